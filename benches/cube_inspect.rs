//! Reading cube files (`cargo bench --bench cube_inspect`): `inspect`'s work on a
//! 200³ single-field cube of a hydrogen-like 1s density.
//!
//! What to compare in divan's table (medians, throughput in MB of text per second):
//! `parse_only` (one streaming pass of parsing) with `inspect` (the full statistics
//! and the 90 % enclosed-fraction isovalue, two passes). Peak memory is measured
//! outside, with `/usr/bin/time -v lobecast inspect FILE` (see DEVELOPERS.md).

use std::io::BufWriter;
use std::path::PathBuf;
use std::sync::OnceLock;

use divan::Bencher;
use divan::counter::BytesCount;
use lobecast::grid::{GridBox, Slab};
use lobecast::io::cube::stats::summarize;
use lobecast::io::cube::{CubeAtom, CubeHeader, CubeReader, write_streaming};

/// The temporary directory of the cube, written on first use, removed by `main`.
static DIR: OnceLock<tempfile::TempDir> = OnceLock::new();

fn main() {
    divan::main();
    if let Some(dir) = DIR.get() {
        std::fs::remove_dir_all(dir.path()).ok();
    }
}

/// The 200³ cube (written on first use) and its size in bytes.
fn cube() -> (PathBuf, u64) {
    let path = DIR
        .get_or_init(|| tempfile::tempdir().unwrap())
        .path()
        .join("bench.cube");
    if !path.exists() {
        let h = 12.0 / 199.0;
        let header = CubeHeader {
            title: "bench".into(),
            comment: "a hydrogen-like 1s density".into(),
            atoms: vec![CubeAtom {
                atomic_number: 1,
                charge: 1.0,
                position: [0.0; 3],
            }],
            grid: GridBox {
                origin: [-6.0; 3],
                axes: [[h, 0.0, 0.0], [0.0, h, 0.0], [0.0, 0.0, h]],
                counts: [200; 3],
            },
            orbital_numbers: None,
        };
        let density = |s: &Slab, v: &mut [f64]| {
            for (x, y) in s.points(&mut Vec::new()).iter().zip(v) {
                let r = (x[0] * x[0] + x[1] * x[1] + x[2] * x[2]).sqrt();
                *y = (-2.0 * r).exp() / std::f64::consts::PI;
            }
        };
        let mut w = BufWriter::with_capacity(1 << 20, std::fs::File::create(&path).unwrap());
        write_streaming(&header, density, &mut w, &|_| {}).unwrap();
    }
    let bytes = std::fs::metadata(&path).unwrap().len();
    (path, bytes)
}

#[divan::bench(sample_count = 5, sample_size = 1)]
fn parse_only(bencher: Bencher) {
    let (path, bytes) = cube();
    let mut buf = vec![0.0; 65_536];
    bencher.counter(BytesCount::new(bytes)).bench_local(|| {
        let mut r = CubeReader::open(&path).unwrap();
        let mut sum = 0.0;
        loop {
            let n = r.read_values(&mut buf).unwrap();
            if n == 0 {
                return sum;
            }
            sum += buf[..n].iter().sum::<f64>();
        }
    });
}

#[divan::bench(sample_count = 5, sample_size = 1)]
fn inspect(bencher: Bencher) {
    let (path, bytes) = cube();
    let open = || CubeReader::open(&path);
    bencher
        .counter(BytesCount::new(bytes))
        .bench_local(|| summarize(&open, 0.9, None).unwrap());
}
