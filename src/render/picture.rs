//! The frame around 3-D panels: title, panels side by side with a caption under
//! each, a key of the surface colours, and footnotes. The panels themselves come
//! from `scene::render` at the size `Layout` gives them.
//!
//! Text sizes follow the picture's width, so a figure scaled to a column keeps
//! legible captions (common practice: one size ratio for every width).

use image::RgbaImage;

use super::canvas::{Canvas, Colour, HAlign, VAlign};
use super::text;

/// Most panels side by side in one row; more wrap onto further rows.
const MAX_COLUMNS: usize = 4;

/// What is written around the panels.
#[derive(Debug, Clone)]
pub struct Furniture {
    pub title: String,
    /// One caption per panel (markup).
    pub captions: Vec<String>,
    /// Surface colours and what they mean ("ψ > 0").
    pub key: Vec<([u8; 3], String)>,
    pub footnotes: Vec<String>,
    pub background: Colour,
}

/// Where everything goes, in pixels.
#[derive(Debug, Clone, PartialEq)]
pub struct Layout {
    pub width: u32,
    pub height: u32,
    /// Size of every panel.
    pub panel: (u32, u32),
    /// Top-left corner of each panel.
    pub origins: Vec<(u32, u32)>,
    title_size: f32,
    caption_size: f32,
    note_size: f32,
    /// Footnote lines after wrapping.
    notes: Vec<String>,
    top: f32,
    rows: usize,
}

fn sizes(width: u32) -> (f32, f32, f32) {
    let w = width as f32;
    (
        (w / 42.0).clamp(14.0, 48.0),
        (w / 52.0).clamp(12.0, 40.0),
        (w / 68.0).clamp(10.0, 30.0),
    )
}

/// Lays out `n` panels in a picture `width` wide; `height` (when given) is the whole
/// picture's, otherwise the panels are 4:3.
pub fn layout(width: u32, height: Option<u32>, n: usize, furniture: &Furniture) -> Layout {
    let (title_size, caption_size, note_size) = sizes(width);
    let columns = n.clamp(1, MAX_COLUMNS);
    let rows = n.div_ceil(columns).max(1);
    let margin = (note_size * 1.5).round();
    let notes: Vec<String> = furniture
        .footnotes
        .iter()
        .flat_map(|f| text::wrap(f, note_size, width as f32 - 2.0 * margin))
        .collect();
    let top = if furniture.title.is_empty() {
        margin * 0.5
    } else {
        title_size * 2.2
    };
    let per_row_text = caption_size * 1.8;
    let bottom = (if furniture.key.is_empty() {
        0.0
    } else {
        caption_size * 2.0
    }) + notes.len() as f32 * note_size * 1.35
        + margin * 0.6;
    let panel_w = ((width as f32 - margin) / columns as f32).floor().max(16.0);
    let panel_h = match height {
        Some(h) => ((h as f32 - top - bottom) / rows as f32 - per_row_text)
            .floor()
            .max(16.0),
        None => (panel_w * 0.75).floor(),
    };
    let total_h =
        height.unwrap_or((top + rows as f32 * (panel_h + per_row_text) + bottom).ceil() as u32);
    let left = ((width as f32 - columns as f32 * panel_w) / 2.0).floor();
    let origins = (0..n)
        .map(|i| {
            let (r, c) = (i / columns, i % columns);
            (
                (left + c as f32 * panel_w) as u32,
                (top + r as f32 * (panel_h + per_row_text)) as u32,
            )
        })
        .collect();
    Layout {
        width,
        height: total_h,
        panel: (panel_w as u32, panel_h as u32),
        origins,
        title_size,
        caption_size,
        note_size,
        notes,
        top,
        rows,
    }
}

