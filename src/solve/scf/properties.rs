//! Numbers reported with SCF orbitals: Mulliken charges, the dipole moment and, for
//! unrestricted orbitals, ⟨S²⟩.

use nalgebra::DMatrix;

use crate::chem::Molecule;

/// Debye per atomic unit of dipole (e a₀), from CODATA 2018: e a₀ =
/// 8.478 353 6255e-30 C m and 1 D = 1e-21/c C m = 3.335 640 95e-30 C m.
pub const DEBYE_PER_AU: f64 = 2.541_746_473;

/// A dipole moment and the point it is taken about.
#[derive(Debug, Clone, PartialEq)]
pub struct Dipole {
    /// e a₀.
    pub au: [f64; 3],
    /// Bohr.
    pub origin: [f64; 3],
    /// Whether the origin is the centre of nuclear charge (always, for an ion,
    /// whose dipole depends on the origin).
    pub about_nuclear_centre: bool,
}

impl Dipole {
    pub fn magnitude_au(&self) -> f64 {
        self.au.iter().map(|v| v * v).sum::<f64>().sqrt()
    }
}

/// The centre of nuclear charge Σ Z_A R_A / Σ Z_A (the origin when there is no
/// nuclear charge).
pub fn nuclear_centre(molecule: &Molecule) -> [f64; 3] {
    let total: f64 = molecule.atoms.iter().map(|a| a.charge()).sum();
    if total <= 0.0 {
        return [0.0; 3];
    }
    std::array::from_fn(|k| {
        molecule
            .atoms
            .iter()
            .map(|a| a.charge() * a.position[k])
            .sum::<f64>()
            / total
    })
}

/// μ = Σ_A Z_A (R_A − O) − Σ_μν P_μν ⟨μ|r − O|ν⟩, with `r` the dipole integrals
/// about O and P the total density matrix.
pub fn dipole(
    molecule: &Molecule,
    total: &DMatrix<f64>,
    r: &[DMatrix<f64>; 3],
    origin: [f64; 3],
) -> Dipole {
    let au = std::array::from_fn(|k| {
        let nuclear: f64 = molecule
            .atoms
            .iter()
            .map(|a| a.charge() * (a.position[k] - origin[k]))
            .sum();
        nuclear - total.dot(&r[k])
    });
    Dipole {
        au,
        origin,
        about_nuclear_centre: true,
    }
}

/// ⟨S²⟩ of a UHF determinant: S_z(S_z + 1) + N_β − Σ_ij |⟨α_i|β_j⟩|² over occupied
/// orbitals (Szabo and Ostlund, eq. 2.271).
pub fn s_squared(
    overlap: &DMatrix<f64>,
    alpha: &DMatrix<f64>,
    beta: &DMatrix<f64>,
    n_alpha: usize,
    n_beta: usize,
) -> f64 {
    let sz = (n_alpha as f64 - n_beta as f64) / 2.0;
    let ca = alpha.columns(0, n_alpha);
    let cb = beta.columns(0, n_beta);
    let m = ca.transpose() * overlap * cb;
    sz * (sz + 1.0) + n_beta as f64 - m.norm_squared()
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Identical alpha and beta spaces give a pure state: ⟨S²⟩ = S_z(S_z+1) exactly
    /// when every beta orbital is also occupied in alpha (a high-spin ROHF-like
    /// determinant; Szabo and Ostlund, exercise 2.40).
    #[test]
    fn nested_spaces_give_a_pure_spin_state() {
        let s = DMatrix::identity(4, 4);
        let c = DMatrix::identity(4, 4);
        let v = s_squared(&s, &c, &c, 3, 1);
        assert!((v - 2.0).abs() < 1e-15, "{v}");
    }
}
