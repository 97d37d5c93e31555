//! `solve`, `volume` with `--method rhf|uhf`: what a user sees, and every refusal
//! (one `error:` line, exit 2; non-convergence exit 1), with no file left behind.

mod common;

use common::{assert_input_error, ok, run, write_file};

/// Water near its experimental geometry (common practice), ångström.
const WATER: &str = "3\nwater\nO 0.0 0.0 0.0\nH 0.757 0.0 0.586\nH -0.757 0.0 0.586\n";

fn dir() -> tempfile::TempDir {
    tempfile::tempdir().unwrap()
}

#[test]
fn rhf_prints_energy_parts_caution_and_writes_version_2() {
    let d = dir();
    write_file(d.path(), "w.xyz", WATER);
    let out = ok(
        d.path(),
        &[
            "solve", "w.xyz", "--method", "rhf", "--basis", "sto-3g", "--json", "w.json",
        ],
    );
    for needle in [
        "nuclear repulsion",
        "one-electron",
        "two-electron",
        "total",
        "SCF converged",
        "dipole moment",
        "Mulliken charges",
        "HOMO",
        "LUMO",
        "neglects electron correlation",
    ] {
        assert!(out.contains(needle), "{needle:?} missing from\n{out}");
    }
    let v: serde_json::Value =
        serde_json::from_str(&std::fs::read_to_string(d.path().join("w.json")).unwrap()).unwrap();
    assert_eq!(v["version"], 2);
    let e = v["total_energy"].as_f64().unwrap();
    let enn = v["nuclear_repulsion"].as_f64().unwrap();
    // STO-3G water near equilibrium lies near −74.96 hartree (from memory; the
    // PySCF comparison in .ci checks it to 1e-8): a loose sanity bound here.
    assert!((-75.1..-74.8).contains(&e), "{e}");
    assert!((enn - 9.2).abs() < 0.2, "{enn}");
    // Orbital energies are eigenvalues: the lowest is the O 1s, near −20.2 hartree.
    let e1 = v["orbitals"][0]["energy"].as_f64().unwrap();
    assert!((-20.6..-20.0).contains(&e1), "{e1}");
    // The file reads back, and says its energies are the file's.
    let back = ok(d.path(), &["solve", "w.json"]);
    assert!(back.contains("as the file states them"), "{back}");
}

#[test]
fn uhf_gives_both_channels_and_spin_density() {
    let d = dir();
    write_file(d.path(), "w.xyz", WATER);
    let out = ok(
        d.path(),
        &[
            "solve", "w.xyz", "--method", "uhf", "--basis", "sto-3g", "--charge", "1", "--json",
            "c.json",
        ],
    );
    assert!(
        out.contains("alpha orbitals") && out.contains("beta orbitals"),
        "{out}"
    );
    assert!(out.contains("<S^2>"), "{out}");
    let v: serde_json::Value =
        serde_json::from_str(&std::fs::read_to_string(d.path().join("c.json")).unwrap()).unwrap();
    assert_eq!(v["multiplicity"], 2);
    assert_eq!(v["charge"], 1);
    assert!(v["orbitals_alpha"].is_array() && v["orbitals_beta"].is_array());
    ok(
        d.path(),
        &[
            "volume",
            "c.json",
            "--field",
            "spin-density",
            "--field",
            "orbital:homo",
            "--spin",
            "beta",
            "--spacing",
            "0.5",
            "--out",
            "s.cube",
        ],
    );
    let cube = std::fs::read_to_string(d.path().join("s.cube")).unwrap();
    assert!(
        cube.lines().take(2).any(|l| l.contains("beta")),
        "channel named in the comment"
    );
}

