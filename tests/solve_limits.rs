//! Hardening of solving and orbital selection as a hostile user meets them: huge
//! or out-of-range orbital selectors, molecules and shells too large to solve, and
//! count options out of range. Each case must give exit status 2, one `error:` line
//! (plus at most a `hint:` line) and no file left behind.

use std::fs;
use std::path::{Path, PathBuf};
use std::process::{Command, Output};

const BIN: &str = env!("CARGO_BIN_EXE_lobecast");
const H2: &str = "[molecule]\nunits = \"bohr\"\ncharge = 1\n\
    atoms = [{ element = \"H\", position = [0, 0, -1] }, { element = \"H\", position = [0, 0, 1] }]\n\
    [basis]\nset = \"slater-1s\"\n";

fn run(dir: &Path, args: &[&str]) -> Output {
    Command::new(BIN)
        .current_dir(dir)
        .args(args)
        .output()
        .expect("the binary runs")
}

fn write(dir: &Path, name: &str, text: &str) -> PathBuf {
    let p = dir.join(name);
    fs::write(&p, text).unwrap();
    p
}

/// Asserts exit status 2, one `error:` line (plus at most a `hint:` line) that
/// contains `needle`, and that the folder holds only `keep` afterwards.
fn assert_input_error(dir: &Path, out: &Output, needle: &str, keep: &[&str]) -> String {
    let err = String::from_utf8_lossy(&out.stderr).into_owned();
    assert_eq!(out.status.code(), Some(2), "stderr: {err}");
    let lines: Vec<&str> = err.lines().collect();
    assert!(lines[0].starts_with("error: "), "{err}");
    assert!(
        lines.len() == 1 || (lines.len() == 2 && lines[1].starts_with("hint: ")),
        "{err}"
    );
    assert!(err.contains(needle), "expected {needle:?} in {err}");
    let mut names: Vec<String> = fs::read_dir(dir)
        .unwrap()
        .map(|e| e.unwrap().file_name().into_string().unwrap())
        .collect();
    names.sort();
    let mut keep: Vec<String> = keep.iter().map(|s| s.to_string()).collect();
    keep.sort();
    assert_eq!(names, keep, "no partial output may remain");
    err
}

/// The reported case: `lumo+18446744073709551615` wrapped around and wrote the HOMO
/// with exit status 0. H2⁺ in slater-1s has two orbitals, the lower one occupied.
#[test]
fn huge_orbital_offsets_are_refused() {
    let d = tempfile::tempdir().unwrap();
    write(d.path(), "h2.toml", H2);
    let cases: &[(&str, &str)] = &[
        (
            "orbital:lumo+18446744073709551615",
            "past the last orbital: lumo is orbital 2 and the set has 2 orbitals (1 to 2)",
        ),
        (
            "orbital:lumo+18446744073709551614",
            "the set has 2 orbitals (1 to 2)",
        ),
        (
            "orbital:lumo+1",
            "orbital:lumo+1 is orbital 3 but the set has 2 orbitals (1 to 2); lumo is orbital 2, so lumo+K needs K from 0 to 0",
        ),
        (
            "orbital-density:homo-1",
            "below orbital 1: homo is orbital 1 and the set has 2 orbitals (1 to 2), so homo-K needs K from 0 to 0",
        ),
        ("orbital:homo-18446744073709551615", "below orbital 1"),
        ("orbital:0", "numbered from 1"),
        (
            "orbital:3",
            "orbital:3 is orbital 3 but the set has 2 orbitals",
        ),
    ];
    for (field, needle) in cases {
        let out = run(
            d.path(),
            &[
                "volume", "h2.toml", "--field", field, "--points", "8", "--out", "o.cube",
            ],
        );
        assert_input_error(d.path(), &out, needle, &["h2.toml"]);
    }
}
