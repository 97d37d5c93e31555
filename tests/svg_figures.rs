//! SVG figures against the PNG of the same figure. Each figure command is run twice
//! with the same arguments, once with `--png F.png` and once with `--png F.svg`; the
//! SVG is parsed as XML (roxmltree, an independent XML 1.0 parser) and rendered by
//! resvg (an independent SVG renderer), and the rendering is compared with the PNG.
//! Negative controls check that the comparison notices text removed or moved by
//! two pixels, so the tolerance means something.

mod common;
mod svg_compare;

use std::path::Path;

use common::{example, ok};
use svg_compare::{FAR, MAX_FAR_SHARE, MAX_MEAN, decode_png, difference, render_svg, within};

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

/// On a transparent background, so the embedded scenes carry their own alpha.
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
            "--background",
            "transparent",
        ],
    );
    assert!(
        images(&svg) >= 2,
        "the rendered scenes are embedded rasters"
    );
    // A transparent figure has no background rectangle: the scenes' own alpha shows.
    assert!(!svg.contains("<rect x=\"0\" y=\"0\""));
}
