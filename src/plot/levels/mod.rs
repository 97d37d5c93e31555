//! Orbital level diagrams: the molecule's levels as bars in the middle column on an
//! energy axis, optional fragment columns left and right, and lines from each
//! molecular level to the fragment levels it is built from, heavier with weight.
//! The caller chooses the window and the links; this file only places them.

use super::frame::line_height;
use super::size::*;
use super::{PALETTE, furniture};
use crate::error::{Error, Result};
use crate::render::canvas::{Canvas, Colour, HAlign, VAlign};
use crate::render::{text, ticks};
use marks::{boxed, electrons, gap_arrow, hund_filling, place, spread};

mod marks;
mod thumbs;

pub use thumbs::Thumbnail;

/// One level to draw: its energy in the diagram's unit, its number (from 1) and the
/// electrons it holds.
#[derive(Debug, Clone, PartialEq)]
pub struct Level {
    pub energy: f64,
    pub number: usize,
    pub occupation: f64,
}

/// A column of levels (already cut to the window) with its caption lines under it.
#[derive(Debug, Clone)]
pub struct Column {
    pub caption: Vec<String>,
    pub levels: Vec<Level>,
}

/// A line from molecular level `molecular` to level `level` of side column `side`
/// (0 left, 1 right), both by number, drawn heavier with `weight` (0 to 1).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Link {
    pub side: usize,
    pub molecular: usize,
    pub level: usize,
    pub weight: f64,
}

#[derive(Debug, Clone)]
pub struct Diagram {
    pub title: String,
    /// Axis name with unit, e.g. "orbital energy (eV)".
    pub axis: String,
    pub unit: String,
    /// Energy range shown (diagram unit).
    pub window: (f64, f64),
    pub middle: Column,
    /// No side columns, or exactly two (left, right).
    pub sides: Vec<Column>,
    pub links: Vec<Link>,
    pub homo: Option<usize>,
    pub lumo: Option<usize>,
    /// Levels closer than this (diagram unit) are one degenerate group.
    pub degeneracy: f64,
    pub footnotes: Vec<String>,
    pub width: u32,
    /// Pictures of chosen molecular orbitals, drawn in a strip on the right.
    pub thumbnails: Vec<Thumbnail>,
}

/// Height of the plot region as a fraction of the width.
const RATIO: f32 = 0.78;
const GAP: f32 = 4.0;
/// Electron arrow length (px).
const ARROW: f32 = 14.0;
/// Horizontal run of the leader from a bar's end to its moved label (px).
const LEADER: f32 = 10.0;
/// Sideways step between the electrons of crowded neighbouring levels (px).
const CROWD_STEP: f32 = 28.0;
/// Smallest widths (px) at which labels, captions and electrons stay apart, and the
/// smallest height of the plot region.
pub const MIN_WIDTH: u32 = 420;
pub const MIN_WIDTH_SIDES: u32 = 680;
const MIN_PLOT_H: f32 = 420.0;
const BAR: Colour = Colour::INK;
const HILITE: Colour = PALETTE[1];

/// Where each group of levels of a column sits: (y, x left, x right, members).
struct Placed {
    y: f32,
    left: f32,
    right: f32,
    members: Vec<Level>,
}

