//! What a job will cost, estimated before anything large is allocated, so that a
//! small input describing a huge job (an XYZ file of 20 000 atoms, a basis of
//! thousands of primitives) is refused with the estimate instead of growing until
//! the machine gives out.
//!
//! Memory of a solve: the generalised eigenproblem keeps about
//! [`SOLVE_MATRICES`] dense n × n matrices of f64 alive at its peak (S, H, the
//! overlap eigenvectors and the orthogonaliser, the transformed H and its
//! eigenvectors, the coefficients, the copy kept with the orbitals), plus the
//! shell-pair blocks of the integrals (about [`BYTES_PER_SHELL_PAIR`] bytes of
//! bookkeeping per pair besides their values). Work of grid evaluation: one
//! exponential per primitive per point, see [`grid_work`].

use super::Method;
use crate::basis::{Basis, Shell};
use crate::budget::check_memory;
use crate::chem::Molecule;
use crate::error::Result;

/// Dense n × n matrices alive at the peak of a solve (counted from `eigen` and the
/// solvers; rounded up).
pub const SOLVE_MATRICES: f64 = 9.0;

/// Bookkeeping per shell pair while the integral blocks are gathered (the pair
/// index, the block's vector header and allocator overhead; common practice).
pub const BYTES_PER_SHELL_PAIR: f64 = 64.0;

/// Estimated peak memory in bytes of solving in a basis of `functions` functions
/// grouped in `shells` shells. An f64 so that no product of counts can wrap.
pub fn solve_memory(functions: usize, shells: usize) -> f64 {
    let n = functions as f64;
    let s = shells as f64;
    SOLVE_MATRICES * n * n * 8.0 + 0.5 * s * (s + 1.0) * BYTES_PER_SHELL_PAIR
}

/// Primitive functions of a basis (a Slater function counts as one).
pub fn primitive_count(basis: &Basis) -> usize {
    basis
        .shells
        .iter()
        .map(|s| match s {
            Shell::Gaussian(g) => g.primitives.len() * g.len(),
            Shell::Slater(sl) => sl.len(),
        })
        .sum()
}

/// Rough operation count of evaluating every basis function at `points` points:
/// primitives × points (each primitive costs about one exponential per point).
pub fn grid_work(basis: &Basis, points: f64) -> f64 {
    primitive_count(basis) as f64 * points
}

/// Rough operation count of the one-electron integrals of a Gaussian basis:
/// primitive pairs × (nuclei + 2) (overlap, kinetic and one attraction per nucleus).
pub fn integral_work(basis: &Basis, nuclei: usize) -> f64 {
    let p = primitive_count(basis) as f64;
    0.5 * p * (p + 1.0) * (nuclei as f64 + 2.0)
}

/// Primitive pairs above which the integrals of a basis are refused: measured here,
/// 5 × 10⁷ pairs of s primitives took 8.6 s for the overlap matrix alone (an
/// orbital file of 100 functions of 100 primitives), so 10⁹ pairs is minutes of
/// overlap and far more for a whole solve — a basis that size is almost always a
/// mistake in a file, and real sets (STO-3G benzene: 108 primitives) are far below.
pub const MAX_PRIMITIVE_PAIRS: f64 = 1e9;

/// Operations counted per primitive pair and integral kind, so that the solve's
/// work estimate (which decides whether progress is shown) includes the integrals.
const OPS_PER_PAIR: f64 = 300.0;

/// Refuses a basis whose primitive pairs exceed `MAX_PRIMITIVE_PAIRS`, before any
/// integral is computed.
pub fn check_primitive_pairs(basis: &Basis) -> Result<()> {
    let p = primitive_count(basis) as f64;
    let pairs = 0.5 * p * (p + 1.0);
    if pairs > MAX_PRIMITIVE_PAIRS {
        return Err(crate::error::Error::input(format!(
            "the basis has {p} primitive functions, {pairs:.2e} pairs for its integrals, more than the {MAX_PRIMITIVE_PAIRS:.0e} lobecast computes (minutes to hours of work)"
        ))
        .with_hint("check the file: real basis sets have a few primitives per function"));
    }
    Ok(())
}

/// The size of a solve: basis functions and shells, and its memory estimate.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SolveEstimate {
    pub functions: usize,
    pub shells: usize,
    /// Bytes.
    pub memory: f64,
    /// Rough floating-point operations of the diagonalisation (about 10 n³).
    pub work: f64,
}

impl SolveEstimate {
    pub fn for_basis(basis: &Basis) -> Self {
        let (functions, shells) = (basis.len(), basis.shells.len());
        let n = functions as f64;
        SolveEstimate {
            functions,
            shells,
            memory: solve_memory(functions, shells),
            work: 10.0 * n * n * n,
        }
    }
}

/// Estimates what solving needs (building only the cheap basis description, no
/// matrix). `None` for given orbitals, which are not solved.
pub fn for_method(molecule: &Molecule, method: &Method) -> Result<Option<SolveEstimate>> {
    Ok(match method {
        Method::Given(_) => None,
        Method::OneElectron { basis } | Method::HartreeFock { basis, .. } => {
            check_primitive_pairs(basis)?;
            let mut e = SolveEstimate::for_basis(basis);
            e.work += OPS_PER_PAIR * integral_work(basis, molecule.atoms.len());
            Some(e)
        }
        Method::ExtendedHuckel(options) => {
            options.check()?;
            let vb = super::huckel_params::valence_basis(molecule, options)?;
            Some(SolveEstimate::for_basis(&vb.basis))
        }
    })
}

/// Refuses a solve whose memory estimate exceeds `budget` bytes, naming the basis
/// size and the estimate.
pub fn check(molecule: &Molecule, method: &Method, budget: u64) -> Result<Option<SolveEstimate>> {
    let Some(e) = for_method(molecule, method)? else {
        return Ok(None);
    };
    check_memory(
        e.memory,
        budget,
        &format!(
            "solving {} ({} atoms, {} basis functions: {} dense {}×{} matrices)",
            molecule.formula(),
            molecule.atoms.len(),
            e.functions,
            SOLVE_MATRICES,
            e.functions,
            e.functions
        ),
    )?;
    Ok(Some(e))
}

#[cfg(test)]
mod tests {
    use super::*;

    /// 20 000 functions: 9 × 20 000² × 8 bytes = 2.88e10 bytes, about 26.8 GiB
    /// (arithmetic), over the 8 GiB default.
    #[test]
    fn large_bases_are_estimated_in_gib() {
        let m = solve_memory(20_000, 20_000);
        assert!((m - (2.88e10 + 0.5 * 2e4 * 20_001.0 * 64.0)).abs() < 1.0);
        assert!(check_memory(m, crate::budget::DEFAULT_MEMORY, "x").is_err());
        assert!(solve_memory(100, 50) < 1e6);
    }
}
