//! The Gaussian integral engine against independent evaluations: Gauss–Legendre
//! quadrature written here (no recurrence, no Hermite expansion, no Boys function),
//! closed forms and a published energy.

mod common;

use lobecast::integrals::boys::boys;
use lobecast::integrals::gaussian::{
    CartesianShell, cartesian_components, kinetic_block, nuclear_block, overlap_block,
};
use lobecast::numerics::quadrature::gauss_legendre;

use common::composite;

// ---------------------------------------------------------------- quadrature tools

/// Neumaier-compensated running sum, so the references carry no visible rounding.
#[derive(Default, Clone, Copy)]
struct Sum {
    s: f64,
    c: f64,
}
impl Sum {
    fn add(&mut self, x: f64) {
        let t = self.s + x;
        self.c += if self.s.abs() >= x.abs() {
            (self.s - t) + x
        } else {
            (x - t) + self.s
        };
        self.s = t;
    }
    fn value(self) -> f64 {
        self.s + self.c
    }
}

// ---------------------------------------------------------------- Boys function

/// ∫₀¹ t^(2n) e^(−T t²) dt for n = 0..=nmax by composite Gauss–Legendre, panels no
/// wider than 1/√T so the peak near t ~ √(n/T) is resolved (common practice).
fn boys_reference(t: f64, nmax: usize, rule: &[(f64, f64)]) -> Vec<f64> {
    let panels = t.sqrt().ceil().max(1.0) as usize;
    let mut sums = vec![Sum::default(); nmax + 1];
    for (x, w) in composite(rule, 0.0, 1.0, panels) {
        let mut f = w * (-t * x * x).exp();
        for s in sums.iter_mut() {
            s.add(f);
            f *= x * x;
        }
    }
    sums.into_iter().map(Sum::value).collect()
}

#[test]
fn boys_matches_quadrature_over_the_whole_range() {
    let rule = gauss_legendre(40);
    let mut ts = vec![0.0, 1e-12, 1e-9, 1e-6];
    // Log-spaced 1e-4 … 1e3, plus the neighbourhoods of every regime switch.
    ts.extend((0..=700).map(|k| 10f64.powf(-4.0 + 7.0 * k as f64 / 700.0)));
    for sw in 25..=37 {
        for d in [-1e-9, 0.0, 1e-9, 0.3, -0.3] {
            ts.push(sw as f64 + d);
        }
    }
    let mut worst = (0.0f64, 0.0, 0);
    for &t in &ts {
        let reference = boys_reference(t, 12, &rule);
        // Each order both as the top of the recursion and from a longer one.
        for len in [1, 3, 7, 13] {
            let mut f = vec![0.0; len];
            boys(t, &mut f);
            for n in 0..len {
                let rel = (f[n] - reference[n]).abs() / reference[n];
                if rel > worst.0 {
                    worst = (rel, t, n);
                }
            }
        }
    }
    println!(
        "Boys: max relative deviation {:.2e} (T = {}, n = {})",
        worst.0, worst.1, worst.2
    );
    assert!(worst.0 <= 1e-14, "Boys deviation {worst:?}");
}

#[test]
fn boys_zero_order_is_the_error_function_identity() {
    // F₀(T) = ½ √(π/T) erf(√T) (textbook identity, from the substitution s = √T t).
    let mut worst = 0.0f64;
    for k in 0..=300 {
        let t = 10f64.powf(-6.0 + 9.0 * k as f64 / 300.0);
        let mut f = [0.0];
        boys(t, &mut f);
        let exact = 0.5 * (std::f64::consts::PI / t).sqrt() * libm::erf(t.sqrt());
        worst = worst.max((f[0] - exact).abs() / exact);
    }
    println!("F0 vs erf identity: max relative deviation {worst:.2e}");
    assert!(worst <= 1e-14);
}

// ---------------------------------------------------------------- shells

