//! What surrounds the data: the title, the legend box and the footnotes.

use super::chart::Series;
use super::frame::{Frame, line_height};
use super::size::*;
use crate::render::canvas::{Canvas, Colour, HAlign, VAlign};
use crate::render::text;

/// The title centred at the top; a long one is set smaller rather than cut.
pub fn title(c: &mut Canvas, title: &str) {
    let w = c.width() as f32;
    let room = w - 2.0 * MARGIN;
    let tw = text::measure(title, TITLE).width;
    let size = if tw > room { TITLE * room / tw } else { TITLE };
    let (x, y) = (w / 2.0, MARGIN);
    c.text(
        title,
        size,
        x,
        y,
        (HAlign::Centre, VAlign::Top),
        Colour::INK,
    );
}

/// Footnote lines (already wrapped) at the bottom left, in grey.
pub fn notes(c: &mut Canvas, lines: &[String]) {
    let step = FOOT_LEADING * FOOT;
    let mut y = c.height() as f32 - MARGIN - lines.len() as f32 * step + 0.3 * FOOT;
    for line in lines {
        let at = (HAlign::Left, VAlign::Top);
        c.text(line, FOOT, MARGIN, y, at, Colour::GREY);
        y += step;
    }
}

/// Length of the line sample in front of a legend entry (px).
const SAMPLE: f32 = 30.0;
const PAD: f32 = 9.0;

/// Distance of the legend's box from the frame's top and right edges (px).
pub const LEGEND_INSET: f32 = 10.0;

fn entries<'s, 'a>(series: &'s [Series<'a>]) -> Vec<(&'s Series<'a>, &'s str)> {
    series
        .iter()
        .filter_map(|s| s.label.as_deref().map(|l| (s, l)))
        .collect()
}

fn row() -> f32 {
    1.5 * line_height(FONT)
}

/// Width and height of the legend's box, `None` with nothing to list.
pub fn legend_size(series: &[Series]) -> Option<(f32, f32)> {
    let entries = entries(series);
    if entries.is_empty() {
        return None;
    }
    let widest = entries
        .iter()
        .map(|(_, l)| text::measure(l, FONT).width)
        .fold(0.0, f32::max);
    let w = (PAD + SAMPLE + 8.0 + widest + PAD).ceil();
    let h = (entries.len() as f32 * row() + PAD).ceil();
    Some((w, h))
}

/// The legend: one entry per labelled series, in a box at the frame's upper right.
/// Returns its box (left, top, width, height), or `None` with nothing to list.
pub fn legend(c: &mut Canvas, f: &Frame, series: &[Series]) -> Option<[f32; 4]> {
    let (w, h) = legend_size(series)?;
    let entries = entries(series);
    let row = row();
    let (x, y) = ((f.right() - LEGEND_INSET - w).round(), f.top + LEGEND_INSET);
    c.fill_rect(x, y, w, h, Colour::WHITE.with_alpha(235));
    c.stroke_rect(
        x + 0.5,
        y + 0.5,
        w - 1.0,
        h - 1.0,
        THIN,
        Colour::rgb(160, 160, 160),
    );
    for (i, (s, label)) in entries.iter().enumerate() {
        let mid = y + PAD / 2.0 + (i as f32 + 0.5) * row;
        let dash = s.dash.as_ref().map(|d| &d[..]);
        let sample = [(x + PAD, mid), (x + PAD + SAMPLE, mid)];
        c.stroke(&sample, s.width, s.colour, dash);
        if let Some(r) = s.marker {
            c.circle(x + PAD + SAMPLE / 2.0, mid, r, s.colour, s.colour, 0.0);
        }
        let at = (HAlign::Left, VAlign::Middle);
        c.text(label, FONT, x + PAD + SAMPLE + 8.0, mid, at, Colour::INK);
    }
    Some([x, y, w, h])
}
