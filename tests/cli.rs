//! The command line as a user meets it: bad input gives one `error:` line and exit
//! status 2, never a panic and never a partial or overwritten file; good input gives
//! a cube file in the standard layout whose size the writer predicted exactly.

mod common;

use std::fs;

use common::{H2, assert_input_error, run, write_file};

#[test]
fn bad_models_are_refused_with_the_reason() {
    let d = tempfile::tempdir().unwrap();
    let cases: &[(&str, &str, &[&str], &str)] = &[
        ("syntax.toml", "[molecule\n", &["solve"], "line 1"),
        (
            "element.toml",
            &H2.replace(
                "element = \"H\", position = [0, 0, 1]",
                "element = \"Xq\", position = [0, 0, 1]",
            ),
            &["solve"],
            "Xq",
        ),
        (
            "key.toml",
            &H2.replace("charge = 1", "charge = 1\ncolour = 3"),
            &["solve"],
            "colour",
        ),
        (
            "same.toml",
            &H2.replace("[0, 0, 1]", "[0, 0, -1]"),
            &["solve"],
            "closer than 0.1 Å",
        ),
        (
            "two.toml",
            &H2.replace("charge = 1", "charge = 0"),
            &["solve"],
            "exactly one electron",
        ),
        (
            "basis.toml",
            &H2.replace("slater-1s", "slater-9z"),
            &["solve"],
            "slater-9z",
        ),
    ];
    let mut keep: Vec<&str> = Vec::new();
    for (name, text, cmd, needle) in cases {
        write_file(d.path(), name, text);
        keep.push(name);
        let mut args = cmd.to_vec();
        args.push(name);
        let out = run(d.path(), &args);
        assert_input_error(d.path(), &out, needle, &keep);
    }
}

#[test]
fn bad_flags_are_refused_before_anything_is_written() {
    let d = tempfile::tempdir().unwrap();
    write_file(d.path(), "h2.toml", H2);
    write_file(
        d.path(),
        "h3.toml",
        &H2.replace(
            "[0, 0, 1] }]",
            "[0, 0, 1] }, { element = \"H\", position = [0, 0, 3] }]",
        ),
    );
    let curve = ["curve", "h2.toml", "--units", "bohr", "--csv", "c.csv"];
    let cases: Vec<(Vec<&str>, &str)> = vec![
        (
            [&curve[..], &["--from", "0", "--to", "4", "--step", "0.1"]].concat(),
            "R > 0",
        ),
        (
            [&curve[..], &["--from", "1", "--to", "4", "--step", "-0.1"]].concat(),
            "--step",
        ),
        (
            [&curve[..], &["--from", "4", "--to", "1", "--step", "0.1"]].concat(),
            "--to",
        ),
        (
            vec![
                "curve", "h3.toml", "--from", "1", "--to", "2", "--step", "0.1",
            ],
            "exactly two atoms",
        ),
        (
            vec![
                "volume",
                "h2.toml",
                "--field",
                "orbital:3",
                "--out",
                "v.cube",
            ],
            "the set has 2 orbitals",
        ),
        (
            vec!["volume", "h2.toml", "--field", "orbit:1", "--out", "v.cube"],
            "unknown field",
        ),
        (
            vec![
                "volume",
                "h2.toml",
                "--field",
                "orbital:1",
                "--spacing",
                "0",
                "--out",
                "v.cube",
            ],
            "spacing",
        ),
        (
            vec![
                "volume",
                "h2.toml",
                "--field",
                "orbital:1",
                "--out",
                "h2.toml",
            ],
            "also an input",
        ),
        (
            vec![
                "volume",
                "h2.toml",
                "--field",
                "orbital:1",
                "--out",
                "no/such/dir/v.cube",
            ],
            "cannot write",
        ),
        (
            vec![
                "volume",
                "h2.toml",
                "--field",
                "orbital:1",
                "--max-bytes",
                "1000",
                "--out",
                "v.cube",
            ],
            "--max-bytes",
        ),
        (
            vec![
                "volume",
                "h2.toml",
                "--feild",
                "orbital:1",
                "--out",
                "v.cube",
            ],
            "--feild",
        ),
    ];
    for (args, needle) in cases {
        let out = run(d.path(), &args);
        assert_input_error(d.path(), &out, needle, &["h2.toml", "h3.toml"]);
    }
    assert_eq!(
        fs::read_to_string(d.path().join("h2.toml")).unwrap(),
        H2,
        "the input is untouched"
    );
}

