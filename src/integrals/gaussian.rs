//! One-electron integrals over contracted Cartesian Gaussian shells by the
//! McMurchie–Davidson method: overlap, kinetic energy and nuclear attraction.
//!
//! Work is organised per primitive pair: the three 1-D Hermite tables (and, for
//! nuclear attraction, the nucleus-summed Hermite Coulomb table) are built once and
//! then read by every component pair, so nothing is allocated or recomputed per
//! component pair. Shells carry raw coefficients; normalisation is the caller's.

use std::f64::consts::PI;

use super::hermite::{Hermite1d, HermiteCoulomb, MAX_L};

/// Component order is the one `basis::harmonics` defines for every shell.
pub use crate::basis::harmonics::cartesian_components;

/// One contracted Cartesian shell: every component x^a y^b z^c (a+b+c = l) times
/// Σ_k d_k exp(−α_k |r−center|²), with the d_k given as they are (no normalisation
/// applied here: the caller folds normalisation into d_k and into its own angular
/// transformation).
#[derive(Debug, Clone, Copy)]
pub struct CartesianShell<'a> {
    pub l: u32,
    pub center: [f64; 3],
    pub exponents: &'a [f64],
    pub coefficients: &'a [f64],
}

impl CartesianShell<'_> {
    fn check(&self) {
        assert!(
            self.l as usize <= MAX_L,
            "Cartesian shells are supported up to l = {MAX_L}, got l = {}",
            self.l
        );
        assert_eq!(
            self.exponents.len(),
            self.coefficients.len(),
            "a shell needs one coefficient per exponent"
        );
    }
}

/// Component powers as indices, for table look-ups.
fn powers(l: u32) -> Vec<[usize; 3]> {
    cartesian_components(l)
        .into_iter()
        .map(|c| c.map(|k| k as usize))
        .collect()
}

/// Everything one primitive pair contributes: its weight d_a d_b, the exponent β of
/// the b primitive, total exponent p, product centre P and the three 1-D Hermite
/// tables (j up to l_b + `extra_j`).
struct PrimitivePair {
    weight: f64,
    beta: f64,
    p: f64,
    center: [f64; 3],
    e: [Hermite1d; 3],
}

/// Calls `f` for every primitive pair of the two shells.
fn for_each_pair(
    a: &CartesianShell,
    b: &CartesianShell,
    extra_j: usize,
    mut f: impl FnMut(&PrimitivePair),
) {
    a.check();
    b.check();
    let (la, lb) = (a.l as usize, b.l as usize);
    for (&alpha, &da) in a.exponents.iter().zip(a.coefficients) {
        for (&beta, &db) in b.exponents.iter().zip(b.coefficients) {
            let p = alpha + beta;
            let e = std::array::from_fn(|k| {
                Hermite1d::new(la, lb + extra_j, alpha, beta, a.center[k], b.center[k])
            });
            let center = std::array::from_fn(|k| (alpha * a.center[k] + beta * b.center[k]) / p);
            f(&PrimitivePair {
                weight: da * db,
                beta,
                p,
                center,
                e,
            });
        }
    }
}

/// Overlap ⟨a|b⟩ over all component pairs, row-major [component of a][component of b].
pub fn overlap_block(a: &CartesianShell, b: &CartesianShell) -> Vec<f64> {
    let (ca, cb) = (powers(a.l), powers(b.l));
    let mut out = vec![0.0; ca.len() * cb.len()];
    for_each_pair(a, b, 0, |pp| {
        let scale = pp.weight * (PI / pp.p) * (PI / pp.p).sqrt();
        let [ex, ey, ez] = &pp.e;
        for (i, pa) in ca.iter().enumerate() {
            for (j, pb) in cb.iter().enumerate() {
                out[i * cb.len() + j] += scale
                    * ex.overlap(pa[0], pb[0])
                    * ey.overlap(pa[1], pb[1])
                    * ez.overlap(pa[2], pb[2]);
            }
        }
    });
    out
}

