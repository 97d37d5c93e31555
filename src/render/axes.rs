//! Axes of a map: a frame, outward ticks at nice lengths in ångström, tick labels
//! and axis names with units.

use super::canvas::{Canvas, Colour, HAlign, VAlign};
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
    pub k: f32,
}

pub fn draw(c: &mut Canvas, a: &Axes) {
    let lw = (1.0 * a.k).max(1.0);
    let tick = 6.0 * a.k;
    // The frame lies just outside the map, so no sampled pixel is painted over.
    c.stroke_rect(
        a.x - lw / 2.0,
        a.y - lw / 2.0,
        a.width + lw,
        a.height + lw,
        lw,
        Colour::INK,
    );
    let w = &a.window;
    let (u0, u1) = (bohr_to_angstrom(w.u0), bohr_to_angstrom(w.u1));
    let (v0, v1) = (bohr_to_angstrom(w.v0), bohr_to_angstrom(w.v1));
    let target = |px: f32| ((px / (6.0 * a.font)) as usize).clamp(2, 8);
    let us = ticks::nice(u0, u1, target(a.width));
    let ud = ticks::decimals(step(&us));
    for u in &us {
        let x = a.x + ((u - u0) / (u1 - u0)) as f32 * a.width;
        let yb = a.y + a.height;
        c.stroke(&[(x, yb), (x, yb + tick)], lw, Colour::INK, None);
        c.text(
            &ticks::label(*u, ud),
            a.font,
            x,
            yb + tick + 2.0 * a.k,
            (HAlign::Centre, VAlign::Top),
            Colour::INK,
        );
    }
    let vs = ticks::nice(v0, v1, target(a.height));
    let vd = ticks::decimals(step(&vs));
    let mut widest: f32 = 0.0;
    for v in &vs {
        let y = a.y + ((v1 - v) / (v1 - v0)) as f32 * a.height;
        c.stroke(&[(a.x - tick, y), (a.x, y)], lw, Colour::INK, None);
        let t = ticks::label(*v, vd);
        widest = widest.max(super::text::measure(&t, a.font).width);
        c.text(
            &t,
            a.font,
            a.x - tick - 3.0 * a.k,
            y,
            (HAlign::Right, VAlign::Middle),
            Colour::INK,
        );
    }
    let name = a.font * 1.1;
    let below = a.y + a.height + tick + 2.0 * a.k + 1.35 * a.font + 4.0 * a.k;
    c.text(
        &format!("{} / Å", a.u_label),
        name,
        a.x + a.width / 2.0,
        below,
        (HAlign::Centre, VAlign::Top),
        Colour::INK,
    );
    let left = a.x - tick - 3.0 * a.k - widest - 6.0 * a.k;
    c.text_up(
        &format!("{} / Å", a.v_label),
        name,
        left,
        a.y + a.height / 2.0,
        (HAlign::Centre, VAlign::Bottom),
        Colour::INK,
    );
}

fn step(t: &[f64]) -> f64 {
    if t.len() > 1 { t[1] - t[0] } else { 1.0 }
}
