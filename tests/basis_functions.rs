//! Basis functions on their own: every Gaussian (pure and Cartesian, l ≤ 3) and every
//! Slater function (n ≤ 4, l ≤ 3) integrates to |χ|² = 1 by an independent numerical
//! quadrature, and the separable lattice evaluation of Gaussians agrees with direct
//! point-by-point evaluation to 1e-12 relative.

use std::f64::consts::PI;

use lobecast::basis::harmonics::cartesian_components;
use lobecast::basis::{Angular, GaussianShell, SlaterShell};
use lobecast::numerics::quadrature::gauss_legendre;

/// Points and weights of a product rule in spherical coordinates around the origin:
/// radial Gauss–Legendre on [0, r_max] in panels, Gauss–Legendre in cos θ, uniform φ.
fn sphere_grid(r_max: f64) -> Vec<([f64; 3], f64)> {
    let radial = gauss_legendre(40);
    let theta = gauss_legendre(16);
    let nphi = 32;
    let panels = 12;
    let mut out = Vec::new();
    for p in 0..panels {
        let (a, b) = (
            r_max * p as f64 / panels as f64,
            r_max * (p + 1) as f64 / panels as f64,
        );
        for (x, w) in &radial {
            let r = 0.5 * (b - a) * x + 0.5 * (a + b);
            let wr = 0.5 * (b - a) * w * r * r;
            for (ct, wt) in &theta {
                let st = (1.0 - ct * ct).sqrt();
                for k in 0..nphi {
                    let phi = 2.0 * PI * k as f64 / nphi as f64;
                    out.push((
                        [r * st * phi.cos(), r * st * phi.sin(), r * ct],
                        wr * wt * 2.0 * PI / nphi as f64,
                    ));
                }
            }
        }
    }
    out
}

fn norms(values: &[f64], n_fun: usize, weights: &[f64]) -> Vec<f64> {
    let np = weights.len();
    (0..n_fun)
        .map(|f| {
            (0..np)
                .map(|p| values[f * np + p].powi(2) * weights[p])
                .sum()
        })
        .collect()
}

#[test]
fn gaussian_functions_are_normalised() {
    let grid = sphere_grid(12.0);
    let (pts, w): (Vec<[f64; 3]>, Vec<f64>) = grid.into_iter().unzip();
    for l in 0..=3 {
        for pure in [true, false] {
            // Two primitives with arbitrary coefficients: the contraction is renormalised.
            let shell =
                GaussianShell::full(0, [0.0; 3], l, vec![(1.3, 0.4), (0.35, 0.7)], pure).unwrap();
            let mut v = vec![0.0; shell.len() * pts.len()];
            shell.values(&pts, &mut v);
            for (f, n) in norms(&v, shell.len(), &w).iter().enumerate() {
                assert!(
                    (n - 1.0).abs() < 1e-10,
                    "l={l} pure={pure} function {f}: ∫χ² = {n}"
                );
            }
        }
    }
}

#[test]
fn slater_functions_are_normalised() {
    let grid = sphere_grid(40.0);
    let (pts, w): (Vec<[f64; 3]>, Vec<f64>) = grid.into_iter().unzip();
    for n in 1..=4u32 {
        for l in 0..n.min(4) {
            let ms: Vec<i32> = (-(l as i32)..=l as i32).collect();
            let shell = SlaterShell::new(0, [0.0; 3], n, l, 1.7, ms).unwrap();
            let mut v = vec![0.0; shell.len() * pts.len()];
            shell.values(&pts, &mut v);
            for (f, q) in norms(&v, shell.len(), &w).iter().enumerate() {
                assert!(
                    (q - 1.0).abs() < 1e-9,
                    "n={n} l={l} function {f}: ∫χ² = {q}"
                );
            }
        }
    }
}

#[test]
fn separable_evaluation_matches_direct() {
    let ys: Vec<f64> = (0..23).map(|j| -3.0 + 0.27 * j as f64).collect();
    let zs: Vec<f64> = (0..31).map(|k| -4.0 + 0.26 * k as f64).collect();
    for l in 0..=3 {
        for pure in [true, false] {
            let shell = GaussianShell::full(
                0,
                [0.3, -0.2, 0.45],
                l,
                vec![(4.1, 0.2), (0.9, 0.5), (0.21, 0.4)],
                pure,
            )
            .unwrap();
            for x in [-2.5, 0.0, 0.3, 1.7] {
                let pts: Vec<[f64; 3]> = ys
                    .iter()
                    .flat_map(|&y| zs.iter().map(move |&z| [x, y, z]))
                    .collect();
                let mut direct = vec![0.0; shell.len() * pts.len()];
                let mut lattice = vec![1.0; shell.len() * pts.len()];
                shell.values(&pts, &mut direct);
                shell.values_lattice(x, &ys, &zs, &mut lattice);
                let max = direct.iter().fold(0.0f64, |m, v| m.max(v.abs()));
                for (d, s) in direct.iter().zip(&lattice) {
                    assert!(
                        (d - s).abs() <= 1e-12 * max,
                        "l={l} pure={pure} x={x}: {d} vs {s}"
                    );
                }
            }
        }
    }
}

#[test]
fn pure_and_cartesian_p_span_the_same_functions() {
    // README conventions: l = 1, m = −1, 0, +1 ↔ y, z, x; both kinds are normalised, so the
    // pure p functions equal the Cartesian ones in that order.
    let pure = GaussianShell::full(0, [0.0; 3], 1, vec![(0.8, 1.0)], true).unwrap();
    let cart = GaussianShell::full(0, [0.0; 3], 1, vec![(0.8, 1.0)], false).unwrap();
    assert_eq!(
        cartesian_components(1),
        vec![[1, 0, 0], [0, 1, 0], [0, 0, 1]]
    );
    assert_eq!(cart.functions[0], Angular::Cartesian([1, 0, 0]));
    let p = [[0.3, -0.7, 1.1]];
    let (mut a, mut b) = (vec![0.0; 3], vec![0.0; 3]);
    pure.values(&p, &mut a);
    cart.values(&p, &mut b);
    for (pa, cb) in [(0, 1), (1, 2), (2, 0)] {
        assert!((a[pa] - b[cb]).abs() < 1e-15);
    }
}
