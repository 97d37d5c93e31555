//! The named Gaussian basis sets for H–Ar, as data: the minimal `sto-3g` and
//! `sto-6g`, the split-valence `3-21g` and `6-31g`, the polarised `6-31g*` and
//! `6-31g**`, and the correlation-consistent `cc-pvdz`.
//!
//! Why a module of its own: the numbers are published reference data, kept apart
//! from any code that places or evaluates functions, so that their provenance can be
//! checked in one place.
//!
//! Provenance. Every table in `data/` was imported digit for digit from the
//! `basis-set-exchange` package 0.12 by `tools/import_bse.py`, never typed in; each
//! file names its source, its conventions and the papers the package cites per
//! element, and `.ci/interop/check_bse.py` compares them with the package again in CI.
//! The STO-nG sets are the expansions of W. J. Hehre, R. F. Stewart, J. A. Pople,
//! J. Chem. Phys. 51, 2657 (1969) (H–Ne) and W. J. Hehre, R. Ditchfield, R. F.
//! Stewart, J. A. Pople, J. Chem. Phys. 52, 2769 (1970) (Na–Ar).
//!
//! Conventions: exponents in bohr⁻²; coefficients multiply normalised primitives (as
//! published). An sp shell is stored as an s and a p shell with the same exponents;
//! each column of a general contraction (cc-pVDZ) as a shell of its own, zero
//! coefficients kept. Each set carries the d-function convention it was published
//! with (Pople sets Cartesian, Dunning sets pure), which `functions` returns.

use std::collections::BTreeMap;
use std::sync::LazyLock;

use serde::Deserialize;

/// One contracted shell of a named set.
#[derive(Debug, Clone, PartialEq)]
pub struct NamedShell {
    /// Angular momentum: 0 for s, 1 for p, 2 for d.
    pub l: u32,
    /// (exponent in bohr⁻², coefficient of the normalised primitive).
    pub primitives: Vec<(f64, f64)>,
}

/// The form of the functions of a shell with l ≥ 2 (s and p are the same either way):
/// 2l+1 real solid harmonics or all (l+1)(l+2)/2 Cartesian components.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Deserialize)]
#[serde(rename_all = "lowercase")]
pub enum AngularForm {
    Pure,
    Cartesian,
}

impl std::str::FromStr for AngularForm {
    type Err = String;
    fn from_str(s: &str) -> std::result::Result<Self, String> {
        match s.trim().to_ascii_lowercase().as_str() {
            "pure" => Ok(AngularForm::Pure),
            "cartesian" => Ok(AngularForm::Cartesian),
            _ => Err(format!("unknown form {s:?}: use pure or cartesian")),
        }
    }
}

impl AngularForm {
    pub fn is_pure(self) -> bool {
        self == AngularForm::Pure
    }

    /// The spelling of the model file and the data files.
    pub fn name(self) -> &'static str {
        match self {
            AngularForm::Pure => "pure",
            AngularForm::Cartesian => "cartesian",
        }
    }
}

/// The set names this module knows, in their canonical (model file) spelling.
pub const NAMES: [&str; 7] = [
    "sto-3g", "sto-6g", "3-21g", "6-31g", "6-31g*", "6-31g**", "cc-pvdz",
];

/// Other common spellings, after lower-casing and removing blanks.
const ALIASES: [(&str, &str); 2] = [("6-31g(d)", "6-31g*"), ("6-31g(d,p)", "6-31g**")];

/// The canonical name of a set, accepting any case, blanks and the aliases
/// `6-31g(d)` = `6-31g*`, `6-31g(d,p)` = `6-31g**`; None for an unknown name.
pub fn canonical(set: &str) -> Option<&'static str> {
    let key: String = set
        .chars()
        .filter(|c| !c.is_whitespace())
        .collect::<String>()
        .to_ascii_lowercase();
    let key = ALIASES
        .iter()
        .find(|(alias, _)| *alias == key)
        .map_or(key.as_str(), |(_, name)| *name);
    NAMES.iter().copied().find(|n| *n == key)
}

/// The shells of a named set for element Z, or None if the set or the element is
/// unknown. `set` is any spelling `canonical` accepts.
pub fn shells(set: &str, z: u32) -> Option<Vec<NamedShell>> {
    table(set)?.shells.get(&z).cloned()
}

/// The set's own convention for shells with l ≥ 2, or None for an unknown set.
pub fn functions(set: &str) -> Option<AngularForm> {
    Some(table(set)?.functions)
}

