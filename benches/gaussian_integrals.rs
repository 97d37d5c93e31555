//! Medians of the one-electron integral engine on one thread (run with `cargo bench`):
//! every shell pair of a benzene-shaped, STO-3G-sized set (6 × {s, s, p} + 6 × s,
//! 36 functions, 12 nuclei, three primitives per shell), and of a set of d and f
//! shells. Exponents are representative, not a published basis.

use std::hint::black_box;
use std::time::Instant;

use lobecast::integrals::gaussian::{CartesianShell, kinetic_block, nuclear_block, overlap_block};

const EXP: [f64; 3] = [3.0, 0.6, 0.17];
const COEF: [f64; 3] = [0.15, 0.53, 0.44];

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

fn run(name: &str, shells: &[CartesianShell], nuclei: &[(f64, [f64; 3])]) {
    let functions: usize = shells
        .iter()
        .map(|s| ((s.l + 1) * (s.l + 2) / 2) as usize)
        .sum();
    let pairs = shells.len() * (shells.len() + 1) / 2;
    let each = |f: &dyn Fn(&CartesianShell, &CartesianShell) -> Vec<f64>| {
        time(21, || {
            for (i, a) in shells.iter().enumerate() {
                for b in &shells[..=i] {
                    black_box(f(a, b));
                }
            }
        })
    };
    let s = each(&|a, b| overlap_block(a, b));
    let t = each(&|a, b| kinetic_block(a, b));
    let v = each(&|a, b| nuclear_block(a, b, nuclei));
    println!(
        "{name}: {functions} functions, {pairs} shell pairs, {} nuclei: overlap {:.3} ms, \
         kinetic {:.3} ms, nuclear {:.3} ms (medians of 21)",
        nuclei.len(),
        s * 1e3,
        t * 1e3,
        v * 1e3
    );
}

fn main() {
    let ring = |k: usize, r: f64| {
        let phi = k as f64 * std::f64::consts::PI / 3.0;
        [r * phi.cos(), r * phi.sin(), 0.0]
    };
    let carbons: Vec<_> = (0..6).map(|k| ring(k, 2.64)).collect();
    let hydrogens: Vec<_> = (0..6).map(|k| ring(k, 4.69)).collect();
    let shell = |l, center| CartesianShell {
        l,
        center,
        exponents: &EXP,
        coefficients: &COEF,
    };
    let mut shells = Vec::new();
    for &c in &carbons {
        shells.extend([shell(0, c), shell(0, c), shell(1, c)]);
    }
    shells.extend(hydrogens.iter().map(|&h| shell(0, h)));
    let nuclei: Vec<_> = carbons
        .iter()
        .map(|&c| (6.0, c))
        .chain(hydrogens.iter().map(|&h| (1.0, h)))
        .collect();
    run("benzene-sized s/p set", &shells, &nuclei);

    let heavy: Vec<_> = carbons
        .iter()
        .flat_map(|&c| [shell(2, c), shell(3, c)])
        .collect();
    run("d/f set on the ring", &heavy, &nuclei);
}
