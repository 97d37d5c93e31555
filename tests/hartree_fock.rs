//! Hartree–Fock against published values and exact invariances. The comparison
//! with a general-purpose reference library (PySCF) for many molecules and basis
//! sets is `.ci/interop/check_hf_pyscf.py`.

use lobecast::basis::{Basis, BasisSpec, GaussianShell, Shell};
use lobecast::chem::Molecule;
use lobecast::field::{Field, FieldSampler};
use lobecast::solve::orbitals::OrbitalSet;
use lobecast::solve::scf::{self, Guess, Reference, ScfOptions};

fn hf(molecule: &Molecule, basis: &Basis, reference: Reference) -> OrbitalSet {
    scf::solve(molecule, basis, &ScfOptions::new(reference), &mut |_| {}).unwrap()
}

fn total(set: &OrbitalSet) -> f64 {
    set.spin.total_energy.unwrap()
}

/// The STO-3G least-squares fit to a ζ = 1 Slater 1s function, (exponent,
/// coefficient): Szabo and Ostlund, Modern Quantum Chemistry, eq. 3.225 (from
/// memory). Exponents scale with ζ².
const STO3G_1S: [(f64, f64); 3] = [
    (2.227660, 0.154329),
    (0.405771, 0.535328),
    (0.109818, 0.444635),
];

/// One STO-3G 1s function per atom with the given Slater exponents.
fn sto3g_1s(molecule: &Molecule, zetas: &[f64]) -> Basis {
    let shells = molecule
        .atoms
        .iter()
        .zip(zetas)
        .enumerate()
        .map(|(i, (a, z))| {
            let prims = STO3G_1S.iter().map(|&(e, c)| (e * z * z, c)).collect();
            Shell::Gaussian(GaussianShell::full(i, a.position, 0, prims, true).unwrap())
        })
        .collect();
    Basis {
        name: "sto-3g".into(),
        shells,
    }
}

fn mol(atoms: &[(&str, [f64; 3])], charge: i32) -> Molecule {
    Molecule::from_symbols(atoms, charge).unwrap()
}

/// H₂ at R = 1.4 bohr in STO-3G (ζ = 1.24): E = −1.1167 hartree, orbital energies
/// −0.578 and +0.670 hartree (Szabo and Ostlund, §3.5.2; from memory).
#[test]
fn hydrogen_molecule_sto3g_matches_szabo_ostlund() {
    let m = mol(&[("H", [0.0, 0.0, 0.0]), ("H", [0.0, 0.0, 1.4])], 0);
    let set = hf(&m, &sto3g_1s(&m, &[1.24, 1.24]), Reference::Restricted);
    assert!((total(&set) + 1.1167).abs() < 1e-4, "{}", total(&set));
    assert!((set.orbitals[0].energy + 0.578).abs() < 1e-3);
    assert!((set.orbitals[1].energy - 0.670).abs() < 1e-3);
    // The named set reproduces the same numbers: its H exponents are 1.24² × the
    // ζ = 1 fit (Hehre, Stewart and Pople 1969).
    let named = BasisSpec::named("sto-3g").build(&m).unwrap();
    let e = total(&hf(&m, &named, Reference::Restricted));
    assert!((e - total(&set)).abs() < 1e-5, "{e}");
}

/// HeH⁺ at R = 1.4632 bohr in STO-3G with ζ(He) = 2.0925, ζ(H) = 1.24:
/// E = −2.860662 hartree (Szabo and Ostlund, §3.5.2; from memory).
#[test]
fn heh_cation_sto3g_matches_szabo_ostlund() {
    let m = mol(&[("He", [0.0, 0.0, 0.0]), ("H", [0.0, 0.0, 1.4632])], 1);
    let set = hf(&m, &sto3g_1s(&m, &[2.0925, 1.24]), Reference::Restricted);
    assert!((total(&set) + 2.8607).abs() < 1e-4, "{}", total(&set));
}

/// One electron: UHF is exact within the basis and equals the one-electron solver;
/// the STO-3G hydrogen atom has E = −0.466582 hartree (Szabo and Ostlund, eq. 3.228
/// area, from memory) and ⟨S²⟩ = 3/4 exactly.
#[test]
fn hydrogen_atom_uhf_is_the_one_electron_energy() {
    let m = mol(&[("H", [0.0, 0.0, 0.0])], 0);
    let b = BasisSpec::named("sto-3g").build(&m).unwrap();
    let set = hf(&m, &b, Reference::Unrestricted);
    assert!((total(&set) + 0.466582).abs() < 2e-6, "{}", total(&set));
    let (s2, exact) = set.spin.scf.as_ref().unwrap().s_squared.unwrap();
    assert!((s2 - 0.75).abs() < 1e-12 && (exact - 0.75).abs() < 1e-15);
    let one = lobecast::solve::one_electron::solve(&m, &b).unwrap();
    assert!((one.orbitals[0].energy - total(&set)).abs() < 1e-10);
}

