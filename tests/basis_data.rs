//! Checks of the embedded basis data: the named sets (`sto-3g`, `sto-6g`, `3-21g`,
//! `6-31g`, `6-31g*`, `6-31g**`, `cc-pvdz`; H–Ar) and the ζ = 1 STO-nG expansions.
//! Why: the data are imported reference numbers, and these properties (shell
//! structure, function counts, normalisation, least-squares optimality, the ζ²
//! scaling that links the two STO tables) catch a wrong, shifted or truncated digit.

use lobecast::basis::named::{self, AngularForm, NamedShell};
use lobecast::basis::sto_ng::{self, MAX_GAUSSIANS, SlaterShell};
use lobecast::basis::{Basis, BasisSpec};
use lobecast::chem::Molecule;

/// The minimal STO-nG sets among `named::NAMES`.
const STO: [&str; 2] = ["sto-3g", "sto-6g"];

/// The split-valence, polarised and correlation-consistent sets.
const EXTENDED: [&str; 5] = ["3-21g", "6-31g", "6-31g*", "6-31g**", "cc-pvdz"];

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
    for set in STO {
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
    // Coefficients multiply normalised primitives (Hehre, Stewart, Pople 1969; the
    // same for the Pople and Dunning sets), so each contracted function as printed
    // must have norm 1 up to the rounding of its digits: the STO-nG and Pople sets
    // print 10 significant digits (measured worst 9.4e-10, 6-31G Ne 2s), cc-pVDZ 6
    // (relative rounding up to 5e-7 per coefficient; measured worst 2.8e-6, Al 3p).
    for set in named::NAMES {
        let tol = if set == "cc-pvdz" { 1e-5 } else { 1e-8 };
        for z in 1..=18 {
            for NamedShell { l, primitives } in named::shells(set, z).unwrap() {
                let n2 = norm2(l, &primitives);
                assert!((n2 - 1.0).abs() < tol, "{set} Z = {z} l = {l}: {n2}");
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
    for set in STO {
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

fn one_atom(z: u32) -> Molecule {
    let symbol = lobecast::chem::elements::by_number(z).unwrap().symbol;
    Molecule::from_symbols(&[(symbol, [0.0, 0.0, 0.0])], 0).unwrap()
}

fn build(set: &str, z: u32, form: Option<AngularForm>) -> (Molecule, Basis) {
    let m = one_atom(z);
    let mut spec = BasisSpec::named(set);
    if let Some(f) = form {
        spec = spec.with_functions(f);
    }
    let b = spec.build(&m).unwrap();
    (m, b)
}

/// Every contracted function of every extended set, pure and Cartesian, has
/// ⟨φ|φ⟩ = 1 by the integral engine (the convention that every basis function and
/// every Cartesian component is normalised to 1). 1e-8 is far above the rounding of
/// the overlap sums (~1e-15) and far below any missing factor such as the 1/3 of a
/// Cartesian xx against yy.
#[test]
fn every_function_of_the_extended_sets_has_norm_one() {
    let mut worst = 0.0f64;
    for set in EXTENDED {
        for z in 1..=18 {
            for form in [AngularForm::Pure, AngularForm::Cartesian] {
                let (m, b) = build(set, z, Some(form));
                let s = lobecast::integrals::overlap_matrix(&m, &b).unwrap();
                let labels = b.function_labels();
                for (i, (_, label)) in labels.iter().enumerate() {
                    let e = (s[(i, i)] - 1.0).abs();
                    assert!(e < 1e-8, "{set} Z = {z} {form:?} {label}: {}", s[(i, i)]);
                    worst = worst.max(e);
                }
            }
        }
    }
    eprintln!("extended sets, H–Ar, pure and Cartesian: worst |<phi|phi> - 1| = {worst:.1e}");
}

/// Number of basis functions per element with each set's own convention (Pople
/// Cartesian d, cc-pVDZ pure d). Source: the shells basis-set-exchange 0.12 gives,
/// as tools/import_bse.py prints them (pure / Cartesian per element); they agree
/// with the published contractions, e.g. 6-31G* C [3s2p1d] = 15 with six Cartesian
/// d (Hariharan, Pople 1973), cc-pVDZ C [3s2p1d] = 14 and H [2s1p] = 5 (Dunning
/// 1989), cc-pVDZ Al–Ar [4s3p1d] = 18 (Woon, Dunning 1993), 3-21G Cl [4s3p] = 13
/// (Gordon et al. 1982); the bracketed contractions from memory.
#[test]
fn function_counts_per_element_are_the_published_ones() {
    // (set, H–He, Li–Ne, Na–Ar)
    let expected = [
        ("3-21g", 2, 9, 13),
        ("6-31g", 2, 9, 13),
        ("6-31g*", 2, 15, 19),
        ("6-31g**", 5, 15, 19),
        ("cc-pvdz", 5, 14, 18),
    ];
    for (set, first, second, third) in expected {
        for z in 1..=18 {
            let want = match z {
                1..=2 => first,
                3..=10 => second,
                _ => third,
            };
            let (_, b) = build(set, z, None);
            assert_eq!(b.len(), want, "{set} Z = {z}");
        }
    }
    // The examples as usually quoted (from memory): 6-31G* C 15, cc-pVDZ C 14,
    // 6-31G** H 5, cc-pVDZ H 5, 3-21G Cl 13.
    for (set, z, n) in [
        ("6-31G*", 6, 15),
        ("cc-pVDZ", 6, 14),
        ("6-31G**", 1, 5),
        ("cc-pVDZ", 1, 5),
        ("3-21G", 17, 13),
    ] {
        assert_eq!(build(set, z, None).1.len(), n, "{set} Z = {z}");
    }
    // The override: cc-pVDZ C with six Cartesian d has 15 functions.
    assert_eq!(
        build("cc-pvdz", 6, Some(AngularForm::Cartesian)).1.len(),
        15
    );
}

/// The shell structure of the extended sets, H–Ar (basis-set-exchange 0.12 as
/// imported; general contractions of cc-pVDZ split one shell per column, so its
/// shells share exponents). A lost or duplicated shell fails here.
#[test]
fn extended_sets_have_the_expected_shells_and_share_exponents_where_contracted_generally() {
    let ls = |set: &str, z: u32| -> Vec<u32> {
        named::shells(set, z).unwrap().iter().map(|s| s.l).collect()
    };
    assert_eq!(ls("3-21g", 1), [0, 0]);
    assert_eq!(ls("3-21g", 6), [0, 0, 1, 0, 1]);
    assert_eq!(ls("3-21g", 17), [0, 0, 1, 0, 1, 0, 1]);
    assert_eq!(ls("6-31g*", 6), [0, 0, 1, 0, 1, 2]);
    assert_eq!(ls("6-31g**", 1), [0, 0, 1]);
    assert_eq!(ls("cc-pvdz", 1), [0, 0, 1]);
    assert_eq!(ls("cc-pvdz", 6), [0, 0, 0, 1, 1, 2]);
    assert_eq!(ls("cc-pvdz", 17), [0, 0, 0, 0, 1, 1, 1, 2]);
    for z in 1..=18 {
        let shells = named::shells("cc-pvdz", z).unwrap();
        for l in 0..=1 {
            let exps: Vec<Vec<f64>> = shells
                .iter()
                .filter(|s| s.l == l)
                .map(|s| s.primitives.iter().map(|p| p.0).collect())
                .collect();
            assert!(
                exps.windows(2).all(|w| w[0] == w[1]),
                "cc-pvdz Z = {z} l = {l}"
            );
        }
    }
    for set in EXTENDED {
        assert!(named::shells(set, 19).is_none(), "{set}");
    }
}