pub fn draw(d: &Diagram) -> Result<Canvas> {
    if !(d.sides.is_empty() || d.sides.len() == 2) {
        return Err(Error::input(
            "a level diagram has no fragment columns or exactly two",
        ));
    }
    // Text has fixed pixel sizes, so a diagram grows to the width its columns and
    // labels need rather than squeezing them (as the charts do).
    let min_w = if d.sides.is_empty() {
        MIN_WIDTH
    } else {
        MIN_WIDTH_SIDES
    };
    let strip = thumbs::strip_width(d);
    let w = d.width.max(min_w) as f32 + strip;
    let note_lines: Vec<String> = d
        .footnotes
        .iter()
        .flat_map(|n| text::wrap(n, FOOT, w - 2.0 * MARGIN))
        .collect();
    let notes_h = note_lines.len() as f32 * FOOT_LEADING * FOOT;
    let caption_rows = std::iter::once(&d.middle)
        .chain(&d.sides)
        .map(|c| c.caption.len())
        .max()
        .unwrap_or(0);
    let caption_h = caption_rows as f32 * line_height(FONT) * 1.2;
    let plot_h = ((w - strip) * RATIO)
        .max(MIN_PLOT_H)
        .max(thumbs::needed_height(d) + 2.0 * line_height(FONT));
    let h = (plot_h + notes_h + caption_h).ceil();
    let mut c = Canvas::new(w as u32, h as u32, Colour::WHITE);
    furniture::title(&mut c, &d.title);

    let (lo, hi) = d.window;
    let tick_values = ticks::nice(lo, hi, 8);
    let dec = ticks::decimals(if tick_values.len() > 1 {
        tick_values[1] - tick_values[0]
    } else {
        1.0
    });
    let labels: Vec<String> = tick_values.iter().map(|v| ticks::label(*v, dec)).collect();
    let label_w = labels
        .iter()
        .map(|l| text::measure(l, FONT).width)
        .fold(0.0, f32::max);
    let x0 = MARGIN + line_height(NAME) + 2.0 * GAP + label_w + GAP + TICK;
    let x1 = w - MARGIN - strip;
    let top = MARGIN + line_height(TITLE) + 2.0 * line_height(FONT);
    let bottom = h - MARGIN - notes_h - caption_h - GAP;
    // The window's ends sit an arrow's length inside the axis, so the electrons of a
    // level at either end stay clear of the captions and the title.
    let (y_lo, y_hi) = (bottom - ARROW, top + ARROW);
    let y_px = |e: f64| y_lo - ((e - lo) / (hi - lo)) as f32 * (y_lo - y_hi);

    // The energy axis.
    c.stroke(&[(x0, top), (x0, bottom)], THIN, Colour::INK, None);
    for (v, l) in tick_values.iter().zip(&labels) {
        let y = y_px(*v);
        c.stroke(&[(x0 - TICK, y), (x0, y)], THIN, Colour::INK, None);
        let at = (HAlign::Right, VAlign::Middle);
        c.text(l, FONT, x0 - TICK - GAP, y, at, Colour::INK);
    }
    let at = (HAlign::Centre, VAlign::Top);
    c.text_up(&d.axis, NAME, MARGIN, (top + bottom) / 2.0, at, Colour::INK);

    // Columns: centres and bar widths.
    let span = x1 - x0;
    let (centres, bar_w) = if d.sides.is_empty() {
        (vec![x0 + 0.5 * span], 0.22 * span)
    } else {
        (
            vec![x0 + 0.5 * span, x0 + 0.14 * span, x0 + 0.86 * span],
            0.14 * span,
        )
    };
    let columns: Vec<&Column> = std::iter::once(&d.middle).chain(&d.sides).collect();
    let placed: Vec<Vec<Placed>> = columns
        .iter()
        .zip(&centres)
        .map(|(col, &cx)| place(col, cx, bar_w, d.degeneracy, &y_px))
        .collect();

    // Links first, so bars and labels lie on top.
    let find = |col: usize, n: usize| {
        placed[col]
            .iter()
            .find(|p| p.members.iter().any(|l| l.number == n))
    };
    for l in &d.links {
        if let (Some(m), Some(f)) = (find(0, l.molecular), find(l.side + 1, l.level)) {
            let (a, b) = if l.side == 0 {
                ((m.left, m.y), (f.right, f.y))
            } else {
                ((m.right, m.y), (f.left, f.y))
            };
            let width = THIN + 3.0 * l.weight.clamp(0.0, 1.0) as f32;
            c.stroke(
                &[a, b],
                width,
                PALETTE[0].with_alpha(170),
                Some(&[5.0, 3.0]),
            );
        }
    }

    // Bars, electrons and numbers.
    // Where each middle-column label ends: (level number, x, y), for the leaders
    // of the pictures.
    let mut label_ends: Vec<(usize, f32, f32)> = Vec::new();
    for (k, groups) in placed.iter().enumerate() {
        let label_side = if k == 1 { HAlign::Right } else { HAlign::Left };
        let mut label_ys: Vec<f32> = groups.iter().map(|g| g.y).collect();
        spread(&mut label_ys, line_height(FONT) + 1.0, top, bottom);
        // Electron arrows no longer than the room to the neighbouring bars; bars
        // closer than an arrow form a crowd whose arrows step sideways, so each
        // level's electrons stay apart from its neighbours'.
        let room: Vec<f32> = (0..groups.len())
            .map(|i| {
                let below = i.checked_sub(1).map(|j| groups[j].y - groups[i].y);
                let above = groups.get(i + 1).map(|n| groups[i].y - n.y);
                let near = below.into_iter().chain(above).fold(f32::INFINITY, f32::min);
                (0.8 * near).clamp(11.0, ARROW)
            })
            .collect();
        let mut shift = vec![0.0f32; groups.len()];
        let mut i = 0;
        while i < groups.len() {
            let mut j = i;
            while j + 1 < groups.len() && groups[j].y - groups[j + 1].y < ARROW {
                j += 1;
            }
            let mid = (i + j) as f32 / 2.0;
            for (t, v) in shift.iter_mut().enumerate().take(j + 1).skip(i) {
                *v = (t as f32 - mid) * CROWD_STEP;
            }
            i = j + 1;
        }
        for (gi, (g, ly)) in groups.iter().zip(label_ys).enumerate() {
            let n = g.members.len() as f32;
            let sub = (g.right - g.left - (n - 1.0) * 2.0 * GAP) / n;
            let whole = hund_filling(&g.members);
            for (i, whole_i) in whole.iter().enumerate() {
                let xa = g.left + i as f32 * (sub + 2.0 * GAP);
                // A degenerate HOMO or LUMO level is marked as a whole.
                let frontier = k == 0
                    && g.members
                        .iter()
                        .any(|m| Some(m.number) == d.homo || Some(m.number) == d.lumo);
                let colour = if frontier { HILITE } else { BAR };
                c.fill_rect(xa, g.y - 1.5, sub, 3.0, colour);
                electrons(&mut c, xa + sub / 2.0 + shift[gi], g.y, *whole_i, room[gi]);
            }
            let mut text_ = g
                .members
                .iter()
                .map(|l| l.number.to_string())
                .collect::<Vec<_>>()
                .join(", ");
            if k == 0 {
                for l in &g.members {
                    if Some(l.number) == d.homo {
                        text_ += " HOMO";
                    } else if Some(l.number) == d.lumo {
                        text_ += " LUMO";
                    }
                }
            }
            // A moved label hangs on a short leader from the bar's end.
            let (end, dir) = match label_side {
                HAlign::Right => (g.left, -1.0),
                _ => (g.right, 1.0),
            };
            if (ly - g.y).abs() > 1.0 {
                let pts = [(end + dir, g.y), (end + dir * LEADER, ly)];
                c.stroke(&pts, THIN, Colour::GREY, None);
            }
            boxed(&mut c, &text_, end + dir * (LEADER + 2.0), ly, label_side);
            if k == 0 {
                let x = end + LEADER + 2.0 + text::measure(&text_, FONT).width + 2.0;
                label_ends.extend(g.members.iter().map(|m| (m.number, x, ly)));
            }
        }
    }

    gap_arrow(&mut c, d, &placed[0], &y_px);
    // Without fragment columns the way from a label to the strip is clear.
    let starts = if d.sides.is_empty() {
        &label_ends[..]
    } else {
        &[]
    };
    thumbs::draw(&mut c, d, x1 + 2.0 * GAP, (top, bottom), &y_px, starts);

    // Captions under the columns.
    for (col, &cx) in columns.iter().zip(&centres) {
        let mut y = bottom + GAP;
        for line in &col.caption {
            c.text(
                line,
                FONT,
                cx,
                y,
                (HAlign::Centre, VAlign::Top),
                Colour::INK,
            );
            y += line_height(FONT) * 1.2;
        }
    }
    furniture::notes(&mut c, &note_lines);
    Ok(c)
}