#[test]
fn component_order_is_the_documented_one() {
    // The order stated in the API (common practice).
    assert_eq!(cartesian_components(0), vec![[0, 0, 0]]);
    assert_eq!(
        cartesian_components(1),
        vec![[1, 0, 0], [0, 1, 0], [0, 0, 1]]
    );
    assert_eq!(
        cartesian_components(2),
        vec![
            [2, 0, 0],
            [1, 1, 0],
            [1, 0, 1],
            [0, 2, 0],
            [0, 1, 1],
            [0, 0, 2]
        ]
    );
    let f = cartesian_components(3);
    assert_eq!(f.len(), 10);
    assert_eq!((f[0], f[3], f[9]), ([3, 0, 0], [1, 2, 0], [0, 0, 3]));
}

/// Test shells: (l, exponents, coefficients), at least two primitives each.
const SHELLS: [(u32, &[f64], &[f64]); 4] = [
    (0, &[3.4, 0.62, 0.17], &[0.15, 0.53, 0.44]),
    (1, &[1.8, 0.4], &[0.6, 0.5]),
    (2, &[1.2, 0.35], &[0.7, 0.4]),
    (3, &[0.9, 0.3], &[0.5, 0.6]),
];

fn shell(k: usize, center: [f64; 3]) -> CartesianShell<'static> {
    let (l, exponents, coefficients) = SHELLS[k];
    CartesianShell {
        l,
        center,
        exponents,
        coefficients,
    }
}

/// Primitive 1-D factor (x−A)^i e^(−α(x−A)²) and its derivative.
fn g(i: u32, alpha: f64, dx: f64) -> (f64, f64) {
    let e = (-alpha * dx * dx).exp();
    let pi = dx.powi(i as i32);
    let lower = if i > 0 {
        i as f64 * dx.powi(i as i32 - 1)
    } else {
        0.0
    };
    (pi * e, (lower - 2.0 * alpha * dx * pi) * e)
}

/// 1-D tables over one direction for one primitive pair, weighted by an extra
/// Gaussian e^(−u²(x−C)²) (u = 0: none): value integrals s[i][j] and derivative
/// integrals d[i][j] = ∫ g_i' g_j' dx. Composite Gauss–Legendre on a window of
/// ±12/√q around the peak of the product Gaussian (common practice).
fn tables_1d(
    rule: &[(f64, f64)],
    la: u32,
    lb: u32,
    ab: (f64, f64),
    xs: (f64, f64, f64),
    u: f64,
) -> [[[f64; 4]; 4]; 2] {
    let ((alpha, beta), (xa, xb, xc)) = (ab, xs);
    let q = alpha + beta + u * u;
    let mid = (alpha * xa + beta * xb + u * u * xc) / q;
    let half = 12.0 / q.sqrt();
    let mut out = [[[0.0; 4]; 4]; 2];
    for (x, w) in composite(rule, mid - half, mid + half, 3) {
        let wc = w * (-u * u * (x - xc) * (x - xc)).exp();
        for i in 0..=la {
            let (ga, da) = g(i, alpha, x - xa);
            for j in 0..=lb {
                let (gb, db) = g(j, beta, x - xb);
                out[0][i as usize][j as usize] += wc * ga * gb;
                out[1][i as usize][j as usize] += wc * da * db;
            }
        }
    }
    out
}

