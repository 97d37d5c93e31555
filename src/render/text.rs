//! Text with the embedded font (DejaVu Sans, see assets/fonts/README.md), so figures
//! render the same on a machine with no system fonts. A tiny markup covers what
//! units and formulas need: `^{…}` raises and `_{…}` lowers a smaller run.

use std::sync::OnceLock;

use ab_glyph::{Font, FontRef, OutlineCurve, PxScale, ScaleFont, point};

static FONT_BYTES: &[u8] = include_bytes!("../../assets/fonts/DejaVuSans.ttf");

fn font() -> &'static FontRef<'static> {
    static FONT: OnceLock<FontRef<'static>> = OnceLock::new();
    FONT.get_or_init(|| FontRef::try_from_slice(FONT_BYTES).expect("the embedded font parses"))
}

/// Size of a raised or lowered run relative to the main text, and its baseline shift
/// in units of the main size (common practice in typesetting).
const SCRIPT_SCALE: f32 = 0.7;
const SUPER_SHIFT: f32 = 0.36;
const SUB_SHIFT: f32 = 0.14;

/// One character placed on a line: its pen position, baseline shift and size.
struct Placed {
    c: char,
    x: f32,
    dy: f32,
    size: f32,
}

/// Splits markup into characters with their size and baseline shift.
fn runs(text: &str, size: f32) -> Vec<(char, f32, f32)> {
    let mut out = Vec::new();
    let mut chars = text.chars().peekable();
    while let Some(c) = chars.next() {
        if (c == '^' || c == '_') && chars.peek() == Some(&'{') {
            chars.next();
            let dy = if c == '^' { -SUPER_SHIFT } else { SUB_SHIFT } * size;
            for s in chars.by_ref() {
                if s == '}' {
                    break;
                }
                out.push((s, dy, size * SCRIPT_SCALE));
            }
        } else {
            out.push((c, 0.0, size));
        }
    }
    out
}

fn layout(text: &str, size: f32) -> (Vec<Placed>, f32) {
    let f = font();
    let mut x = 0.0;
    let mut prev: Option<(ab_glyph::GlyphId, f32)> = None;
    let mut placed = Vec::new();
    for (c, dy, s) in runs(text, size) {
        let scaled = f.as_scaled(PxScale::from(s));
        let id = f.glyph_id(c);
        if let Some((p, ps)) = prev
            && ps == s
        {
            x += scaled.kern(p, id);
        }
        placed.push(Placed { c, x, dy, size: s });
        x += scaled.h_advance(id);
        prev = Some((id, s));
    }
    (placed, x)
}

/// Width, ascent and descent (pixels, positive) of a line of markup at `size` px.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Extent {
    pub width: f32,
    pub ascent: f32,
    pub descent: f32,
}

impl Extent {
    pub fn height(&self) -> f32 {
        self.ascent + self.descent
    }
}

pub fn measure(text: &str, size: f32) -> Extent {
    let (_, width) = layout(text, size);
    let scaled = font().as_scaled(PxScale::from(size));
    Extent {
        width,
        ascent: scaled.ascent(),
        descent: -scaled.descent(),
    }
}

/// Calls `cover(x, y, coverage)` for every pixel the text touches, with (0, 0) the
/// left end of the baseline.
pub fn rasterize(text: &str, size: f32, mut cover: impl FnMut(i32, i32, f32)) {
    let f = font();
    let (placed, _) = layout(text, size);
    for p in placed {
        let glyph = f
            .glyph_id(p.c)
            .with_scale_and_position(PxScale::from(p.size), point(p.x, p.dy));
        if let Some(outlined) = f.outline_glyph(glyph) {
            let b = outlined.px_bounds();
            outlined
                .draw(|gx, gy, c| cover(b.min.x as i32 + gx as i32, b.min.y as i32 + gy as i32, c));
        }
    }
}

/// The same glyphs as `rasterize`, as SVG path data (nonzero fill) in the same frame:
/// (0, 0) the left end of the baseline, y down. Each point goes through the mapping
/// ab_glyph's own rasterizer applies (`OutlinedGlyph::draw`: font units times the
/// scale factor, y flipped, plus the glyph's position), so a vector figure's text
/// covers exactly the pixels the raster text fills.
pub fn outline_path(text: &str, size: f32) -> String {
    use std::fmt::Write;
    let f = font();
    let (placed, _) = layout(text, size);
    let mut d = String::new();
    for p in placed {
        let Some(outline) = f.outline(f.glyph_id(p.c)) else {
            continue;
        };
        let k = f.as_scaled(PxScale::from(p.size)).scale_factor();
        let at = |q: &ab_glyph::Point| (q.x * k.horizontal + p.x, -q.y * k.vertical + p.dy);
        let (mut pen, mut first): (Option<(f32, f32)>, (f32, f32)) = (None, (0.0, 0.0));
        for curve in &outline.curves {
            let (start, rest) = match curve {
                OutlineCurve::Line(a, b) => (at(a), vec![at(b)]),
                OutlineCurve::Quad(a, b, c) => (at(a), vec![at(b), at(c)]),
                OutlineCurve::Cubic(a, b, c, e) => (at(a), vec![at(b), at(c), at(e)]),
            };
            if rest.len() == 1 && rest[0] == start {
                continue; // a zero-length closing line fills nothing
            }
            if pen != Some(start) {
                let _ = write!(d, "M{} {}", num(start.0), num(start.1));
                first = start;
            }
            if rest.len() == 1 && rest[0] == first {
                d.push('Z'); // the line back to the contour's start
                pen = Some(first);
                continue;
            }
            let verb = ["L", "Q", "C"][rest.len() - 1];
            d.push_str(verb);
            for (i, q) in rest.iter().enumerate() {
                let sep = if i == 0 { "" } else { " " };
                let _ = write!(d, "{sep}{} {}", num(q.0), num(q.1));
            }
            pen = rest.last().copied();
        }
    }
    d
}

