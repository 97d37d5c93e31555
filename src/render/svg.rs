//! Figures as SVG 1.1 (W3C Scalable Vector Graphics 1.1, 2nd edition), written from a
//! canvas's display list (`render::record`): rectangles, lines, circles and text as
//! vectors, rasters (colour maps, 3-D panels) as embedded PNG images (`data:` URIs,
//! RFC 2397). Text is written as the embedded font's glyph outlines, not as `<text>`,
//! so the file looks the same on a machine without DejaVu Sans and lines up with the
//! PNG of the same figure. The file's physical size follows `--dpi` as the PNG's
//! `pHYs` does; title and command line go in `<title>` and `<desc>`.

use base64::Engine as _;
use std::fmt::Write;
use std::path::Path;

use super::canvas::{Canvas, Colour};
use super::record::Op;
use super::text::{self, num};
use crate::error::{Error, Result};
use crate::io::png::PngMeta;

/// The file formats a figure can be written in, chosen by the file name's extension.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum FigureFormat {
    Png,
    Svg,
}

impl FigureFormat {
    /// `.png` or `.svg` (any case); `-` (standard output) is PNG. Anything else is
    /// refused, naming the accepted extensions.
    pub fn from_path(path: &Path) -> Result<FigureFormat> {
        if path == Path::new("-") {
            return Ok(FigureFormat::Png);
        }
        let ext = path
            .extension()
            .and_then(|e| e.to_str())
            .map(str::to_ascii_lowercase);
        match ext.as_deref() {
            Some("png") => Ok(FigureFormat::Png),
            Some("svg") => Ok(FigureFormat::Svg),
            _ => Err(Error::input(format!(
                "cannot tell a figure format from '{}': figure files must end in .png or .svg",
                path.display()
            ))),
        }
    }
}

impl Canvas {
    /// The figure as a file of `format`.
    pub fn encode(&self, format: FigureFormat, meta: &PngMeta) -> Result<Vec<u8>> {
        match format {
            FigureFormat::Png => self.encode_png(meta),
            FigureFormat::Svg => encode(self, meta),
        }
    }
}

/// The canvas's display list as an SVG document.
pub fn encode(canvas: &Canvas, meta: &PngMeta) -> Result<Vec<u8>> {
    let (w, h) = (canvas.width(), canvas.height());
    // Four decimals: a thousandth of a pixel even at 10 000 dpi, so a renderer that
    // maps the viewBox onto this size lands on the pixel grid.
    let mm = |px: u32| {
        let v = format!("{:.4}", px as f64 * 25.4 / meta.dpi);
        v.trim_end_matches('0').trim_end_matches('.').to_string()
    };
    let mut s = String::new();
    s.push_str("<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n");
    let _ = writeln!(
        s,
        "<svg xmlns=\"http://www.w3.org/2000/svg\" xmlns:xlink=\"http://www.w3.org/1999/xlink\" \
         version=\"1.1\" width=\"{}mm\" height=\"{}mm\" viewBox=\"0 0 {w} {h}\">",
        mm(w),
        mm(h)
    );
    if let Some(t) = &meta.title {
        let _ = writeln!(s, "<title>{}</title>", escape(t));
    }
    if let Some(c) = &meta.command {
        let _ = writeln!(s, "<desc>{}</desc>", escape(c));
    }
    let _ = writeln!(
        s,
        "<metadata>{}</metadata>",
        escape(&crate::io::png::software())
    );
    let mut clips: Vec<[f32; 4]> = Vec::new();
    for op in canvas.ops().iter().chain(canvas.pending().as_ref()) {
        element(&mut s, op, &mut clips)?;
    }
    s.push_str("</svg>\n");
    Ok(s.into_bytes())
}

