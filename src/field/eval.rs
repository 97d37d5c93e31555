//! Batched evaluation: basis values are computed once per batch of points and shared
//! by every requested field, so a cube with several fields costs little more than one.

use super::Field;
use crate::basis::Shell;
use crate::error::Result;
use crate::grid::Slab;
use crate::solve::OrbitalSet;

#[derive(Debug, Clone)]
pub(super) enum Resolved {
    Orbital(Vec<f64>),
    OrbitalDensity(Vec<f64>),
    /// Coefficients and the Mulliken gross populations of the orbital.
    OrbitalDeformation(Vec<f64>, Vec<f64>),
    /// (occupation, coefficients) of every occupied orbital.
    Density(Vec<(f64, Vec<f64>)>),
    /// The occupied orbitals as for `Density`, and the free-atom occupation of
    /// every function.
    Deformation(Vec<(f64, Vec<f64>)>, Vec<f64>),
}

/// Evaluates a list of fields of one orbital set at points. Values come out
/// interleaved: for each point, the value of every field in order.
#[derive(Debug, Clone)]
pub struct FieldSampler {
    pub(super) shells: Vec<Shell>,
    pub(super) offsets: Vec<usize>,
    pub(super) nbf: usize,
    pub(super) fields: Vec<Resolved>,
}

impl FieldSampler {
    /// Resolves orbital selectors now, so that an out-of-range orbital is an error
    /// before any work starts.
    pub fn new(set: &OrbitalSet, fields: &[Field]) -> Result<Self> {
        let mut resolved = Vec::with_capacity(fields.len());
        for f in fields {
            let index = f.selector().map(|s| s.resolve(&set.orbitals)).transpose()?;
            let coeffs = || {
                set.orbitals[index.expect("orbital field")]
                    .coefficients
                    .clone()
            };
            resolved.push(match f {
                Field::Orbital(_) => Resolved::Orbital(coeffs()),
                Field::OrbitalDensity(_) => Resolved::OrbitalDensity(coeffs()),
                Field::OrbitalDeformation(_) => Resolved::OrbitalDeformation(
                    coeffs(),
                    set.gross_populations(index.expect("orbital field"))?,
                ),
                Field::Stored(_) => return Err(super::stored_needs_cube()),
                Field::Density => Resolved::Density(occupied(set)),
                Field::Deformation => Resolved::Deformation(
                    occupied(set),
                    set.reference.clone().ok_or_else(|| {
                        crate::error::Error::input(format!(
                            "deformation needs the free-atom reference occupations, which {} does not provide",
                            set.method
                        ))
                        .with_hint("use --method extended-huckel, or orbital-deformation:N for one orbital")
                    })?,
                ),
            });
        }
        Ok(FieldSampler {
            shells: set.basis.shells.clone(),
            offsets: set.basis.offsets(),
            nbf: set.basis.len(),
            fields: resolved,
        })
    }

    pub fn field_count(&self) -> usize {
        self.fields.len()
    }

    /// Fills `out` (points × fields) with the interleaved values at arbitrary points.
    pub fn evaluate(&self, points: &[[f64; 3]], out: &mut [f64]) {
        let n = points.len();
        let mut phi = vec![0.0; n * self.nbf];
        for (shell, &o) in self.shells.iter().zip(&self.offsets) {
            shell.values(points, &mut phi[o * n..(o + shell.len()) * n]);
        }
        self.combine_fields(&phi, n, out);
    }

    /// Like `evaluate` on a grid slab; Gaussian shells use the separable lattice
    /// evaluation when the slab is axis-aligned.
    pub fn evaluate_slab(&self, slab: &Slab, out: &mut [f64]) {
        let Some((x, ys, zs)) = slab.lattice else {
            return self.evaluate(slab.points, out);
        };
        let n = slab.points.len();
        let mut phi = vec![0.0; n * self.nbf];
        for (shell, &o) in self.shells.iter().zip(&self.offsets) {
            let dst = &mut phi[o * n..(o + shell.len()) * n];
            match shell {
                Shell::Gaussian(g) => g.values_lattice(x, ys, zs, dst),
                Shell::Slater(_) => shell.values(slab.points, dst),
            }
        }
        self.combine_fields(&phi, n, out);
    }

    /// From basis values (functions × points) to the interleaved field values.
    fn combine_fields(&self, phi: &[f64], n: usize, out: &mut [f64]) {
        let nf = self.fields.len();
        assert_eq!(
            out.len(),
            n * nf,
            "output buffer must hold points × fields values"
        );
        let mut psi = vec![0.0; n];
        for (k, field) in self.fields.iter().enumerate() {
            match field {
                Resolved::Orbital(c) => {
                    combine(phi, c, n, &mut psi);
                    scatter(out, nf, k, psi.iter().copied());
                }
                Resolved::OrbitalDensity(c) => {
                    combine(phi, c, n, &mut psi);
                    scatter(out, nf, k, psi.iter().map(|v| v * v));
                }
                Resolved::OrbitalDeformation(c, q) => {
                    combine(phi, c, n, &mut psi);
                    for (p, v) in psi.iter_mut().enumerate() {
                        let atomic: f64 = q
                            .iter()
                            .enumerate()
                            .map(|(m, qm)| qm * phi[m * n + p] * phi[m * n + p])
                            .sum();
                        *v = *v * *v - atomic;
                    }
                    scatter(out, nf, k, psi.iter().copied());
                }
                Resolved::Density(list) => {
                    let rho = density(phi, list, n, &mut psi);
                    scatter(out, nf, k, rho.into_iter());
                }
                Resolved::Deformation(list, reference) => {
                    let mut rho = density(phi, list, n, &mut psi);
                    for (m, &r0) in reference.iter().enumerate().filter(|(_, r)| **r != 0.0) {
                        for (r, p) in rho.iter_mut().zip(&phi[m * n..(m + 1) * n]) {
                            *r -= r0 * p * p;
                        }
                    }
                    scatter(out, nf, k, rho.into_iter());
                }
            }
        }
    }
}

fn occupied(set: &OrbitalSet) -> Vec<(f64, Vec<f64>)> {
    set.orbitals
        .iter()
        .filter(|o| o.occupation > 0.0)
        .map(|o| (o.occupation, o.coefficients.clone()))
        .collect()
}

/// Σ_i n_i ψ_i(p)² at every point.
fn density(phi: &[f64], list: &[(f64, Vec<f64>)], n: usize, psi: &mut [f64]) -> Vec<f64> {
    let mut rho = vec![0.0; n];
    for (occ, c) in list {
        combine(phi, c, n, psi);
        for (r, v) in rho.iter_mut().zip(psi.iter()) {
            *r += occ * v * v;
        }
    }
    rho
}

/// ψ(p) = Σ_μ c_μ φ_μ(p) for every point, with φ stored function-major.
fn combine(phi: &[f64], c: &[f64], n: usize, psi: &mut [f64]) {
    psi.fill(0.0);
    for (m, &cm) in c.iter().enumerate() {
        if cm != 0.0 {
            for (v, p) in psi.iter_mut().zip(&phi[m * n..(m + 1) * n]) {
                *v += cm * p;
            }
        }
    }
}

fn scatter(out: &mut [f64], stride: usize, offset: usize, values: impl Iterator<Item = f64>) {
    for (slot, v) in out.iter_mut().skip(offset).step_by(stride).zip(values) {
        *slot = v;
    }
}