/// Overlap, kinetic (as ½ ∫ ∇a·∇b, integration by parts — a different formula from
/// the engine's second derivative) and nuclear attraction by quadrature. The
/// nuclear attraction uses 1/r = (2/√π) ∫₀^∞ e^(−r²u²) du (a standard identity),
/// with u = √p w/(1−w) and composite Gauss–Legendre in w, so every u-point is a
/// product of three 1-D quadratures.
fn quadrature_blocks(
    a: &CartesianShell,
    b: &CartesianShell,
    nuclei: &[(f64, [f64; 3])],
) -> [Vec<f64>; 3] {
    let (rule, u_rule) = (gauss_legendre(32), gauss_legendre(20));
    let (ca, cb) = (cartesian_components(a.l), cartesian_components(b.l));
    let n = ca.len() * cb.len();
    let mut out = [vec![0.0; n], vec![0.0; n], vec![0.0; n]];
    for (&alpha, &da) in a.exponents.iter().zip(a.coefficients) {
        for (&beta, &db) in b.exponents.iter().zip(b.coefficients) {
            let wgt = da * db;
            let t0: [_; 3] = std::array::from_fn(|d| {
                tables_1d(
                    &rule,
                    a.l,
                    b.l,
                    (alpha, beta),
                    (a.center[d], b.center[d], 0.0),
                    0.0,
                )
            });
            for (i, pa) in ca.iter().enumerate() {
                for (j, pb) in cb.iter().enumerate() {
                    let s = |d: usize| t0[d][0][pa[d] as usize][pb[d] as usize];
                    let dd = |d: usize| t0[d][1][pa[d] as usize][pb[d] as usize];
                    out[0][i * cb.len() + j] += wgt * s(0) * s(1) * s(2);
                    out[1][i * cb.len() + j] += wgt
                        * 0.5
                        * (dd(0) * s(1) * s(2) + s(0) * dd(1) * s(2) + s(0) * s(1) * dd(2));
                }
            }
            let sp = (alpha + beta).sqrt();
            for &(z, c) in nuclei {
                for (w, ww) in composite(&u_rule, 0.0, 1.0, 8) {
                    let u = sp * w / (1.0 - w);
                    let du = ww * sp / ((1.0 - w) * (1.0 - w));
                    let f = -z * 2.0 / std::f64::consts::PI.sqrt() * du * wgt;
                    let tu: [_; 3] = std::array::from_fn(|d| {
                        tables_1d(
                            &rule,
                            a.l,
                            b.l,
                            (alpha, beta),
                            (a.center[d], b.center[d], c[d]),
                            u,
                        )
                    });
                    for (i, pa) in ca.iter().enumerate() {
                        for (j, pb) in cb.iter().enumerate() {
                            let s = |d: usize| tu[d][0][pa[d] as usize][pb[d] as usize];
                            out[2][i * cb.len() + j] += f * s(0) * s(1) * s(2);
                        }
                    }
                }
            }
        }
    }
    out
}

#[test]
fn blocks_match_quadrature_for_s_p_d_f_pairs() {
    // Non-collinear geometry: A off the origin, B along a skew direction, and a third
    // nucleus off the A–B line.
    let a_center = [0.2, -0.1, 0.3];
    let dir = [0.3f64, -0.5, 0.8];
    let norm = dir.iter().map(|x| x * x).sum::<f64>().sqrt();
    let mut worst = [0.0f64; 3];
    for r in [0.0, 0.7, 1.5, 3.0] {
        let b_center: [f64; 3] = std::array::from_fn(|d| a_center[d] + r * dir[d] / norm);
        let nuclei = [(1.0, a_center), (2.0, b_center), (3.0, [1.1, 0.9, -0.4])];
        for ka in 0..4 {
            for kb in 0..4 {
                let (sa, sb) = (shell(ka, a_center), shell(kb, b_center));
                let quad = quadrature_blocks(&sa, &sb, &nuclei);
                // Self-overlaps by quadrature, to compare on normalised functions.
                let na: Vec<f64> = diagonal(&quadrature_blocks(&sa, &sa, &[])[0], sa.l);
                let nb: Vec<f64> = diagonal(&quadrature_blocks(&sb, &sb, &[])[0], sb.l);
                let engine = [
                    overlap_block(&sa, &sb),
                    kinetic_block(&sa, &sb),
                    nuclear_block(&sa, &sb, &nuclei),
                ];
                for kind in 0..3 {
                    for (i, ni) in na.iter().enumerate() {
                        for (j, nj) in nb.iter().enumerate() {
                            let k = i * nb.len() + j;
                            let dev = (engine[kind][k] - quad[kind][k]).abs() / (ni * nj).sqrt();
                            assert!(
                                dev <= 1e-8,
                                "kind {kind}, l = {ka},{kb}, R = {r}, pair {i},{j}: {dev:e}"
                            );
                            worst[kind] = worst[kind].max(dev);
                        }
                    }
                }
            }
        }
    }
    println!(
        "normalised deviations from quadrature: overlap {:.2e}, kinetic {:.2e}, nuclear {:.2e}",
        worst[0], worst[1], worst[2]
    );
}

fn diagonal(block: &[f64], l: u32) -> Vec<f64> {
    let n = cartesian_components(l).len();
    (0..n).map(|i| block[i * n + i]).collect()
}

