//! Gaussian values on tiles of an axis-aligned slab, by separability:
//! e^(−αr²) = e^(−αx²) e^(−αy²) e^(−αz²). The per-axis tables are built once per
//! thread and grid for every primitive (ny + nz exponentials each), then every tile adds, line
//! segment by line segment, exactly the terms `GaussianShell::values_lattice` adds
//! for its points, in the same order and with the same screening, so each value is
//! the same to the bit.

mod fused;

use super::TILE;
use crate::basis::Shell;
use crate::basis::gaussian::{CARTESIAN, SCREEN};
use crate::basis::slater::{exp_neg, powers};
pub(super) use fused::{MAX_ORBITALS, Terms};

/// One primitive's slab tables.
#[derive(Debug, Clone, Copy, Default)]
struct Prim {
    xpow: [f64; 4],
    /// Start of the y table ((l+1) × ny), then the z table ((l+1) × nz), in `data`.
    y: usize,
    z: usize,
    /// Start of the per-line "not screened" flags in `ok`.
    line: usize,
}

/// Axis tables of one primitive: they depend on the lattice lines, not on the slab.
#[derive(Debug, Clone, Copy, Default)]
struct Axes {
    y: usize,
    z: usize,
    /// Start of max_b |ytab[b][j]| per line in `data`.
    ymax: usize,
    zmax: f64,
}

/// Tables of every Gaussian primitive: the y and z tables are built once per
/// sampler and lattice (the same exponentials every slab of a grid recomputed
/// before), the x factors and the screening of lines once per slab.
#[derive(Debug, Default)]
pub(super) struct Tables {
    /// Which sampler and lattice lines `data` and `axes` belong to.
    owner: u64,
    /// Counts `fill` calls: names the slab the per-slab tables belong to (the fused
    /// path keeps a line's gathered terms while they are this slab's).
    generation: u64,
    ys: Vec<u64>,
    zs: Vec<u64>,
    data: Vec<f64>,
    axes: Vec<Axes>,
    ok: Vec<bool>,
    prims: Vec<Prim>,
    /// prims[first[k]..first[k + 1]] belong to shell k.
    first: Vec<usize>,
    ny: usize,
    nz: usize,
}

fn bits(v: &[f64]) -> impl Iterator<Item = u64> + '_ {
    v.iter().map(|t| t.to_bits())
}

impl Tables {
    pub(super) fn bytes(&self) -> usize {
        8 * (self.data.capacity() + self.ys.capacity() + self.zs.capacity())
            + self.ok.capacity()
            + std::mem::size_of::<Axes>() * self.axes.capacity()
            + std::mem::size_of::<Prim>() * self.prims.capacity()
            + 8 * self.first.capacity()
    }

    /// The axis tables of every primitive of `shells` on these lines.
    fn build_axes(&mut self, owner: u64, shells: &[Shell], ys: &[f64], zs: &[f64]) {
        let (ny, nz) = (ys.len(), zs.len());
        (self.owner, self.ny, self.nz) = (owner, ny, nz);
        self.ys = bits(ys).collect();
        self.zs = bits(zs).collect();
        self.data.clear();
        self.axes.clear();
        for shell in shells {
            let Shell::Gaussian(g) = shell else { continue };
            let l = g.l as usize;
            for (alpha, _) in &g.primitives {
                let (y, z) = (self.data.len(), self.data.len() + (l + 1) * ny);
                let ymax = z + (l + 1) * nz;
                self.data.resize(ymax + ny, 0.0);
                fill_axis(&mut self.data[y..z], ys, g.center[1], *alpha, l);
                fill_axis(&mut self.data[z..ymax], zs, g.center[2], *alpha, l);
                let zmax = self.data[z..ymax]
                    .iter()
                    .fold(0.0f64, |m, v| m.max(v.abs()));
                for j in 0..ny {
                    self.data[ymax + j] =
                        (0..=l).fold(0.0f64, |m, b| m.max(self.data[y + b * ny + j].abs()));
                }
                self.axes.push(Axes { y, z, ymax, zmax });
            }
        }
    }

    /// Prepares the slab at `x` with lines along z at `ys`, for the sampler `owner`.
    pub(super) fn fill(&mut self, owner: u64, shells: &[Shell], x: f64, ys: &[f64], zs: &[f64]) {
        let same = self.owner == owner
            && !self.axes.is_empty()
            && self.ys.iter().copied().eq(bits(ys))
            && self.zs.iter().copied().eq(bits(zs));
        if !same {
            self.build_axes(owner, shells, ys, zs);
        }
        let ny = self.ny;
        self.generation = self.generation.wrapping_add(1);
        self.ok.clear();
        self.prims.clear();
        self.first.clear();
        let mut q = 0;
        for shell in shells {
            self.first.push(self.prims.len());
            let Shell::Gaussian(g) = shell else { continue };
            let l = g.l as usize;
            let dx = x - g.center[0];
            let px = powers(dx);
            for ((alpha, _), d) in g.primitives.iter().zip(&g.d) {
                let axes = self.axes[q];
                q += 1;
                let ex = d * exp_neg(-alpha * dx * dx);
                let mut xpow = [0.0; 4];
                for a in 0..=l {
                    xpow[a] = ex * px[a];
                }
                let xmax = xpow[..=l].iter().fold(0.0f64, |m, v| m.max(v.abs()));
                if xmax < SCREEN {
                    continue;
                }
                let line = self.ok.len();
                for j in 0..ny {
                    let screened = xmax * self.data[axes.ymax + j] * axes.zmax < SCREEN;
                    self.ok.push(!screened);
                }
                self.prims.push(Prim {
                    xpow,
                    y: axes.y,
                    z: axes.z,
                    line,
                });
            }
        }
        self.first.push(self.prims.len());
    }

