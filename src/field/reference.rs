//! The evaluation exactly as it stood before tiling (function-major basis values of a
//! whole batch, one axpy per coefficient), kept verbatim as the oracle of the
//! bit-identity tests in `identity`. Test-only.

use super::FieldSampler;
use super::eval::Resolved;
use crate::basis::gaussian::SCREEN;
use crate::basis::harmonics::{cartesian_components, eval_polynomial, solid_harmonic};
use crate::basis::{GaussianShell, Shell, SlaterShell};
use crate::grid::Slab;

const SCREEN_ZETA_R: f64 = 60.0;

/// The old evaluation of a sampler's fields.
pub(super) struct Old<'a>(pub &'a FieldSampler);

impl Old<'_> {
    /// Fills `out` (points × fields) with the interleaved values at arbitrary points.
    pub(super) fn evaluate(&self, points: &[[f64; 3]], out: &mut [f64]) {
        let n = points.len();
        let mut phi = vec![0.0; n * self.0.nbf];
        for (shell, &o) in self.0.shells.iter().zip(&self.0.offsets) {
            shell_values(shell, points, &mut phi[o * n..(o + shell.len()) * n]);
        }
        self.combine_fields(&phi, n, out);
    }

    /// Like `evaluate` on a grid slab; Gaussian shells use the separable lattice
    /// evaluation when the slab is axis-aligned.
    pub(super) fn evaluate_slab(&self, slab: &Slab, out: &mut [f64]) {
        let Some((x, ys, zs)) = slab.lattice else {
            return Old(self.0).evaluate(slab.points(&mut Vec::new()), out);
        };
        let mut buf = Vec::new();
        let points = slab.points(&mut buf);
        let n = points.len();
        let mut phi = vec![0.0; n * self.0.nbf];
        for (shell, &o) in self.0.shells.iter().zip(&self.0.offsets) {
            let dst = &mut phi[o * n..(o + shell.len()) * n];
            match shell {
                Shell::Gaussian(g) => values_lattice(g, x, ys, zs, dst),
                Shell::Slater(_) => shell_values(shell, points, dst),
            }
        }
        self.combine_fields(&phi, n, out);
    }

    /// From basis values (functions × points) to the interleaved field values.
    fn combine_fields(&self, phi: &[f64], n: usize, out: &mut [f64]) {
        let nf = self.0.fields.len();
        assert_eq!(
            out.len(),
            n * nf,
            "output buffer must hold points × fields values"
        );
        let mut psi = vec![0.0; n];
        for (k, field) in self.0.fields.iter().enumerate() {
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

fn shell_values(shell: &Shell, points: &[[f64; 3]], out: &mut [f64]) {
    match shell {
        Shell::Slater(s) => slater_values(s, points, out),
        Shell::Gaussian(g) => gaussian_values(g, points, out),
    }
}

fn gaussian_values(this: &GaussianShell, points: &[[f64; 3]], out: &mut [f64]) {
    let n = points.len();
    let comps = cartesian_components(this.l);
    let mut mono = vec![0.0; comps.len()];
    for (p, pt) in points.iter().enumerate() {
        let (x, y, z) = (
            pt[0] - this.center[0],
            pt[1] - this.center[1],
            pt[2] - this.center[2],
        );
        let r2 = x * x + y * y + z * z;
        let radial: f64 = this
            .primitives
            .iter()
            .zip(&this.d)
            .map(|((a, _), d)| d * (-a * r2).exp())
            .sum();
        for (m, c) in mono.iter_mut().zip(&comps) {
            *m = x.powi(c[0] as i32) * y.powi(c[1] as i32) * z.powi(c[2] as i32);
        }
        for (f, row) in this.rows.iter().enumerate() {
            out[f * n + p] = radial * row.iter().zip(&mono).map(|(r, m)| r * m).sum::<f64>();
        }
    }
}

fn values_lattice(this: &GaussianShell, x: f64, ys: &[f64], zs: &[f64], out: &mut [f64]) {
    let (ny, nz) = (ys.len(), zs.len());
    let n = ny * nz;
    out[..this.len() * n].fill(0.0);
    let l = this.l as usize;
    let comps = cartesian_components(this.l);
    let dx = x - this.center[0];
    let mut ytab = vec![0.0; (l + 1) * ny];
    let mut ztab = vec![0.0; (l + 1) * nz];
    for ((alpha, _), d) in this.primitives.iter().zip(&this.d) {
        let ex = d * (-alpha * dx * dx).exp();
        let xpow: Vec<f64> = (0..=l).map(|a| ex * dx.powi(a as i32)).collect();
        let xmax = xpow.iter().fold(0.0f64, |m, v| m.max(v.abs()));
        if xmax < SCREEN {
            continue;
        }
        fill_axis(&mut ytab, ys, this.center[1], *alpha, l);
        fill_axis(&mut ztab, zs, this.center[2], *alpha, l);
        let zmax = ztab.iter().fold(0.0f64, |m, v| m.max(v.abs()));
        for j in 0..ny {
            let ymax = (0..=l).fold(0.0f64, |m, b| m.max(ytab[b * ny + j].abs()));
            if xmax * ymax * zmax < SCREEN {
                continue;
            }
            for (ci, c) in comps.iter().enumerate() {
                let coef = xpow[c[0] as usize] * ytab[c[1] as usize * ny + j];
                if coef == 0.0 {
                    continue;
                }
                let zrow = &ztab[c[2] as usize * nz..(c[2] as usize + 1) * nz];
                for (f, row) in this.rows.iter().enumerate() {
                    let w = row[ci] * coef;
                    if w != 0.0 {
                        let dst = &mut out[f * n + j * nz..f * n + (j + 1) * nz];
                        for (o, zv) in dst.iter_mut().zip(zrow) {
                            *o += w * zv;
                        }
                    }
                }
            }
        }
    }
}

/// table[p·len + i] = (t_i − c)^p e^(−α (t_i − c)²) for p = 0..=l.
fn fill_axis(table: &mut [f64], ts: &[f64], c: f64, alpha: f64, l: usize) {
    let len = ts.len();
    for (i, t) in ts.iter().enumerate() {
        let d = t - c;
        let mut v = (-alpha * d * d).exp();
        for p in 0..=l {
            table[p * len + i] = v;
            v *= d;
        }
    }
}

fn slater_values(this: &SlaterShell, points: &[[f64; 3]], out: &mut [f64]) {
    let np = points.len();
    let power = this.n as i32 - 1 - this.l as i32;
    let harmonics: Vec<_> = this
        .ms
        .iter()
        .map(|&m| solid_harmonic(this.l, m).unwrap())
        .collect();
    let fact: f64 = (1..=2 * this.n).map(f64::from).product();
    let norm = (2.0 * this.zeta).powf(this.n as f64 + 0.5) / fact.sqrt();
    for (p, pt) in points.iter().enumerate() {
        let (x, y, z) = (
            pt[0] - this.center[0],
            pt[1] - this.center[1],
            pt[2] - this.center[2],
        );
        let r = (x * x + y * y + z * z).sqrt();
        let radial = if this.zeta * r > SCREEN_ZETA_R {
            0.0
        } else {
            norm * r.powi(power) * (-this.zeta * r).exp()
        };
        for (f, h) in harmonics.iter().enumerate() {
            out[f * np + p] = if radial == 0.0 {
                0.0
            } else {
                radial * eval_polynomial(h, x, y, z)
            };
        }
    }
}
