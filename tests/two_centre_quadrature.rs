//! Independent cross-check of the closed-form two-centre 1s integrals.
//!
//! S, H_AA and H_AB are computed here by brute-force Gauss–Legendre quadrature in
//! prolate spheroidal coordinates and compared with `two_centre_1s`. Nothing is
//! taken from the library's derivation: the kinetic terms are ½∫∇φ·∇φ dV (first
//! derivatives only), and E_atom comes from the same quadrature, not from ζ²/2 − Zζ.
//!
//! Coordinates: λ = (rA+rB)/R ∈ [1, ∞), μ = (rA−rB)/R ∈ [−1, 1], azimuth done
//! analytically, dV = (R/2)³(λ²−μ²) dλ dμ dφ. Then rA = R(λ+μ)/2, rB = R(λ−μ)/2,
//! so the Jacobian cancels the nuclear singularities: (λ²−μ²)/rA = 2(λ−μ)/R,
//! (λ²−μ²)(1/rA + 1/rB) = 4λ/R, and, with r̂A·r̂B = (rA²+rB²−R²)/(2 rA rB),
//! (λ²−μ²) r̂A·r̂B = λ² + μ² − 2. Every integrand below is smooth (analytic).

mod common;

use lobecast::integrals::two_centre::{TwoCentre1s, two_centre_1s};
use lobecast::numerics::quadrature::gauss_legendre;

use common::composite;

/// Quadrature resolution. Every λ-integrand decays at least as e^(−ζRλ); with
/// t = ζR(λ−1) the neglected tail beyond t = T is bounded by
/// ½e^(−T)[(ζR+T)² + 2(ζR+T) + 2] · max(1, 2ζ², 4/R) ≲ 1e-21 for T = 60 on this
/// table, far below 1e-14.
#[derive(Clone, Copy)]
struct Resolution {
    t_max: f64,
    lambda_panels: usize,
    mu_panels: usize,
    order: usize,
}

const STANDARD: Resolution = Resolution {
    t_max: 60.0,
    lambda_panels: 30,
    mu_panels: 8,
    order: 16,
};
const REFINED: Resolution = Resolution {
    t_max: 90.0,
    lambda_panels: 90,
    mu_panels: 16,
    order: 24,
};

/// The seven integrals the eight fields are built from.
#[derive(Debug, Clone, Copy)]
struct Raw {
    norm: f64,   // ∫φA²
    s: f64,      // ∫φAφB
    t_aa: f64,   // ½∫|∇φA|²
    v_aa_a: f64, // ∫φA²/rA
    v_aa_b: f64, // ∫φA²/rB
    t_ab: f64,   // ½∫∇φA·∇φB
    v_ab: f64,   // ∫φAφB (1/rA + 1/rB)
}

fn raw(zeta: f64, r: f64, res: Resolution) -> Raw {
    let a = zeta * r;
    let gl = gauss_legendre(res.order);
    let ts = composite(&gl, 0.0, res.t_max, res.lambda_panels);
    let mus = composite(&gl, -1.0, 1.0, res.mu_panels);
    // φAφB = (ζ³/π) e^(−aλ), φA² = (ζ³/π) e^(−a(λ+μ)); 2π (R/2)³ ζ³/π = a³/4.
    let pre = a.powi(3) / 4.0;
    // Inner (μ) sums per λ node, then a compensated (Neumaier) outer sum, so that
    // rounding over ~10⁵ terms stays well below 1e-13.
    let (mut q, mut c) = ([0.0; 7], [0.0; 7]);
    for &(t, wt) in &ts {
        let l = 1.0 + t / a;
        let mut row = [0.0; 7];
        for &(m, wm) in &mus {
            let w = pre * wt / a * wm;
            let cross = w * (-a * l).exp();
            let self_a = w * (-a * (l + m)).exp();
            let jac = l * l - m * m;
            row[0] += self_a * jac;
            row[1] += cross * jac;
            row[2] += 0.5 * zeta * zeta * self_a * jac; // |∇φA|² = ζ²φA²
            row[3] += self_a * 2.0 * (l - m) / r;
            row[4] += self_a * 2.0 * (l + m) / r;
            row[5] += 0.5 * zeta * zeta * cross * (l * l + m * m - 2.0); // ∇φ = −ζ r̂ φ
            row[6] += cross * 4.0 * l / r;
        }
        for k in 0..7 {
            let sum = q[k] + row[k];
            c[k] += if q[k].abs() >= row[k].abs() {
                (q[k] - sum) + row[k]
            } else {
                (row[k] - sum) + q[k]
            };
            q[k] = sum;
        }
    }
    let q: [f64; 7] = std::array::from_fn(|k| q[k] + c[k]);
    let [norm, s, t_aa, v_aa_a, v_aa_b, t_ab, v_ab] = q;
    Raw {
        norm,
        s,
        t_aa,
        v_aa_a,
        v_aa_b,
        t_ab,
        v_ab,
    }
}

