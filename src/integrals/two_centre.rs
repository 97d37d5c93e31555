//! Closed forms for two identical nuclei of charge Z, each carrying one normalised 1s
//! Slater function of the same exponent ζ, separated by R (all atomic units).
//!
//! With ρ = ζR the elementary integrals are the standard ones (e.g. I. N. Levine,
//! *Quantum Chemistry*, 7th ed., Sec. 13.5, written there for ζ = Z = 1):
//!
//! * overlap                S = e^(−ρ) (1 + ρ + ρ²/3)
//! * ⟨φA| 1/rB |φA⟩        = (1/R) [1 − (1 + ρ) e^(−2ρ)]
//! * ⟨φB| 1/rA |φA⟩        = ζ (1 + ρ) e^(−ρ)
//! * ⟨φB| −½∇² |φA⟩        = −ζ²S/2 + ζ ⟨φB|1/rA|φA⟩   (from −½∇²φA = (−ζ²/2 + ζ/rA) φA)
//!
//! The one-electron Hamiltonian includes the nuclear repulsion Z²/R, so the energies
//! are total energies of the one-electron ion at fixed nuclei.

/// Every number the two-centre model reports at one separation (hartree, bohr).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct TwoCentre1s {
    /// Overlap integral S = ⟨φA|φB⟩.
    pub s: f64,
    /// H_AA = ⟨φA|H|φA⟩, nuclear repulsion included.
    pub h_aa: f64,
    /// H_AB = ⟨φB|H|φA⟩, nuclear repulsion included (as Z²S/R).
    pub h_ab: f64,
    /// Energy of one 1s function of exponent ζ on its own nucleus, ζ²/2 − Zζ.
    pub e_atom: f64,
    /// Coulomb integral J = H_AA − E_atom.
    pub coulomb: f64,
    /// Exchange integral K = H_AB − E_atom·S.
    pub exchange: f64,
    /// E₊ = (H_AA + H_AB)/(1 + S) = E_atom + (J + K)/(1 + S).
    pub e_bonding: f64,
    /// E₋ = (H_AA − H_AB)/(1 − S) = E_atom + (J − K)/(1 − S).
    pub e_antibonding: f64,
}

/// Evaluates the model at separation `r` > 0 (bohr) for nuclear charge `z` and
/// exponent `zeta`.
pub fn two_centre_1s(z: f64, zeta: f64, r: f64) -> TwoCentre1s {
    debug_assert!(r > 0.0 && zeta > 0.0 && z > 0.0);
    let rho = zeta * r;
    let e1 = (-rho).exp();
    let s = e1 * (1.0 + rho + rho * rho / 3.0);
    let attraction_aa_b = (1.0 - (1.0 + rho) * (-2.0 * rho).exp()) / r;
    let attraction_ab = zeta * (1.0 + rho) * e1;
    let kinetic_ab = -0.5 * zeta * zeta * s + zeta * attraction_ab;
    let e_atom = 0.5 * zeta * zeta - z * zeta;
    let repulsion = z * z / r;
    let h_aa = e_atom - z * attraction_aa_b + repulsion;
    let h_ab = kinetic_ab - 2.0 * z * attraction_ab + repulsion * s;
    let coulomb = h_aa - e_atom;
    let exchange = h_ab - e_atom * s;
    TwoCentre1s {
        s,
        h_aa,
        h_ab,
        e_atom,
        coulomb,
        exchange,
        e_bonding: e_atom + (coulomb + exchange) / (1.0 + s),
        e_antibonding: e_atom + (coulomb - exchange) / (1.0 - s),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// For ζ = Z = 1 the textbook forms J = (1 + 1/R) e^(−2R) and
    /// K = S/R − (1 + R) e^(−R) (Levine, Sec. 13.5; from memory) must follow.
    #[test]
    fn reduces_to_the_textbook_forms_for_hydrogen() {
        for r in [0.5, 1.0, 2.0, 4.0] {
            let m = two_centre_1s(1.0, 1.0, r);
            let j = (1.0 + 1.0 / r) * (-2.0 * r).exp();
            let k = m.s / r - (1.0 + r) * (-r).exp();
            assert!((m.coulomb - j).abs() < 1e-14, "J at R={r}");
            assert!((m.exchange - k).abs() < 1e-14, "K at R={r}");
            let eb = (m.h_aa + m.h_ab) / (1.0 + m.s);
            assert!((m.e_bonding - eb).abs() < 1e-14);
        }
    }
}
