//! QCSchema documents: the basis-function conventions, checked against closed forms
//! written out here independently of lobecast's harmonic tables.
//!
//! Ordering and scaling: the QCSchema wavefunction documentation says the AO basis
//! functions follow the CCA standard (Kenny, Janssen, Valeev and Windus, "Components
//! for integral evaluation in quantum chemistry", J. Comput. Chem. 29, 562 (2008);
//! from memory): Cartesian components xx, xy, xz, yy, yz, zz (x power descending,
//! then y), all scaled like x^l; real solid harmonics m = −l … +l, each normalised.
//! Real spherical harmonics without the Condon–Shortley phase, m < 0 sine-like: the
//! standard table (e.g. Helgaker, Jørgensen and Olsen, Molecular Electronic-
//! Structure Theory, Wiley 2000, section 6.4; from memory).

use lobecast::basis::Shell;
use lobecast::io::qcschema;
use serde_json::{Value, json};
use std::f64::consts::PI;

const CENTER: [f64; 3] = [0.3, -0.2, 0.1];

/// Exponent of the single primitive of the l shell: different per l so a mix-up of
/// shells shows.
fn alpha(l: u32) -> f64 {
    0.5 + 0.15 * l as f64
}

/// Real solid harmonic R_lm with ∫(R_lm / r^l)² dΩ = 1, closed form.
fn solid(l: u32, m: i32, x: f64, y: f64, z: f64) -> f64 {
    let r2 = x * x + y * y + z * z;
    match (l, m) {
        (0, 0) => 0.5 / PI.sqrt(),
        (1, -1) => (3.0 / (4.0 * PI)).sqrt() * y,
        (1, 0) => (3.0 / (4.0 * PI)).sqrt() * z,
        (1, 1) => (3.0 / (4.0 * PI)).sqrt() * x,
        (2, -2) => 0.5 * (15.0 / PI).sqrt() * x * y,
        (2, -1) => 0.5 * (15.0 / PI).sqrt() * y * z,
        (2, 0) => 0.25 * (5.0 / PI).sqrt() * (3.0 * z * z - r2),
        (2, 1) => 0.5 * (15.0 / PI).sqrt() * x * z,
        (2, 2) => 0.25 * (15.0 / PI).sqrt() * (x * x - y * y),
        (3, -3) => 0.25 * (35.0 / (2.0 * PI)).sqrt() * y * (3.0 * x * x - y * y),
        (3, -2) => 0.5 * (105.0 / PI).sqrt() * x * y * z,
        (3, -1) => 0.25 * (21.0 / (2.0 * PI)).sqrt() * y * (5.0 * z * z - r2),
        (3, 0) => 0.25 * (7.0 / PI).sqrt() * z * (5.0 * z * z - 3.0 * r2),
        (3, 1) => 0.25 * (21.0 / (2.0 * PI)).sqrt() * x * (5.0 * z * z - r2),
        (3, 2) => 0.25 * (105.0 / PI).sqrt() * z * (x * x - y * y),
        (3, 3) => 0.25 * (35.0 / (2.0 * PI)).sqrt() * x * (x * x - 3.0 * y * y),
        _ => unreachable!(),
    }
}

/// Γ(l + 3/2) for l = 0…3: √π/2, 3√π/4, 15√π/8, 105√π/16.
fn gamma_l_three_halves(l: u32) -> f64 {
    [0.5, 0.75, 1.875, 6.5625][l as usize] * PI.sqrt()
}

/// A normalised pure Gaussian: N r^l Y_lm e^(−αr²), N² = 2 (2α)^(l+3/2) / Γ(l+3/2).
fn pure_value(l: u32, m: i32, d: [f64; 3]) -> f64 {
    let a = alpha(l);
    let n = (2.0 * (2.0 * a).powf(l as f64 + 1.5) / gamma_l_three_halves(l)).sqrt();
    let r2 = d[0] * d[0] + d[1] * d[1] + d[2] * d[2];
    n * solid(l, m, d[0], d[1], d[2]) * (-a * r2).exp()
}

