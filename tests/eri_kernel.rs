//! The electron-repulsion kernel against independent references: a closed form for
//! s primitives, a published H2 table, the nuclear-attraction engine in the limit of
//! a point-like charge distribution, permutational symmetry and rotational
//! invariance (the Boys function has its own file, `boys_reference.rs`).

use lobecast::basis::{BasisSpec, GaussianShell};
use lobecast::chem::Molecule;
use lobecast::integrals::gaussian::{CartesianShell, nuclear_block};
use lobecast::integrals::two_electron::{PackedEri, eri_quartet};
use std::f64::consts::PI;

/// Deterministic pseudo-random numbers in [0, 1) (a 64-bit LCG, Knuth's MMIX
/// constants; common practice).
struct Lcg(u64);
impl Lcg {
    fn next(&mut self) -> f64 {
        self.0 = self
            .0
            .wrapping_mul(6364136223846793005)
            .wrapping_add(1442695040888963407);
        (self.0 >> 11) as f64 / (1u64 << 53) as f64
    }
    fn point(&mut self, r: f64) -> [f64; 3] {
        [0, 1, 2].map(|_| r * (2.0 * self.next() - 1.0))
    }
    /// A shell of angular momentum l with 1–3 primitives, at a random point.
    fn shell_near(&mut self, l: u32, r: f64, pure: bool) -> GaussianShell {
        let c = self.point(r);
        self.shell(l, c, pure)
    }
    /// A shell of angular momentum l with 1–3 primitives.
    fn shell(&mut self, l: u32, center: [f64; 3], pure: bool) -> GaussianShell {
        let n = 1 + (self.next() * 3.0) as usize;
        let prims = (0..n)
            .map(|k| (0.2 + 3.0 * self.next() / (k + 1) as f64, 0.3 + self.next()))
            .collect();
        GaussianShell::full(0, center, l, prims, pure).unwrap()
    }
}

fn dist2(a: [f64; 3], b: [f64; 3]) -> f64 {
    (0..3).map(|k| (a[k] - b[k]).powi(2)).sum()
}

/// F₀(T) = ½ √(π/T) erf(√T), Taylor series below 1e-8 (textbook identity).
fn f0(t: f64) -> f64 {
    if t < 1e-8 {
        1.0 - t / 3.0
    } else {
        0.5 * (PI / t).sqrt() * libm::erf(t.sqrt())
    }
}

#[test]
fn four_centre_s_primitives_match_the_closed_form() {
    // Szabo & Ostlund, Modern Quantum Chemistry, appendix A, eq. (A.41), times the
    // normalisations (2α/π)^(3/4) of the four primitives.
    let mut rng = Lcg(7);
    let (mut worst, mut compared) = (0.0f64, 0);
    for _ in 0..200 {
        let e: [f64; 4] = [0, 1, 2, 3].map(|_| 0.05 + 20.0 * rng.next().powi(2));
        let c: [[f64; 3]; 4] = [0, 1, 2, 3].map(|_| rng.point(1.5));
        let s: Vec<GaussianShell> = (0..4)
            .map(|k| GaussianShell::full(0, c[k], 0, vec![(e[k], 1.0)], true).unwrap())
            .collect();
        let got = eri_quartet(&s[0], &s[1], &s[2], &s[3]).unwrap()[0];
        let (p, q) = (e[0] + e[1], e[2] + e[3]);
        let pc: [f64; 3] = std::array::from_fn(|k| (e[0] * c[0][k] + e[1] * c[1][k]) / p);
        let qc: [f64; 3] = std::array::from_fn(|k| (e[2] * c[2][k] + e[3] * c[3][k]) / q);
        let norm: f64 = e.iter().map(|a| (2.0 * a / PI).powf(0.75)).product();
        let want = norm * 2.0 * PI.powf(2.5) / (p * q * (p + q).sqrt())
            * (-e[0] * e[1] / p * dist2(c[0], c[1]) - e[2] * e[3] / q * dist2(c[2], c[3])).exp()
            * f0(p * q / (p + q) * dist2(pc, qc));
        // Primitive pairs with e^(−μ|AB|²) < 1e-20 are dropped by design (pair.rs):
        // there only an absolute bound applies.
        let kab = (-e[0] * e[1] / p * dist2(c[0], c[1])).exp();
        let kcd = (-e[2] * e[3] / q * dist2(c[2], c[3])).exp();
        if kab < 1e-20 || kcd < 1e-20 {
            assert!((got - want).abs() < 1e-18, "{got:e} vs {want:e}");
            continue;
        }
        compared += 1;
        worst = worst.max((got - want).abs() / want.abs());
    }
    println!("(ss|ss) vs closed form, {compared} cases: worst relative deviation {worst:.2e}");
    assert!(compared > 150);
    assert!(worst < 1e-13, "{worst:e}");
}

