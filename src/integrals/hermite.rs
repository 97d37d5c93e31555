//! McMurchie–Davidson building blocks for one primitive pair: the Hermite expansion
//! coefficients E_t^{ij} of a product of two 1-D Cartesian Gaussians, and the Hermite
//! Coulomb integrals R_tuv of the product's charge distribution about a point.
//!
//! Both are tables filled once per primitive pair (R once per nucleus) and then read
//! by every component pair of the two shells, which is where the work is saved.
//! All storage is fixed-size or allocated once per shell pair.

use super::boys::boys;

/// Highest angular momentum per shell that the tables hold.
pub const MAX_L: usize = 3;
/// The kinetic energy needs j up to l_b + 2.
const NI: usize = MAX_L + 1;
const NJ: usize = MAX_L + 3;
/// t runs to i + j; one spare zero slot lets the recurrence read t + 1 unguarded.
const NT: usize = NI + NJ;

/// E_t^{ij} for one Cartesian direction:
/// (x−A)^i (x−B)^j e^(−a(x−A)² − b(x−B)²) = Σ_t E_t^{ij} Λ_t(x; p, P),
/// with Λ_t the Hermite Gaussians about P = (aA + bB)/p, p = a + b.
/// The Gaussian-product prefactor e^(−ab/p (A−B)²) is included in E_0^{00}.
#[derive(Clone)]
pub struct Hermite1d {
    e: [[[f64; NT]; NJ]; NI],
}

impl Hermite1d {
    /// Fills i ≤ `imax`, j ≤ `jmax` for exponents `a`, `b` on centres `xa`, `xb`.
    pub fn new(imax: usize, jmax: usize, a: f64, b: f64, xa: f64, xb: f64) -> Self {
        assert!(imax < NI && jmax < NJ, "Hermite table too small");
        let p = a + b;
        let inv2p = 0.5 / p;
        let xab = xa - xb;
        let xp = (a * xa + b * xb) / p;
        let (xpa, xpb) = (xp - xa, xp - xb);
        let mut e = [[[0.0; NT]; NJ]; NI];
        e[0][0][0] = (-a * b / p * xab * xab).exp();
        // Raise j at i = 0, then raise i for every j.
        for j in 0..jmax {
            for t in 0..=j + 1 {
                let down = if t > 0 { e[0][j][t - 1] } else { 0.0 };
                e[0][j + 1][t] = inv2p * down + xpb * e[0][j][t] + (t + 1) as f64 * e[0][j][t + 1];
            }
        }
        for i in 0..imax {
            let (done, next) = e.split_at_mut(i + 1);
            for (j, (from, to)) in done[i]
                .iter()
                .zip(next[0].iter_mut())
                .take(jmax + 1)
                .enumerate()
            {
                for t in 0..=i + j + 1 {
                    let down = if t > 0 { from[t - 1] } else { 0.0 };
                    to[t] = inv2p * down + xpa * from[t] + (t + 1) as f64 * from[t + 1];
                }
            }
        }
        Hermite1d { e }
    }

    /// E_t^{ij} for t = 0..=i+j.
    #[inline]
    pub fn coefficients(&self, i: usize, j: usize) -> &[f64] {
        &self.e[i][j][..=i + j]
    }

    /// E_0^{ij}: the 1-D overlap divided by √(π/p).
    #[inline]
    pub fn overlap(&self, i: usize, j: usize) -> f64 {
        self.e[i][j][0]
    }
}

/// Σ_C w_C R_tuv(p, P − C) for t + u + v ≤ L, accumulated over points C with weights
/// w_C (for nuclear attraction w_C = −Z_C), where
/// R_tuv = ∂_Px^t ∂_Py^u ∂_Pz^v F₀(p |P−C|²) in the McMurchie–Davidson form.
pub struct HermiteCoulomb {
    l: usize,
    /// R^n_tuv for one point, indexed [n][t][u][v] with each side L + 1.
    work: Vec<f64>,
    /// The weighted sum of R^0_tuv, indexed [t][u][v].
    sum: Vec<f64>,
    boys: [f64; 2 * MAX_L + 1],
}

impl HermiteCoulomb {
    /// Storage for total angular momentum up to `l` (≤ 2 MAX_L).
    pub fn new(l: usize) -> Self {
        assert!(l <= 2 * MAX_L, "Hermite Coulomb table too small");
        let side = l + 1;
        HermiteCoulomb {
            l,
            work: vec![0.0; side * side * side * side],
            sum: vec![0.0; side * side * side],
            boys: [0.0; 2 * MAX_L + 1],
        }
    }

    #[inline]
    fn at(&self, n: usize, t: usize, u: usize, v: usize) -> usize {
        let s = self.l + 1;
        ((n * s + t) * s + u) * s + v
    }

    /// Starts a new sum (for the next primitive pair).
    pub fn clear(&mut self) {
        self.sum.fill(0.0);
    }

    /// Adds `weight` · R^0_tuv(p, pc) with pc = P − C, from
    /// R^n_000 = (−2p)^n F_n(p |PC|²) and
    /// R^n_(t+1)uv = t R^(n+1)_(t−1)uv + X_PC R^(n+1)_tuv (likewise in u, v).
    pub fn add(&mut self, weight: f64, p: f64, pc: [f64; 3]) {
        let l = self.l;
        let r2 = pc[0] * pc[0] + pc[1] * pc[1] + pc[2] * pc[2];
        boys(p * r2, &mut self.boys[..=l]);
        let mut scale = 1.0;
        for n in 0..=l {
            let i = self.at(n, 0, 0, 0);
            self.work[i] = scale * self.boys[n];
            scale *= -2.0 * p;
        }
        for n in (0..l).rev() {
            let top = l - n;
            for t in 0..=top {
                for u in 0..=top - t {
                    for v in 0..=top - t - u {
                        if t + u + v == 0 {
                            continue;
                        }
                        // Lower whichever index is nonzero first.
                        let (k, x, prev, prev2) = if t > 0 {
                            (
                                t - 1,
                                pc[0],
                                self.at(n + 1, t - 1, u, v),
                                (t >= 2).then(|| self.at(n + 1, t - 2, u, v)),
                            )
                        } else if u > 0 {
                            (
                                u - 1,
                                pc[1],
                                self.at(n + 1, t, u - 1, v),
                                (u >= 2).then(|| self.at(n + 1, t, u - 2, v)),
                            )
                        } else {
                            (
                                v - 1,
                                pc[2],
                                self.at(n + 1, t, u, v - 1),
                                (v >= 2).then(|| self.at(n + 1, t, u, v - 2)),
                            )
                        };
                        let mut r = x * self.work[prev];
                        if let Some(p2) = prev2 {
                            r += k as f64 * self.work[p2];
                        }
                        let i = self.at(n, t, u, v);
                        self.work[i] = r;
                    }
                }
            }
        }
        let s = l + 1;
        for t in 0..=l {
            for u in 0..=l - t {
                for v in 0..=l - t - u {
                    self.sum[(t * s + u) * s + v] += weight * self.work[self.at(0, t, u, v)];
                }
            }
        }
    }

    /// The accumulated Σ_C w_C R^0_tuv.
    #[inline]
    pub fn get(&self, t: usize, u: usize, v: usize) -> f64 {
        let s = self.l + 1;
        self.sum[(t * s + u) * s + v]
    }
}
