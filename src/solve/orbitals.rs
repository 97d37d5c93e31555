//! Orbitals as plain data, occupations, and choosing an orbital by number or by
//! occupation (`homo`, `lumo+1`, …).

use nalgebra::DMatrix;

use crate::basis::Basis;
use crate::chem::Molecule;
use crate::error::{Error, Result};

/// Levels closer than this (hartree; 1e-6 eV) count as degenerate and share electrons.
pub const DEGENERACY_HARTREE: f64 = 1e-6 / crate::chem::units::HARTREE_IN_EV;

#[derive(Debug, Clone, PartialEq)]
pub struct Orbital {
    /// Orbital energy in hartree.
    pub energy: f64,
    /// Electrons in this orbital (0 to 2).
    pub occupation: f64,
    /// One coefficient per basis function.
    pub coefficients: Vec<f64>,
}

/// Everything downstream needs to evaluate and describe orbitals; nothing downstream
/// knows whether it came from a solver or a file.
#[derive(Debug, Clone)]
pub struct OrbitalSet {
    pub molecule: Molecule,
    pub basis: Basis,
    /// Overlap matrix of the basis (for Mulliken populations), where lobecast can
    /// compute it.
    pub overlap: Option<DMatrix<f64>>,
    /// Sorted by increasing energy.
    pub orbitals: Vec<Orbital>,
    /// How the orbitals were obtained, e.g. "one-electron, slater-1s".
    pub method: String,
    /// Plain statements the user must see with the numbers: what the model may and
    /// may not be used for, and anything the solver had to do (dropped functions).
    pub notes: Vec<String>,
    /// Free-atom valence occupation of each basis function (the neutral, spherical
    /// atoms the deformation density is measured against), where the method has one.
    pub reference: Option<Vec<f64>>,
}

impl OrbitalSet {
    /// Mulliken gross populations of one orbital per basis function,
    /// q_μ = c_μ Σ_ν S_μν c_ν; they sum to cᵀSc (1 for a normalised orbital).
    pub fn gross_populations(&self, index: usize) -> Result<Vec<f64>> {
        let s = self.overlap.as_ref().ok_or_else(|| {
            Error::input(
                "Mulliken populations need the overlap matrix, which lobecast computes for Gaussian \
                 functions and for 1s Slater functions of equal exponent",
            )
        })?;
        let c = &self.orbitals[index].coefficients;
        Ok((0..c.len())
            .map(|m| c[m] * (0..c.len()).map(|n| s[(m, n)] * c[n]).sum::<f64>())
            .collect())
    }
}

impl OrbitalSet {
    /// Mulliken charge of every atom: its free-atom valence electrons minus its
    /// gross population summed over the occupied orbitals. Needs the overlap and
    /// the free-atom reference.
    pub fn mulliken_charges(&self) -> Option<Vec<f64>> {
        let reference = self.reference.as_ref()?;
        self.overlap.as_ref()?;
        let mut q = vec![0.0; self.molecule.atoms.len()];
        let atoms: Vec<usize> = self.basis.function_labels().iter().map(|l| l.0).collect();
        for (m, &a) in atoms.iter().enumerate() {
            q[a] += reference[m];
        }
        for (i, o) in self.orbitals.iter().enumerate() {
            if o.occupation > 0.0 {
                let pops = self.gross_populations(i).ok()?;
                for (m, p) in pops.iter().enumerate() {
                    q[atoms[m]] -= o.occupation * p;
                }
            }
        }
        Some(q)
    }
}

/// Aufbau filling with two electrons per orbital; a group of degenerate levels that
/// is only partly filled shares its electrons evenly. Returns (occupations, whether
/// any sharing happened).
pub fn aufbau(energies: &[f64], electrons: f64) -> (Vec<f64>, bool) {
    let mut occ = vec![0.0; energies.len()];
    let mut left = electrons;
    let mut shared = false;
    let mut i = 0;
    while i < energies.len() && left > 1e-12 {
        let mut j = i + 1;
        while j < energies.len() && energies[j] - energies[i] < DEGENERACY_HARTREE {
            j += 1;
        }
        let capacity = 2.0 * (j - i) as f64;
        let put = left.min(capacity);
        if put < capacity && j - i > 1 {
            shared = true;
        }
        for o in &mut occ[i..j] {
            *o = put / (j - i) as f64;
        }
        left -= put;
        i = j;
    }
    (occ, shared)
}

