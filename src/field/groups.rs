//! Basis values of one tile of arbitrary points, shells grouped by what their
//! exponentials share: Slater shells with one centre and one ζ (a valence s and p)
//! share e^(−ζr), Gaussian shells with one centre and the same exponents (an sp
//! shell) share every e^(−α_k r²). Each shared value is the very number every member
//! computed on its own before, so the values are unchanged to the bit.

use super::TILE;
use super::scratch::{Scratch, at_least};
use crate::basis::Shell;
use crate::basis::slater::SCREEN_ZETA_R;
use crate::numerics::exp::exp_in_place;

/// e^(−x) is exactly 0 in binary64 for x beyond about 745.2; a tile where every
/// α r² exceeds this has Gaussian values that are exactly ±0 (IEEE 754 exp
/// underflow; the margin covers rounding of α r²).
const GAUSSIAN_UNDERFLOW: f64 = 760.0;

#[derive(Debug, Clone)]
pub(super) struct Group {
    center: [f64; 3],
    kind: Kind,
    /// (shell, its first function) of every member.
    members: Vec<(usize, usize)>,
}

#[derive(Debug, Clone, PartialEq)]
enum Kind {
    Slater(u64),
    /// The exponents' bits, and the smallest exponent.
    Gaussian(Vec<u64>, f64),
}

/// Groups shells whose centre and exponents are equal bit for bit.
pub(super) fn build(shells: &[Shell], offsets: &[usize]) -> Vec<Group> {
    let mut groups: Vec<Group> = Vec::new();
    for (k, (shell, &o)) in shells.iter().zip(offsets).enumerate() {
        let kind = match shell {
            Shell::Slater(s) => Kind::Slater(s.zeta.to_bits()),
            Shell::Gaussian(g) => Kind::Gaussian(
                g.exponents.iter().map(|a| a.to_bits()).collect(),
                g.exponents.iter().cloned().fold(f64::INFINITY, f64::min),
            ),
        };
        let center = shell.center();
        let same = |g: &&mut Group| {
            g.kind == kind && g.center.map(f64::to_bits) == center.map(f64::to_bits)
        };
        match groups.iter_mut().find(same) {
            Some(g) => g.members.push((k, o)),
            None => groups.push(Group {
                center,
                kind,
                members: vec![(k, o)],
            }),
        }
    }
    groups
}

/// Most primitives of any group (rows of the exponential table).
pub(super) fn max_primitives(groups: &[Group]) -> usize {
    groups
        .iter()
        .map(|g| match &g.kind {
            Kind::Slater(_) => 1,
            Kind::Gaussian(a, _) => a.len(),
        })
        .max()
        .unwrap_or(0)
}

/// The points of one tile: listed, or points p0..p0+n of an axis-aligned slab
/// (x, ys[j], zs[k]), k fastest, whose points are never listed.
#[derive(Clone, Copy)]
pub(super) enum At<'a> {
    Points(&'a [[f64; 3]]),
    Lattice {
        x: f64,
        ys: &'a [f64],
        zs: &'a [f64],
        p0: usize,
        n: usize,
    },
}

impl At<'_> {
    fn len(&self) -> usize {
        match *self {
            At::Points(p) => p.len(),
            At::Lattice { n, .. } => n,
        }
    }

    /// Offsets p − c of the points from a centre into `d`: the same subtractions of
    /// the same coordinates either way (a lattice point is (x, y_j, z_k) to the bit).
    fn offsets(&self, c: [f64; 3], d: &mut [[f64; 3]]) {
        match *self {
            At::Points(points) => {
                for (d, p) in d.iter_mut().zip(points) {
                    *d = [p[0] - c[0], p[1] - c[1], p[2] - c[2]];
                }
            }
            At::Lattice { x, ys, zs, p0, n } => {
                let nz = zs.len();
                let dx = x - c[0];
                let mut t = 0;
                while t < n {
                    let (j, k0) = ((p0 + t) / nz, (p0 + t) % nz);
                    let len = (nz - k0).min(n - t);
                    let dy = ys[j] - c[1];
                    for (d, z) in d[t..t + len].iter_mut().zip(&zs[k0..k0 + len]) {
                        *d = [dx, dy, z - c[2]];
                    }
                    t += len;
                }
            }
        }
    }
}

/// Fills `s.phi` (functions × TILE) and `s.live` for the points of one tile; with
/// `slater_only`, Gaussian shells are left to the lattice path.
pub(super) fn tile(groups: &[Group], shells: &[Shell], at: At, s: &mut Scratch, slater_only: bool) {
    let n = at.len();
    debug_assert!(n <= TILE);
    at_least(&mut s.d, TILE);
    at_least(&mut s.r, TILE);
    for g in groups {
        if slater_only && matches!(g.kind, Kind::Gaussian(..)) {
            continue;
        }
        at.offsets(g.center, &mut s.d[..n]);
        let d = &s.d[..n];
        let live = match &g.kind {
            Kind::Slater(z) => {
                let zeta = f64::from_bits(*z);
                for (r, d) in s.r.iter_mut().zip(d) {
                    *r = (d[0] * d[0] + d[1] * d[1] + d[2] * d[2]).sqrt();
                }
                // The same screening test `SlaterShell::values` applies per point.
                let screened = s.r[..n].iter().all(|&r| zeta * r > SCREEN_ZETA_R);
                let live = !screened;
                if live {
                    at_least(&mut s.ex, TILE);
                    for (e, &r) in s.ex[..n].iter_mut().zip(&s.r[..n]) {
                        *e = -zeta * r;
                    }
                    exp_in_place(&mut s.ex[..n]);
                    for &(k, o) in &g.members {
                        if let Shell::Slater(sh) = &shells[k] {
                            let out = &mut s.phi[o * TILE..(o + sh.len()) * TILE];
                            sh.values_shared(d, &s.r[..n], &s.ex[..n], out, TILE);
                        }
                    }
                }
                live
            }
            Kind::Gaussian(alphas, amin) => {
                for (r, d) in s.r.iter_mut().zip(d) {
                    *r = d[0] * d[0] + d[1] * d[1] + d[2] * d[2];
                }
                let under = s.r[..n].iter().all(|&r2| amin * r2 > GAUSSIAN_UNDERFLOW);
                let live = !under;
                if live {
                    at_least(&mut s.ex, alphas.len() * TILE);
                    for (k, a) in alphas.iter().enumerate() {
                        let a = f64::from_bits(*a);
                        let row = &mut s.ex[k * TILE..k * TILE + n];
                        for (e, &r2) in row.iter_mut().zip(&s.r[..n]) {
                            *e = -a * r2;
                        }
                        exp_in_place(row);
                    }
                    for &(k, o) in &g.members {
                        if let Shell::Gaussian(sh) = &shells[k] {
                            let out = &mut s.phi[o * TILE..(o + sh.len()) * TILE];
                            sh.values_shared(d, &s.ex, TILE, out, TILE);
                        }
                    }
                }
                live
            }
        };
        for &(k, o) in &g.members {
            let len = shells[k].len();
            s.live[o..o + len].fill(live);
            if !live {
                // Values the direct path gives as ±0: stored as 0 for the fields
                // that read every function.
                for f in o..o + len {
                    s.phi[f * TILE..f * TILE + n].fill(0.0);
                }
            }
        }
    }
}
