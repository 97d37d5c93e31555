//! Axes of a map: a frame, outward ticks at nice lengths in ångström, tick labels
//! and axis names with units. Tick density follows the measured label sizes, so
//! labels never overlap on small panel maps.

use super::canvas::{Canvas, Colour, HAlign, VAlign};
use super::text;
use super::ticks;
use crate::chem::units::bohr_to_angstrom;
use crate::grid::plane::Window;

pub struct Axes<'a> {
    pub x: f32,
    pub y: f32,
    pub width: f32,
    pub height: f32,
    /// The window shown (bohr); labels are in Å.
    pub window: Window,
    pub u_label: &'a str,
    pub v_label: &'a str,
    pub font: f32,
}

/// A drawn label's box: left, top, width, height (px).
pub type LabelBox = [f32; 4];

/// Whether two boxes share any area.
pub fn overlap(a: &LabelBox, b: &LabelBox) -> bool {
    a[0] < b[0] + b[2] && b[0] < a[0] + a[2] && a[1] < b[1] + b[3] && b[1] < a[1] + a[3]
}

const TICK: f32 = 6.0;
const LW: f32 = 1.0;

/// Draws the axes and returns the boxes of the tick labels.
pub fn draw(c: &mut Canvas, a: &Axes) -> Vec<LabelBox> {
    // The frame lies just outside the map, so no sampled pixel is painted over.
    c.stroke_rect(
        a.x - LW / 2.0,
        a.y - LW / 2.0,
        a.width + LW,
        a.height + LW,
        LW,
        Colour::INK,
    );
    let w = &a.window;
    let (u0, u1) = (bohr_to_angstrom(w.u0), bohr_to_angstrom(w.u1));
    let (v0, v1) = (bohr_to_angstrom(w.v0), bohr_to_angstrom(w.v1));
    // Neighbouring labels keep at least this much free space between them.
    let pad = 0.8 * a.font;
    let x_of = |u: f64| a.x + ((u - u0) / (u1 - u0)) as f32 * a.width;
    let y_of = |v: f64| a.y + ((v1 - v) / (v1 - v0)) as f32 * a.height;
    let widths = |t: &[f64], d: usize| -> Vec<f32> {
        t.iter()
            .map(|u| text::measure(&ticks::label(*u, d), a.font).width)
            .collect()
    };
    let max_ticks = |px: f32| ((px / (3.0 * a.font)) as usize).clamp(2, 10);
    let (us, ud) = ticks::fitted(u0, u1, max_ticks(a.width), |t, d| {
        let wd = widths(t, d);
        t.windows(2)
            .zip(wd.windows(2))
            .all(|(p, w)| x_of(p[1]) - x_of(p[0]) >= 0.5 * (w[0] + w[1]) + pad)
    });
    let line = text::measure("0", a.font).height();
    let (vs, vd) = ticks::fitted(v0, v1, max_ticks(a.height), |t, _| {
        t.windows(2)
            .all(|p| y_of(p[0]) - y_of(p[1]) >= line + 0.3 * pad)
    });
    let mut boxes = Vec::new();
    let yb = a.y + a.height;
    for u in &us {
        let x = x_of(*u);
        c.stroke(&[(x, yb), (x, yb + TICK)], LW, Colour::INK, None);
        let t = ticks::label(*u, ud);
        let e = text::measure(&t, a.font);
        let top = yb + TICK + 2.0;
        c.text(
            &t,
            a.font,
            x,
            top,
            (HAlign::Centre, VAlign::Top),
            Colour::INK,
        );
        boxes.push([x - e.width / 2.0, top, e.width, e.height()]);
    }
    let mut widest: f32 = 0.0;
    for v in &vs {
        let y = y_of(*v);
        c.stroke(&[(a.x - TICK, y), (a.x, y)], LW, Colour::INK, None);
        let t = ticks::label(*v, vd);
        let e = text::measure(&t, a.font);
        widest = widest.max(e.width);
        let right = a.x - TICK - 3.0;
        c.text(
            &t,
            a.font,
            right,
            y,
            (HAlign::Right, VAlign::Middle),
            Colour::INK,
        );
        boxes.push([right - e.width, y - e.height() / 2.0, e.width, e.height()]);
    }
    let name = a.font * 1.1;
    let below = yb + TICK + 2.0 + 1.35 * a.font + 4.0;
    c.text(
        &format!("{} / Å", a.u_label),
        name,
        a.x + a.width / 2.0,
        below,
        (HAlign::Centre, VAlign::Top),
        Colour::INK,
    );
    let left = a.x - TICK - 3.0 - widest - 6.0;
    c.text_up(
        &format!("{} / Å", a.v_label),
        name,
        left,
        a.y + a.height / 2.0,
        (HAlign::Centre, VAlign::Bottom),
        Colour::INK,
    );
    boxes
}