#[test]
fn an_existing_output_is_replaced_only_on_success() {
    let d = tempfile::tempdir().unwrap();
    write_file(d.path(), "h2.toml", H2);
    fs::write(d.path().join("v.cube"), "old").unwrap();
    let out = run(
        d.path(),
        &[
            "volume",
            "h2.toml",
            "--field",
            "orbital:9",
            "--out",
            "v.cube",
        ],
    );
    assert_eq!(out.status.code(), Some(2));
    assert_eq!(fs::read_to_string(d.path().join("v.cube")).unwrap(), "old");
    let out = run(
        d.path(),
        &[
            "volume",
            "h2.toml",
            "--field",
            "orbital:1",
            "--out",
            "v.cube",
            "--points",
            "21",
        ],
    );
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    assert!(fs::read_to_string(d.path().join("v.cube")).unwrap().len() > 1000);
}

/// The layout of the de-facto cube standard (two comment lines; atom count and
/// origin; three count + axis lines; atoms; for several fields a negative atom count
/// and an index line; values six per line, a new line after each innermost row).
#[test]
fn multi_field_cube_layout() {
    let d = tempfile::tempdir().unwrap();
    write_file(d.path(), "h2.toml", H2);
    let out = run(
        d.path(),
        &[
            "volume",
            "h2.toml",
            "--field",
            "orbital:1",
            "--field",
            "orbital-density:2",
            "--field",
            "density",
            "--spacing",
            "0.5",
            "--units",
            "bohr",
            "--out",
            "m.cube",
        ],
    );
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let text = fs::read_to_string(d.path().join("m.cube")).unwrap();
    let lines: Vec<&str> = text.lines().collect();
    let nums = |l: &str| {
        l.split_whitespace()
            .map(|t| t.parse::<f64>().unwrap())
            .collect::<Vec<_>>()
    };
    let head = nums(lines[2]);
    assert_eq!(
        head[0], -2.0,
        "negative atom count marks the multi-orbital variant"
    );
    let counts: Vec<usize> = (3..6).map(|i| nums(lines[i])[0] as usize).collect();
    assert_eq!(
        counts,
        vec![21, 21, 25],
        "box of 10 × 10 × 12 bohr at 0.5 bohr"
    );
    assert_eq!(nums(lines[5])[3], 0.5);
    assert_eq!(nums(lines[6]), vec![1.0, 1.0, 0.0, 0.0, -1.0]);
    assert_eq!(
        nums(lines[8]),
        vec![3.0, 1.0, 2.0, 0.0],
        "field count, then orbital numbers (0 = total density)"
    );
    let row: usize = 25 * 3;
    let per_row = row.div_ceil(6);
    let data = &lines[9..];
    assert_eq!(data.len(), 21 * 21 * per_row);
    for (n, l) in data.iter().enumerate() {
        let expect = if n % per_row == per_row - 1 && row % 6 != 0 {
            row % 6
        } else {
            6
        };
        assert_eq!(l.len(), 13 * expect, "line {} of the values", n + 1);
    }
    let values: Vec<f64> = data.iter().flat_map(|l| nums(l)).collect();
    // orbital-density:2 and density are non-negative; density equals orbital-density:1
    // (one electron in orbital 1), i.e. the square of field 0 to the printed precision.
    for p in values.chunks(3) {
        assert!(p[1] >= 0.0 && p[2] >= 0.0);
        assert!((p[2] - p[0] * p[0]).abs() <= 2e-5 * p[2].abs() + 1e-300);
    }
}

