//! The contracted shell-quartet kernel, McMurchie–Davidson form (Helgaker,
//! Jørgensen, Olsen, eq. 9.9.33):
//!
//! (ab|cd) = Σ_prims 2π^(5/2) / (pq √(p+q)) Σ_tuv E^{ab}_tuv Σ_τνφ (−1)^(τ+ν+φ)
//!           E^{cd}_τνφ R_(t+τ)(u+ν)(v+φ)(α, P − Q),   α = pq/(p+q).
//!
//! For one outer primitive pair the inner primitive pairs are summed into
//! H_tuv,cd = Σ_inner Σ_τνφ R_(t+τ,…) E^{cd}_τνφ, then H is contracted once with the
//! outer E; both steps are dot products over Hermite indices, which the
//! function-major expansions of `pair` keep contiguous. Which pair goes outside is
//! chosen per quartet from the operation counts (`ShellPair::cost_outside`);
//! (ab|cd) = (cd|ab) makes both orders valid. Primitive pairs carry their own
//! Schwarz bounds, sorted, so the loops stop at the first negligible primitive
//! quartet. All work arrays live in a per-thread `Scratch`: nothing is allocated
//! per quartet.

use std::f64::consts::PI;

use super::hermite_r::{MAX_PAIR, RScratch, SUM_STRIDE, TABLES, nherm};
use super::pair::ShellPair;
use crate::basis::GaussianShell;
use crate::error::Result;

/// Most function products of one pair: two Cartesian f shells.
const MAX_NF: usize = 100;

/// Work space of one thread.
pub struct Scratch {
    r: RScratch,
    h: Vec<f64>,
    out: Vec<f64>,
    swapped: Vec<f64>,
}

impl Default for Scratch {
    fn default() -> Self {
        Scratch {
            r: RScratch::default(),
            h: vec![0.0; nherm(MAX_PAIR) * MAX_NF],
            out: vec![0.0; MAX_NF * MAX_NF],
            swapped: vec![0.0; MAX_NF * MAX_NF],
        }
    }
}

/// (ab|cd) for every function quartet, row-major [fa][fb][fc][fd] (that is
/// [bra product][ket product]). The slice lives in `scratch` until the next call.
///
/// Primitive quartets whose Schwarz bound (product of the primitive pairs'
/// `bound`s) is below `eps` are left out, so each integral is within
/// eps × (number of primitive quartets) of the full sum; `eps` = 0 keeps all.
pub fn contract<'s>(
    bra: &ShellPair,
    ket: &ShellPair,
    eps: f64,
    scratch: &'s mut Scratch,
) -> &'s [f64] {
    let n = bra.nf * ket.nf;
    if n == 0 {
        return &[];
    }
    if bra.cost_outside(ket) <= ket.cost_outside(bra) {
        kernel(
            bra,
            ket,
            eps,
            &mut scratch.out,
            &mut scratch.h,
            &mut scratch.r,
        );
    } else {
        kernel(
            ket,
            bra,
            eps,
            &mut scratch.swapped,
            &mut scratch.h,
            &mut scratch.r,
        );
        for i in 0..bra.nf {
            for k in 0..ket.nf {
                scratch.out[i * ket.nf + k] = scratch.swapped[k * bra.nf + i];
            }
        }
    }
    &scratch.out[..n]
}

/// Max over function products of √(ab|ab): the Schwarz bound of a pair.
pub(crate) fn self_bound(p: &ShellPair, scratch: &mut Scratch) -> f64 {
    let block = contract(p, p, 0.0, scratch);
    (0..p.nf)
        .map(|k| block[k * p.nf + k])
        .fold(0.0f64, f64::max)
        .sqrt()
}

/// 2π^(5/2).
const TWO_PI_52: f64 = 2.0 * PI * PI * 1.772_453_850_905_516;

