//! `inspect` and `combine` as a user meets them: combining a file with itself at
//! weights 1 and −1 gives zero, bonding minus antibonding orbital density integrates
//! to zero, gzip output reads the same, and bad input gives one `error:` line, exit
//! status 2 and no output file.

mod common;

use std::fs;
use std::path::Path;

use common::{H2, assert_input_error, ok, run};

fn inspect_json(dir: &Path, file: &str) -> serde_json::Value {
    serde_json::from_str(&ok(dir, &["inspect", file, "--json"])).unwrap()
}

fn field(v: &serde_json::Value, key: &str) -> f64 {
    v["fields"][0][key].as_f64().unwrap()
}

/// `volume` of one field of the H2+ model on the tests' common grid.
fn volume(dir: &Path, field: &str, out: &str) {
    ok(
        dir,
        &[
            "volume",
            "h2.toml",
            "--field",
            field,
            "--spacing",
            "0.15",
            "--units",
            "bohr",
            "--padding",
            "6",
            "--out",
            out,
        ],
    );
}

fn setup() -> tempfile::TempDir {
    let d = tempfile::tempdir().unwrap();
    fs::write(d.path().join("h2.toml"), H2).unwrap();
    volume(d.path(), "orbital-density:1", "bond.cube");
    volume(d.path(), "orbital-density:2", "anti.cube.gz");
    d
}

/// A − A = 0 at every point (exact arithmetic: w·v − w·v = 0); bonding minus
/// antibonding density integrates to zero because each integrates to one electron
/// (normalised orbitals; the grid integrals hold to 1e-3, tests/grid_checks.rs).
#[test]
fn combine_differences() {
    let d = setup();
    let p = d.path();
    ok(
        p,
        &[
            "combine",
            "--out",
            "zero.cube",
            "bond.cube:1",
            "bond.cube:-1",
        ],
    );
    let z = inspect_json(p, "zero.cube");
    assert_eq!(field(&z, "min"), 0.0);
    assert_eq!(field(&z, "max"), 0.0);
    assert!(z["fields"][0]["isovalue"].is_null());

    let b = inspect_json(p, "bond.cube");
    let a = inspect_json(p, "anti.cube.gz");
    assert_eq!(a["gzip"], true);
    let (ib, ia) = (field(&b, "integral"), field(&a, "integral"));
    eprintln!("∫ bonding density = {ib:.6}, ∫ antibonding density = {ia:.6}");
    assert!((ib - 1.0).abs() < 1e-3 && (ia - 1.0).abs() < 1e-3);
    ok(
        p,
        &[
            "combine",
            "--out",
            "diff.cube.gz",
            "bond.cube:1",
            "anti.cube.gz:-1",
        ],
    );
    let diff = inspect_json(p, "diff.cube.gz");
    let id = field(&diff, "integral");
    eprintln!("∫ (bonding − antibonding) = {id:.3e}");
    assert!(id.abs() < 2e-3, "{id}");
    // The difference equals the difference of the integrals to the printed precision.
    assert!((id - (ib - ia)).abs() < 1e-5, "{id} vs {}", ib - ia);
    assert!(diff["fields"][0]["signed"].as_bool().unwrap());
    assert_eq!(diff["points"], b["points"]);
}

/// A multi-field file: #N picks the stored field, its absence is an error with a hint.
#[test]
fn combine_selects_fields_of_multi_field_files() {
    let d = setup();
    let p = d.path();
    ok(
        p,
        &[
            "volume",
            "h2.toml",
            "--field",
            "orbital-density:1",
            "--field",
            "orbital-density:2",
            "--spacing",
            "0.15",
            "--units",
            "bohr",
            "--padding",
            "6",
            "--out",
            "both.cube",
        ],
    );
    ok(
        p,
        &[
            "combine",
            "--out",
            "second.cube",
            "both.cube#2:2",
            "anti.cube.gz:-2",
        ],
    );
    let s = inspect_json(p, "second.cube");
    assert_eq!(field(&s, "min"), 0.0);
    assert_eq!(field(&s, "max"), 0.0);
    let both = inspect_json(p, "both.cube");
    assert_eq!(both["fields"].as_array().unwrap().len(), 2);
    assert_eq!(both["fields"][1]["orbital"], 2);
    let out = run(p, &["combine", "--out", "x.cube", "both.cube:1"]);
    assert_input_error(
        p,
        &out,
        "holds 2 fields",
        &[
            "h2.toml",
            "bond.cube",
            "anti.cube.gz",
            "both.cube",
            "second.cube",
        ],
    );
}

