//! Energy curves of the two-centre 1s model: scans over R, the optimal exponent at
//! each R, and the equilibrium refined beyond the scan step.

use crate::chem::LengthUnit;
use crate::error::{Error, Result};
use crate::integrals::two_centre::{TwoCentre1s, two_centre_1s};
use crate::numerics::brent::minimize;

/// Relative tolerance on ζ and on R in the minimisations.
pub const TOLERANCE: f64 = 1e-8;

#[derive(Debug, Clone, Copy, PartialEq)]
pub enum ZetaChoice {
    Fixed(f64),
    /// ζ minimising the bonding energy at each R.
    Optimized,
}

#[derive(Debug, Clone, Copy, PartialEq)]
pub struct CurvePoint {
    pub r: f64,
    pub zeta: f64,
    pub model: TwoCentre1s,
}

#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Equilibrium {
    pub r: f64,
    pub zeta: f64,
    pub energy: f64,
}

/// The exponent that minimises E_bonding at separation `r` for nuclear charge `z`.
/// The optimum lies between Z (separated atoms) and 2Z (united atom); the bracket
/// is wider to be safe.
pub fn optimal_zeta(z: f64, r: f64) -> f64 {
    minimize(
        |zeta| two_centre_1s(z, zeta, r).e_bonding,
        0.1 * z,
        4.0 * z,
        TOLERANCE,
    )
    .0
}

pub fn point(z: f64, choice: ZetaChoice, r: f64) -> CurvePoint {
    let zeta = match choice {
        ZetaChoice::Fixed(zeta) => zeta,
        ZetaChoice::Optimized => optimal_zeta(z, r),
    };
    CurvePoint {
        r,
        zeta,
        model: two_centre_1s(z, zeta, r),
    }
}

/// The most separations one scan takes.
pub const MAX_SEPARATIONS: usize = 1_000_000;

/// Separations from `from` to `to` inclusive in steps of `step` (bohr); each is
/// computed as from + i·step so no rounding accumulates.
pub fn separations(from: f64, to: f64, step: f64) -> Result<Vec<f64>> {
    separations_in(from, to, step, LengthUnit::Bohr)
}

/// `separations` for values given in `unit`: refusals quote the values as the user
/// gave them, with their unit; the result is in bohr.
pub fn separations_in(from: f64, to: f64, step: f64, unit: LengthUnit) -> Result<Vec<f64>> {
    let u = unit.symbol();
    if !(from.is_finite() && to.is_finite() && step.is_finite()) {
        return Err(Error::input(
            "--from, --to and --step must be finite numbers",
        ));
    }
    if from <= 0.0 {
        return Err(Error::input(format!(
            "the scan must start at R > 0, got --from {from} {u}"
        )));
    }
    if step <= 0.0 {
        return Err(Error::input(format!(
            "--step must be positive, got {step} {u}"
        )));
    }
    if to < from {
        return Err(Error::input(format!(
            "--to ({to} {u}) is smaller than --from ({from} {u})"
        )));
    }
    let (from, to, step) = (unit.to_bohr(from), unit.to_bohr(to), unit.to_bohr(step));
    // Counted in f64 first: a cast of a huge quotient to usize would saturate and
    // the + 1 wrap to zero separations.
    let count = ((to - from) / step + 1e-9).floor() + 1.0;
    if count > MAX_SEPARATIONS as f64 {
        return Err(Error::input(format!(
            "the scan would have {count:.3e} points, more than {MAX_SEPARATIONS}; use a larger --step"
        )));
    }
    let count = count as usize;
    Ok((0..count).map(|i| from + i as f64 * step).collect())
}

pub fn scan(z: f64, choice: ZetaChoice, rs: &[f64]) -> Vec<CurvePoint> {
    rs.iter().map(|&r| point(z, choice, r)).collect()
}

