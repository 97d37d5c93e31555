//! Per shell pair, everything the quartet kernel reads about one side: for each
//! primitive pair its exponent sum p, product centre P and the Hermite expansion of
//! the product of every pair of the shells' *functions* (not Cartesian components):
//!
//! φ_a φ_b = Σ_tuv E^{ab}_tuv Λ_tuv(r; p, P),  E^{ab}_tuv = Σ rows_a rows_b d_a d_b E_t^x E_u^y E_v^z.
//!
//! Folding the Cartesian → pure transformation and the contraction coefficients into
//! E once per pair means the quartet kernel never sees Cartesian components, and a
//! pure d or f pair carries 25 or 49 function products instead of 36 or 100.

use super::hermite_r::{TABLES, nherm};
use crate::basis::GaussianShell;
use crate::integrals::hermite::{Hermite1d, MAX_L};

/// Primitive pairs whose Gaussian-product prefactor e^(−ab/p |AB|²) falls below this
/// contribute nothing visible: normalised primitives keep every other factor of
/// order one, so their integrals are below 1e-20 of the pair's scale.
const PRIMITIVE_CUTOFF: f64 = 1e-20;

#[derive(Clone, Copy, Debug)]
pub(crate) struct Primitive {
    pub p: f64,
    pub center: [f64; 3],
    /// max over function products of √(ρ|ρ) for this primitive pair alone: the
    /// Schwarz bound of its share of any integral.
    pub bound: f64,
}

/// The expansion of one ordered shell pair (a, b).
#[derive(Clone, Debug)]
pub struct ShellPair {
    /// l_a + l_b: the Hermite order of the products.
    pub(crate) l: usize,
    /// Function products: functions of a × functions of b.
    pub(crate) nf: usize,
    /// nherm(l).
    pub(crate) nh: usize,
    pub(crate) prims: Vec<Primitive>,
    /// Per primitive pair nf × nh, function-major (each product's Hermite
    /// coefficients contiguous, for dot products): E^{ab}_h / p (bra use).
    pub(crate) e: Vec<f64>,
    /// The same times (−1)^(t+u+v) (ket use).
    pub(crate) e_ket: Vec<f64>,
}

fn ncart(l: usize) -> usize {
    (l + 1) * (l + 2) / 2
}

impl ShellPair {
    /// Expansion of the pair; the shells must have passed `super::check_shell`.
    pub fn new(a: &GaussianShell, b: &GaussianShell) -> ShellPair {
        let (la, lb) = (a.l as usize, b.l as usize);
        debug_assert!(la <= MAX_L && lb <= MAX_L);
        let l = la + lb;
        let nh = nherm(l);
        let (na, nb) = (a.rows.len(), b.rows.len());
        let nf = na * nb;
        let (ca, cb) = (
            crate::basis::gaussian::CARTESIAN[la],
            crate::basis::gaussian::CARTESIAN[lb],
        );
        let (nca, ncb) = (ncart(la), ncart(lb));
        let tuv = &TABLES.tuv[..nh];
        let signs: Vec<f64> = tuv
            .iter()
            .map(|c| {
                if (c[0] + c[1] + c[2]) % 2 == 0 {
                    1.0
                } else {
                    -1.0
                }
            })
            .collect();
        let mut prims = Vec::new();
        let mut e = Vec::new();
        // Cartesian expansion of one primitive pair, [h][ca][cb], then half-transformed.
        let mut cart = vec![0.0; nh * nca * ncb];
        let mut half = vec![0.0; nca * nb];
        for (&alpha, &da) in a.exponents.iter().zip(&a.d) {
            for (&beta, &db) in b.exponents.iter().zip(&b.d) {
                let p = alpha + beta;
                let mu = alpha * beta / p;
                let ab2: f64 = (0..3).map(|k| (a.center[k] - b.center[k]).powi(2)).sum();
                if (-mu * ab2).exp() < PRIMITIVE_CUTOFF || da * db == 0.0 {
                    continue;
                }
                let h1: [Hermite1d; 3] = std::array::from_fn(|k| {
                    Hermite1d::new(la, lb, alpha, beta, a.center[k], b.center[k])
                });
                let w = da * db / p;
                for (h, c) in tuv.iter().enumerate() {
                    for (i, pa) in ca.iter().enumerate() {
                        for (j, pb) in cb.iter().enumerate() {
                            let pw = |k: usize| (pa[k] + pb[k]) as usize;
                            let v = if c[0] <= pw(0) && c[1] <= pw(1) && c[2] <= pw(2) {
                                let x = h1[0].coefficients(pa[0] as usize, pb[0] as usize)[c[0]];
                                let y = h1[1].coefficients(pa[1] as usize, pb[1] as usize)[c[1]];
                                let z = h1[2].coefficients(pa[2] as usize, pb[2] as usize)[c[2]];
                                w * x * y * z
                            } else {
                                0.0
                            };
                            cart[(h * nca + i) * ncb + j] = v;
                        }
                    }
                }
                let start = e.len();
                e.resize(start + nh * nf, 0.0);
                let out = &mut e[start..];
                for h in 0..nh {
                    let block = &cart[h * nca * ncb..(h + 1) * nca * ncb];
                    for i in 0..nca {
                        for (fb, rb) in b.rows.iter().enumerate() {
                            half[i * nb + fb] = rb
                                .iter()
                                .zip(&block[i * ncb..(i + 1) * ncb])
                                .map(|(r, v)| r * v)
                                .sum();
                        }
                    }
                    for (fa, ra) in a.rows.iter().enumerate() {
                        for fb in 0..nb {
                            out[(fa * nb + fb) * nh + h] = ra
                                .iter()
                                .enumerate()
                                .map(|(i, r)| r * half[i * nb + fb])
                                .sum();
                        }
                    }
                }
                let center =
                    std::array::from_fn(|k| (alpha * a.center[k] + beta * b.center[k]) / p);
                prims.push(Primitive {
                    p,
                    center,
                    bound: f64::INFINITY,
                });
            }
        }
        let e_ket = e
            .chunks_exact(nh)
            .flat_map(|vals| vals.iter().zip(&signs).map(|(v, s)| s * v))
            .collect();
        ShellPair {
            l,
            nf,
            nh,
            prims,
            e,
            e_ket,
        }
        .sorted_by_bound()
    }

