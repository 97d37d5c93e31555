//! Perspective-correct depth: a large oblique square cuts a ball in half, and the
//! cut in the picture is where exact ray casting puts it.

use super::super::draw::render_lit;
use super::super::project::Projector;
use super::super::shade::Lights;
use super::super::vec3::{dot, sub};
use super::super::{Ball, Painted, Scene, View, ViewSpec, frame};
use crate::chem::Molecule;
use crate::surface::Mesh;

/// Depth is interpolated as 1/z across a triangle under perspective (common
/// practice): interpolating z itself would put the middle of this 20-bohr square
/// about half a bohr too deep and move the cut through the ball by many pixels.
#[test]
fn a_big_oblique_square_cuts_a_ball_where_ray_casting_says() {
    let l = 10.0;
    let square = Mesh {
        positions: vec![[-l, -l, 0.0], [l, -l, 0.0], [l, l, 0.0], [-l, l, 0.0]],
        normals: vec![[0.0, 0.0, 1.0]; 4],
        triangles: vec![[0, 1, 2], [0, 2, 3]],
    };
    let r = 2.0;
    let scene = Scene {
        surfaces: vec![Painted {
            mesh: &square,
            rgb: [0, 0, 255],
            opacity: 1.0,
        }],
        balls: vec![Ball {
            centre: [0.0; 3],
            radius: r,
            rgb: [255, 0, 0],
        }],
        sticks: vec![],
    };
    let any = Molecule::from_symbols(&[("H", [0.0; 3])], 0).unwrap();
    let view = View {
        spec: ViewSpec::Axis {
            axis: 0,
            positive: true,
        },
        turn_deg: [40.0, 25.0],
        perspective: true,
    };
    let cam = frame(&scene, &view.orientation(&any).unwrap(), true, 1.0);
    let (w, h) = (400usize, 400usize);
    let flat = Lights {
        lights: vec![],
        ambient: 1.0,
        specular: 0.0,
        shininess: 1,
    };
    let img = render_lit(&scene, &cam, w as u32, h as u32, None, &flat);
    let p = Projector::new(&cam, w, h);
    let (centre, normal) = (cam.eye([0.0; 3]), cam.eye_dir([0.0, 0.0, 1.0]));
    let (mut checked, mut wrong) = (0, 0);
    for row in 0..h {
        for col in 0..w {
            let (o, d) = p.ray(col, row);
            let oc = sub(o, centre);
            let (b, c) = (dot(d, oc), dot(oc, oc) - r * r);
            let disc = b * b - dot(d, d) * c;
            if disc < 0.0 {
                continue;
            }
            let t_ball = (-b - disc.sqrt()) / dot(d, d);
            let t_plane = -dot(oc, normal) / dot(d, normal);
            // Skip pixels near the cut, where anti-aliasing mixes the two.
            if (t_ball - t_plane).abs() < 0.05 || disc < 0.05 {
                continue;
            }
            checked += 1;
            let px = img.get_pixel(col as u32, row as u32).0;
            let red = px[0] > px[2];
            if red != (t_ball < t_plane) {
                wrong += 1;
            }
        }
    }
    assert!(checked > 2000, "{checked}");
    assert!(
        wrong == 0,
        "{wrong} of {checked} ball pixels on the wrong side of the cut"
    );
}
