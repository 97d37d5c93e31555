//! Batched evaluation: basis values are computed once per tile of `TILE` points and
//! shared by every requested field, so a cube with several fields costs little more
//! than one. A tile's basis values (functions × TILE) stay in cache while the orbital
//! product and the fields read them; working memory is per thread (`scratch`).
//! Every value is the same to the bit as the untiled evaluation gave (see `combine`,
//! `groups`, `lattice`; checked against a verbatim copy in `identity`).

use super::combine::Combo;
use super::groups::{self, At, Group};
use super::lattice::MAX_ORBITALS;
use super::scratch::{Scratch, at_least, with_scratch};
use super::{Field, TILE};
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
    groups: Vec<Group>,
    combo: Combo,
    /// Tells this sampler's cached lattice tables from another's (`lattice`).
    id: u64,
    /// Orbitals straight from the lattice tables on axis-aligned slabs
    /// (`lattice::fused`): every shell Gaussian, a few orbitals, no field that reads
    /// basis values.
    fused: bool,
}

/// Source of `FieldSampler::id`.
static NEXT_ID: std::sync::atomic::AtomicU64 = std::sync::atomic::AtomicU64::new(1);

impl FieldSampler {
    /// Resolves orbital selectors now, so that an out-of-range orbital is an error
    /// before any work starts.
    pub fn new(set: &OrbitalSet, fields: &[Field]) -> Result<Self> {
        let mut resolved = Vec::with_capacity(fields.len());
        for f in fields {
            let index = f.selector().map(|s| s.resolve(set.shown())).transpose()?;
            let coeffs = || {
                set.shown()[index.expect("orbital field")]
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
                Field::SpinDensity => Resolved::Density(spin_density(set)?),
                Field::Deformation if set.reference.is_none() && set.spin.free_atoms.is_some() => {
                    // ρ − Σ_atoms Σ_k n_k χ_k²: the free atoms' orbitals with
                    // negative weights; no diagonal reference.
                    let mut list = occupied(set);
                    for (n, c) in set.spin.free_atoms.iter().flatten() {
                        list.push((-n, c.clone()));
                    }
                    Resolved::Deformation(list, vec![0.0; set.basis.len()])
                }
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
        let offsets = set.basis.offsets();
        let combo = Combo::new(&resolved, set.basis.len());
        let gaussian = (set.basis.shells.iter()).all(|s| matches!(s, Shell::Gaussian(_)));
        Ok(FieldSampler {
            groups: groups::build(&set.basis.shells, &offsets),
            fused: gaussian
                && (1..=MAX_ORBITALS).contains(&combo.norb)
                && !combo.needs_basis_values(),
            combo,
            id: NEXT_ID.fetch_add(1, std::sync::atomic::Ordering::Relaxed),
            shells: set.basis.shells.clone(),
            offsets,
            nbf: set.basis.len(),
            fields: resolved,
        })
    }

    pub fn field_count(&self) -> usize {
        self.fields.len()
    }

    /// Fills `out` (points × fields) with the interleaved values at arbitrary points.
    pub fn evaluate(&self, points: &[[f64; 3]], out: &mut [f64]) {
        let nf = self.check_out(points.len(), out);
        if nf == 0 || points.is_empty() {
            return;
        }
        with_scratch(|s| {
            self.prepare(s);
            for (tile, dst) in points.chunks(TILE).zip(out.chunks_mut(TILE * nf)) {
                groups::tile(&self.groups, &self.shells, At::Points(tile), s, false);
                self.finish_tile(tile.len(), s, dst);
            }
        });
    }

    /// Like `evaluate` on a grid slab; Gaussian shells use the separable lattice
    /// evaluation when the slab is axis-aligned.
    pub fn evaluate_slab(&self, slab: &Slab, out: &mut [f64]) {
        let Some((x, ys, zs)) = slab.lattice else {
            // Not a lattice: the slab lists its points, nothing is built.
            return self.evaluate(slab.points(&mut Vec::new()), out);
        };
        let n = slab.len();
        let nf = self.check_out(n, out);
        if nf == 0 || n == 0 {
            return;
        }
        with_scratch(|s| {
            self.prepare(s);
            s.lattice.fill(self.id, &self.shells, x, ys, zs);
            for (p0, len) in slab_tiles(ys.len(), zs.len()) {
                let dst = &mut out[p0 * nf..(p0 + len) * nf];
                if self.fused {
                    let c = &self.combo;
                    s.lattice.tile_orbitals(
                        &self.shells,
                        &self.offsets,
                        c.coefficients(),
                        c.norb,
                        p0,
                        len,
                        &mut s.terms,
                        &mut s.psi,
                    );
                    c.fields(&s.phi, &s.psi, len, &mut s.acc, dst);
                    continue;
                }
                let at = At::Lattice {
                    x,
                    ys,
                    zs,
                    p0,
                    n: len,
                };
                groups::tile(&self.groups, &self.shells, at, s, true);
                s.lattice.tile(
                    &self.shells,
                    &self.offsets,
                    p0,
                    len,
                    &mut s.phi,
                    &mut s.live,
                );
                self.finish_tile(len, s, dst);
            }
        });
    }

    fn check_out(&self, n: usize, out: &[f64]) -> usize {
        let nf = self.fields.len();
        assert_eq!(
            out.len(),
            n * nf,
            "output buffer must hold points × fields values"
        );
        nf
    }

    /// Sizes this thread's scratch for this sampler.
    fn prepare(&self, s: &mut Scratch) {
        at_least(&mut s.phi, self.nbf * TILE);
        at_least(&mut s.psi, self.combo.norb * TILE);
        at_least(&mut s.ex, groups::max_primitives(&self.groups) * TILE);
        at_least(&mut s.live, self.nbf);
        at_least(&mut s.acc, TILE);
    }

    /// The tile's orbitals over its live functions, then its fields.
    fn finish_tile(&self, n: usize, s: &mut Scratch, out: &mut [f64]) {
        let mut active = std::mem::take(&mut s.active);
        active.clear();
        active.extend((0..self.nbf as u32).filter(|&m| s.live[m as usize]));
        self.combo.orbitals(&s.phi, &active, n, &mut s.psi);
        self.combo.fields(&s.phi, &s.psi, n, &mut s.acc, out);
        s.active = active;
    }
}

/// (first point, length) of the tiles of a slab of ny lines of nz points: whole
/// lines when they fit in a tile, else each line cut into equal pieces, so the
/// lattice path adds long contiguous runs.
fn slab_tiles(ny: usize, nz: usize) -> impl Iterator<Item = (usize, usize)> {
    let (per_line, chunk) = if nz <= TILE {
        (1, nz)
    } else {
        let pieces = nz.div_ceil(TILE);
        (pieces, nz.div_ceil(pieces))
    };
    let lines = if nz <= TILE {
        (TILE / nz.max(1)).max(1)
    } else {
        1
    };
    let n = ny * nz;
    let step = lines * nz;
    (0..ny.div_ceil(lines)).flat_map(move |b| {
        (0..per_line).filter_map(move |c| {
            let p0 = b * step + c * chunk;
            let end = if per_line == 1 {
                (p0 + step).min(n)
            } else {
                (b * nz + (c + 1) * chunk).min((b + 1) * nz)
            };
            (p0 < end).then_some((p0, end - p0))
        })
    })
}

fn occupied(set: &OrbitalSet) -> Vec<(f64, Vec<f64>)> {
    set.occupied()
        .filter(|o| o.occupation > 0.0)
        .map(|o| (o.occupation, o.coefficients.clone()))
        .collect()
}

/// ρ_α − ρ_β as weighted orbital densities: alpha orbitals +n, beta orbitals −n.
fn spin_density(set: &OrbitalSet) -> Result<Vec<(f64, Vec<f64>)>> {
    let beta = set.spin.beta.as_ref().ok_or_else(|| {
        crate::error::Error::input(format!(
            "spin-density needs unrestricted orbitals (alpha and beta), which {} does not have",
            set.method
        ))
        .with_hint("solve with --method uhf")
    })?;
    let mut list: Vec<(f64, Vec<f64>)> = set
        .orbitals
        .iter()
        .filter(|o| o.occupation > 0.0)
        .map(|o| (o.occupation, o.coefficients.clone()))
        .collect();
    list.extend(
        beta.iter()
            .filter(|o| o.occupation > 0.0)
            .map(|o| (-o.occupation, o.coefficients.clone())),
    );
    Ok(list)
}
