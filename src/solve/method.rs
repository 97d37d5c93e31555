//! How the orbitals are obtained: one `Method` variant per method, carrying what it
//! needs, so that `solve` takes a molecule and a method and returns an `OrbitalSet`
//! without knowing where either came from (a model file, an XYZ file with flags).

use serde::Deserialize;

use super::huckel_params::HuckelOptions;
use super::{OrbitalSet, estimate, huckel, one_electron, scf};
use crate::basis::Basis;
use crate::chem::Molecule;
use crate::error::{Error, Result};

/// A method with its options.
#[derive(Debug, Clone)]
pub enum Method {
    /// Solve H C = S C ε for one electron in `basis`.
    OneElectron { basis: Basis },
    /// Extended Hückel in its own valence Slater basis (semi-empirical, qualitative).
    ExtendedHuckel(HuckelOptions),
    /// Orbitals taken as they are (read from an orbital file).
    Given(Box<OrbitalSet>),
    /// Hartree–Fock (RHF or UHF, as the options say) in `basis`.
    HartreeFock {
        basis: Basis,
        options: super::scf::ScfOptions,
    },
}

/// A method's name alone, as a model file (`[orbitals] method`) or the command line
/// (`--method`) names it.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Deserialize, Default)]
#[serde(rename_all = "kebab-case")]
pub enum MethodKind {
    #[default]
    OneElectron,
    /// Orbitals from an orbital file.
    File,
    ExtendedHuckel,
    /// Restricted closed-shell Hartree–Fock.
    Rhf,
    /// Unrestricted Hartree–Fock.
    Uhf,
}

impl MethodKind {
    /// Reads a method name as the command line gives it (only for XYZ files).
    pub fn parse(text: &str) -> Result<Self> {
        match text.trim().to_ascii_lowercase().as_str() {
            "extended-huckel" | "extended-hückel" => Ok(MethodKind::ExtendedHuckel),
            "one-electron" => Ok(MethodKind::OneElectron),
            "rhf" => Ok(MethodKind::Rhf),
            "uhf" => Ok(MethodKind::Uhf),
            _ => Err(Error::input(format!("unknown method {text:?}")).with_hint(
                "the methods for an XYZ file: rhf, uhf (with --basis), extended-huckel",
            )),
        }
    }
}

impl Method {
    pub fn kind(&self) -> MethodKind {
        match self {
            Method::OneElectron { .. } => MethodKind::OneElectron,
            Method::ExtendedHuckel(_) => MethodKind::ExtendedHuckel,
            Method::Given(_) => MethodKind::File,
            Method::HartreeFock { options, .. } => match options.reference {
                super::scf::Reference::Restricted => MethodKind::Rhf,
                super::scf::Reference::Unrestricted => MethodKind::Uhf,
            },
        }
    }

    /// The basis the method works in, where it is known before solving.
    pub fn basis(&self) -> Option<&Basis> {
        match self {
            Method::OneElectron { basis } | Method::HartreeFock { basis, .. } => Some(basis),
            Method::Given(set) => Some(&set.basis),
            Method::ExtendedHuckel(_) => None,
        }
    }
}

/// Obtains the orbitals within the default memory budget.
pub fn orbitals_for(molecule: &Molecule, method: &Method) -> Result<OrbitalSet> {
    orbitals_within(molecule, method, crate::budget::DEFAULT_MEMORY, &mut |_| {})
}

/// Obtains the orbitals, refusing first (with the estimate) a solve that would need
/// more than `memory` bytes. `announce` hears the estimate before a solve starts, so
/// a caller can show progress on a long one.
pub fn orbitals_within(
    molecule: &Molecule,
    method: &Method,
    memory: u64,
    announce: &mut dyn FnMut(&estimate::SolveEstimate),
) -> Result<OrbitalSet> {
    orbitals_reporting(molecule, method, memory, announce, &mut |_| {})
}

/// Like `orbitals_within`, and a self-consistent run tells `progress` how it goes
/// (integrals, then every iteration).
pub fn orbitals_reporting(
    molecule: &Molecule,
    method: &Method,
    memory: u64,
    announce: &mut dyn FnMut(&estimate::SolveEstimate),
    progress: &mut (dyn FnMut(scf::Stage) + Send),
) -> Result<OrbitalSet> {
    if let Some(e) = estimate::check(molecule, method, memory)? {
        announce(&e);
    }
    match method {
        Method::OneElectron { basis } => one_electron::solve(molecule, basis),
        Method::ExtendedHuckel(options) => huckel::solve(molecule, options),
        Method::Given(set) => Ok((**set).clone()),
        Method::HartreeFock { basis, options } => {
            let options = scf::ScfOptions {
                memory,
                ..options.clone()
            };
            scf::solve(molecule, basis, &options, progress)
        }
    }
}
