//! What a `Canvas` drew, kept beside its pixels as a display list so the same figure
//! can also be written as vectors (`render::svg`). Shapes and text are kept as
//! shapes and text; pixel work (maps, pasted 3-D panels, single blended pixels) is
//! kept as images, one per put or paste and one per run of single-pixel blends, so a
//! large figure's list holds a few rasters rather than one element per pixel.

use image::RgbaImage;

use super::canvas::Colour;

/// One drawing operation in canvas pixel coordinates (x right, y down).
#[derive(Debug, Clone)]
pub enum Op {
    /// An anti-aliased filled rectangle (also the background of a new canvas).
    Rect {
        x: f32,
        y: f32,
        w: f32,
        h: f32,
        fill: Colour,
    },
    /// A polyline: butt caps, round joins, optional dash lengths and clip rectangle
    /// (x, y, w, h) outside which nothing shows.
    Line {
        points: Vec<(f32, f32)>,
        width: f32,
        colour: Colour,
        dash: Option<Vec<f32>>,
        clip: Option<[f32; 4]>,
    },
    /// A filled circle with an outline of `width` (none when 0).
    Circle {
        cx: f32,
        cy: f32,
        r: f32,
        fill: Colour,
        line: Colour,
        width: f32,
    },
    /// A line of markup at `size` px; `matrix` (SVG order a b c d e f) takes the
    /// text's own frame (origin at the left end of the baseline, y down) to the canvas.
    Text {
        text: String,
        size: f32,
        matrix: [f32; 6],
        colour: Colour,
    },
    /// A straight-alpha raster laid "over" with its top-left corner at (x, y).
    Image { x: i32, y: i32, image: RgbaImage },
}

/// The pixel rectangle touched by single-pixel blends since the last recorded
/// operation: x0, y0 inclusive, x1, y1 exclusive.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Dirty {
    pub x0: u32,
    pub y0: u32,
    pub x1: u32,
    pub y1: u32,
}

impl Dirty {
    pub fn grow(this: Option<Dirty>, x: u32, y: u32) -> Dirty {
        match this {
            None => Dirty {
                x0: x,
                y0: y,
                x1: x + 1,
                y1: y + 1,
            },
            Some(d) => Dirty {
                x0: d.x0.min(x),
                y0: d.y0.min(y),
                x1: d.x1.max(x + 1),
                y1: d.y1.max(y + 1),
            },
        }
    }
}
