//! Checks of the embedded basis data: the named sets `sto-3g`/`sto-6g` (H–Ar) and the
//! ζ = 1 STO-nG expansions. Why: the data are typed-in reference numbers, and these
//! properties (shell structure, normalisation, least-squares optimality, the ζ² scaling
//! that links the two tables) catch a wrong, shifted or truncated digit.

use lobecast::basis::named::{self, NamedShell};
use lobecast::basis::sto_ng::{self, MAX_GAUSSIANS, SlaterShell};

/// Overlap of two normalised Gaussians r^l e^(−a r²) and r^l e^(−b r²) with the same
/// angular part: (2√(ab)/(a+b))^(l+3/2) (closed form; common practice).
fn primitive_overlap(l: u32, a: f64, b: f64) -> f64 {
    (2.0 * (a * b).sqrt() / (a + b)).powf(f64::from(l) + 1.5)
}

fn norm2(l: u32, prims: &[(f64, f64)]) -> f64 {
    let mut s = 0.0;
    for &(a, c) in prims {
        for &(b, d) in prims {
            s += c * d * primitive_overlap(l, a, b);
        }
    }
    s
}

fn gamma_half_integer(x2: u32) -> f64 {
    // Γ(x2/2) for odd x2 ≥ 1: Γ(1/2) = √π, Γ(x+1) = x Γ(x).
    let mut g = std::f64::consts::PI.sqrt();
    let mut x = 0.5;
    while (2.0 * x) as u32 != x2 {
        g *= x;
        x += 1.0;
    }
    g
}

fn factorial(n: u32) -> f64 {
    (1..=n).map(f64::from).product()
}

/// ⟨Slater nl, ζ = 1 | normalised Gaussian r^l e^(−a r²)⟩ by composite Simpson
/// quadrature on [0, 80] bohr (independent of the closed-form recurrence the fitting
/// script uses). Radial normalisations: Slater (2ζ)^(n+1/2)/√((2n)!), Gaussian
/// √(2 (2a)^(l+3/2) / Γ(l+3/2)).
fn sto_gauss_overlap_quadrature(n: u32, l: u32, a: f64) -> f64 {
    let ns = 2f64.powf(f64::from(n) + 0.5) / factorial(2 * n).sqrt();
    let ng = (2.0 * (2.0 * a).powf(f64::from(l) + 1.5) / gamma_half_integer(2 * l + 3)).sqrt();
    let steps = 200_000;
    let h = 80.0 / steps as f64;
    let f = |r: f64| r.powi((n + 1 + l) as i32) * (-r - a * r * r).exp();
    let mut s = f(0.0) + f(80.0);
    for i in 1..steps {
        let w = if i % 2 == 1 { 4.0 } else { 2.0 };
        s += w * f(i as f64 * h);
    }
    ns * ng * s * h / 3.0
}

fn expected_ls(z: u32) -> Vec<u32> {
    match z {
        1 | 2 => vec![0],
        3..=10 => vec![0, 0, 1],
        _ => vec![0, 0, 1, 0, 1],
    }
}

#[test]
fn every_element_h_to_ar_has_the_expected_shells() {
    for set in named::NAMES {
        for z in 1..=18 {
            let shells = named::shells(set, z).unwrap_or_else(|| panic!("{set} lacks Z = {z}"));
            let ls: Vec<u32> = shells.iter().map(|s| s.l).collect();
            assert_eq!(ls, expected_ls(z), "{set} Z = {z}");
            let m = if set == "sto-3g" { 3 } else { 6 };
            for s in &shells {
                assert_eq!(s.primitives.len(), m, "{set} Z = {z}");
                assert!(s.primitives.iter().all(|p| p.0.is_finite() && p.0 > 0.0));
            }
        }
        assert!(named::shells(set, 19).is_none());
    }
}

#[test]
fn named_contractions_are_normalised() {
    // Coefficients multiply normalised primitives (Hehre, Stewart, Pople 1969), so the
    // contracted function must have norm 1; tolerance 1e-4 from the issue.
    for set in named::NAMES {
        for z in 1..=18 {
            for NamedShell { l, primitives } in named::shells(set, z).unwrap() {
                let n2 = norm2(l, &primitives);
                assert!((n2 - 1.0).abs() < 1e-4, "{set} Z = {z} l = {l}: {n2}");
            }
        }
    }
}

#[test]
fn sto_ng_expansions_are_normalised_with_positive_exponents() {
    for kind in SlaterShell::ALL {
        for m in 1..=MAX_GAUSSIANS {
            let e = sto_ng::expansion(kind, m).unwrap();
            assert!(e.iter().all(|p| p.0.is_finite() && p.0 > 0.0));
            let n2 = norm2(kind.l(), e);
            assert!((n2 - 1.0).abs() < 1e-12, "{kind:?} {m}: {n2}");
        }
    }
}