fn water(rotate: bool, shift: [f64; 3]) -> Molecule {
    // Water near its experimental geometry (common practice: r = 0.958 Å, 104.5°),
    // in bohr.
    let pts = [
        [0.0, 0.0, 0.0],
        [1.4305, 0.0, 1.1075],
        [-1.4305, 0.0, 1.1075],
    ];
    let (c, s) = (0.6f64.cos(), 0.6f64.sin());
    let place = |p: [f64; 3]| {
        let q = if rotate {
            // A rotation about x then z, by 0.6 rad each.
            let r1 = [p[0], c * p[1] - s * p[2], s * p[1] + c * p[2]];
            [c * r1[0] - s * r1[1], s * r1[0] + c * r1[1], r1[2]]
        } else {
            p
        };
        [q[0] + shift[0], q[1] + shift[1], q[2] + shift[2]]
    };
    let mut m = mol(&[("O", pts[0]), ("H", pts[1]), ("H", pts[2])], 0);
    for (a, p) in m.atoms.iter_mut().zip(pts) {
        a.position = place(p);
    }
    m
}

/// Rotating and translating a molecule leaves the energy unchanged (exact
/// invariance; the bound 1e-9 hartree), for Cartesian d functions too.
#[test]
fn energy_is_invariant_under_rotation_and_translation() {
    let set_name = if BasisSpec::named("6-31g*")
        .build(&water(false, [0.0; 3]))
        .is_ok()
    {
        "6-31g*"
    } else {
        "sto-3g"
    };
    let e = |m: Molecule| {
        let b = BasisSpec::named(set_name).build(&m).unwrap();
        total(&hf(&m, &b, Reference::Restricted))
    };
    let e0 = e(water(false, [0.0; 3]));
    let e1 = e(water(true, [0.7, -1.3, 2.1]));
    assert!((e0 - e1).abs() < 1e-9, "{set_name}: {e0} vs {e1}");
    // Both starting densities reach the same state.
    let m = water(false, [0.0; 3]);
    let b = BasisSpec::named(set_name).build(&m).unwrap();
    let mut o = ScfOptions::new(Reference::Restricted);
    o.guess = Guess::Core;
    let core = scf::solve(&m, &b, &o, &mut |_| {}).unwrap();
    assert!((total(&core) - e0).abs() < 1e-9);
}

/// Σ h³ f over a box: the trapezoid rule of a periodic-like smooth function,
/// spectrally accurate while the narrowest Gaussian of the density is wider than
/// the spacing (numerical analysis: Trefethen and Weideman, SIAM Rev. 56, 385
/// (2014)). H-only molecules keep every exponent of 6-31G** wide enough at 0.15 bohr.
fn grid_integral(set: &OrbitalSet, field: Field, h: f64, pad: f64) -> f64 {
    let (lo, hi) = set.molecule.bounds();
    let n: Vec<usize> = (0..3)
        .map(|k| ((hi[k] - lo[k] + 2.0 * pad) / h).ceil() as usize + 1)
        .collect();
    let sampler = FieldSampler::new(set, &[field]).unwrap();
    let mut sum = 0.0;
    let mut pts = Vec::with_capacity(n[1] * n[2]);
    let mut out = vec![0.0; n[1] * n[2]];
    for i in 0..n[0] {
        pts.clear();
        for j in 0..n[1] {
            for k in 0..n[2] {
                pts.push([
                    lo[0] - pad + i as f64 * h,
                    lo[1] - pad + j as f64 * h,
                    lo[2] - pad + k as f64 * h,
                ]);
            }
        }
        sampler.evaluate(&pts, &mut out);
        sum += out.iter().sum::<f64>();
    }
    sum * h * h * h
}

/// H₃⁺ (equilateral, R = 1.65 bohr; common practice) in 6-31G** or sto-3g: the
/// density integrates to the electron count and the deformation density to −charge
/// (definitions), to 1e-3 on a 0.15-bohr grid.
#[test]
fn density_and_deformation_integrate_to_their_counts() {
    let r: f64 = 1.65;
    let m = mol(
        &[
            ("H", [0.0, 0.0, 0.0]),
            ("H", [r, 0.0, 0.0]),
            ("H", [r / 2.0, r * 3f64.sqrt() / 2.0, 0.0]),
        ],
        1,
    );
    let name = if BasisSpec::named("6-31g**").build(&m).is_ok() {
        "6-31g**"
    } else {
        "sto-3g"
    };
    let b = BasisSpec::named(name).build(&m).unwrap();
    let set = hf(&m, &b, Reference::Restricted);
    let n = grid_integral(&set, Field::Density, 0.15, 7.0);
    assert!((n - 2.0).abs() < 1e-3, "{name}: ∫ρ = {n}");
    let d = grid_integral(&set, Field::Deformation, 0.15, 7.0);
    assert!((d + 1.0).abs() < 1e-3, "{name}: ∫Δρ = {d}");
}

/// The spin density of a doublet integrates to 2S = 1 (definition); H₂⁺ … here the
/// H₃ radical (linear, common practice geometry) with UHF.
#[test]
fn spin_density_integrates_to_twice_the_spin() {
    let m = mol(
        &[
            ("H", [0.0, 0.0, 0.0]),
            ("H", [0.0, 0.0, 1.8]),
            ("H", [0.0, 0.0, 3.6]),
        ],
        0,
    );
    let b = BasisSpec::named("sto-3g").build(&m).unwrap();
    let set = hf(&m, &b, Reference::Unrestricted);
    let s = grid_integral(&set, Field::SpinDensity, 0.15, 7.0);
    assert!((s - 1.0).abs() < 1e-3, "∫(ρα−ρβ) = {s}");
    let (s2, exact) = set.spin.scf.as_ref().unwrap().s_squared.unwrap();
    assert!(s2 >= exact - 1e-12, "⟨S²⟩ {s2} below S(S+1) {exact}");
}
