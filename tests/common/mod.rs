//! Helpers shared by the integration tests. Each test binary declares `mod common;`
//! and uses what it needs, so not every item is used by every binary.
//!
//! The refusal checks differ on purpose; pick the one a test has always made:
//!
//! | helper | exit 2 | `error:` lines | `hint:` lines | other checks |
//! | --- | --- | --- | --- | --- |
//! | `assert_input_error` | yes | the first line, alone | at most one, as the second line | needle anywhere in stderr; the folder holds exactly `keep` |
//! | `assert_refused` | yes | exactly one `error: ` line holding every needle | any | no panic |
//! | `assert_refused_one_hint` | yes | exactly one `error:` line holding every needle | at most one, returned | no panic |
//! | `assert_error_first` | yes | stderr starts with `error: ` | any | needle anywhere in stderr |

#![allow(dead_code)]

use std::fs;
use std::path::{Path, PathBuf};
use std::process::{Command, Output};

use lobecast::chem::{LengthUnit, Molecule};
use lobecast::field::Field;
use lobecast::io::xyz::parse_xyz;
use lobecast::solve::OrbitalSet;

// ---------------------------------------------------------------- the binary

/// The lobecast binary Cargo built for these tests.
pub const BIN: &str = env!("CARGO_BIN_EXE_lobecast");

/// The binary as a path.
pub fn bin() -> PathBuf {
    PathBuf::from(BIN)
}

/// A file of the repository's `examples/` folder.
pub fn example(name: &str) -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("examples")
        .join(name)
}

/// Runs `lobecast ARGS…` in `dir`.
pub fn run(dir: &Path, args: &[&str]) -> Output {
    Command::new(BIN)
        .current_dir(dir)
        .args(args)
        .output()
        .expect("the binary runs")
}

/// Runs `lobecast ARGS…` in the test's own working folder (paths in `args` absolute).
pub fn run_here(args: &[&str]) -> Output {
    Command::new(bin()).args(args).output().unwrap()
}

/// Runs `lobecast ARGS…` in `dir`, asserts success and returns standard output.
pub fn ok(dir: &Path, args: &[&str]) -> String {
    let out = run(dir, args);
    assert!(
        out.status.success(),
        "{args:?}: {}",
        String::from_utf8_lossy(&out.stderr)
    );
    String::from_utf8(out.stdout).unwrap()
}

// ---------------------------------------------------------------- files

/// Writes `text` to `dir/name` and returns the path.
pub fn write_file(dir: &Path, name: &str, text: &str) -> PathBuf {
    let p = dir.join(name);
    fs::write(&p, text).unwrap();
    p
}

/// The names of the entries of `dir`, sorted.
pub fn names(dir: &Path) -> Vec<String> {
    let mut n: Vec<String> = fs::read_dir(dir)
        .unwrap()
        .map(|e| e.unwrap().file_name().into_string().unwrap())
        .collect();
    n.sort();
    n
}

// ---------------------------------------------------------------- refusals

/// Asserts exit status 2, one `error:` line (plus at most a `hint:` line) that
/// contains `needle`, and that the folder holds only `keep` afterwards. Returns
/// standard error.
pub fn assert_input_error(dir: &Path, out: &Output, needle: &str, keep: &[&str]) -> String {
    let err = String::from_utf8_lossy(&out.stderr).into_owned();
    assert_eq!(out.status.code(), Some(2), "stderr: {err}");
    let lines: Vec<&str> = err.lines().collect();
    assert!(lines[0].starts_with("error: "), "{err}");
    assert!(
        lines.len() == 1 || (lines.len() == 2 && lines[1].starts_with("hint: ")),
        "{err}"
    );
    assert!(err.contains(needle), "expected {needle:?} in {err}");
    let mut keep: Vec<String> = keep.iter().map(|s| s.to_string()).collect();
    keep.sort();
    assert_eq!(names(dir), keep, "no partial output may remain");
    err
}

/// Exit 2, no panic, exactly one line starting with `prefix` and holding every piece
/// of `expect`. Returns standard error.
fn one_error_line(o: &Output, prefix: &str, expect: &[&str]) -> String {
    let err = String::from_utf8_lossy(&o.stderr).into_owned();
    assert_eq!(o.status.code(), Some(2), "{err}");
    assert!(!err.contains("panicked"), "{err}");
    let errors: Vec<&str> = err.lines().filter(|l| l.starts_with(prefix)).collect();
    assert_eq!(errors.len(), 1, "{err}");
    for e in expect {
        assert!(errors[0].contains(e), "{e:?} not in {err}");
    }
    err
}

