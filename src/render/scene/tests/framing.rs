//! Balls and sticks of a molecule, and the framing of scenes.

use super::super::project::Projector;
use super::super::{
    BALL_FRACTION, MARGIN, Painted, STICK_RADIUS_ANGSTROM, Scene, View, ViewSpec, ball_and_stick,
    frame, frame_all, render,
};
use super::helpers::icosphere;
use crate::chem::Molecule;
use crate::chem::colours::element_rgb;
use crate::chem::units::BOHR_IN_ANGSTROM;

fn water() -> Molecule {
    // O–H 0.9572 Å, H–O–H 104.52° (the experimental gas-phase geometry, from memory).
    let (r, half) = (0.9572 / BOHR_IN_ANGSTROM, 104.52f64.to_radians() / 2.0);
    Molecule::from_symbols(
        &[
            ("O", [0.0, 0.0, 0.0]),
            ("H", [r * half.sin(), 0.0, r * half.cos()]),
            ("H", [-r * half.sin(), 0.0, r * half.cos()]),
            ("X", [0.0, 0.0, -1.0]),
        ],
        0,
    )
    .unwrap()
}

/// O–H (0.96 Å) is under 1.2 × (0.66 + 0.31) Å = 1.16 Å and bonded; H···H (1.51 Å)
/// is over 1.2 × 0.62 Å = 0.74 Å and not (Cordero radii, common-practice factor).
/// The ghost centre gets neither ball nor bond.
#[test]
fn water_has_three_balls_and_two_sticks() {
    let m = water();
    let (balls, sticks) = ball_and_stick(&m);
    assert_eq!(balls.len(), 3);
    assert_eq!(sticks.len(), 2);
    let want_o = BALL_FRACTION * 0.66 / BOHR_IN_ANGSTROM;
    assert!(
        (balls[0].radius - want_o).abs() < 1e-12,
        "{}",
        balls[0].radius
    );
    assert_eq!(balls[0].rgb, element_rgb(8));
    assert_eq!(balls[1].rgb, element_rgb(1));
    for s in &sticks {
        assert_eq!(s.a, m.atoms[0].position);
        assert_eq!((s.rgb_a, s.rgb_b), (element_rgb(8), element_rgb(1)));
        assert!((s.radius - STICK_RADIUS_ANGSTROM / BOHR_IN_ANGSTROM).abs() < 1e-12);
        assert!(
            s.radius < balls[1].radius,
            "stick ends hide inside the smallest ball"
        );
    }
}

/// Every object lies inside the picture, with at least the margin free on each
/// side, and the fit is tight in one direction.
#[test]
fn framing_keeps_everything_inside_with_a_margin() {
    let m = water();
    let (balls, sticks) = ball_and_stick(&m);
    let lobe = icosphere([0.5, -2.0, 3.0], 1.5, 2);
    let scene = Scene {
        surfaces: vec![Painted {
            mesh: &lobe,
            rgb: [230, 120, 20],
            opacity: 1.0,
        }],
        balls,
        sticks,
    };
    for (spec, turn) in [
        ("+x", [0.0, 0.0]),
        ("+z", [0.0, 0.0]),
        ("auto", [0.0, 0.0]),
        ("atoms:1,2", [20.0, 40.0]),
    ] {
        for perspective in [false, true] {
            for (w, h) in [(400usize, 300usize), (200, 400)] {
                let v = View {
                    spec: spec.parse::<ViewSpec>().unwrap(),
                    turn_deg: turn,
                    perspective,
                };
                let o = v.orientation(&m).unwrap();
                let cam = frame(&scene, &o, perspective, w as f64 / h as f64);
                let p = Projector::new(&cam, w, h);
                let mut ext = [
                    f64::INFINITY,
                    f64::NEG_INFINITY,
                    f64::INFINITY,
                    f64::NEG_INFINITY,
                ];
                let objects = (scene.balls.iter().map(|b| (b.centre, b.radius)))
                    .chain(
                        scene
                            .sticks
                            .iter()
                            .flat_map(|s| [(s.a, s.radius), (s.b, s.radius)]),
                    )
                    .chain(lobe.positions.iter().map(|q| (*q, 0.0)));
                for (c, r) in objects {
                    let e = cam.sphere_extent(cam.eye(c), r).unwrap();
                    let a = p.sample([e[0], e[3]]);
                    let b = p.sample([e[1], e[2]]);
                    ext = [
                        ext[0].min(a[0]),
                        ext[1].max(b[0]),
                        ext[2].min(a[1]),
                        ext[3].max(b[1]),
                    ];
                }
                // Free space on each side: MARGIN of the fitted half extent, i.e. a
                // fraction MARGIN / (1 + MARGIN) of the half picture in the tight
                // direction (our own definition, in camera.rs).
                let (mx, my) = (
                    w as f64 / 2.0 * MARGIN / (1.0 + MARGIN),
                    h as f64 / 2.0 * MARGIN / (1.0 + MARGIN),
                );
                let what = format!("{spec} {perspective} {w}x{h}: {ext:?}");
                assert!(
                    ext[0] > 0.0 && ext[1] < w as f64 && ext[2] > 0.0 && ext[3] < h as f64,
                    "{what}"
                );
                let gap = [ext[0], w as f64 - ext[1], ext[2], h as f64 - ext[3]];
                let want = [mx, mx, my, my];
                assert!((0..4).all(|k| gap[k] >= want[k] - 1e-6), "{what} {gap:?}");
                let near = |k: usize| (gap[k] - want[k]).abs() < 1e-6;
                let (tight_x, tight_y) = (near(0) && near(1), near(2) && near(3));
                assert!(tight_x || tight_y, "{what} {gap:?}");
            }
        }
    }
}

