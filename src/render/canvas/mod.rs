//! A pixel canvas (tiny-skia underneath: anti-aliased strokes, dashes and fills)
//! with text from the embedded font; `io::png` encodes it at the end. Every public
//! drawing method also records itself in a display list (`render::record`), from
//! which `render::svg` writes the same figure as vectors: a new drawing method must
//! both draw its pixels and push its `Op` (see DEVELOPERS.md).

use tiny_skia::{
    FillRule, LineCap, LineJoin, Mask, Paint, PathBuilder, Pixmap, PremultipliedColorU8, Rect,
    Stroke, StrokeDash, Transform,
};

use super::record::{Dirty, Op};

mod lettering;
mod shrink;

pub use lettering::offsets;

/// A straight (not premultiplied) sRGB colour with alpha.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Colour {
    pub r: u8,
    pub g: u8,
    pub b: u8,
    pub a: u8,
}

impl Colour {
    pub const fn rgb(r: u8, g: u8, b: u8) -> Self {
        Colour { r, g, b, a: 255 }
    }
    pub const fn with_alpha(self, a: u8) -> Self {
        Colour { a, ..self }
    }
    pub const BLACK: Colour = Colour::rgb(0, 0, 0);
    pub const WHITE: Colour = Colour::rgb(255, 255, 255);
    pub const INK: Colour = Colour::rgb(34, 34, 34);
    pub const GREY: Colour = Colour::rgb(110, 110, 110);
    pub const TRANSPARENT: Colour = Colour {
        r: 255,
        g: 255,
        b: 255,
        a: 0,
    };
}

/// Where a text's anchor point sits on the text's box.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum HAlign {
    Left,
    Centre,
    Right,
}

#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum VAlign {
    Top,
    Middle,
    Baseline,
    Bottom,
}

pub struct Canvas {
    pixmap: Pixmap,
    /// What was drawn, in order, for vector output.
    ops: Vec<Op>,
    /// Pixels blended one at a time since the last recorded operation.
    dirty: Option<Dirty>,
}

fn paint(c: Colour) -> Paint<'static> {
    let mut p = Paint::default();
    p.set_color_rgba8(c.r, c.g, c.b, c.a);
    p.anti_alias = true;
    p
}

impl Canvas {
    pub fn new(width: u32, height: u32, background: Colour) -> Self {
        let mut pixmap = Pixmap::new(width.max(1), height.max(1)).expect("non-zero canvas");
        pixmap.fill(tiny_skia::Color::from_rgba8(
            background.r,
            background.g,
            background.b,
            background.a,
        ));
        let mut c = Canvas {
            pixmap,
            ops: Vec::new(),
            dirty: None,
        };
        if background.a > 0 {
            c.ops.push(Op::Rect {
                x: 0.0,
                y: 0.0,
                w: c.width() as f32,
                h: c.height() as f32,
                fill: background,
            });
        }
        c
    }

    /// The recorded drawing operations, in order; a run of single-pixel blends not yet
    /// followed by another operation is in `pending`.
    pub fn ops(&self) -> &[Op] {
        &self.ops
    }

    /// The pixels blended one at a time since the last recorded operation, as the
    /// canvas's own pixels over their bounding box (what lies under them included).
    pub fn pending(&self) -> Option<Op> {
        self.dirty.map(|d| self.crop(d))
    }

    fn crop(&self, d: Dirty) -> Op {
        let image = image::RgbaImage::from_fn(d.x1 - d.x0, d.y1 - d.y0, |x, y| {
            let c = self.pixel(d.x0 + x, d.y0 + y);
            image::Rgba([c.r, c.g, c.b, c.a])
        });
        Op::Image {
            x: d.x0 as i32,
            y: d.y0 as i32,
            image,
        }
    }

    /// Appends `op` after any pending pixel run, keeping the list in drawing order.
    fn record(&mut self, op: Op) {
        if let Some(run) = self.pending() {
            self.ops.push(run);
            self.dirty = None;
        }
        self.ops.push(op);
    }

    pub fn width(&self) -> u32 {
        self.pixmap.width()
    }

    pub fn height(&self) -> u32 {
        self.pixmap.height()
    }

    /// The straight (un-premultiplied) colour of a pixel.
    pub fn pixel(&self, x: u32, y: u32) -> Colour {
        let p = self.pixmap.pixel(x, y).expect("pixel inside the canvas");
        let c = p.demultiply();
        Colour {
            r: c.red(),
            g: c.green(),
            b: c.blue(),
            a: c.alpha(),
        }
    }

    /// Copies opaque pixels into the rectangle at (x0, y0), row-major, `w` wide.
    pub fn put_pixels(&mut self, x0: u32, y0: u32, w: u32, pixels: &[[u8; 3]]) {
        let w = w.max(1);
        let rows = pixels.len().div_ceil(w as usize) as u32;
        let image =
            image::RgbaImage::from_fn(w, rows, |x, y| match pixels.get((y * w + x) as usize) {
                Some(p) => image::Rgba([p[0], p[1], p[2], 255]),
                None => image::Rgba([0, 0, 0, 0]),
            });
        self.record(Op::Image {
            x: x0 as i32,
            y: y0 as i32,
            image,
        });
        let width = self.width();
        let height = self.height();
        let data = self.pixmap.pixels_mut();
        for (i, p) in pixels.iter().enumerate() {
            let (x, y) = (x0 + i as u32 % w, y0 + i as u32 / w);
            if x < width && y < height {
                data[(y * width + x) as usize] =
                    PremultipliedColorU8::from_rgba(p[0], p[1], p[2], 255).expect("opaque");
            }
        }
    }

