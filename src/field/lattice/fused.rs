//! Orbitals straight from the lattice tables, for samplers whose fields need only a
//! few orbitals (an orbital, its density, a small density) of an all-Gaussian basis:
//! each function's value on eight points is summed in registers and at once added,
//! times its coefficients, to the orbitals, so the tile's basis values (functions ×
//! points, larger than the first-level cache for a benzene-sized basis) are never
//! stored and read back.
//!
//! The same bits as the two-step path: each φ_μ is the same sum of the same terms
//! from 0.0 (`tile_any`), and each ψ_i the sum of c_iμ φ_μ from 0.0 in increasing μ
//! (`combine`). Functions with no term on a line are left out there; on the
//! two-step path they add c·0 = ±0, which leaves a partial sum that starts at +0.0
//! unchanged (IEEE 754 round-to-nearest: x + ±0 = x for x ≠ −0, and such a sum is
//! never −0).

use super::super::TILE;
use super::Tables;
use crate::basis::Shell;
use crate::basis::gaussian::CARTESIAN;

/// The most orbitals this path accumulates in registers (4 × 8 doubles).
pub(in crate::field) const MAX_ORBITALS: usize = 4;

/// Terms of one line segment: (w, start of its z row in `data`), and per function
/// with any term (function, first term, end of its terms).
#[derive(Debug, Default)]
pub(in crate::field) struct Terms {
    terms: Vec<(f64, usize)>,
    funcs: Vec<(usize, usize, usize)>,
    /// The (slab generation, line) these terms were gathered for, from the line's
    /// first point: a line cut into several tiles is gathered once.
    line: Option<(u64, usize)>,
}

impl Terms {
    pub(in crate::field) fn bytes(&self) -> usize {
        16 * self.terms.capacity() + 24 * self.funcs.capacity()
    }
}

impl Tables {
    /// ψ_i at slab points p0..p0+n into psi[i·TILE + t] for the `norb` (1 to
    /// `MAX_ORBITALS`) orbitals with coefficients coef[μ·norb + i]; every shell
    /// must be Gaussian.
    #[allow(clippy::too_many_arguments)]
    pub(in crate::field) fn tile_orbitals(
        &self,
        shells: &[Shell],
        offsets: &[usize],
        coef: &[f64],
        norb: usize,
        p0: usize,
        n: usize,
        work: &mut Terms,
        psi: &mut [f64],
    ) {
        #[cfg(target_arch = "x86_64")]
        if std::arch::is_x86_feature_detected!("avx") {
            // SAFETY: the CPU supports AVX, checked just above.
            return unsafe { self.orbitals_avx(shells, offsets, coef, norb, p0, n, work, psi) };
        }
        self.orbitals_any(shells, offsets, coef, norb, p0, n, work, psi)
    }

    /// `orbitals_any` with 4-wide AVX multiplies and adds (no fused multiply-add).
    #[cfg(target_arch = "x86_64")]
    #[target_feature(enable = "avx")]
    #[allow(clippy::too_many_arguments)]
    fn orbitals_avx(
        &self,
        shells: &[Shell],
        offsets: &[usize],
        coef: &[f64],
        norb: usize,
        p0: usize,
        n: usize,
        work: &mut Terms,
        psi: &mut [f64],
    ) {
        self.orbitals_any(shells, offsets, coef, norb, p0, n, work, psi)
    }

    #[inline(always)]
    #[allow(clippy::too_many_arguments)]
    fn orbitals_any(
        &self,
        shells: &[Shell],
        offsets: &[usize],
        coef: &[f64],
        norb: usize,
        p0: usize,
        n: usize,
        work: &mut Terms,
        psi: &mut [f64],
    ) {
        let nz = self.nz;
        let (j0, j1) = (p0 / nz, (p0 + n - 1) / nz + 1);
        for j in j0..j1 {
            let k0 = p0.max(j * nz) - j * nz;
            let k1 = (p0 + n).min((j + 1) * nz) - j * nz;
            let t0 = j * nz + k0 - p0;
            if work.line != Some((self.generation, j)) {
                self.gather(shells, offsets, j, work);
                work.line = Some((self.generation, j));
            }
            let at = |k: usize| (k0 + k, t0 + k);
            match norb {
                1 => segment::<1>(&self.data, work, coef, k1 - k0, at, psi),
                2 => segment::<2>(&self.data, work, coef, k1 - k0, at, psi),
                3 => segment::<3>(&self.data, work, coef, k1 - k0, at, psi),
                4 => segment::<4>(&self.data, work, coef, k1 - k0, at, psi),
                _ => unreachable!("at most {MAX_ORBITALS} orbitals on this path"),
            }
        }
    }

