//! J and K from the in-core store and from direct builds against a brute-force
//! quadruple sum, the Schwarz inequality, dipole integrals against closed forms,
//! and refusals of what the engine cannot treat.

use lobecast::basis::{Angular, Basis, BasisSpec, GaussianShell, Shell, SlaterShell};
use lobecast::chem::Molecule;
use lobecast::error::Kind;
use lobecast::integrals::dipole_matrices;
use lobecast::integrals::two_electron::{DirectJk, PackedEri, TwoElectron, schwarz};
use nalgebra::DMatrix;
use std::f64::consts::PI;

/// Water (geometry common practice, bohr) in STO-3G plus a Cartesian d shell on O
/// and a pure f shell on one H: every angular momentum the engine treats.
fn water_with_d_and_f() -> (Molecule, Basis) {
    let m = Molecule::from_symbols(
        &[
            ("O", [0.0, 0.0, 0.2217]),
            ("H", [0.0, 1.4309, -0.8867]),
            ("H", [0.0, -1.4309, -0.8867]),
        ],
        0,
    )
    .unwrap();
    let mut basis = BasisSpec::named("sto-3g").build(&m).unwrap();
    let o = m.atoms[0].position;
    let h = m.atoms[1].position;
    let d = GaussianShell::full(0, o, 2, vec![(1.2, 0.6), (0.4, 0.5)], false).unwrap();
    let f = GaussianShell::full(1, h, 3, vec![(0.9, 1.0)], true).unwrap();
    basis.shells.push(Shell::Gaussian(d));
    basis.shells.push(Shell::Gaussian(f));
    (m, basis)
}

/// A symmetric matrix with entries in [−1, 1) from a 64-bit LCG (common practice).
fn random_symmetric(n: usize, seed: u64) -> DMatrix<f64> {
    let mut s = seed;
    let mut next = || {
        s = s
            .wrapping_mul(6364136223846793005)
            .wrapping_add(1442695040888963407);
        2.0 * ((s >> 11) as f64 / (1u64 << 53) as f64) - 1.0
    };
    let mut m = DMatrix::zeros(n, n);
    for i in 0..n {
        for j in 0..=i {
            let v = next();
            m[(i, j)] = v;
            m[(j, i)] = v;
        }
    }
    m
}

fn max_abs_diff(a: &DMatrix<f64>, b: &DMatrix<f64>) -> f64 {
    (a - b).iter().fold(0.0f64, |m, v| m.max(v.abs()))
}

#[test]
fn packed_direct_and_brute_force_agree() {
    // The definitions J_μν = Σ (μν|λσ) D_λσ and K_μν = Σ (μλ|νσ) D_λσ summed over all
    // n⁴ index quadruples (no symmetry used) are the reference for both builders.
    let (_, basis) = water_with_d_and_f();
    let n = basis.len();
    assert_eq!(n, 7 + 6 + 7);
    let eri = PackedEri::build(&basis, 1e-14, &mut |_| {}).unwrap();
    let direct = DirectJk::new(&basis, 1e-14).unwrap();
    let (d1, d2) = (random_symmetric(n, 1), random_symmetric(n, 2));
    let mut brute = Vec::new();
    for d in [&d1, &d2] {
        let (mut j, mut k) = (DMatrix::<f64>::zeros(n, n), DMatrix::<f64>::zeros(n, n));
        for m in 0..n {
            for v in 0..n {
                for l in 0..n {
                    for s in 0..n {
                        j[(m, v)] += eri.get(m, v, l, s) * d[(l, s)];
                        k[(m, v)] += eri.get(m, l, v, s) * d[(l, s)];
                    }
                }
            }
        }
        brute.push((j, k));
    }
    let packed = eri.jk(&[&d1, &d2]);
    let direct = direct.jk(&[&d1, &d2]);
    let mut worst = 0.0f64;
    for ((bj, bk), ((pj, pk), (dj, dk))) in brute.iter().zip(packed.iter().zip(&direct)) {
        assert!(bj.iter().any(|v| v.abs() > 1.0) && bk.iter().any(|v| v.abs() > 1.0));
        for (x, y) in [(bj, pj), (bk, pk), (bj, dj), (bk, dk), (pj, dj), (pk, dk)] {
            worst = worst.max(max_abs_diff(x, y));
        }
    }
    println!("J/K packed vs direct vs brute force: worst |Δ| {worst:.2e}");
    assert!(worst < 1e-10, "{worst:e}");
}

