//! Rendered pixels: symmetry, placement, depth, translucency, backgrounds, shading.

use image::RgbaImage;

use super::super::draw::render_lit;
use super::super::shade::{Lights, linear};
use super::super::{
    Ball, Camera, Painted, Scene, Stick, View, ViewSpec, check_size, frame, render,
};
use super::helpers::{icosphere, px, symmetric_lights};
use crate::chem::Molecule;
use crate::surface::Mesh;

fn camera(scene: &Scene, spec: &str, perspective: bool, w: u32, h: u32) -> Camera {
    let any = Molecule::from_symbols(&[("H", [0.0; 3])], 0).unwrap();
    let view = View {
        spec: spec.parse::<ViewSpec>().unwrap(),
        turn_deg: [0.0; 2],
        perspective,
    };
    frame(
        scene,
        &view.orientation(&any).unwrap(),
        perspective,
        w as f64 / h as f64,
    )
}

fn solid<'a>(mesh: &'a Mesh, rgb: [u8; 3]) -> Painted<'a> {
    Painted {
        mesh,
        rgb,
        opacity: 1.0,
    }
}

fn ball(centre: [f64; 3], radius: f64, rgb: [u8; 3]) -> Ball {
    Ball {
        centre,
        radius,
        rgb,
    }
}

/// A scene symmetric under x → −x seen from +y (x is the screen's horizontal) gives
/// a mirror-symmetric picture, to one colour step after anti-aliasing (lights
/// symmetric too: the default key light is on the left on purpose).
#[test]
fn mirror_symmetric_scene_gives_a_mirror_symmetric_picture() {
    let top = icosphere([0.0, 0.0, 2.5], 1.2, 3);
    let left = icosphere([-2.5, 0.3, -2.0], 1.0, 3);
    let right = icosphere([2.5, 0.3, -2.0], 1.0, 3);
    let veil = icosphere([0.0, -1.0, 0.0], 1.6, 3);
    let scene = Scene {
        surfaces: vec![
            solid(&top, [230, 120, 20]),
            solid(&left, [120, 60, 170]),
            solid(&right, [120, 60, 170]),
            Painted {
                mesh: &veil,
                rgb: [40, 160, 200],
                opacity: 0.45,
            },
        ],
        balls: vec![
            ball([-1.2, 0.0, 0.0], 0.7, [90, 90, 95]),
            ball([1.2, 0.0, 0.0], 0.7, [90, 90, 95]),
        ],
        sticks: vec![Stick {
            a: [-1.2, 0.0, 0.0],
            b: [1.2, 0.0, 0.0],
            radius: 0.2,
            rgb_a: [200, 40, 40],
            rgb_b: [200, 40, 40],
        }],
    };
    for perspective in [false, true] {
        let (w, h) = (240, 180);
        let cam = camera(&scene, "+y", perspective, w, h);
        let img = render_lit(
            &scene,
            &cam,
            w,
            h,
            Some([255, 255, 255]),
            &symmetric_lights(),
        );
        let mut worst = 0u8;
        for y in 0..h {
            for x in 0..w / 2 {
                let (a, b) = (px(&img, x, y), px(&img, w - 1 - x, y));
                for k in 0..4 {
                    worst = worst.max(a[k].abs_diff(b[k]));
                }
            }
        }
        assert!(
            worst <= 2,
            "perspective {perspective}: columns differ by {worst}"
        );
        // Something is drawn on both halves: the test is not vacuous.
        assert!(px(&img, w / 2, h / 2) != [255, 255, 255, 255]);
    }
}

fn is_red(p: [u8; 4]) -> bool {
    p[3] > 128 && p[0] > 120 && p[1] < 60 && p[2] < 60
}