/// The CCA order of Cartesian components of degree l.
fn cca_order(l: u32) -> Vec<[i32; 3]> {
    match l {
        0 => vec![[0, 0, 0]],
        1 => vec![[1, 0, 0], [0, 1, 0], [0, 0, 1]],
        2 => vec![
            [2, 0, 0],
            [1, 1, 0],
            [1, 0, 1],
            [0, 2, 0],
            [0, 1, 1],
            [0, 0, 2],
        ],
        3 => vec![
            [3, 0, 0],
            [2, 1, 0],
            [2, 0, 1],
            [1, 2, 0],
            [1, 1, 1],
            [1, 0, 2],
            [0, 3, 0],
            [0, 2, 1],
            [0, 1, 2],
            [0, 0, 3],
        ],
        _ => unreachable!(),
    }
}

/// x^a y^b z^c e^(−αr²) scaled so that x^l e^(−αr²) has unit norm:
/// (2α/π)^(3/4) (4α)^(l/2) / √((2l−1)!!), (2l−1)!! = 1, 1, 3, 15.
fn cartesian_value(p: [i32; 3], d: [f64; 3]) -> f64 {
    let l = (p[0] + p[1] + p[2]) as u32;
    let a = alpha(l);
    let dfact = [1.0, 1.0, 3.0, 15.0][l as usize];
    let n = (2.0 * a / PI).powf(0.75) * (4.0 * a).powf(l as f64 / 2.0) / f64::sqrt(dfact);
    let r2 = d[0] * d[0] + d[1] * d[1] + d[2] * d[2];
    n * d[0].powi(p[0]) * d[1].powi(p[1]) * d[2].powi(p[2]) * (-a * r2).exp()
}

/// A neon atom carrying one single-primitive shell of every l in `form`, and one
/// orbital per function (the identity), so each orbital is one basis function.
fn document(form: &str) -> (String, usize) {
    let shells: Vec<Value> = (0..=3u32)
        .map(|l| {
            json!({"angular_momentum": [l], "harmonic_type": form,
                   "exponents": [alpha(l)], "coefficients": [[1.0]]})
        })
        .collect();
    let nbf: usize = (0..=3usize)
        .map(|l| {
            if form == "spherical" {
                2 * l + 1
            } else {
                (l + 1) * (l + 2) / 2
            }
        })
        .sum();
    let mut c = vec![0.0; nbf * nbf];
    for i in 0..nbf {
        c[i * nbf + i] = 1.0;
    }
    let eps: Vec<f64> = (0..nbf).map(|i| i as f64 * 0.1).collect();
    // Ten electrons in five orbitals keep neon neutral; which five does not matter.
    let occ: Vec<f64> = (0..nbf).map(|i| if i < 5 { 1.0 } else { 0.0 }).collect();
    let doc = json!({
        "schema_name": "qcschema_output", "schema_version": 1,
        "molecule": {"symbols": ["Ne"], "geometry": CENTER, "molecular_charge": 0.0, "molecular_multiplicity": 1},
        "driver": "energy", "model": {"method": "hf", "basis": "test"}, "return_result": 0.0, "success": true,
        "properties": {}, "provenance": {"creator": "test", "version": "0", "routine": "hand-built"},
        "wavefunction": {
            "basis": {"name": "test", "center_data": {"Ne": {"electron_shells": shells}}, "atom_map": ["Ne"], "nbf": nbf},
            "restricted": true, "scf_orbitals_a": c, "scf_eigenvalues_a": eps, "scf_occupations_a": occ
        }
    });
    (doc.to_string(), nbf)
}

