//! Every occupied orbital and the density of a molecule of about a hundred
//! functions on a 0.15-bohr grid, evaluated without writing a file
//! (`cargo bench --bench many_fields`): benzene RHF/6-31G* (102 functions, 21
//! occupied orbitals) from `examples/benzene.xyz`, solved once, in a box padded 5
//! bohr (129 × 121 × 67 points, about what `lobecast volume --spacing 0.15 --units
//! bohr` makes).
//!
//! Throughput is counted two ways, both per second of the median:
//! * `all_occupied_and_density`: point·functions, grid points × 102 (the basis
//!   values every point needs, whatever the number of fields);
//! * the same run's point·function·orbital products are that times 21.
//!
//! `cube_text_of_the_same` is the whole `volume` job into memory (evaluation,
//! formatting, no disk): the difference is the cost of the cube text.

use std::path::Path;
use std::sync::LazyLock;

use divan::Bencher;
use divan::counter::ItemsCount;
use lobecast::field::{Field, FieldSampler};
use lobecast::grid::{GridBox, Slab, stream_slabs};
use lobecast::io::cube::{CubeHeader, write_streaming};
use lobecast::io::model::{LoadOptions, load_with};
use lobecast::solve::MethodKind;

struct Setup {
    sampler: FieldSampler,
    grid: GridBox,
    nbf: usize,
}

static SETUP: LazyLock<Setup> = LazyLock::new(|| {
    let options = LoadOptions {
        method: Some(MethodKind::Rhf),
        basis: Some("6-31g*".into()),
        ..Default::default()
    };
    let path = Path::new(env!("CARGO_MANIFEST_DIR")).join("examples/benzene.xyz");
    let set = load_with(&path, &options).unwrap().solve().unwrap();
    let occupied = set.orbitals.iter().filter(|o| o.occupation > 0.0).count();
    let mut fields: Vec<Field> = (1..=occupied)
        .map(|i| Field::parse(&format!("orbital:{i}")).unwrap())
        .collect();
    fields.push(Field::Density);
    let sampler = FieldSampler::new(&set, &fields).unwrap();
    let (lo, hi) = set.molecule.atoms.iter().fold(
        ([f64::INFINITY; 3], [f64::NEG_INFINITY; 3]),
        |(lo, hi), a| {
            (
                std::array::from_fn(|d| lo[d].min(a.position[d])),
                std::array::from_fn(|d| hi[d].max(a.position[d])),
            )
        },
    );
    let h = 0.15;
    let counts = std::array::from_fn(|d| ((hi[d] - lo[d] + 10.0) / h).floor() as usize + 1);
    let grid = GridBox {
        origin: std::array::from_fn(|d| lo[d] - 5.0),
        axes: [[h, 0.0, 0.0], [0.0, h, 0.0], [0.0, 0.0, h]],
        counts,
    };
    let nbf = set.basis.len();
    Setup { sampler, grid, nbf }
});

fn main() {
    let s = &*SETUP;
    eprintln!(
        "benzene RHF/6-31G*: {} functions, {} fields, grid {:?} ({} points)",
        s.nbf,
        s.sampler.field_count(),
        s.grid.counts,
        s.grid.point_count()
    );
    divan::main();
}

#[divan::bench(sample_count = 7, sample_size = 1)]
fn all_occupied_and_density(bencher: Bencher) {
    let s = &*SETUP;
    let nf = s.sampler.field_count();
    bencher
        .counter(ItemsCount::new(s.grid.point_count() * s.nbf))
        .bench_local(|| {
            let mut sum = 0.0;
            let eval = |slab: &Slab, v: &mut [f64]| s.sampler.evaluate_slab(slab, v);
            let add = |x| {
                sum += x;
                Ok(())
            };
            stream_slabs(&s.grid, nf, eval, |v| v.iter().sum::<f64>(), add).unwrap();
            sum
        });
}

#[divan::bench(sample_count = 7, sample_size = 1)]
fn cube_text_of_the_same(bencher: Bencher) {
    let s = &*SETUP;
    let header = CubeHeader {
        title: "bench".into(),
        comment: "bench".into(),
        atoms: Vec::new(),
        grid: s.grid.clone(),
        orbital_numbers: Some((1..=s.sampler.field_count()).collect()),
    };
    let mut out = Vec::with_capacity(header.predicted_bytes() as usize);
    bencher
        .counter(ItemsCount::new(s.grid.point_count() * s.nbf))
        .bench_local(|| {
            out.clear();
            write_streaming(
                &header,
                |sl, v| s.sampler.evaluate_slab(sl, v),
                &mut out,
                &|_| {},
            )
            .unwrap();
            out.len()
        });
}
