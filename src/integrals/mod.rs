//! One-electron integrals over basis functions. Only matrices come out of here; no
//! function allocates per grid point.

pub mod boys;
pub mod gaussian;
pub mod hermite;
pub mod two_centre;

use nalgebra::DMatrix;

use crate::basis::{Basis, BasisFunction};
use crate::chem::Molecule;
use crate::error::{Error, Result};

/// Overlap S and one-electron Hamiltonian H (kinetic + nuclear attraction + nuclear
/// repulsion on the diagonal scale, so eigenvalues are total energies of a
/// one-electron system).
#[derive(Debug, Clone)]
pub struct OneElectronMatrices {
    pub overlap: DMatrix<f64>,
    pub hamiltonian: DMatrix<f64>,
}

/// Builds S and H for the `slater-1s` set, where closed forms exist: one atom, or two
/// identical atoms carrying the same exponent.
pub fn slater_1s_matrices(molecule: &Molecule, basis: &Basis) -> Result<OneElectronMatrices> {
    let fns: Vec<_> = basis
        .functions
        .iter()
        .map(|f| match f {
            BasisFunction::Slater1s(s) => s,
        })
        .collect();
    let why = "the slater-1s set uses exact closed forms, which lobecast has for one atom \
               or for two identical atoms with the same exponent";
    match (molecule.atoms.as_slice(), fns.as_slice()) {
        ([a], [f]) => {
            let z = a.charge();
            let e = 0.5 * f.zeta * f.zeta - z * f.zeta;
            Ok(OneElectronMatrices {
                overlap: DMatrix::from_element(1, 1, 1.0),
                hamiltonian: DMatrix::from_element(1, 1, e),
            })
        }
        ([a, b], [fa, fb]) => {
            if a.element != b.element || fa.zeta != fb.zeta {
                return Err(Error::input(format!(
                    "slater-1s cannot treat {}–{} with exponents {} and {}",
                    a.element.symbol, b.element.symbol, fa.zeta, fb.zeta
                ))
                .with_hint(why));
            }
            let r = crate::chem::molecule::distance(a.position, b.position);
            let m = two_centre::two_centre_1s(a.charge(), fa.zeta, r);
            Ok(OneElectronMatrices {
                overlap: DMatrix::from_row_slice(2, 2, &[1.0, m.s, m.s, 1.0]),
                hamiltonian: DMatrix::from_row_slice(2, 2, &[m.h_aa, m.h_ab, m.h_ab, m.h_aa]),
            })
        }
        _ => Err(Error::input(format!(
            "slater-1s cannot treat a molecule of {} atoms",
            molecule.atoms.len()
        ))
        .with_hint(why)),
    }
}
