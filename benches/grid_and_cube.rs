//! Benchmarks printed as medians (run with `cargo bench`): grid evaluation of the
//! two-centre model on a 200³ box, and cube writing against a plain buffered write of
//! the same number of bytes. Shared machines are noisy, so ratios and medians are
//! what to quote.

use std::io::{BufWriter, Write};
use std::path::Path;
use std::time::Instant;

use lobecast::field::{Field, FieldSampler};
use lobecast::grid::{GridBox, stream_slabs};
use lobecast::io::cube::writer::format_slab;
use lobecast::io::cube::{CubeAtom, CubeHeader, write_streaming};

const MODEL: &str = "[molecule]\nunits = \"bohr\"\ncharge = 1\n\
    atoms = [{ element = \"H\", position = [0, 0, -1] }, { element = \"H\", position = [0, 0, 1] }]\n\
    [basis]\nset = \"slater-1s\"\n";

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
    let model = lobecast::io::model::parse(MODEL, Path::new("bench.toml")).unwrap();
    let set = model.solve().unwrap();
    let sampler = FieldSampler::new(&set, &[Field::parse("orbital:1").unwrap()]).unwrap();
    // A 200³ box of 12 bohr edges around the bond centre.
    let h = 12.0 / 199.0;
    let grid = GridBox {
        origin: [-6.0; 3],
        axes: [[h, 0.0, 0.0], [0.0, h, 0.0], [0.0, 0.0, h]],
        counts: [200; 3],
    };
    let n = grid.point_count();
    println!(
        "grid {:?} = {n} points, {} threads",
        grid.counts,
        rayon::current_num_threads()
    );

    let eval = time(5, || {
        let mut total = 0.0;
        stream_slabs(
            &grid,
            1,
            |s, v| sampler.evaluate_slab(s, v),
            |v| v.iter().sum::<f64>(),
            |s| {
                total += s;
                Ok(())
            },
        )
        .unwrap();
        std::hint::black_box(total);
    });
    println!(
        "grid evaluation (two-centre orbital): median {eval:.3} s, {:.1} M points/s",
        n as f64 / eval / 1e6
    );

    let header = CubeHeader {
        title: "bench".into(),
        comment: "bench".into(),
        atoms: set
            .molecule
            .atoms
            .iter()
            .map(|a| CubeAtom {
                atomic_number: 1,
                charge: 1.0,
                position: a.position,
            })
            .collect(),
        grid: grid.clone(),
        orbital_numbers: None,
    };
    let bytes = header.predicted_bytes() as usize;
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("bench.cube");
    let cube = time(5, || {
        let mut w = BufWriter::with_capacity(1 << 20, std::fs::File::create(&path).unwrap());
        write_streaming(&header, |s, v| sampler.evaluate_slab(s, v), &mut w, &|_| {}).unwrap();
    });
    assert_eq!(
        std::fs::metadata(&path).unwrap().len() as usize,
        bytes,
        "predicted size"
    );
    let line = [b'7'; 79];
    let plain = time(5, || {
        let mut w = BufWriter::with_capacity(1 << 20, std::fs::File::create(&path).unwrap());
        let mut left = bytes;
        while left > 0 {
            let k = left.min(line.len());
            w.write_all(&line[..k]).unwrap();
            left -= k;
        }
        w.flush().unwrap();
    });
    let mb = bytes as f64 / 1e6;
    println!(
        "cube write (evaluate + format + write, {mb:.0} MB): median {cube:.3} s, {:.0} MB/s",
        mb / cube
    );
    println!(
        "plain buffered write of the same bytes: median {plain:.3} s, {:.0} MB/s",
        mb / plain
    );
    let values: Vec<f64> = (0..n).map(|i| ((i as f64) * 1e-3).sin() * 1e-3).collect();
    let mut buf = Vec::with_capacity(bytes);
    let fmt = time(5, || {
        buf.clear();
        format_slab(&values, 200, &mut buf).expect("finite values");
        std::hint::black_box(&buf);
    });
    println!(
        "formatting alone, one thread: median {fmt:.3} s, {:.0} M values/s, {:.2} × the plain write",
        n as f64 / fmt / 1e6,
        fmt / plain
    );
    let format_only = cube - eval;
    println!(
        "formatting + writing beyond evaluation: {format_only:.3} s = {:.2} × the plain write",
        format_only / plain
    );
}
