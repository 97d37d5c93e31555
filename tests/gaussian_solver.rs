//! The one-electron solver in Gaussian bases against published energies.
//!
//! Sources:
//! * Hydrogen atom in STO-3G (ζ = 1.24): E = −0.466582 hartree (A. Szabo and
//!   N. S. Ostlund, *Modern Quantum Chemistry*, Dover 1996, ch. 3; from memory).
//! * The exact ground state of the one-electron hydrogen molecular ion at R = 2.0
//!   bohr: −0.6026342 hartree total (D. R. Bates, K. Ledsham and A. L. Stewart,
//!   Phil. Trans. R. Soc. Lond. A 246, 215 (1953); from memory, and the value the
//!   project's issue quotes).

mod common;

use lobecast::integrals::two_centre::two_centre_1s;

const EXACT_R2_HARTREE: f64 = -0.602_634_2;

fn energy(model: &str) -> f64 {
    common::solve_model(model).orbitals[0].energy
}

fn h2(basis: &str) -> String {
    format!("{}{basis}", common::H2_MOLECULE)
}

#[test]
fn hydrogen_atom_in_sto_3g() {
    let e = energy(
        "[molecule]\natoms = [{ element = \"H\", position = [0, 0, 0] }]\n[basis]\nset = \"sto-3g\"\n",
    );
    assert!((e + 0.466582).abs() < 5e-7, "E = {e}");
}

#[test]
fn even_tempered_approaches_the_exact_energy_from_above() {
    let text = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/examples/h2-cation-even-tempered.toml"
    ))
    .unwrap();
    let e = energy(&text);
    assert!(e > EXACT_R2_HARTREE, "variational bound: {e}");
    assert!(
        e - EXACT_R2_HARTREE < 2e-4,
        "within 2e-4 hartree of the exact energy: {e}"
    );
}

#[test]
fn sto_ng_lies_above_the_slater_energy_and_approaches_it() {
    // STO-nG for hydrogen fits the 1s Slater function of ζ = 1.24 (the standard
    // molecular exponent of Hehre, Stewart and Pople 1969).
    let slater = two_centre_1s(1.0, 1.24, 2.0).e_bonding;
    let e3 = energy(&h2("[basis]\nset = \"sto-3g\"\n"));
    let e6 = energy(&h2("[basis]\nset = \"sto-6g\"\n"));
    assert!(
        e3 > e6 && e6 > slater,
        "STO-3G {e3} > STO-6G {e6} > Slater {slater}"
    );
    assert!(e6 - slater < e3 - slater);
}

#[test]
fn slater_closed_form_equals_the_generic_eigen_solution() {
    // The closed forms and the generalised eigenproblem must agree exactly
    // (common practice: two routes to one number).
    let m = two_centre_1s(1.0, 1.0, 2.0);
    let e = energy(&h2("[basis]\nset = \"slater-1s\"\n"));
    assert!((e - m.e_bonding).abs() < 1e-14);
}
