//! Memory and work budgets of `slice` and `profile`: a cube keeps only the stored
//! fields drawn, a cube or figure over `--memory` is refused before anything large is
//! allocated (exit 2, one `error:` line naming the estimate and the budget, a true
//! hint, no file), and a figure over the fixed work limit is refused at once.

mod common;

use std::io::Write;
use std::path::Path;
use std::process::Command;
use std::time::{Duration, Instant};

use lobecast::field::Field;
use lobecast::io::cube::{CubeReader, Volume};
use lobecast::source::Source;

use common::{assert_refused_one_hint, bin, example, run_here};

/// Writes a gzip cube of `n`³ points (0.2 bohr apart, one H atom in the middle) with
/// `fields` stored fields; field f (from 0) at point p holds `value(f, p)`.
fn write_cube(path: &Path, n: usize, fields: usize, value: impl Fn(usize, usize) -> String) {
    let file = std::fs::File::create(path).unwrap();
    let mut gz =
        flate2::write::GzEncoder::new(std::io::BufWriter::new(file), flate2::Compression::fast());
    let mid = 0.1 * (n - 1) as f64;
    let count = if fields > 1 { "-1" } else { "1" };
    write!(gz, "test cube\nbudget test\n{count} 0.0 0.0 0.0\n").unwrap();
    for d in 0..3 {
        let mut step = [0.0; 3];
        step[d] = 0.2;
        writeln!(gz, "{n} {} {} {}", step[0], step[1], step[2]).unwrap();
    }
    writeln!(gz, "1 1.0 {mid} {mid} {mid}").unwrap();
    if fields > 1 {
        let list: Vec<String> = (1..=fields).map(|f| f.to_string()).collect();
        writeln!(gz, "{fields} {}", list.join(" ")).unwrap();
    }
    let mut line = String::new();
    for p in 0..n * n * n {
        for f in 0..fields {
            line.push_str(&value(f, p));
            line.push(' ');
        }
        if line.len() > 60 {
            line.push('\n');
            gz.write_all(line.as_bytes()).unwrap();
            line.clear();
        }
    }
    line.push('\n');
    gz.write_all(line.as_bytes()).unwrap();
    gz.finish().unwrap().flush().unwrap();
}

/// 300³ points × 1 field × 8 bytes = 216 000 000 bytes, 206 MiB (arithmetic), over
/// a 64 MiB budget: refused with both figures before any value is stored.
#[test]
fn cube_over_the_budget_is_refused_with_the_estimate() {
    let dir = tempfile::tempdir().unwrap();
    let cube = dir.path().join("big.cube.gz");
    write_cube(&cube, 300, 1, |_, _| "0".into());
    let png = dir.path().join("b.png");
    let started = Instant::now();
    let o = run_here(&[
        "slice",
        cube.to_str().unwrap(),
        "--field",
        "stored:1",
        "--plane",
        "xy",
        "--png",
        png.to_str().unwrap(),
        "--memory",
        "64M",
    ]);
    let hint = assert_refused_one_hint(&o, &["206 MiB", "64 MiB", "300×300×300"]);
    assert!(hint.contains("--memory"), "{hint}");
    assert!(!png.exists());
    // Refused from the header, without reading 27 million values.
    assert!(started.elapsed() < Duration::from_secs(5));
    let csv = dir.path().join("b.csv");
    let o = run_here(&[
        "profile",
        cube.to_str().unwrap(),
        "--field",
        "stored:1",
        "--from",
        "0,0,0",
        "--to",
        "1,1,1",
        "--csv",
        csv.to_str().unwrap(),
        "--memory",
        "64M",
    ]);
    assert_refused_one_hint(&o, &["206 MiB", "64 MiB"]);
    assert!(!csv.exists());
}

/// A 3-field cube drawing field 2 holds one field: 80³ =
/// 512 000 points × 8 bytes = 4 MB for one field, 12 MB for three (arithmetic).
#[test]
fn a_multi_field_cube_keeps_only_the_field_drawn() {
    let dir = tempfile::tempdir().unwrap();
    let cube = dir.path().join("three.cube.gz");
    let n = 80;
    write_cube(&cube, n, 3, |f, p| {
        format!("{}", (f * 1000 + p % 997) as f64 * 1e-3)
    });
    let points = n * n * n;

    // Through the library: one field kept, its values the file's.
    let src = Source::load_for(
        &cube,
        &Default::default(),
        Some(&[Field::parse("stored:2").unwrap()]),
        5 << 20,
    )
    .unwrap();
    let Source::Volume { volume, .. } = &src else {
        panic!("a cube gives a volume source")
    };
    assert_eq!(volume.kept, [1]);
    assert_eq!(volume.values.len(), points);
    assert_eq!(volume.held_bytes(), points * 8);
    let p = (3 * n + 7) * n + 11;
    assert_eq!(volume.at(1, 3, 7, 11), (1000 + p % 997) as f64 * 1e-3);
    // All three fields do not fit in the same budget.
    let all = Volume::keeping(CubeReader::open(&cube).unwrap(), &[0, 1, 2], 5 << 20);
    let e = all.unwrap_err();
    assert!(
        e.message.contains("3 of 3 stored field(s)"),
        "{}",
        e.message
    );

    // Through the command: a budget just above one field's need suffices.
    let csv = dir.path().join("p.csv");
    let o = run_here(&[
        "profile",
        cube.to_str().unwrap(),
        "--field",
        "stored:2",
        "--from",
        "0.5,0.5,0.5",
        "--to",
        "7,7,7",
        "--units",
        "bohr",
        "--csv",
        csv.to_str().unwrap(),
        "--memory",
        "5M",
    ]);
    assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
    assert!(csv.exists());
}

