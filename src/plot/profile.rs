//! The profile chart: field values along a line, with the nuclei on it marked.

use super::chart::{self, Axis, Chart, Vertical};
use super::{PALETTE, padded, size};
use crate::error::Result;
use crate::render::canvas::{Canvas, Colour};

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
    let (x0, x1) = (p.s[0], p.s[p.s.len() - 1]);
    let all = p.series.iter().flat_map(|s| s.values.iter().copied());
    let finite = all.filter(|v| v.is_finite());
    let (lo, hi) = finite.fold((0.0f64, 0.0f64), |(a, b), v| (a.min(v), b.max(v)));
    let (y0, y1) = padded(lo, hi, 0.06);
    let zero_x = [x0, x1];
    let zero_y = [0.0, 0.0];
    let mut series = Vec::new();
    if y0 < 0.0 && y1 > 0.0 {
        series.push(chart::Series {
            width: size::THIN,
            ..chart::Series::line(None, &zero_x, &zero_y, Colour::rgb(90, 90, 90))
        });
    }
    for (i, s) in p.series.iter().enumerate() {
        let colour = PALETTE[i % PALETTE.len()];
        // A gap (NaN) breaks the line: the chart draws runs of values only.
        series.push(chart::Series::line(
            Some(s.label.clone()),
            p.s,
            s.values,
            colour,
        ));
    }
    let chart = Chart {
        title: p.title.clone(),
        width: p.width,
        background: p.background,
        x: Axis {
            name: p.x_label.clone(),
            lo: x0,
            hi: x1,
        },
        y: Axis {
            name: p.y_label.clone(),
            lo: y0,
            hi: y1,
        },
        twin: None,
        series,
        verticals: p
            .nuclei
            .iter()
            .map(|(label, x)| Vertical {
                x: *x,
                label: label.clone(),
            })
            .collect(),
        points: Vec::new(),
        notes: p.footnotes.clone(),
        // One series is named by the y axis.
        legend: p.series.len() > 1,
        // Room above the curves for the legend, so it covers none of them.
        legend_headroom: true,
    };
    Ok(chart::draw(&chart).canvas)
}