/// A red sphere on +z, seen from +x, lies above the nucleus at the origin: with z
/// up in side views (common practice), its pixels are in the upper half.
#[test]
fn a_plus_z_lobe_appears_above_the_nucleus_in_a_side_view() {
    let lobe = icosphere([0.0, 0.0, 3.0], 1.0, 3);
    let scene = Scene {
        surfaces: vec![solid(&lobe, [220, 20, 20])],
        balls: vec![ball([0.0; 3], 0.6, [90, 90, 95])],
        sticks: vec![],
    };
    for perspective in [false, true] {
        let (w, h) = (200, 200);
        let img = render(&scene, &camera(&scene, "+x", perspective, w, h), w, h, None);
        let (mut n, mut sx, mut sy) = (0.0, 0.0, 0.0);
        for (x, y, p) in img.enumerate_pixels() {
            if is_red(p.0) {
                n += 1.0;
                sx += x as f64;
                sy += y as f64;
            }
        }
        assert!(n > 500.0, "red pixels: {n}");
        let (cx, cy) = (sx / n, sy / n);
        assert!((cx - 100.0).abs() < 3.0, "centred horizontally: {cx}");
        // Sphere above the ball: its centre is well above the picture's middle.
        assert!(cy < 70.0, "red centroid at row {cy} of 200");
        assert!(
            !is_red(px(&img, 100, 170)),
            "the ball's side stays free of red"
        );
    }
}

/// Whatever is nearer the camera covers the rest, whichever order the scene lists.
#[test]
fn the_nearer_object_hides_the_farther() {
    let behind = icosphere([-3.0, 0.0, 0.0], 1.0, 3);
    let front = icosphere([3.0, 0.0, 0.0], 1.0, 3);
    let blue = ball([0.0; 3], 1.5, [20, 20, 220]);
    for perspective in [false, true] {
        // Seen from +x the ball (x ≤ 1.5) is in front of the sphere at x = −3.
        let scene = Scene {
            surfaces: vec![solid(&behind, [220, 20, 20])],
            balls: vec![blue],
            sticks: vec![],
        };
        let img = render(
            &scene,
            &camera(&scene, "+x", perspective, 100, 100),
            100,
            100,
            None,
        );
        let c = px(&img, 50, 50);
        assert!(c[2] > 150 && c[0] < 60, "ball in front: {c:?}");
        // …and behind the sphere at x = +3.
        let scene = Scene {
            surfaces: vec![solid(&front, [220, 20, 20])],
            balls: vec![blue],
            sticks: vec![],
        };
        let img = render(
            &scene,
            &camera(&scene, "+x", perspective, 100, 100),
            100,
            100,
            None,
        );
        let c = px(&img, 50, 50);
        assert!(c[0] > 150 && c[2] < 60, "sphere in front: {c:?}");
    }
}

fn centre_linear(img: &RgbaImage) -> [f32; 3] {
    let p = px(img, img.width() / 2, img.height() / 2);
    linear([p[0], p[1], p[2]])
}

/// A translucent sphere (opacity ½) in front of a green ball: both its faces lie
/// in front, so by the "over" operator (T. Porter and T. Duff, "Compositing digital
/// images", SIGGRAPH 1984) the ball keeps (1 − ½)² = ¼ of its light in the middle.
/// The red surface adds green only through its small white highlight (≤ 0.05).
#[test]
fn a_translucent_surface_over_a_ball_blends() {
    let veil = icosphere([3.0, 0.0, 0.0], 1.0, 4);
    let green = ball([0.0; 3], 1.5, [0, 255, 0]);
    let both = Scene {
        surfaces: vec![Painted {
            mesh: &veil,
            rgb: [255, 0, 0],
            opacity: 0.5,
        }],
        balls: vec![green],
        sticks: vec![],
    };
    let cam = camera(&both, "+x", false, 100, 100);
    let mixed = centre_linear(&render(&both, &cam, 100, 100, None));
    let alone = Scene {
        surfaces: vec![],
        ..both.clone()
    };
    let ball_only = centre_linear(&render(&alone, &cam, 100, 100, None));
    let veil_only = centre_linear(&render(
        &Scene {
            balls: vec![],
            ..both.clone()
        },
        &cam,
        100,
        100,
        None,
    ));
    assert!(ball_only[1] > 0.6, "{ball_only:?}");
    assert!(
        (mixed[1] - 0.25 * ball_only[1]).abs() < 0.05,
        "green {mixed:?} vs ball {ball_only:?}"
    );
    assert!(
        mixed[0] > 0.5 && mixed[0] > ball_only[0] + 0.4,
        "red {mixed:?}"
    );
    // Over nothing the two layers give alpha 1 − ¼ = ¾.
    let p = px(
        &render(
            &Scene {
                balls: vec![],
                ..both
            },
            &cam,
            100,
            100,
            None,
        ),
        50,
        50,
    );
    assert!((p[3] as f64 - 0.75 * 255.0).abs() <= 1.0, "alpha {}", p[3]);
    assert!(veil_only[0] > 0.5);
}

