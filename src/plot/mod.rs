//! Line charts (energy curves, integrals, profiles, build-up) on the same canvas as
//! the slice maps: `chart` describes one, `frame` lays it out and maps data to
//! pixels, `furniture` draws the title, legend and footnotes.

pub mod axes;
pub mod chart;
pub mod curve;
pub mod frame;
pub mod furniture;
pub mod levels;
pub mod profile;

use crate::render::canvas::Colour;

/// Line colours: the Okabe–Ito palette (M. Okabe and K. Ito, "Color Universal
/// Design", 2008), chosen to stay distinct for colour-blind readers.
pub const PALETTE: [Colour; 5] = [
    Colour::rgb(0, 114, 178),
    Colour::rgb(213, 94, 0),
    Colour::rgb(0, 158, 115),
    Colour::rgb(204, 121, 167),
    Colour::rgb(230, 159, 0),
];

/// Sizes in pixels, fixed whatever the chart's width (as for the slice maps): a
/// wider chart gets a wider plot area, not larger letters.
pub mod size {
    pub const TITLE: f32 = 22.0;
    /// Tick labels, legend entries and marker labels.
    pub const FONT: f32 = 15.0;
    /// Axis names.
    pub const NAME: f32 = 16.0;
    pub const FOOT: f32 = 13.0;
    /// Space between a footnote line and the next, as a multiple of `FOOT`.
    pub const FOOT_LEADING: f32 = 1.35;
    pub const MARGIN: f32 = 16.0;
    pub const TICK: f32 = 6.0;
    /// Data lines and thin lines (axes, ticks, guides).
    pub const LINE: f32 = 2.2;
    pub const THIN: f32 = 1.0;
    /// The plot area is never smaller than this; the chart grows instead.
    pub const MIN_FRAME_W: f32 = 220.0;
    pub const MIN_FRAME_H: f32 = 160.0;
    /// Height of a chart as a fraction of its width, when the text leaves room.
    pub const ASPECT: f32 = 0.62;
    /// The plot area is at least this fraction of the chart's width high, so small
    /// charts with fixed-size text keep a usable plot area.
    pub const FRAME_ASPECT: f32 = 0.42;
}

/// A range padded by `frac` of its span on both sides (a flat one by ±1).
pub(crate) fn padded(lo: f64, hi: f64, frac: f64) -> (f64, f64) {
    let span = hi - lo;
    if span <= 0.0 || !span.is_finite() {
        return (lo - 1.0, hi + 1.0);
    }
    (lo - frac * span, hi + frac * span)
}