    pub fn fill_rect(&mut self, x: f32, y: f32, w: f32, h: f32, c: Colour) {
        if let Some(r) = Rect::from_xywh(x, y, w, h) {
            self.record(Op::Rect {
                x,
                y,
                w,
                h,
                fill: c,
            });
            self.pixmap
                .fill_rect(r, &paint(c), Transform::identity(), None);
        }
    }

    /// Strokes a polyline; `dash` gives on/off lengths in pixels.
    pub fn stroke(&mut self, points: &[(f32, f32)], width: f32, c: Colour, dash: Option<&[f32]>) {
        self.stroke_clipped(points, width, c, dash, None);
    }

    /// `stroke`, drawn only inside the rectangle `clip` = (x, y, w, h) (a chart's
    /// plot area), which covers whole pixels or none.
    pub fn stroke_clipped(
        &mut self,
        points: &[(f32, f32)],
        width: f32,
        c: Colour,
        dash: Option<&[f32]>,
        clip: Option<[f32; 4]>,
    ) {
        if points.len() < 2 {
            return;
        }
        self.record(Op::Line {
            points: points.to_vec(),
            width,
            colour: c,
            dash: dash.map(|d| d.to_vec()),
            clip,
        });
        let mask = clip.and_then(|r| clip_mask(self.width(), self.height(), r));
        let mut pb = PathBuilder::new();
        pb.move_to(points[0].0, points[0].1);
        for p in &points[1..] {
            pb.line_to(p.0, p.1);
        }
        let Some(path) = pb.finish() else { return };
        let stroke = Stroke {
            width,
            line_cap: LineCap::Butt,
            line_join: LineJoin::Round,
            dash: dash.and_then(|d| StrokeDash::new(d.to_vec(), 0.0)),
            ..Stroke::default()
        };
        self.pixmap.stroke_path(
            &path,
            &paint(c),
            &stroke,
            Transform::identity(),
            mask.as_ref(),
        );
    }

    pub fn stroke_rect(&mut self, x: f32, y: f32, w: f32, h: f32, width: f32, c: Colour) {
        let pts = [(x, y), (x + w, y), (x + w, y + h), (x, y + h), (x, y)];
        self.stroke(&pts, width, c, None);
    }

    /// A circle filled with `fill` and outlined with `line` of width `lw`.
    pub fn circle(&mut self, cx: f32, cy: f32, r: f32, fill: Colour, line: Colour, lw: f32) {
        let Some(path) = PathBuilder::from_circle(cx, cy, r) else {
            return;
        };
        self.record(Op::Circle {
            cx,
            cy,
            r,
            fill,
            line,
            width: lw,
        });
        self.pixmap.fill_path(
            &path,
            &paint(fill),
            FillRule::Winding,
            Transform::identity(),
            None,
        );
        if lw > 0.0 {
            let stroke = Stroke {
                width: lw,
                ..Stroke::default()
            };
            self.pixmap
                .stroke_path(&path, &paint(line), &stroke, Transform::identity(), None);
        }
    }

    /// Blends colour `c` with coverage `cover` (0–1) into one pixel.
    pub fn blend(&mut self, x: i32, y: i32, c: Colour, cover: f32) {
        if self.blend_pixel(x, y, c, cover) {
            self.dirty = Some(Dirty::grow(self.dirty, x as u32, y as u32));
        }
    }

    /// `blend` without recording (for drawing whose operation is recorded whole);
    /// false when the pixel is off the canvas or not covered.
    fn blend_pixel(&mut self, x: i32, y: i32, c: Colour, cover: f32) -> bool {
        let (w, h) = (self.width() as i32, self.height() as i32);
        if x < 0 || y < 0 || x >= w || y >= h || cover <= 0.0 {
            return false;
        }
        let a = (cover.min(1.0) * c.a as f32 / 255.0).clamp(0.0, 1.0);
        let idx = (y * w + x) as usize;
        let dst = self.pixmap.pixels()[idx];
        let mix = |s: u8, d: u8| (s as f32 * a + d as f32 * (1.0 - a)).round() as u8;
        let out_a = mix(255, dst.alpha());
        // Premultiplied source over premultiplied destination.
        let r = mix(c.r, dst.red()).min(out_a);
        let g = mix(c.g, dst.green()).min(out_a);
        let b = mix(c.b, dst.blue()).min(out_a);
        self.pixmap.pixels_mut()[idx] =
            PremultipliedColorU8::from_rgba(r, g, b, out_a).expect("valid premultiplied colour");
        true
    }

    /// Lays a straight-alpha raster over the canvas with its top-left corner at
    /// (x0, y0), "over" compositing; what falls outside the canvas is dropped.
    pub fn paste(&mut self, x0: i32, y0: i32, img: &image::RgbaImage) {
        self.record(Op::Image {
            x: x0,
            y: y0,
            image: img.clone(),
        });
        for (x, y, p) in img.enumerate_pixels() {
            let [r, g, b, a] = p.0;
            if a > 0 {
                let c = Colour { r, g, b, a };
                self.blend_pixel(x0 + x as i32, y0 + y as i32, c, 1.0);
            }
        }
    }

    /// The figure as a PNG file (see `io::png`).
    pub fn encode_png(&self, meta: &crate::io::png::PngMeta) -> crate::Result<Vec<u8>> {
        crate::io::png::encode(&self.to_image(), meta)
    }
}

/// A mask letting drawing through inside the rectangle (x, y, w, h) only.
fn clip_mask(width: u32, height: u32, [x, y, w, h]: [f32; 4]) -> Option<Mask> {
    let mut mask = Mask::new(width, height)?;
    let path = PathBuilder::from_rect(Rect::from_xywh(x, y, w, h)?);
    mask.fill_path(&path, FillRule::Winding, false, Transform::identity());
    Some(mask)
}
