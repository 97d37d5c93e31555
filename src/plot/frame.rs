//! Layout of a chart: room for the title, the tick labels, the axis names and the
//! footnotes in fixed pixels, the plot area (the frame) from what is left, ticks fitted
//! to measured label sizes so that no two labels overlap, and data → pixel mapping.

use super::chart::Chart;
use super::furniture::{LEGEND_INSET, legend_size};
use super::size::*;
use crate::render::axes::LabelBox;
use crate::render::text;
use crate::render::ticks;

/// The plot area in pixels and the data ranges it shows.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Frame {
    pub left: f32,
    pub top: f32,
    pub width: f32,
    pub height: f32,
    pub x: (f64, f64),
    pub y: (f64, f64),
    /// The twin axis as (scale, offset): right = scale · left + offset.
    pub twin: Option<(f64, f64)>,
}

impl Frame {
    pub fn right(&self) -> f32 {
        self.left + self.width
    }
    pub fn bottom(&self) -> f32 {
        self.top + self.height
    }
    pub fn x_px(&self, x: f64) -> f32 {
        self.left + ((x - self.x.0) / (self.x.1 - self.x.0)) as f32 * self.width
    }
    pub fn y_px(&self, y: f64) -> f32 {
        self.top + ((self.y.1 - y) / (self.y.1 - self.y.0)) as f32 * self.height
    }
    /// Pixel of the data point (x, y) on the left axis.
    pub fn px(&self, x: f64, y: f64) -> (f32, f32) {
        (self.x_px(x), self.y_px(y))
    }
    /// The left-axis value shown at the height of a right-axis value `r`.
    pub fn from_twin(&self, r: f64) -> f64 {
        let (a, b) = self.twin.unwrap_or((1.0, 0.0));
        (r - b) / a
    }
    /// Height (pixel row) of a value on the twin axis.
    pub fn twin_px(&self, r: f64) -> f32 {
        self.y_px(self.from_twin(r))
    }
}

/// Tick values of one axis and the decimal places their labels need.
#[derive(Debug, Clone, Default)]
pub struct Ticks {
    pub values: Vec<f64>,
    pub decimals: usize,
}

impl Ticks {
    pub fn labels(&self) -> Vec<String> {
        self.values
            .iter()
            .map(|v| ticks::label(*v, self.decimals))
            .collect()
    }
    fn widest(&self) -> f32 {
        self.labels()
            .iter()
            .map(|t| text::measure(t, FONT).width)
            .fold(0.0, f32::max)
    }
}

pub struct Layout {
    pub width: u32,
    pub height: u32,
    pub frame: Frame,
    pub x: Ticks,
    pub y: Ticks,
    pub right: Option<Ticks>,
    /// Footnotes broken into lines that fit the chart.
    pub notes: Vec<String>,
    /// Rows of labels above the frame (vertical markers).
    pub label_rows: usize,
}

/// Height of one line of text at `size` px.
pub fn line_height(size: f32) -> f32 {
    text::measure("0", size).height()
}

/// Free space kept between neighbouring tick labels (px).
const LABEL_PAD: f32 = 10.0;
/// Gap between a tick's end and its label.
pub const LABEL_GAP: f32 = 4.0;

/// Ticks along a vertical extent of `px` pixels: labels one line high plus padding.
fn fitted_vertical(lo: f64, hi: f64, px: f32) -> Ticks {
    let need = line_height(FONT) + 0.5 * LABEL_PAD;
    let max = ((px / (2.0 * need)) as usize).clamp(2, 10);
    let (values, decimals) = ticks::fitted(lo, hi, max, |t, _| {
        t.windows(2)
            .all(|p| (p[1] - p[0]) / (hi - lo) * px as f64 >= need as f64)
    });
    Ticks { values, decimals }
}

