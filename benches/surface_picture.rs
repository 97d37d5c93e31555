//! The whole 3-D picture of the benchmark (`cargo bench --bench
//! surface_picture`): benzene's HOMO by extended Hückel from the XYZ file to a
//! 1200 × 900 PNG at the command's defaults (0.15 bohr grid, 5 bohr padding, 90 %
//! enclosed, auto view), split into its stages: `solve` (read and solve),
//! `surfaces` (sample, choose the level, extract, place on the exact field),
//! `picture` (ball-and-stick, camera, render at 3× supersampling, frame, PNG) and
//! `all`. Goal: `all` under 1.5 s on 2 cores (median in divan's table).

use std::path::Path;

use lobecast::field::Field;
use lobecast::grid::{GridBox, Resolution};
use lobecast::io::model::LoadOptions;
use lobecast::io::png::PngMeta;
use lobecast::render::Colour;
use lobecast::render::picture::{Furniture, compose, layout};
use lobecast::render::scene::{Painted, Scene, View, ViewSpec, ball_and_stick, frame_all, render};
use lobecast::solve::MethodKind;
use lobecast::source::Source;
use lobecast::source::surfaces::{FieldSurfaces, Isovalue, Timings, surfaces_of};

fn main() {
    divan::main();
}

fn load() -> Source {
    let path = Path::new(env!("CARGO_MANIFEST_DIR")).join("examples/benzene.xyz");
    let options = LoadOptions {
        method: Some(MethodKind::ExtendedHuckel),
        ..Default::default()
    };
    Source::load(&path, &options).unwrap()
}

fn surfaces(source: &Source) -> Vec<FieldSurfaces> {
    let field = Field::parse("orbital:homo").unwrap();
    let grid = GridBox::around(source.molecule(), 5.0, Resolution::Spacing(0.15)).unwrap();
    surfaces_of(
        source,
        &[field],
        &grid,
        Isovalue::Enclosing(0.9),
        8 << 30,
        &mut Timings::default(),
    )
    .unwrap()
}

fn picture(source: &Source, found: &[FieldSurfaces]) -> Vec<u8> {
    let (balls, sticks) = ball_and_stick(source.molecule());
    let colours = [[232, 140, 40], [120, 100, 170]];
    let scene = Scene {
        surfaces: found[0]
            .surfaces
            .iter()
            .zip(colours)
            .map(|(s, rgb)| Painted {
                mesh: &s.mesh,
                rgb,
                opacity: 1.0,
            })
            .collect(),
        balls,
        sticks,
    };
    let furniture = Furniture {
        title: "benzene HOMO".into(),
        captions: vec!["ψ".into()],
        key: vec![(colours[0], "ψ > 0".into()), (colours[1], "ψ < 0".into())],
        footnotes: vec!["bench".into()],
        background: Colour::WHITE,
    };
    let l = layout(1200, Some(900), 1, &furniture);
    let view = View {
        spec: ViewSpec::Auto,
        turn_deg: [0.0, 0.0],
        perspective: false,
    };
    let o = view.orientation(source.molecule()).unwrap();
    let camera = frame_all(
        std::slice::from_ref(&scene),
        &o,
        false,
        l.panel.0 as f64 / l.panel.1 as f64,
    );
    let panel = render(&scene, &camera, l.panel.0, l.panel.1, Some([255, 255, 255]));
    compose(&l, &[panel], &furniture)
        .encode_png(&PngMeta::default())
        .unwrap()
}

#[divan::bench(sample_count = 10)]
fn solve() -> Source {
    load()
}

#[divan::bench(sample_count = 10)]
fn surfaces_only(b: divan::Bencher) {
    let source = load();
    b.bench(|| surfaces(&source));
}

#[divan::bench(sample_count = 10)]
fn picture_only(b: divan::Bencher) {
    let source = load();
    let found = surfaces(&source);
    b.bench(|| picture(&source, &found));
}

#[divan::bench(sample_count = 10)]
fn all() -> Vec<u8> {
    let source = load();
    let found = surfaces(&source);
    picture(&source, &found)
}