#[test]
fn h2_sto3g_matches_the_published_table() {
    // Szabo & Ostlund, Modern Quantum Chemistry, eq. (3.235), H2 STO-3G at
    // R = 1.4 bohr, ζ = 1.24 (values from memory, 4 decimals as printed).
    let m = Molecule::from_symbols(&[("H", [0.0, 0.0, 0.0]), ("H", [0.0, 0.0, 1.4])], 0).unwrap();
    let basis = BasisSpec::named("sto-3g").build(&m).unwrap();
    let eri = PackedEri::build(&basis, 0.0, &mut |_| {}).unwrap();
    for ((i, j, k, l), want) in [
        ((0, 0, 0, 0), 0.7746),
        ((0, 0, 1, 1), 0.5697),
        ((1, 0, 0, 0), 0.4441),
        ((1, 0, 1, 0), 0.2970),
    ] {
        let got = eri.get(i, j, k, l);
        println!(
            "H2 ({}{}|{}{}) = {got:.6} (published {want})",
            i + 1,
            j + 1,
            k + 1,
            l + 1
        );
        assert!(
            (got - want).abs() < 1e-4,
            "({i}{j}|{k}{l}) = {got}, published {want}"
        );
    }
}

fn cart(g: &GaussianShell) -> CartesianShell<'_> {
    CartesianShell {
        l: g.l,
        center: g.center,
        exponents: &g.exponents,
        coefficients: &g.d,
    }
}

/// rows_a · C · rows_bᵀ (from Cartesian components to the shells' functions).
fn to_functions(a: &GaussianShell, b: &GaussianShell, cart: &[f64]) -> Vec<f64> {
    let nbc = b.rows[0].len();
    let mut out = vec![0.0; a.len() * b.len()];
    for (fa, ra) in a.rows.iter().enumerate() {
        for (fb, rb) in b.rows.iter().enumerate() {
            for (i, wa) in ra.iter().enumerate() {
                for (j, wb) in rb.iter().enumerate() {
                    out[fa * b.len() + fb] += wa * wb * cart[i * nbc + j];
                }
            }
        }
    }
    out
}

#[test]
fn point_like_ket_tends_to_nuclear_attraction() {
    // With c = d a normalised s primitive of exponent γ, |φ_c|² is a unit charge of
    // exponent 2γ, whose potential is erf(√(2γ) r)/r, so
    // (ab|cc) = ∫ φ_a φ_b / |r − C| − (π / 2γ) φ_a(C) φ_b(C) + O(γ⁻²)
    // (∫ erfc(k r)/r d³r = π/k²; Helgaker, Jørgensen, Olsen, eq. 9.8.27 for the
    // potential). The reference is the one-electron engine's nuclear block (its own
    // Hermite Coulomb table, no two-electron code).
    let mut rng = Lcg(11);
    let cpt = [0.3, -0.4, 0.5];
    let gamma = 1e5;
    let tight = GaussianShell::full(0, cpt, 0, vec![(gamma, 1.0)], true).unwrap();
    let mut worst = 0.0f64;
    for (la, lb) in [(0, 3), (1, 2), (2, 2), (3, 3), (2, 1), (3, 0)] {
        for pure in [true, false] {
            let (ca, cb) = (rng.point(1.2), rng.point(1.2));
            let a = rng.shell(la, ca, pure);
            let b = rng.shell(lb, cb, !pure);
            let got = eri_quartet(&a, &b, &tight, &tight).unwrap();
            let v = to_functions(&a, &b, &nuclear_block(&cart(&a), &cart(&b), &[(1.0, cpt)]));
            let (mut va, mut vb) = (vec![0.0; a.len()], vec![0.0; b.len()]);
            a.values(&[cpt], &mut va);
            b.values(&[cpt], &mut vb);
            let scale = v.iter().fold(0.0f64, |m, x| m.max(x.abs()));
            for fa in 0..a.len() {
                for fb in 0..b.len() {
                    let want = -v[fa * b.len() + fb] - PI / (2.0 * gamma) * va[fa] * vb[fb];
                    let dev = (got[fa * b.len() + fb] - want).abs() / scale;
                    worst = worst.max(dev);
                }
            }
        }
    }
    println!("(ab|cc), γ = 1e5, vs nuclear attraction: worst deviation {worst:.2e} of the block");
    assert!(worst < 1e-8, "{worst:e}");
}

/// Index of function quartet f in a block [fa][fb][fc][fd] of shells with sizes n.
fn at(n: [usize; 4], f: [usize; 4]) -> usize {
    ((f[0] * n[1] + f[1]) * n[2] + f[2]) * n[3] + f[3]
}

