//! Extended-Hückel parameters: valence Slater exponents and valence-state
//! ionisation energies H_ii, with per-element overrides from the model file, and
//! the valence basis they define on a molecule.
//!
//! Sources (every value below is from memory, not re-checked against the printed
//! tables; correct them here if a table disagrees):
//! * C, and H_ii of H: R. Hoffmann, J. Chem. Phys. 39, 1397 (1963), which treats
//!   hydrocarbons only (exponents by Slater's rules).
//! * ζ(H) = 1.3: the value of later compilations; Hoffmann 1963 probably used a
//!   different hydrogen exponent. From memory, source to be confirmed.
//! * N, O: not in Hoffmann 1963 (hydrocarbons only); the values are those commonly
//!   tabulated in compilations such as the one below. From memory, source to be
//!   confirmed.
//! * Li, Be, B, F, Na–Cl: the standard compilation of extended-Hückel parameters,
//!   S. Alvarez, "Tables of Parameters for Extended Hückel Calculations",
//!   Universitat de Barcelona (1993); exponents there mostly follow Slater's rules.
//!
//! Extended-Hückel numbers are semi-empirical and qualitative: these parameters
//! are fitted to atomic spectra, not derived.

use std::collections::BTreeMap;

use serde::Deserialize;

use crate::basis::{Basis, Shell, SlaterShell};
use crate::chem::Molecule;
use crate::chem::elements::Element;
use crate::chem::units::HARTREE_IN_EV;
use crate::error::{Error, Result};

/// One valence shell: principal quantum number, exponent (bohr⁻¹), H_ii (eV).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ShellParams {
    pub n: u32,
    pub zeta: f64,
    pub energy_ev: f64,
}

/// The valence s shell and (except for H) the p shell of one element.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ElementParams {
    pub s: ShellParams,
    pub p: Option<ShellParams>,
}

const fn sp(n: u32, zs: f64, hs: f64, zp: f64, hp: f64) -> Option<ElementParams> {
    Some(ElementParams {
        s: ShellParams {
            n,
            zeta: zs,
            energy_ev: hs,
        },
        p: Some(ShellParams {
            n,
            zeta: zp,
            energy_ev: hp,
        }),
    })
}

/// Built-in parameters by atomic number (sources in the module comment).
pub fn builtin(z: u32) -> Option<ElementParams> {
    match z {
        // H_ii: Hoffmann 1963; ζ = 1.3: later compilations (source to be confirmed).
        1 => Some(ElementParams {
            s: ShellParams {
                n: 1,
                zeta: 1.3,
                energy_ev: -13.6,
            },
            p: None,
        }),
        // Alvarez 1993 compilation.
        3 => sp(2, 0.650, -5.4, 0.650, -3.5),
        4 => sp(2, 0.975, -10.0, 0.975, -6.0),
        5 => sp(2, 1.300, -15.2, 1.300, -8.5),
        // Hoffmann 1963 (hydrocarbons).
        6 => sp(2, 1.625, -21.4, 1.625, -11.4),
        // Not in Hoffmann 1963: from memory, source to be confirmed.
        7 => sp(2, 1.950, -26.0, 1.950, -13.4),
        8 => sp(2, 2.275, -32.3, 2.275, -14.8),
        // Alvarez 1993 compilation.
        9 => sp(2, 2.425, -40.0, 2.425, -18.1),
        11 => sp(3, 0.733, -5.1, 0.733, -3.0),
        12 => sp(3, 1.100, -9.0, 1.100, -4.5),
        13 => sp(3, 1.167, -12.3, 1.167, -6.5),
        14 => sp(3, 1.383, -17.3, 1.383, -9.2),
        15 => sp(3, 1.600, -18.6, 1.600, -14.0),
        16 => sp(3, 1.817, -20.0, 1.817, -13.3),
        17 => sp(3, 2.183, -26.3, 1.733, -14.2),
        _ => None,
    }
}

