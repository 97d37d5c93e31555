//! Every canvas operation, recorded and written as SVG, renders (resvg) to the pixels
//! the canvas drew: text straight, turned up and turned down, with raised and lowered
//! markup; filled and translucent rectangles; solid, dashed and clipped polylines;
//! circles with and without outlines; put pixels, a pasted translucent raster and
//! single blended pixels. The tolerance is the one `svg_figures` states and explains.

mod svg_compare;

use image::{Rgba, RgbaImage};
use lobecast::io::png::PngMeta;
use lobecast::render::FigureFormat;
use lobecast::render::canvas::{Canvas, Colour, HAlign, VAlign};
use svg_compare::{decode_png, difference, render_svg, within};

fn scene(text: bool) -> Canvas {
    let mut c = Canvas::new(420, 300, Colour::WHITE);
    c.fill_rect(10.0, 10.0, 120.0, 60.0, Colour::rgb(230, 120, 20));
    c.fill_rect(
        60.5,
        40.25,
        120.0,
        60.0,
        Colour::rgb(20, 90, 200).with_alpha(120),
    );
    let pixels: Vec<[u8; 3]> = (0..80 * 50)
        .map(|i| [(i % 80 * 3) as u8, (i / 80 * 5) as u8, 128])
        .collect();
    c.put_pixels(300, 20, 80, &pixels);
    let mut img = RgbaImage::new(60, 40);
    for (x, y, p) in img.enumerate_pixels_mut() {
        *p = Rgba([200, (x * 4) as u8, (y * 6) as u8, (x * 4 + 10) as u8]);
    }
    c.paste(320, 40, &img);
    let wave: Vec<(f32, f32)> = (0..60)
        .map(|i| (20.0 + i as f32 * 6.0, 200.0 + 30.0 * (i as f32 * 0.3).sin()))
        .collect();
    c.stroke(&wave, 2.0, Colour::INK, None);
    c.stroke(
        &[(20.0, 150.0), (380.0, 160.0)],
        1.5,
        Colour::GREY,
        Some(&[6.0, 3.0]),
    );
    c.stroke_clipped(
        &wave,
        3.0,
        Colour::rgb(200, 0, 0),
        None,
        Some([100.0, 170.0, 120.0, 60.0]),
    );
    c.stroke_rect(200.5, 120.5, 80.0, 40.0, 1.0, Colour::BLACK);
    c.circle(60.0, 260.0, 12.0, Colour::WHITE, Colour::BLACK, 1.5);
    c.circle(100.0, 260.0, 5.0, Colour::BLACK, Colour::BLACK, 0.0);
    for i in 0..40 {
        c.blend(150 + i, 250 + i / 4, Colour::rgb(0, 150, 0), 0.8);
    }
    if text {
        let a = (HAlign::Left, VAlign::Baseline);
        c.text("E_{1} = −0.55 hartree", 18.0, 140.0, 140.0, a, Colour::INK);
        c.text(
            "bohr^{−3/2} Å",
            14.0,
            410.0,
            290.0,
            (HAlign::Right, VAlign::Bottom),
            Colour::BLACK,
        );
        c.text_up(
            "z / Å up",
            15.0,
            250.0,
            240.0,
            (HAlign::Centre, VAlign::Top),
            Colour::INK,
        );
        c.text_down(
            "ψ_{2} down",
            15.0,
            290.0,
            230.0,
            (HAlign::Centre, VAlign::Middle),
            Colour::INK,
        );
    }
    c
}

#[test]
fn every_canvas_operation_renders_as_drawn() {
    let meta = PngMeta::default();
    let c = scene(true);
    let (w, h, png) = decode_png(&c.encode(FigureFormat::Png, &meta).unwrap());
    let svg = String::from_utf8(c.encode(FigureFormat::Svg, &meta).unwrap()).unwrap();
    roxmltree::Document::parse(&svg).unwrap();
    let d = difference(&render_svg(&svg, w, h), &png);
    eprintln!("canvas: {d:?}");
    assert!(within(d), "{d:?}");

    // Each text alone, straight, up or down, is enough to fail the limit when it is
    // missing, so each one's placement is checked, not only the sum.
    for label in ["E_{1}", "bohr^{", "z / Å up", "ψ_{2} down"] {
        let without: Vec<&str> = svg
            .lines()
            .filter(|l| !l.starts_with(&format!("<path aria-label=\"{label}")))
            .collect();
        assert_eq!(without.len() + 1, svg.lines().count(), "{label}");
        let d = difference(&render_svg(&without.join("\n"), w, h), &png);
        assert!(d.1 > svg_compare::MAX_FAR_SHARE, "{label}: {d:?}");
    }

    // Negative control: the same canvas without its four texts is over the limit,
    // so the limit would catch text the SVG lost or misplaced.
    let bare = scene(false);
    let svg = String::from_utf8(bare.encode(FigureFormat::Svg, &meta).unwrap()).unwrap();
    let d = difference(&render_svg(&svg, w, h), &png);
    eprintln!("canvas without text: {d:?}");
    assert!(!within(d), "{d:?}");
}
