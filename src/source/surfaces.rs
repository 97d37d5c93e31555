//! Isosurfaces of a source's fields: sample on a box, choose the level, extract, and
//! (for wave functions) put the vertices and normals on the exact field.
//!
//! A wave-function source is sampled on a box around the molecule; a cube file is
//! used on its own grid, with no resampling, so the mesh is the one any other tool
//! would extract from the same file.

use std::time::{Duration, Instant};

use super::{FieldInfo, Sampler, Source};
use crate::budget::check_memory;
use crate::error::{Error, Result};
use crate::field::{Field, FieldSampler};
use crate::grid::{GridBox, sample_all};
use crate::io::cube::stats::{Measure, enclosing_level};
use crate::surface::extract::{Lattice, extract};
use crate::surface::place::{ExactField, place_exactly};
use crate::surface::{Phase, Surface};

/// How the isovalue is chosen.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Isovalue {
    /// This value (in the field's unit); ±value for a signed field.
    Fixed(f64),
    /// The value whose surface encloses this fraction of the field's measure (|f|
    /// for a non-negative field, f² for a signed one), as `inspect` defines it.
    Enclosing(f64),
}

/// The surfaces of one field.
#[derive(Debug, Clone)]
pub struct FieldSurfaces {
    pub field: Field,
    pub info: FieldInfo,
    /// The isovalue t > 0: surfaces at +t, and at −t for a signed field.
    pub level: f64,
    /// The fraction of the measure on the samples where |f| ≥ t.
    pub enclosed: f64,
    pub measure: Measure,
    /// +t first, then −t; a phase the field never reaches has no entry.
    pub surfaces: Vec<Surface>,
    /// Largest |f| on the samples.
    pub largest: f64,
}

/// Where the time went, for the report.
#[derive(Debug, Clone, Copy, Default)]
pub struct Timings {
    pub sampling: Duration,
    pub extraction: Duration,
}

/// Bytes per grid point held while one field is extracted: its values, and the
/// extractor's per-point edge bookkeeping (an estimate with margin).
const BYTES_PER_POINT: f64 = 8.0 * 3.0;

/// The grid a source's surfaces are extracted on: `box_for_orbitals` for a wave
/// function, the file's own grid for a cube.
pub fn grid_of(source: &Source, box_for_orbitals: Option<GridBox>) -> Result<GridBox> {
    match (source, box_for_orbitals) {
        (Source::Volume { volume, .. }, _) => Ok(volume.info.header.grid.clone()),
        (Source::Orbitals { .. }, Some(g)) => Ok(g),
        (Source::Orbitals { .. }, None) => Err(Error::internal("no box for the orbital source")),
    }
}

/// Extracts the surfaces of every field in turn (one field's values in memory at a
/// time), refusing before sampling when a field's grid would exceed `memory`.
pub fn surfaces_of(
    source: &Source,
    fields: &[Field],
    grid: &GridBox,
    isovalue: Isovalue,
    memory: u64,
    timings: &mut Timings,
) -> Result<Vec<FieldSurfaces>> {
    let points = grid.point_count() as f64;
    check_memory(
        points * BYTES_PER_POINT + source.held_bytes(),
        memory,
        &format!("an isosurface grid of {} points", grid.point_count()),
    )?;
    fields
        .iter()
        .map(|f| one_field(source, f, grid, isovalue, timings))
        .collect()
}

