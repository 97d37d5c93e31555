//! Placing a basis on a molecule: `slater-1s`, the named Gaussian sets of
//! `named` (`sto-3g` … `cc-pvdz`), generated `even-tempered` sets, and user-defined
//! shells per element.

use std::collections::BTreeMap;

use serde::Deserialize;

use super::named::{self, AngularForm};
use super::{Basis, GaussianShell, Shell, SlaterShell};
use crate::chem::{Molecule, elements};
use crate::error::{Error, Result};

/// The `[basis]` section of a model file, as plain data.
#[derive(Debug, Clone, PartialEq, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct BasisSpec {
    /// `slater-1s`, a named Gaussian set (`named::NAMES`), `even-tempered` or `custom`.
    pub set: String,
    /// `pure` or `cartesian` shells with l ≥ 2, overriding the named set's own
    /// convention (even-tempered: pure by default). None keeps the default.
    #[serde(default)]
    pub functions: Option<AngularForm>,
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

/// Exponents α·β^k, k = 0…count−1, for every l ≤ l_max (pure functions unless
/// `functions = "cartesian"`).
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

pub const SET_NAMES: &str = "slater-1s, sto-3g, sto-6g, 3-21g, 6-31g, 6-31g* (6-31g(d)), 6-31g** (6-31g(d,p)), cc-pvdz, even-tempered, custom";

impl BasisSpec {
    pub fn named(set: &str) -> Self {
        BasisSpec {
            set: set.into(),
            functions: None,
            zeta: BTreeMap::new(),
            even_tempered: BTreeMap::new(),
            shells: BTreeMap::new(),
        }
    }

    /// The same set with shells of l ≥ 2 made `functions` (pure or Cartesian)
    /// instead of the set's own convention.
    pub fn with_functions(mut self, functions: AngularForm) -> Self {
        self.functions = Some(functions);
        self
    }

    pub fn is_slater_1s(&self) -> bool {
        self.set.eq_ignore_ascii_case("slater-1s") && self.shells.is_empty()
    }