/// An orbital chosen by its number (from 1, by energy) or relative to the frontier.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum OrbitalSelector {
    Number(usize),
    /// `homo` (0), `homo-1` (1), …
    Homo(usize),
    /// `lumo` (0), `lumo+1` (1), …
    Lumo(usize),
}

impl OrbitalSelector {
    pub fn parse(text: &str) -> Result<Self> {
        let t = text.trim().to_ascii_lowercase();
        let bad = || {
            Error::input(format!("cannot read {text:?} as an orbital"))
                .with_hint("give a number from 1 (lowest energy), homo, homo-K, lumo or lumo+K")
        };
        if let Some(rest) = t.strip_prefix("homo") {
            return match rest {
                "" => Ok(OrbitalSelector::Homo(0)),
                r => r
                    .strip_prefix('-')
                    .and_then(|k| k.parse().ok())
                    .map(OrbitalSelector::Homo)
                    .ok_or_else(bad),
            };
        }
        if let Some(rest) = t.strip_prefix("lumo") {
            return match rest {
                "" => Ok(OrbitalSelector::Lumo(0)),
                r => r
                    .strip_prefix('+')
                    .and_then(|k| k.parse().ok())
                    .map(OrbitalSelector::Lumo)
                    .ok_or_else(bad),
            };
        }
        match t.parse::<usize>() {
            Ok(n) if n >= 1 => Ok(OrbitalSelector::Number(n)),
            _ => Err(bad()),
        }
    }

    /// Resolves to a 0-based index into `orbitals` (sorted by energy).
    pub fn resolve(self, orbitals: &[Orbital]) -> Result<usize> {
        let n = orbitals.len();
        let homo = orbitals.iter().rposition(|o| o.occupation > 1e-12);
        let idx = match self {
            OrbitalSelector::Number(k) => Some(k - 1),
            OrbitalSelector::Homo(k) => homo.and_then(|h| h.checked_sub(k)),
            OrbitalSelector::Lumo(k) => Some(homo.map_or(0, |h| h + 1) + k),
        };
        match idx {
            Some(i) if i < n => Ok(i),
            _ => Err(Error::input(format!(
                "there is no orbital {self} here: the set holds {n} orbitals, numbered 1 to {n}"
            ))),
        }
    }
}

impl std::fmt::Display for OrbitalSelector {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            OrbitalSelector::Number(k) => write!(f, "{k}"),
            OrbitalSelector::Homo(0) => write!(f, "homo"),
            OrbitalSelector::Homo(k) => write!(f, "homo-{k}"),
            OrbitalSelector::Lumo(0) => write!(f, "lumo"),
            OrbitalSelector::Lumo(k) => write!(f, "lumo+{k}"),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn orbs(occ: &[f64]) -> Vec<Orbital> {
        occ.iter()
            .enumerate()
            .map(|(i, &o)| Orbital {
                energy: i as f64,
                occupation: o,
                coefficients: vec![],
            })
            .collect()
    }

    #[test]
    fn selectors_resolve_by_occupation() {
        let o = orbs(&[2.0, 2.0, 0.0, 0.0]);
        assert_eq!(
            OrbitalSelector::parse("HOMO").unwrap().resolve(&o).unwrap(),
            1
        );
        assert_eq!(
            OrbitalSelector::parse("homo-1")
                .unwrap()
                .resolve(&o)
                .unwrap(),
            0
        );
        assert_eq!(
            OrbitalSelector::parse("lumo+1")
                .unwrap()
                .resolve(&o)
                .unwrap(),
            3
        );
        assert_eq!(OrbitalSelector::parse("3").unwrap().resolve(&o).unwrap(), 2);
        assert!(OrbitalSelector::parse("5").unwrap().resolve(&o).is_err());
        assert!(
            OrbitalSelector::parse("homo-2")
                .unwrap()
                .resolve(&o)
                .is_err()
        );
        assert!(OrbitalSelector::parse("0").is_err());
        assert!(OrbitalSelector::parse("homo+1").is_err());
    }

    #[test]
    fn aufbau_shares_degenerate_levels() {
        let (occ, shared) = aufbau(&[-2.0, -1.0, -1.0, 0.5], 4.0);
        assert_eq!(occ, vec![2.0, 1.0, 1.0, 0.0]);
        assert!(shared);
        let (occ, shared) = aufbau(&[-1.0, 1.0], 1.0);
        assert_eq!(occ, vec![1.0, 0.0]);
        assert!(!shared);
    }
}