/// Lays out `c` at least `requested` px wide, with `rows` rows of marker labels
/// above the frame.
fn layout_with(c: &Chart, requested: f32, rows: usize) -> Layout {
    let notes: Vec<String> = c
        .notes
        .iter()
        .flat_map(|n| text::wrap(n, FOOT, requested - 2.0 * MARGIN))
        .collect();
    let name_h = 1.25 * line_height(NAME);
    let tick_h = line_height(FONT);
    let top = MARGIN + 1.4 * line_height(TITLE) + 6.0 + rows as f32 * 1.3 * tick_h + 4.0;
    let bottom = TICK
        + LABEL_GAP
        + tick_h
        + 8.0
        + name_h
        + 6.0
        + notes.len() as f32 * FOOT_LEADING * FOOT
        + MARGIN;
    let least = top + bottom + MIN_FRAME_H.max(FRAME_ASPECT * requested);
    let height = (ASPECT * requested).max(least).round();
    let frame_h = (height - top - bottom).floor();
    let (lo, hi) = (c.y.lo, with_headroom(c, frame_h));
    let y = fitted_vertical(lo, hi, frame_h);
    let twin = c.twin.as_ref().map(|t| (t.scale, t.offset));
    let right_ticks = c.twin.as_ref().map(|t| {
        let (a, b) = (t.right_of(lo), t.right_of(hi));
        fitted_vertical(a.min(b), a.max(b), frame_h)
    });
    let left = (MARGIN + name_h + 6.0 + y.widest() + LABEL_GAP + TICK).ceil();
    let x_end = text::measure(&ticks::label(c.x.hi, 3), FONT).width;
    let right_room = match &right_ticks {
        Some(r) => TICK + LABEL_GAP + r.widest() + 6.0 + name_h + MARGIN,
        None => MARGIN + 0.5 * x_end,
    }
    .ceil();
    // The legend's box fits inside the frame with its inset on both sides.
    let legend_w = match (c.legend, legend_size(&c.series)) {
        (true, Some((w, _))) => w + 2.0 * LEGEND_INSET,
        _ => 0.0,
    };
    let least = MIN_FRAME_W.max(legend_w);
    let width = requested.max(left + least + right_room).round();
    let frame = Frame {
        left,
        top: top.round(),
        width: width - left - right_room,
        height: frame_h,
        x: (c.x.lo, c.x.hi),
        y: (lo, hi),
        twin,
    };
    let x = fitted_horizontal(&frame, width);
    Layout {
        width: width as u32,
        height: height as u32,
        frame,
        x,
        y,
        right: right_ticks,
        notes,
        label_rows: rows,
    }
}

/// Ticks along the x axis: label boxes apart by `LABEL_PAD`, all inside the canvas.
fn fitted_horizontal(f: &Frame, canvas_w: f32) -> Ticks {
    let max = ((f.width / (3.0 * FONT)) as usize).clamp(2, 12);
    let (values, decimals) = ticks::fitted(f.x.0, f.x.1, max, |t, d| {
        let spans: Vec<(f32, f32)> = t
            .iter()
            .map(|v| {
                let w = text::measure(&ticks::label(*v, d), FONT).width;
                (f.x_px(*v) - w / 2.0, f.x_px(*v) + w / 2.0)
            })
            .collect();
        let inside = spans.iter().all(|s| s.0 >= 2.0 && s.1 <= canvas_w - 2.0);
        inside && spans.windows(2).all(|p| p[1].0 - p[0].1 >= LABEL_PAD)
    });
    Ticks { values, decimals }
}

/// Boxes of the labels above the frame, one per vertical marker, placed in rows so
/// that neighbours never overlap.
pub fn marker_label_boxes(c: &Chart, f: &Frame) -> (Vec<LabelBox>, usize) {
    let h = line_height(FONT);
    let mut ends: Vec<f32> = Vec::new();
    let mut boxes = Vec::new();
    let mut order: Vec<usize> = (0..c.verticals.len()).collect();
    order.sort_by(|a, b| c.verticals[*a].x.total_cmp(&c.verticals[*b].x));
    let mut placed = vec![[0.0; 4]; c.verticals.len()];
    for i in order {
        let v = &c.verticals[i];
        let w = text::measure(&v.label, FONT).width;
        let x = f.x_px(v.x) - w / 2.0;
        let row = ends.iter().position(|e| x >= e + 6.0).unwrap_or(ends.len());
        if row == ends.len() {
            ends.push(x + w);
        } else {
            ends[row] = x + w;
        }
        placed[i] = [x, f.top - 4.0 - (row as f32 + 1.0) * 1.3 * h, w, h];
    }
    boxes.extend(placed);
    (boxes, ends.len())
}

/// The top of the y range raised so that the legend's box (with a gap) covers no
/// value up to the asked-for top: y.hi then sits `room` px below the frame's top.
fn with_headroom(c: &Chart, frame_h: f32) -> f64 {
    let (lo, hi) = (c.y.lo, c.y.hi);
    if !(c.legend && c.legend_headroom) {
        return hi;
    }
    let Some((_, h)) = legend_size(&c.series) else {
        return hi;
    };
    let room = ((LEGEND_INSET + h + 6.0) / frame_h).min(0.6) as f64;
    (hi - lo * room) / (1.0 - room)
}

/// The layout of `c`: it is laid out again when it had to grow (so the footnotes
/// use the width) or needs more rows of marker labels.
pub fn layout(c: &Chart) -> Layout {
    let mut rows = usize::from(!c.verticals.is_empty());
    let mut width = c.width as f32;
    let mut l = layout_with(c, width, rows);
    for _ in 0..4 {
        let (_, need) = marker_label_boxes(c, &l.frame);
        if need <= rows && l.width as f32 <= width {
            break;
        }
        rows = rows.max(need);
        width = width.max(l.width as f32);
        l = layout_with(c, width, rows);
    }
    l
}
