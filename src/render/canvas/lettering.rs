//! Text on the canvas: straight, turned up (vertical axis labels) or turned down.
//! Each draws ab_glyph's coverage pixel by pixel and records one `Op::Text` whose
//! matrix maps the text's own frame onto exactly those pixels.

use super::super::record::Op;
use super::super::text;
use super::{Canvas, Colour, HAlign, VAlign};

impl Canvas {
    /// Draws one line of markup at `size` px anchored at (x, y).
    pub fn text(&mut self, s: &str, size: f32, x: f32, y: f32, align: (HAlign, VAlign), c: Colour) {
        let e = text::measure(s, size);
        let (dx, dy) = offsets(&e, align);
        let (ox, oy) = ((x + dx).round() as i32, (y + dy).round() as i32);
        self.record_text(s, size, [1.0, 0.0, 0.0, 1.0, ox as f32, oy as f32], c);
        let mut cover = Vec::new();
        text::rasterize(s, size, |px, py, v| cover.push((px, py, v)));
        for (px, py, v) in cover {
            self.blend_pixel(ox + px, oy + py, c, v);
        }
    }

    /// Draws text turned 90° anticlockwise (reading upwards), for vertical axis labels;
    /// `align` refers to the turned text's own frame.
    pub fn text_up(
        &mut self,
        s: &str,
        size: f32,
        x: f32,
        y: f32,
        align: (HAlign, VAlign),
        c: Colour,
    ) {
        self.turned(s, size, (x, y), align, c, true);
    }

    /// Draws text turned 90° clockwise (reading downwards).
    pub fn text_down(
        &mut self,
        s: &str,
        size: f32,
        x: f32,
        y: f32,
        align: (HAlign, VAlign),
        c: Colour,
    ) {
        self.turned(s, size, (x, y), align, c, false);
    }

    /// Text turned a quarter up or down. Up: the pixel (px, py) of the text frame
    /// lands on (round(x + dy) + py, round(y − dx) − px), so as a mapping of areas the
    /// text point (u, w) goes to (round(x + dy) + w, round(y − dx) + 1 − u). Down is
    /// the mirror: (u, w) → (round(x − dy) + 1 − w, round(y + dx) + u).
    fn turned(
        &mut self,
        s: &str,
        size: f32,
        (x, y): (f32, f32),
        align: (HAlign, VAlign),
        c: Colour,
        up: bool,
    ) {
        let e = text::measure(s, size);
        let (dx, dy) = offsets(&e, align);
        let matrix = if up {
            [
                0.0,
                -1.0,
                1.0,
                0.0,
                (x + dy).round(),
                (y - dx).round() + 1.0,
            ]
        } else {
            [
                0.0,
                1.0,
                -1.0,
                0.0,
                (x - dy).round() + 1.0,
                (y + dx).round(),
            ]
        };
        self.record_text(s, size, matrix, c);
        let mut cover = Vec::new();
        text::rasterize(s, size, |px, py, v| cover.push((px, py, v)));
        for (px, py, v) in cover {
            // Text frame (u right, w down) → canvas.
            let (u, w) = (px as f32 + dx, py as f32 + dy);
            let (cx, cy) = if up { (x + w, y - u) } else { (x - w, y + u) };
            self.blend_pixel(cx.round() as i32, cy.round() as i32, c, v);
        }
    }

    fn record_text(&mut self, s: &str, size: f32, matrix: [f32; 6], colour: Colour) {
        self.record(Op::Text {
            text: s.to_string(),
            size,
            matrix,
            colour,
        });
    }
}

/// Offsets from the anchor to the left end of the baseline.
pub fn offsets(e: &text::Extent, (h, v): (HAlign, VAlign)) -> (f32, f32) {
    let dx = match h {
        HAlign::Left => 0.0,
        HAlign::Centre => -e.width / 2.0,
        HAlign::Right => -e.width,
    };
    let dy = match v {
        VAlign::Top => e.ascent,
        VAlign::Middle => (e.ascent - e.descent) / 2.0,
        VAlign::Baseline => 0.0,
        VAlign::Bottom => -e.descent,
    };
    (dx, dy)
}