#[test]
fn combine_refuses_different_grids_and_warns_about_atoms() {
    let d = setup();
    let p = d.path();
    ok(
        p,
        &[
            "volume",
            "h2.toml",
            "--field",
            "orbital-density:1",
            "--spacing",
            "0.2",
            "--units",
            "bohr",
            "--out",
            "coarse.cube",
        ],
    );
    let keep = ["h2.toml", "bond.cube", "anti.cube.gz", "coarse.cube"];
    let out = run(
        p,
        &[
            "combine",
            "--out",
            "c.cube",
            "bond.cube:1",
            "coarse.cube:-1",
        ],
    );
    assert_input_error(p, &out, "grids of bond.cube and coarse.cube differ", &keep);
    // Shift the origin by 1e-5 bohr: beyond the 1e-6 tolerance, and said so.
    let text = fs::read_to_string(p.join("bond.cube")).unwrap();
    let orig: Vec<String> = text.lines().map(String::from).collect();
    let t: Vec<f64> = orig[2]
        .split_whitespace()
        .map(|x| x.parse().unwrap())
        .collect();
    let mut lines = orig.clone();
    lines[2] = format!("{:5}{:12.6}{:12.6}{:12.6}", t[0], t[1], t[2] + 1e-5, t[3]);
    fs::write(p.join("shifted.cube"), lines.join("\n") + "\n").unwrap();
    let out = run(
        p,
        &[
            "combine",
            "--out",
            "c.cube",
            "bond.cube:1",
            "shifted.cube:-1",
        ],
    );
    let mut keep2 = keep.to_vec();
    keep2.push("shifted.cube");
    assert_input_error(p, &out, "origins differ by 1.000e-5 bohr in y", &keep2);
    // Move an atom (line 7, the first atom): only a warning, and the sum is written.
    let mut lines = orig;
    assert!(lines[6].contains("-1.000000"));
    lines[6] = lines[6].replace("-1.000000", "-1.100000");
    fs::write(p.join("moved.cube"), lines.join("\n") + "\n").unwrap();
    let out = run(
        p,
        &["combine", "--out", "c.cube", "bond.cube:1", "moved.cube:-1"],
    );
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(
        err.starts_with("warning: ") && err.contains("atom 1"),
        "{err}"
    );
    assert!(p.join("c.cube").exists());
}

#[test]
fn bad_input_is_refused_without_output() {
    let d = setup();
    let p = d.path();
    let keep = ["h2.toml", "bond.cube", "anti.cube.gz"];
    let out = run(
        p,
        &[
            "combine",
            "--out",
            "bond.cube",
            "bond.cube:1",
            "anti.cube.gz:-1",
        ],
    );
    assert_input_error(p, &out, "also an input", &keep);
    let out = run(p, &["combine", "--out", "c.cube", "bond.cube:one"]);
    assert_input_error(p, &out, "weight", &keep);
    let out = run(p, &["combine", "--out", "c.cube", "missing.cube:1"]);
    assert_input_error(p, &out, "missing.cube", &keep);
    let out = run(p, &["inspect", "bond.cube", "--enclose", "1.5"]);
    assert_input_error(p, &out, "fraction", &keep);
    // A broken value in a large file: the error names its line, and combine leaves
    // no partial output although it had started writing.
    let text = fs::read_to_string(p.join("bond.cube")).unwrap();
    let mut lines: Vec<&str> = text.lines().collect();
    let n = lines.len() - 3;
    lines[n] = "  1.00000E-01  oops";
    fs::write(p.join("broken.cube"), lines.join("\n") + "\n").unwrap();
    let mut keep2 = keep.to_vec();
    keep2.push("broken.cube");
    let out = run(p, &["inspect", "broken.cube"]);
    assert_input_error(
        p,
        &out,
        &format!("line {}: 'oops' is not a number", n + 1),
        &keep2,
    );
    let out = run(
        p,
        &[
            "combine",
            "--out",
            "c.cube",
            "bond.cube:1",
            "broken.cube:-1",
        ],
    );
    assert_input_error(p, &out, &format!("line {}", n + 1), &keep2);
}

/// The text report carries the header and the ± level of a signed field.
#[test]
fn inspect_report() {
    let d = setup();
    let p = d.path();
    ok(
        p,
        &[
            "combine",
            "--out",
            "diff.cube",
            "bond.cube:1",
            "anti.cube.gz:-1",
        ],
    );
    let text = ok(p, &["inspect", "diff.cube", "--enclose", "0.5"]);
    assert!(
        text.contains("title:   lobecast combine: +1×bond.cube −1×anti.cube.gz"),
        "{text}"
    );
    assert!(text.contains("isovalue ±"), "{text}");
    assert!(text.contains("50.0000 % of ∫f² dV"), "{text}");
    let text = ok(p, &["inspect", "bond.cube"]);
    assert!(text.contains("of ∫|f| dV") && !text.contains("±"), "{text}");
}

/// Hardening item 15: the sum's unit is stated on the comment line, an orbital added
/// to a density draws a warning, and an existing name holding ':' and '#' is taken
/// whole (units: bohr^-3/2 for orbitals, e/bohr^3 for densities — atomic units).
#[test]
fn combine_states_units_and_takes_odd_names() {
    let d = setup();
    let p = d.path();
    volume(p, "orbital:1", "psi.cube");
    let comment = |f: &str| {
        fs::read_to_string(p.join(f))
            .unwrap()
            .lines()
            .nth(1)
            .unwrap()
            .to_string()
    };
    let same = run(
        p,
        &[
            "combine",
            "--out",
            "d.cube",
            "bond.cube:1",
            "anti.cube.gz:-1",
        ],
    );
    assert!(String::from_utf8_lossy(&same.stderr).is_empty());
    assert!(
        comment("d.cube").contains("in e/bohr^3"),
        "{}",
        comment("d.cube")
    );
    let mixed = run(p, &["combine", "--out", "m.cube", "bond.cube", "psi.cube"]);
    assert!(mixed.status.success());
    let err = String::from_utf8_lossy(&mixed.stderr);
    assert!(
        err.starts_with("warning: ") && err.contains("different units"),
        "{err}"
    );
    assert!(
        comment("m.cube").contains("mixed units"),
        "{}",
        comment("m.cube")
    );
    fs::copy(p.join("bond.cube"), p.join("run:2#1.cube")).unwrap();
    let odd = ok(p, &["combine", "--out", "o.cube", "run:2#1.cube"]);
    assert!(odd.contains("+1×run:2#1.cube"), "{odd}");
    // With a weight, the name is no existing file: the field and weight follow it.
    let spelled = ok(p, &["combine", "--out", "o2.cube", "run:2#1.cube#1:-1"]);
    assert!(spelled.contains("−1×run:2#1.cube"), "{spelled}");
}
