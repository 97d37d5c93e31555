//! Electron-repulsion throughput on benzene (`cargo bench --bench eri`): the in-core
//! build (unique integrals per second, median of 3), one J/K from the store, and the
//! direct builder's setup and one J/K, each for two basis sets:
//!
//! * `sto-3g+d`: STO-3G plus one Cartesian d shell (α = 0.8) per carbon, 72
//!   functions (the brief's stand-in while no 6-31G* set is in the tree);
//! * `6-31G*-like`: the 6-31G exponents and contractions of C and H typed from
//!   memory (Hehre, Ditchfield, Pople, J. Chem. Phys. 56, 2257 (1972)) plus a
//!   Cartesian d (α = 0.8) on C, 102 functions: for timing only, not a reference.
//!
//! Geometry: examples/benzene.xyz (Gauss & Stanton, J. Phys. Chem. A 104, 2865
//! (2000); from memory). The density is a random symmetric matrix, so density
//! screening removes nothing: the direct timing is the worst case of an SCF step.

use std::collections::BTreeMap;
use std::time::Instant;

use lobecast::basis::sets::ShellSpec;
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

fn spec(l: u32, prims: &[[f64; 2]], cartesian: bool) -> ShellSpec {
    ShellSpec {
        l,
        primitives: prims.to_vec(),
        cartesian,
    }
}

/// 6-31G* shapes for C and H (numbers from memory; see the top of the file).
fn six_31g_star_like(m: &Molecule) -> Basis {
    let c_core = [
        [3047.5249, 0.0018347],
        [457.36952, 0.0140373],
        [103.94869, 0.0688426],
        [29.210155, 0.2321844],
        [9.2866630, 0.4679413],
        [3.1639270, 0.3623120],
    ];
    let c_sp_exp = [7.8682724, 1.8812885, 0.5442493];
    let c_s = [-0.1193324, -0.1608542, 1.1434564];
    let c_p = [0.0689991, 0.3164240, 0.7443083];
    let zip = |e: &[f64], c: &[f64]| -> Vec<[f64; 2]> {
        e.iter().zip(c).map(|(e, c)| [*e, *c]).collect()
    };
    let carbon = vec![
        spec(0, &c_core, false),
        spec(0, &zip(&c_sp_exp, &c_s), false),
        spec(1, &zip(&c_sp_exp, &c_p), false),
        spec(0, &[[0.1687144, 1.0]], false),
        spec(1, &[[0.1687144, 1.0]], false),
        spec(2, &[[0.8, 1.0]], true),
    ];
    let hydrogen = vec![
        spec(
            0,
            &[
                [18.731137, 0.0334946],
                [2.8253937, 0.23472695],
                [0.6401217, 0.81375733],
            ],
            false,
        ),
        spec(0, &[[0.1612778, 1.0]], false),
    ];
    let mut s = BasisSpec::named("custom");
    s.shells = BTreeMap::from([("C".to_string(), carbon), ("H".to_string(), hydrogen)]);
    s.build(m).unwrap()
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
        ("6-31G*-like", six_31g_star_like(&m)),
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
