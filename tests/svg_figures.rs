//! SVG figures against the PNG of the same figure. Each figure command is run twice
//! with the same arguments, once with `--png F.png` and once with `--png F.svg`; the
//! SVG is parsed as XML (roxmltree, an independent XML 1.0 parser) and rendered by
//! resvg (an independent SVG renderer), and the rendering is compared with the PNG.
//! Negative controls check that the comparison notices text removed or moved by
//! two pixels, so the tolerance means something.

mod common;

use std::path::Path;

use common::{example, ok};

/// Decodes a PNG file to straight-alpha RGBA.
fn decode_png(bytes: &[u8]) -> (u32, u32, Vec<u8>) {
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
fn render_svg(svg: &str, w: u32, h: u32) -> Vec<u8> {
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
fn difference(a: &[u8], b: &[u8]) -> (f64, f64) {
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
const FAR: f64 = 64.0;
const MAX_FAR_SHARE: f64 = 0.001;
const MAX_MEAN: f64 = 0.8;

fn within(d: (f64, f64)) -> bool {
    d.0 <= MAX_MEAN && d.1 <= MAX_FAR_SHARE
}

/// Runs `lobecast ARGS… --png NAME.png` and `… --png NAME.svg` in `dir`, checks the
/// SVG's structure and its rendering against the PNG, and returns the SVG text.
fn both(dir: &Path, name: &str, args: &[&str]) -> String {
    let png_name = format!("{name}.png");
    let svg_name = format!("{name}.svg");
    for out in [&png_name, &svg_name] {
        let mut a: Vec<&str> = args.to_vec();
        a.extend(["--png", out]);
        ok(dir, &a);
    }
    let (w, h, png) = decode_png(&std::fs::read(dir.join(&png_name)).unwrap());
    let svg = std::fs::read_to_string(dir.join(&svg_name)).unwrap();
    check_svg(&svg, name, args[0], w, h, &png);
    svg
}

fn check_svg(svg: &str, name: &str, command: &str, w: u32, h: u32, png: &[u8]) {
    // Well-formed XML whose root is an SVG element of the PNG's pixel grid, with the
    // command line in <desc> (as the PNG's iTXt Comment holds it).
    let doc = roxmltree::Document::parse(svg).unwrap_or_else(|e| panic!("{name}: {e}"));
    let root = doc.root_element();
    assert_eq!(root.tag_name().name(), "svg");
    assert_eq!(
        root.tag_name().namespace(),
        Some("http://www.w3.org/2000/svg")
    );
    assert_eq!(
        root.attribute("viewBox"),
        Some(format!("0 0 {w} {h}").as_str())
    );
    let desc = root
        .children()
        .find(|n| n.has_tag_name("desc"))
        .and_then(|n| n.text())
        .unwrap_or_default();
    assert!(desc.contains(command), "{name}: <desc> {desc:?}");
    // Text is glyph outlines, never <text> (which would need the font installed).
    assert_eq!(
        doc.descendants().filter(|n| n.has_tag_name("text")).count(),
        0
    );
    assert!(glyphs(&doc) > 0, "{name}: no text paths");

    let drawn = render_svg(svg, w, h);
    // For looking at: LOBECAST_SVG_RENDERS=DIR keeps resvg's rendering as DIR/NAME.png.
    if let Some(dump) = std::env::var_os("LOBECAST_SVG_RENDERS") {
        let img = image::RgbaImage::from_raw(w, h, drawn.clone()).unwrap();
        let bytes = lobecast::io::png::encode(&img, &Default::default()).unwrap();
        std::fs::write(Path::new(&dump).join(format!("{name}.png")), bytes).unwrap();
    }
    let d = difference(&drawn, png);
    eprintln!("{name}: mean {:.3}, share beyond {FAR}: {:.5}", d.0, d.1);
    assert!(
        within(d),
        "{name}: SVG rendering differs from the PNG: {d:?}"
    );

    // Negative controls: without its text, or with the text moved 2 px right, the
    // same comparison must fail.
    let no_text: String = svg
        .lines()
        .filter(|l| !l.starts_with("<path aria-label"))
        .collect::<Vec<_>>()
        .join("\n");
    let gone = difference(&render_svg(&no_text, w, h), png);
    assert!(
        gone.0 > MAX_MEAN && gone.1 > MAX_FAR_SHARE,
        "{name}: text removed: {gone:?}"
    );
    let moved = svg.replace("transform=\"matrix(", "transform=\"translate(2 0) matrix(");
    let moved = difference(&render_svg(&moved, w, h), png);
    assert!(
        moved.0 > MAX_MEAN && moved.1 > MAX_FAR_SHARE,
        "{name}: text moved: {moved:?}"
    );
}

fn glyphs(doc: &roxmltree::Document) -> usize {
    doc.descendants()
        .filter(|n| n.has_tag_name("path") && n.attribute("aria-label").is_some())
        .count()
}

fn images(svg: &str) -> usize {
    let doc = roxmltree::Document::parse(svg).unwrap();
    doc.descendants()
        .filter(|n| n.has_tag_name("image"))
        .count()
}

#[test]
fn levels_svg_matches_its_png_and_is_all_vectors() {
    let dir = tempfile::tempdir().unwrap();
    let ion = example("h2-cation.toml");
    let svg = both(
        dir.path(),
        "levels",
        &["levels", ion.to_str().unwrap(), "--fragments", "1:2"],
    );
    assert_eq!(images(&svg), 0, "a level diagram has no raster part");
    let doc = roxmltree::Document::parse(&svg).unwrap();
    let title = doc.descendants().find(|n| n.has_tag_name("title"));
    assert!(title.and_then(|t| t.text()).is_some_and(|t| !t.is_empty()));
}

#[test]
fn slice_svg_matches_its_png_with_the_map_embedded() {
    let dir = tempfile::tempdir().unwrap();
    let ion = example("h2-cation.toml");
    let svg = both(
        dir.path(),
        "slice",
        &[
            "slice",
            ion.to_str().unwrap(),
            "--panels",
            "orbital:1,orbital:2",
            "--plane",
            "xz",
            "--zero-contour",
        ],
    );
    assert!(
        images(&svg) >= 2,
        "the two colour maps are embedded rasters"
    );
    assert!(svg.contains("data:image/png;base64,"));
    assert!(svg.contains("<polyline"), "contours and axes are vectors");
}

#[test]
fn profile_svg_matches_its_png_and_is_all_vectors() {
    let dir = tempfile::tempdir().unwrap();
    let ion = example("h2-cation.toml");
    let svg = both(
        dir.path(),
        "profile",
        &[
            "profile",
            ion.to_str().unwrap(),
            "--field",
            "orbital:1",
            "--from",
            "atom:1",
            "--to",
            "atom:2",
        ],
    );
    assert_eq!(images(&svg), 0);
    assert!(
        svg.contains("clip-path="),
        "series are clipped to the plot area"
    );
}

#[test]
fn curve_svg_and_its_companion_match_their_pngs() {
    let dir = tempfile::tempdir().unwrap();
    let ion = example("h2-cation.toml");
    let args = [
        "curve",
        ion.to_str().unwrap(),
        "--units",
        "bohr",
        "--from",
        "1",
        "--to",
        "4",
        "--step",
        "0.25",
    ];
    both(dir.path(), "curve", &args);
    // The closed form's integral chart follows the main file's extension.
    let (w, h, png) = decode_png(&std::fs::read(dir.path().join("curve-integrals.png")).unwrap());
    let svg = std::fs::read_to_string(dir.path().join("curve-integrals.svg")).unwrap();
    check_svg(&svg, "curve-integrals", "curve", w, h, &png);
}

#[test]
fn surface_svg_matches_its_png_with_the_scene_embedded() {
    let dir = tempfile::tempdir().unwrap();
    let ion = example("h2-cation.toml");
    let svg = both(
        dir.path(),
        "surface",
        &[
            "surface",
            ion.to_str().unwrap(),
            "--panels",
            "orbital:1,orbital:2",
            "--spacing",
            "0.3",
            "--units",
            "bohr",
            "--size",
            "640",
        ],
    );
    assert!(
        images(&svg) >= 2,
        "the rendered scenes are embedded rasters"
    );
}
