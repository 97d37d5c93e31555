//! Grid evaluation and cube writing of the two-centre model (H2⁺, Slater 1s) on a
//! 200³ box (`cargo bench --bench grid_and_cube`).
//!
//! What to compare in divan's table (medians; the machine is shared, quote ratios):
//! * `cube_write` (evaluate + format + write) with `plain_write`, a buffered write of
//!   the same number of bytes: the throughput columns give the MB/s of each.
//! * `cube_write` − `grid_evaluation` is the cost of formatting and writing beyond
//!   evaluation; divided by `plain_write` it is the "× the plain write" figure.
//! * `format_slab` (one thread, no I/O) against `plain_write`.
//! * `cube_write_gzip` (the same through the `.gz` sink, parallel gzip members) with
//!   `cube_write`: the goal is at most 1.5× the plain cube's time.

use std::io::{BufWriter, Write};
use std::path::Path;
use std::sync::LazyLock;

use divan::Bencher;
use divan::counter::{BytesCount, ItemsCount};
use lobecast::field::{Field, FieldSampler};
use lobecast::grid::{GridBox, stream_slabs};
use lobecast::io::cube::sink::CubeSink;
use lobecast::io::cube::writer::{format_slab, format_slab_into};
use lobecast::io::cube::{CubeAtom, CubeHeader, write_streaming};

const MODEL: &str = "[molecule]\nunits = \"bohr\"\ncharge = 1\n\
    atoms = [{ element = \"H\", position = [0, 0, -1] }, { element = \"H\", position = [0, 0, 1] }]\n\
    [basis]\nset = \"slater-1s\"\n";

/// The first orbital's sampler and the cube header of a 200³ box of 12 bohr edges
/// around the bond centre.
static SETUP: LazyLock<(FieldSampler, CubeHeader)> = LazyLock::new(|| {
    let model = lobecast::io::model::parse(MODEL, Path::new("bench.toml")).unwrap();
    let set = model.solve().unwrap();
    let sampler = FieldSampler::new(&set, &[Field::parse("orbital:1").unwrap()]).unwrap();
    let h = 12.0 / 199.0;
    let header = CubeHeader {
        title: "bench".into(),
        comment: "bench".into(),
        atoms: (set.molecule.atoms.iter())
            .map(|a| CubeAtom {
                atomic_number: 1,
                charge: 1.0,
                position: a.position,
            })
            .collect(),
        grid: GridBox {
            origin: [-6.0; 3],
            axes: [[h, 0.0, 0.0], [0.0, h, 0.0], [0.0, 0.0, h]],
            counts: [200; 3],
        },
        orbital_numbers: None,
    };
    (sampler, header)
});

fn main() {
    divan::main();
}

#[divan::bench(sample_count = 5, sample_size = 1)]
fn grid_evaluation(bencher: Bencher) {
    let (sampler, header) = &*SETUP;
    let grid = &header.grid;
    bencher
        .counter(ItemsCount::new(grid.point_count()))
        .bench(|| {
            let mut total = 0.0;
            stream_slabs(
                grid,
                1,
                |s, v| sampler.evaluate_slab(s, v),
                |v| v.iter().sum::<f64>(),
                |s| {
                    total += s;
                    Ok(())
                },
            )
            .unwrap();
            total
        });
}

#[divan::bench(sample_count = 5, sample_size = 1)]
fn cube_write(bencher: Bencher) {
    let (sampler, header) = &*SETUP;
    let bytes = header.predicted_bytes();
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("bench.cube");
    bencher.counter(BytesCount::new(bytes)).bench(|| {
        let mut w = BufWriter::with_capacity(1 << 20, std::fs::File::create(&path).unwrap());
        write_streaming(header, |s, v| sampler.evaluate_slab(s, v), &mut w, &|_| {}).unwrap();
    });
    let written = std::fs::metadata(&path).unwrap().len();
    assert_eq!(written, bytes, "predicted size");
}

#[divan::bench(sample_count = 5, sample_size = 1)]
fn cube_write_gzip(bencher: Bencher) {
    let (sampler, header) = &*SETUP;
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("bench.cube.gz");
    // Counted in uncompressed bytes, to compare with `cube_write`.
    bencher
        .counter(BytesCount::new(header.predicted_bytes()))
        .bench(|| {
            let mut file = std::fs::File::create(&path).unwrap();
            let mut w = CubeSink::new(&mut file, &path);
            write_streaming(header, |s, v| sampler.evaluate_slab(s, v), &mut w, &|_| {}).unwrap();
            w.finish().unwrap();
        });
}

#[divan::bench(sample_count = 5, sample_size = 1)]
fn plain_write(bencher: Bencher) {
    let bytes = SETUP.1.predicted_bytes() as usize;
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("plain.bin");
    let line = [b'7'; 79];
    bencher.counter(BytesCount::new(bytes)).bench(|| {
        let mut w = BufWriter::with_capacity(1 << 20, std::fs::File::create(&path).unwrap());
        let mut left = bytes;
        while left > 0 {
            let k = left.min(line.len());
            w.write_all(&line[..k]).unwrap();
            left -= k;
        }
        w.flush().unwrap();
    });
}

#[divan::bench(sample_count = 5, sample_size = 1)]
fn format_slab_one_thread(bencher: Bencher) {
    let n = SETUP.1.grid.point_count();
    let values: Vec<f64> = (0..n).map(|i| ((i as f64) * 1e-3).sin() * 1e-3).collect();
    let mut buf = Vec::with_capacity(SETUP.1.predicted_bytes() as usize);
    bencher.counter(ItemsCount::new(n)).bench_local(|| {
        buf.clear();
        format_slab(&values, 200, &mut buf).expect("finite values");
        buf.len()
    });
}

/// The slot formatter the cube writer uses (fixed 13-byte slots), one thread, the
/// values of the bench's own box: ns per value is the time over the items count.
#[divan::bench(sample_count = 5, sample_size = 1)]
fn format_slab_into_one_thread(bencher: Bencher) {
    let (sampler, header) = &*SETUP;
    let n = header.grid.point_count();
    let mut values = vec![0.0; n];
    stream_slabs(
        &header.grid,
        1,
        |slab, out| sampler.evaluate_slab(slab, out),
        |v| v.to_vec(),
        {
            let mut at = 0;
            let values = &mut values;
            move |v: Vec<f64>| {
                values[at..at + v.len()].copy_from_slice(&v);
                at += v.len();
                Ok(())
            }
        },
    )
    .expect("evaluation");
    let mut buf = vec![0u8; header.predicted_bytes() as usize - header.text().len()];
    bencher.counter(ItemsCount::new(n)).bench_local(|| {
        format_slab_into(&values, 200, &mut buf).expect("finite values");
        buf.len()
    });
}