#[test]
fn bad_input_is_refused_before_any_file() {
    let d = dir();
    write_file(d.path(), "w.xyz", WATER);
    write_file(d.path(), "k.xyz", "1\npotassium\nK 0 0 0\n");
    write_file(d.path(), "two.xyz", "2\nsame place\nH 0 0 0\nH 0 0 0.01\n");
    let keep = ["k.xyz", "two.xyz", "w.xyz"];
    let cases: [(&[&str], &str); 8] = [
        (
            &["--method", "rhf", "--basis", "6-31q"],
            "unknown basis set",
        ),
        (&["--method", "rhf"], "needs --basis"),
        (
            &["--method", "rhf", "--basis", "sto-3g", "--charge", "1"],
            "closed shell",
        ),
        (
            &[
                "--method",
                "uhf",
                "--basis",
                "sto-3g",
                "--multiplicity",
                "2",
            ],
            "impossible",
        ),
        (
            &[
                "--method",
                "uhf",
                "--basis",
                "sto-3g",
                "--multiplicity",
                "0",
            ],
            "--multiplicity",
        ),
        (
            &["--method", "uhf", "--basis", "sto-3g", "--charge", "10"],
            "electrons",
        ),
        (
            &[
                "--method",
                "rhf",
                "--basis",
                "sto-3g",
                "--max-iterations",
                "0",
            ],
            "--max-iterations",
        ),
        (
            &["--method", "rhf", "--basis", "sto-3g", "--spin", "beta"],
            "unrestricted",
        ),
    ];
    for (flags, needle) in cases {
        let mut args = vec!["volume", "w.xyz", "--field", "density", "--out", "x.cube"];
        args.extend_from_slice(flags);
        let out = run(d.path(), &args);
        assert_input_error(d.path(), &out, needle, &keep);
    }
    let out = run(
        d.path(),
        &[
            "solve", "k.xyz", "--method", "uhf", "--basis", "sto-3g", "--json", "k.json",
        ],
    );
    assert_input_error(d.path(), &out, "no functions for K", &keep);
    let out = run(
        d.path(),
        &[
            "solve", "two.xyz", "--method", "rhf", "--basis", "sto-3g", "--json", "t.json",
        ],
    );
    assert_input_error(d.path(), &out, "closer than 0.1 Å", &keep);
}

/// Running out of iterations is exit 1 with the last figures, and no file.
#[test]
fn non_convergence_is_exit_1_with_the_figures() {
    let d = dir();
    write_file(d.path(), "w.xyz", WATER);
    let out = run(
        d.path(),
        &[
            "solve",
            "w.xyz",
            "--method",
            "rhf",
            "--basis",
            "sto-3g",
            "--max-iterations",
            "2",
            "--json",
            "w.json",
        ],
    );
    let err = String::from_utf8_lossy(&out.stderr);
    assert_eq!(out.status.code(), Some(1), "{err}");
    assert!(
        err.starts_with("error: the SCF did not converge in 2 iterations"),
        "{err}"
    );
    assert!(
        err.contains("ΔE") && err.contains("RMS commutator"),
        "{err}"
    );
    assert!(!d.path().join("w.json").exists());
}

/// cc-pVDZ is pure by its published convention (O: 3s2p1d = 14, H: 2s1p = 5, so 24
/// for water); `--functions cartesian` turns the O d shell into 6 components (25).
/// Counts from the basis-set-exchange data (tests/basis_data.rs).
#[test]
fn functions_override_changes_the_d_shell() {
    let d = dir();
    write_file(d.path(), "w.xyz", WATER);
    let pure = ok(
        d.path(),
        &["solve", "w.xyz", "--method", "rhf", "--basis", "cc-pvdz"],
    );
    assert!(pure.contains("24 basis functions"), "{pure}");
    let cart = ok(
        d.path(),
        &[
            "solve",
            "w.xyz",
            "--method",
            "rhf",
            "--basis",
            "cc-pvdz",
            "--functions",
            "cartesian",
        ],
    );
    assert!(cart.contains("25 basis functions"), "{cart}");
}

