//! The colour bar: the scale drawn top (+max) to bottom (−max or 0), its exact end
//! values, nice ticks between, the contour levels marked across it, and the
//! quantity with its unit along its side.

use super::canvas::{Canvas, Colour, HAlign, VAlign};
use super::scale::{Mapping, Scale};
use super::ticks;

/// A bar's place and content.
pub struct Bar<'a> {
    pub x: f32,
    pub y: f32,
    pub width: f32,
    pub height: f32,
    pub scale: &'a Scale,
    pub mapping: Mapping,
    /// Markup such as "ψ_{1}" and "bohr^{−3/2}".
    pub quantity: &'a str,
    pub unit: &'a str,
    pub levels: &'a [f64],
    /// Font size of the tick labels.
    pub font: f32,
    pub k: f32,
}

/// Row `y` of a bar of `h` rows shows position t = 1 − y/(h − 1), so the first and
/// last rows carry exactly the end colours.
pub fn row_t(y: u32, h: u32) -> f64 {
    if h < 2 {
        return 0.5;
    }
    1.0 - y as f64 / (h - 1) as f64
}

pub fn draw(c: &mut Canvas, bar: &Bar) {
    let (x0, y0) = (bar.x.round() as u32, bar.y.round() as u32);
    let (w, h) = (bar.width.round() as u32, bar.height.round().max(2.0) as u32);
    let mut pixels = Vec::with_capacity((w * h) as usize);
    for y in 0..h {
        let col = bar.scale.at(row_t(y, h));
        pixels.extend(std::iter::repeat_n([col.r, col.g, col.b], w as usize));
    }
    c.put_pixels(x0, y0, w, &pixels);
    let (xf, yf, wf, hf) = (x0 as f32, y0 as f32, w as f32, h as f32);
    let y_of = |v: f64| yf + 0.5 + ((1.0 - bar.mapping.t(v)) * (hf as f64 - 1.0)) as f32;
    for &l in bar.levels {
        let y = y_of(l);
        if y >= yf && y <= yf + hf {
            let dash: Option<&[f32]> = if l < 0.0 { Some(&[3.0, 2.0]) } else { None };
            let lw = (1.0 * bar.k).max(1.0);
            c.stroke(
                &[(xf, y), (xf + wf, y)],
                lw,
                Colour::INK.with_alpha(210),
                dash,
            );
        }
    }
    // The frame lies just outside the bar, so the end rows keep their exact colours.
    let lw = (1.0 * bar.k).max(1.0);
    c.stroke_rect(
        xf - lw / 2.0,
        yf - lw / 2.0,
        wf + lw,
        hf + lw,
        lw,
        Colour::INK,
    );

    let (lo, hi) = bar.mapping.range();
    let exp = if bar.mapping.is_log() {
        0
    } else {
        ticks::common_exponent(lo.abs().max(hi.abs()))
    };
    let factor = 10f64.powi(exp);
    let tick = 5.0 * bar.k;
    let label_x = xf + wf + tick + 3.0 * bar.k;
    // Exact ends first; nice ticks that would crowd them are left out.
    let end = |v: f64| {
        if bar.mapping.is_log() {
            sci(v)
        } else {
            signif(v / factor, 4)
        }
    };
    let ends = [(hi, y_of(hi)), (lo, y_of(lo))];
    let mut widest: f32 = 0.0;
    for (v, y) in ends {
        widest = widest.max(super::text::measure(&end(v), bar.font).width);
        c.stroke(
            &[(xf + wf, y), (xf + wf + tick, y)],
            1.0_f32.max(bar.k),
            Colour::INK,
            None,
        );
        c.text(
            &end(v),
            bar.font,
            label_x,
            y,
            (HAlign::Left, VAlign::Middle),
            Colour::INK,
        );
    }
    let target = ((hf / (3.0 * bar.font)) as usize).clamp(2, 8);
    let (values, labels): (Vec<f64>, Vec<String>) = if bar.mapping.is_log() {
        let d = ticks::decades(lo, hi);
        let l = d.iter().map(|v| ticks::power_label(*v)).collect();
        (d, l)
    } else {
        let t = ticks::nice(lo / factor, hi / factor, target);
        let step = if t.len() > 1 { t[1] - t[0] } else { 1.0 };
        let l = t
            .iter()
            .map(|v| ticks::label(*v, ticks::decimals(step)))
            .collect();
        (t.iter().map(|v| v * factor).collect(), l)
    };
    for (v, label) in values.iter().zip(labels) {
        let y = y_of(*v);
        c.stroke(
            &[(xf + wf, y), (xf + wf + tick, y)],
            1.0_f32.max(bar.k),
            Colour::INK,
            None,
        );
        if ends.iter().all(|(_, ye)| (ye - y).abs() > 1.3 * bar.font) {
            widest = widest.max(super::text::measure(&label, bar.font).width);
            c.text(
                &label,
                bar.font,
                label_x,
                y,
                (HAlign::Left, VAlign::Middle),
                Colour::INK,
            );
        }
    }
    let unit = if exp != 0 {
        format!(
            "{} / (10^{{{}}} {})",
            bar.quantity,
            exp.to_string().replace('-', "−"),
            bar.unit
        )
    } else {
        format!("{} / {}", bar.quantity, bar.unit)
    };
    let ux = label_x + widest + 0.6 * bar.font;
    c.text_up(
        &unit,
        bar.font * 1.1,
        ux,
        yf + hf / 2.0,
        (HAlign::Centre, VAlign::Top),
        Colour::INK,
    );
}

/// `v` to `n` significant digits with a true minus sign.
pub fn signif(v: f64, n: usize) -> String {
    if v == 0.0 || !v.is_finite() {
        return "0".into();
    }
    let d = (n as i32 - 1 - v.abs().log10().floor() as i32).max(0) as usize;
    ticks::label(v, d)
}

/// `v` as markup "3.18×10^{−1}".
pub fn sci(v: f64) -> String {
    if v <= 0.0 || !v.is_finite() {
        return "0".into();
    }
    let e = v.log10().floor() as i32;
    let m = v / 10f64.powi(e);
    format!("{m:.2}×10^{{{}}}", e.to_string().replace('-', "−"))
}