/// For a normalised least-squares fit on fixed exponents the coefficients are
/// d = S⁻¹b / O with b_k = ⟨φ_STO|g_k⟩ and O = ⟨φ_STO|fit⟩ (the criterion of Hehre,
/// Stewart, Pople 1969), i.e. S d = b / O. This holds for each function of a jointly
/// fitted 2s/2p or 3s/3p pair too, because only the exponents are shared.
#[test]
fn sto_ng_coefficients_are_the_least_squares_optimum_and_overlap_is_recorded() {
    for kind in SlaterShell::ALL {
        for m in 1..=MAX_GAUSSIANS {
            let e = sto_ng::expansion(kind, m).unwrap();
            let b: Vec<f64> = e
                .iter()
                .map(|p| sto_gauss_overlap_quadrature(kind.n(), kind.l(), p.0))
                .collect();
            let o: f64 = e.iter().zip(&b).map(|(p, bk)| p.1 * bk).sum();
            let recorded = sto_ng::overlap_with_slater(kind, m).unwrap();
            assert!(
                (o - recorded).abs() < 1e-11,
                "{kind:?} {m}: {o} vs {recorded}"
            );
            for (i, &(a, _)) in e.iter().enumerate() {
                let sd: f64 = e
                    .iter()
                    .map(|&(bexp, d)| d * primitive_overlap(kind.l(), a, bexp))
                    .sum();
                assert!((sd - b[i] / o).abs() < 1e-10, "{kind:?} {m} row {i}");
            }
        }
    }
}

#[test]
fn overlaps_with_the_slater_function_grow_with_the_number_of_gaussians() {
    for kind in SlaterShell::ALL {
        let o: Vec<f64> = (1..=MAX_GAUSSIANS)
            .map(|m| sto_ng::overlap_with_slater(kind, m).unwrap())
            .collect();
        assert!(o.windows(2).all(|w| w[1] > w[0]), "{kind:?}: {o:?}");
        assert!(o[MAX_GAUSSIANS - 1] < 1.0);
    }
}

#[test]
fn one_s_overlaps_with_the_slater_function() {
    // Measured by our own fit and re-measured by quadrature in the test above:
    // ⟨1s STO|STO-3G⟩ = 0.99983474 and ⟨1s STO|STO-6G⟩ = 0.99999938. The issue's
    // recalled 0.9965 ("from memory") is not what the published expansion gives: the
    // published H coefficients (basis-set-exchange sto-3g) reproduce 0.99983474 too
    // (see `named_sets_are_the_sto_ng_fits_scaled_by_the_standard_exponents`).
    // The values below are our measurement (computed by tools/fit_sto_ng.py), not a
    // published number.
    let o3 = sto_ng::overlap_with_slater(SlaterShell::S1, 3).unwrap();
    let o6 = sto_ng::overlap_with_slater(SlaterShell::S1, 6).unwrap();
    assert!((o3 - 0.999_834_74).abs() < 1e-8, "{o3}");
    assert!((o6 - 0.999_999_38).abs() < 1e-8, "{o6}");
}

/// The named sets are the ζ = 1 fits with exponents scaled by the standard molecular
/// ζ² (Hehre, Stewart, Pople 1969): H 1s ζ = 1.24, C 1s ζ = 5.67, C 2sp ζ = 1.72
/// (from memory; tools/import_bse.py infers the same values, 1.240000, 5.670000 and
/// 1.720000, from the ratios of the published exponents to ours). Their coefficients are the same for every element, and equal ours
/// to the 10 printed digits; for Na–Ar the 3sp coefficients equal our 3s/3p fit.
#[test]
fn named_sets_are_the_sto_ng_fits_scaled_by_the_standard_exponents() {
    let close = |a: f64, b: f64| (a - b).abs() <= 1e-9 * b.abs().max(1e-3);
    let check = |set: &str, z: u32, shell: usize, kind: SlaterShell, zeta: f64| {
        let m = if set == "sto-3g" { 3 } else { 6 };
        let ours = sto_ng::scaled(kind, m, zeta).unwrap();
        let theirs = &named::shells(set, z).unwrap()[shell].primitives;
        for (o, t) in ours.iter().zip(theirs) {
            assert!(
                close(o.0, t.0),
                "{set} Z = {z} {kind:?}: exponent {} vs {}",
                o.0,
                t.0
            );
            assert!(
                close(o.1, t.1),
                "{set} Z = {z} {kind:?}: coefficient {} vs {}",
                o.1,
                t.1
            );
        }
    };
    for set in named::NAMES {
        check(set, 1, 0, SlaterShell::S1, 1.24);
        check(set, 6, 0, SlaterShell::S1, 5.67);
        check(set, 6, 1, SlaterShell::S2, 1.72);
        check(set, 6, 2, SlaterShell::P2, 1.72);
        let m = if set == "sto-3g" { 3 } else { 6 };
        for z in 11..=18 {
            let shells = named::shells(set, z).unwrap();
            for (shell, kind) in [(3, SlaterShell::S3), (4, SlaterShell::P3)] {
                let ours = sto_ng::expansion(kind, m).unwrap();
                for (o, t) in ours.iter().zip(&shells[shell].primitives) {
                    assert!(
                        close(o.1, t.1),
                        "{set} Z = {z} {kind:?}: {} vs {}",
                        o.1,
                        t.1
                    );
                }
            }
        }
    }
}
