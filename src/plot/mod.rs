//! Line charts (energy curves, profiles): plotters lays them out, our canvas draws
//! them (see `backend`).

pub mod backend;
pub mod curve;
pub mod profile;

use crate::error::Error;

/// Plotters reports drawing failures as its own error type; none can happen on an
/// in-memory canvas, but they are passed on rather than unwrapped.
pub(crate) fn plot_error<E: std::fmt::Display>(e: E) -> Error {
    Error::internal(format!("drawing the chart failed: {e}"))
}

use plotters::style::RGBColor;

/// Line colours: the Okabe–Ito palette (M. Okabe and K. Ito, "Color Universal
/// Design", 2008), chosen to stay distinct for colour-blind readers.
pub const PALETTE: [RGBColor; 5] = [
    RGBColor(0, 114, 178),
    RGBColor(213, 94, 0),
    RGBColor(0, 158, 115),
    RGBColor(204, 121, 167),
    RGBColor(230, 159, 0),
];

/// Charts are drawn this many times larger and shrunk: plotters places everything on
/// whole pixels, and shrinking turns that into smooth, anti-aliased curves.
pub const SUPERSAMPLE: u32 = 3;

/// Font sizes and line widths for a chart `width` pixels wide (1000 is the base).
pub(crate) struct Sizes {
    pub k: f32,
    pub title: f32,
    pub label: f32,
    pub desc: f32,
    pub foot: f32,
    pub line: u32,
    /// Width of axes, ticks and thin guide lines.
    pub thin: u32,
}

/// Chart text is never scaled below this fraction of its size at 1000 px.
pub const MIN_TEXT_SCALE: f32 = 0.75;

impl Sizes {
    /// Room above the chart for the title.
    pub fn margin_top(&self) -> f32 {
        14.0 * self.k + 1.6 * self.title
    }

    pub fn new(width: u32) -> Self {
        let k = width as f32 / 1000.0;
        // Text keeps a readable minimum size in small charts.
        let kt = k.max(MIN_TEXT_SCALE * SUPERSAMPLE as f32);
        Sizes {
            k,
            title: 23.0 * kt,
            label: 17.0 * kt,
            desc: 19.0 * kt,
            foot: 14.0 * kt,
            line: (2.5 * k).round().max(1.0) as u32,
            thin: k.round().max(1.0) as u32,
        }
    }
}

/// Decimals for axis labels over a range shown with about `n` ticks.
pub(crate) fn axis_decimals(lo: f64, hi: f64, n: usize) -> usize {
    let t = crate::render::ticks::nice(lo, hi, n);
    crate::render::ticks::decimals(if t.len() > 1 { t[1] - t[0] } else { hi - lo })
}

/// A range padded by `frac` of its span on both sides (a flat one by ±1).
pub(crate) fn padded(lo: f64, hi: f64, frac: f64) -> (f64, f64) {
    let span = hi - lo;
    if span <= 0.0 || !span.is_finite() {
        return (lo - 1.0, hi + 1.0);
    }
    (lo - frac * span, hi + frac * span)
}

/// Footnotes broken into lines that fit a chart `width` pixels wide.
pub(crate) fn wrap_notes(notes: &[String], z: &Sizes, width: u32) -> Vec<String> {
    notes
        .iter()
        .flat_map(|f| crate::render::text::wrap(f, z.foot, width as f32 - 32.0 * z.k))
        .collect()
}
