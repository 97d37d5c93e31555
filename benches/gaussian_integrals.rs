//! The one-electron integral engine on one thread (`cargo bench --bench
//! gaussian_integrals`): overlap, kinetic and nuclear-attraction blocks of every shell
//! pair of two sets, each time for the whole set:
//! * `sp`: a benzene-shaped, STO-3G-sized set (6 × {s, s, p} + 6 × s, 36 functions,
//!   12 nuclei, three primitives per shell);
//! * `df`: a d and an f shell on each of the six carbons, the same 12 nuclei.
//!
//! Exponents are representative, not a published basis. Compare `overlap`, `kinetic`
//! and `nuclear` of the same set in divan's table (medians).

use divan::Bencher;
use lobecast::integrals::gaussian::{CartesianShell, kinetic_block, nuclear_block, overlap_block};

const EXP: [f64; 3] = [3.0, 0.6, 0.17];
const COEF: [f64; 3] = [0.15, 0.53, 0.44];
const SETS: [&str; 2] = ["sp", "df"];

fn ring(k: usize, r: f64) -> [f64; 3] {
    let phi = k as f64 * std::f64::consts::PI / 3.0;
    [r * phi.cos(), r * phi.sin(), 0.0]
}

/// Six carbons (at 2.64 bohr) and six hydrogens (at 4.69 bohr) on a ring.
fn nuclei() -> Vec<(f64, [f64; 3])> {
    let carbons = (0..6).map(|k| (6.0, ring(k, 2.64)));
    carbons
        .chain((0..6).map(|k| (1.0, ring(k, 4.69))))
        .collect()
}

/// The shells of the set `sp` or `df` (see the top of the file).
fn shells(set: &str) -> Vec<CartesianShell<'static>> {
    let shell = |l, (_, center): (f64, [f64; 3])| CartesianShell {
        l,
        center,
        exponents: &EXP,
        coefficients: &COEF,
    };
    let nuclei = nuclei();
    let (carbons, hydrogens) = nuclei.split_at(6);
    let ls: &[u32] = if set == "sp" { &[0, 0, 1] } else { &[2, 3] };
    let on_carbons = carbons
        .iter()
        .flat_map(|&c| ls.iter().map(move |&l| shell(l, c)));
    let on_hydrogens = hydrogens.iter().map(|&h| shell(0, h));
    if set == "sp" {
        on_carbons.chain(on_hydrogens).collect()
    } else {
        on_carbons.collect()
    }
}

fn main() {
    divan::main();
}

/// Runs `block` over every shell pair (a, b ≤ a) of the named set.
fn pairs(
    bencher: Bencher,
    set: &str,
    block: impl Fn(&CartesianShell, &CartesianShell) -> Vec<f64>,
) {
    let shells = shells(set);
    bencher.bench_local(|| {
        for (i, a) in shells.iter().enumerate() {
            for b in &shells[..=i] {
                divan::black_box(block(a, b));
            }
        }
    });
}

#[divan::bench(args = SETS)]
fn overlap(bencher: Bencher, set: &str) {
    pairs(bencher, set, overlap_block);
}

#[divan::bench(args = SETS)]
fn kinetic(bencher: Bencher, set: &str) {
    pairs(bencher, set, kinetic_block);
}

#[divan::bench(args = SETS)]
fn nuclear(bencher: Bencher, set: &str) {
    let nuclei = nuclei();
    pairs(bencher, set, |a, b| nuclear_block(a, b, &nuclei));
}
