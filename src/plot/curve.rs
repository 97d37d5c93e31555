//! Charts of the two-centre energy curve: the bonding and antibonding energies with
//! the equilibrium marked (hartree on the left axis, eV on the right), and the
//! overlap, Coulomb and exchange integrals against R.

use plotters::element::{Circle, EmptyElement, PathElement, Text};
use plotters::prelude::*;

use super::backend::CanvasBackend;
use super::profile::finish;
use super::{PALETTE, SUPERSAMPLE, Sizes, axis_decimals, padded, plot_error};
use crate::chem::units::HARTREE_IN_EV;
use crate::error::Result;
use crate::render::canvas::{Canvas, Colour};
use crate::render::ticks;

pub struct CurveData {
    pub title: String,
    /// Separations (bohr).
    pub r: Vec<f64>,
    pub overlap: Vec<f64>,
    pub coulomb: Vec<f64>,
    pub exchange: Vec<f64>,
    pub e_bonding: Vec<f64>,
    pub e_antibonding: Vec<f64>,
    /// Legend names of the two energy curves.
    pub state_labels: [String; 2],
    /// (R_e, E_e) in bohr and hartree.
    pub equilibrium: Option<(f64, f64)>,
    /// Energy of the separated atom and nucleus (hartree).
    pub limit: f64,
    pub footnotes: Vec<String>,
    pub width: u32,
}

/// Pieces of a curve inside [lo, hi], cut where it leaves, with the crossing point
/// interpolated, so clipped lines end at the frame rather than run outside it.
pub fn clip(xs: &[f64], ys: &[f64], lo: f64, hi: f64) -> Vec<Vec<(f64, f64)>> {
    let mut pieces = Vec::new();
    let mut cur: Vec<(f64, f64)> = Vec::new();
    let inside = |y: f64| y >= lo && y <= hi;
    for i in 0..xs.len() {
        let (x, y) = (xs[i], ys[i]);
        if i > 0 && inside(y) != inside(ys[i - 1]) {
            let (xp, yp) = (xs[i - 1], ys[i - 1]);
            let edge = if y > hi || yp > hi { hi } else { lo };
            let t = (edge - yp) / (y - yp);
            cur.push((xp + t * (x - xp), edge));
            if !inside(y) {
                pieces.push(std::mem::take(&mut cur));
            }
        }
        if inside(y) {
            cur.push((x, y));
        }
    }
    if cur.len() > 1 {
        pieces.push(cur);
    }
    pieces.retain(|p| p.len() > 1);
    pieces
}

