//! The contracted shell-quartet kernel, McMurchie–Davidson form (Helgaker,
//! Jørgensen, Olsen, eq. 9.9.33):
//!
//! (ab|cd) = Σ_prims 2π^(5/2) / (pq √(p+q)) Σ_tuv E^{ab}_tuv Σ_τνφ (−1)^(τ+ν+φ)
//!           E^{cd}_τνφ R_(t+τ)(u+ν)(v+φ)(α, P − Q),   α = pq/(p+q).
//!
//! For one outer primitive pair the inner primitive pairs are summed into
//! H_tuv,cd = Σ_inner Σ_τνφ R_(t+τ,…) E^{cd}_τνφ, then H is contracted once with the
//! outer E. Which pair goes outside is chosen per quartet from the operation
//! counts (`ShellPair::cost_outside`); (ab|cd) = (cd|ab) makes both orders valid.
//! All work arrays live in a per-thread `Scratch`: nothing is allocated per quartet.

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
pub fn contract<'s>(bra: &ShellPair, ket: &ShellPair, scratch: &'s mut Scratch) -> &'s [f64] {
    let n = bra.nf * ket.nf;
    if n == 0 {
        return &[];
    }
    if bra.cost_outside(ket) <= ket.cost_outside(bra) {
        kernel(bra, ket, &mut scratch.out, &mut scratch.h, &mut scratch.r);
    } else {
        kernel(
            ket,
            bra,
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

/// 2π^(5/2).
const TWO_PI_52: f64 = 2.0 * PI * PI * 1.772_453_850_905_516;

fn kernel(x: &ShellPair, y: &ShellPair, out: &mut [f64], h: &mut [f64], r: &mut RScratch) {
    let (nfx, nfy, nhx, nhy) = (x.nf, y.nf, x.nh, y.nh);
    let l = x.l + y.l;
    let out = &mut out[..nfx * nfy];
    out.fill(0.0);
    let h = &mut h[..nhx * nfy];
    let sum = &TABLES.sum;
    for (i, pi) in x.prims.iter().enumerate() {
        h.fill(0.0);
        for (k, pk) in y.prims.iter().enumerate() {
            let pq = std::array::from_fn(|d| pi.center[d] - pk.center[d]);
            let s = pi.p + pk.p;
            let rv = r.compute(l, pi.p * pk.p / s, pq, TWO_PI_52 / s.sqrt());
            let ey = &y.e_ket[k * nhy * nfy..(k + 1) * nhy * nfy];
            if nfy == 1 {
                for (a, hv) in h.iter_mut().enumerate() {
                    let idx = &sum[a * SUM_STRIDE..a * SUM_STRIDE + nhy];
                    *hv += idx
                        .iter()
                        .zip(ey)
                        .map(|(&j, e)| rv[j as usize] * e)
                        .sum::<f64>();
                }
                continue;
            }
            for (a, hrow) in h.chunks_exact_mut(nfy).enumerate() {
                let idx = &sum[a * SUM_STRIDE..a * SUM_STRIDE + nhy];
                for (&j, erow) in idx.iter().zip(ey.chunks_exact(nfy)) {
                    let w = rv[j as usize];
                    for (hv, ev) in hrow.iter_mut().zip(erow) {
                        *hv += w * ev;
                    }
                }
            }
        }
        let ex = &x.e[i * nhx * nfx..(i + 1) * nhx * nfx];
        for (erow, hrow) in ex.chunks_exact(nfx).zip(h.chunks_exact(nfy)) {
            for (&w, orow) in erow.iter().zip(out.chunks_exact_mut(nfy)) {
                if w != 0.0 {
                    for (o, hv) in orow.iter_mut().zip(hrow) {
                        *o += w * hv;
                    }
                }
            }
        }
    }
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
    Ok(contract(&bra, &ket, &mut scratch).to_vec())
}