/// The eight fields of `TwoCentre1s` from their definitions, with nuclear repulsion
/// in the Hamiltonian: H = −½∇² − Z/rA − Z/rB + Z²/R, E_atom = ⟨φA|−½∇² − Z/rA|φA⟩.
fn fields(z: f64, zeta: f64, r: f64, res: Resolution) -> [f64; 8] {
    let q = raw(zeta, r, res);
    let e_atom = q.t_aa - z * q.v_aa_a;
    let h_aa = e_atom - z * q.v_aa_b + z * z / r;
    let h_ab = q.t_ab - z * q.v_ab + z * z / r * q.s;
    [
        q.s,
        h_aa,
        h_ab,
        e_atom,
        h_aa - e_atom,
        h_ab - e_atom * q.s,
        (h_aa + h_ab) / (1.0 + q.s),
        (h_aa - h_ab) / (1.0 - q.s),
    ]
}

const NAMES: [&str; 8] = [
    "s",
    "h_aa",
    "h_ab",
    "e_atom",
    "coulomb",
    "exchange",
    "e_bonding",
    "e_antibonding",
];

fn library(z: f64, zeta: f64, r: f64) -> [f64; 8] {
    let TwoCentre1s {
        s,
        h_aa,
        h_ab,
        e_atom,
        coulomb,
        exchange,
        e_bonding,
        e_antibonding,
    } = two_centre_1s(z, zeta, r);
    [
        s,
        h_aa,
        h_ab,
        e_atom,
        coulomb,
        exchange,
        e_bonding,
        e_antibonding,
    ]
}

/// The case table: short (S → 1, large 1/(1−S)), bonding and long (S ~ e^(−16))
/// separations; contracted, free and diffuse exponents; Z = 1 and Z = 2.
fn cases() -> Vec<(f64, f64, f64)> {
    let mut out = Vec::new();
    for z in [1.0, 2.0] {
        for zeta in [0.8, 1.0, 1.24, 2.0] {
            for r in [0.3, 1.0, 2.0, 2.5, 4.0, 8.0] {
                out.push((z, zeta, r));
            }
        }
    }
    out
}

