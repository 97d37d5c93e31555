//! Where outputs go (issue items 2–4): every output is checked before any work, all
//! are written or none, targets that are not regular files are never replaced, links
//! are written through, `-` is standard output, and interrupted runs leave no
//! temporary files. The expected behaviour is the documented contract of
//! `src/output/` (common practice for careful command-line tools).

mod common;

use std::fs;
use std::path::Path;
use std::process::{Command, Output, Stdio};

use common::{BIN, H2, assert_error_first, names, run};

const SCAN: [&str; 6] = ["--from", "1", "--to", "2", "--step", "0.5"];

fn setup() -> tempfile::TempDir {
    let dir = tempfile::tempdir().unwrap();
    fs::write(dir.path().join("h2.toml"), H2).unwrap();
    dir
}

fn curve(dir: &Path, extra: &[&str]) -> Output {
    let mut args = vec!["curve", "h2.toml"];
    args.extend(SCAN);
    args.extend(extra);
    run(dir, &args)
}

#[test]
fn a_missing_folder_fails_before_any_file_is_written() {
    let dir = setup();
    let out = curve(
        dir.path(),
        &["--csv", "c.csv", "--json", "c.json", "--png", "nodir/c.png"],
    );
    assert_error_first(&out, "does not exist");
    assert_eq!(names(dir.path()), ["h2.toml"]);
}

#[test]
fn two_outputs_with_one_name_are_refused() {
    let dir = setup();
    let out = curve(dir.path(), &["--csv", "c.png", "--png", "./c.png"]);
    assert_error_first(&out, "same file");
    assert_eq!(names(dir.path()), ["h2.toml"]);
}

#[test]
fn an_input_is_never_an_output() {
    let dir = setup();
    let out = curve(dir.path(), &["--csv", "./h2.toml"]);
    assert_error_first(&out, "also an input");
    assert_eq!(fs::read_to_string(dir.path().join("h2.toml")).unwrap(), H2);
}

#[cfg(unix)]
#[test]
fn devices_fifos_and_folders_are_not_replaced() {
    use std::os::unix::fs::FileTypeExt;
    let dir = setup();
    let fifo = dir.path().join("pipe");
    let made = Command::new("mkfifo").arg(&fifo).status();
    if made.is_ok_and(|s| s.success()) {
        let out = curve(dir.path(), &["--csv", "pipe"]);
        assert_error_first(&out, "FIFO");
        assert!(fs::symlink_metadata(&fifo).unwrap().file_type().is_fifo());
    }
    let out = curve(dir.path(), &["--csv", "/dev/null"]);
    assert_error_first(&out, "a device");
    assert!(!fs::metadata("/dev/null").unwrap().is_file());
    fs::create_dir(dir.path().join("sub")).unwrap();
    let out = curve(dir.path(), &["--csv", "sub"]);
    assert_error_first(&out, "a folder");
}

#[cfg(unix)]
#[test]
fn a_symlink_is_written_through_and_stays_a_link() {
    let dir = setup();
    let real = dir.path().join("real.csv");
    fs::write(&real, "old").unwrap();
    std::os::unix::fs::symlink("real.csv", dir.path().join("link.csv")).unwrap();
    let out = curve(dir.path(), &["--csv", "link.csv"]);
    assert_eq!(
        out.status.code(),
        Some(0),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let link = fs::symlink_metadata(dir.path().join("link.csv")).unwrap();
    assert!(link.file_type().is_symlink());
    assert!(fs::read_to_string(&real).unwrap().starts_with("# lobecast"));
    assert_eq!(names(dir.path()), ["h2.toml", "link.csv", "real.csv"]);
}

#[test]
fn a_dash_is_standard_output_and_reports_move_to_standard_error() {
    let dir = setup();
    let out = curve(dir.path(), &["--csv", "-"]);
    assert_eq!(out.status.code(), Some(0));
    let stdout = String::from_utf8_lossy(&out.stdout);
    assert!(
        stdout.starts_with("# lobecast"),
        "only the CSV on stdout: {stdout}"
    );
    assert!(String::from_utf8_lossy(&out.stderr).contains("R/bohr"));
    assert_eq!(names(dir.path()), ["h2.toml"]);
    let out = run(
        dir.path(),
        &[
            "volume",
            "h2.toml",
            "--field",
            "orbital:1",
            "--points",
            "10",
            "--out",
            "-",
        ],
    );
    assert_eq!(out.status.code(), Some(0));
    let cube = String::from_utf8_lossy(&out.stdout);
    assert!(
        cube.starts_with("lobecast volume"),
        "the cube alone on stdout"
    );
    assert!(!cube.contains("wrote"));
    assert!(String::from_utf8_lossy(&out.stderr).contains("wrote standard output"));
}

#[test]
fn stale_temporary_files_of_dead_runs_are_removed() {
    let dir = setup();
    // A process number above the Linux maximum (2^22) is never alive.
    let stale = dir.path().join(".c.csv.lobecast-4194999.abcdef.part");
    let other = dir.path().join(".notes.part");
    fs::write(&stale, "x").unwrap();
    fs::write(&other, "mine").unwrap();
    let out = curve(dir.path(), &["--csv", "c.csv"]);
    assert_eq!(out.status.code(), Some(0));
    if Path::new("/proc/self/stat").exists() {
        assert!(!stale.exists(), "a dead run's temporary file is cleaned");
    }
    assert!(other.exists(), "files that are not ours are left alone");
}

#[cfg(unix)]
#[test]
fn an_interrupt_removes_the_unfinished_cube() {
    let dir = setup();
    let mut child = Command::new(BIN)
        .current_dir(dir.path())
        .args([
            "volume",
            "h2.toml",
            "--field",
            "orbital:1",
            "--points",
            "700",
        ])
        .args(["--out", "big.cube"])
        .stdout(Stdio::null())
        .stderr(Stdio::piped())
        .spawn()
        .unwrap();
    // Wait until the temporary file exists, then interrupt.
    let start = std::time::Instant::now();
    loop {
        let started = names(dir.path()).iter().any(|n| n.ends_with(".part"));
        if started || start.elapsed().as_secs() > 60 {
            break;
        }
        std::thread::sleep(std::time::Duration::from_millis(20));
    }
    let _ = Command::new("kill")
        .args(["-INT", &child.id().to_string()])
        .status();
    let status = child.wait().unwrap();
    assert_eq!(status.code(), Some(130), "exit 128 + SIGINT");
    assert_eq!(names(dir.path()), ["h2.toml"], "no temporary file remains");
}

/// Hardening item 2: with `--json -` the orbital file alone goes to standard output
/// (the report to standard error), so it parses as JSON (common practice for `-`).
#[test]
fn solve_json_to_stdout_stays_parseable() {
    let dir = tempfile::tempdir().unwrap();
    std::fs::write(dir.path().join("m.toml"), H2).unwrap();
    let out = run(dir.path(), &["solve", "m.toml", "--json", "-"]);
    assert!(out.status.success());
    let doc: serde_json::Value = serde_json::from_slice(&out.stdout).expect("stdout is JSON");
    assert_eq!(doc["format"], "lobecast-orbitals");
    assert!(String::from_utf8_lossy(&out.stderr).contains("lobecast solve:"));
}
