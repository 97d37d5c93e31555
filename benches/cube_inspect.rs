//! Benchmark of reading cube files (run with `cargo bench --bench cube_inspect`):
//! `inspect`'s work on a 200³ single-field cube — one streaming pass of parsing
//! alone, and the full statistics with the enclosed-fraction isovalue (two passes) —
//! as medians of 5 runs, in MB of text per second. Peak memory is measured outside,
//! with `/usr/bin/time -v lobecast inspect FILE` (see DEVELOPERS.md).

use std::io::BufWriter;
use std::time::Instant;

use lobecast::grid::GridBox;
use lobecast::io::cube::stats::summarize;
use lobecast::io::cube::{CubeAtom, CubeHeader, CubeReader, write_streaming};

fn median(mut v: Vec<f64>) -> f64 {
    v.sort_by(f64::total_cmp);
    v[v.len() / 2]
}

fn time<F: FnMut()>(runs: usize, mut f: F) -> f64 {
    median(
        (0..runs)
            .map(|_| {
                let t = Instant::now();
                f();
                t.elapsed().as_secs_f64()
            })
            .collect(),
    )
}

fn main() {
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
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("bench.cube");
    {
        let mut w = BufWriter::with_capacity(1 << 20, std::fs::File::create(&path).unwrap());
        let eval = |s: &lobecast::grid::Slab, v: &mut [f64]| {
            let p = s.points;
            for (x, y) in p.iter().zip(v) {
                let r = (x[0] * x[0] + x[1] * x[1] + x[2] * x[2]).sqrt();
                *y = (-2.0 * r).exp() / std::f64::consts::PI;
            }
        };
        write_streaming(&header, eval, &mut w, &|_| {}).unwrap();
    }
    let mb = std::fs::metadata(&path).unwrap().len() as f64 / 1e6;
    println!("cube 200×200×200, one field: {mb:.1} MB of text");

    let parse = time(5, || {
        let mut r = CubeReader::open(&path).unwrap();
        let mut buf = vec![0.0; 65_536];
        let mut s = 0.0;
        loop {
            let n = r.read_values(&mut buf).unwrap();
            if n == 0 {
                break;
            }
            s += buf[..n].iter().sum::<f64>();
        }
        std::hint::black_box(s);
    });
    println!(
        "one pass, parsing only: median {parse:.3} s, {:.0} MB/s",
        mb / parse
    );
    let open = || CubeReader::open(&path);
    let full = time(5, || {
        std::hint::black_box(summarize(&open, 0.9, None).unwrap());
    });
    println!(
        "inspect (statistics + 90 % isovalue, two passes): median {full:.3} s, {:.0} MB/s of file",
        mb / full
    );
}
