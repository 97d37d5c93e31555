//! Figure benchmarks, printed as medians (run with `cargo bench --bench figures`):
//! a 1000×1000 slice of an orbital over 36 basis functions, four 600×600 panels,
//! full slice figures (evaluation, colours, contours, text, PNG encoding) and a
//! profile with its chart. Shared machines are noisy: quote medians.

use std::time::Instant;

use lobecast::basis::{Basis, Shell, SlaterShell};
use lobecast::chem::{Atom, Molecule, elements::by_symbol};
use lobecast::field::{Field, FieldSampler};
use lobecast::grid::plane::{PixelGrid, PlaneSpec, Window};
use lobecast::render::slice::{Figure, Panel, Style, render};
use lobecast::solve::{Orbital, OrbitalSet};

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

/// 36 hydrogen-like 1s functions on a 6 × 6 square lattice (1.4 bohr apart) in the
/// xy plane, with four orbitals of alternating-sign coefficients.
fn lattice() -> OrbitalSet {
    let h = by_symbol("H").unwrap();
    let atoms: Vec<Atom> = (0..36)
        .map(|i| Atom {
            element: h,
            position: [1.4 * (i % 6) as f64 - 3.5, 1.4 * (i / 6) as f64 - 3.5, 0.0],
        })
        .collect();
    let functions = atoms
        .iter()
        .enumerate()
        .map(|(i, a)| Shell::Slater(SlaterShell::s1(i, a.position, 1.2).unwrap()))
        .collect();
    let orbitals = (0..4)
        .map(|k| Orbital {
            energy: -0.5 + 0.1 * k as f64,
            occupation: if k == 0 { 2.0 } else { 0.0 },
            coefficients: (0..36)
                .map(|i| {
                    if (i + k * (i / 6)) % 2 == 0 {
                        0.17
                    } else {
                        -0.17
                    }
                })
                .collect(),
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
    }
}

fn main() {
    let set = lattice();
    let plane = PlaneSpec::parse("xy@0.5", lobecast::chem::LengthUnit::Bohr)
        .unwrap()
        .resolve(&set.molecule, None)
        .unwrap();
    let window = Window::centred([0.0, 0.0], 14.0, 14.0);
    println!(
        "{} basis functions, {} threads",
        set.basis.len(),
        rayon::current_num_threads()
    );

    let one = FieldSampler::new(&set, &[Field::parse("orbital:1").unwrap()]).unwrap();
    let grid = PixelGrid {
        plane: plane.clone(),
        window,
        nx: 1000,
        ny: 1000,
    };
    let t = time(7, || {
        std::hint::black_box(grid.sample(1, |p, v| one.evaluate(p, v)));
    });
    println!(
        "slice 1000×1000, 1 field: median {:.3} s = {:.2} million pixels/s",
        t,
        1e-6 * 1e6 / t
    );

    let fields: Vec<Field> = ["orbital:1", "orbital:2", "orbital:3", "orbital:4"]
        .iter()
        .map(|f| Field::parse(f).unwrap())
        .collect();
    let four = FieldSampler::new(&set, &fields).unwrap();
    let grid = PixelGrid {
        nx: 600,
        ny: 600,
        ..grid
    };
    let t = time(7, || {
        std::hint::black_box(grid.sample(4, |p, v| four.evaluate(p, v)));
    });
    println!(
        "panels 4 × 600×600 (evaluated together): median {:.3} s = {:.2} million panel pixels/s",
        t,
        4.0 * 0.36 / t
    );

    for (width, n) in [(1000u32, 1usize), (1400, 4)] {
        let figure = Figure {
            title: "benchmark".into(),
            footnotes: vec!["note".into()],
            plane: plane.clone(),
            window,
            nuclei: Vec::new(),
            gap_note: String::new(),
            panels: (0..n)
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
        let style = Style {
            width,
            ..Style::default()
        };
        let sampler = FieldSampler::new(&set, &fields[..n]).unwrap();
        let mut pixels = 0;
        let t = time(5, || {
            let r = render(&figure, &style, |g| {
                let all = g.sample(n, |p, v| sampler.evaluate(p, v));
                (0..n)
                    .map(|k| all.iter().skip(k).step_by(n).copied().collect())
                    .collect()
            })
            .unwrap();
            pixels = r.grid.nx * r.grid.ny * n;
            std::hint::black_box(r.canvas.encode_png().unwrap());
        });
        println!(
            "whole figure {width} px wide, {n} map(s) of {pixels} sampled pixels in all, 4 contour levels per sign, PNG encoded: median {t:.3} s"
        );
    }

    let line = lobecast::grid::line::Line::new([-4.0, -4.0, 0.0], [4.0, 4.0, 0.0], 1.0).unwrap();
    let s = line.distances(100_000);
    let points: Vec<[f64; 3]> = s.iter().map(|&d| line.point(d)).collect();
    let mut v = vec![0.0; points.len()];
    let t = time(7, || one.evaluate(&points, &mut v));
    println!(
        "profile 100000 points, 1 field (one thread): median {:.4} s = {:.2} million points/s",
        t,
        0.1 / t
    );
}