/// Principal quantum number of the valence shell (H–Ar).
pub fn valence_n(z: u32) -> u32 {
    match z {
        0..=2 => 1,
        3..=10 => 2,
        _ => 3,
    }
}

/// Valence electrons of the neutral atom: Z minus the closed core.
pub fn valence_electrons(z: u32) -> u32 {
    match z {
        0..=2 => z,
        3..=10 => z - 2,
        _ => z - 10,
    }
}

/// (s, p) occupations of the free-atom ground configuration (aufbau: ns before np).
pub fn ground_occupations(z: u32) -> (f64, f64) {
    let v = valence_electrons(z);
    let s = v.min(2);
    (s as f64, (v - s) as f64)
}

/// A user's replacement for one shell's exponent and/or H_ii (eV).
#[derive(Debug, Clone, Copy, Default, Deserialize, PartialEq)]
#[serde(deny_unknown_fields)]
pub struct ShellOverride {
    pub zeta: Option<f64>,
    /// H_ii in eV.
    pub energy: Option<f64>,
}

/// Overrides for one element: `C = { s = { zeta = 1.6 }, p = { energy = -11.0 } }`.
#[derive(Debug, Clone, Copy, Default, Deserialize, PartialEq)]
#[serde(deny_unknown_fields)]
pub struct ElementOverride {
    pub s: Option<ShellOverride>,
    pub p: Option<ShellOverride>,
}

/// How H_ij is formed from H_ii, H_jj and S_ij.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum OffDiagonal {
    /// Wolfsberg–Helmholz: H_ij = K S_ij (H_ii + H_jj)/2.
    #[default]
    Plain,
    /// The weighted form, K' = K + Δ² + Δ⁴(1 − K) with Δ = (H_ii − H_jj)/(H_ii + H_jj)
    /// (J. H. Ammeter, H.-B. Bürgi, J. C. Thibeault, R. Hoffmann, J. Am. Chem. Soc.
    /// 100, 3686 (1978); from memory).
    Weighted,
}

/// Every choice the method takes, as the model file or the CLI gives it.
#[derive(Debug, Clone, PartialEq, Deserialize)]
#[serde(deny_unknown_fields, rename_all = "kebab-case")]
pub struct HuckelOptions {
    /// The Wolfsberg–Helmholz constant K (1.75, Hoffmann 1963).
    #[serde(default = "default_k")]
    pub k: f64,
    #[serde(default)]
    pub off_diagonal: OffDiagonal,
    /// Per-element overrides, keyed by element symbol.
    #[serde(default)]
    pub parameters: BTreeMap<String, ElementOverride>,
}

fn default_k() -> f64 {
    1.75
}

impl Default for HuckelOptions {
    fn default() -> Self {
        HuckelOptions {
            k: default_k(),
            off_diagonal: OffDiagonal::Plain,
            parameters: BTreeMap::new(),
        }
    }
}

fn apply(base: Option<ShellParams>, o: Option<ShellOverride>, n: u32) -> Option<ShellParams> {
    match (base, o) {
        (b, None) => b,
        (Some(b), Some(o)) => Some(ShellParams {
            n: b.n,
            zeta: o.zeta.unwrap_or(b.zeta),
            energy_ev: o.energy.unwrap_or(b.energy_ev),
        }),
        (
            None,
            Some(ShellOverride {
                zeta: Some(zeta),
                energy: Some(energy_ev),
            }),
        ) => Some(ShellParams { n, zeta, energy_ev }),
        (None, Some(_)) => None,
    }
}

