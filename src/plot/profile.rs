//! The profile chart: field values along a line, with the nuclei on it marked.

use plotters::element::PathElement;
use plotters::prelude::*;

use super::backend::CanvasBackend;
use super::{PALETTE, SUPERSAMPLE, Sizes, axis_decimals, padded, plot_error};
use crate::error::Result;
use crate::render::canvas::{Canvas, Colour, HAlign, VAlign};
use crate::render::ticks;

pub struct Series<'a> {
    /// Legend entry (markup).
    pub label: String,
    pub values: &'a [f64],
}

pub struct Profile<'a> {
    pub title: String,
    /// Positions along the line (Å).
    pub s: &'a [f64],
    pub series: Vec<Series<'a>>,
    /// "ψ / bohr^{−3/2}" (markup).
    pub y_label: String,
    pub x_label: String,
    /// Nuclei on the line: label and position (Å).
    pub nuclei: Vec<(String, f64)>,
    pub footnotes: Vec<String>,
    pub width: u32,
    pub background: Colour,
}

pub fn draw(p: &Profile) -> Result<Canvas> {
    let z = Sizes::new(p.width * SUPERSAMPLE);
    let height = (p.width as f32 * 0.62) as u32 * SUPERSAMPLE;
    let mut canvas = Canvas::new(p.width * SUPERSAMPLE, height, p.background);
    let top = (z.margin_top() + 1.6 * z.label) as u32;
    let bottom = (super::wrap_notes(&p.footnotes, &z, canvas.width()).len() as f32 * 1.35 * z.foot
        + 14.0 * z.k) as u32;
    let (x0, x1) = (p.s[0], p.s[p.s.len() - 1]);
    let all = p.series.iter().flat_map(|s| s.values.iter().copied());
    let (lo, hi) = all.fold((0.0f64, 0.0f64), |(a, b), v| (a.min(v), b.max(v)));
    let (y0, mut y1) = padded(lo, hi, 0.06);
    if p.series.len() > 1 {
        // Headroom for the legend, so it covers no curve.
        y1 += 0.12 * (hi - lo) * p.series.len() as f64;
    }
    let yd = axis_decimals(y0, y1, 8);
    let xd = axis_decimals(x0, x1, 10);
    let legend = (30.0 * z.k) as i32;
    let mut nucleus_labels: Vec<(String, (i32, i32))> = Vec::new();
    {
        let root = CanvasBackend {
            canvas: &mut canvas,
        }
        .into_drawing_area();
        let mut chart = ChartBuilder::on(&root)
            .margin_top(top)
            .margin_bottom(bottom)
            .margin_left((16.0 * z.k) as u32)
            .margin_right((30.0 * z.k) as u32)
            .x_label_area_size((3.2 * z.label) as u32)
            .y_label_area_size((6.0 * z.label) as u32)
            .build_cartesian_2d(x0..x1, y0..y1)
            .map_err(plot_error)?;
        chart
            .configure_mesh()
            .set_all_tick_mark_size((6.0 * z.k) as u32)
            .axis_style(ShapeStyle::from(&BLACK).stroke_width(z.thin))
            .light_line_style(TRANSPARENT)
            .bold_line_style(RGBColor(215, 215, 215))
            .label_style(("sans-serif", z.label as f64))
            .axis_desc_style(("sans-serif", z.desc as f64))
            .x_desc(p.x_label.as_str())
            .y_desc(p.y_label.as_str())
            .x_labels(10)
            .y_labels(8)
            .x_label_formatter(&|v| ticks::label(*v, xd))
            .y_label_formatter(&|v| ticks::label(*v, yd))
            .draw()
            .map_err(plot_error)?;
        if y0 < 0.0 && y1 > 0.0 {
            chart
                .draw_series(LineSeries::new(
                    [(x0, 0.0), (x1, 0.0)],
                    ShapeStyle::from(&RGBColor(90, 90, 90)).stroke_width(z.thin),
                ))
                .map_err(plot_error)?;
        }
        for (label, x) in &p.nuclei {
            chart
                .draw_series(DashedLineSeries::new(
                    [(*x, y0), (*x, y1)],
                    (6.0 * z.k) as i32,
                    (5.0 * z.k) as i32,
                    ShapeStyle::from(&RGBColor(100, 100, 100)).stroke_width(z.thin),
                ))
                .map_err(plot_error)?;
            // Labels go above the frame, clear of the curves and the legend.
            nucleus_labels.push((label.clone(), chart.backend_coord(&(*x, y1))));
        }
        for (i, s) in p.series.iter().enumerate() {
            let colour = PALETTE[i % PALETTE.len()];
            let style = ShapeStyle::from(&colour).stroke_width(z.line);
            // One line per run of samples with values: the line breaks at gaps (NaN).
            let mut runs = runs(p.s, s.values).into_iter();
            let first = runs.next().unwrap_or_default();
            chart
                .draw_series(LineSeries::new(first, style))
                .map_err(plot_error)?
                .label(s.label.as_str())
                .legend(move |(x, y)| PathElement::new([(x, y), (x + legend, y)], style));
            for run in runs {
                chart
                    .draw_series(LineSeries::new(run, style))
                    .map_err(plot_error)?;
            }
        }
        if p.series.len() > 1 {
            chart
                .configure_series_labels()
                .legend_area_size((44.0 * z.k) as u32)
                .position(SeriesLabelPosition::UpperRight)
                .margin((14.0 * z.k) as u32)
                .label_font(("sans-serif", z.label as f64))
                .background_style(WHITE.mix(0.9))
                .border_style(RGBColor(150, 150, 150))
                .draw()
                .map_err(plot_error)?;
        }
        root.present().map_err(plot_error)?;
    }
    for (label, (x, y)) in &nucleus_labels {
        canvas.text(
            label,
            z.label,
            *x as f32,
            *y as f32 - 4.0 * z.k,
            (HAlign::Centre, VAlign::Bottom),
            Colour::rgb(60, 60, 60),
        );
    }
    finish(&mut canvas, &p.title, &p.footnotes, &z);
    Ok(canvas.downsample(SUPERSAMPLE))
}