/// Points around the centre, fixed pseudo-random (a linear congruential generator).
fn points() -> Vec<[f64; 3]> {
    let mut s: u64 = 12345;
    let mut next = || {
        s = s
            .wrapping_mul(6364136223846793005)
            .wrapping_add(1442695040888963407);
        ((s >> 11) as f64 / (1u64 << 53) as f64) * 3.0 - 1.5
    };
    (0..40)
        .map(|_| [CENTER[0] + next(), CENTER[1] + next(), CENTER[2] + next()])
        .collect()
}

/// Every basis function of the parsed document at the points, function-major.
fn values(text: &str, nbf: usize) -> Vec<Vec<f64>> {
    let set = qcschema::parse(text, "hand-built").unwrap();
    assert_eq!(set.basis.len(), nbf);
    // The orbitals are the identity: orbital i is function i.
    for (i, o) in set.orbitals.iter().enumerate() {
        let want: Vec<f64> = (0..nbf).map(|j| if j == i { 1.0 } else { 0.0 }).collect();
        assert_eq!(o.coefficients, want, "orbital {i}");
    }
    let pts = points();
    let mut out = Vec::new();
    for shell in &set.basis.shells {
        let mut v = vec![0.0; shell.len() * pts.len()];
        shell.values(&pts, &mut v);
        assert!(matches!(shell, Shell::Gaussian(_)));
        out.extend(v.chunks(pts.len()).map(<[f64]>::to_vec));
    }
    out
}

fn close(got: f64, want: f64) -> bool {
    (got - want).abs() <= 1e-12 * (1.0 + want.abs())
}

#[test]
fn pure_functions_match_closed_form_real_solid_harmonics_in_cca_order() {
    let (text, nbf) = document("spherical");
    let got = values(&text, nbf);
    let mut k = 0;
    for l in 0..=3u32 {
        for m in -(l as i32)..=l as i32 {
            for (p, pt) in points().iter().enumerate() {
                let d = [pt[0] - CENTER[0], pt[1] - CENTER[1], pt[2] - CENTER[2]];
                let want = pure_value(l, m, d);
                assert!(
                    close(got[k][p], want),
                    "l={l} m={m} point {p}: {} vs {want}",
                    got[k][p]
                );
            }
            k += 1;
        }
    }
    assert_eq!(k, nbf);
}

#[test]
fn cartesian_functions_follow_cca_order_and_shared_scaling() {
    let (text, nbf) = document("cartesian");
    let got = values(&text, nbf);
    let mut k = 0;
    for l in 0..=3u32 {
        for p in cca_order(l) {
            for (i, pt) in points().iter().enumerate() {
                let d = [pt[0] - CENTER[0], pt[1] - CENTER[1], pt[2] - CENTER[2]];
                let want = cartesian_value(p, d);
                assert!(
                    close(got[k][i], want),
                    "{p:?} point {i}: {} vs {want}",
                    got[k][i]
                );
            }
            k += 1;
        }
    }
    assert_eq!(k, nbf);
}

/// Norms ⟨φ|φ⟩ of the Cartesian d and f components under the shared scaling, from
/// the closed form ∫x^(2a)y^(2b)z^(2c)e^(−2αr²) ∝ (2a−1)!!(2b−1)!!(2c−1)!!: xx 1,
/// xy 1/3; xxx 1, xxy 1/5, xyz 1/15.
#[test]
fn shared_scaling_gives_the_closed_form_norms() {
    let (text, _) = document("cartesian");
    let set = qcschema::parse(&text, "hand-built").unwrap();
    let s = set.overlap.expect("Gaussian overlap");
    // Offsets: s 0, p 1–3, d 4–9 (xx xy xz yy yz zz), f 10–19.
    for (i, want) in [
        (4, 1.0),
        (5, 1.0 / 3.0),
        (10, 1.0),
        (11, 0.2),
        (14, 1.0 / 15.0),
    ] {
        assert!(
            (s[(i, i)] - want).abs() < 1e-12,
            "S[{i},{i}] = {}",
            s[(i, i)]
        );
    }
}
