//! The named minimal Gaussian basis sets `sto-3g` and `sto-6g` for H–Ar, as data.
//!
//! Why a module of its own: the numbers are published reference data, kept apart
//! from any code that places or evaluates functions, so that their provenance can be
//! checked in one place.
//!
//! Provenance. The tables in `data/sto-3g.json` and `data/sto-6g.json` are the
//! least-squares Gaussian expansions of Slater functions with the standard molecular
//! exponents of W. J. Hehre, R. F. Stewart, J. A. Pople, J. Chem. Phys. 51, 2657
//! (1969) for H–Ne and W. J. Hehre, R. Ditchfield, R. F. Stewart, J. A. Pople,
//! J. Chem. Phys. 52, 2769 (1970) for Na–Ar. They were imported digit for digit
//! (10 significant digits as printed) from the `basis-set-exchange` package 0.12 by
//! `tools/import_bse.py`; `.ci/interop/check_bse.py` compares them with the package
//! again in CI. Each sp shell of the published sets is stored as an s and a p shell
//! with the same exponents.
//!
//! Conventions: exponents in bohr⁻²; coefficients multiply normalised primitives
//! (as published), and every contracted function is then normalised to 1 within
//! about 1e-10 (checked in `tests/basis_data.rs`).

use std::collections::BTreeMap;
use std::sync::LazyLock;

use serde::Deserialize;

/// One contracted shell of a named set.
#[derive(Debug, Clone, PartialEq)]
pub struct NamedShell {
    /// Angular momentum: 0 for s, 1 for p.
    pub l: u32,
    /// (exponent in bohr⁻², coefficient of the normalised primitive).
    pub primitives: Vec<(f64, f64)>,
}

/// The set names this module knows, in the spelling the model file uses.
pub const NAMES: [&str; 2] = ["sto-3g", "sto-6g"];

/// The shells of a named set for element Z, or None if the set lacks it.
/// `set` is "sto-3g" or "sto-6g" (case-insensitive).
pub fn shells(set: &str, z: u32) -> Option<Vec<NamedShell>> {
    let table = match set.to_ascii_lowercase().as_str() {
        "sto-3g" => &*STO_3G,
        "sto-6g" => &*STO_6G,
        _ => return None,
    };
    table.get(&z).cloned()
}

type Table = BTreeMap<u32, Vec<NamedShell>>;

static STO_3G: LazyLock<Table> = LazyLock::new(|| parse(include_str!("data/sto-3g.json")));
static STO_6G: LazyLock<Table> = LazyLock::new(|| parse(include_str!("data/sto-6g.json")));

#[derive(Deserialize)]
struct FileJson {
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
fn parse(text: &str) -> Table {
    let file: FileJson = serde_json::from_str(text).expect("embedded basis data is valid JSON");
    file.elements
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
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn unknown_set_and_element_give_none() {
        assert!(shells("sto-4g", 1).is_none());
        assert!(shells("sto-3g", 0).is_none());
        assert!(shells("sto-3g", 19).is_none());
        assert!(shells("STO-3G", 1).is_some());
    }
}
