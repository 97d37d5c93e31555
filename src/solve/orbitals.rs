//! Orbitals as plain data, occupations, and choosing an orbital by number or by
//! occupation (`homo`, `lumo+1`, …).

use nalgebra::DMatrix;

use crate::basis::Basis;
use crate::chem::Molecule;
use crate::error::{Error, Result};

/// A statement that must go with a method's numbers wherever they are shown
/// (tables, figure footnotes, orbital files). Decided by the solver as data, turned
/// into text only at output.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Caveat {
    /// A minimal basis used for energies or bond strengths.
    MinimalBasis,
    /// A semi-empirical method (extended Hückel).
    SemiEmpirical,
    /// Hartree–Fock: no electron correlation; Koopmans orbital energies.
    Uncorrelated,
}

impl Caveat {
    pub const ALL: [Caveat; 3] = [
        Caveat::MinimalBasis,
        Caveat::SemiEmpirical,
        Caveat::Uncorrelated,
    ];

    pub fn text(self) -> &'static str {
        match self {
            Caveat::MinimalBasis => super::one_electron::MINIMAL_BASIS_CAVEAT,
            Caveat::SemiEmpirical => super::huckel::CAUTION,
            Caveat::Uncorrelated => super::scf::CAUTION,
        }
    }

    /// The short form a figure's footnote carries, where the figure needs one (the
    /// extended-Hückel caution already stands in every figure's method line).
    pub fn figure_note(self) -> Option<&'static str> {
        match self {
            Caveat::MinimalBasis => {
                Some("Minimal basis: shapes and signs are qualitative; energies are upper bounds.")
            }
            Caveat::SemiEmpirical | Caveat::Uncorrelated => None,
        }
    }

    /// The caveat a note of an orbital file states, if it is one of ours.
    pub fn from_text(text: &str) -> Option<Caveat> {
        Caveat::ALL.into_iter().find(|c| c.text() == text)
    }
}

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
    /// The method that made the orbitals (`File` for orbitals from elsewhere); it
    /// decides the energy unit of titles (eV for extended Hückel).
    pub origin: super::MethodKind,
    /// How the orbitals were obtained, for display only: "one-electron, slater-1s".
    pub method: String,
    /// What the numbers may and may not be used for.
    pub caveats: Vec<Caveat>,
    /// Other statements the user must see with the numbers: anything the solver had
    /// to do (dropped functions), shared electrons, renumbering.
    pub notes: Vec<String>,
    /// Free-atom valence occupation of each basis function (the neutral, spherical
    /// atoms the deformation density is measured against), where the method has one.
    pub reference: Option<Vec<f64>>,
    /// Levels closer than this (hartree) form one degenerate set: 1e-6 of the unit
    /// the method reports its energies in (see `degenerate::tolerance`).
    pub degeneracy: f64,
    /// What an unrestricted or self-consistent set carries besides its orbitals;
    /// `Spin::default()` for the other methods.
    pub spin: Spin,
}

/// Spin channels and self-consistent-field facts. In an unrestricted set
/// `OrbitalSet::orbitals` are the alpha orbitals (occupations 0 or 1) and `beta`
/// the beta ones; a restricted set has `beta = None` and occupations up to 2.
#[derive(Debug, Clone, Default)]
pub struct Spin {
    pub beta: Option<Vec<Orbital>>,
    /// 2S + 1, where the method or the file states it.
    pub multiplicity: Option<u32>,
    /// Total energy in hartree (electronic plus nuclear repulsion), where the
    /// method or the file states it. Orbital energies never include E_nn.
    pub total_energy: Option<f64>,
    /// The deformation reference as orbitals: each spherical free atom's occupied
    /// orbitals in the same basis, as (occupation, coefficients over the whole
    /// basis). For self-consistent methods, whose reference is not diagonal.
    pub free_atoms: Option<Vec<(f64, Vec<f64>)>>,
    /// The run's report (energy parts, convergence, properties), when solved here.
    pub scf: Option<Box<super::scf::ScfReport>>,
    /// The channel that orbital fields, titles and tables pick (`--spin`).
    pub shown: Channel,
}