/// A coordinate with two decimals (a hundredth of a pixel), trailing zeros dropped.
pub fn num(v: f32) -> String {
    let s = format!("{v:.2}");
    let s = s.trim_end_matches('0').trim_end_matches('.');
    if s == "-0" || s.is_empty() {
        "0".into()
    } else {
        s.into()
    }
}

/// Breaks markup into lines no wider than `width` at `size`, at spaces.
pub fn wrap(text: &str, size: f32, width: f32) -> Vec<String> {
    let mut lines = Vec::new();
    let mut line = String::new();
    for word in text.split(' ') {
        let candidate = if line.is_empty() {
            word.to_string()
        } else {
            format!("{line} {word}")
        };
        if line.is_empty() || measure(&candidate, size).width <= width {
            line = candidate;
        } else {
            lines.push(std::mem::replace(&mut line, word.to_string()));
        }
    }
    if !line.is_empty() {
        lines.push(line);
    }
    lines
}

/// Turns a chemical formula such as "H2+" into markup with subscript counts and a
/// superscript charge: "H_{2}^{+}".
pub fn formula_markup(formula: &str) -> String {
    let (body, charge) = match formula.find(['+', '-']) {
        Some(i) => formula.split_at(i),
        None => (formula, ""),
    };
    let mut out = String::new();
    let mut digits = String::new();
    for c in body.chars() {
        if c.is_ascii_digit() {
            digits.push(c);
        } else {
            if !digits.is_empty() {
                out += &format!("_{{{digits}}}");
                digits.clear();
            }
            out.push(c);
        }
    }
    if !digits.is_empty() {
        out += &format!("_{{{digits}}}");
    }
    if !charge.is_empty() {
        // "+2" is written 2+ in chemistry.
        let (sign, n) = charge.split_at(1);
        let sign = if sign == "-" { "−" } else { "+" };
        out += &format!("^{{{n}{sign}}}");
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn markup_shrinks_scripts_and_formulas_read_right() {
        let plain = measure("bohr3", 20.0).width;
        let raised = measure("bohr^{3}", 20.0).width;
        assert!(raised < plain && raised > measure("bohr", 20.0).width);
        assert_eq!(formula_markup("H2+"), "H_{2}^{+}");
        assert_eq!(formula_markup("SO4-2"), "SO_{4}^{2−}");
        assert_eq!(formula_markup("C2H4"), "C_{2}H_{4}");
    }

    #[test]
    fn text_leaves_ink() {
        let mut ink = 0.0;
        rasterize("Å", 30.0, |_, y, c| {
            assert!(y < 5, "glyphs sit on or above the baseline");
            ink += c;
        });
        assert!(ink > 20.0);
    }
}

/// Markup as plain Unicode text, for metadata that is not drawn (a PNG's Title, an
/// SVG's `<title>`): digits and signs in `^{…}` and `_{…}` become super- and
/// subscript characters, anything else keeps its letters without the braces.
pub fn plain(markup: &str) -> String {
    const SUP: [char; 10] = ['⁰', '¹', '²', '³', '⁴', '⁵', '⁶', '⁷', '⁸', '⁹'];
    const SUB: [char; 10] = ['₀', '₁', '₂', '₃', '₄', '₅', '₆', '₇', '₈', '₉'];
    let mut out = String::with_capacity(markup.len());
    let mut shift: Option<bool> = None;
    let mut chars = markup.chars().peekable();
    while let Some(c) = chars.next() {
        match (c, shift) {
            ('^' | '_', None) if chars.peek() == Some(&'{') => {
                chars.next();
                shift = Some(c == '^');
            }
            ('}', Some(_)) => shift = None,
            (d, Some(up)) if d.is_ascii_digit() => {
                let k = d as usize - '0' as usize;
                out.push(if up { SUP[k] } else { SUB[k] });
            }
            ('+', Some(up)) => out.push(if up { '⁺' } else { '₊' }),
            ('-' | '−', Some(up)) => out.push(if up { '⁻' } else { '₋' }),
            (c, _) => out.push(c),
        }
    }
    out
}

#[cfg(test)]
mod plain_tests {
    /// Unicode superscripts and subscripts (Unicode block "Superscripts and
    /// Subscripts", U+2070–U+209F, and U+00B2/U+00B3/U+00B9).
    #[test]
    fn markup_becomes_unicode() {
        assert_eq!(
            super::plain("H_{2}^{+} orbital levels"),
            "H₂⁺ orbital levels"
        );
        assert_eq!(super::plain("C_{6}H_{6}"), "C₆H₆");
        assert_eq!(super::plain("ρ (e bohr^{−3})"), "ρ (e bohr⁻³)");
        assert_eq!(super::plain("a^b_c"), "a^b_c");
    }
}