pub fn energies(d: &CurveData) -> Result<Canvas> {
    let z = Sizes::new(d.width * SUPERSAMPLE);
    let height = (d.width as f32 * 0.62) as u32 * SUPERSAMPLE;
    let mut canvas = Canvas::new(d.width * SUPERSAMPLE, height, Colour::WHITE);
    let (x0, x1) = (d.r[0], d.r[d.r.len() - 1]);
    let lowest = d.e_bonding.iter().copied().fold(f64::INFINITY, f64::min);
    let highest = d
        .e_bonding
        .iter()
        .chain(&d.e_antibonding)
        .copied()
        .fold(f64::NEG_INFINITY, f64::max);
    // The top of the chart is E = 0 (both states unbound above it) or the highest
    // energy if lower, so the bonding well is not squashed by the steep walls.
    let top = highest
        .min(d.limit + d.limit.abs())
        .max(d.limit + 0.1 * d.limit.abs());
    let (_, y1) = padded(lowest.min(d.limit), top, 0.04);
    // More room below the well, for the equilibrium's label.
    let y0 = lowest.min(d.limit) - 0.12 * (top - lowest.min(d.limit));
    let yd = axis_decimals(y0, y1, 8);
    let ed = axis_decimals(y0 * HARTREE_IN_EV, y1 * HARTREE_IN_EV, 8);
    let xd = axis_decimals(x0, x1, 10);
    let bottom =
        ((super::wrap_notes(&d.footnotes, &z, canvas.width()).len() + 1) as f32 * 1.35 * z.foot
            + 14.0 * z.k) as u32;
    let legend = (30.0 * z.k) as i32;
    {
        let root = CanvasBackend {
            canvas: &mut canvas,
        }
        .into_drawing_area();
        let mut chart = ChartBuilder::on(&root)
            .margin_top((z.margin_top() + 0.5 * z.label) as u32)
            .margin_bottom(bottom)
            .margin_left((16.0 * z.k) as u32)
            .margin_right((16.0 * z.k) as u32)
            .x_label_area_size((3.2 * z.label) as u32)
            .y_label_area_size((5.5 * z.label) as u32)
            .right_y_label_area_size((5.5 * z.label) as u32)
            .build_cartesian_2d(x0..x1, y0..y1)
            .map_err(plot_error)?
            .set_secondary_coord(x0..x1, y0 * HARTREE_IN_EV..y1 * HARTREE_IN_EV);
        chart
            .configure_mesh()
            .set_all_tick_mark_size((6.0 * z.k) as u32)
            .axis_style(ShapeStyle::from(&BLACK).stroke_width(z.thin))
            .light_line_style(TRANSPARENT)
            .bold_line_style(RGBColor(218, 218, 218))
            .label_style(("sans-serif", z.label as f64))
            .axis_desc_style(("sans-serif", z.desc as f64))
            .x_desc("R / bohr")
            .y_desc("E / hartree")
            .x_labels(10)
            .y_labels(8)
            .x_label_formatter(&|v| ticks::label(*v, xd))
            .y_label_formatter(&|v| ticks::label(*v, yd))
            .draw()
            .map_err(plot_error)?;
        chart
            .configure_secondary_axes()
            .set_all_tick_mark_size((6.0 * z.k) as u32)
            .axis_style(ShapeStyle::from(&BLACK).stroke_width(z.thin))
            .label_style(("sans-serif", z.label as f64))
            .axis_desc_style(("sans-serif", z.desc as f64))
            .y_desc("E / eV")
            .y_labels(8)
            .y_label_formatter(&|v| ticks::label(*v, ed))
            .draw()
            .map_err(plot_error)?;
        let grey = ShapeStyle::from(&RGBColor(90, 90, 90)).stroke_width(z.thin);
        chart
            .draw_series(DashedLineSeries::new(
                [(x0, d.limit), (x1, d.limit)],
                (7.0 * z.k) as i32,
                (5.0 * z.k) as i32,
                grey,
            ))
            .map_err(plot_error)?
            .label(format!(
                "separated limit, {} hartree",
                ticks::label(d.limit, 4)
            ))
            .legend(move |(x, y)| PathElement::new([(x, y), (x + legend, y)], grey));
        for (i, (name, ys)) in [
            (d.state_labels[0].as_str(), &d.e_bonding),
            (d.state_labels[1].as_str(), &d.e_antibonding),
        ]
        .into_iter()
        .enumerate()
        {
            let style = ShapeStyle::from(&PALETTE[i]).stroke_width(z.line);
            let mut first = true;
            for piece in clip(&d.r, ys, y0, y1) {
                let drawn = chart
                    .draw_series(LineSeries::new(piece, style))
                    .map_err(plot_error)?;
                if first {
                    drawn
                        .label(name)
                        .legend(move |(x, y)| PathElement::new([(x, y), (x + legend, y)], style));
                    first = false;
                }
            }
        }
        if let Some((re, ee)) = d.equilibrium {
            let label = format!(
                "R_{{e}} = {} bohr, E = {} hartree",
                ticks::label(re, 3),
                ticks::label(ee, 4)
            );
            let font = ("sans-serif", z.label as f64).into_font();
            let r = (5.0 * z.k).max(3.0) as i32;
            let off = (10.0 * z.k) as i32;
            chart
                .draw_series(std::iter::once(
                    EmptyElement::at((re, ee))
                        + Circle::new((0, 0), r, ShapeStyle::from(&BLACK).filled())
                        + Text::new(label, (off, off / 2), font),
                ))
                .map_err(plot_error)?;
        }
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
        root.present().map_err(plot_error)?;
    }
    let mut notes = d.footnotes.clone();
    if highest > y1 {
        notes.insert(
            0,
            format!(
                "Energies above {} hartree (short R) run off the top of the chart.",
                ticks::label(y1, yd)
            ),
        );
    }
    finish(
        &mut canvas,
        &format!("Energy curves · {}", d.title),
        &notes,
        &z,
    );
    Ok(canvas.downsample(SUPERSAMPLE))
}

