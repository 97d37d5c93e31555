//! What a slice or a profile will cost, estimated before any value is sampled, so a
//! request for a huge figure is refused at once with the estimate instead of
//! growing for minutes until the machine gives out.
//!
//! Memory: the sampled values are held twice at the peak (interleaved as sampled,
//! then one column per field), plus the source's own values (a cube's kept fields),
//! plus the picture three times over (the canvas, the raster handed to the PNG
//! encoder and, at most, the encoded file). Work: rough floating-point operations,
//! limited to `MAX_WORK` whatever the memory budget.

use super::Source;
use crate::field::Field;
use crate::solve::estimate::primitive_count;

/// The most work a figure or profile may take: about 10¹² operations, several
/// minutes on two cores. Larger requests are refused (ask for fewer samples).
pub const MAX_WORK: f64 = 1e12;

/// Copies of the sampled values alive at the peak.
const SAMPLE_COPIES: f64 = 2.0;
/// Bytes per pixel of the picture, times its copies at the peak: the RGBA canvas,
/// the copy of its maps or panels in the canvas's display list, and the file being
/// encoded — for PNG the raster and the PNG, for SVG an embedded raster's PNG, its
/// base64 text (4/3 of it) and the SVG text holding that (4/3 again), counted as if
/// nothing compressed.
const PICTURE_BYTES_PER_PIXEL: f64 = 4.0 * 6.0;
/// Operations per point and field to interpolate a cube (8 corners, 3 weights each).
const CUBE_OPS: f64 = 30.0;

/// Rough operations per sample point for `fields` of `source`. Orbitals: one
/// exponential per primitive (shared by all fields), then per field a sum over the
/// basis functions for every orbital it involves (all occupied ones for a density).
pub fn work_per_point(source: &Source, fields: &[Field]) -> f64 {
    match source {
        Source::Volume { .. } => CUBE_OPS * fields.len() as f64,
        Source::Orbitals { set, .. } => {
            let nbf = set.basis.len() as f64;
            let occupied = set.orbitals.iter().filter(|o| o.occupation > 0.0).count() as f64;
            let per_field: f64 = fields
                .iter()
                .map(|f| match f {
                    Field::Orbital(_) | Field::OrbitalDensity(_) => nbf,
                    Field::OrbitalDeformation(_) => 2.0 * nbf,
                    Field::Density | Field::SpinDensity => occupied * nbf,
                    Field::Deformation => (occupied + 1.0) * nbf,
                    Field::Stored(_) => 0.0,
                })
                .sum();
            primitive_count(&set.basis) as f64 + per_field
        }
    }
}

/// Bytes of `points` samples of `fields` fields, at the peak.
pub fn samples_memory(points: f64, fields: usize) -> f64 {
    SAMPLE_COPIES * points * fields as f64 * 8.0
}

/// Bytes of a picture of `width` × `height` pixels, with its copies.
pub fn picture_memory(width: f64, height: f64) -> f64 {
    PICTURE_BYTES_PER_PIXEL * width * height
}

#[cfg(test)]
mod tests {
    use super::*;

    /// 1000 × 1000 samples of 2 fields, twice, at 8 bytes: 32 MB; a 1000 × 800
    /// picture with 6 copies of 4 bytes per pixel: 19.2 MB (arithmetic).
    #[test]
    fn estimates_are_plain_products() {
        assert_eq!(samples_memory(1e6, 2), 3.2e7);
        assert_eq!(picture_memory(1000.0, 800.0), 1.92e7);
    }
}
