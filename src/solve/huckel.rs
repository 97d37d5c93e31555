//! The extended Hückel method (R. Hoffmann, J. Chem. Phys. 39, 1397 (1963)): a
//! valence basis of Slater functions, H_ii from valence-state ionisation energies,
//! H_ij by Wolfsberg–Helmholz (M. Wolfsberg, L. Helmholz, J. Chem. Phys. 20, 837
//! (1952)), and H C = S C ε with the exact Slater overlaps. Semi-empirical and
//! qualitative: good for the shapes and ordering of valence orbitals, not for
//! quantitative energies.

use nalgebra::DMatrix;

use super::MethodKind;
use super::degenerate::{canonicalise, sharing_notes, tolerance};
use super::eigen::{DEPENDENCE_THRESHOLD, generalized_symmetric};
use super::huckel_params::{HuckelOptions, OffDiagonal, valence_basis};
use super::orbitals::{Caveat, OrbitalSet, aufbau};
use crate::chem::Molecule;
use crate::error::{Error, Result};
use crate::integrals::slater_overlap_matrix;

/// Said wherever extended-Hückel numbers appear.
pub const CAUTION: &str = "extended Hückel is semi-empirical and qualitative: orbital \
    shapes, nodes and level ordering are meaningful, the energies (eV) and Mulliken charges \
    are rough trends only; densities are valence-only";

/// H_ij from H_ii, H_jj and S_ij by the chosen Wolfsberg–Helmholz form.
pub fn off_diagonal(hi: f64, hj: f64, s: f64, k: f64, form: OffDiagonal) -> f64 {
    let k = match form {
        OffDiagonal::Plain => k,
        OffDiagonal::Weighted => {
            let d = (hi - hj) / (hi + hj);
            k + d * d + d.powi(4) * (1.0 - k)
        }
    };
    k * s * (hi + hj) / 2.0
}

/// Solves the extended-Hückel problem for a molecule (valence electrons only).
pub fn solve(molecule: &Molecule, options: &HuckelOptions) -> Result<OrbitalSet> {
    options.check()?;
    let vb = valence_basis(molecule, options)?;
    let s = slater_overlap_matrix(&vb.basis)?;
    let n = vb.basis.len();
    let h = DMatrix::from_fn(n, n, |i, j| {
        if i == j {
            vb.h_diag[i]
        } else {
            off_diagonal(
                vb.h_diag[i],
                vb.h_diag[j],
                s[(i, j)],
                options.k,
                options.off_diagonal,
            )
        }
    });
    let valence: f64 = vb.atom_valence.iter().sum();
    let electrons = valence - molecule.charge as f64;
    if electrons < 0.0 || electrons > 2.0 * n as f64 {
        return Err(Error::input(format!(
            "charge {} leaves {electrons} valence electrons for {} valence functions of {}",
            molecule.charge,
            n,
            molecule.formula()
        )));
    }
    let eigen = generalized_symmetric(&h, &s, DEPENDENCE_THRESHOLD)?;
    let tol = tolerance(true);
    let (occupations, _) = aufbau(&eigen.values, electrons, tol);
    let orbitals = eigen.orbitals(&occupations);
    let mut notes = Vec::new();
    if eigen.dropped > 0 {
        notes.push(format!(
            "{} near-linear-dependent combination(s) of the basis were dropped",
            eigen.dropped
        ));
    }
    let form = match options.off_diagonal {
        OffDiagonal::Plain => "",
        OffDiagonal::Weighted => ", weighted",
    };
    let mut set = OrbitalSet {
        molecule: molecule.clone(),
        basis: vb.basis,
        overlap: Some(s),
        orbitals,
        origin: MethodKind::ExtendedHuckel,
        method: format!(
            "extended Hückel (semi-empirical, qualitative), K = {}{form}",
            options.k
        ),
        caveats: vec![Caveat::SemiEmpirical],
        notes,
        reference: Some(vb.reference),
        degeneracy: tol,
        spin: Default::default(),
    };
    canonicalise(&mut set);
    let shared = sharing_notes(&set);
    set.notes.splice(0..0, shared);
    Ok(set)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The weighted form reduces to the plain one for equal H_ii (Δ = 0) and, for
    /// H_ii = −10, H_jj = −20 (Δ = 1/3), K' = K + 1/9 + (1/81)(1 − K)
    /// (Ammeter et al. 1978, from memory; arithmetic here).
    #[test]
    fn weighted_off_diagonal() {
        let plain = off_diagonal(-10.0, -10.0, 0.3, 1.75, OffDiagonal::Plain);
        assert!((plain - 1.75 * 0.3 * -10.0).abs() < 1e-15);
        let w = off_diagonal(-10.0, -10.0, 0.3, 1.75, OffDiagonal::Weighted);
        assert!((w - plain).abs() < 1e-15);
        let k = 1.75 + 1.0 / 9.0 + (1.0 - 1.75) / 81.0;
        let w = off_diagonal(-10.0, -20.0, 0.3, 1.75, OffDiagonal::Weighted);
        assert!((w - k * 0.3 * -15.0).abs() < 1e-13, "{w}");
    }
}
