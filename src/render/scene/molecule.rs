//! The molecule as balls and sticks.
//!
//! * A bond joins two atoms closer than 1.2 × the sum of their covalent radii
//!   (common practice; Cordero radii from `chem::elements`).
//! * A ball's radius is `BALL_FRACTION` = 0.5 of the atom's covalent radius (H 0.155 Å,
//!   C 0.38 Å), small enough that orbital lobes, not atoms, fill the picture.
//! * Sticks have a fixed radius `STICK_RADIUS_ANGSTROM` = 0.1 Å, thinner than the
//!   smallest ball, so their ends always hide inside the balls; each half takes the
//!   colour of the atom it starts from.
//! * Ghost centres (Z = 0) carry no nucleus: they get neither ball nor bond.

use super::{Ball, Stick};
use crate::chem::colours::element_rgb;
use crate::chem::molecule::distance;
use crate::chem::units::BOHR_IN_ANGSTROM;
use crate::chem::{Atom, Molecule};

/// Bonds up to this multiple of the summed covalent radii (common practice).
pub const BOND_TOLERANCE: f64 = 1.2;
/// Ball radius as a fraction of the covalent radius.
pub const BALL_FRACTION: f64 = 0.5;
/// Stick radius in ångström.
pub const STICK_RADIUS_ANGSTROM: f64 = 0.1;

fn covalent_bohr(a: &Atom) -> f64 {
    a.element.covalent_radius_angstrom / BOHR_IN_ANGSTROM
}

/// Balls (one per real atom) and sticks (one per bond) of `molecule`, in bohr.
///
/// Bonds are found by comparing every pair: quadratic, which is nothing for the
/// molecules a figure shows (a thousand atoms are half a million distances).
pub fn ball_and_stick(molecule: &Molecule) -> (Vec<Ball>, Vec<Stick>) {
    let atoms: Vec<&Atom> = (molecule.atoms.iter())
        .filter(|a| a.element.atomic_number > 0)
        .collect();
    let balls = atoms
        .iter()
        .map(|a| Ball {
            centre: a.position,
            radius: BALL_FRACTION * covalent_bohr(a),
            rgb: element_rgb(a.element.atomic_number),
        })
        .collect();
    let radius = STICK_RADIUS_ANGSTROM / BOHR_IN_ANGSTROM;
    let mut sticks = Vec::new();
    for (i, a) in atoms.iter().enumerate() {
        for b in &atoms[i + 1..] {
            let reach = BOND_TOLERANCE * (covalent_bohr(a) + covalent_bohr(b));
            if distance(a.position, b.position) < reach {
                sticks.push(Stick {
                    a: a.position,
                    b: b.position,
                    radius,
                    rgb_a: element_rgb(a.element.atomic_number),
                    rgb_b: element_rgb(b.element.atomic_number),
                });
            }
        }
    }
    (balls, sticks)
}