struct Table {
    functions: AngularForm,
    shells: BTreeMap<u32, Vec<NamedShell>>,
}

/// The embedded files, in the order of `NAMES`.
const FILES: [&str; 7] = [
    include_str!("data/sto-3g.json"),
    include_str!("data/sto-6g.json"),
    include_str!("data/3-21g.json"),
    include_str!("data/6-31g.json"),
    include_str!("data/6-31g_st.json"),
    include_str!("data/6-31g_st_st.json"),
    include_str!("data/cc-pvdz.json"),
];

static TABLES: LazyLock<Vec<Table>> = LazyLock::new(|| {
    NAMES
        .iter()
        .zip(FILES)
        .map(|(name, text)| parse(name, text))
        .collect()
});

fn table(set: &str) -> Option<&'static Table> {
    let name = canonical(set)?;
    let i = NAMES.iter().position(|n| *n == name)?;
    Some(&TABLES[i])
}

#[derive(Deserialize)]
struct FileJson {
    name: String,
    /// Absent in the STO-nG files, which have s and p shells only.
    functions: Option<AngularForm>,
    elements: BTreeMap<String, ElementJson>,
}

#[derive(Deserialize)]
struct ElementJson {
    shells: Vec<ShellJson>,
}

#[derive(Deserialize)]
struct ShellJson {
    l: u32,
    primitives: Vec<(f64, f64)>,
}

/// Parses an embedded table. The files are part of the binary and checked by the
/// tests, so a malformed one is a build defect: panicking here is deliberate.
fn parse(name: &str, text: &str) -> Table {
    let file: FileJson = serde_json::from_str(text).expect("embedded basis data is valid JSON");
    assert_eq!(file.name, name, "embedded basis file in the wrong slot");
    let shells: BTreeMap<u32, Vec<NamedShell>> = file
        .elements
        .into_iter()
        .map(|(z, e)| {
            let z: u32 = z.parse().expect("element keys are atomic numbers");
            let shells = e
                .shells
                .into_iter()
                .map(|s| NamedShell {
                    l: s.l,
                    primitives: s.primitives,
                })
                .collect();
            (z, shells)
        })
        .collect();
    let has_d = shells.values().flatten().any(|s| s.l >= 2);
    assert!(
        file.functions.is_some() || !has_d,
        "{name}: a set with l >= 2 shells must state its functions"
    );
    Table {
        functions: file.functions.unwrap_or(AngularForm::Pure),
        shells,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn unknown_set_and_element_give_none() {
        assert!(shells("sto-4g", 1).is_none());
        assert!(shells("sto-3g", 0).is_none());
        assert!(shells("sto-3g", 19).is_none());
        assert!(shells("6-31g*", 19).is_none());
        assert!(shells("STO-3G", 1).is_some());
        assert!(functions("6-311g").is_none());
    }

    #[test]
    fn names_are_accepted_in_any_case_and_common_spelling() {
        assert_eq!(canonical("6-31G(d)"), Some("6-31g*"));
        assert_eq!(canonical("6-31G(d, p)"), Some("6-31g**"));
        assert_eq!(canonical("6-31G**"), Some("6-31g**"));
        assert_eq!(canonical("cc-pVDZ"), Some("cc-pvdz"));
        assert_eq!(canonical("6-31g(p)"), None);
        for name in NAMES {
            assert_eq!(canonical(name), Some(name));
            assert_eq!(canonical(&name.to_ascii_uppercase()), Some(name));
        }
    }

    #[test]
    fn every_set_loads_with_its_published_convention() {
        // Pople sets: six Cartesian d; Dunning sets: five pure d (the conventions the
        // sets were published with; from memory, and what basis-set-exchange marks).
        // The STO-nG files have s and p shells only and record none: pure by default,
        // which changes nothing.
        let expected = [
            ("sto-3g", AngularForm::Pure),
            ("sto-6g", AngularForm::Pure),
            ("3-21g", AngularForm::Cartesian),
            ("6-31g", AngularForm::Cartesian),
            ("6-31g(d)", AngularForm::Cartesian),
            ("6-31g(d,p)", AngularForm::Cartesian),
            ("cc-pvdz", AngularForm::Pure),
        ];
        for (set, form) in expected {
            assert_eq!(functions(set), Some(form), "{set}");
        }
    }
}
