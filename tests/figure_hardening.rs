//! Hostile input to `slice` and `profile`: every count option bounded with its range
//! named, negative numbers read as values and refused with a reason and a unit, `--up`
//! checked against the plane, and the help naming every kind of source and field.

mod common;

use std::path::{Path, PathBuf};
use std::process::Command;
use std::time::{Duration, Instant};

use common::{bin, example, run_here};

/// Runs `lobecast COMMAND SOURCE ARGS… --png/--csv OUT` and checks the refusal: exit 2,
/// exactly one `error:` line containing `expect`, no panic, no file, done quickly.
fn refused(command: &str, source: &Path, args: &[&str], expect: &str) {
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path().join(if command == "profile" {
        "o.csv"
    } else {
        "o.png"
    });
    let flag = if command == "profile" {
        "--csv"
    } else {
        "--png"
    };
    let started = Instant::now();
    let o = Command::new(bin())
        .arg(command)
        .arg(source)
        .args(args)
        .arg(flag)
        .arg(&out)
        .output()
        .unwrap();
    let took = started.elapsed();
    let err = String::from_utf8_lossy(&o.stderr);
    assert_eq!(o.status.code(), Some(2), "{args:?}: {err}");
    let errors: Vec<&str> = err.lines().filter(|l| l.starts_with("error: ")).collect();
    assert_eq!(errors.len(), 1, "{args:?}: {err}");
    assert!(errors[0].contains(expect), "{args:?}: {err}");
    assert!(!err.contains("panicked"), "{err}");
    assert!(!out.exists(), "{args:?} left a file");
    // A refusal must not start the work (common practice: seconds, not minutes).
    assert!(took < Duration::from_secs(20), "{args:?} took {took:?}");
}

fn h2() -> PathBuf {
    example("h2-cation.toml")
}

const XZ: [&str; 4] = ["--field", "orbital:1", "--plane", "xz"];