/// Which spin channel of an unrestricted set a field or a table uses.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum Channel {
    #[default]
    Alpha,
    Beta,
}

impl std::str::FromStr for Channel {
    type Err = String;
    fn from_str(s: &str) -> std::result::Result<Self, String> {
        match s.trim().to_ascii_lowercase().as_str() {
            "alpha" | "a" => Ok(Channel::Alpha),
            "beta" | "b" => Ok(Channel::Beta),
            _ => Err(format!("unknown spin {s:?}: use alpha or beta")),
        }
    }
}

impl Channel {
    pub fn name(self) -> &'static str {
        match self {
            Channel::Alpha => "alpha",
            Channel::Beta => "beta",
        }
    }
}

impl OrbitalSet {
    /// Whether the set has separate alpha and beta orbitals.
    pub fn is_unrestricted(&self) -> bool {
        self.spin.beta.is_some()
    }

    /// Makes orbital fields and titles use channel `c`; beta needs an unrestricted set.
    pub fn show(&mut self, c: Channel) -> Result<()> {
        if c == Channel::Beta && !self.is_unrestricted() {
            return Err(Error::input(format!(
                "--spin beta needs unrestricted orbitals; {} has one set for both spins",
                self.method
            ))
            .with_hint("solve with --method uhf, or leave out --spin"));
        }
        self.spin.shown = c;
        Ok(())
    }

    /// The orbitals that orbital fields pick: those of the `shown` channel.
    pub fn shown(&self) -> &[Orbital] {
        self.channel(self.spin.shown)
    }

    /// "beta orbital" or "orbital": how titles name an orbital of the shown channel.
    pub fn orbital_word(&self) -> &'static str {
        match (self.is_unrestricted(), self.spin.shown) {
            (false, _) => "orbital",
            (true, Channel::Alpha) => "alpha orbital",
            (true, Channel::Beta) => "beta orbital",
        }
    }

    /// The orbitals of one channel: a restricted set has only one, whatever is asked.
    pub fn channel(&self, c: Channel) -> &[Orbital] {
        match (c, &self.spin.beta) {
            (Channel::Beta, Some(b)) => b,
            _ => &self.orbitals,
        }
    }

    /// (occupation, orbital) of every occupied orbital of both channels.
    pub fn occupied(&self) -> impl Iterator<Item = &Orbital> {
        self.orbitals
            .iter()
            .chain(self.spin.beta.iter().flatten())
            .filter(|o| o.occupation != 0.0)
    }

    /// Scales every orbital (both channels) to ⟨ψ|ψ⟩ = cᵀSc = 1. Returns how many
    /// were off 1 by more than 1e-12 and the norm furthest from 1.
    pub fn renormalize(&mut self) -> Result<(usize, f64)> {
        let s = self.overlap.clone().ok_or_else(|| {
            Error::input(
                "cannot renormalise: lobecast has no overlap integrals for this basis (it mixes Slater and Gaussian functions, or has Slater functions beyond s and p)",
            )
        })?;
        let (mut fixed, mut worst) = (0, 1.0f64);
        let beta = self.spin.beta.iter_mut().flatten();
        for o in self.orbitals.iter_mut().chain(beta) {
            let c = nalgebra::DVector::from_column_slice(&o.coefficients);
            let n = c.dot(&(&s * &c));
            if !(n.is_finite() && n > 0.0) {
                return Err(Error::input(format!(
                    "cannot renormalise an orbital with ⟨ψ|ψ⟩ = {n:e}"
                )));
            }
            if (n - 1.0).abs() > 1e-12 {
                fixed += 1;
                let k = 1.0 / n.sqrt();
                o.coefficients.iter_mut().for_each(|v| *v *= k);
            }
            if (n - 1.0).abs() > (worst - 1.0).abs() {
                worst = n;
            }
        }
        Ok((fixed, worst))
    }

    /// Every statement to print with the numbers: the caveats' text, then the notes.
    pub fn statements(&self) -> Vec<String> {
        self.caveats
            .iter()
            .map(|c| c.text().to_string())
            .chain(self.notes.iter().cloned())
            .collect()
    }

    pub fn has_caveat(&self, c: Caveat) -> bool {
        self.caveats.contains(&c)
    }

    /// Mulliken gross populations of one orbital per basis function,
    /// q_μ = c_μ Σ_ν S_μν c_ν; they sum to cᵀSc (1 for a normalised orbital).
    pub fn gross_populations(&self, index: usize) -> Result<Vec<f64>> {
        self.populations(&self.shown()[index].coefficients)
    }

    /// Mulliken gross populations of any coefficient vector (see `gross_populations`).
    pub fn populations(&self, c: &[f64]) -> Result<Vec<f64>> {
        let s = self.overlap.as_ref().ok_or_else(|| {
            Error::input(
                "Mulliken populations need the overlap matrix, which lobecast computes for Gaussian \
                 functions and for 1s Slater functions of equal exponent",
            )
        })?;

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
        let s = self.overlap.as_ref()?;
        let mut q = vec![0.0; self.molecule.atoms.len()];
        let atoms: Vec<usize> = self.basis.function_labels().iter().map(|l| l.0).collect();
        match (&self.reference, &self.spin.free_atoms) {
            (Some(reference), _) => {
                for (m, &a) in atoms.iter().enumerate() {
                    q[a] += reference[m];
                }
            }
            // All-electron: the free atoms hold their nuclear charge in electrons.
            (None, Some(_)) => {
                for (a, atom) in self.molecule.atoms.iter().enumerate() {
                    q[a] = atom.charge();
                }
            }
            (None, None) => return None,
        }
        for o in self.occupied() {
            let c = &o.coefficients;
            for (m, &a) in atoms.iter().enumerate() {
                let sc: f64 = (0..c.len()).map(|n| s[(m, n)] * c[n]).sum();
                q[a] -= o.occupation * c[m] * sc;
            }
        }
        Some(q)
    }
}