/// Draws the finished picture from panel images laid out by `layout`.
pub fn compose(l: &Layout, panels: &[RgbaImage], f: &Furniture) -> Canvas {
    let mut c = Canvas::new(l.width, l.height, f.background);
    let centre = l.width as f32 / 2.0;
    if !f.title.is_empty() {
        // A long title shrinks to fit rather than running off the picture.
        c.text(
            &f.title,
            fitted(&f.title, l.title_size, l.width as f32 * 0.96),
            centre,
            l.top * 0.5,
            (HAlign::Centre, VAlign::Middle),
            Colour::INK,
        );
    }
    // One size for every caption: the largest at which the longest fits its panel.
    let size = f
        .captions
        .iter()
        .map(|s| fitted(s, l.caption_size, l.panel.0 as f32 * 0.96))
        .fold(l.caption_size, f32::min);
    for ((img, &(x, y)), caption) in panels.iter().zip(&l.origins).zip(&f.captions) {
        c.paste(x as i32, y as i32, img);
        let cx = x as f32 + l.panel.0 as f32 / 2.0;
        let cy = y as f32 + l.panel.1 as f32 + l.caption_size * 0.9;
        c.text(
            caption,
            size,
            cx,
            cy,
            (HAlign::Centre, VAlign::Middle),
            Colour::INK,
        );
    }
    let mut y =
        l.top + l.rows as f32 * (l.panel.1 as f32 + l.caption_size * 1.8) + l.caption_size * 0.4;
    if !f.key.is_empty() {
        key(
            &mut c,
            &f.key,
            l.caption_size,
            centre,
            y + l.caption_size * 0.5,
        );
        y += l.caption_size * 2.0;
    }
    let margin = (l.note_size * 1.5).round();
    for line in &l.notes {
        c.text(
            line,
            l.note_size,
            margin,
            y + l.note_size,
            (HAlign::Left, VAlign::Baseline),
            Colour::GREY,
        );
        y += l.note_size * 1.35;
    }
    c
}

/// The largest size up to `size` at which `s` fits `width`.
fn fitted(s: &str, size: f32, width: f32) -> f32 {
    let w = text::measure(s, size).width;
    if w <= width {
        size
    } else {
        (size * width / w).max(8.0)
    }
}

/// Swatches and labels in one centred row.
fn key(c: &mut Canvas, entries: &[([u8; 3], String)], size: f32, centre: f32, y: f32) {
    let gap = size * 1.5;
    let swatch = size * 0.9;
    let widths: Vec<f32> = entries
        .iter()
        .map(|(_, label)| swatch + size * 0.4 + text::measure(label, size).width)
        .collect();
    let total: f32 = widths.iter().sum::<f32>() + gap * (entries.len().saturating_sub(1)) as f32;
    let mut x = centre - total / 2.0;
    for ((rgb, label), w) in entries.iter().zip(&widths) {
        let colour = Colour::rgb(rgb[0], rgb[1], rgb[2]);
        c.fill_rect(x, y - swatch / 2.0, swatch, swatch, colour);
        c.stroke_rect(x, y - swatch / 2.0, swatch, swatch, 1.0, Colour::GREY);
        c.text(
            label,
            size,
            x + swatch + size * 0.4,
            y,
            (HAlign::Left, VAlign::Middle),
            Colour::INK,
        );
        x += w + gap;
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn furniture(n: usize) -> Furniture {
        Furniture {
            title: "title".into(),
            captions: vec!["caption".into(); n],
            key: vec![([255, 0, 0], "ψ > 0".into())],
            footnotes: vec!["a note ".repeat(40)],
            background: Colour::WHITE,
        }
    }

    /// Panels stay inside the picture and do not overlap (common practice).
    #[test]
    fn panels_fit_side_by_side() {
        for (n, h) in [(1, None), (3, None), (3, Some(700)), (6, Some(1200))] {
            let f = furniture(n);
            let l = layout(1200, h, n, &f);
            if let Some(h) = h {
                assert_eq!(l.height, h);
            }
            for (i, &(x, y)) in l.origins.iter().enumerate() {
                assert!(
                    x + l.panel.0 <= l.width && y + l.panel.1 <= l.height,
                    "panel {i} inside"
                );
                for &(x2, y2) in &l.origins[i + 1..] {
                    let apart = x2 >= x + l.panel.0 || y2 >= y + l.panel.1;
                    assert!(apart, "panels {i} and a later one overlap");
                }
            }
            assert!(l.notes.len() >= 2, "the long footnote wraps");
        }
    }

    /// A pasted panel shows through; the key swatch carries its colour.
    #[test]
    fn compose_pastes_panels() {
        let f = furniture(1);
        let l = layout(600, None, 1, &f);
        let img = RgbaImage::from_pixel(l.panel.0, l.panel.1, image::Rgba([10, 200, 30, 255]));
        let c = compose(&l, &[img], &f);
        let (x, y) = l.origins[0];
        let p = c.pixel(x + 5, y + 5);
        assert_eq!((p.r, p.g, p.b), (10, 200, 30));
    }
}
