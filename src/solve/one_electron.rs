//! The one-electron solver: exact within the basis for a system with one electron.

use super::eigen::{DEPENDENCE_THRESHOLD, generalized_symmetric};
use super::orbitals::{Orbital, OrbitalSet, aufbau};
use crate::basis::{Basis, BasisSetName};
use crate::chem::Molecule;
use crate::error::{Error, Result};
use crate::integrals::slater_1s_matrices;

/// Said with every minimal-basis result, because such numbers are easily over-read.
pub const MINIMAL_BASIS_CAVEAT: &str = "minimal basis (one 1s function per nucleus): the \
    energies are variational upper bounds and the bond is too weak; use them for \
    pictures and trends, not as quantitative energies";

pub fn solve(molecule: &Molecule, basis: &Basis) -> Result<OrbitalSet> {
    let electrons = molecule.electron_count();
    if electrons != 1 {
        return Err(Error::input(format!(
            "the one-electron method needs exactly one electron, but {} with charge {} has {electrons}",
            molecule.formula(),
            molecule.charge
        ))
        .with_hint("set [molecule] charge so that nuclear charges minus charge = 1"));
    }
    let matrices = match basis.name {
        BasisSetName::Slater1s => slater_1s_matrices(molecule, basis)?,
    };
    let eigen = generalized_symmetric(
        &matrices.hamiltonian,
        &matrices.overlap,
        DEPENDENCE_THRESHOLD,
    )?;
    let (occupations, _) = aufbau(&eigen.values, electrons as f64);
    let orbitals = eigen
        .values
        .iter()
        .zip(&occupations)
        .enumerate()
        .map(|(i, (&energy, &occupation))| Orbital {
            energy,
            occupation,
            coefficients: eigen.vectors.column(i).iter().copied().collect(),
        })
        .collect();
    let mut notes = vec![MINIMAL_BASIS_CAVEAT.to_string()];
    if eigen.dropped > 0 {
        notes.push(format!(
            "{} near-linear-dependent combination(s) of the basis were dropped",
            eigen.dropped
        ));
    }
    Ok(OrbitalSet {
        molecule: molecule.clone(),
        basis: basis.clone(),
        overlap: matrices.overlap,
        orbitals,
        method: format!("one-electron, {}", basis.name.as_str()),
        notes,
    })
}
