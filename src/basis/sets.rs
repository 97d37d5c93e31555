//! Placing a basis on a molecule: the named sets (`slater-1s`, `sto-3g`, `sto-6g`),
//! generated `even-tempered` sets, and user-defined shells per element.

use std::collections::BTreeMap;

use serde::Deserialize;

use super::{Basis, GaussianShell, Shell, SlaterShell};
use crate::chem::{Molecule, elements};
use crate::error::{Error, Result};

/// The `[basis]` section of a model file, as plain data.
#[derive(Debug, Clone, PartialEq, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct BasisSpec {
    /// `slater-1s`, `sto-3g`, `sto-6g`, `even-tempered` or `custom`.
    pub set: String,
    /// 1s exponent per element for `slater-1s` (default ζ = Z).
    #[serde(default)]
    pub zeta: BTreeMap<String, f64>,
    /// Generator parameters per element for `even-tempered`.
    #[serde(default, rename = "even-tempered")]
    pub even_tempered: BTreeMap<String, EvenTempered>,
    /// User-defined shells per element; they replace the named set for that element.
    #[serde(default)]
    pub shells: BTreeMap<String, Vec<ShellSpec>>,
}

/// Exponents α·β^k, k = 0…count−1, for every l ≤ l_max (pure functions).
#[derive(Debug, Clone, Copy, PartialEq, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct EvenTempered {
    pub l_max: u32,
    pub count: usize,
    pub alpha: f64,
    pub beta: f64,
}

/// One user-defined contracted Gaussian shell.
#[derive(Debug, Clone, PartialEq, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ShellSpec {
    pub l: u32,
    /// `[exponent, coefficient]` pairs; coefficients multiply normalised primitives.
    pub primitives: Vec<[f64; 2]>,
    /// Cartesian components instead of pure (real solid harmonic) functions.
    #[serde(default)]
    pub cartesian: bool,
}

pub const SET_NAMES: &str = "slater-1s, sto-3g, sto-6g, even-tempered, custom";

impl BasisSpec {
    pub fn named(set: &str) -> Self {
        BasisSpec {
            set: set.into(),
            zeta: BTreeMap::new(),
            even_tempered: BTreeMap::new(),
            shells: BTreeMap::new(),
        }
    }

    pub fn is_slater_1s(&self) -> bool {
        self.set.eq_ignore_ascii_case("slater-1s") && self.shells.is_empty()
    }

    /// Places the basis on every atom of `molecule`.
    pub fn build(&self, molecule: &Molecule) -> Result<Basis> {
        let set = self.set.to_ascii_lowercase();
        if !matches!(
            set.as_str(),
            "slater-1s" | "sto-3g" | "sto-6g" | "even-tempered" | "custom"
        ) {
            return Err(Error::input(format!("unknown basis set {:?}", self.set))
                .with_hint(format!("the basis sets are: {SET_NAMES}")));
        }
        for key in self
            .zeta
            .keys()
            .chain(self.even_tempered.keys())
            .chain(self.shells.keys())
        {
            if elements::by_symbol(key).is_none() {
                return Err(Error::input(format!(
                    "[basis] names an unknown element {key:?}"
                )));
            }
        }
        let mut shells = Vec::new();
        for (i, atom) in molecule.atoms.iter().enumerate() {
            let symbol = atom.element.symbol;
            let c = atom.position;
            if let Some(key) = find(self.shells.keys(), symbol) {
                for s in &self.shells[&key] {
                    let prims = s.primitives.iter().map(|p| (p[0], p[1])).collect();
                    let shell =
                        GaussianShell::full(i, c, s.l, prims, !s.cartesian).map_err(|e| {
                            Error::input(format!("[basis] shells for {symbol}: {}", e.message))
                        })?;
                    shells.push(Shell::Gaussian(shell));
                }
                continue;
            }
            match set.as_str() {
                "slater-1s" => {
                    let zeta =
                        find(self.zeta.keys(), symbol).map_or(atom.charge(), |k| self.zeta[&k]);
                    let s = SlaterShell::s1(i, c, zeta).map_err(|e| {
                        Error::input(format!("[basis] zeta for {symbol}: {}", e.message))
                    })?;
                    shells.push(Shell::Slater(s));
                }
                "sto-3g" | "sto-6g" => {
                    let named = super::named::shells(&set, atom.element.atomic_number).ok_or_else(
                        || Error::input(format!("the {set} set has no functions for {symbol}")),
                    )?;
                    for s in named {
                        shells.push(Shell::Gaussian(GaussianShell::full(
                            i,
                            c,
                            s.l,
                            s.primitives,
                            true,
                        )?));
                    }
                }
                "even-tempered" => {
                    let key = find(self.even_tempered.keys(), symbol).ok_or_else(|| {
                        Error::input(format!("even-tempered needs parameters for {symbol}"))
                            .with_hint(format!("add [basis.even-tempered] {symbol} = {{ l_max = 2, count = 10, alpha = 0.05, beta = 2.5 }}"))
                    })?;
                    shells.extend(even_tempered(i, c, &self.even_tempered[&key], symbol)?);
                }
                _ => {
                    return Err(Error::input(format!(
                        "the custom basis has no shells for {symbol}"
                    ))
                    .with_hint(format!(
                        "add [basis.shells] {symbol} = [{{ l = 0, primitives = [[1.0, 1.0]] }}]"
                    )));
                }
            }
        }
        Ok(Basis { name: set, shells })
    }
}

/// The key among `keys` naming `symbol`, ignoring case.
fn find<'a>(mut keys: impl Iterator<Item = &'a String>, symbol: &str) -> Option<String> {
    keys.find(|k| k.eq_ignore_ascii_case(symbol)).cloned()
}

fn even_tempered(atom: usize, c: [f64; 3], p: &EvenTempered, symbol: &str) -> Result<Vec<Shell>> {
    let bad = |m: String| Error::input(format!("even-tempered parameters for {symbol}: {m}"));
    if p.l_max > super::harmonics::L_MAX {
        return Err(bad(format!("l_max must be at most 3, got {}", p.l_max)));
    }
    if !(1..=60).contains(&p.count) {
        return Err(bad(format!("count must be 1 to 60, got {}", p.count)));
    }
    if !(p.alpha.is_finite() && p.alpha > 0.0 && p.beta.is_finite() && p.beta > 1.0) {
        return Err(bad(format!(
            "need alpha > 0 and beta > 1, got alpha = {}, beta = {}",
            p.alpha, p.beta
        )));
    }
    let mut out = Vec::new();
    for l in 0..=p.l_max {
        for k in 0..p.count {
            let alpha = p.alpha * p.beta.powi(k as i32);
            out.push(Shell::Gaussian(GaussianShell::full(
                atom,
                c,
                l,
                vec![(alpha, 1.0)],
                true,
            )?));
        }
    }
    Ok(out)
}