/// The minimum of the bonding curve, refined by Brent's method between the samples
/// either side of the lowest one. `None` when the lowest sample is an end point:
/// the scan does not bracket a minimum.
pub fn equilibrium(z: f64, choice: ZetaChoice, points: &[CurvePoint]) -> Option<Equilibrium> {
    let best = (0..points.len()).min_by(|&a, &b| {
        points[a]
            .model
            .e_bonding
            .total_cmp(&points[b].model.e_bonding)
    })?;
    if best == 0 || best + 1 == points.len() {
        return None;
    }
    let (r, energy) = minimize(
        |r| point(z, choice, r).model.e_bonding,
        points[best - 1].r,
        points[best + 1].r,
        TOLERANCE,
    );
    Some(Equilibrium {
        r,
        zeta: point(z, choice, r).zeta,
        energy,
    })
}

/// Energy of the separated limit: a hydrogen-like atom of charge Z in its ground
/// state plus a bare nucleus, −Z²/2 hartree.
pub fn separated_limit(z: f64) -> f64 {
    -0.5 * z * z
}

/// Energies of the lowest states at one separation, for any basis.
#[derive(Debug, Clone, PartialEq)]
pub struct StatesPoint {
    pub r: f64,
    pub energies: Vec<f64>,
}

/// The two-atom molecule of `template` moved to separation `r` along its own bond
/// axis, about the same midpoint.
pub fn at_separation(template: &crate::chem::Molecule, r: f64) -> Result<crate::chem::Molecule> {
    let (a, b) = (&template.atoms[0], &template.atoms[1]);
    let d: [f64; 3] = std::array::from_fn(|k| b.position[k] - a.position[k]);
    let len = (d[0] * d[0] + d[1] * d[1] + d[2] * d[2]).sqrt();
    let mid: [f64; 3] = std::array::from_fn(|k| 0.5 * (a.position[k] + b.position[k]));
    let u = d.map(|x| x / len);
    let mut atoms = template.atoms.clone();
    atoms[0].position = std::array::from_fn(|k| mid[k] - 0.5 * r * u[k]);
    atoms[1].position = std::array::from_fn(|k| mid[k] + 0.5 * r * u[k]);
    crate::chem::Molecule::new(atoms, template.charge)
}

/// The `states` lowest one-electron energies at separation `r` in the basis `spec`.
pub fn states_at(
    template: &crate::chem::Molecule,
    spec: &crate::basis::BasisSpec,
    r: f64,
    states: usize,
) -> Result<Vec<f64>> {
    let molecule = at_separation(template, r)?;
    let basis = spec.build(&molecule)?;
    let set = super::one_electron::solve(&molecule, &basis)?;
    if set.orbitals.len() < states {
        return Err(Error::input(format!(
            "--states {states} asks for more states than the basis has functions ({})",
            set.orbitals.len()
        )));
    }
    Ok(set.orbitals.iter().take(states).map(|o| o.energy).collect())
}

/// Scans the lowest `states` energies over `rs` (in parallel: each R is a full solve).
pub fn scan_states(
    template: &crate::chem::Molecule,
    spec: &crate::basis::BasisSpec,
    rs: &[f64],
    states: usize,
) -> Result<Vec<StatesPoint>> {
    use rayon::prelude::*;
    rs.par_iter()
        .map(|&r| {
            Ok(StatesPoint {
                r,
                energies: states_at(template, spec, r, states)?,
            })
        })
        .collect()
}

/// The minimum of the lowest state, refined between the samples either side of the
/// lowest one; `None` when the scan does not bracket it.
pub fn states_equilibrium(
    template: &crate::chem::Molecule,
    spec: &crate::basis::BasisSpec,
    points: &[StatesPoint],
) -> Result<Option<(f64, f64)>> {
    let Some(best) =
        (0..points.len()).min_by(|&a, &b| points[a].energies[0].total_cmp(&points[b].energies[0]))
    else {
        return Ok(None);
    };
    if best == 0 || best + 1 == points.len() {
        return Ok(None);
    }
    let mut failure = None;
    let (r, e) = minimize(
        |r| match states_at(template, spec, r, 1) {
            Ok(e) => e[0],
            Err(err) => {
                failure = Some(err);
                f64::INFINITY
            }
        },
        points[best - 1].r,
        points[best + 1].r,
        TOLERANCE,
    );
    match failure {
        Some(err) => Err(err),
        None => Ok(Some((r, e))),
    }
}
