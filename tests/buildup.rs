//! The build-up numbers of the two-centre 1s model: the electrons the bonding and
//! antibonding orbitals gather between the nuclei, and the deformation density at the
//! bond midpoint, against closed forms and an independent integration.

mod common;

use std::f64::consts::PI;

use lobecast::field::buildup::{Buildup, buildup};
use lobecast::integrals::two_centre::two_centre_1s;

fn model_at(r: f64, zeta: f64) -> Buildup {
    let text = format!(
        "[molecule]\nunits = \"bohr\"\ncharge = 1\n\
         atoms = [{{ element = \"H\", position = [0, 0, {}] }}, {{ element = \"H\", position = [0, 0, {}] }}]\n\
         [basis]\nset = \"slater-1s\"\nzeta = {{ H = {zeta} }}\n",
        -0.5 * r,
        0.5 * r
    );
    buildup(&common::solve_model(&text)).unwrap()
}

#[test]
fn bonding_gathers_and_antibonding_pushes_out_at_every_separation() {
    let rs: Vec<f64> = (0..=37).map(|i| 0.6 + 0.2 * i as f64).collect();
    let b: Vec<Buildup> = rs.iter().map(|&r| model_at(r, 1.0)).collect();
    for (r, x) in rs.iter().zip(&b) {
        assert!(
            x.between[0] > 0.0 && x.between[1] < 0.0,
            "R = {r}: {:?}",
            x.between
        );
    }
    let peak = b
        .iter()
        .map(|x| x.between[0].abs().max(x.between[1].abs()))
        .fold(0.0, f64::max);
    let last = b.last().unwrap();
    assert!(
        last.between[0] < 0.1 * peak && -last.between[1] < 0.1 * peak,
        "tends to 0: {:?}",
        last.between
    );
    // Beyond the maximum gain the numbers fall monotonically to zero.
    let imax = (0..b.len())
        .max_by(|&i, &j| b[i].between[0].total_cmp(&b[j].between[0]))
        .unwrap();
    assert!(
        b[imax..]
            .windows(2)
            .all(|w| w[1].between[0] < w[0].between[0])
    );
}

/// At the midpoint φA = φB = φm = sqrt(ζ³/π) e^(−ζR/2) and each atom carries half the
/// population, so Δρ₊ = 2φm²/(1+S) − φm² = φm²(1−S)/(1+S) and Δρ₋ = −φm² (the
/// antibonding orbital vanishes there). Derived here from the 1s function and S.
#[test]
fn midpoint_values_have_the_closed_form() {
    for (r, zeta) in [(1.0, 1.0), (2.0, 1.0), (2.5, 1.24), (5.0, 1.0)] {
        let x = model_at(r, zeta);
        let s = two_centre_1s(1.0, zeta, r).s;
        let phi_m2 = zeta.powi(3) / PI * (-zeta * r).exp();
        assert!(
            (x.midpoint[0] - phi_m2 * (1.0 - s) / (1.0 + s)).abs() < 1e-14,
            "R = {r}"
        );
        assert!((x.midpoint[1] + phi_m2).abs() < 1e-14, "R = {r}");
    }
}

/// An independent integration: the model is symmetric about the bond, so the slab
/// integral is 2π∫∫ Δρ(ρ, z) ρ dρ dz; composite Simpson's rule in ρ ∈ [0, 30] and in
/// z across the slab, with Δρ written out here from the 1s functions and S.
#[test]
fn slab_integral_agrees_with_an_independent_integration() {
    for (r, zeta) in [(1.2, 1.0), (2.0, 1.0), (2.5, 1.0), (4.0, 1.3)] {
        let s = two_centre_1s(1.0, zeta, r).s;
        let n = (zeta.powi(3) / PI).sqrt();
        let delta = |rho: f64, z: f64, sign: f64| {
            let a = n * (-zeta * (rho * rho + (z + 0.5 * r).powi(2)).sqrt()).exp();
            let b = n * (-zeta * (rho * rho + (z - 0.5 * r).powi(2)).sqrt()).exp();
            (a + sign * b).powi(2) / (2.0 * (1.0 + sign * s)) - 0.5 * (a * a + b * b)
        };
        let simpson = |f: &dyn Fn(f64) -> f64, lo: f64, hi: f64, m: usize| {
            let h = (hi - lo) / m as f64;
            (0..=m)
                .map(|i| {
                    f(lo + i as f64 * h)
                        * if i == 0 || i == m {
                            1.0
                        } else if i % 2 == 1 {
                            4.0
                        } else {
                            2.0
                        }
                })
                .sum::<f64>()
                * h
                / 3.0
        };
        let x = model_at(r, zeta);
        for (k, sign) in [(0usize, 1.0), (1, -1.0)] {
            let inner =
                |z: f64| simpson(&|rho| 2.0 * PI * rho * delta(rho, z, sign), 0.0, 30.0, 6000);
            let reference = simpson(&inner, -0.5 * r, 0.5 * r, 400);
            assert!(
                (x.between[k] - reference).abs() < 1e-4,
                "R = {r}, orbital {}: {} vs {reference}",
                k + 1,
                x.between[k]
            );
        }
    }
}
