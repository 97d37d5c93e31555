//! Test meshes and light sets (the shared shape builders are written elsewhere; the
//! tests keep their own so they depend on nothing else).

use std::collections::HashMap;

use super::super::shade::{Light, Lights};
use crate::surface::Mesh;

/// An icosphere: the icosahedron subdivided `levels` times, pushed onto the sphere;
/// triangles counter-clockwise seen from outside, normals outward.
pub fn icosphere(centre: [f64; 3], radius: f64, levels: u32) -> Mesh {
    let p = (1.0 + 5f64.sqrt()) / 2.0;
    let mut dirs: Vec<[f64; 3]> = vec![
        [-1.0, p, 0.0],
        [1.0, p, 0.0],
        [-1.0, -p, 0.0],
        [1.0, -p, 0.0],
        [0.0, -1.0, p],
        [0.0, 1.0, p],
        [0.0, -1.0, -p],
        [0.0, 1.0, -p],
        [p, 0.0, -1.0],
        [p, 0.0, 1.0],
        [-p, 0.0, -1.0],
        [-p, 0.0, 1.0],
    ];
    let mut tris: Vec<[u32; 3]> = vec![
        [0, 11, 5],
        [0, 5, 1],
        [0, 1, 7],
        [0, 7, 10],
        [0, 10, 11],
        [1, 5, 9],
        [5, 11, 4],
        [11, 10, 2],
        [10, 7, 6],
        [7, 1, 8],
        [3, 9, 4],
        [3, 4, 2],
        [3, 2, 6],
        [3, 6, 8],
        [3, 8, 9],
        [4, 9, 5],
        [2, 4, 11],
        [6, 2, 10],
        [8, 6, 7],
        [9, 8, 1],
    ];
    let unit = |v: [f64; 3]| {
        let n = (v[0] * v[0] + v[1] * v[1] + v[2] * v[2]).sqrt();
        [v[0] / n, v[1] / n, v[2] / n]
    };
    for d in dirs.iter_mut() {
        *d = unit(*d);
    }
    for _ in 0..levels {
        let mut mid: HashMap<(u32, u32), u32> = HashMap::new();
        let mut next = Vec::with_capacity(tris.len() * 4);
        let mut half = |a: u32, b: u32, dirs: &mut Vec<[f64; 3]>| {
            *mid.entry((a.min(b), a.max(b))).or_insert_with(|| {
                let (x, y) = (dirs[a as usize], dirs[b as usize]);
                dirs.push(unit([x[0] + y[0], x[1] + y[1], x[2] + y[2]]));
                dirs.len() as u32 - 1
            })
        };
        for [a, b, c] in tris {
            let (ab, bc, ca) = (
                half(a, b, &mut dirs),
                half(b, c, &mut dirs),
                half(c, a, &mut dirs),
            );
            next.extend([[a, ab, ca], [b, bc, ab], [c, ca, bc], [ab, bc, ca]]);
        }
        tris = next;
    }
    // Make every triangle counter-clockwise seen from outside.
    for t in tris.iter_mut() {
        let [a, b, c] = t.map(|k| dirs[k as usize]);
        let (u, v) = (sub(b, a), sub(c, a));
        let n = [
            u[1] * v[2] - u[2] * v[1],
            u[2] * v[0] - u[0] * v[2],
            u[0] * v[1] - u[1] * v[0],
        ];
        if n[0] * a[0] + n[1] * a[1] + n[2] * a[2] < 0.0 {
            t.swap(1, 2);
        }
    }
    Mesh {
        positions: dirs
            .iter()
            .map(|d| {
                [
                    centre[0] + radius * d[0],
                    centre[1] + radius * d[1],
                    centre[2] + radius * d[2],
                ]
            })
            .collect(),
        normals: dirs,
        triangles: tris,
    }
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