    /// Places the basis on every atom of `molecule`.
    pub fn build(&self, molecule: &Molecule) -> Result<Basis> {
        let named_set = named::canonical(&self.set);
        let set = named_set.map_or_else(|| self.set.to_ascii_lowercase(), String::from);
        if named_set.is_none() && !matches!(set.as_str(), "slater-1s" | "even-tempered" | "custom")
        {
            return Err(Error::input(format!("unknown basis set {:?}", self.set))
                .with_hint(format!("the basis sets are: {SET_NAMES}")));
        }
        // Whether shells with l ≥ 2 are pure. s and p shells are the same functions
        // either way and stay pure, so p keeps the order y, z, x in every set.
        let pure = match (named_set, self.functions) {
            (Some(name), f) => f
                .or(named::functions(name))
                .is_none_or(AngularForm::is_pure),
            (None, f) if set == "even-tempered" => f.is_none_or(AngularForm::is_pure),
            (None, None) => true,
            (None, Some(f)) => {
                return Err(Error::input(format!(
                    "[basis] functions = {:?} applies to the named Gaussian sets and even-tempered, not to {set}",
                    f.name()
                ))
                .with_hint("for shells of your own, give `cartesian = true` on each shell instead"));
            }
        };
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
                _ if named_set.is_some() => {
                    let named = named::shells(&set, atom.element.atomic_number).ok_or_else(|| {
                        Error::input(format!("the {set} set has no functions for {symbol}"))
                            .with_hint(format!(
                                "lobecast carries the named sets for H–Ar; give shells of your own with [basis.shells] {symbol} = [...]"
                            ))
                    })?;
                    for s in named {
                        shells.push(Shell::Gaussian(GaussianShell::full(
                            i,
                            c,
                            s.l,
                            s.primitives,
                            pure || s.l < 2,
                        )?));
                    }
                }
                "even-tempered" => {
                    let key = find(self.even_tempered.keys(), symbol).ok_or_else(|| {
                        Error::input(format!("even-tempered needs parameters for {symbol}"))
                            .with_hint(format!("add [basis.even-tempered] {symbol} = {{ l_max = 2, count = 10, alpha = 0.05, beta = 2.5 }}"))
                    })?;
                    shells.extend(even_tempered(
                        i,
                        c,
                        &self.even_tempered[&key],
                        symbol,
                        pure,
                    )?);
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

fn even_tempered(
    atom: usize,
    c: [f64; 3],
    p: &EvenTempered,
    symbol: &str,
    pure: bool,
) -> Result<Vec<Shell>> {
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
                pure || l < 2,
            )?));
        }
    }
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::basis::{Angular, BasisKind};

    fn atom(symbol: &str) -> Molecule {
        // Charge 0 even for odd electron counts: building a basis ignores the charge.
        Molecule::from_symbols(&[(symbol, [0.0, 0.0, 0.0])], 0).unwrap()
    }

    fn count(spec: &BasisSpec, symbol: &str) -> usize {
        spec.build(&atom(symbol)).unwrap().len()
    }

    fn spec(text: &str) -> std::result::Result<BasisSpec, toml::de::Error> {
        toml::from_str(text)
    }

    /// Function counts for C: 6-31G* 3s 2p 1d with six Cartesian d = 15, cc-pVDZ
    /// 3s 2p 1d with five pure d = 14 (the published counts; basis-set-exchange 0.12
    /// gives these shells, printed by tools/import_bse.py). The override swaps 5 and 6.
    #[test]
    fn each_set_uses_its_convention_unless_overridden() {
        let cc = BasisSpec::named("cc-pVDZ");
        assert_eq!(count(&cc, "C"), 14);
        let cart = spec("set = \"cc-pvdz\"\nfunctions = \"cartesian\"\n").unwrap();
        assert_eq!(count(&cart, "C"), 15);
        assert_eq!(
            count(&cc.clone().with_functions(AngularForm::Cartesian), "C"),
            15
        );
        let pople = BasisSpec::named("6-31G(d)");
        assert_eq!(count(&pople, "C"), 15);
        assert_eq!(count(&pople.with_functions(AngularForm::Pure), "C"), 14);
        // Only l ≥ 2 changes: p stays pure (y, z, x), d is Cartesian.
        let b = BasisSpec::named("6-31g*").build(&atom("C")).unwrap();
        for shell in &b.shells {
            let Shell::Gaussian(g) = shell else {
                panic!("6-31g* is Gaussian")
            };
            let pure = g.functions.iter().all(|f| matches!(f, Angular::Pure(_)));
            assert_eq!(pure, g.l < 2, "l = {}", g.l);
        }
        // s and p are the same either way: H in cc-pVDZ is 2s 1p = 5 both ways.
        assert_eq!(count(&cart, "H"), 5);
        assert_eq!(count(&cc, "H"), 5);
        let et = "set = \"even-tempered\"\neven-tempered = { H = { l_max = 2, count = 1, alpha = 1.0, beta = 2.0 } }\n";
        assert_eq!(count(&spec(et).unwrap(), "H"), 1 + 3 + 5);
        let et = format!("functions = \"cartesian\"\n{et}");
        assert_eq!(count(&spec(&et).unwrap(), "H"), 1 + 3 + 6);
    }

    #[test]
    fn the_basis_is_named_canonically_and_extended_sets_are_not_minimal() {
        let b = BasisSpec::named("6-31G(d,p)").build(&atom("H")).unwrap();
        assert_eq!(b.name, "6-31g**");
        for set in ["3-21g", "6-31g", "6-31g*", "6-31g**", "cc-pvdz"] {
            let b = BasisSpec::named(set).build(&atom("C")).unwrap();
            assert_eq!(b.kind(), BasisKind::Extended, "{set}");
            assert!(!b.kind().is_minimal(), "{set}");
        }
        let b = BasisSpec::named("STO-3G").build(&atom("C")).unwrap();
        assert_eq!((b.name.as_str(), b.kind()), ("sto-3g", BasisKind::StoNg));
    }

    #[test]
    fn bad_sets_elements_and_functions_are_input_errors() {
        let e = BasisSpec::named("6-31g*").build(&atom("K")).unwrap_err();
        assert_eq!(e.kind, crate::error::Kind::Input);
        assert_eq!(e.message, "the 6-31g* set has no functions for K");
        let e = BasisSpec::named("6-311g").build(&atom("H")).unwrap_err();
        assert!(e.hint.unwrap().contains("cc-pvdz"));
        let e = spec("set = \"cc-pvdz\"\nfunctions = \"spherical\"\n").unwrap_err();
        assert!(e.message().contains("`pure`") && e.message().contains("`cartesian`"));
        let s1 = BasisSpec::named("slater-1s").with_functions(AngularForm::Pure);
        let e = s1.build(&atom("H")).unwrap_err();
        assert_eq!(e.kind, crate::error::Kind::Input);
        assert!(e.message.contains("slater-1s"), "{}", e.message);
    }
}