/// Writes one operation as SVG elements.
fn element(s: &mut String, op: &Op, clips: &mut Vec<[f32; 4]>) -> Result<()> {
    match op {
        Op::Rect { x, y, w, h, fill } => {
            let _ = writeln!(
                s,
                "<rect x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\"{}/>",
                num(*x),
                num(*y),
                num(*w),
                num(*h),
                paint("fill", *fill)
            );
        }
        Op::Line {
            points,
            width,
            colour,
            dash,
            clip,
        } => {
            let mut clip_attr = String::new();
            if let Some(r) = clip {
                let id = match clips.iter().position(|c| c == r) {
                    Some(i) => i,
                    None => {
                        clips.push(*r);
                        let _ = writeln!(
                            s,
                            "<clipPath id=\"clip{}\"><rect x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\"/></clipPath>",
                            clips.len() - 1,
                            num(r[0]),
                            num(r[1]),
                            num(r[2]),
                            num(r[3])
                        );
                        clips.len() - 1
                    }
                };
                clip_attr = format!(" clip-path=\"url(#clip{id})\"");
            }
            let pts: Vec<String> = points
                .iter()
                .map(|(x, y)| format!("{},{}", num(*x), num(*y)))
                .collect();
            let _ = writeln!(
                s,
                "<polyline points=\"{}\" fill=\"none\"{} stroke-width=\"{}\" stroke-linecap=\"butt\" stroke-linejoin=\"round\"{}{clip_attr}/>",
                pts.join(" "),
                paint("stroke", *colour),
                num(*width),
                dash_attr(dash.as_deref())
            );
        }
        Op::Circle {
            cx,
            cy,
            r,
            fill,
            line,
            width,
        } => {
            let outline = if *width > 0.0 {
                format!(
                    "{} stroke-width=\"{}\"",
                    paint("stroke", *line),
                    num(*width)
                )
            } else {
                String::new()
            };
            let _ = writeln!(
                s,
                "<circle cx=\"{}\" cy=\"{}\" r=\"{}\"{}{outline}/>",
                num(*cx),
                num(*cy),
                num(*r),
                paint("fill", *fill)
            );
        }
        Op::Text {
            text: t,
            size,
            matrix: m,
            colour,
        } => {
            let d = text::outline_path(t, *size);
            if !d.is_empty() {
                let m: Vec<String> = m.iter().map(|v| num(*v)).collect();
                let _ = writeln!(
                    s,
                    "<path aria-label=\"{}\" transform=\"matrix({})\" d=\"{d}\"{}/>",
                    escape(t),
                    m.join(" "),
                    paint("fill", *colour)
                );
            }
        }
        Op::Image { x, y, image } => {
            if image.width() > 0 && image.height() > 0 {
                let png = crate::io::png::encode(image, &PngMeta::default())?;
                let _ = writeln!(
                    s,
                    "<image x=\"{x}\" y=\"{y}\" width=\"{}\" height=\"{}\" preserveAspectRatio=\"none\" xlink:href=\"data:image/png;base64,{}\"/>",
                    image.width(),
                    image.height(),
                    base64::engine::general_purpose::STANDARD.encode(&png)
                );
            }
        }
    }
    Ok(())
}

/// ` fill="#rrggbb"` (or stroke), with its opacity when not opaque.
fn paint(what: &str, c: Colour) -> String {
    let mut a = format!(" {what}=\"#{:02x}{:02x}{:02x}\"", c.r, c.g, c.b);
    if c.a < 255 {
        let _ = write!(a, " {what}-opacity=\"{}\"", num(c.a as f32 / 255.0));
    }
    a
}

/// The dash pattern as tiny-skia draws it: an even number of non-negative lengths
/// with a positive sum, or none (a solid line) otherwise.
fn dash_attr(dash: Option<&[f32]>) -> String {
    match dash {
        Some(d)
            if d.len() >= 2
                && d.len() % 2 == 0
                && d.iter().all(|v| v.is_finite() && *v >= 0.0)
                && d.iter().sum::<f32>() > 0.0 =>
        {
            let v: Vec<String> = d.iter().map(|v| num(*v)).collect();
            format!(" stroke-dasharray=\"{}\"", v.join(" "))
        }
        _ => String::new(),
    }
}

/// Text as XML character data or attribute value: markup characters escaped and the
/// control characters XML 1.0 forbids dropped.
pub fn escape(t: &str) -> String {
    let mut out = String::with_capacity(t.len());
    for c in t.chars() {
        match c {
            '&' => out.push_str("&amp;"),
            '<' => out.push_str("&lt;"),
            '>' => out.push_str("&gt;"),
            '"' => out.push_str("&quot;"),
            '\'' => out.push_str("&apos;"),
            c if (c as u32) < 0x20 && !matches!(c, '\t' | '\n' | '\r') => {}
            c => out.push(c),
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_extension_decides_the_format() {
        let f = |p: &str| FigureFormat::from_path(Path::new(p));
        assert_eq!(f("a.png").unwrap(), FigureFormat::Png);
        assert_eq!(f("dir/A.SVG").unwrap(), FigureFormat::Svg);
        assert_eq!(f("-").unwrap(), FigureFormat::Png);
        for bad in ["a.jpg", "a", "a.svg.gz"] {
            let e = f(bad).unwrap_err().to_string();
            assert!(e.contains(".png or .svg"), "{e}");
        }
    }

    #[test]
    fn escaping_leaves_no_markup() {
        assert_eq!(escape("a<b & \"c\"\u{1}"), "a&lt;b &amp; &quot;c&quot;");
    }
}