#[test]
fn direct_density_screening_drops_only_what_it_may() {
    // A density change confined to one shell-pair block, as an incremental SCF
    // produces: J/K must still match the store (same definitions as above).
    let (_, basis) = water_with_d_and_f();
    let n = basis.len();
    let eri = PackedEri::build(&basis, 1e-14, &mut |_| {}).unwrap();
    let direct = DirectJk::new(&basis, 1e-12).unwrap();
    let mut dd = DMatrix::zeros(n, n);
    dd[(8, 8)] = 1e-3;
    dd[(8, 2)] = 2e-4;
    dd[(2, 8)] = 2e-4;
    let (pj, pk) = &eri.jk(&[&dd])[0];
    let (dj, dk) = &direct.jk(&[&dd])[0];
    let dev = max_abs_diff(pj, dj).max(max_abs_diff(pk, dk));
    let size = pj
        .iter()
        .chain(pk.iter())
        .fold(0.0f64, |m, v| m.max(v.abs()));
    println!("ΔD in one block: |Δ| {dev:.2e}, largest element {size:.2e}");
    assert!(size > 1e-4);
    assert!(dev < 1e-11, "{dev:e}");
    let zero = &direct.jk(&[&DMatrix::zeros(n, n)])[0];
    assert!(zero.0.iter().chain(zero.1.iter()).all(|v| *v == 0.0));
}

#[test]
fn schwarz_bounds_every_integral() {
    // Cauchy–Schwarz: |(ab|cd)| ≤ √(ab|ab) √(cd|cd) (the integral is an inner product).
    let (_, basis) = water_with_d_and_f();
    let q = schwarz(&basis).unwrap();
    let eri = PackedEri::build(&basis, 0.0, &mut |_| {}).unwrap();
    let shell_of: Vec<usize> = basis
        .shells
        .iter()
        .enumerate()
        .flat_map(|(s, sh)| std::iter::repeat_n(s, sh.len()))
        .collect();
    let n = basis.len();
    let mut tightest = 0.0f64;
    for i in 0..n {
        for j in 0..n {
            for k in 0..n {
                for l in 0..n {
                    let bound = q[(shell_of[i], shell_of[j])] * q[(shell_of[k], shell_of[l])];
                    let v = eri.get(i, j, k, l).abs();
                    assert!(
                        v <= bound * (1.0 + 1e-12),
                        "({i}{j}|{k}{l}) = {v} > {bound}"
                    );
                    tightest = tightest.max(v / bound);
                }
            }
        }
    }
    // The bound is attained on the diagonal (ab|ab) of the largest element.
    assert!((tightest - 1.0).abs() < 1e-12, "{tightest}");
    assert_eq!(q.shape(), (basis.shells.len(), basis.shells.len()));
}

#[test]
fn build_reports_progress_and_sizes() {
    let (_, basis) = water_with_d_and_f();
    let n = basis.len();
    let mut seen = Vec::new();
    let eri = PackedEri::build(&basis, 1e-12, &mut |f| seen.push(f)).unwrap();
    assert!(seen.windows(2).all(|w| w[0] <= w[1]), "{seen:?}");
    assert_eq!(*seen.last().unwrap(), 1.0);
    // n(n+1)/2 pairs, then pairs of pairs (8-fold symmetry; common practice).
    let pairs = n * (n + 1) / 2;
    assert_eq!(eri.len(), pairs * (pairs + 1) / 2);
    assert_eq!(PackedEri::bytes_for(n), Some(8 * eri.len() as u64));
    assert_eq!(PackedEri::bytes_for(2), Some(48));
    assert_eq!(PackedEri::bytes_for(0), Some(0));
    assert_eq!(PackedEri::bytes_for(usize::MAX), None);
    assert_eq!(PackedEri::bytes_for(1 << 17), None); // 2^65 values
    assert!(PackedEri::bytes_for(1 << 14).is_some());
    assert!(eri.describe().starts_with("stored in memory"));
}