/// 16 density panels in one column at --size 10000: about 9.3e7 samples per map,
/// 16 maps, 16 bytes each (two copies), some 24 GB — refused at once, under a small
/// budget and under the default 8 GiB alike.
#[test]
fn sixteen_huge_panels_are_refused_at_once() {
    let dir = tempfile::tempdir().unwrap();
    let png = dir.path().join("x.png");
    let panels = vec!["density"; 16].join(",");
    for memory in [Some("256M"), None] {
        let benzene = example("benzene.xyz");
        let mut args = vec!["slice".to_string(), benzene.to_str().unwrap().to_string()];
        for a in [
            "--method",
            "extended-huckel",
            "--panels",
            &panels,
            "--plane",
            "xy",
            "--columns",
            "1",
            "--size",
            "10000",
            "--png",
            png.to_str().unwrap(),
        ] {
            args.push(a.to_string());
        }
        if let Some(m) = memory {
            args.push("--memory".into());
            args.push(m.into());
        }
        let started = Instant::now();
        let o = Command::new(bin()).args(&args).output().unwrap();
        let budget = if memory.is_some() {
            "256 MiB"
        } else {
            "8.0 GiB"
        };
        let hint = assert_refused_one_hint(&o, &["16 map(s)", "GiB of memory", budget]);
        assert!(
            hint.contains("--memory") && hint.contains("more --columns"),
            "{hint}"
        );
        // 10000 is the largest --size: the hint may only suggest a smaller one.
        assert!(!hint.contains("raise --size"), "{hint}");
        assert!(started.elapsed() < Duration::from_secs(10));
        assert!(!png.exists());
    }
}

/// 100 carbon atoms (400 valence functions, 200 occupied orbitals): a density map at
/// --size 10000 is about 9e7 samples × 8e4 operations, some 7e12, over the fixed
/// limit of 1e12 while well inside the memory budget.
#[test]
fn work_over_the_limit_is_refused() {
    let dir = tempfile::tempdir().unwrap();
    let xyz = dir.path().join("c100.xyz");
    let mut text = String::from("100\nlattice\n");
    for i in 0..5 {
        for j in 0..5 {
            for k in 0..4 {
                text += &format!(
                    "C {:.2} {:.2} {:.2}\n",
                    1.5 * i as f64,
                    1.5 * j as f64,
                    1.5 * k as f64
                );
            }
        }
    }
    std::fs::write(&xyz, text).unwrap();
    let png = dir.path().join("w.png");
    let started = Instant::now();
    let o = run_here(&[
        "slice",
        xyz.to_str().unwrap(),
        "--method",
        "extended-huckel",
        "--field",
        "density",
        "--plane",
        "xy",
        "--size",
        "10000",
        "--png",
        png.to_str().unwrap(),
    ]);
    let hint = assert_refused_one_hint(&o, &["operations", "over the limit of 1e12"]);
    assert!(hint.contains("a smaller --size"), "{hint}");
    assert!(started.elapsed() < Duration::from_secs(30));
    assert!(!png.exists());
}

/// Under a process memory limit below what the budget allows, the reservation of the
/// cube's values fails and is reported as an error, not an abort.
#[test]
#[cfg(target_os = "linux")]
fn an_allocation_the_system_refuses_is_an_error() {
    let dir = tempfile::tempdir().unwrap();
    let cube = dir.path().join("big.cube.gz");
    write_cube(&cube, 300, 1, |_, _| "0".into());
    let png = dir.path().join("b.png");
    let script = format!(
        "ulimit -v 200000; exec '{}' slice '{}' --field stored:1 --plane xy --png '{}'",
        bin().display(),
        cube.display(),
        png.display()
    );
    let o = Command::new("sh").arg("-c").arg(&script).output().unwrap();
    let hint = assert_refused_one_hint(&o, &["206 MiB", "system refused"]);
    assert!(hint.contains("ulimit"), "{hint}");
    assert!(!png.exists());
}
