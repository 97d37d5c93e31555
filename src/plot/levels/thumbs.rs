//! Small 3-D pictures of chosen orbitals in a strip right of the diagram, each
//! beside the energy of its level: a mark on the strip's edge at the level's
//! energy, a leader to the picture, and the level's number under it.

use image::RgbaImage;

use super::{Diagram, GAP, HILITE};
use crate::plot::frame::line_height;
use crate::plot::size::*;
use crate::render::canvas::{Canvas, Colour, HAlign, VAlign};

/// A picture of orbital `number` (from 1) and the isovalue its surfaces show.
#[derive(Debug, Clone)]
pub struct Thumbnail {
    pub number: usize,
    pub image: RgbaImage,
    pub isovalue: f64,
}

/// Horizontal run of the leader from the strip's edge to a picture (px).
const LEAD: f32 = 18.0;

/// Width the strip adds to the figure (0 without pictures).
pub(super) fn strip_width(d: &Diagram) -> f32 {
    let widest = d.thumbnails.iter().map(|t| t.image.width()).max();
    widest.map_or(0.0, |w| LEAD + w as f32 + 2.0 * GAP)
}

/// Height one picture takes with its caption and the space to the next.
fn slot_height(t: &Thumbnail) -> f32 {
    t.image.height() as f32 + line_height(FONT) + 3.0 * GAP
}

/// Height of the plot region the pictures need, stacked.
pub(super) fn needed_height(d: &Diagram) -> f32 {
    d.thumbnails.iter().map(slot_height).sum()
}

/// Draws the strip from `x` (its left edge) between `top` and `bottom`; a picture
/// whose level is outside the window is placed at the nearer end. `label_ends`
/// (level number, x, y) are where dotted leaders from the level labels start.
pub(super) fn draw(
    c: &mut Canvas,
    d: &Diagram,
    x: f32,
    (top, bottom): (f32, f32),
    y_px: &dyn Fn(f64) -> f32,
    label_ends: &[(usize, f32, f32)],
) {
    if d.thumbnails.is_empty() {
        return;
    }
    let slot = d.thumbnails.iter().map(slot_height).fold(0.0, f32::max);
    let level_y: Vec<f32> = d
        .thumbnails
        .iter()
        .map(|t| {
            let e = d
                .middle
                .levels
                .iter()
                .find(|l| l.number == t.number)
                .map_or(d.window.0, |l| l.energy);
            y_px(e).clamp(top, bottom)
        })
        .collect();
    let mut centres = level_y.clone();
    super::spread(&mut centres, slot, top + slot / 2.0, bottom - slot / 2.0);
    for ((t, &ly), &cy) in d.thumbnails.iter().zip(&level_y).zip(&centres) {
        let (iw, ih) = (t.image.width() as f32, t.image.height() as f32);
        let px = x + LEAD;
        let py = (cy - (ih + line_height(FONT) + GAP) / 2.0).round();
        let frontier = Some(t.number) == d.homo || Some(t.number) == d.lumo;
        let mark = if frontier { HILITE } else { Colour::INK };
        if let Some(&(_, sx, sy)) = label_ends.iter().find(|e| e.0 == t.number) {
            let dots = Some(&[2.0, 3.0][..]);
            c.stroke(
                &[(sx + GAP, sy), (x - 2.0 * GAP, ly)],
                THIN,
                Colour::GREY,
                dots,
            );
        }
        c.stroke(&[(x - 2.0 * GAP, ly), (x, ly)], 2.0, mark, None);
        c.stroke(
            &[(x, ly), (px - GAP, py + ih / 2.0)],
            THIN,
            Colour::GREY,
            Some(&[2.0, 2.0]),
        );
        c.paste(px as i32, py as i32, &t.image);
        c.stroke_rect(px, py, iw, ih, THIN, Colour::GREY);
        let mut caption = t.number.to_string();
        if Some(t.number) == d.homo {
            caption += " HOMO";
        } else if Some(t.number) == d.lumo {
            caption += " LUMO";
        }
        let at = (HAlign::Centre, VAlign::Top);
        c.text(
            &caption,
            FONT,
            px + iw / 2.0,
            py + ih + GAP,
            at,
            Colour::INK,
        );
    }
}
