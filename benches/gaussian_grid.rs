//! One orbital of 36 contracted Gaussian functions (benzene in STO-3G) on a 128³
//! grid, on one thread and on all of rayon's threads
//! (`cargo bench --bench gaussian_grid`).
//!
//! What to compare in divan's table (medians; the machine is shared, quote ratios):
//! * `direct` with `separable` at the same thread count: the speed-up of the
//!   separable lattice evaluation over point-by-point evaluation;
//! * each at 1 thread with itself at 2 (or all) threads: the parallel scaling.
//!
//! The throughput column counts point·functions (grid points × 36).
//!
//! `alkane_all_occupied` is the many-field case: every occupied extended-Hückel
//! orbital of hexadecane (98 Slater functions, 49 orbitals) plus the density, on a
//! 0.15-bohr grid through the middle of the chain; its throughput counts
//! point·functions·fields.

use std::path::Path;
use std::sync::LazyLock;

use divan::Bencher;
use divan::counter::ItemsCount;
use lobecast::field::{Field, FieldSampler};
use lobecast::grid::{GridBox, Slab, stream_slabs};
use lobecast::solve::{Orbital, OrbitalSet};

/// Benzene, D6h, r(C–C) = 1.3915 Å and r(C–H) = 1.0800 Å (semi-experimental
/// equilibrium structure, J. Gauss and J. F. Stanton, J. Phys. Chem. A 104, 2865
/// (2000); from memory). Geometry only: the orbital coefficients are arbitrary, since
/// only the speed is measured.
fn benzene() -> String {
    let atoms: Vec<String> = (0..6)
        .flat_map(|k| {
            let a = std::f64::consts::PI / 3.0 * k as f64;
            [("C", 1.3915), ("H", 2.4715)].map(|(el, r)| {
                format!(
                    "{{ element = \"{el}\", position = [{}, {}, 0.0] }}",
                    r * a.cos(),
                    r * a.sin()
                )
            })
        })
        .collect();
    format!(
        "[molecule]\natoms = [{}]\n[basis]\nset = \"sto-3g\"\n",
        atoms.join(", ")
    )
}

/// The sampler of one orbital with arbitrary coefficients, and its function count.
static SAMPLER: LazyLock<(FieldSampler, usize)> = LazyLock::new(|| {
    let model = lobecast::io::model::parse(&benzene(), Path::new("benzene.toml")).unwrap();
    let basis = model
        .basis()
        .expect("a one-electron model has its basis")
        .clone();
    let nbf = basis.len();
    let set = OrbitalSet {
        molecule: model.molecule.clone(),
        basis,
        overlap: None,
        orbitals: vec![Orbital {
            energy: 0.0,
            occupation: 2.0,
            coefficients: (0..nbf).map(|i| 0.1 + 0.01 * i as f64).collect(),
        }],
        origin: lobecast::solve::MethodKind::File,
        method: "bench".into(),
        caveats: Vec::new(),
        reference: None,
        degeneracy: lobecast::solve::degenerate::tolerance(false),
        spin: Default::default(),
        notes: vec![],
    };
    let fields = [Field::parse("orbital:1").unwrap()];
    (FieldSampler::new(&set, &fields).unwrap(), nbf)
});

