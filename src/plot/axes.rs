//! A chart's axes: light grid lines at the ticks, the frame, outward ticks, their
//! labels and the axis names (the right one only with a twin axis).

use super::chart::Chart;
use super::frame::{LABEL_GAP, Layout, line_height};
use super::size::*;
use crate::render::axes::LabelBox;
use crate::render::canvas::{Canvas, Colour, HAlign, VAlign};
use crate::render::text;

const GRID: Colour = Colour::rgb(226, 226, 226);

/// A 1-px line drawn on a pixel centre stays sharp.
fn crisp(v: f32) -> f32 {
    v.floor() + 0.5
}

/// Grid lines, drawn first so that everything else lies over them.
pub fn grid(c: &mut Canvas, l: &Layout) {
    let f = &l.frame;
    for x in &l.x.values {
        let px = crisp(f.x_px(*x));
        c.stroke(&[(px, f.top), (px, f.bottom())], THIN, GRID, None);
    }
    for y in &l.y.values {
        let py = crisp(f.y_px(*y));
        c.stroke(&[(f.left, py), (f.right(), py)], THIN, GRID, None);
    }
}

/// The frame, ticks, tick labels and axis names; returns the tick labels' boxes.
pub fn draw(c: &mut Canvas, chart: &Chart, l: &Layout) -> Vec<LabelBox> {
    let f = &l.frame;
    let ink = Colour::INK;
    // The frame lies just outside the plot area.
    c.stroke_rect(
        f.left - 0.5,
        f.top - 0.5,
        f.width + 1.0,
        f.height + 1.0,
        THIN,
        ink,
    );
    let mut boxes = Vec::new();
    let below = f.bottom() + TICK + LABEL_GAP;
    for (v, t) in l.x.values.iter().zip(l.x.labels()) {
        let x = crisp(f.x_px(*v));
        c.stroke(&[(x, f.bottom()), (x, f.bottom() + TICK)], THIN, ink, None);
        let e = text::measure(&t, FONT);
        c.text(&t, FONT, x, below, (HAlign::Centre, VAlign::Top), ink);
        boxes.push([x - e.width / 2.0, below, e.width, e.height()]);
    }
    let at = f.left - TICK - LABEL_GAP;
    for (v, t) in l.y.values.iter().zip(l.y.labels()) {
        let y = crisp(f.y_px(*v));
        c.stroke(&[(f.left - TICK, y), (f.left, y)], THIN, ink, None);
        let e = text::measure(&t, FONT);
        c.text(&t, FONT, at, y, (HAlign::Right, VAlign::Middle), ink);
        boxes.push([at - e.width, y - e.height() / 2.0, e.width, e.height()]);
    }
    if let Some(r) = &l.right {
        let at = f.right() + TICK + LABEL_GAP;
        for (v, t) in r.values.iter().zip(r.labels()) {
            let y = crisp(f.twin_px(*v));
            c.stroke(&[(f.right(), y), (f.right() + TICK, y)], THIN, ink, None);
            let e = text::measure(&t, FONT);
            c.text(&t, FONT, at, y, (HAlign::Left, VAlign::Middle), ink);
            boxes.push([at, y - e.height() / 2.0, e.width, e.height()]);
        }
    }
    names(c, chart, l);
    boxes
}

/// Axis names: centred under the x axis, turned beside the y axes.
fn names(c: &mut Canvas, chart: &Chart, l: &Layout) {
    let f = &l.frame;
    let ink = Colour::INK;
    let under = f.bottom() + TICK + LABEL_GAP + line_height(FONT) + 8.0;
    let mid_x = f.left + f.width / 2.0;
    let mid_y = f.top + f.height / 2.0;
    c.text(
        &chart.x.name,
        NAME,
        mid_x,
        under,
        (HAlign::Centre, VAlign::Top),
        ink,
    );
    // A turned name longer than the frame is high is set smaller rather than cut.
    let fit = |name: &str| {
        let w = text::measure(name, NAME).width;
        NAME * (f.height + 40.0).min(w) / w
    };
    c.text_up(
        &chart.y.name,
        fit(&chart.y.name),
        MARGIN,
        mid_y,
        (HAlign::Centre, VAlign::Top),
        ink,
    );
    if let Some(t) = &chart.twin {
        c.text_down(
            &t.name,
            fit(&t.name),
            l.width as f32 - MARGIN,
            mid_y,
            (HAlign::Centre, VAlign::Top),
            ink,
        );
    }
}
