//! Hermite Coulomb integrals R_tuv(α, PQ) for one primitive quartet, up to
//! t + u + v ≤ 12 (four f shells), in a compact degree-ordered index.
//!
//! Why not `hermite::HermiteCoulomb`: that table is sized for one-electron work
//! (L ≤ 6), indexes a full cube and accumulates over nuclei. Here one call per
//! primitive quartet is the hot path, so the recursion walks precomputed index
//! tables over the C(L+3, 3) needed entries only, with no allocation.
//!
//! Recurrence (McMurchie & Davidson, J. Comput. Phys. 26, 218 (1978); Helgaker,
//! Jørgensen, Olsen, ch. 9.9): R^n_000 = (−2α)^n F_n(α |PQ|²),
//! R^n_(t+1)uv = t R^(n+1)_(t−1)uv + X_PQ R^(n+1)_tuv, likewise in u and v.

use std::sync::LazyLock;

use crate::integrals::boys::boys;
use crate::integrals::hermite::MAX_L;

/// Highest total Hermite order of a quartet.
pub const MAX_R: usize = 4 * MAX_L;
/// Highest Hermite order of one shell pair.
pub const MAX_PAIR: usize = 2 * MAX_L;

/// Number of (t, u, v) with t + u + v ≤ l.
pub const fn nherm(l: usize) -> usize {
    (l + 1) * (l + 2) * (l + 3) / 6
}

const NR: usize = nherm(MAX_R);
const NP: usize = nherm(MAX_PAIR);

/// One step of the recurrence for a compact index: raise direction `dir` from the
/// entry `from` (the index lowered by one), adding `coef` × the entry `from2`
/// (lowered by two; any valid index when `coef` is 0).
#[derive(Clone, Copy)]
struct Step {
    coef: f64,
    from: u16,
    from2: u16,
    dir: u8,
}

/// Work buffers are a power of two long so that masked indices need no bounds
/// checks in the recursion (every index is below `NR` anyway).
const BUF: usize = NR.next_power_of_two();

pub(crate) struct Tables {
    /// (t, u, v) of each compact index, ordered by t + u + v.
    pub tuv: Vec<[usize; 3]>,
    steps: Vec<Step>,
    /// index(tuv_a + tuv_b) for a, b < nherm(MAX_PAIR), row-major over a.
    pub sum: Vec<u16>,
}

pub(crate) static TABLES: LazyLock<Tables> = LazyLock::new(|| {
    let mut tuv = Vec::with_capacity(NR);
    for l in 0..=MAX_R {
        for t in (0..=l).rev() {
            for u in (0..=l - t).rev() {
                tuv.push([t, u, l - t - u]);
            }
        }
    }
    let side = MAX_R + 1;
    let mut index = vec![usize::MAX; side * side * side];
    for (i, c) in tuv.iter().enumerate() {
        index[(c[0] * side + c[1]) * side + c[2]] = i;
    }
    let at = |c: [usize; 3]| index[(c[0] * side + c[1]) * side + c[2]];
    let steps = tuv
        .iter()
        .map(|c| {
            let Some(dir) = c.iter().position(|&k| k > 0) else {
                return Step {
                    dir: 0,
                    from: 0,
                    from2: 0,
                    coef: 0.0,
                };
            };
            let mut down = *c;
            down[dir] -= 1;
            let k = down[dir];
            let mut down2 = down;
            let from2 = if k > 0 {
                down2[dir] -= 1;
                at(down2)
            } else {
                0
            };
            Step {
                dir: dir as u8,
                from: at(down) as u16,
                from2: from2 as u16,
                coef: k as f64,
            }
        })
        .collect();
    let mut sum = vec![0u16; NP * NP];
    for a in 0..NP {
        for b in 0..NP {
            let (x, y) = (tuv[a], tuv[b]);
            sum[a * NP + b] = at([x[0] + y[0], x[1] + y[1], x[2] + y[2]]) as u16;
        }
    }
    Tables { tuv, steps, sum }
});

/// Row stride of `Tables::sum`.
pub const SUM_STRIDE: usize = NP;

/// Work space for one thread: two recurrence levels and the Boys values.
pub struct RScratch {
    a: [f64; BUF],
    b: [f64; BUF],
    f: [f64; MAX_R + 1],
}

impl Default for RScratch {
    fn default() -> Self {
        RScratch {
            a: [0.0; BUF],
            b: [0.0; BUF],
            f: [0.0; MAX_R + 1],
        }
    }
}

impl RScratch {
    /// scale · R^0_tuv(α, PQ) for t + u + v ≤ l, in compact order.
    pub fn compute(&mut self, l: usize, alpha: f64, pq: [f64; 3], scale: f64) -> &[f64] {
        debug_assert!(l <= MAX_R);
        let r2 = pq[0] * pq[0] + pq[1] * pq[1] + pq[2] * pq[2];
        boys(alpha * r2, &mut self.f[..=l]);
        // The two smallest orders, most of the primitive quartets of a contracted
        // basis, written out.
        if l == 0 {
            self.a[0] = scale * self.f[0];
            return &self.a[..1];
        }
        if l == 1 {
            let r1 = -2.0 * alpha * scale * self.f[1];
            // Compact order of degree 1 is (1,0,0), (0,1,0), (0,0,1).
            self.a[..4].copy_from_slice(&[scale * self.f[0], pq[0] * r1, pq[1] * r1, pq[2] * r1]);
            return &self.a[..4];
        }
        let mut pow = [0.0; MAX_R + 1];
        pow[0] = scale;
        for n in 0..l {
            pow[n + 1] = pow[n] * (-2.0 * alpha);
        }
        let steps = &TABLES.steps;
        let pq4 = [pq[0], pq[1], pq[2], 0.0];
        let (mut cur, mut next) = (&mut self.a, &mut self.b);
        cur[0] = pow[l] * self.f[l];
        for n in (0..l).rev() {
            next[0] = pow[n] * self.f[n];
            let m = nherm(l - n).min(BUF);
            for (x, s) in next[1..m].iter_mut().zip(&steps[1..m]) {
                *x = pq4[s.dir as usize & 3] * cur[s.from as usize & (BUF - 1)]
                    + s.coef * cur[s.from2 as usize & (BUF - 1)];
            }
            std::mem::swap(&mut cur, &mut next);
        }
        &cur[..nherm(l)]
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::integrals::hermite::HermiteCoulomb;

    /// The compact recursion against the cube-indexed one of the one-electron code
    /// (an independent implementation of the same recurrence), L ≤ 6.
    #[test]
    fn agrees_with_the_one_electron_table() {
        let mut s = RScratch::default();
        let (alpha, pq) = (0.83, [0.4, -1.1, 0.7]);
        for l in 0..=MAX_PAIR {
            let r = s.compute(l, alpha, pq, 1.0).to_vec();
            let mut h = HermiteCoulomb::new(l);
            h.clear();
            h.add(1.0, alpha, pq);
            for (i, c) in TABLES.tuv.iter().take(nherm(l)).enumerate() {
                let want = h.get(c[0], c[1], c[2]);
                assert!((r[i] - want).abs() <= 1e-13 * want.abs().max(1e-3), "{c:?}");
            }
        }
    }
}
