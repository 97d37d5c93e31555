//! Benchmark (run with `cargo bench --bench gaussian_grid`): one orbital of 36
//! contracted Gaussian functions (benzene in STO-3G) on a 128³ grid, separable
//! lattice evaluation against direct point-by-point evaluation, on one and on all
//! threads. Prints medians; quote ratios, the machine is shared.

use std::path::Path;
use std::time::Instant;

use lobecast::field::{Field, FieldSampler};
use lobecast::grid::{GridBox, stream_slabs};
use lobecast::solve::{Orbital, OrbitalSet};

/// Benzene, D6h, r(C–C) = 1.3915 Å and r(C–H) = 1.0800 Å (semi-experimental
/// equilibrium structure, J. Gauss and J. F. Stanton, J. Phys. Chem. A 104, 2865
/// (2000); from memory). Geometry only: the orbital coefficients are arbitrary, since
/// only the speed is measured.
fn benzene() -> String {
    let mut atoms = Vec::new();
    for k in 0..6 {
        let a = std::f64::consts::PI / 3.0 * k as f64;
        atoms.push(format!(
            "{{ element = \"C\", position = [{}, {}, 0.0] }}",
            1.3915 * a.cos(),
            1.3915 * a.sin()
        ));
        atoms.push(format!(
            "{{ element = \"H\", position = [{}, {}, 0.0] }}",
            2.4715 * a.cos(),
            2.4715 * a.sin()
        ));
    }
    format!(
        "[molecule]\natoms = [{}]\n[basis]\nset = \"sto-3g\"\n",
        atoms.join(", ")
    )
}

fn median(mut v: Vec<f64>) -> f64 {
    v.sort_by(f64::total_cmp);
    v[v.len() / 2]
}

fn run(grid: &GridBox, eval: &(dyn Fn(&lobecast::grid::Slab, &mut [f64]) + Sync)) -> f64 {
    median(
        (0..3)
            .map(|_| {
                let t = Instant::now();
                let mut sum = 0.0;
                stream_slabs(
                    grid,
                    1,
                    eval,
                    |v| v.iter().sum::<f64>(),
                    |s| {
                        sum += s;
                        Ok(())
                    },
                )
                .unwrap();
                std::hint::black_box(sum);
                t.elapsed().as_secs_f64()
            })
            .collect(),
    )
}

fn main() {
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
        notes: vec![],
    };
    let sampler = FieldSampler::new(&set, &[Field::parse("orbital:1").unwrap()]).unwrap();
    // A 128³ box, 16 bohr on a side, around the ring.
    let h = 16.0 / 127.0;
    let grid = GridBox {
        origin: [-8.0; 3],
        axes: [[h, 0.0, 0.0], [0.0, h, 0.0], [0.0, 0.0, h]],
        counts: [128; 3],
    };
    let n = grid.point_count() as f64;
    println!(
        "benzene STO-3G: {nbf} functions, grid {:?} = {n} points",
        grid.counts
    );
    for threads in [1, rayon::current_num_threads()] {
        let pool = rayon::ThreadPoolBuilder::new()
            .num_threads(threads)
            .build()
            .unwrap();
        let (sep, direct) = pool.install(|| {
            (
                run(&grid, &|s, v| sampler.evaluate_slab(s, v)),
                run(&grid, &|s, v| sampler.evaluate(s.points, v)),
            )
        });
        println!(
            "{threads} thread(s): separable {sep:.3} s ({:.0} M point·functions/s), direct {direct:.3} s ({:.0} M point·functions/s), ratio {:.1}×",
            n * nbf as f64 / sep / 1e6,
            n * nbf as f64 / direct / 1e6,
            direct / sep
        );
    }
}
