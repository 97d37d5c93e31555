//! Atoms and molecules. Positions are stored in bohr.

use std::collections::HashMap;

use super::elements::Element;
use super::units::{BOHR_IN_ANGSTROM, bohr_to_angstrom};
use crate::error::{Error, Result};

/// Nuclei closer than this (bohr) are treated as one point: almost always a typo.
/// Every molecule is held to it, including the geometries of an energy curve.
pub const COINCIDENT_BOHR: f64 = 1e-4;

/// Atoms read from a file (XYZ, model, orbital file) closer than this (Å) are refused:
/// no chemical bond is shorter than about 0.5 Å, so such a pair is a duplicated or
/// mistyped line (common practice). Ghost centres (Z = 0) are exempt: they may sit
/// anywhere, even on an atom.
pub const MIN_SEPARATION_ANGSTROM: f64 = 0.1;

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
    /// False when the charge was not stated but inferred (an orbital file's
    /// fractional occupations): titles then show the formula alone.
    pub charge_known: bool,
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
        }
        if let Some((i, j, _)) = closest_pair_below(&atoms, COINCIDENT_BOHR) {
            return Err(Error::input(format!(
                "atoms {} and {} ({} and {}) sit at the same place",
                i + 1,
                j + 1,
                atoms[i].element.symbol,
                atoms[j].element.symbol
            )));
        }
        let molecule = Molecule {
            atoms,
            charge,
            charge_known: true,
        };
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

    /// The formula in the Hill system (E. A. Hill, J. Am. Chem. Soc. 22, 478 (1900)):
    /// with carbon, C first, then H, then the other symbols alphabetically; without
    /// carbon, every symbol alphabetically (HCl → "ClH", NH₃ → "H3N"). Ghost centres
    /// (Z = 0) are not part of the formula unless there is nothing else.
    pub fn formula(&self) -> String {
        let mut counts: Vec<(&str, usize)> = Vec::new();
        let real = self.atoms.iter().any(|a| a.element.atomic_number > 0);
        for a in &self.atoms {
            if real && a.element.atomic_number == 0 {
                continue;
            }
            match counts.iter_mut().find(|(s, _)| *s == a.element.symbol) {
                Some((_, n)) => *n += 1,
                None => counts.push((a.element.symbol, 1)),
            }
        }
        let carbon = counts.iter().any(|(s, _)| *s == "C");
        let rank = |s: &str| match s {
            "C" if carbon => 0,
            "H" if carbon => 1,
            _ => 2,
        };
        counts.sort_by(|a, b| rank(a.0).cmp(&rank(b.0)).then(a.0.cmp(b.0)));
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

    /// The formula with its charge, e.g. "H2+" or "C2H4" or "O4S-2"; the formula alone
    /// when the charge was not stated (`charge_known` false).
    pub fn formula_with_charge(&self) -> String {
        if !self.charge_known {
            return self.formula();
        }
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
                let zz = a.charge() * b.charge();
                // A ghost centre (no charge) may sit on an atom: it adds nothing.
                if zz != 0.0 {
                    e += zz / distance(a.position, b.position);
                }
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

impl Molecule {
    /// A molecule from element symbols and positions (bohr), for tests and
    /// examples written in code.
    pub fn from_symbols(atoms: &[(&str, [f64; 3])], charge: i32) -> Result<Molecule> {
        let atoms = atoms
            .iter()
            .map(|(s, p)| {
                let element = crate::chem::elements::by_symbol(s).ok_or_else(|| {
                    crate::error::Error::input(crate::chem::elements::unknown_symbol(s))
                })?;
                Ok(Atom {
                    element,
                    position: *p,
                })
            })
            .collect::<Result<Vec<_>>>()?;
        Molecule::new(atoms, charge)
    }
}

pub fn distance(a: [f64; 3], b: [f64; 3]) -> f64 {
    (nalgebra::Vector3::from(a) - nalgebra::Vector3::from(b)).norm()
}

/// The first pair of centres (i < j, ordered by j then i) closer than `threshold`
/// (bohr), with their distance; ghost centres (Z = 0) are skipped. Linear time: the
/// atoms are binned in cubes of side `threshold`, and only neighbouring cubes are
/// compared (a cube holds few atoms unless they are too close anyway).
pub fn closest_pair_below(atoms: &[Atom], threshold: f64) -> Option<(usize, usize, f64)> {
    let cell = |p: [f64; 3]| p.map(|x| (x / threshold).floor() as i64);
    let mut cells: HashMap<[i64; 3], Vec<usize>> = HashMap::new();
    for (j, b) in atoms.iter().enumerate() {
        if b.element.atomic_number == 0 {
            continue;
        }
        let c = cell(b.position);
        let mut best: Option<(usize, f64)> = None;
        for dx in -1i64..=1 {
            for dy in -1i64..=1 {
                for dz in -1i64..=1 {
                    let key = [
                        c[0].saturating_add(dx),
                        c[1].saturating_add(dy),
                        c[2].saturating_add(dz),
                    ];
                    for &i in cells.get(&key).into_iter().flatten() {
                        let d = distance(atoms[i].position, b.position);
                        if d < threshold && best.is_none_or(|(k, _)| i < k) {
                            best = Some((i, d));
                        }
                    }
                }
            }
        }
        if let Some((i, d)) = best {
            return Some((i, j, d));
        }
        cells.entry(c).or_default().push(j);
    }
    None
}

/// Refuses atoms closer than `MIN_SEPARATION_ANGSTROM`, naming the pair: atom numbers
/// (from 1), symbols and distance in Å. `place(i)` adds where atom i came from (e.g.
/// " on line 4"), or nothing.
pub fn check_separations(atoms: &[Atom], place: impl Fn(usize) -> String) -> Result<()> {
    let threshold = MIN_SEPARATION_ANGSTROM / BOHR_IN_ANGSTROM;
    if let Some((i, j, d)) = closest_pair_below(atoms, threshold) {
        return Err(Error::input(format!(
            "atoms {} ({}{}) and {} ({}{}) are {:.4} Å apart, closer than {} Å: a duplicated or mistyped atom?",
            i + 1,
            atoms[i].element.symbol,
            place(i),
            j + 1,
            atoms[j].element.symbol,
            place(j),
            bohr_to_angstrom(d),
            MIN_SEPARATION_ANGSTROM
        )));
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::chem::elements::by_symbol;

    fn molecule(atoms: &[(&str, [f64; 3])]) -> Molecule {
        Molecule::from_symbols(atoms, 0).unwrap()
    }

    /// The Hill system (E. A. Hill, J. Am. Chem. Soc. 22, 478 (1900); citation from
    /// memory): a carbon compound lists C, then H, then the rest alphabetically
    /// (CH2O, CO2, C2H6O, CBrClF2); without carbon everything is alphabetical (H2O,
    /// ClH, H3N, O4S).
    #[test]
    fn formulas_in_hill_order() {
        let x = |k: f64| [0.0, 0.0, 2.0 * k];
        let cases: Vec<(Vec<&str>, &str)> = vec![
            (vec!["O", "C", "H", "H"], "CH2O"),
            (vec!["O", "C", "O"], "CO2"),
            (vec!["H", "O", "H"], "H2O"),
            (vec!["H", "Cl"], "ClH"),
            (vec!["N", "H", "H", "H"], "H3N"),
            (vec!["O", "H", "C", "C", "H", "H", "H", "H", "H"], "C2H6O"),
            (vec!["F", "Cl", "Br", "C", "F"], "CBrClF2"),
            (vec!["S", "O", "O", "O", "O"], "O4S"),
            (vec!["Fe", "C", "O"], "CFeO"),
        ];
        for (symbols, want) in cases {
            let atoms: Vec<_> = symbols
                .iter()
                .enumerate()
                .map(|(k, s)| (*s, x(k as f64)))
                .collect();
            assert_eq!(molecule(&atoms).formula(), want, "{symbols:?}");
        }
        let mut m = molecule(&[("H", x(0.0)), ("H", x(1.0)), ("X", x(0.5))]);
        assert_eq!(m.formula(), "H2", "ghost centres are not in the formula");
        m.charge = -98;
        assert_eq!(m.formula_with_charge(), "H2-98");
        m.charge_known = false;
        assert_eq!(
            m.formula_with_charge(),
            "H2",
            "an unstated charge is not shown"
        );
    }

    #[test]
    fn close_pairs_are_found_and_named() {
        // 0.05 Å apart (well under the 0.1 Å common-practice limit), with a third atom
        // far away and a ghost centre on top of atom 1, which is allowed.
        let b = 0.05 / BOHR_IN_ANGSTROM;
        let atoms: Vec<Atom> = [("O", 0.0), ("X", 0.0), ("H", 3.0), ("H", b)]
            .iter()
            .map(|(s, z)| Atom {
                element: by_symbol(s).unwrap(),
                position: [1.0, -2.0, *z],
            })
            .collect();
        let (i, j, d) = closest_pair_below(&atoms, 0.1 / BOHR_IN_ANGSTROM).unwrap();
        assert_eq!((i, j), (0, 3));
        assert!((d - b).abs() < 1e-12);
        let e = check_separations(&atoms, |_| String::new()).unwrap_err();
        assert!(
            e.message
                .contains("atoms 1 (O) and 4 (H) are 0.0500 Å apart"),
            "{}",
            e.message
        );
        // Just over the limit passes; the ghost on atom 1 passes Molecule::new too.
        let mut ok = atoms.clone();
        ok[3].position[2] = 0.1001 / BOHR_IN_ANGSTROM;
        assert!(check_separations(&ok, |_| String::new()).is_ok());
        let m = Molecule::new(ok, 0).unwrap();
        assert!(m.nuclear_repulsion().is_finite());
    }

    /// Linear time: 100 000 atoms on a 2 Å lattice are checked quickly, and a
    /// duplicate at the very end is found.
    #[test]
    fn many_atoms_are_checked_in_linear_time() {
        let h = by_symbol("H").unwrap();
        let mut atoms: Vec<Atom> = (0..100_000)
            .map(|k| Atom {
                element: h,
                position: [
                    (k % 50) as f64 * 4.0,
                    ((k / 50) % 50) as f64 * 4.0,
                    (k / 2500) as f64 * 4.0,
                ],
            })
            .collect();
        let t = std::time::Instant::now();
        assert!(check_separations(&atoms, |_| String::new()).is_ok());
        atoms.push(atoms[12_345].clone());
        let e = check_separations(&atoms, |_| String::new()).unwrap_err();
        assert!(
            e.message.contains("atoms 12346 (H) and 100001 (H)"),
            "{}",
            e.message
        );
        assert!(t.elapsed().as_secs_f64() < 5.0);
    }
}