#[test]
fn blocks_are_hermitian_under_swapping_shells() {
    // ⟨a|O|b⟩ = ⟨b|O|a⟩ for the real symmetric operators here (common practice); the
    // kinetic engine differentiates only the right-hand shell, so this is a real check.
    let (pa, pb) = ([0.1, 0.4, -0.2], [1.0, -0.6, 0.9]);
    let nuclei = [(1.0, pa), (6.0, [0.5, 0.5, 0.5])];
    for ka in 0..4 {
        for kb in 0..4 {
            let (sa, sb) = (shell(ka, pa), shell(kb, pb));
            let (na, nb) = (
                cartesian_components(sa.l).len(),
                cartesian_components(sb.l).len(),
            );
            let pairs = [
                (overlap_block(&sa, &sb), overlap_block(&sb, &sa)),
                (kinetic_block(&sa, &sb), kinetic_block(&sb, &sa)),
                (
                    nuclear_block(&sa, &sb, &nuclei),
                    nuclear_block(&sb, &sa, &nuclei),
                ),
            ];
            for (ab, ba) in pairs {
                for i in 0..na {
                    for j in 0..nb {
                        let (x, y) = (ab[i * nb + j], ba[j * na + i]);
                        assert!(
                            (x - y).abs() <= 1e-13 * (1.0 + x.abs()),
                            "l = {ka},{kb}: {x} vs {y}"
                        );
                    }
                }
            }
        }
    }
}

// ---------------------------------------------------------------- closed forms

/// (2α/π)^(3/4): the normalisation of an s Gaussian (common practice).
fn s_norm(alpha: f64) -> f64 {
    (2.0 * alpha / std::f64::consts::PI).powf(0.75)
}

#[test]
fn normalised_s_overlap_closed_form() {
    // S = (2√(αβ)/(α+β))^(3/2) exp(−αβR²/(α+β)) for normalised s Gaussians
    // (Gaussian product theorem; common practice).
    let (alpha, beta) = (1.3, 0.4);
    let mut worst = 0.0f64;
    for r in [0.0, 0.7, 1.5, 3.0, 6.0] {
        let (ca, cb) = ([alpha], [s_norm(alpha)]);
        let (cb2, db) = ([beta], [s_norm(beta)]);
        let a = CartesianShell {
            l: 0,
            center: [0.0; 3],
            exponents: &ca,
            coefficients: &cb,
        };
        let b = CartesianShell {
            l: 0,
            center: [0.0, r, 0.0],
            exponents: &cb2,
            coefficients: &db,
        };
        let p = alpha + beta;
        let exact = (2.0 * (alpha * beta).sqrt() / p).powf(1.5) * (-alpha * beta * r * r / p).exp();
        let got = overlap_block(&a, &b)[0];
        worst = worst.max((got - exact).abs() / exact);
    }
    println!("s overlap closed form: max relative deviation {worst:.2e}");
    assert!(worst <= 1e-14);
}

#[test]
fn hydrogen_sto3g_energy() {
    // E = −0.466582 hartree for H in STO-3G (A. Szabo and N. S. Ostlund, Modern
    // Quantum Chemistry, ch. 3). Exponents (ζ = 1.24) and coefficients multiplying
    // normalised primitives: from memory.
    let exponents = [3.42525091, 0.62391373, 0.16885540];
    let d = [0.15432897, 0.53532814, 0.44463454];
    let coefficients: Vec<f64> = exponents
        .iter()
        .zip(d)
        .map(|(&a, d)| d * s_norm(a))
        .collect();
    let h = [0.0, 0.0, 0.0];
    let s = CartesianShell {
        l: 0,
        center: h,
        exponents: &exponents,
        coefficients: &coefficients,
    };
    let norm = overlap_block(&s, &s)[0];
    let e = (kinetic_block(&s, &s)[0] + nuclear_block(&s, &s, &[(1.0, h)])[0]) / norm;
    println!("H STO-3G: E = {e:.8} hartree, contraction self-overlap {norm:.8}");
    assert!((e - -0.466582).abs() <= 1e-6, "E = {e}");
}
