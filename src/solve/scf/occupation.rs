//! Electron counts per spin from the charge and the multiplicity, checked before any
//! integral is computed.

use super::Reference;
use crate::chem::Molecule;
use crate::error::{Error, Result};

/// Alpha and beta electron counts.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct SpinCounts {
    pub alpha: usize,
    pub beta: usize,
    pub multiplicity: u32,
}

impl SpinCounts {
    /// S(S+1) for this multiplicity, the exact ⟨S²⟩ of a pure spin state.
    pub fn exact_s_squared(&self) -> f64 {
        let s = (self.multiplicity as f64 - 1.0) / 2.0;
        s * (s + 1.0)
    }
}

/// The counts for `molecule` (its charge) and `multiplicity` (default: 1 for an
/// even electron count, 2 for an odd one). Refuses what no state can have, and RHF
/// for an open shell.
pub fn spin_counts(
    molecule: &Molecule,
    multiplicity: Option<u32>,
    reference: Reference,
) -> Result<SpinCounts> {
    let electrons = molecule.electron_count();
    let formula = molecule.formula_with_charge();
    if electrons < 1 {
        return Err(Error::input(format!(
            "{formula} has {electrons} electrons: charge {} leaves nothing to solve for",
            molecule.charge
        )));
    }
    let n = electrons as u64;
    let m = u64::from(multiplicity.unwrap_or(if n % 2 == 0 { 1 } else { 2 }));
    if m < 1 || m > n + 1 {
        return Err(Error::input(format!(
            "multiplicity {m} is impossible for {formula} with {n} electron(s): it must be 1 to {}",
            n + 1
        )));
    }
    // n_alpha − n_beta = m − 1 and n_alpha + n_beta = n.
    if (n + m - 1) % 2 != 0 {
        let allowed = if n % 2 == 0 {
            "odd (1, 3, 5, …)"
        } else {
            "even (2, 4, …)"
        };
        return Err(Error::input(format!(
            "multiplicity {m} is impossible for {formula} with {n} electron(s): with an {} electron count it must be {allowed}",
            if n % 2 == 0 { "even" } else { "odd" }
        )));
    }
    let alpha = ((n + m - 1) / 2) as usize;
    let beta = n as usize - alpha;
    if reference == Reference::Restricted && alpha != beta {
        return Err(Error::input(format!(
            "RHF needs a closed shell, but {formula} with {n} electron(s) and multiplicity {m} has {alpha} alpha and {beta} beta electrons"
        ))
        .with_hint("use --method uhf for an open shell"));
    }
    Ok(SpinCounts {
        alpha,
        beta,
        multiplicity: m as u32,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn mol(atoms: &[(&str, [f64; 3])], charge: i32) -> Molecule {
        Molecule::from_symbols(atoms, charge).unwrap()
    }

    /// Counts follow from n_α + n_β = N and n_α − n_β = 2S (definition).
    #[test]
    fn counts_and_refusals() {
        let water = mol(
            &[
                ("O", [0.0, 0.0, 0.0]),
                ("H", [1.4, 0.0, 1.1]),
                ("H", [-1.4, 0.0, 1.1]),
            ],
            0,
        );
        let c = spin_counts(&water, None, Reference::Restricted).unwrap();
        assert_eq!((c.alpha, c.beta, c.multiplicity), (5, 5, 1));
        let c = spin_counts(&water, Some(3), Reference::Unrestricted).unwrap();
        assert_eq!((c.alpha, c.beta), (6, 4));
        assert!((c.exact_s_squared() - 2.0).abs() < 1e-15);
        assert!(spin_counts(&water, Some(2), Reference::Unrestricted).is_err());
        assert!(spin_counts(&water, Some(12), Reference::Unrestricted).is_err());
        assert!(spin_counts(&water, Some(0), Reference::Unrestricted).is_err());
        let cation = mol(
            &[
                ("O", [0.0, 0.0, 0.0]),
                ("H", [1.4, 0.0, 1.1]),
                ("H", [-1.4, 0.0, 1.1]),
            ],
            1,
        );
        let e = spin_counts(&cation, None, Reference::Restricted).unwrap_err();
        assert!(e.hint.unwrap().contains("uhf"));
        let c = spin_counts(&cation, None, Reference::Unrestricted).unwrap();
        assert_eq!((c.alpha, c.beta, c.multiplicity), (5, 4, 2));
        let bare = mol(&[("H", [0.0; 3])], 1);
        assert!(spin_counts(&bare, None, Reference::Unrestricted).is_err());
    }
}
