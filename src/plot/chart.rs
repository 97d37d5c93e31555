//! A line chart described as plain data — axes with names and units, an optional
//! twin y axis linked linearly to the left one, series, markers and notes — and
//! `draw`, which lays it out (`frame`) and paints it on the shared canvas.

use super::frame::{Frame, layout, marker_label_boxes};
use super::size::*;
use super::{axes, furniture};
use crate::render::axes::LabelBox;
use crate::render::canvas::{Canvas, Colour, HAlign, VAlign};
use crate::render::text;

/// One axis: its name with the unit (markup) and the data range shown.
pub struct Axis {
    pub name: String,
    pub lo: f64,
    pub hi: f64,
}

/// A right-hand y axis showing the left one's values in another unit, or a second
/// quantity on its own scale: right = scale · left + offset.
pub struct Twin {
    pub name: String,
    pub scale: f64,
    pub offset: f64,
}

impl Twin {
    /// The same quantity in another unit (e.g. hartree → eV: `scale` = eV per hartree).
    pub fn unit(name: &str, scale: f64) -> Twin {
        Twin {
            name: name.into(),
            scale,
            offset: 0.0,
        }
    }
    /// A second quantity whose range `right` spans the height of the left range `left`.
    pub fn spanning(name: &str, left: (f64, f64), right: (f64, f64)) -> Twin {
        let scale = (right.1 - right.0) / (left.1 - left.0);
        Twin {
            name: name.into(),
            scale,
            offset: right.0 - scale * left.0,
        }
    }
    pub fn right_of(&self, left: f64) -> f64 {
        self.scale * left + self.offset
    }
}

/// A polyline through (x, y); a non-finite y breaks it.
pub struct Series<'a> {
    /// Legend entry (markup); `None` keeps it out of the legend.
    pub label: Option<String>,
    pub xs: &'a [f64],
    pub ys: &'a [f64],
    pub colour: Colour,
    pub width: f32,
    /// On and off lengths (px).
    pub dash: Option<[f32; 2]>,
    /// Radius of a dot at every point (px).
    pub marker: Option<f32>,
    /// Values are on the twin axis.
    pub on_twin: bool,
}

impl<'a> Series<'a> {
    pub fn line(label: Option<String>, xs: &'a [f64], ys: &'a [f64], colour: Colour) -> Self {
        Series {
            label,
            xs,
            ys,
            colour,
            width: LINE,
            dash: None,
            marker: None,
            on_twin: false,
        }
    }
}

/// A dashed vertical line across the frame with its label above the frame.
pub struct Vertical {
    pub x: f64,
    pub label: String,
}

/// A marked point (a dot) with a label beside it, e.g. the equilibrium.
pub struct Point {
    pub x: f64,
    pub y: f64,
    pub label: String,
}

pub struct Chart<'a> {
    pub title: String,
    /// Asked-for width (px); the chart grows if its plot area would be too small.
    pub width: u32,
    pub background: Colour,
    pub x: Axis,
    pub y: Axis,
    pub twin: Option<Twin>,
    pub series: Vec<Series<'a>>,
    pub verticals: Vec<Vertical>,
    pub points: Vec<Point>,
    /// Footnotes (markup), wrapped to the width.
    pub notes: Vec<String>,
    pub legend: bool,
    /// Raise the top of the y range so that the legend covers no value up to `y.hi`.
    pub legend_headroom: bool,
}

/// A drawn chart with its frame (for mapping data to pixels) and the boxes of its
/// tick labels (for checking that none overlap).
pub struct Drawn {
    pub canvas: Canvas,
    pub frame: Frame,
    pub tick_boxes: Vec<LabelBox>,
    pub legend: Option<LabelBox>,
}

const GUIDE: Colour = Colour::rgb(100, 100, 100);

pub fn draw(chart: &Chart) -> Drawn {
    let l = layout(chart);
    let f = l.frame;
    let mut canvas = Canvas::new(l.width, l.height, chart.background);
    axes::grid(&mut canvas, &l);
    let mask = frame_mask(&f);
    for v in &chart.verticals {
        let x = f.x_px(v.x).floor() + 0.5;
        let pts = [(x, f.top), (x, f.bottom())];
        stroke_masked(&mut canvas, &pts, THIN, GUIDE, Some([6.0, 5.0]), &mask);
    }
    for s in &chart.series {
        series(&mut canvas, &f, s, &mask);
    }
    let tick_boxes = axes::draw(&mut canvas, chart, &l);
    let (label_boxes, _) = marker_label_boxes(chart, &f);
    for (v, b) in chart.verticals.iter().zip(&label_boxes) {
        let at = (HAlign::Left, VAlign::Top);
        canvas.text(&v.label, FONT, b[0], b[1], at, Colour::rgb(60, 60, 60));
    }
    for p in &chart.points {
        point(&mut canvas, &f, p);
    }
    let legend = if chart.legend {
        furniture::legend(&mut canvas, &f, &chart.series)
    } else {
        None
    };
    furniture::title(&mut canvas, &chart.title);
    furniture::notes(&mut canvas, &l.notes);
    Drawn {
        canvas,
        frame: f,
        tick_boxes,
        legend,
    }
}

/// A series as polylines, one per run of finite values, and its dots.
fn series(c: &mut Canvas, f: &Frame, s: &Series, mask: &Option<[f32; 4]>) {
    let to_px = |x: f64, y: f64| {
        let y = if s.on_twin { f.from_twin(y) } else { y };
        f.px(x, y)
    };
    let mut run: Vec<(f32, f32)> = Vec::new();
    for (x, y) in s.xs.iter().zip(s.ys) {
        if y.is_finite() && x.is_finite() {
            run.push(to_px(*x, *y));
        } else {
            stroke_masked(c, &run, s.width, s.colour, s.dash, mask);
            run.clear();
        }
    }
    stroke_masked(c, &run, s.width, s.colour, s.dash, mask);
    if let Some(r) = s.marker {
        for (x, y) in s.xs.iter().zip(s.ys).filter(|(_, y)| y.is_finite()) {
            let (px, py) = to_px(*x, *y);
            let inside = (f.left..=f.right()).contains(&px) && (f.top..=f.bottom()).contains(&py);
            if inside {
                c.circle(px, py, r, s.colour, s.colour, 0.0);
            }
        }
    }
}

/// A black dot with its label to the lower right, or lower left near the frame's
/// right edge.
fn point(c: &mut Canvas, f: &Frame, p: &Point) {
    let (x, y) = f.px(p.x, p.y);
    c.circle(x, y, 5.0, Colour::BLACK, Colour::BLACK, 0.0);
    let w = text::measure(&p.label, FONT).width;
    let (tx, h) = if x + 10.0 + w > f.right() - 4.0 {
        (x - 10.0, HAlign::Right)
    } else {
        (x + 10.0, HAlign::Left)
    };
    c.text(&p.label, FONT, tx, y + 5.0, (h, VAlign::Top), Colour::INK);
}

/// A mask that lets drawing through inside the frame only, so lines leaving the
/// chart's range end at the frame.
fn frame_mask(f: &Frame) -> Option<[f32; 4]> {
    Some([f.left, f.top, f.width, f.height])
}

fn stroke_masked(
    c: &mut Canvas,
    pts: &[(f32, f32)],
    width: f32,
    colour: Colour,
    dash: Option<[f32; 2]>,
    mask: &Option<[f32; 4]>,
) {
    c.stroke_clipped(pts, width, colour, dash.as_ref().map(|d| &d[..]), *mask);
}