fn with<'a>(base: &[&'a str], extra: &[&'a str]) -> Vec<&'a str> {
    base.iter().chain(extra).copied().collect()
}

#[test]
fn slice_counts_are_bounded_with_the_range_named() {
    // The reported cases: u64::MAX panicked with a capacity overflow, 10^12 aborted,
    // 10000 ran for minutes. Ranges as documented in README and --help.
    for n in ["18446744073709551615", "1000000000000", "10000", "51", "-5"] {
        refused("slice", &h2(), &with(&XZ, &["--contours", n]), "0 to 50");
    }
    refused(
        "slice",
        &h2(),
        &with(&XZ, &["--contours", "lots"]),
        "whole number from 0 to 50",
    );
    for n in ["199", "10001", "-5", "99999999999999999999999999"] {
        refused("slice", &h2(), &with(&XZ, &["--size", n]), "200 to 10000");
    }
    let seventeen = vec!["orbital:1"; 17].join(",");
    refused(
        "slice",
        &h2(),
        &["--panels", &seventeen, "--plane", "xz"],
        "1 to 16",
    );
    let many: Vec<String> = (1..=101).map(|k| format!("{}", k as f64 * 0.001)).collect();
    let many = many.join(",");
    refused(
        "slice",
        &h2(),
        &["--field", "orbital:1", "--plane", "xz", "--levels", &many],
        "1 to 100",
    );
    let two = ["--panels", "orbital:1,orbital:2", "--plane", "xz"];
    // --columns 0 was accepted; it must be 1 to the number of panels.
    for n in ["0", "3", "-1", "18446744073709551616"] {
        refused("slice", &h2(), &with(&two, &["--columns", n]), "1 to 2");
    }
}

#[test]
fn profile_counts_are_bounded_with_the_range_named() {
    let line = ["--field", "orbital:1", "--from", "atom:1", "--to", "atom:2"];
    for n in ["1", "1000001", "-5", "18446744073709551615"] {
        refused(
            "profile",
            &h2(),
            &with(&line, &["--points", n]),
            "2 to 1000000",
        );
    }
    for n in ["199", "4001", "-5"] {
        let a = with(&line, &["--size", n]);
        refused("profile", &h2(), &a, "200 to 4000");
    }
    let mut seventeen = vec!["--from", "atom:1", "--to", "atom:2"];
    for _ in 0..17 {
        seventeen.extend(["--field", "orbital:1"]);
    }
    refused("profile", &h2(), &seventeen, "1 to 16");
}

#[test]
fn negative_numbers_are_values_refused_with_a_reason_and_a_unit() {
    // Before, clap read "-5" as an unknown flag.
    refused(
        "slice",
        &h2(),
        &with(&XZ, &["--extent", "-5"]),
        "--extent must be positive, got -5 Å",
    );
    refused(
        "slice",
        &h2(),
        &with(&XZ, &["--extent", "4,-3", "--units", "bohr"]),
        "--extent must be positive, got -3 bohr",
    );
    refused(
        "slice",
        &h2(),
        &with(&XZ, &["--extent", "5000"]),
        "at most 1000 Å",
    );
    refused(
        "slice",
        &h2(),
        &["--field", "density", "--plane", "xz", "--log", "-2"],
        "--log takes 0.1 to 12 decades, got -2",
    );
    let line = ["--field", "orbital:1", "--from", "atom:1", "--to", "atom:2"];
    refused(
        "profile",
        &h2(),
        &with(&line, &["--extend", "-5"]),
        "--extend must be zero or positive, got -5 Å",
    );
    refused(
        "profile",
        &h2(),
        &with(&line, &["--extend", "-2bohr"]),
        "got -2 bohr",
    );
    // A negative coordinate is a value, not a flag.
    let dir = tempfile::tempdir().unwrap();
    let csv = dir.path().join("p.csv");
    let o = run_here(&[
        "profile",
        h2().to_str().unwrap(),
        "--field",
        "orbital:1",
        "--from",
        "-1,0,0",
        "--to",
        "1,0,0",
        "--points",
        "5",
        "--csv",
        csv.to_str().unwrap(),
    ]);
    assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
    let text = std::fs::read_to_string(&csv).unwrap();
    let first = text
        .lines()
        .find(|l| !l.starts_with('#') && !l.starts_with('s'))
        .unwrap();
    // x = −1 Å in bohr (CODATA 2018 Bohr radius, 0.529177210903 Å).
    let x: f64 = first.split(',').nth(1).unwrap().parse().unwrap();
    assert!((x + 1.0 / 0.529_177_210_903).abs() < 1e-12, "{first}");
}

#[test]
fn up_is_checked_against_the_plane() {
    // --up was ignored silently with xy; the normal of the plane is refused.
    refused(
        "slice",
        &h2(),
        &["--field", "orbital:1", "--plane", "xy", "--up", "z"],
        "--up z is perpendicular to the plane xy",
    );
    refused(
        "slice",
        &h2(),
        &[
            "--field",
            "orbital:1",
            "--plane",
            "atoms:1,2,1",
            "--up",
            "z",
        ],
        "three atoms",
    );
    // --up x with xz turns the picture: x is drawn upwards, so the H2 bond (along z)
    // lies across it and the map is wider than tall for a window of 4 × 2 bohr given
    // as W,H in picture directions.
    let dir = tempfile::tempdir().unwrap();
    let png = dir.path().join("up.png");
    let o = run_here(&[
        "slice",
        h2().to_str().unwrap(),
        "--field",
        "orbital:1",
        "--plane",
        "xz",
        "--up",
        "x",
        "--png",
        png.to_str().unwrap(),
    ]);
    assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
    let text = String::from_utf8_lossy(&o.stdout);
    // The nuclei are 2 bohr apart along z, with 2.5 Å padding on every side: the
    // samples span (2 bohr + 5 Å) across and 5 Å up (geometry of the default window).
    let across = 2.0 * 0.529_177_210_903 + 5.0;
    assert!(text.contains(&format!("({across:.2} × 5.00 Å)")), "{text}");
}

#[test]
fn slice_help_names_every_source_and_field() {
    let o = run_here(&["slice", "--help"]);
    let help = String::from_utf8_lossy(&o.stdout);
    for word in ["XYZ", "deformation", "stored:K", "cube", "orbital-density"] {
        assert!(help.contains(word), "slice --help lacks {word}:\n{help}");
    }
    let o = run_here(&["profile", "--help"]);
    let help = String::from_utf8_lossy(&o.stdout);
    for word in ["XYZ", "deformation", "stored:K"] {
        assert!(help.contains(word), "profile --help lacks {word}:\n{help}");
    }
}

#[test]
fn extended_huckel_titles_give_energies_in_ev() {
    // Extended Hückel is parametrised in eV (Hoffmann 1963), so figures state its
    // energies in eV; the ethylene π HOMO lies near −13 eV (from memory), far from
    // any value in hartree.
    let dir = tempfile::tempdir().unwrap();
    let png = dir.path().join("t.png");
    let o = run_here(&[
        "slice",
        example("ethylene.xyz").to_str().unwrap(),
        "--method",
        "extended-huckel",
        "--field",
        "orbital:homo",
        "--plane",
        "xz",
        "--png",
        png.to_str().unwrap(),
    ]);
    assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
    let info = lobecast::source::Source::load(
        &example("ethylene.xyz"),
        &lobecast::io::model::LoadOptions {
            method: Some(lobecast::solve::MethodKind::ExtendedHuckel),
            ..Default::default()
        },
    )
    .unwrap()
    .info(&lobecast::field::Field::parse("orbital:homo").unwrap())
    .unwrap();
    assert!(info.heading.ends_with(" eV"), "{}", info.heading);
    assert!(!info.heading.contains("hartree"), "{}", info.heading);
    assert!(info.short.ends_with(" eV"), "{}", info.short);
    let e: f64 = info
        .heading
        .split("E = ")
        .nth(1)
        .unwrap()
        .trim_end_matches(" eV")
        .replace('−', "-")
        .parse()
        .unwrap();
    assert!((-14.5..-12.0).contains(&e), "{e}");
    // A one-electron model keeps hartree first.
    let h = lobecast::source::Source::load(&h2(), &Default::default())
        .unwrap()
        .info(&lobecast::field::Field::parse("orbital:1").unwrap())
        .unwrap();
    assert!(h.heading.contains("hartree"), "{}", h.heading);
}