/// An all-electron deformation density peaks at the nuclei; `--limit` ends the
/// colour scale where the bonds show, and says so. A bad limit is refused first.
#[test]
fn slice_limit_sets_the_colour_range() {
    let d = dir();
    write_file(d.path(), "w.xyz", WATER);
    let base = [
        "slice",
        "w.xyz",
        "--method",
        "rhf",
        "--basis",
        "sto-3g",
        "--field",
        "deformation",
        "--plane",
        "xz",
        "--size",
        "400",
    ];
    let mut args = base.to_vec();
    args.extend(["--limit", "0.1", "--png", "d.png"]);
    let out = ok(d.path(), &args);
    assert!(
        out.contains("colour range -1.000000e-1 to 1.000000e-1"),
        "{out}"
    );
    let mut bad = base.to_vec();
    bad.extend(["--limit", "-2", "--png", "e.png"]);
    let o = run(d.path(), &bad);
    assert_input_error(
        d.path(),
        &o,
        "--limit takes a positive value",
        &["d.png", "w.xyz"],
    );
}

/// A model file names the method, the set, its form and the multiplicity itself;
/// here the O₂ triplet by UHF (multiplicity in [molecule], pure d by `functions`).
#[test]
fn model_file_names_method_basis_and_multiplicity() {
    let d = dir();
    let model = "[molecule]\nmultiplicity = 3\natoms = [{ element = \"O\", position = [0, 0, 0] }, { element = \"O\", position = [0, 0, 1.21] }]\n[basis]\nset = \"6-31g*\"\nfunctions = \"pure\"\n[orbitals]\nmethod = \"uhf\"\n";
    write_file(d.path(), "o2.toml", model);
    let out = ok(d.path(), &["solve", "o2.toml"]);
    // 6-31G* O: 3s 2p 1d = 4 + 2·3 + 5 (pure) = 14 per atom (basis-set-exchange data).
    assert!(out.contains("multiplicity 3, 28 basis functions"), "{out}");
    assert!(out.contains("(9 alpha, 7 beta)"), "{out}");
    // UHF on a triplet: ⟨S²⟩ at or above S(S+1) = 2 (a determinant's bound).
    let s2: f64 = out
        .split("<S^2> = ")
        .nth(1)
        .and_then(|t| t.split_whitespace().next())
        .and_then(|v| v.parse().ok())
        .unwrap();
    assert!((2.0..2.1).contains(&s2), "{s2}");
    let bad = model.replace("method = \"uhf\"", "method = \"one-electron\"");
    write_file(d.path(), "bad.toml", &bad);
    let o = run(d.path(), &["solve", "bad.toml"]);
    assert_input_error(d.path(), &o, "multiplicity", &["bad.toml", "o2.toml"]);
}

/// Both starting densities reach the same state (the SCF solution does not depend
/// on where it starts, for a well-behaved closed shell): equal totals as printed
/// (10 decimals); `--guess` is refused for a method without an SCF.
#[test]
fn both_starts_reach_the_same_energy() {
    let d = dir();
    write_file(d.path(), "w.xyz", WATER);
    let total = |out: &str| -> String {
        out.lines()
            .find(|l| l.trim_start().starts_with("total"))
            .and_then(|l| l.split_whitespace().nth(1))
            .unwrap()
            .to_string()
    };
    let atoms = ok(
        d.path(),
        &["solve", "w.xyz", "--method", "rhf", "--basis", "6-31g"],
    );
    let core = ok(
        d.path(),
        &[
            "solve", "w.xyz", "--method", "rhf", "--basis", "6-31g", "--guess", "core",
        ],
    );
    assert!(
        atoms.contains("start: superposed spherical free atoms"),
        "{atoms}"
    );
    assert!(core.contains("start: core Hamiltonian"), "{core}");
    assert_eq!(total(&atoms), total(&core));
    let o = run(
        d.path(),
        &[
            "solve",
            "w.xyz",
            "--method",
            "extended-huckel",
            "--guess",
            "core",
        ],
    );
    assert_input_error(d.path(), &o, "--guess goes with Hartree–Fock", &["w.xyz"]);
}
