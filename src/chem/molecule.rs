//! Atoms and molecules. Positions are stored in bohr.

use super::elements::Element;
use crate::error::{Error, Result};

/// Nuclei closer than this (bohr) are treated as one point: almost always a typo.
pub const COINCIDENT_BOHR: f64 = 1e-4;

#[derive(Debug, Clone, PartialEq)]
pub struct Atom {
    pub element: &'static Element,
    /// Position in bohr.
    pub position: [f64; 3],
}

impl Atom {
    pub fn charge(&self) -> f64 {
        self.element.atomic_number as f64
    }
}

#[derive(Debug, Clone, PartialEq)]
pub struct Molecule {
    pub atoms: Vec<Atom>,
    /// Net charge in units of the elementary charge.
    pub charge: i32,
}

impl Molecule {
    /// Builds a molecule, refusing an empty one and coincident nuclei.
    pub fn new(atoms: Vec<Atom>, charge: i32) -> Result<Self> {
        if atoms.is_empty() {
            return Err(Error::input("the molecule has no atoms"));
        }
        for (i, a) in atoms.iter().enumerate() {
            if a.position.iter().any(|x| !x.is_finite()) {
                return Err(Error::input(format!(
                    "atom {} has a non-finite position",
                    i + 1
                )));
            }
            for (j, b) in atoms.iter().enumerate().skip(i + 1) {
                if distance(a.position, b.position) < COINCIDENT_BOHR {
                    return Err(Error::input(format!(
                        "atoms {} and {} ({} and {}) sit at the same place",
                        i + 1,
                        j + 1,
                        a.element.symbol,
                        b.element.symbol
                    )));
                }
            }
        }
        let molecule = Molecule { atoms, charge };
        if molecule.electron_count() < 0 {
            return Err(Error::input(format!(
                "charge {charge} leaves a negative number of electrons"
            )));
        }
        Ok(molecule)
    }

    /// Total electrons: nuclear charges minus the net charge (may be negative for a
    /// nonsensical input, which `new` refuses).
    pub fn electron_count(&self) -> i64 {
        let z: i64 = self
            .atoms
            .iter()
            .map(|a| a.element.atomic_number as i64)
            .sum();
        z - self.charge as i64
    }

    /// Brief formula in input order of first appearance, e.g. "H2" or "C2H4".
    pub fn formula(&self) -> String {
        let mut counts: Vec<(&str, usize)> = Vec::new();
        for a in &self.atoms {
            match counts.iter_mut().find(|(s, _)| *s == a.element.symbol) {
                Some((_, n)) => *n += 1,
                None => counts.push((a.element.symbol, 1)),
            }
        }
        counts
            .iter()
            .map(|(s, n)| {
                if *n == 1 {
                    s.to_string()
                } else {
                    format!("{s}{n}")
                }
            })
            .collect()
    }

    /// The formula with its charge, e.g. "H2+" or "C2H4" or "SO4-2".
    pub fn formula_with_charge(&self) -> String {
        match self.charge {
            0 => self.formula(),
            1 => format!("{}+", self.formula()),
            -1 => format!("{}-", self.formula()),
            q if q > 0 => format!("{}+{q}", self.formula()),
            q => format!("{}-{}", self.formula(), -q),
        }
    }

    /// Classical repulsion of the nuclei (hartree).
    pub fn nuclear_repulsion(&self) -> f64 {
        let mut e = 0.0;
        for (i, a) in self.atoms.iter().enumerate() {
            for b in &self.atoms[i + 1..] {
                e += a.charge() * b.charge() / distance(a.position, b.position);
            }
        }
        e
    }

    /// Smallest and largest coordinates over all nuclei (bohr).
    pub fn bounds(&self) -> ([f64; 3], [f64; 3]) {
        let mut lo = [f64::INFINITY; 3];
        let mut hi = [f64::NEG_INFINITY; 3];
        for a in &self.atoms {
            for d in 0..3 {
                lo[d] = lo[d].min(a.position[d]);
                hi[d] = hi[d].max(a.position[d]);
            }
        }
        (lo, hi)
    }
}

pub fn distance(a: [f64; 3], b: [f64; 3]) -> f64 {
    ((a[0] - b[0]).powi(2) + (a[1] - b[1]).powi(2) + (a[2] - b[2]).powi(2)).sqrt()
}
