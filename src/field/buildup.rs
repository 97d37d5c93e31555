//! How much density a two-atom orbital gathers between its nuclei: the integral of
//! its orbital deformation density over the slab between the planes through the two
//! nuclei perpendicular to the bond (electrons gained, > 0, or lost, < 0, there), and
//! the deformation density at the bond midpoint.

use rayon::prelude::*;

use super::{Field, FieldSampler};
use crate::error::{Error, Result};
use crate::grid::slab_rule::between_planes;
use crate::solve::{OrbitalSelector, OrbitalSet};

/// Orbital 1 (bonding) and orbital 2 (antibonding) of a two-atom set.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Buildup {
    /// Electrons gained (> 0) or lost (< 0) between the nuclei, [bonding, antibonding].
    pub between: [f64; 2],
    /// Orbital deformation density at the bond midpoint (e/bohr³), [bonding, antibonding].
    pub midpoint: [f64; 2],
}

pub fn buildup(set: &OrbitalSet) -> Result<Buildup> {
    let atoms = &set.molecule.atoms;
    if atoms.len() != 2 || set.orbitals.len() < 2 {
        return Err(Error::input(
            "the build-up numbers need two atoms and at least two orbitals",
        ));
    }
    let fields = [1, 2].map(|n| Field::OrbitalDeformation(OrbitalSelector::Number(n)));
    let sampler = FieldSampler::new(set, &fields)?;
    let (a, b) = (atoms[0].position, atoms[1].position);
    let rule = between_planes(a, b, 1.0);
    // Chunk sums are gathered in order and added in order, so the result does not
    // depend on how rayon splits the work (a parallel reduce would).
    let partial: Vec<[f64; 2]> = rule
        .par_chunks(4096)
        .map(|chunk| {
            let pts: Vec<[f64; 3]> = chunk.iter().map(|(p, _)| *p).collect();
            let mut v = vec![0.0; 2 * pts.len()];
            sampler.evaluate(&pts, &mut v);
            chunk
                .iter()
                .zip(v.chunks_exact(2))
                .fold([0.0; 2], |acc, ((_, w), f)| {
                    [acc[0] + w * f[0], acc[1] + w * f[1]]
                })
        })
        .collect();
    let between = partial
        .iter()
        .fold([0.0; 2], |x, y| [x[0] + y[0], x[1] + y[1]]);
    let mid = [std::array::from_fn(|k| 0.5 * (a[k] + b[k]))];
    let mut midpoint = [0.0; 2];
    sampler.evaluate(&mid, &mut midpoint);
    Ok(Buildup { between, midpoint })
}

/// The build-up numbers at every separation of a curve, in parallel:
/// `orbitals_at(i, R)` gives the orbitals at the i-th separation (the caller
/// decides how they are obtained; nothing here solves).
pub fn along_curve<F>(rs: &[f64], orbitals_at: F) -> Result<Vec<Buildup>>
where
    F: Fn(usize, f64) -> Result<OrbitalSet> + Sync,
{
    rs.par_iter()
        .enumerate()
        .map(|(i, &r)| buildup(&orbitals_at(i, r)?))
        .collect()
}
