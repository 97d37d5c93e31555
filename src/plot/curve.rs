//! Charts of the two-centre energy curve: the bonding and antibonding energies with
//! the equilibrium marked (hartree on the left axis, eV on the right), and the
//! overlap, Coulomb and exchange integrals against R.

use super::chart::{Axis, Chart, Point, Series, Twin, draw};
use super::{PALETTE, padded, size};
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

/// Decimal places of axis labels over [lo, hi] at about eight ticks, for notes that
/// quote an axis value.
fn decimals_over(lo: f64, hi: f64) -> usize {
    let t = ticks::nice(lo, hi, 8);
    ticks::decimals(if t.len() > 1 { t[1] - t[0] } else { hi - lo })
}

/// Clipped pieces of a curve joined into one series, a NaN between pieces.
fn joined(pieces: Vec<Vec<(f64, f64)>>) -> (Vec<f64>, Vec<f64>) {
    let (mut xs, mut ys) = (Vec::new(), Vec::new());
    for p in pieces {
        for (x, y) in p {
            xs.push(x);
            ys.push(y);
        }
        xs.push(f64::NAN);
        ys.push(f64::NAN);
    }
    (xs, ys)
}

const GUIDE: Colour = Colour::rgb(90, 90, 90);

pub fn energies(d: &CurveData) -> Result<Canvas> {
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
    let limit_x = [x0, x1];
    let limit_y = [d.limit, d.limit];
    let mut series = vec![Series {
        dash: Some([7.0, 5.0]),
        width: size::THIN,
        ..Series::line(
            Some(format!(
                "separated limit, {} hartree",
                ticks::label(d.limit, 4)
            )),
            &limit_x,
            &limit_y,
            GUIDE,
        )
    }];
    let curves = [
        joined(clip(&d.r, &d.e_bonding, y0, y1)),
        joined(clip(&d.r, &d.e_antibonding, y0, y1)),
    ];
    for (i, (xs, ys)) in curves.iter().enumerate() {
        let name = d.state_labels[i].clone();
        series.push(Series::line(Some(name), xs, ys, PALETTE[i]));
    }
    let points = d
        .equilibrium
        .map(|(re, ee)| Point {
            x: re,
            y: ee,
            label: format!(
                "R_{{e}} = {} bohr, E = {} hartree",
                ticks::label(re, 3),
                ticks::label(ee, 4)
            ),
        })
        .into_iter()
        .collect();
    let mut notes = d.footnotes.clone();
    if highest > y1 {
        notes.insert(
            0,
            format!(
                "Energies above {} hartree (short R) run off the top of the chart.",
                ticks::label(y1, decimals_over(y0, y1))
            ),
        );
    }
    let chart = Chart {
        title: format!("Energy curves · {}", d.title),
        width: d.width,
        background: Colour::WHITE,
        x: Axis {
            name: "R / bohr".into(),
            lo: x0,
            hi: x1,
        },
        y: Axis {
            name: "E / hartree".into(),
            lo: y0,
            hi: y1,
        },
        twin: Some(Twin::unit("E / eV", HARTREE_IN_EV)),
        series,
        verticals: Vec::new(),
        points,
        notes,
        legend: true,
        legend_headroom: false,
    };
    Ok(draw(&chart).canvas)
}

pub fn integrals(d: &CurveData) -> Result<Canvas> {
    let (x0, x1) = (d.r[0], d.r[d.r.len() - 1]);
    let jk = d.coulomb.iter().chain(&d.exchange).copied();
    let (lo, hi) = jk.fold((0.0f64, 0.0f64), |(a, b), v| (a.min(v), b.max(v)));
    let (y0, y1) = padded(lo, hi, 0.05);
    let zero_x = [x0, x1];
    let zero_y = [0.0, 0.0];
    let mut series = Vec::new();
    if y0 < 0.0 && y1 > 0.0 {
        series.push(Series {
            width: size::THIN,
            ..Series::line(None, &zero_x, &zero_y, Colour::rgb(120, 120, 120))
        });
    }
    let jk = [
        ("J (Coulomb), left axis", &d.coulomb),
        ("K (exchange), left axis", &d.exchange),
    ];
    for (i, (name, ys)) in jk.into_iter().enumerate() {
        series.push(Series::line(Some(name.into()), &d.r, ys, PALETTE[i + 2]));
    }
    series.push(Series {
        dash: Some([10.0, 6.0]),
        on_twin: true,
        ..Series::line(
            Some("S (overlap), right axis".into()),
            &d.r,
            &d.overlap,
            PALETTE[0],
        )
    });
    let notes = vec![
        "J = H_{AA} − E_{atom}, K = H_{AB} − E_{atom}S with E_{atom} = ζ^{2}/2 − Zζ; H includes the nuclear repulsion Z^{2}/R.".to_string(),
        d.footnotes.last().cloned().unwrap_or_default(),
    ];
    let chart = Chart {
        title: format!("Overlap, Coulomb and exchange integrals · {}", d.title),
        width: d.width,
        background: Colour::WHITE,
        x: Axis {
            name: "R / bohr".into(),
            lo: x0,
            hi: x1,
        },
        y: Axis {
            name: "J, K / hartree".into(),
            lo: y0,
            hi: y1,
        },
        twin: Some(Twin::spanning("S (dimensionless)", (y0, y1), (0.0, 1.05))),
        series,
        verticals: Vec::new(),
        points: Vec::new(),
        notes,
        legend: true,
        legend_headroom: false,
    };
    Ok(draw(&chart).canvas)
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