/// Transparent where nothing is drawn; edge pixels keep the object's colour and
/// lose only opacity (no dark fringe): with ambient light alone a ball is one flat
/// colour, so every partly covered pixel must have exactly it.
#[test]
fn backgrounds_and_edges() {
    let scene = Scene {
        balls: vec![ball([0.0; 3], 1.0, [200, 100, 50])],
        ..Scene::default()
    };
    let cam = camera(&scene, "+z", false, 64, 48);
    let img = render(&scene, &cam, 64, 48, None);
    for (x, y) in [(0, 0), (63, 0), (0, 47), (63, 47)] {
        assert_eq!(px(&img, x, y)[3], 0, "corner {x},{y}");
    }
    let white = render(&scene, &cam, 64, 48, Some([255, 255, 255]));
    assert_eq!(px(&white, 0, 0), [255, 255, 255, 255]);
    let flat = Lights {
        lights: vec![],
        ambient: 1.0,
        specular: 0.0,
        shininess: 1,
    };
    let img = render_lit(&scene, &cam, 64, 48, None, &flat);
    let mut edges = 0;
    for p in img.pixels() {
        if p.0[3] > 0 {
            assert!(
                p.0[0].abs_diff(200) <= 1 && p.0[1].abs_diff(100) <= 1 && p.0[2].abs_diff(50) <= 1,
                "{:?}",
                p.0
            );
            edges += usize::from(p.0[3] < 255);
        }
    }
    assert!(edges > 20, "anti-aliased edge pixels: {edges}");
}

/// The mesh path and the exact ball agree: a finely tessellated sphere and a ball
/// of the same size and colour look the same in the middle and are lit from the
/// upper left (where the key light is).
#[test]
fn mesh_and_ball_shade_alike_and_the_key_light_is_upper_left() {
    let mesh = icosphere([0.0; 3], 1.0, 5);
    let rgb = [180, 180, 180];
    let as_mesh = Scene {
        surfaces: vec![solid(&mesh, rgb)],
        ..Scene::default()
    };
    let as_ball = Scene {
        balls: vec![ball([0.0; 3], 1.0, rgb)],
        ..Scene::default()
    };
    let cam = camera(&as_ball, "+z", false, 120, 120);
    let a = render(&as_mesh, &cam, 120, 120, None);
    let b = render(&as_ball, &cam, 120, 120, None);
    for (x, y) in [(60, 60), (40, 40), (80, 80), (60, 30), (85, 60)] {
        let (p, q) = (px(&a, x, y), px(&b, x, y));
        assert!(
            (0..3).all(|k| p[k].abs_diff(q[k]) <= 3),
            "{x},{y}: mesh {p:?} ball {q:?}"
        );
    }
    assert!(
        px(&a, 40, 40)[0] > px(&a, 80, 80)[0] + 40,
        "upper left brighter"
    );
}

/// Two-sided lighting: the inside of an open bowl, seen from below, is lit like
/// an outside, not left at the ambient level.
#[test]
fn open_surfaces_are_lit_from_both_sides() {
    let mut bowl = icosphere([0.0; 3], 1.0, 4);
    let pos = bowl.positions.clone();
    bowl.triangles
        .retain(|t| t.iter().map(|&k| pos[k as usize][2]).sum::<f64>() > 0.0);
    let scene = Scene {
        surfaces: vec![solid(&bowl, [200, 200, 200])],
        ..Scene::default()
    };
    let cam = camera(&scene, "-z", false, 100, 100);
    let img = render(&scene, &cam, 100, 100, None);
    let p = px(&img, 50, 50);
    // Ambient alone would give 0.2 of the albedo in linear light (sRGB ≈ 105);
    // facing the viewer the key light adds about 0.55 more.
    assert!(p[3] == 255 && p[0] > 170, "{p:?}");
}

#[test]
fn picture_sizes_are_checked() {
    assert!(check_size(1200, 900).is_ok());
    for (w, h) in [(0, 10), (10, 0), (20_000, 10), (16_000, 16_000)] {
        assert!(check_size(w, h).is_err(), "{w}x{h}");
    }
    let empty = render(
        &Scene::default(),
        &camera(&Scene::default(), "+x", false, 1, 1),
        0,
        5,
        None,
    );
    assert_eq!(empty.dimensions(), (0, 5));
}
