//! The built-in demo, as a new user's first command: it must write every file its
//! GALLERY.md lists (the reduced `--quick` gallery, into a temporary folder).

mod common;

use std::process::Command;

#[test]
fn quick_demo_writes_every_listed_file() {
    let dir = tempfile::tempdir().unwrap();
    let out = Command::new(common::BIN)
        .args(["demo", "--quick", "--out"])
        .arg(dir.path())
        .output()
        .unwrap();
    let stdout = String::from_utf8_lossy(&out.stdout);
    assert!(
        out.status.success(),
        "{stdout}\n{}",
        String::from_utf8_lossy(&out.stderr)
    );
    // GALLERY.md lists each file in a table row starting "| `NAME`".
    let gallery = std::fs::read_to_string(dir.path().join("GALLERY.md")).unwrap();
    let files: Vec<std::path::PathBuf> = gallery
        .lines()
        .filter_map(|l| l.strip_prefix("| `"))
        .filter_map(|l| l.split_once('`'))
        .map(|(f, _)| dir.path().join(f))
        .collect();
    assert!(files.len() >= 15, "the gallery lists {} files", files.len());
    for f in &files {
        let bytes = std::fs::read(f).unwrap_or_else(|e| panic!("{}: {e}", f.display()));
        assert!(bytes.len() > 200, "{} is nearly empty", f.display());
        if f.extension().is_some_and(|e| e == "png") {
            assert_eq!(
                &bytes[..8],
                b"\x89PNG\r\n\x1a\n",
                "{} is a PNG",
                f.display()
            );
        }
    }
    // One line per step with its time, as the README promises.
    assert!(
        stdout
            .lines()
            .filter(|l| l.starts_with('[') && l.contains(" s "))
            .count()
            >= 9,
        "{stdout}"
    );
    // The build-up columns are in the curve CSV with the signs the physics demands
    // (checked in detail in tests/buildup.rs).
    let csv = std::fs::read_to_string(dir.path().join("h2plus-curve.csv")).unwrap();
    let header = csv.lines().find(|l| l.starts_with("r_bohr")).unwrap();
    assert!(
        header
            .ends_with("between_bonding,between_antibonding,midpoint_bonding,midpoint_antibonding")
    );
}
