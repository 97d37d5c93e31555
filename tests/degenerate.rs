//! Degenerate orbitals in their canonical form: linear molecules give pure p_x and
//! p_y π members, the form does not depend on how the solver happened to mix a set,
//! and the rotation leaves energies, occupations, orthonormality and the density as
//! they were.

mod common;

use lobecast::basis::BasisSpec;
use lobecast::solve::OrbitalSet;
use lobecast::solve::degenerate::{canonicalise, sets};
use lobecast::solve::huckel::solve;
use lobecast::solve::huckel_params::HuckelOptions;

use common::{benzene, molecule};

const CO2: &str = "3\nCO2\nC 0 0 0\nO 0 0 1.16\nO 0 0 -1.16\n";
const O2: &str = "2\nO2\nO 0 0 0\nO 0 0 1.21\n";

fn eht(xyz: &str) -> OrbitalSet {
    solve(&molecule(xyz, 0), &HuckelOptions::default()).unwrap()
}

/// Σ nᵢ cᵢcᵢᵀ over all orbitals.
fn density(set: &OrbitalSet) -> Vec<f64> {
    let n = set.basis.len();
    let mut d = vec![0.0; n * n];
    for o in &set.orbitals {
        for a in 0..n {
            for b in 0..n {
                d[a * n + b] += o.occupation * o.coefficients[a] * o.coefficients[b];
            }
        }
    }
    d
}

/// Mixes members i and j of a set by `angle`, as an eigensolver may return them.
fn mix(set: &mut OrbitalSet, i: usize, j: usize, angle: f64) {
    let (s, c) = angle.sin_cos();
    let (a, b) = (
        set.orbitals[i].coefficients.clone(),
        set.orbitals[j].coefficients.clone(),
    );
    for m in 0..a.len() {
        set.orbitals[i].coefficients[m] = c * a[m] + s * b[m];
        set.orbitals[j].coefficients[m] = -s * a[m] + c * b[m];
    }
}

/// Largest |coefficient| on functions whose label lacks `kind` ("px", "py", …).
fn off_axis(set: &OrbitalSet, index: usize, kind: &str) -> f64 {
    let labels = set.basis.function_labels();
    set.orbitals[index]
        .coefficients
        .iter()
        .zip(&labels)
        .filter(|(_, (_, l))| !l.contains(kind))
        .fold(0.0f64, |m, (c, _)| m.max(c.abs()))
}

fn max_diff(a: &[f64], b: &[f64]) -> f64 {
    a.iter()
        .zip(b)
        .fold(0.0f64, |m, (x, y)| m.max((x - y).abs()))
}

/// The largest coefficient of every member of every set is positive (our sign
/// rule; the first of equal magnitudes).
fn assert_signs(set: &OrbitalSet) {
    for r in sets(set) {
        for i in r {
            let c = &set.orbitals[i].coefficients;
            let max = c.iter().fold(0.0f64, |m, v| m.max(v.abs()));
            let first = c.iter().find(|v| v.abs() > max * (1.0 - 1e-9)).unwrap();
            assert!(*first > 0.0, "orbital {} starts negative", i + 1);
        }
    }
}

/// A linear molecule along z has π orbitals separable into an x and a y member
/// (C∞v/D∞h symmetry; common practice): after the rotation the x member has no
/// coefficient (below 1e-10) on any function but p_x, the y member none but p_y.
#[test]
fn co2_pi_pairs_are_pure_x_and_y() {
    let set = eht(CO2);
    let found = sets(&set);
    // 16 valence electrons: πu (4, 5), πg (7, 8) and πu* (9, 10) (common practice).
    assert_eq!(found, vec![3..5, 6..8, 8..10], "{found:?}");
    for r in &found {
        assert!(off_axis(&set, r.start, "px") < 1e-10, "{r:?} x member");
        assert!(off_axis(&set, r.start + 1, "py") < 1e-10, "{r:?} y member");
    }
    assert_signs(&set);
}

