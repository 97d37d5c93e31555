//! Electron-repulsion integrals (μν|λσ) over contracted Gaussian shells (s to f,
//! pure or Cartesian) by the McMurchie–Davidson method, and the Coulomb and
//! exchange matrices built from them, either from an in-core store with 8-fold
//! permutational symmetry (`PackedEri`) or recomputed on every call (`DirectJk`).
//!
//! Layout: `hermite_r` (Hermite Coulomb integrals R_tuv), `pair` (per shell pair
//! Hermite expansions), `quartet` (the contracted kernel), `screen` (Schwarz
//! bounds), `accumulate` (J and K from unique quartets), `packed`, `direct`.

mod accumulate;
pub mod direct;
mod hermite_r;
pub mod packed;
mod pair;
mod quartet;
pub mod screen;

pub use direct::DirectJk;
pub use packed::PackedEri;
pub use quartet::eri_quartet;
pub use screen::schwarz;

use nalgebra::DMatrix;

use crate::basis::{Basis, GaussianShell, Shell};
use crate::error::{Error, Result};
use crate::integrals::hermite::MAX_L;

/// Coulomb and exchange matrices for several density matrices at once:
/// J[D]_μν = Σ_λσ (μν|λσ) D_λσ, K[D]_μν = Σ_λσ (μλ|νσ) D_λσ. D symmetric.
pub trait TwoElectron: Sync {
    /// One (J, K) per density, in order.
    ///
    /// # Panics
    /// If a density is not n × n for the basis the implementor was built for (a
    /// programming error, not user input).
    fn jk(&self, densities: &[&DMatrix<f64>]) -> Vec<(DMatrix<f64>, DMatrix<f64>)>;
    /// One line for reports, e.g. "stored in memory (13.8 million unique integrals, 105 MiB)".
    fn describe(&self) -> String;
}

/// Refuses what the kernel cannot treat, as input errors: l > 3, more functions
/// than Cartesian components (they cannot be independent; the kernel's work arrays
/// are sized for (l+1)(l+2)/2 per shell), and shells whose public fields disagree
/// with each other (hand-built, not from `GaussianShell::new`).
pub(crate) fn check_shell(g: &GaussianShell) -> Result<()> {
    if g.l as usize > MAX_L {
        return Err(Error::input(format!(
            "electron-repulsion integrals are implemented up to l = {MAX_L} (f), got l = {}",
            g.l
        )));
    }
    let ncart = ((g.l + 1) * (g.l + 2) / 2) as usize;
    let consistent = !g.exponents.is_empty()
        && g.exponents.len() == g.d.len()
        && g.rows.len() <= ncart
        && g.rows.len() == g.functions.len()
        && g.rows.iter().all(|r| r.len() == ncart)
        && g.exponents.iter().all(|a| a.is_finite() && *a > 0.0)
        && g.d.iter().all(|d| d.is_finite())
        && g.center.iter().all(|c| c.is_finite());
    if !consistent {
        return Err(Error::input(format!(
            "a Gaussian shell (l = {}) on atom {} is inconsistent: exponents, \
             coefficients and angular rows do not match, or it has more than {ncart} functions",
            g.l, g.atom
        )));
    }
    Ok(())
}

/// The basis's shells, all Gaussian and each within the kernel's limits.
pub(crate) fn gaussian_shells(basis: &Basis) -> Result<Vec<&GaussianShell>> {
    basis
        .shells
        .iter()
        .map(|s| match s {
            Shell::Gaussian(g) => check_shell(g).map(|_| g),
            Shell::Slater(_) => Err(Error::input(
                "electron-repulsion integrals need an all-Gaussian basis",
            )
            .with_hint("use sto-3g, sto-6g, even-tempered or custom Gaussian shells")),
        })
        .collect()
}

/// Index of the unordered pair (i, j), i ≥ j, in a lower triangle.
#[inline]
pub(crate) fn tri(i: usize, j: usize) -> usize {
    i * (i + 1) / 2 + j
}