/// Kinetic energy ⟨a|−½∇²|b⟩, row-major [component of a][component of b].
///
/// Per direction, −½ d²/dx² acting on (x−B)^j e^(−b(x−B)²) gives
/// −½ [j(j−1) G_(j−2) − 2b(2j+1) G_j + 4b² G_(j+2)], so the 1-D kinetic integral is
/// a combination of 1-D overlaps with j − 2, j, j + 2.
pub fn kinetic_block(a: &CartesianShell, b: &CartesianShell) -> Vec<f64> {
    let (ca, cb) = (powers(a.l), powers(b.l));
    let (la, lb) = (a.l as usize, b.l as usize);
    let mut out = vec![0.0; ca.len() * cb.len()];
    for_each_pair(a, b, 2, |pp| {
        let beta = pp.beta;
        // 1-D overlap s[d][i][j] and kinetic t[d][i][j], both without √(π/p).
        let mut s = [[[0.0; MAX_L + 1]; MAX_L + 1]; 3];
        let mut t = [[[0.0; MAX_L + 1]; MAX_L + 1]; 3];
        for d in 0..3 {
            let e = &pp.e[d];
            for i in 0..=la {
                for j in 0..=lb {
                    let lower = if j >= 2 {
                        (j * (j - 1)) as f64 * e.overlap(i, j - 2)
                    } else {
                        0.0
                    };
                    s[d][i][j] = e.overlap(i, j);
                    t[d][i][j] = -0.5
                        * (lower - 2.0 * beta * (2 * j + 1) as f64 * e.overlap(i, j)
                            + 4.0 * beta * beta * e.overlap(i, j + 2));
                }
            }
        }
        let scale = pp.weight * (PI / pp.p) * (PI / pp.p).sqrt();
        for (i, pa) in ca.iter().enumerate() {
            for (j, pb) in cb.iter().enumerate() {
                let [sx, sy, sz] = [0, 1, 2].map(|d| s[d][pa[d]][pb[d]]);
                let [tx, ty, tz] = [0, 1, 2].map(|d| t[d][pa[d]][pb[d]]);
                out[i * cb.len() + j] += scale * (tx * sy * sz + sx * ty * sz + sx * sy * tz);
            }
        }
    });
    out
}

/// Nuclear attraction ⟨a| Σ_C −Z_C/|r−C| |b⟩ for the given nuclei (Z, position),
/// row-major [component of a][component of b].
///
/// The nuclei are summed into one Hermite Coulomb table per primitive pair before
/// the contraction with the E coefficients, so the cost per nucleus does not grow
/// with the number of component pairs.
pub fn nuclear_block(
    a: &CartesianShell,
    b: &CartesianShell,
    nuclei: &[(f64, [f64; 3])],
) -> Vec<f64> {
    let (ca, cb) = (powers(a.l), powers(b.l));
    let mut out = vec![0.0; ca.len() * cb.len()];
    let mut r = HermiteCoulomb::new((a.l + b.l) as usize);
    for_each_pair(a, b, 0, |pp| {
        r.clear();
        for &(z, c) in nuclei {
            let pc = [0, 1, 2].map(|d| pp.center[d] - c[d]);
            r.add(-z, pp.p, pc);
        }
        let scale = pp.weight * 2.0 * PI / pp.p;
        let [ex, ey, ez] = &pp.e;
        for (i, pa) in ca.iter().enumerate() {
            for (j, pb) in cb.iter().enumerate() {
                let (ux, uy, uz) = (
                    ex.coefficients(pa[0], pb[0]),
                    ey.coefficients(pa[1], pb[1]),
                    ez.coefficients(pa[2], pb[2]),
                );
                let mut sum = 0.0;
                for (t, &et) in ux.iter().enumerate() {
                    for (u, &eu) in uy.iter().enumerate() {
                        let etu = et * eu;
                        for (v, &ev) in uz.iter().enumerate() {
                            sum += etu * ev * r.get(t, u, v);
                        }
                    }
                }
                out[i * cb.len() + j] += scale * sum;
            }
        }
    });
    out
}