fn kernel(
    x: &ShellPair,
    y: &ShellPair,
    eps: f64,
    out: &mut [f64],
    h: &mut [f64],
    r: &mut RScratch,
) {
    let (nfx, nfy, nhx, nhy) = (x.nf, y.nf, x.nh, y.nh);
    let l = x.l + y.l;
    let out = &mut out[..nfx * nfy];
    out.fill(0.0);
    // H[fy][a], a over the outer pair's Hermite functions.
    let h = &mut h[..nfy * nhx];
    let sum = &TABLES.sum;
    let mut g = [0.0; nherm(MAX_PAIR)];
    let g = &mut g[..nhy];
    let ybest = y.prims.first().map_or(0.0, |p| p.bound);
    for (i, pi) in x.prims.iter().enumerate() {
        // Both lists are sorted by bound, largest first: the rest is negligible.
        if pi.bound * ybest < eps {
            break;
        }
        h.fill(0.0);
        for (k, pk) in y.prims.iter().enumerate() {
            if pi.bound * pk.bound < eps {
                break;
            }
            let pq = std::array::from_fn(|d| pi.center[d] - pk.center[d]);
            let s = pi.p + pk.p;
            let rv = r.compute(l, pi.p * pk.p / s, pq, TWO_PI_52 / s.sqrt());
            let ey = &y.e_ket[k * nfy * nhy..(k + 1) * nfy * nhy];
            // With an s-type pair on either side the index sums are the identity.
            if nhy == 1 {
                for (hrow, &e) in h.chunks_exact_mut(nhx).zip(ey) {
                    for (hv, &rv) in hrow.iter_mut().zip(rv) {
                        *hv += rv * e;
                    }
                }
                continue;
            }
            if nhx == 1 {
                for (hv, erow) in h.iter_mut().zip(ey.chunks_exact(nhy)) {
                    *hv += dot(&rv[..nhy], erow);
                }
                continue;
            }
            for a in 0..nhx {
                // R_(a+b) for every inner Hermite index b, then one dot product per
                // inner function product.
                let idx = &sum[a * SUM_STRIDE..a * SUM_STRIDE + nhy];
                for (gv, &j) in g.iter_mut().zip(idx) {
                    *gv = rv[j as usize];
                }
                for (hv, erow) in h[a..].iter_mut().step_by(nhx).zip(ey.chunks_exact(nhy)) {
                    *hv += dot(g, erow);
                }
            }
        }
        let ex = &x.e[i * nfx * nhx..(i + 1) * nfx * nhx];
        for (orow, erow) in out.chunks_exact_mut(nfy).zip(ex.chunks_exact(nhx)) {
            for (o, hrow) in orow.iter_mut().zip(h.chunks_exact(nhx)) {
                *o += dot(erow, hrow);
            }
        }
    }
}

/// Σ a_k b_k with four partial sums, so the compiler can keep them in registers
/// and vectorise.
#[inline(always)]
fn dot(a: &[f64], b: &[f64]) -> f64 {
    let n = a.len().min(b.len());
    let (a, b) = (&a[..n], &b[..n]);
    let mut acc = [0.0; 4];
    let (ca, cb) = (a.chunks_exact(4), b.chunks_exact(4));
    let (ra, rb) = (ca.remainder(), cb.remainder());
    for (x, y) in ca.zip(cb) {
        for k in 0..4 {
            acc[k] += x[k] * y[k];
        }
    }
    let mut s = (acc[0] + acc[1]) + (acc[2] + acc[3]);
    for (x, y) in ra.iter().zip(rb) {
        s += x * y;
    }
    s
}

/// (ab|cd) over the functions of four shells, [fa][fb][fc][fd] row-major: the
/// one-quartet entry point (tests, checks); bulk work goes through `ShellPair`s.
pub fn eri_quartet(
    a: &GaussianShell,
    b: &GaussianShell,
    c: &GaussianShell,
    d: &GaussianShell,
) -> Result<Vec<f64>> {
    for s in [a, b, c, d] {
        super::check_shell(s)?;
    }
    let (bra, ket) = (ShellPair::new(a, b), ShellPair::new(c, d));
    let mut scratch = Scratch::default();
    Ok(contract(&bra, &ket, 0.0, &mut scratch).to_vec())
}