/// Exit 2, exactly one `error: ` line containing every word of `expect`, no panic.
pub fn assert_refused(o: &Output, expect: &[&str]) {
    one_error_line(o, "error: ", expect);
}

/// Exit 2, exactly one `error:` line holding every piece of `expect`, at most one
/// `hint:` line (returned, empty if none), no panic.
pub fn assert_refused_one_hint(o: &Output, expect: &[&str]) -> String {
    let err = one_error_line(o, "error:", expect);
    let hints: Vec<&str> = err.lines().filter(|l| l.starts_with("hint:")).collect();
    assert!(hints.len() <= 1, "{err}");
    hints.first().map_or(String::new(), |h| h.to_string())
}

/// Exit 2 and standard error that starts with `error: ` and contains `needle`.
pub fn assert_error_first(out: &Output, needle: &str) {
    let err = String::from_utf8_lossy(&out.stderr);
    assert_eq!(out.status.code(), Some(2), "{err}");
    assert!(err.starts_with("error: ") && err.contains(needle), "{err}");
}

// ---------------------------------------------------------------- models

/// The `[molecule]` table of H2⁺: two protons at z = ∓1 bohr, charge 1.
macro_rules! h2_molecule {
    () => {
        "[molecule]\nunits = \"bohr\"\ncharge = 1\n\
         atoms = [{ element = \"H\", position = [0, 0, -1] }, { element = \"H\", position = [0, 0, 1] }]\n"
    };
}

/// The molecule of [`H2`] without a basis, for tests that add their own.
pub const H2_MOLECULE: &str = h2_molecule!();

/// The one-electron model of H2⁺ at R = 2 bohr in the `slater-1s` basis.
pub const H2: &str = concat!(h2_molecule!(), "[basis]\nset = \"slater-1s\"\n");

/// Parses a model text and solves it.
pub fn solve_model(text: &str) -> OrbitalSet {
    lobecast::io::model::parse(text, Path::new("t.toml"))
        .unwrap()
        .solve()
        .unwrap()
}

/// Parses field names.
pub fn fields(list: &[&str]) -> Vec<Field> {
    list.iter().map(|f| Field::parse(f).unwrap()).collect()
}

/// A molecule from XYZ text in ångström.
pub fn molecule(xyz: &str, charge: i32) -> Molecule {
    let f = parse_xyz(xyz, "t.xyz", LengthUnit::Angstrom).unwrap();
    Molecule::new(f.atoms, charge).unwrap()
}

/// Benzene as XYZ text in the xy plane with C1 on the x axis, D6h, r(CC) = 1.3915 Å,
/// r(CH) = 1.0800 Å (J. Gauss and J. F. Stanton, J. Phys. Chem. A 104, 2865 (2000);
/// from memory), in full double precision (the example file rounds to 1e-6 Å, which
/// splits the degenerate pairs by ~1e-6 eV) so the pairs are degenerate to ~1e-14 eV.
pub fn benzene() -> String {
    let mut t = String::from("12\nbenzene\n");
    for (el, r) in [("C", 1.3915), ("H", 1.3915 + 1.08)] {
        for k in 0..6 {
            let a = (60.0 * k as f64).to_radians();
            t += &format!("{el} {:.17e} {:.17e} 0\n", r * a.cos(), r * a.sin());
        }
    }
    t
}

// ---------------------------------------------------------------- quadrature

/// Nodes and weights of `panels` equal panels over [lo, hi], each with the rule
/// `rule` (from `lobecast::numerics::quadrature::gauss_legendre`).
pub fn composite(rule: &[(f64, f64)], lo: f64, hi: f64, panels: usize) -> Vec<(f64, f64)> {
    let h = (hi - lo) / panels as f64;
    let mut out = Vec::with_capacity(rule.len() * panels);
    for k in 0..panels {
        let mid = lo + (k as f64 + 0.5) * h;
        out.extend(rule.iter().map(|&(x, w)| (mid + 0.5 * h * x, 0.5 * h * w)));
    }
    out
}
