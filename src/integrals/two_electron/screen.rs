//! Cauchy–Schwarz bounds |(ab|cd)| ≤ Q_ab Q_cd with Q_ab = max_(μ∈a,ν∈b) √(μν|μν)
//! (Häser & Ahlrichs, J. Comput. Chem. 10, 104 (1989)), and the canonical list of
//! shell pairs (a ≥ b, index `tri(a, b)`) that both ERI stores start from.

use nalgebra::DMatrix;
use rayon::prelude::*;

use super::pair::ShellPair;
use super::quartet::{Scratch, self_bound};
use super::{gaussian_shells, tri};
use crate::basis::{Basis, GaussianShell};
use crate::budget;
use crate::error::Result;

/// Expansions of every pair a ≥ b, at index `tri(a, b)`, built in parallel after a
/// memory estimate (refused over `budget::DEFAULT_MEMORY` rather than aborting).
pub(crate) fn canonical_pairs(shells: &[&GaussianShell]) -> Result<Vec<ShellPair>> {
    let index: Vec<(usize, usize)> = (0..shells.len())
        .flat_map(|a| (0..=a).map(move |b| (a, b)))
        .collect();
    let bytes: f64 = index
        .iter()
        .map(|&(a, b)| ShellPair::estimate_bytes(shells[a], shells[b]))
        .sum();
    budget::check_memory(
        bytes,
        budget::DEFAULT_MEMORY,
        "the shell-pair expansions for electron repulsion",
    )?;
    Ok(index
        .par_iter()
        .map(|&(a, b)| ShellPair::new(shells[a], shells[b]))
        .collect())
}

/// Q for every canonical pair, same order as `canonical_pairs`.
pub(crate) fn pair_bounds(pairs: &[ShellPair]) -> Vec<f64> {
    pairs
        .par_iter()
        .map_init(Scratch::default, |scratch, p| self_bound(p, scratch))
        .collect()
}

/// Q_ab = √(max (ab|ab)) for every pair of shells (a symmetric nshell × nshell
/// matrix), for screening |(ab|cd)| ≤ Q_ab Q_cd.
pub fn schwarz(basis: &Basis) -> Result<DMatrix<f64>> {
    let shells = gaussian_shells(basis)?;
    let q = pair_bounds(&canonical_pairs(&shells)?);
    let n = shells.len();
    Ok(DMatrix::from_fn(n, n, |a, b| q[tri(a.max(b), a.min(b))]))
}
