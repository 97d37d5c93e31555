//! The largest |value| a field takes in space, so that a slice can tell a plane on
//! which the field vanishes (a node, values at rounding level) from one where the
//! field is merely small.

use super::{Sampler, Source};
use crate::chem::LengthUnit;

/// Points per edge of the coarse box for computed fields. Even, so that a box
/// symmetric about the molecule has no layer on its mirror planes, where a π or
/// antisymmetric orbital would be zero at every point of the layer.
const BOX_POINTS: usize = 16;
/// Space around the outermost nuclei (Å): valence lobes peak within about 1 Å.
const BOX_PADDING_ANGSTROM: f64 = 2.0;

/// One value per field (in the sampler's order). Cube files: the largest |stored
/// value|, exact. Computed fields: the largest |value| at the nuclei and at the
/// cell centres of a 16³ box around the molecule (4096 points, cheap for any
/// molecule we take) — an underestimate of the true maximum, which only makes the
/// zero test stricter; a lobe that reaches the box is far above rounding level.
pub fn largest(source: &Source, sampler: &Sampler) -> Vec<f64> {
    let nf = sampler.fields();
    if let Source::Volume { volume, .. } = source {
        let Sampler::Volume(_, idx) = sampler else {
            unreachable!("a volume source gives a volume sampler")
        };
        return idx
            .iter()
            .map(|&k| volume.field_values(k).fold(0.0f64, |m, v| m.max(v.abs())))
            .collect();
    }
    let molecule = source.molecule();
    let (lo, hi) = molecule.bounds();
    let pad = LengthUnit::Angstrom.to_bohr(BOX_PADDING_ANGSTROM);
    let mut points: Vec<[f64; 3]> = molecule.atoms.iter().map(|a| a.position).collect();
    let at = |d: usize, i: usize| {
        let (a, b) = (lo[d] - pad, hi[d] + pad);
        a + (b - a) * (i as f64 + 0.5) / BOX_POINTS as f64
    };
    for i in 0..BOX_POINTS {
        for j in 0..BOX_POINTS {
            for k in 0..BOX_POINTS {
                points.push([at(0, i), at(1, j), at(2, k)]);
            }
        }
    }
    let mut out = vec![0.0; points.len() * nf];
    sampler.evaluate(&points, &mut out);
    (0..nf)
        .map(|f| {
            out.iter()
                .skip(f)
                .step_by(nf)
                .filter(|v| v.is_finite())
                .fold(0.0f64, |m, v| m.max(v.abs()))
        })
        .collect()
}
