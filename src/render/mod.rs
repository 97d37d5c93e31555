//! Figures as pixels (and, from the same drawing, SVG): colour scales, slice rasters,
//! marching-squares contours, text in an embedded font, colour bars, axes and panels. Nothing here reads
//! files or evaluates orbitals: callers hand over values sampled at the pixels.

pub mod axes;
pub mod canvas;
pub mod colorbar;
pub mod contour;
pub mod nuclei;
pub mod picture;
pub mod record;
pub mod scale;
pub mod scene;
pub mod slice;
pub mod svg;
pub mod text;
pub mod ticks;

pub use canvas::{Canvas, Colour};
pub use scale::{Mapping, Scale};
pub use svg::FigureFormat;
