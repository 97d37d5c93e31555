//! A demonstration picture for looking at by eye (`cargo test --release --lib
//! scene::tests::demo -- --ignored`): two π lobes, orange and purple, around
//! carbon monoxide, written to /tmp/scene-demo.png (and a translucent version).

use super::super::{Painted, Scene, View, ViewSpec, ball_and_stick, frame, render};
use super::helpers::{icosphere, lobe};
use crate::chem::Molecule;
use crate::io::png::{PngMeta, encode};

#[test]
#[ignore = "writes /tmp/scene-demo*.png for inspection"]
fn demo_picture() {
    // C≡O along x, 1.128 Å = 2.13 bohr (from memory).
    let m =
        Molecule::from_symbols(&[("C", [-1.066, 0.0, 0.0]), ("O", [1.066, 0.0, 0.0])], 0).unwrap();
    let (balls, sticks) = ball_and_stick(&m);
    let up = lobe(icosphere([0.0; 3], 1.0, 6), [0.0, 0.0, 1.0]);
    let down = lobe(icosphere([0.0; 3], 1.0, 6), [0.0, 0.0, -1.0]);
    for (opacity, name) in [(1.0, "scene-demo"), (0.6, "scene-demo-translucent")] {
        let scene = Scene {
            surfaces: vec![
                Painted {
                    mesh: &up,
                    rgb: [236, 128, 32],
                    opacity,
                },
                Painted {
                    mesh: &down,
                    rgb: [118, 72, 172],
                    opacity,
                },
            ],
            balls: balls.clone(),
            sticks: sticks.clone(),
        };
        let view = View {
            spec: ViewSpec::Auto,
            turn_deg: [0.0; 2],
            perspective: true,
        };
        let cam = frame(&scene, &view.orientation(&m).unwrap(), true, 4.0 / 3.0);
        let t = std::time::Instant::now();
        let img = render(&scene, &cam, 1200, 900, Some([255, 255, 255]));
        eprintln!("{name}: {:.3} s", t.elapsed().as_secs_f64());
        let bytes = encode(&img, &PngMeta::default()).unwrap();
        std::fs::write(format!("/tmp/{name}.png"), bytes).unwrap();
        // Edges magnified 4× (nearest neighbour) to look for speckles and fringes.
        let crop = image::imageops::crop_imm(&img, 540, 340, 200, 150).to_image();
        let big = image::imageops::resize(&crop, 800, 600, image::imageops::FilterType::Nearest);
        let bytes = encode(&big, &PngMeta::default()).unwrap();
        std::fs::write(format!("/tmp/{name}-crop.png"), bytes).unwrap();
        // An oblique view in which the lobes pass in front of the atoms.
        let view = View {
            spec: ViewSpec::Axis {
                axis: 1,
                positive: false,
            },
            turn_deg: [50.0, 30.0],
            perspective: true,
        };
        let cam = frame(&scene, &view.orientation(&m).unwrap(), true, 4.0 / 3.0);
        let img = render(&scene, &cam, 600, 450, None);
        let bytes = encode(&img, &PngMeta::default()).unwrap();
        std::fs::write(format!("/tmp/{name}-oblique.png"), bytes).unwrap();
    }
    // Benzene (C–C 1.39 Å, C–H 1.09 Å, from memory) with lobes above and below the
    // ring, in the automatic view, orthographic.
    let mut atoms = Vec::new();
    for k in 0..6 {
        let a = std::f64::consts::PI / 3.0 * k as f64;
        atoms.push(("C", [2.627 * a.cos(), 2.627 * a.sin(), 0.0]));
        atoms.push(("H", [4.687 * a.cos(), 4.687 * a.sin(), 0.0]));
    }
    let benzene = Molecule::from_symbols(&atoms, 0).unwrap();
    let (balls, sticks) = ball_and_stick(&benzene);
    let scene = Scene {
        surfaces: vec![
            Painted {
                mesh: &up,
                rgb: [236, 128, 32],
                opacity: 0.7,
            },
            Painted {
                mesh: &down,
                rgb: [118, 72, 172],
                opacity: 0.7,
            },
        ],
        balls,
        sticks,
    };
    let view = View {
        spec: ViewSpec::Auto,
        turn_deg: [0.0; 2],
        perspective: false,
    };
    let cam = frame(
        &scene,
        &view.orientation(&benzene).unwrap(),
        false,
        4.0 / 3.0,
    );
    let img = render(&scene, &cam, 800, 600, Some([255, 255, 255]));
    let bytes = encode(&img, &PngMeta::default()).unwrap();
    std::fs::write("/tmp/scene-demo-benzene.png", bytes).unwrap();
}