/// The points of a series split into runs of finite values.
fn runs(s: &[f64], values: &[f64]) -> Vec<Vec<(f64, f64)>> {
    let mut out: Vec<Vec<(f64, f64)>> = vec![Vec::new()];
    for (x, y) in s.iter().zip(values) {
        if y.is_finite() {
            out.last_mut().expect("never empty").push((*x, *y));
        } else if !out.last().expect("never empty").is_empty() {
            out.push(Vec::new());
        }
    }
    out.retain(|r| !r.is_empty());
    out
}

/// Title at the top and footnotes at the bottom, in our own text.
pub(crate) fn finish(c: &mut Canvas, title: &str, footnotes: &[String], z: &Sizes) {
    let w = c.width() as f32;
    let footnotes = super::wrap_notes(footnotes, z, c.width());
    // A long title is set smaller rather than cut at the edges.
    let room = w - 32.0 * z.k;
    let tw = crate::render::text::measure(title, z.title).width;
    let title_size = if tw > room {
        z.title * room / tw
    } else {
        z.title
    };
    c.text(
        title,
        title_size,
        w / 2.0,
        14.0 * z.k,
        (HAlign::Centre, VAlign::Top),
        Colour::INK,
    );
    let mut y = c.height() as f32 - 10.0 * z.k - footnotes.len() as f32 * 1.35 * z.foot;
    for f in &footnotes {
        c.text(
            f,
            z.foot,
            16.0 * z.k,
            y,
            (HAlign::Left, VAlign::Top),
            Colour::GREY,
        );
        y += 1.35 * z.foot;
    }
}
