//! Turning a molecule and a basis into orbitals: the generalised eigenproblem, the
//! one-electron solver, occupations, orbital selection and energy curves.

pub mod brent;
pub mod curve;
pub mod eigen;
pub mod huckel;
pub mod huckel_params;
pub mod one_electron;
pub mod orbital_file;
pub mod orbitals;

pub use orbitals::{Orbital, OrbitalSelector, OrbitalSet};

use crate::error::Result;
use crate::model::{Method, Model};

/// Obtains the orbitals a model asks for.
pub fn orbitals_for(model: &Model) -> Result<OrbitalSet> {
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