/// Whatever mixture the solver returns, the canonical form is the same, and the
/// rotation keeps energies and occupations bit for bit, the members orthonormal in
/// the overlap metric, and the closed-shell density (Σ nᵢcᵢcᵢᵀ, a rotation invariant
/// of equally occupied orbitals) to 1e-12.
#[test]
fn canonical_form_does_not_depend_on_the_mixture() {
    let reference = eht(CO2);
    let s = reference.overlap.clone().unwrap();
    for angle in [0.3, 0.78, 1.2, -2.5, 3.0] {
        let mut set = reference.clone();
        for r in sets(&set) {
            mix(&mut set, r.start, r.start + 1, angle);
        }
        let before = density(&set);
        let energies: Vec<f64> = set.orbitals.iter().map(|o| o.energy).collect();
        let occ: Vec<f64> = set.orbitals.iter().map(|o| o.occupation).collect();
        canonicalise(&mut set);
        assert!(max_diff(&before, &density(&set)) < 1e-12, "angle {angle}");
        for (i, o) in set.orbitals.iter().enumerate() {
            assert_eq!(o.energy, energies[i]);
            assert_eq!(o.occupation, occ[i]);
            let d = max_diff(&o.coefficients, &reference.orbitals[i].coefficients);
            assert!(d < 1e-10, "angle {angle}, orbital {}: {d:e}", i + 1);
        }
        for r in sets(&set) {
            for i in r.clone() {
                for j in r.clone() {
                    let (a, b) = (&set.orbitals[i].coefficients, &set.orbitals[j].coefficients);
                    let sij: f64 = (0..a.len())
                        .map(|m| a[m] * (0..b.len()).map(|n| s[(m, n)] * b[n]).sum::<f64>())
                        .sum();
                    let want = if i == j { 1.0 } else { 0.0 };
                    assert!((sij - want).abs() < 1e-12, "⟨{i}|{j}⟩ = {sij}");
                }
            }
        }
    }
}

/// O2 (12 valence electrons): the π* pair holds two electrons, one in each member
/// (Hund's rule gives the triplet ground state; common practice). The pair is pure
/// x and y, the density is unchanged by any mixing (equal occupations), and a note
/// says the two share their electrons.
#[test]
fn o2_half_filled_pair_is_marked_and_canonical() {
    let set = eht(O2);
    assert_eq!(sets(&set), vec![2..4, 5..7]);
    assert_eq!(set.orbitals[5].occupation, 1.0);
    assert_eq!(set.orbitals[6].occupation, 1.0);
    assert!(off_axis(&set, 5, "px") < 1e-10 && off_axis(&set, 6, "py") < 1e-10);
    assert!(
        set.notes.iter().any(|n| n
            == "orbitals 6 and 7 are degenerate (within 1e-6 eV) and share 2 electrons evenly (1.00 each)"),
        "{:?}",
        set.notes
    );
    let mut mixed = set.clone();
    mix(&mut mixed, 5, 6, 0.4);
    let before = density(&mixed);
    canonicalise(&mut mixed);
    assert!(max_diff(&before, &density(&mixed)) < 1e-12);
    assert!(
        max_diff(
            &mixed.orbitals[5].coefficients,
            &set.orbitals[5].coefficients
        ) < 1e-10
    );
}