#[test]
fn dipole_integrals_match_closed_forms() {
    // Closed forms for normalised primitives, from the Gaussian product theorem
    // (Szabo & Ostlund, appendix A): with p = a + b, P = (aA + bB)/p,
    // K = e^(−ab/p |AB|²): ⟨s|x−O|s⟩ = K (π/p)^(3/2) X_PO N_a N_b, and for p_x on A
    // ⟨p_x|x−O|s⟩ = K (π/p)^(3/2) (1/(2p) + X_PA X_PO) N_a N_b,
    // ⟨p_x|y−O|s⟩ = K (π/p)^(3/2) X_PA Y_PO N_a N_b.
    let (a, b) = (0.8, 1.3);
    let (ca, cb) = ([0.2, -0.5, 0.9], [-0.7, 0.4, 0.1]);
    let origin = [0.3, 0.25, -0.6];
    let s_a = GaussianShell::full(0, ca, 0, vec![(a, 1.0)], true).unwrap();
    let p_a = GaussianShell::full(0, ca, 1, vec![(a, 1.0)], false).unwrap();
    let s_b = GaussianShell::full(1, cb, 0, vec![(b, 1.0)], true).unwrap();
    let basis = Basis {
        name: "test".into(),
        shells: vec![
            Shell::Gaussian(s_a),
            Shell::Gaussian(p_a),
            Shell::Gaussian(s_b),
        ],
    };
    let m = dipole_matrices(&basis, origin).unwrap();
    // One normalised s function: ⟨s|x−O|s⟩ = (A_x − O_x) exactly.
    for k in 0..3 {
        assert!((m[k][(0, 0)] - (ca[k] - origin[k])).abs() < 1e-15);
    }
    let p = a + b;
    let pc: [f64; 3] = std::array::from_fn(|k| (a * ca[k] + b * cb[k]) / p);
    let ab2: f64 = (0..3).map(|k| (ca[k] - cb[k]).powi(2)).sum();
    let kab = (-a * b / p * ab2).exp() * (PI / p).powf(1.5);
    let ns = |e: f64| (2.0 * e / PI).powf(0.75);
    let np = ns(a) * (4.0 * a).sqrt();
    let mut worst = 0.0f64;
    for k in 0..3 {
        let ss = kab * (pc[k] - origin[k]) * ns(a) * ns(b);
        worst = worst.max((m[k][(0, 4)] - ss).abs());
        for c in 0..3 {
            // Function 1 + c is p along c (Cartesian order x, y, z).
            let mut v = (pc[c] - ca[c]) * (pc[k] - origin[k]);
            if c == k {
                v += 0.5 / p;
            }
            let want = kab * v * np * ns(b);
            worst = worst.max((m[k][(1 + c, 4)] - want).abs());
            worst = worst.max((m[k][(4, 1 + c)] - want).abs());
        }
    }
    println!("dipole integrals vs closed forms: worst |Δ| {worst:.2e}");
    assert!(worst < 1e-15, "{worst:e}");
}

#[test]
fn unsupported_input_is_an_input_error() {
    let m = Molecule::from_symbols(&[("H", [0.0; 3]), ("H", [0.0, 0.0, 1.4])], 0).unwrap();
    let slater = BasisSpec::named("slater-1s").build(&m).unwrap();
    assert!(matches!(slater.shells[0], Shell::Slater(_)));
    let mixed = Basis {
        name: "mixed".into(),
        shells: vec![Shell::Slater(SlaterShell::s1(0, [0.0; 3], 1.0).unwrap())],
    };
    // A shell of l = 4 can only be made by hand (GaussianShell::new refuses it).
    let mut g = GaussianShell::full(0, [0.0; 3], 3, vec![(1.0, 1.0)], true).unwrap();
    g.l = 4;
    let high = Basis {
        name: "g".into(),
        shells: vec![Shell::Gaussian(g)],
    };
    // Eleven functions on an f shell: GaussianShell::new accepts repeated ones.
    let mut fs: Vec<Angular> = (-3..=3).map(Angular::Pure).collect();
    fs.extend((-3..=0).map(Angular::Pure));
    let crowded = GaussianShell::new(0, [0.0; 3], 3, vec![(1.0, 1.0)], fs).unwrap();
    let crowded = Basis {
        name: "f".into(),
        shells: vec![Shell::Gaussian(crowded)],
    };
    for b in [&slater, &mixed, &high, &crowded] {
        let kinds = [
            PackedEri::build(b, 1e-12, &mut |_| {})
                .err()
                .map(|e| e.kind),
            DirectJk::new(b, 1e-12).err().map(|e| e.kind),
            schwarz(b).err().map(|e| e.kind),
            dipole_matrices(b, [0.0; 3]).err().map(|e| e.kind),
        ];
        assert!(kinds.iter().all(|k| *k == Some(Kind::Input)), "{kinds:?}");
    }
}