pub fn integrals(d: &CurveData) -> Result<Canvas> {
    let z = Sizes::new(d.width * SUPERSAMPLE);
    let height = (d.width as f32 * 0.62) as u32 * SUPERSAMPLE;
    let mut canvas = Canvas::new(d.width * SUPERSAMPLE, height, Colour::WHITE);
    let (x0, x1) = (d.r[0], d.r[d.r.len() - 1]);
    let jk = d.coulomb.iter().chain(&d.exchange).copied();
    let (lo, hi) = jk.fold((0.0f64, 0.0f64), |(a, b), v| (a.min(v), b.max(v)));
    let (y0, y1) = padded(lo, hi, 0.05);
    let yd = axis_decimals(y0, y1, 8);
    let xd = axis_decimals(x0, x1, 10);
    let bottom = (2.0 * 1.35 * z.foot + 14.0 * z.k) as u32;
    let legend = (30.0 * z.k) as i32;
    {
        let root = CanvasBackend {
            canvas: &mut canvas,
        }
        .into_drawing_area();
        let mut chart = ChartBuilder::on(&root)
            .margin_top((z.margin_top() + 0.5 * z.label) as u32)
            .margin_bottom(bottom)
            .margin_left((16.0 * z.k) as u32)
            .margin_right((16.0 * z.k) as u32)
            .x_label_area_size((3.2 * z.label) as u32)
            .y_label_area_size((5.5 * z.label) as u32)
            .right_y_label_area_size((5.0 * z.label) as u32)
            .build_cartesian_2d(x0..x1, y0..y1)
            .map_err(plot_error)?
            .set_secondary_coord(x0..x1, 0.0..1.05);
        chart
            .configure_mesh()
            .set_all_tick_mark_size((6.0 * z.k) as u32)
            .axis_style(ShapeStyle::from(&BLACK).stroke_width(z.thin))
            .light_line_style(TRANSPARENT)
            .bold_line_style(RGBColor(218, 218, 218))
            .label_style(("sans-serif", z.label as f64))
            .axis_desc_style(("sans-serif", z.desc as f64))
            .x_desc("R / bohr")
            .y_desc("J, K / hartree")
            .x_labels(10)
            .y_labels(8)
            .x_label_formatter(&|v| ticks::label(*v, xd))
            .y_label_formatter(&|v| ticks::label(*v, yd))
            .draw()
            .map_err(plot_error)?;
        chart
            .configure_secondary_axes()
            .set_all_tick_mark_size((6.0 * z.k) as u32)
            .axis_style(ShapeStyle::from(&BLACK).stroke_width(z.thin))
            .label_style(("sans-serif", z.label as f64))
            .axis_desc_style(("sans-serif", z.desc as f64))
            .y_desc("S (dimensionless)")
            .y_labels(6)
            .y_label_formatter(&|v| ticks::label(*v, 1))
            .draw()
            .map_err(plot_error)?;
        if y0 < 0.0 && y1 > 0.0 {
            chart
                .draw_series(LineSeries::new(
                    [(x0, 0.0), (x1, 0.0)],
                    ShapeStyle::from(&RGBColor(120, 120, 120)).stroke_width(z.thin),
                ))
                .map_err(plot_error)?;
        }
        let series = [
            ("J (Coulomb), left axis", &d.coulomb),
            ("K (exchange), left axis", &d.exchange),
        ];
        for (i, (name, ys)) in series.into_iter().enumerate() {
            let style = ShapeStyle::from(&PALETTE[i + 2]).stroke_width(z.line);
            chart
                .draw_series(LineSeries::new(
                    d.r.iter().copied().zip(ys.iter().copied()),
                    style,
                ))
                .map_err(plot_error)?
                .label(name)
                .legend(move |(x, y)| PathElement::new([(x, y), (x + legend, y)], style));
        }
        let s_style = ShapeStyle::from(&PALETTE[0]).stroke_width(z.line);
        chart
            .draw_secondary_series(DashedLineSeries::new(
                d.r.iter().copied().zip(d.overlap.iter().copied()),
                (10.0 * z.k) as i32,
                (6.0 * z.k) as i32,
                s_style,
            ))
            .map_err(plot_error)?
            .label("S (overlap), right axis")
            .legend(move |(x, y)| PathElement::new([(x, y), (x + legend, y)], s_style));
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
        root.present().map_err(plot_error)?;
    }
    let notes = [
        "J = H_{AA} − E_{atom}, K = H_{AB} − E_{atom}S with E_{atom} = ζ^{2}/2 − Zζ; H includes the nuclear repulsion Z^{2}/R.".to_string(),
        d.footnotes.last().cloned().unwrap_or_default(),
    ];
    finish(
        &mut canvas,
        &format!("Overlap, Coulomb and exchange integrals · {}", d.title),
        &notes,
        &z,
    );
    Ok(canvas.downsample(SUPERSAMPLE))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn clipping_cuts_at_the_edge() {
        let pieces = clip(&[0.0, 1.0, 2.0, 3.0], &[0.0, 2.0, 0.0, 0.5], -1.0, 1.0);
        assert_eq!(pieces.len(), 2);
        assert_eq!(pieces[0], vec![(0.0, 0.0), (0.5, 1.0)]);
        assert_eq!(pieces[1], vec![(1.5, 1.0), (2.0, 0.0), (3.0, 0.5)]);
    }
}
