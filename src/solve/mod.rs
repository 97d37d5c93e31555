//! Turning a molecule and a basis into orbitals: the generalised eigenproblem, the
//! one-electron solver, occupations, orbital selection and energy curves.

pub mod curve;
pub mod degenerate;
pub mod eigen;
pub mod estimate;
pub mod huckel;
pub mod huckel_params;
pub mod one_electron;
pub mod orbital_file;
pub mod orbitals;
pub mod progress;

pub use orbitals::{Orbital, OrbitalSelector, OrbitalSet};

use crate::error::Result;
use crate::model::{Method, Model};

/// Obtains the orbitals a model asks for, within the default memory budget.
pub fn orbitals_for(model: &Model) -> Result<OrbitalSet> {
    orbitals_within(model, crate::budget::DEFAULT_MEMORY)
}

/// Obtains the orbitals a model asks for, refusing first (with the estimate) a
/// solve that would need more than `memory` bytes. A long solve (over about 1e11
/// operations) shows a spinner on standard error when it is a terminal.
pub fn orbitals_within(model: &Model, memory: u64) -> Result<OrbitalSet> {
    let estimate = estimate::check(model, memory)?;
    let spinner = estimate
        .filter(|e| e.work > 1e11)
        .map(|e| progress::spinner(&format!("solving in {} basis functions", e.functions)));
    let result = solve_unchecked(model);
    if let Some(s) = spinner {
        s.finish_and_clear();
    }
    result
}

fn solve_unchecked(model: &Model) -> Result<OrbitalSet> {
    match (model.method, &model.orbitals) {
        (Method::OneElectron, _) => one_electron::solve(&model.molecule, &model.basis),
        (Method::ExtendedHuckel, _) => huckel::solve(
            &model.molecule,
            model.huckel.as_ref().unwrap_or(&Default::default()),
        ),
        (Method::File, Some(set)) => Ok(set.clone()),
        (Method::File, None) => Err(crate::error::Error::internal(
            "a file model without its orbitals",
        )),
    }
}