/// XYZ input with extended Hückel: bad files, missing parameters and misuse of the
/// flags each give one `error:` line and exit 2 with no output; a good run writes
/// the orbital table with the caution, and a cube of the frontier and deformation.
#[test]
fn xyz_with_extended_huckel() {
    let d = tempfile::tempdir().unwrap();
    let water = "3\nwater\nO 0 0 0\nH 0.757 0 0.586\nH -0.757 0 0.586\n";
    write_file(d.path(), "w.xyz", water);
    write_file(d.path(), "bad.xyz", "2\n\nO 0 0 0\nQq 0 0 1\n");
    write_file(d.path(), "ne.xyz", "2\n\nNe 0 0 0\nH 0 0 1\n");
    write_file(d.path(), "m.toml", H2);
    let keep = ["bad.xyz", "m.toml", "ne.xyz", "w.xyz"];
    let eht = ["--method", "extended-huckel"];
    let cases: &[(&[&str], &str)] = &[
        (&["solve", "bad.xyz", eht[0], eht[1]], "line 4"),
        (&["solve", "ne.xyz", eht[0], eht[1]], "no parameters for Ne"),
        (&["solve", "w.xyz"], "--method"),
        (&["solve", "w.xyz", "--method", "guess"], "unknown method"),
        (&["solve", "m.toml", eht[0], eht[1]], "XYZ file"),
        (
            &[
                "volume", "ne.xyz", eht[0], eht[1], "--field", "density", "--out", "o.cube",
            ],
            "Ne",
        ),
        (
            &[
                "volume",
                "m.toml",
                "--field",
                "deformation",
                "--out",
                "o.cube",
            ],
            "free-atom reference",
        ),
    ];
    for (args, needle) in cases {
        let out = run(d.path(), args);
        assert_input_error(d.path(), &out, needle, &keep);
    }
    let out = run(
        d.path(),
        &["solve", "w.xyz", eht[0], eht[1], "--json", "w.json"],
    );
    let text = String::from_utf8_lossy(&out.stdout);
    assert_eq!(
        out.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    assert!(text.contains("HOMO") && text.contains("LUMO") && text.contains("Mulliken"));
    assert!(text.contains("semi-empirical and qualitative"), "{text}");
    let json = fs::read_to_string(d.path().join("w.json")).unwrap();
    assert!(json.contains("semi-empirical"));
    let out = run(
        d.path(),
        &[
            "volume",
            "w.xyz",
            eht[0],
            eht[1],
            "--field",
            "orbital:homo",
            "--field",
            "lumo-x",
            "--out",
            "f.cube",
        ],
    );
    assert_eq!(out.status.code(), Some(2));
    let out = run(
        d.path(),
        &[
            "volume",
            "w.xyz",
            eht[0],
            eht[1],
            "--field",
            "orbital:homo",
            "--field",
            "orbital:lumo",
            "--field",
            "deformation",
            "--spacing",
            "0.3",
            "--out",
            "f.cube",
        ],
    );
    assert_eq!(
        out.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    assert!(d.path().join("f.cube").exists());
}

/// Help, version and a command's report into a pipe whose reader has gone
/// (`lobecast slice --help | head -1`): the output ends quietly, with no panic on
/// standard error (Rust's print macros panic on a closed pipe; found by hand).
#[test]
fn a_closed_pipe_on_standard_output_is_not_a_panic() {
    use std::os::fd::OwnedFd;
    use std::os::unix::net::UnixStream;
    use std::process::{Command, Stdio};
    let d = tempfile::tempdir().unwrap();
    let model = write_file(d.path(), "h2.toml", H2);
    let cases: &[&[&str]] = &[
        &["slice", "--help"],
        &["--help"],
        &["--version"],
        &["solve", model.to_str().unwrap()],
    ];
    for args in cases {
        let (ours, theirs) = UnixStream::pair().unwrap();
        drop(theirs);
        let out = Command::new(env!("CARGO_BIN_EXE_lobecast"))
            .args(*args)
            .stdout(Stdio::from(OwnedFd::from(ours)))
            .stderr(Stdio::piped())
            .output()
            .unwrap();
        let err = String::from_utf8_lossy(&out.stderr);
        assert!(!err.contains("panicked"), "{args:?}: {err}");
        assert_eq!(out.status.code(), Some(0), "{args:?}: {err}");
    }
}