impl HuckelOptions {
    /// Checks K and that override keys name elements.
    pub fn check(&self) -> Result<()> {
        if !(self.k.is_finite() && self.k > 0.0) {
            return Err(Error::input(format!(
                "the Wolfsberg–Helmholz constant k must be positive, got {}",
                self.k
            )));
        }
        for (symbol, o) in &self.parameters {
            if crate::chem::elements::by_symbol(symbol).is_none() {
                return Err(Error::input(format!(
                    "[orbitals.parameters] names unknown element {symbol:?}"
                )));
            }
            for sh in [o.s, o.p].into_iter().flatten() {
                if let Some(z) = sh.zeta {
                    if !(z.is_finite() && z > 0.0) {
                        return Err(Error::input(format!(
                            "[orbitals.parameters.{symbol}] zeta must be positive, got {z}"
                        )));
                    }
                }
                if let Some(e) = sh.energy {
                    if !e.is_finite() {
                        return Err(Error::input(format!(
                            "[orbitals.parameters.{symbol}] energy must be a finite number of eV"
                        )));
                    }
                }
            }
        }
        Ok(())
    }

    /// The parameters of one element after overrides, or an error that says how to
    /// supply them.
    pub fn element(&self, e: &Element) -> Result<ElementParams> {
        let o = self
            .parameters
            .iter()
            .find(|(k, _)| k.eq_ignore_ascii_case(e.symbol))
            .map(|(_, v)| *v)
            .unwrap_or_default();
        let base = builtin(e.atomic_number);
        let n = valence_n(e.atomic_number);
        let s = apply(base.map(|b| b.s), o.s, n);
        let p = apply(base.and_then(|b| b.p), o.p, n);
        match s {
            Some(s) => Ok(ElementParams { s, p }),
            None => Err(Error::input(format!(
                "extended Hückel has no parameters for {} (built in: H, Li–F, Na–Cl)",
                e.symbol
            ))
            .with_hint(format!(
                "give them in a model file: [orbitals.parameters.{0}] s = {{ zeta = …, energy = … }} (energy in eV; p likewise)",
                e.symbol
            ))),
        }
    }
}

/// The valence basis and, per function, H_ii (hartree) and the free-atom
/// ground-state occupation (p electrons spread evenly over the three p functions).
#[derive(Debug, Clone)]
pub struct ValenceBasis {
    pub basis: Basis,
    pub h_diag: Vec<f64>,
    pub reference: Vec<f64>,
    /// Valence electrons of the neutral atoms, per atom.
    pub atom_valence: Vec<f64>,
}

/// Places each atom's valence s (and p) Slater shell on it.
pub fn valence_basis(molecule: &Molecule, options: &HuckelOptions) -> Result<ValenceBasis> {
    let mut shells = Vec::new();
    let (mut h_diag, mut reference, mut atom_valence) = (Vec::new(), Vec::new(), Vec::new());
    for (i, a) in molecule.atoms.iter().enumerate() {
        let p = options.element(a.element)?;
        let (occ_s, occ_p) = ground_occupations(a.element.atomic_number);
        atom_valence.push(occ_s + occ_p);
        shells.push(Shell::Slater(SlaterShell::new(
            i,
            a.position,
            p.s.n,
            0,
            p.s.zeta,
            vec![0],
        )?));
        h_diag.push(p.s.energy_ev / HARTREE_IN_EV);
        reference.push(occ_s);
        if let Some(pp) = p.p {
            shells.push(Shell::Slater(SlaterShell::new(
                i,
                a.position,
                pp.n,
                1,
                pp.zeta,
                vec![-1, 0, 1],
            )?));
            for _ in 0..3 {
                h_diag.push(pp.energy_ev / HARTREE_IN_EV);
                reference.push(occ_p / 3.0);
            }
        } else if occ_p > 0.0 {
            return Err(Error::input(format!(
                "{} needs p functions for its ground configuration; give [orbitals.parameters.{}] p = {{ zeta = …, energy = … }}",
                a.element.symbol, a.element.symbol
            )));
        }
    }
    Ok(ValenceBasis {
        basis: Basis {
            name: "extended-huckel valence".into(),
            shells,
        },
        h_diag,
        reference,
        atom_valence,
    })
}