/// C16H34 as an idealised zigzag chain (C–C 1.54 Å, C–H 1.09 Å, tetrahedral angles;
/// common practice), in bohr, and its extended-Hückel orbitals.
static ALKANE: LazyLock<(FieldSampler, usize)> = LazyLock::new(|| {
    const N: usize = 16;
    let b = 0.529177210903;
    let half = (109.5f64 / 2.0).to_radians();
    let (dx, dy) = (1.54 * half.sin(), 1.54 * half.cos() / 2.0);
    let mut atoms = Vec::new();
    for i in 0..N {
        let s = if i % 2 == 0 { 1.0 } else { -1.0 };
        let (x, y) = (i as f64 * dx, s * dy);
        atoms.push(("C", [x, y, 0.0]));
        atoms.push(("H", [x, y + s * 0.629, 0.89]));
        atoms.push(("H", [x, y + s * 0.629, -0.89]));
    }
    let s = if (N - 1) % 2 == 0 { 1.0 } else { -1.0 };
    atoms.push(("H", [-1.03, dy - 0.36, 0.0]));
    atoms.push(("H", [(N - 1) as f64 * dx + 1.03, s * (dy - 0.36), 0.0]));
    let atoms: Vec<(&str, [f64; 3])> = atoms
        .into_iter()
        .map(|(e, p)| (e, p.map(|v| v / b)))
        .collect();
    let m = lobecast::chem::Molecule::from_symbols(&atoms, 0).unwrap();
    let set = lobecast::solve::huckel::solve(&m, &Default::default()).unwrap();
    let occupied = set.orbitals.iter().filter(|o| o.occupation > 0.0).count();
    let mut fields: Vec<Field> = (1..=occupied)
        .map(|i| Field::parse(&format!("orbital:{i}")).unwrap())
        .collect();
    fields.push(Field::Density);
    let units = set.basis.len() * fields.len();
    (FieldSampler::new(&set, &fields).unwrap(), units)
});

fn main() {
    divan::main();
}

/// A 128³ box, 16 bohr on a side, around the ring.
fn grid() -> GridBox {
    let h = 16.0 / 127.0;
    GridBox {
        origin: [-8.0; 3],
        axes: [[h, 0.0, 0.0], [0.0, h, 0.0], [0.0, 0.0, h]],
        counts: [128; 3],
    }
}

/// 1 and all of rayon's threads (2 on the CI machines).
fn threads() -> Vec<usize> {
    let all = rayon::current_num_threads();
    if all > 1 { vec![1, all] } else { vec![1] }
}

/// Streams the grid through `eval` on a pool of `threads` threads and sums it.
fn run(bencher: Bencher, threads: usize, eval: impl Fn(&Slab, &mut [f64]) + Sync) {
    let grid = grid();
    let pool = rayon::ThreadPoolBuilder::new()
        .num_threads(threads)
        .build()
        .unwrap();
    bencher
        .counter(ItemsCount::new(grid.point_count() * SAMPLER.1))
        .bench_local(|| {
            pool.install(|| {
                let mut sum = 0.0;
                let add = |s| {
                    sum += s;
                    Ok(())
                };
                stream_slabs(&grid, 1, &eval, |v| v.iter().sum::<f64>(), add).unwrap();
                sum
            })
        });
}

#[divan::bench(args = threads(), sample_count = 3, sample_size = 1)]
fn separable(bencher: Bencher, threads: usize) {
    run(bencher, threads, |s, v| SAMPLER.0.evaluate_slab(s, v));
}

#[divan::bench(args = threads(), sample_count = 3, sample_size = 1)]
fn direct(bencher: Bencher, threads: usize) {
    // The slab's points built per slab, as the sampler built them for every slab before.
    run(bencher, threads, |s, v| {
        SAMPLER.0.evaluate(s.points(&mut Vec::new()), v)
    });
}

/// 96 × 48 × 48 points at 0.15 bohr around the middle of the chain, all threads.
#[divan::bench(sample_count = 3, sample_size = 1)]
fn alkane_all_occupied(bencher: Bencher) {
    let h = 0.15;
    let grid = GridBox {
        origin: [8.0, -3.6, -3.6],
        axes: [[h, 0.0, 0.0], [0.0, h, 0.0], [0.0, 0.0, h]],
        counts: [96, 48, 48],
    };
    let (sampler, units) = &*ALKANE;
    let nf = sampler.field_count();
    bencher
        .counter(ItemsCount::new(grid.point_count() * units))
        .bench_local(|| {
            let mut sum = 0.0;
            let add = |s| {
                sum += s;
                Ok(())
            };
            let eval = |s: &Slab, v: &mut [f64]| sampler.evaluate_slab(s, v);
            stream_slabs(&grid, nf, eval, |v| v.iter().sum::<f64>(), add).unwrap();
            sum
        });
}