    /// Values of every Gaussian shell at slab points p0..p0+n into `phi`
    /// (functions × TILE), and whether each function got any nonzero term.
    pub(super) fn tile(
        &self,
        shells: &[Shell],
        offsets: &[usize],
        p0: usize,
        n: usize,
        phi: &mut [f64],
        live: &mut [bool],
    ) {
        #[cfg(target_arch = "x86_64")]
        if std::arch::is_x86_feature_detected!("avx") {
            // SAFETY: the CPU supports AVX, checked just above.
            return unsafe { self.tile_avx(shells, offsets, p0, n, phi, live) };
        }
        self.tile_any(shells, offsets, p0, n, phi, live)
    }

    /// `tile_any` compiled with 4-wide AVX multiplies and adds: the same IEEE 754
    /// operations in the same order (no fused multiply-add), twice the width.
    #[cfg(target_arch = "x86_64")]
    #[target_feature(enable = "avx")]
    fn tile_avx(
        &self,
        shells: &[Shell],
        offsets: &[usize],
        p0: usize,
        n: usize,
        phi: &mut [f64],
        live: &mut [bool],
    ) {
        self.tile_any(shells, offsets, p0, n, phi, live)
    }

    /// Each function's value on each line segment of the tile is summed in
    /// registers from its terms w · z-table, in the order `values_lattice` adds
    /// them (primitive, then Cartesian component), starting from 0.0: the same
    /// additions as zeroing the row and adding term by term, without the zeroing
    /// pass and the reloads of the row.
    #[inline(always)]
    fn tile_any(
        &self,
        shells: &[Shell],
        offsets: &[usize],
        p0: usize,
        n: usize,
        phi: &mut [f64],
        live: &mut [bool],
    ) {
        let (ny, nz) = (self.ny, self.nz);
        let (j0, j1) = (p0 / nz, (p0 + n - 1) / nz + 1);
        let mut terms = [(0.0f64, 0usize); MAX_TERMS];
        for (k, (shell, &o)) in shells.iter().zip(offsets).enumerate() {
            let Shell::Gaussian(g) = shell else { continue };
            let rows = &mut phi[o * TILE..(o + g.len()) * TILE];
            let comps = CARTESIAN[g.l as usize];
            let prims = &self.prims[self.first[k]..self.first[k + 1]];
            let mut any = false;
            for j in j0..j1 {
                let k0 = p0.max(j * nz) - j * nz;
                let k1 = (p0 + n).min((j + 1) * nz) - j * nz;
                let t0 = j * nz + k0 - p0;
                for (f, row) in g.rows.iter().enumerate() {
                    let dst = &mut rows[f * TILE + t0..][..k1 - k0];
                    let (mut nt, mut fresh) = (0, true);
                    for p in prims {
                        if !self.ok[p.line + j] {
                            continue;
                        }
                        for (ci, c) in comps.iter().enumerate() {
                            let coef =
                                p.xpow[c[0] as usize] * self.data[p.y + c[1] as usize * ny + j];
                            if coef == 0.0 {
                                continue;
                            }
                            let w = row[ci] * coef;
                            if w != 0.0 {
                                if nt == MAX_TERMS {
                                    sum_terms(&terms, &self.data, dst, fresh);
                                    (nt, fresh) = (0, false);
                                }
                                terms[nt] = (w, p.z + c[2] as usize * nz + k0);
                                nt += 1;
                            }
                        }
                    }
                    any |= nt > 0 || !fresh;
                    if nt > 0 || fresh {
                        sum_terms(&terms[..nt], &self.data, dst, fresh);
                    }
                }
            }
            live[o..o + g.len()].fill(any);
        }
    }
}

/// Terms gathered before they are summed into a row segment; more are summed in
/// several rounds (the partial sums stored and reloaded, which changes no bits).
const MAX_TERMS: usize = 32;

/// dst[t] = (((start + w₁ z₁[t]) + w₂ z₂[t]) + …) for the terms (w, start of the z
/// row in `data`), with start 0.0 when `fresh`, else dst's own value; eight points at
/// a time in registers.
#[inline(always)]
fn sum_terms(terms: &[(f64, usize)], data: &[f64], dst: &mut [f64], fresh: bool) {
    const W: usize = 8;
    let len = dst.len();
    let mut k = 0;
    while k + W <= len {
        let mut acc = [0.0f64; W];
        if !fresh {
            acc.copy_from_slice(&dst[k..k + W]);
        }
        for &(w, z) in terms {
            let zv: &[f64; W] = data[z + k..z + k + W].try_into().expect("eight values");
            for q in 0..W {
                acc[q] += w * zv[q];
            }
        }
        dst[k..k + W].copy_from_slice(&acc);
        k += W;
    }
    for (t, o) in dst.iter_mut().enumerate().skip(k) {
        let mut acc = if fresh { 0.0 } else { *o };
        for &(w, z) in terms {
            acc += w * data[z + t];
        }
        *o = acc;
    }
}

/// table[p·len + i] = (t_i − c)^p e^(−α (t_i − c)²) for p = 0..=l, as
/// `GaussianShell::values_lattice` fills it.
fn fill_axis(table: &mut [f64], ts: &[f64], c: f64, alpha: f64, l: usize) {
    let len = ts.len();
    for (i, t) in ts.iter().enumerate() {
        let d = t - c;
        let mut v = exp_neg(-alpha * d * d);
        for p in 0..=l {
            table[p * len + i] = v;
            v *= d;
        }
    }
}