/// Benzene's HOMO pair (e1g; common practice) comes out in one form whatever the
/// mixture, identical on a second solve, and each member is even or odd under the
/// reflection y → −y (a D6h mirror through C1 and C4): the even member, with more
/// weight along x, first.
#[test]
fn benzene_homo_pair_is_canonical_and_stable() {
    let set = eht(&benzene());
    let again = eht(&benzene());
    assert!(sets(&set).contains(&(13..15)), "{:?}", sets(&set));
    for (a, b) in set.orbitals.iter().zip(&again.orbitals) {
        assert_eq!(a.coefficients, b.coefficients, "a re-run changes nothing");
    }
    // C atoms k and 6 − k are mirror images under y → −y; H atoms 6 + k and 12 − k.
    let labels = set.basis.function_labels();
    let pz = |atom: usize| {
        labels
            .iter()
            .position(|(a, l)| *a == atom && l.contains("pz"))
            .unwrap()
    };
    for (index, parity) in [(13, 1.0), (14, -1.0)] {
        let c = &set.orbitals[index].coefficients;
        for k in 1..6 {
            let d = c[pz(k)] - parity * c[pz(6 - k)];
            assert!(
                d.abs() < 1e-10,
                "orbital {}: C{} vs C{}: {d:e}",
                index + 1,
                k + 1,
                7 - k
            );
        }
        assert!(
            off_axis(&set, index, "pz") < 1e-10,
            "π orbitals are pure p_z"
        );
    }
    assert!(
        set.orbitals[14].coefficients[pz(0)].abs() < 1e-10,
        "odd member has a node at C1"
    );
    for angle in [0.2, 1.0, 2.9] {
        let mut mixed = set.clone();
        mix(&mut mixed, 13, 14, angle);
        canonicalise(&mut mixed);
        for i in 13..15 {
            let d = max_diff(
                &mixed.orbitals[i].coefficients,
                &set.orbitals[i].coefficients,
            );
            assert!(d < 1e-10, "angle {angle}, orbital {}: {d:e}", i + 1);
        }
    }
    assert_signs(&set);
}

/// One-electron Gaussian case: Li²⁺ (one electron) in STO-3G has a triply degenerate
/// 2p level (a one-electron atom; common practice). Each member is a single p
/// function, in the order x, y, z, with coefficient +1 (functions normalised).
#[test]
fn one_electron_atom_p_level_is_x_y_z() {
    let m = molecule("1\nLi\nLi 0 0 0\n", 2);
    let basis = BasisSpec::named("sto-3g").build(&m).unwrap();
    let mut set = lobecast::solve::one_electron::solve(&m, &basis).unwrap();
    let found = sets(&set);
    assert_eq!(found, vec![2..5], "{found:?}");
    for (i, kind) in [(2, "x"), (3, "y"), (4, "z")] {
        let c = &set.orbitals[i].coefficients;
        let labels = set.basis.function_labels();
        let at = labels
            .iter()
            .position(|(_, l)| l.ends_with(kind) || l.contains(&format!("p{kind}")))
            .unwrap();
        assert!((c[at] - 1.0).abs() < 1e-10, "orbital {}: {c:?}", i + 1);
        assert!(
            max_diff(c, &{
                let mut e = vec![0.0; c.len()];
                e[at] = 1.0;
                e
            }) < 1e-10
        );
    }
    let before = set.clone();
    mix(&mut set, 2, 4, 0.9);
    mix(&mut set, 3, 4, -0.4);
    canonicalise(&mut set);
    for i in 2..5 {
        assert!(
            max_diff(
                &set.orbitals[i].coefficients,
                &before.orbitals[i].coefficients
            ) < 1e-10
        );
    }
}

/// `solve` marks each member of a degenerate set and names the set under the table.
#[test]
fn solve_output_marks_degenerate_sets() {
    let dir = std::env::temp_dir().join(format!("lobecast-degen-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    std::fs::write(dir.join("co2.xyz"), CO2).unwrap();
    std::fs::write(dir.join("o2.xyz"), O2).unwrap();
    let run = |file: &str| common::ok(&dir, &["solve", file, "--method", "extended-huckel"]);
    let text = run("co2.xyz");
    let row = |n: usize| {
        text.lines()
            .find(|l| l.split_whitespace().next() == Some(&n.to_string()))
            .unwrap()
            .to_string()
    };
    for (n, tag) in [
        (4, "D1"),
        (5, "D1"),
        (7, "D2"),
        (8, "D2"),
        (9, "D3"),
        (10, "D3"),
    ] {
        assert!(row(n).split_whitespace().any(|t| t == tag), "{}", row(n));
    }
    assert!(!row(6).contains(" D"), "{}", row(6));
    assert!(
        text.contains("D2: orbitals 7 and 8 are degenerate (within 1e-6 eV)"),
        "{text}"
    );
    let text = run("o2.xyz");
    assert!(
        text.contains("note: orbitals 6 and 7 are degenerate (within 1e-6 eV) and share 2 electrons evenly (1.00 each)"),
        "{text}"
    );
    std::fs::remove_dir_all(&dir).unwrap();
}
