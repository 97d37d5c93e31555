//! Test meshes and light sets.

use super::super::shade::{Light, Lights};
use crate::surface::Mesh;

/// An icosphere (the shared shape builder): triangles counter-clockwise seen from
/// outside, normals outward.
pub fn icosphere(centre: [f64; 3], radius: f64, levels: u32) -> Mesh {
    crate::surface::shapes::sphere(centre, radius, levels)
}

fn sub(a: [f64; 3], b: [f64; 3]) -> [f64; 3] {
    [a[0] - b[0], a[1] - b[1], a[2] - b[2]]
}

/// Lights symmetric under left ↔ right (key from straight above the viewer, no
/// fill), for the mirror test.
pub fn symmetric_lights() -> Lights {
    let n = (0.6f32 * 0.6 + 1.0).sqrt();
    Lights {
        lights: vec![Light {
            towards: [0.0, 0.6 / n, -1.0 / n],
            strength: 0.8,
            highlight: true,
        }],
        ..Lights::default()
    }
}

pub fn px(img: &image::RgbaImage, x: u32, y: u32) -> [u8; 4] {
    img.get_pixel(x, y).0
}

/// A p-like lobe from a unit sphere: an egg 2.6 bohr long along `axis` (±z only),
/// narrow end towards the origin, tip 0.5 bohr from it; normals recomputed.
pub fn lobe(mut m: Mesh, axis: [f64; 3]) -> Mesh {
    let s = axis[2].signum();
    for p in m.positions.iter_mut() {
        let z = p[2] * s;
        let w = 1.0 + 0.35 * z;
        *p = [1.1 * w * p[0], 1.1 * w * p[1], s * (1.3 * z + 1.8)];
    }
    recompute_normals(&mut m);
    m
}

/// Area-weighted vertex normals from the triangles (counter-clockwise outside).
pub fn recompute_normals(m: &mut Mesh) {
    let mut n = vec![[0.0f64; 3]; m.positions.len()];
    for t in &m.triangles {
        let [a, b, c] = t.map(|k| m.positions[k as usize]);
        let (u, v) = (sub(b, a), sub(c, a));
        let f = [
            u[1] * v[2] - u[2] * v[1],
            u[2] * v[0] - u[0] * v[2],
            u[0] * v[1] - u[1] * v[0],
        ];
        for k in t {
            for i in 0..3 {
                n[*k as usize][i] += f[i];
            }
        }
    }
    for v in n.iter_mut() {
        let l = (v[0] * v[0] + v[1] * v[1] + v[2] * v[2]).sqrt();
        *v = v.map(|x| x / l);
    }
    m.normals = n;
}
