//! Figures (`cargo bench --bench figures`) of four orbitals of 36 hydrogen-like 1s
//! functions on a 6 × 6 lattice, in the plane z = 0.5 bohr:
//! * `slice_1000`: a 1000×1000 slice of one orbital (throughput: pixels per second);
//! * `panels_4x600`: four 600×600 panels evaluated together (panel pixels per second);
//! * `whole_figure`: the full slice figure (evaluation, colours, 4 contour levels per
//!   sign, text, PNG encoding), 1000 px wide with 1 map and 1400 px wide with 4;
//! * `profile_100k`: a profile line of 100 000 points of one orbital, one thread.
//!
//! Compare the throughput of `slice_1000` with that of `panels_4x600`, and
//! `whole_figure` with the evaluation alone, in divan's table (medians; the machine
//! is shared, quote ratios).

use std::sync::LazyLock;

use divan::Bencher;
use divan::counter::ItemsCount;
use lobecast::basis::{Basis, Shell, SlaterShell};
use lobecast::chem::{Atom, LengthUnit, Molecule, elements::by_symbol};
use lobecast::field::{Field, FieldSampler};
use lobecast::grid::plane::{PixelGrid, Plane, PlaneSpec, Window};
use lobecast::render::slice::{Figure, Panel, Style, render};
use lobecast::solve::{Orbital, OrbitalSet};

/// 36 hydrogen-like 1s functions on a 6 × 6 square lattice (1.4 bohr apart) in the
/// xy plane, with four orbitals of alternating-sign coefficients.
static LATTICE: LazyLock<OrbitalSet> = LazyLock::new(|| {
    let h = by_symbol("H").unwrap();
    let atoms: Vec<Atom> = (0..36)
        .map(|i| Atom {
            element: h,
            position: [1.4 * (i % 6) as f64 - 3.5, 1.4 * (i / 6) as f64 - 3.5, 0.0],
        })
        .collect();
    let functions = (atoms.iter().enumerate())
        .map(|(i, a)| Shell::Slater(SlaterShell::s1(i, a.position, 1.2).unwrap()))
        .collect();
    let sign = |i: usize, k: usize| {
        if (i + k * (i / 6)) % 2 == 0 {
            0.17
        } else {
            -0.17
        }
    };
    let orbitals = (0..4)
        .map(|k| Orbital {
            energy: -0.5 + 0.1 * k as f64,
            occupation: if k == 0 { 2.0 } else { 0.0 },
            coefficients: (0..36).map(|i| sign(i, k)).collect(),
        })
        .collect();
    OrbitalSet {
        molecule: Molecule::new(atoms, 0).unwrap(),
        basis: Basis {
            name: "slater-1s".into(),
            shells: functions,
        },
        overlap: Some(nalgebra::DMatrix::identity(36, 36)),
        orbitals,
        origin: lobecast::solve::MethodKind::File,
        method: "benchmark lattice".into(),
        caveats: Vec::new(),
        reference: None,
        notes: Vec::new(),
        degeneracy: lobecast::solve::degenerate::tolerance(false),
        spin: Default::default(),
    }
});

fn main() {
    divan::main();
}

/// A sampler of the first `n` orbitals.
fn sampler(n: usize) -> FieldSampler {
    let fields: Vec<Field> = (1..=n)
        .map(|k| Field::parse(&format!("orbital:{k}")).unwrap())
        .collect();
    FieldSampler::new(&LATTICE, &fields).unwrap()
}

/// The plane z = 0.5 bohr and a 14-bohr square window on it.
fn plane() -> (Plane, Window) {
    let spec = PlaneSpec::parse("xy@0.5", LengthUnit::Bohr).unwrap();
    let plane = spec.resolve(&LATTICE.molecule, None).unwrap();
    (plane, Window::centred([0.0, 0.0], 14.0, 14.0))
}

/// A grid of `side`² pixels over the window.
fn grid(side: usize) -> PixelGrid {
    let (plane, window) = plane();
    PixelGrid {
        plane,
        window,
        nx: side,
        ny: side,
    }
}

#[divan::bench(sample_count = 7, sample_size = 1)]
fn slice_1000(bencher: Bencher) {
    let (one, grid) = (sampler(1), grid(1000));
    bencher
        .counter(ItemsCount::new(1000 * 1000usize))
        .bench(|| grid.sample(1, |p, v| one.evaluate(p, v)));
}

#[divan::bench(sample_count = 7, sample_size = 1)]
fn panels_4x600(bencher: Bencher) {
    let (four, grid) = (sampler(4), grid(600));
    bencher
        .counter(ItemsCount::new(4 * 600 * 600usize))
        .bench(|| grid.sample(4, |p, v| four.evaluate(p, v)));
}

/// The whole figure of `maps` maps: 1000 px wide for one map, 1400 px for four.
#[divan::bench(args = [1, 4], sample_count = 5, sample_size = 1)]
fn whole_figure(bencher: Bencher, maps: usize) {
    let (plane, window) = plane();
    let figure = Figure {
        title: "benchmark".into(),
        footnotes: vec!["note".into()],
        plane,
        window,
        nuclei: Vec::new(),
        gap_note: String::new(),
        panels: (0..maps)
            .map(|_| Panel {
                heading: "ψ".into(),
                quantity: "ψ".into(),
                family: "ψ".into(),
                unit: "bohr^{−3/2}".into(),
                signed: true,
                largest: None,
            })
            .collect(),
    };
    let width = if maps == 1 { 1000 } else { 1400 };
    let style = Style {
        width,
        ..Style::default()
    };
    let sampler = sampler(maps);
    bencher.bench(|| {
        let r = render(&figure, &style, |g| {
            let all = g.sample(maps, |p, v| sampler.evaluate(p, v));
            (0..maps)
                .map(|k| all.iter().skip(k).step_by(maps).copied().collect())
                .collect()
        })
        .unwrap();
        r.canvas
            .encode_png(&lobecast::io::png::PngMeta::default())
            .unwrap()
    });
}

#[divan::bench(sample_count = 7, sample_size = 1)]
fn profile_100k(bencher: Bencher) {
    let one = sampler(1);
    let line = lobecast::grid::line::Line::new([-4.0, -4.0, 0.0], [4.0, 4.0, 0.0], 1.0).unwrap();
    let points: Vec<[f64; 3]> = (line.distances(100_000).iter())
        .map(|&d| line.point(d))
        .collect();
    let mut v = vec![0.0; points.len()];
    bencher
        .counter(ItemsCount::new(points.len()))
        .bench_local(|| one.evaluate(&points, &mut v));
}