/// One camera for several panels holds every scene; the picture's border stays
/// empty.
#[test]
fn frame_all_holds_every_scene() {
    let a = icosphere([0.0, 0.0, 0.0], 1.0, 2);
    let b = icosphere([6.0, 0.0, 0.0], 1.0, 2);
    let sa = Scene {
        surfaces: vec![Painted {
            mesh: &a,
            rgb: [200, 0, 0],
            opacity: 1.0,
        }],
        ..Scene::default()
    };
    let sb = Scene {
        surfaces: vec![Painted {
            mesh: &b,
            rgb: [0, 0, 200],
            opacity: 1.0,
        }],
        ..Scene::default()
    };
    let o = View {
        spec: ViewSpec::Axis {
            axis: 2,
            positive: true,
        },
        turn_deg: [0.0; 2],
        perspective: false,
    }
    .orientation(&Molecule::from_symbols(&[("H", [0.0; 3])], 0).unwrap())
    .unwrap();
    let both = frame_all(&[sa.clone(), sb.clone()], &o, false, 2.0);
    let only_a = frame(&sa, &o, false, 2.0);
    // The union spans x = −1 … 7 (8 bohr) across a 2:1 picture: half height is
    // 8 / 2 / 2 × (1 + MARGIN).
    assert!(
        (both.half_height - 2.0 * (1.0 + MARGIN)).abs() < 1e-9,
        "{}",
        both.half_height
    );
    assert!(only_a.half_height < both.half_height);
    for s in [&sa, &sb] {
        let img = render(s, &both, 200, 100, None);
        let drawn = |x: u32, y: u32| img.get_pixel(x, y).0[3] > 0;
        let mut count = 0;
        for y in 0..100 {
            for x in 0..200 {
                if drawn(x, y) {
                    count += 1;
                    assert!(
                        (3..197).contains(&x) && (3..97).contains(&y),
                        "pixel {x},{y} at the border"
                    );
                }
            }
        }
        assert!(count > 1000, "the sphere is drawn ({count} pixels)");
    }
}

/// The perspective extent of a sphere is exact: points sampled on the sphere
/// project inside it, and the extremes come within 1e-3 of its edges (the
/// silhouette of a sphere under central projection touches its tangent lines;
/// common practice).
#[test]
fn perspective_sphere_extent_is_tight() {
    let o = View {
        spec: ViewSpec::Axis {
            axis: 2,
            positive: true,
        },
        turn_deg: [0.0; 2],
        perspective: true,
    }
    .orientation(&Molecule::from_symbols(&[("H", [0.0; 3])], 0).unwrap())
    .unwrap();
    let lobe = icosphere([0.0; 3], 5.0, 1);
    let scene = Scene {
        surfaces: vec![Painted {
            mesh: &lobe,
            rgb: [0; 3],
            opacity: 1.0,
        }],
        ..Scene::default()
    };
    let cam = frame(&scene, &o, true, 1.0);
    for (c, r) in [
        ([3.0, -2.0, 1.0], 1.5),
        ([-4.0, 3.5, -2.0], 0.7),
        ([0.0, 0.0, 4.0], 1.0),
    ] {
        let e = cam.sphere_extent(cam.eye(c), r).unwrap();
        let mut got = [
            f64::INFINITY,
            f64::NEG_INFINITY,
            f64::INFINITY,
            f64::NEG_INFINITY,
        ];
        let n = 400;
        for i in 0..=n {
            for j in 0..2 * n {
                let (t, p) = (
                    std::f64::consts::PI * i as f64 / n as f64,
                    std::f64::consts::PI * j as f64 / n as f64,
                );
                let q = [
                    c[0] + r * t.sin() * p.cos(),
                    c[1] + r * t.sin() * p.sin(),
                    c[2] + r * t.cos(),
                ];
                let s = cam.screen(cam.eye(q));
                got = [
                    got[0].min(s[0]),
                    got[1].max(s[0]),
                    got[2].min(s[1]),
                    got[3].max(s[1]),
                ];
            }
        }
        for k in 0..4 {
            let inside = if k % 2 == 0 {
                got[k] >= e[k] - 1e-9
            } else {
                got[k] <= e[k] + 1e-9
            };
            assert!(
                inside && (got[k] - e[k]).abs() < 1e-3 * r,
                "{c:?} {k}: {got:?} vs {e:?}"
            );
        }
    }
}
