//! STO-nG expansions (n = 1…6 Gaussians) of Slater 1s, 2s, 2p, 3s, 3p and 3d
//! functions with ζ = 1, and their scaling to any ζ.
//!
//! Why: extended Hückel and the overlap checks need Gaussian stand-ins for Slater
//! functions of any exponent. A Slater function with exponent ζ is the ζ = 1 function
//! scaled by ζ in length, so its expansion has exponents α ζ² and the same
//! coefficients (coefficients multiply normalised primitives r^l e^(−α r²)).
//!
//! Provenance (`data/sto-ng.json`). Every number here is **computed by us** with
//! `tools/fit_sto_ng.py`, using the criterion of W. J. Hehre, R. F. Stewart,
//! J. A. Pople, J. Chem. Phys. 51, 2657 (1969): minimise ∫(φ_STO − Σ d_k g_k)² dV with
//! the expansion normalised (equivalently, maximise ⟨φ_STO|Σ d_k g_k⟩); 2s/2p and
//! 3s/3p are fitted jointly with shared exponents, as they did, 1s and 3d alone. The
//! fits are converged in 50-digit arithmetic and rounded to double precision.
//!
//! The published ζ = 1 tables (Hehre–Stewart–Pople 1969; R. F. Stewart, J. Chem.
//! Phys. 52, 431 (1970)) were not available to us as text. What is published and
//! available is the STO-2G … STO-6G data of the `basis-set-exchange` package 0.12
//! (H–Ar, from Hehre–Stewart–Pople 1969 and Hehre–Ditchfield–Stewart–Pople 1970):
//! the coefficients of the 1s, 2sp and 3sp expansions for n = 2…6, and exponents
//! scaled by each element's ζ². Against those, for every element H–Ar:
//! our coefficients equal the published ones to at most 4.3e-10 relative difference
//! (worst case over all elements; 10 printed digits), and within each element's
//! shell the published exponents are ours times one common factor to at most
//! 6.2e-10 relative — that factor is ζ² with ζ a 3-digit standard molecular exponent
//! (e.g. H 1s 1.24, C 1s 5.67, C 2sp 1.72, Na 3sp 1.75; inferred by the script). So
//! the published numbers are reproduced to their 9–10 printed digits.
//! For n = 1 and for 3d (all n) no published numbers were available to us: those
//! are computed only. The per-entry agreement is recorded in the data file's
//! `published_check` fields, and `tests/basis_data.rs` re-derives the 1s and 2sp
//! relations from the named sets.

use std::sync::LazyLock;

use serde::Deserialize;

/// A Slater function kind by principal quantum number and angular momentum.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum SlaterShell {
    S1,
    S2,
    P2,
    S3,
    P3,
    D3,
}

impl SlaterShell {
    pub const ALL: [SlaterShell; 6] = [
        SlaterShell::S1,
        SlaterShell::S2,
        SlaterShell::P2,
        SlaterShell::S3,
        SlaterShell::P3,
        SlaterShell::D3,
    ];

    /// The label used in the data file ("1s", "2p", …).
    pub fn label(self) -> &'static str {
        match self {
            SlaterShell::S1 => "1s",
            SlaterShell::S2 => "2s",
            SlaterShell::P2 => "2p",
            SlaterShell::S3 => "3s",
            SlaterShell::P3 => "3p",
            SlaterShell::D3 => "3d",
        }
    }

    /// Principal quantum number n of the Slater function r^(n−1) e^(−ζr).
    pub fn n(self) -> u32 {
        match self {
            SlaterShell::S1 => 1,
            SlaterShell::S2 | SlaterShell::P2 => 2,
            SlaterShell::S3 | SlaterShell::P3 | SlaterShell::D3 => 3,
        }
    }

    /// Angular momentum l of the function and of its Gaussian primitives.
    pub fn l(self) -> u32 {
        match self {
            SlaterShell::S1 | SlaterShell::S2 | SlaterShell::S3 => 0,
            SlaterShell::P2 | SlaterShell::P3 => 1,
            SlaterShell::D3 => 2,
        }
    }
}

/// Largest number of Gaussians in the table.
pub const MAX_GAUSSIANS: usize = 6;

/// (exponent, coefficient of normalised primitive) pairs for ζ = 1, or None when not
/// available (n_gaussians outside 1…6).
pub fn expansion(kind: SlaterShell, n_gaussians: usize) -> Option<&'static [(f64, f64)]> {
    TABLE
        .iter()
        .find(|e| e.kind == kind && e.n_gaussians == n_gaussians)
        .map(|e| e.primitives.as_slice())
}

/// The expansion for exponent zeta (α scaled by ζ²). None for a non-positive or
/// non-finite zeta as well as for a missing expansion.
pub fn scaled(kind: SlaterShell, n_gaussians: usize, zeta: f64) -> Option<Vec<(f64, f64)>> {
    if !(zeta.is_finite() && zeta > 0.0) {
        return None;
    }
    let z2 = zeta * zeta;
    expansion(kind, n_gaussians).map(|p| p.iter().map(|&(a, d)| (a * z2, d)).collect())
}

/// The overlap ⟨φ_STO|expansion⟩ recorded by the fitting script (ζ-independent).
pub fn overlap_with_slater(kind: SlaterShell, n_gaussians: usize) -> Option<f64> {
    TABLE
        .iter()
        .find(|e| e.kind == kind && e.n_gaussians == n_gaussians)
        .map(|e| e.overlap)
}

struct Entry {
    kind: SlaterShell,
    n_gaussians: usize,
    overlap: f64,
    primitives: Vec<(f64, f64)>,
}

#[derive(Deserialize)]
struct FileJson {
    expansions: Vec<EntryJson>,
}

#[derive(Deserialize)]
struct EntryJson {
    kind: String,
    n_gaussians: usize,
    overlap_with_slater: f64,
    primitives: Vec<(f64, f64)>,
}

/// Parsed once. The file is embedded and checked by the tests, so a malformed one is
/// a build defect: panicking here is deliberate.
static TABLE: LazyLock<Vec<Entry>> = LazyLock::new(|| {
    let file: FileJson = serde_json::from_str(include_str!("data/sto-ng.json"))
        .expect("embedded STO-nG data is valid JSON");
    file.expansions
        .into_iter()
        .map(|e| Entry {
            kind: *SlaterShell::ALL
                .iter()
                .find(|k| k.label() == e.kind)
                .expect("known Slater kind in the STO-nG data"),
            n_gaussians: e.n_gaussians,
            overlap: e.overlap_with_slater,
            primitives: e.primitives,
        })
        .collect()
});

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_kind_and_length_is_present_and_nothing_else() {
        for kind in SlaterShell::ALL {
            assert!(expansion(kind, 0).is_none());
            assert!(expansion(kind, MAX_GAUSSIANS + 1).is_none());
            for n in 1..=MAX_GAUSSIANS {
                assert_eq!(expansion(kind, n).map(<[_]>::len), Some(n), "{kind:?} {n}");
            }
        }
    }

    #[test]
    fn scaling_multiplies_exponents_by_zeta_squared() {
        let base = expansion(SlaterShell::P2, 3).unwrap();
        let s = scaled(SlaterShell::P2, 3, 1.5).unwrap();
        for (b, s) in base.iter().zip(&s) {
            assert_eq!(s.0, b.0 * 2.25);
            assert_eq!(s.1, b.1);
        }
        assert!(scaled(SlaterShell::P2, 3, 0.0).is_none());
        assert!(scaled(SlaterShell::P2, 3, f64::NAN).is_none());
    }
}
