//! The one-electron solver: exact within the basis for a system with one electron.

use super::MethodKind;
use super::degenerate::{canonicalise, sharing_notes, tolerance};
use super::eigen::{DEPENDENCE_THRESHOLD, generalized_symmetric};
use super::orbitals::{Caveat, OrbitalSet, aufbau};
use crate::basis::Basis;
use crate::chem::Molecule;
use crate::error::{Error, Result};
use crate::integrals::{gaussian_matrices, slater_1s_matrices};

/// Said with every minimal-basis result, because such numbers are easily over-read.
pub const MINIMAL_BASIS_CAVEAT: &str = "minimal basis (one function per occupied atomic \
    shell): the energies are variational upper bounds and bonds come out too weak; use \
    them for pictures and trends, not as quantitative energies";

pub fn solve(molecule: &Molecule, basis: &Basis) -> Result<OrbitalSet> {
    let electrons = molecule.electron_count();
    if electrons != 1 {
        return Err(Error::input(format!(
            "the one-electron method needs exactly one electron, but {} with charge {} has {electrons}",
            molecule.formula(),
            molecule.charge
        ))
        .with_hint("for more electrons use [orbitals] method = \"file\" with orbitals from another program (or method = \"extended-huckel\" for qualitative valence orbitals); for one electron set charge so that nuclear charges minus charge = 1"));
    }
    let matrices = if basis.all_gaussian() {
        gaussian_matrices(molecule, basis)?
    } else {
        slater_1s_matrices(molecule, basis)?
    };
    let eigen = generalized_symmetric(
        &matrices.hamiltonian,
        &matrices.overlap,
        DEPENDENCE_THRESHOLD,
    )?;
    let tol = tolerance(false);
    let (occupations, _) = aufbau(&eigen.values, electrons as f64, tol);
    let orbitals = eigen.orbitals(&occupations);
    let caveats = if basis.kind().is_minimal() {
        vec![Caveat::MinimalBasis]
    } else {
        Vec::new()
    };
    let mut notes = Vec::new();
    if eigen.dropped > 0 {
        notes.push(format!(
            "{} near-linear-dependent combination(s) of the basis were dropped",
            eigen.dropped
        ));
    }
    let mut set = OrbitalSet {
        molecule: molecule.clone(),
        basis: basis.clone(),
        overlap: Some(matrices.overlap),
        orbitals,
        origin: MethodKind::OneElectron,
        method: format!("one-electron, {}", basis.name),
        caveats,
        notes,
        reference: None,
        degeneracy: tol,
        spin: Default::default(),
    };
    canonicalise(&mut set);
    let shared = sharing_notes(&set);
    set.notes.extend(shared);
    Ok(set)
}