/// The quadrature alone: ∫φA² = 1 (exact by normalisation) to 1e-12 in every case,
/// and a refined grid (3× the λ panels, 2× the μ panels, order 24, tail to t = 90)
/// reproduces the seven raw integrals to 1e-13 and the eight fields to 1e-12, three
/// orders below the comparison tolerance (common practice). E_antibonding at
/// R = 0.3 is the worst conditioned: 1/(1 − S) ≈ 100 amplifies rounding.
#[test]
fn quadrature_is_converged() {
    let as_array = |q: Raw| [q.norm, q.s, q.t_aa, q.v_aa_a, q.v_aa_b, q.t_ab, q.v_ab];
    for (z, zeta, r) in cases() {
        let n = raw(zeta, r, STANDARD).norm;
        assert!((n - 1.0).abs() < 1e-12, "∫φA² = {n} at ζ={zeta}, R={r}");
        let (a, b) = (raw(zeta, r, STANDARD), raw(zeta, r, REFINED));
        for (x, y) in as_array(a).into_iter().zip(as_array(b)) {
            assert!((x - y).abs() < 1e-13, "ζ={zeta} R={r}: {a:?} vs {b:?}");
        }
        let (a, b) = (fields(z, zeta, r, STANDARD), fields(z, zeta, r, REFINED));
        for k in 0..8 {
            let d = (a[k] - b[k]).abs();
            assert!(
                d < 1e-12,
                "{} Z={z} ζ={zeta} R={r}: {} vs {}",
                NAMES[k],
                a[k],
                b[k]
            );
        }
    }
}

/// Hand values at Z = ζ = 1, R = 2 (H2+ with the free-atom exponent).
#[test]
fn hand_values_at_r_2() {
    let [s, _, _, e_atom, coulomb, exchange, e_bonding, _] = fields(1.0, 1.0, 2.0, STANDARD);
    let r: f64 = 2.0;
    // S = e^(−R)(1 + R + R²/3): the standard 1s–1s overlap (Levine, Quantum
    // Chemistry, Sec. 13.5; from memory).
    let s_ref = (-r).exp() * (1.0 + r + r * r / 3.0);
    assert!((s - s_ref).abs() < 1e-12, "S = {s}, closed form {s_ref}");
    assert!((e_atom + 0.5).abs() < 1e-12, "E_atom = {e_atom}");
    // With nuclear repulsion included: J = e^(−2R)(1 + 1/R), K = S/R − e^(−R)(1+R)
    // (same textbook treatment of H2+; from memory).
    let j_ref = (-2.0 * r).exp() * (1.0 + 1.0 / r);
    let k_ref = s_ref / r - (-r).exp() * (1.0 + r);
    assert!(
        (coulomb - j_ref).abs() < 1e-12,
        "J = {coulomb}, closed form {j_ref}"
    );
    assert!(
        (exchange - k_ref).abs() < 1e-12,
        "K = {exchange}, closed form {k_ref}"
    );
    let e_ref = -0.5 + (j_ref + k_ref) / (1.0 + s_ref);
    assert!((e_bonding - e_ref).abs() < 1e-12, "E_bonding = {e_bonding}");
    // Variational bound: the exact H2+ energy at R = 2 is −1.1026342 hartree
    // electronic, −0.6026342 with 1/R (from memory); LCAO must lie above it.
    assert!(
        e_bonding > -0.6026342,
        "E_bonding = {e_bonding} below exact"
    );
}

/// All eight fields of the library against the quadrature, to 1e-9 absolute.
/// Every failure is collected and printed with both numbers before the test fails.
#[test]
fn library_matches_quadrature() {
    let mut max_dev = [0.0f64; 8];
    let mut failures = Vec::new();
    for (z, zeta, r) in cases() {
        let (quad, lib) = (fields(z, zeta, r, STANDARD), library(z, zeta, r));
        for k in 0..8 {
            let d = (quad[k] - lib[k]).abs();
            // A NaN from the library must fail too.
            if d.is_nan() || d > 1e-9 {
                failures.push(format!(
                    "{} Z={z} ζ={zeta} R={r}: library {:.15e}, quadrature {:.15e}, |Δ| {d:.2e}",
                    NAMES[k], lib[k], quad[k]
                ));
            }
            max_dev[k] = max_dev[k].max(d);
        }
    }
    for k in 0..8 {
        eprintln!(
            "max |library − quadrature| {:>13}: {:.2e}",
            NAMES[k], max_dev[k]
        );
    }
    assert!(failures.is_empty(), "{}", failures.join("\n"));
}