fn one_field(
    source: &Source,
    field: &Field,
    grid: &GridBox,
    isovalue: Isovalue,
    timings: &mut Timings,
) -> Result<FieldSurfaces> {
    let info = source.info(field)?;
    let started = Instant::now();
    let values = sampled(source, field, grid)?;
    timings.sampling += started.elapsed();
    let measure = if info.signed {
        Measure::Square
    } else {
        Measure::Abs
    };
    let largest = values.iter().fold(0.0f64, |m, v| m.max(v.abs()));
    let level = match isovalue {
        Isovalue::Fixed(t) => t.abs(),
        Isovalue::Enclosing(f) => enclosing_level(&values, 1, 0, f, measure)?.ok_or_else(|| {
            Error::input(format!(
                "{} is zero everywhere on the grid: there is no surface to draw",
                info.plain
            ))
        })?,
    };
    if !(level > 0.0 && level.is_finite()) {
        return Err(Error::input(format!(
            "the isovalue must be a non-zero finite value, got {level:e}"
        )));
    }
    if level >= largest {
        let (why, hint) = match isovalue {
            Isovalue::Fixed(_) => (
                "the isovalue",
                "choose a smaller --iso, or use --enclose F (a fraction of the field's measure)",
            ),
            Isovalue::Enclosing(_) => (
                "the enclosed fraction gives an isovalue",
                "use a larger --enclose fraction",
            ),
        };
        return Err(Error::input(format!(
            "{why} {level:.4e}, at or above the largest |value| of {} on the grid, {largest:.4e}: the surface would be empty",
            info.plain
        ))
        .with_hint(hint));
    }
    let enclosed = enclosed_fraction(&values, level, measure);
    let started = Instant::now();
    let lattice = Lattice {
        origin: grid.origin,
        axes: grid.axes,
        counts: grid.counts,
        values: &values,
    };
    let exact = match source {
        Source::Orbitals { set, .. } => Some(OneField(FieldSampler::new(
            set,
            std::slice::from_ref(field),
        )?)),
        Source::Volume { .. } => None,
    };
    let phases: &[Phase] = if info.signed {
        &[Phase::Positive, Phase::Negative]
    } else {
        &[Phase::Positive]
    };
    let mut surfaces = Vec::new();
    for &phase in phases {
        let signed_level = if phase == Phase::Positive {
            level
        } else {
            -level
        };
        let mut ex = extract(&lattice, signed_level, phase)?;
        if ex.mesh.is_empty() {
            continue;
        }
        if let Some(f) = &exact {
            place_exactly(&mut ex, signed_level, phase, f);
        }
        surfaces.push(Surface {
            phase,
            level: signed_level,
            open_edges: ex.open_edges,
            mesh: ex.mesh,
        });
    }
    timings.extraction += started.elapsed();
    if surfaces.is_empty() {
        return Err(Error::input(format!(
            "no surface of {} at ±{level:.4e} on this grid",
            info.plain
        ))
        .with_hint("choose a smaller --iso or a finer --spacing"));
    }
    Ok(FieldSurfaces {
        field: *field,
        info,
        level,
        enclosed,
        measure,
        surfaces,
        largest,
    })
}

/// One field's values on the grid, in cube order.
fn sampled(source: &Source, field: &Field, grid: &GridBox) -> Result<Vec<f64>> {
    let sampler = source.sampler(std::slice::from_ref(field))?;
    Ok(match (&sampler, source) {
        // A cube's own grid: its stored values as they are.
        (Sampler::Volume(v, idx), Source::Volume { .. }) => v.field_values(idx[0]).collect(),
        (Sampler::Orbitals(s), _) => sample_all(grid, 1, |slab, out| s.evaluate_slab(slab, out)),
        (Sampler::Volume(..), _) => return Err(Error::internal("a volume sampler for orbitals")),
    })
}

/// Σ_{|f| ≥ t} w(f) / Σ w(f) on the samples.
fn enclosed_fraction(values: &[f64], t: f64, measure: Measure) -> f64 {
    let w = |v: f64| match measure {
        Measure::Abs => v.abs(),
        Measure::Square => v * v,
    };
    let (inside, total) = values.iter().fold((0.0, 0.0), |(i, s), &v| {
        let wv = w(v);
        (if v.abs() >= t { i + wv } else { i }, s + wv)
    });
    if total > 0.0 { inside / total } else { 0.0 }
}

/// One field of a wave function, evaluated exactly for vertex placement and normals.
struct OneField(FieldSampler);

impl ExactField for OneField {
    fn values(&self, points: &[[f64; 3]], out: &mut [f64]) {
        self.0.evaluate(points, out);
    }

    /// The analytic gradient (basis-function derivatives), not differences.
    fn gradients(&self, points: &[[f64; 3]], out: &mut [[f64; 3]]) {
        self.0.gradients(points, out);
    }
}

/// The smallest step of a grid (bohr), for reports and footnotes.
pub fn spacing(grid: &GridBox) -> f64 {
    grid.axes
        .iter()
        .map(|a| (a[0] * a[0] + a[1] * a[1] + a[2] * a[2]).sqrt())
        .fold(f64::INFINITY, f64::min)
}

impl FieldSurfaces {
    /// What the enclosed fraction is of, in words: "∫f² dV" or "∫|f| dV".
    pub fn measure_text(&self) -> &'static str {
        match self.measure {
            Measure::Square => "∫f² dV",
            Measure::Abs => "∫|f| dV",
        }
    }
}