    /// Fills every primitive pair's Schwarz bound and orders the primitive pairs by
    /// it, largest first, so the kernel can stop at the first negligible one.
    fn sorted_by_bound(mut self) -> ShellPair {
        let block = self.nf * self.nh;
        let mut scratch = super::quartet::Scratch::default();
        for (k, prim) in self.prims.iter_mut().enumerate() {
            let one = ShellPair {
                l: self.l,
                nf: self.nf,
                nh: self.nh,
                prims: vec![*prim],
                e: self.e[k * block..(k + 1) * block].to_vec(),
                e_ket: self.e_ket[k * block..(k + 1) * block].to_vec(),
            };
            prim.bound = super::quartet::self_bound(&one, &mut scratch);
        }
        let mut order: Vec<usize> = (0..self.prims.len()).collect();
        order.sort_by(|&i, &j| self.prims[j].bound.total_cmp(&self.prims[i].bound));
        let pick = |v: &[f64]| -> Vec<f64> {
            order
                .iter()
                .flat_map(|&k| v[k * block..(k + 1) * block].iter().copied())
                .collect()
        };
        ShellPair {
            prims: order.iter().map(|&k| self.prims[k]).collect(),
            e: pick(&self.e),
            e_ket: pick(&self.e_ket),
            ..self
        }
    }

    /// Bytes the expansion of a pair of these shells holds (for memory estimates).
    pub fn estimate_bytes(a: &GaussianShell, b: &GaussianShell) -> f64 {
        let n = nherm((a.l + b.l) as usize) as f64 * (a.rows.len() * b.rows.len()) as f64;
        (a.exponents.len() * b.exponents.len()) as f64 * (2.0 * n * 8.0 + 32.0)
    }

    /// Work of one quartet with `self` outside (a Boys call and the recursion per
    /// primitive quartet, the ket contraction, then the bra contraction), in rough
    /// multiply-adds: the kernel picks the cheaper side to put outside.
    pub(crate) fn cost_outside(&self, ket: &ShellPair) -> f64 {
        let (np, nq) = (self.prims.len() as f64, ket.prims.len() as f64);
        let inner = (self.nh * ket.nh * ket.nf) as f64 + nherm(self.l + ket.l) as f64 * 2.0 + 30.0;
        np * nq * inner + np * (self.nh * self.nf * ket.nf) as f64
    }
}
