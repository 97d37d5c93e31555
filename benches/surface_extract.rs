//! Isosurface extraction and exact placement on a 200³ box (`cargo bench --bench
//! surface_extract`). The field is a 2p-like z·e^(−r) on a 20-bohr cube, the level
//! 0.02; `tools/bench_marching_cubes.py` runs scikit-image's marching cubes on the
//! same values. Compare medians of the items/s column (voxels per second); the
//! machine is shared, so quote ratios.

use std::sync::LazyLock;

use divan::Bencher;
use divan::counter::ItemsCount;
use lobecast::surface::Phase;
use lobecast::surface::extract::{Extraction, Lattice, extract};
use lobecast::surface::place::{ExactField, place_exactly};

const N: usize = 200;
const HALF: f64 = 10.0;
const LEVEL: f64 = 0.02;

fn p_orbital(p: [f64; 3]) -> f64 {
    p[2] * (-(p[0] * p[0] + p[1] * p[1] + p[2] * p[2]).sqrt()).exp()
}

fn spacing() -> f64 {
    2.0 * HALF / (N - 1) as f64
}

/// The sampled values, i slowest and k fastest.
static VALUES: LazyLock<Vec<f64>> = LazyLock::new(|| {
    let (h, mut v) = (spacing(), Vec::with_capacity(N * N * N));
    for i in 0..N {
        for j in 0..N {
            for k in 0..N {
                v.push(p_orbital([i, j, k].map(|x| -HALF + x as f64 * h)));
            }
        }
    }
    v
});

fn lattice() -> Lattice<'static> {
    let h = spacing();
    Lattice {
        origin: [-HALF; 3],
        axes: [[h, 0.0, 0.0], [0.0, h, 0.0], [0.0, 0.0, h]],
        counts: [N; 3],
        values: &VALUES,
    }
}

static EXTRACTED: LazyLock<Extraction> =
    LazyLock::new(|| extract(&lattice(), LEVEL, Phase::Positive).unwrap());

struct Analytic;

impl ExactField for Analytic {
    fn values(&self, points: &[[f64; 3]], out: &mut [f64]) {
        for (o, p) in out.iter_mut().zip(points) {
            *o = p_orbital(*p);
        }
    }
}

fn main() {
    let ex = &*EXTRACTED;
    println!(
        "{N}³ voxels, level {LEVEL}: {} vertices, {} triangles",
        ex.mesh.positions.len(),
        ex.mesh.triangles.len()
    );
    divan::main();
}

#[divan::bench(sample_count = 10, sample_size = 1)]
fn extraction(bencher: Bencher) {
    let lat = lattice();
    bencher
        .counter(ItemsCount::new((N - 1).pow(3)))
        .bench(|| extract(&lat, LEVEL, Phase::Positive).unwrap());
}

/// Per vertex: two edge ends, five trial points and six gradient probes.
#[divan::bench(sample_count = 10, sample_size = 1)]
fn placement(bencher: Bencher) {
    let ex = &*EXTRACTED;
    bencher
        .counter(ItemsCount::new(ex.mesh.positions.len()))
        .with_inputs(|| ex.clone())
        .bench_refs(|ex| place_exactly(ex, LEVEL, Phase::Positive, &Analytic));
}
