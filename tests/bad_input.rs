//! The bad-input corpus (`tests/bad_input/cases.txt`): each case runs the binary in a
//! scratch copy of `tests/bad_input/files/` under a 20 s wall-clock bound and a 3 GiB
//! address-space limit, and must end with exit status 2, exactly one `error:` line (at
//! most one `hint:` after it), no panic, no file left behind and every input unchanged.
//! The refusal rules are the hardening issue's (common practice for command-line tools).

mod common;

use std::collections::BTreeMap;
use std::fs;
use std::path::Path;
use std::process::{Command, Stdio};
use std::time::{Duration, Instant};

use common::BIN;

const TIME_LIMIT: Duration = Duration::from_secs(20);
/// Address space for one case, in KiB for `ulimit -v`.
const MEMORY_KIB: u64 = 3 * 1024 * 1024;

/// Every file below `dir` with its bytes, to compare before and after a case.
fn snapshot(dir: &Path) -> BTreeMap<String, Vec<u8>> {
    let mut out = BTreeMap::new();
    for e in fs::read_dir(dir).unwrap() {
        let e = e.unwrap();
        let name = e.file_name().to_string_lossy().into_owned();
        let meta = fs::symlink_metadata(e.path()).unwrap();
        let bytes = if meta.is_file() {
            fs::read(e.path()).unwrap()
        } else {
            Vec::new()
        };
        out.insert(name, bytes);
    }
    out
}

/// Runs one case; returns a description of what went wrong, if anything.
fn check(dir: &Path, expected: &str, args: &[&str]) -> Result<(), String> {
    let before = snapshot(dir);
    let start = Instant::now();
    let mut child = Command::new("sh")
        .arg("-c")
        .arg(format!("ulimit -v {MEMORY_KIB} && exec \"$0\" \"$@\""))
        .arg(BIN)
        .args(args)
        .current_dir(dir)
        .stdin(Stdio::null())
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .unwrap();
    let status = loop {
        if let Some(s) = child.try_wait().unwrap() {
            break s;
        }
        if start.elapsed() > TIME_LIMIT {
            let _ = child.kill();
            let _ = child.wait();
            return Err(format!("still running after {TIME_LIMIT:?}"));
        }
        std::thread::sleep(Duration::from_millis(20));
    };
    let out = child.wait_with_output().unwrap();
    let stderr = String::from_utf8_lossy(&out.stderr);
    let lines: Vec<&str> = stderr.lines().collect();
    let errors: Vec<usize> = (0..lines.len())
        .filter(|&i| lines[i].starts_with("error: "))
        .collect();
    if status.code() != Some(2) {
        return Err(format!("exit status {status}, stderr: {stderr}"));
    }
    if stderr.contains("panicked") || stderr.contains("RUST_BACKTRACE") {
        return Err(format!("a panic: {stderr}"));
    }
    let [e] = errors[..] else {
        return Err(format!("{} error: lines in {stderr}", errors.len()));
    };
    let tail = &lines[e + 1..];
    if tail.len() > 1 || tail.iter().any(|l| !l.starts_with("hint: ")) {
        return Err(format!(
            "after the error line, only one hint: may follow: {stderr}"
        ));
    }
    if !lines[e].contains(expected) {
        return Err(format!("expected {expected:?} in {:?}", lines[e]));
    }
    let after = snapshot(dir);
    if after != before {
        let changed: Vec<&String> = after
            .keys()
            .chain(before.keys())
            .filter(|k| after.get(*k) != before.get(*k))
            .collect();
        return Err(format!("files changed or left behind: {changed:?}"));
    }
    Ok(())
}

#[test]
fn every_bad_input_is_refused_cleanly() {
    let root = Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/bad_input");
    let scratch = tempfile::tempdir().unwrap();
    for e in fs::read_dir(root.join("files")).unwrap() {
        let e = e.unwrap();
        fs::copy(e.path(), scratch.path().join(e.file_name())).unwrap();
    }
    // An existing folder where a case names its output.
    fs::create_dir(scratch.path().join("sub")).unwrap();
    let cases = fs::read_to_string(root.join("cases.txt")).unwrap();
    let mut failures = Vec::new();
    let mut count = 0;
    for line in cases.lines() {
        let line = line.trim();
        if line.is_empty() || line.starts_with('#') {
            continue;
        }
        let (expected, args) = line.split_once(" | ").expect("EXPECTED | ARGS");
        let args: Vec<&str> = args.split_whitespace().collect();
        count += 1;
        if let Err(why) = check(scratch.path(), expected.trim(), &args) {
            failures.push(format!("lobecast {}: {why}", args.join(" ")));
        }
    }
    assert!(count >= 30, "the corpus holds {count} cases");
    assert!(failures.is_empty(), "{}", failures.join("\n"));
}