#[test]
fn all_eight_permutations_agree() {
    // (ab|cd) = (ba|cd) = (ab|dc) = (cd|ab) = … for real functions (the symmetry of
    // the Coulomb integral; Szabo & Ostlund eq. 2.119). Each permutation takes a
    // different route through the kernel (bra/ket roles, signs, transposition).
    let perms = [
        [0, 1, 2, 3],
        [1, 0, 2, 3],
        [0, 1, 3, 2],
        [1, 0, 3, 2],
        [2, 3, 0, 1],
        [3, 2, 0, 1],
        [2, 3, 1, 0],
        [3, 2, 1, 0],
    ];
    let mut rng = Lcg(3);
    let mut worst = 0.0f64;
    for ls in [
        [3, 3, 3, 3],
        [3, 2, 1, 0],
        [0, 1, 2, 3],
        [2, 2, 1, 3],
        [1, 3, 0, 2],
        [2, 0, 3, 1],
    ] {
        for pure in [[true; 4], [false; 4], [true, false, false, true]] {
            let s: Vec<GaussianShell> = (0..4)
                .map(|k| rng.shell_near(ls[k], 1.0, pure[k]))
                .collect();
            let n = [0, 1, 2, 3].map(|k| s[k].len());
            let base = eri_quartet(&s[0], &s[1], &s[2], &s[3]).unwrap();
            let scale = base.iter().fold(0.0f64, |m, v| m.max(v.abs()));
            assert!(scale > 1e-3);
            for p in &perms[1..] {
                let other = eri_quartet(&s[p[0]], &s[p[1]], &s[p[2]], &s[p[3]]).unwrap();
                let np = p.map(|k| n[k]);
                for (i, &b) in base.iter().enumerate() {
                    let mut f = [0; 4];
                    let mut rest = i;
                    for k in (0..4).rev() {
                        f[k] = rest % n[k];
                        rest /= n[k];
                    }
                    let v = other[at(np, p.map(|k| f[k]))];
                    worst = worst.max((v - b).abs() / scale);
                }
            }
        }
    }
    println!("8 permutations, l ≤ 3: worst deviation {worst:.2e} of the block");
    assert!(worst < 1e-13, "{worst:e}");
}

fn rotate(m: &[[f64; 3]; 3], v: [f64; 3]) -> [f64; 3] {
    std::array::from_fn(|i| (0..3).map(|j| m[i][j] * v[j]).sum())
}

#[test]
fn quartet_norm_is_rotationally_invariant() {
    // Rotating all centres turns the 2l+1 real solid harmonics of a pure shell into
    // an orthogonal combination of themselves, so Σ (ab|cd)² over a block is
    // invariant (group theory; common practice). Tests d and f in every slot.
    let mut rng = Lcg(5);
    let (axis, angle) = ([0.3f64, -0.5, 0.81], 1.1f64);
    let norm = axis.iter().map(|a| a * a).sum::<f64>().sqrt();
    let [x, y, z] = axis.map(|a| a / norm);
    let (c, s) = (angle.cos(), angle.sin());
    // Rodrigues' rotation formula.
    let m = [
        [
            c + x * x * (1.0 - c),
            x * y * (1.0 - c) - z * s,
            x * z * (1.0 - c) + y * s,
        ],
        [
            y * x * (1.0 - c) + z * s,
            c + y * y * (1.0 - c),
            y * z * (1.0 - c) - x * s,
        ],
        [
            z * x * (1.0 - c) - y * s,
            z * y * (1.0 - c) + x * s,
            c + z * z * (1.0 - c),
        ],
    ];
    let mut worst = 0.0f64;
    for ls in [[2, 3, 2, 3], [3, 3, 1, 2], [2, 2, 2, 2], [3, 1, 0, 3]] {
        let s: Vec<GaussianShell> = (0..4).map(|k| rng.shell_near(ls[k], 1.3, true)).collect();
        let turned: Vec<GaussianShell> = s
            .iter()
            .map(|g| {
                GaussianShell::full(0, rotate(&m, g.center), g.l, g.primitives.clone(), true)
                    .unwrap()
            })
            .collect();
        let sq = |b: Vec<f64>| b.iter().map(|v| v * v).sum::<f64>();
        let before = sq(eri_quartet(&s[0], &s[1], &s[2], &s[3]).unwrap());
        let after = sq(eri_quartet(&turned[0], &turned[1], &turned[2], &turned[3]).unwrap());
        worst = worst.max((before - after).abs() / before);
    }
    println!("Σ (ab|cd)² under rotation: worst relative change {worst:.2e}");
    assert!(worst < 1e-12, "{worst:e}");
}