    /// The terms of every function on line j, with the screening and the zero tests
    /// of `tile_any`, in its order.
    #[inline(always)]
    fn gather(&self, shells: &[Shell], offsets: &[usize], j: usize, work: &mut Terms) {
        let (ny, nz) = (self.ny, self.nz);
        work.terms.clear();
        work.funcs.clear();
        for (sk, (shell, &o)) in shells.iter().zip(offsets).enumerate() {
            let Shell::Gaussian(g) = shell else { continue };
            let comps = CARTESIAN[g.l as usize];
            let prims = &self.prims[self.first[sk]..self.first[sk + 1]];
            for (f, row) in g.rows.iter().enumerate() {
                let a = work.terms.len();
                for p in prims {
                    if !self.ok[p.line + j] {
                        continue;
                    }
                    for (ci, c) in comps.iter().enumerate() {
                        let coef = p.xpow[c[0] as usize] * self.data[p.y + c[1] as usize * ny + j];
                        if coef == 0.0 {
                            continue;
                        }
                        let w = row[ci] * coef;
                        if w != 0.0 {
                            work.terms.push((w, p.z + c[2] as usize * nz));
                        }
                    }
                }
                if work.terms.len() > a {
                    work.funcs.push((o + f, a, work.terms.len()));
                }
            }
        }
    }
}

/// One line segment of `len` points: blocks of eight, then one point at a time;
/// `at(k)` is (point along the z rows, point in the tile).
#[inline(always)]
fn segment<const NO: usize>(
    data: &[f64],
    work: &Terms,
    coef: &[f64],
    len: usize,
    at: impl Fn(usize) -> (usize, usize),
    psi: &mut [f64],
) {
    let mut k = 0;
    // Fewer orbitals leave registers for more points (24 for one, 16 for two): more
    // independent sums in flight per term (the same operations on each point).
    if NO == 1 {
        while k + 24 <= len {
            block::<NO, 24>(data, work, coef, at(k), psi);
            k += 24;
        }
    }
    if NO <= 2 {
        while k + 16 <= len {
            block::<NO, 16>(data, work, coef, at(k), psi);
            k += 16;
        }
    }
    while k + 8 <= len {
        block::<NO, 8>(data, work, coef, at(k), psi);
        k += 8;
    }
    while k < len {
        block::<NO, 1>(data, work, coef, at(k), psi);
        k += 1;
    }
}

/// ψ on W points: φ_μ = Σ w z from 0.0 per function, ψ_i = Σ_μ c_iμ φ_μ from 0.0.
#[inline(always)]
fn block<const NO: usize, const W: usize>(
    data: &[f64],
    work: &Terms,
    coef: &[f64],
    (k, t): (usize, usize),
    psi: &mut [f64],
) {
    let mut acc = [[0.0f64; W]; NO];
    for &(m, a, b) in &work.funcs {
        let mut phi = [0.0f64; W];
        for &(w, z) in &work.terms[a..b] {
            let zv: &[f64; W] = data[z + k..z + k + W].try_into().expect("W values");
            for q in 0..W {
                phi[q] += w * zv[q];
            }
        }
        let c: &[f64; NO] = coef[m * NO..m * NO + NO].try_into().expect("NO values");
        for o in 0..NO {
            for q in 0..W {
                acc[o][q] += c[o] * phi[q];
            }
        }
    }
    for (o, a) in acc.iter().enumerate() {
        psi[o * TILE + t..o * TILE + t + W].copy_from_slice(a);
    }
}
