//! Electron-repulsion throughput on benzene (`cargo bench --bench eri`): the in-core
//! build (unique integrals per second, median of 3), one J/K from the store, and the
//! direct builder's setup and one J/K, each for two basis sets:
//!
//! * `sto-3g+d`: STO-3G plus one Cartesian d shell (α = 0.8) per carbon, 72
//!   functions;
//! * `6-31g*`: the named set (basis-set-exchange data), Cartesian d, 102 functions.
//!
//! Geometry: examples/benzene.xyz (Gauss & Stanton, J. Phys. Chem. A 104, 2865
//! (2000); from memory). The density is a random symmetric matrix, so density
//! screening removes nothing: the direct timing is the worst case of an SCF step.

use std::time::Instant;

use lobecast::basis::{Basis, BasisSpec, GaussianShell, Shell};
use lobecast::chem::{LengthUnit, Molecule};
use lobecast::integrals::two_electron::{DirectJk, PackedEri, TwoElectron};
use lobecast::io::xyz::parse_xyz;
use nalgebra::DMatrix;

const THRESHOLD: f64 = 1e-12;

fn benzene() -> Molecule {
    let f = parse_xyz(
        include_str!("../examples/benzene.xyz"),
        "benzene.xyz",
        LengthUnit::Angstrom,
    )
    .unwrap();
    Molecule::new(f.atoms, 0).unwrap()
}

fn with_carbon_d(m: &Molecule, mut basis: Basis) -> Basis {
    for (i, a) in m.atoms.iter().enumerate() {
        if a.element.symbol == "C" {
            let d = GaussianShell::full(i, a.position, 2, vec![(0.8, 1.0)], false).unwrap();
            basis.shells.push(Shell::Gaussian(d));
        }
    }
    basis
}

fn median3(mut f: impl FnMut() -> f64) -> f64 {
    let mut t = [f(), f(), f()];
    t.sort_by(f64::total_cmp);
    t[1]
}

fn seconds(f: impl FnOnce()) -> f64 {
    let t = Instant::now();
    f();
    t.elapsed().as_secs_f64()
}

fn random_symmetric(n: usize) -> DMatrix<f64> {
    let mut s = 12345u64;
    let mut m = DMatrix::zeros(n, n);
    for i in 0..n {
        for j in 0..=i {
            s = s
                .wrapping_mul(6364136223846793005)
                .wrapping_add(1442695040888963407);
            let v = 0.2 * ((s >> 11) as f64 / (1u64 << 53) as f64 - 0.5);
            m[(i, j)] = v;
            m[(j, i)] = v;
        }
    }
    m
}

fn main() {
    let m = benzene();
    println!(
        "threads: {}, Schwarz threshold {THRESHOLD:e}",
        rayon::current_num_threads()
    );
    let sets = [
        (
            "sto-3g+d",
            with_carbon_d(&m, BasisSpec::named("sto-3g").build(&m).unwrap()),
        ),
        ("6-31g*", BasisSpec::named("6-31g*").build(&m).unwrap()),
    ];
    for (name, basis) in sets {
        let n = basis.len();
        let mut store = None;
        let build = median3(|| {
            let t = Instant::now();
            store = Some(PackedEri::build(&basis, THRESHOLD, &mut |_| {}).unwrap());
            t.elapsed().as_secs_f64()
        });
        let eri = store.unwrap();
        let d = random_symmetric(n);
        let packed_jk = median3(|| seconds(|| drop(eri.jk(&[&d]))));
        let mut direct = None;
        let setup =
            median3(|| seconds(|| direct = Some(DirectJk::new(&basis, THRESHOLD).unwrap())));
        let direct = direct.unwrap();
        let direct_jk = median3(|| seconds(|| drop(direct.jk(&[&d]))));
        println!(
            "{name}: {n} functions, {} shells; {}\n  in-core build {build:.3} s = {:.2} M unique integrals/s; J/K from store {:.1} ms\n  direct: setup {:.1} ms, one J/K {:.3} s",
            basis.shells.len(),
            eri.describe(),
            eri.len() as f64 / build / 1e6,
            packed_jk * 1e3,
            setup * 1e3,
            direct_jk,
        );
    }
}