/// Aufbau filling with two electrons per orbital; a group of levels within `tol`
/// (hartree, see `degenerate::groups`) that is only partly filled shares its
/// electrons evenly. Returns (occupations, whether any sharing happened).
pub fn aufbau(energies: &[f64], electrons: f64, tol: f64) -> (Vec<f64>, bool) {
    let mut occ = vec![0.0; energies.len()];
    let mut left = electrons;
    let mut shared = false;
    for g in super::degenerate::groups(energies, tol) {
        if left <= 1e-12 {
            break;
        }
        let capacity = 2.0 * g.len() as f64;
        let put = left.min(capacity);
        if put < capacity && g.len() > 1 {
            shared = true;
        }
        let each = put / g.len() as f64;
        for o in &mut occ[g] {
            *o = each;
        }
        left -= put;
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
            Ok(_) => Err(Error::input(format!(
                "there is no orbital {text:?}: orbitals are numbered from 1 (lowest energy)"
            ))),
            _ => Err(bad()),
        }
    }

    /// Resolves to a 0-based index into `orbitals` (sorted by energy). Offsets are
    /// user numbers, so every step is checked: a selector past either end of the set
    /// is an error naming the orbital it would be and the valid range, never a
    /// wrapped index.
    pub fn resolve(self, orbitals: &[Orbital]) -> Result<usize> {
        let n = orbitals.len();
        let homo = orbitals.iter().rposition(|o| o.occupation > 1e-12);
        let range = if n == 0 {
            String::from("the set has no orbitals")
        } else {
            format!(
                "the set has {n} orbital{} (1 to {n})",
                if n == 1 { "" } else { "s" }
            )
        };
        let idx = match self {
            OrbitalSelector::Number(0) => {
                return Err(Error::input(format!(
                    "there is no orbital 0: orbitals are numbered from 1 and {range}"
                )));
            }
            OrbitalSelector::Number(k) => k - 1,
            OrbitalSelector::Homo(k) => {
                let Some(h) = homo else {
                    return Err(Error::input(format!(
                        "orbital:{self} needs an occupied orbital, but no orbital of this set is occupied ({range})"
                    )));
                };
                match h.checked_sub(k) {
                    Some(i) => i,
                    None => {
                        return Err(Error::input(format!(
                            "orbital:{self} is below orbital 1: homo is orbital {} and {range}, so homo-K needs K from 0 to {h}",
                            h + 1
                        )));
                    }
                }
            }
            OrbitalSelector::Lumo(k) => {
                let lumo = homo.map_or(0, |h| h + 1);
                match lumo.checked_add(k) {
                    Some(i) => i,
                    None => {
                        return Err(Error::input(format!(
                            "orbital:{self} is past the last orbital: lumo is orbital {} and {range}",
                            lumo + 1
                        )));
                    }
                }
            }
        };
        if idx < n {
            return Ok(idx);
        }
        let hint = match (self, homo) {
            (OrbitalSelector::Lumo(_), h) if h.map_or(0, |h| h + 1) < n => {
                let lumo = h.map_or(0, |h| h + 1);
                format!(
                    "; lumo is orbital {}, so lumo+K needs K from 0 to {}",
                    lumo + 1,
                    n - 1 - lumo
                )
            }
            (OrbitalSelector::Lumo(_), _) => {
                String::from("; every orbital is occupied, so there is no lumo")
            }
            _ => String::new(),
        };
        // A checked sum can still be usize::MAX, whose orbital number would not fit.
        let number = idx
            .checked_add(1)
            .map_or_else(|| format!("{idx}+1"), |v| v.to_string());
        Err(Error::input(format!(
            "orbital:{self} is orbital {number} but {range}{hint}"
        )))
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

    /// Out-of-range selectors are errors naming the orbital and the valid range,
    /// never a wrapped index (the reported case: lumo+18446744073709551615 gave the
    /// HOMO).
    #[test]
    fn out_of_range_selectors_name_the_range() {
        let o = orbs(&[2.0, 2.0, 2.0, 2.0, 0.0, 0.0, 0.0]);
        let err = |s: &str| {
            OrbitalSelector::parse(s)
                .and_then(|sel| sel.resolve(&o))
                .unwrap_err()
                .message
        };
        let e = err("lumo+3");
        assert_eq!(
            e,
            "orbital:lumo+3 is orbital 8 but the set has 7 orbitals (1 to 7); lumo is orbital 5, so lumo+K needs K from 0 to 2"
        );
        for huge in [
            format!("lumo+{}", usize::MAX),
            format!("lumo+{}", usize::MAX - 4),
            format!("lumo+{}", usize::MAX - 5),
        ] {
            let e = err(&huge);
            assert!(e.contains("the set has 7 orbitals (1 to 7)"), "{huge}: {e}");
        }
        let e = err("homo-4");
        assert!(
            e.contains("below orbital 1") && e.contains("K from 0 to 3"),
            "{e}"
        );
        assert!(err(&format!("homo-{}", usize::MAX)).contains("below orbital 1"));
        assert!(err("0").contains("numbered from 1"));
        assert!(err("8").contains("is orbital 8 but the set has 7 orbitals"));
        assert_eq!(
            OrbitalSelector::parse("lumo+2")
                .unwrap()
                .resolve(&o)
                .unwrap(),
            6
        );
        let empty = orbs(&[0.0, 0.0]);
        assert!(
            OrbitalSelector::parse("homo")
                .unwrap()
                .resolve(&empty)
                .unwrap_err()
                .message
                .contains("no orbital of this set is occupied")
        );
        let full = orbs(&[2.0, 2.0]);
        assert!(
            OrbitalSelector::parse("lumo")
                .unwrap()
                .resolve(&full)
                .unwrap_err()
                .message
                .contains("no lumo")
        );
    }

    #[test]
    fn aufbau_shares_degenerate_levels() {
        let (occ, shared) = aufbau(&[-2.0, -1.0, -1.0, 0.5], 4.0, 1e-6);
        assert_eq!(occ, vec![2.0, 1.0, 1.0, 0.0]);
        assert!(shared);
        let (occ, shared) = aufbau(&[-1.0, 1.0], 1.0, 1e-6);
        assert_eq!(occ, vec![1.0, 0.0]);
        assert!(!shared);
    }
}
