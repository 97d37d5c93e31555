//! The 3-D picture (`cargo bench --bench scene`): `render_1200x900` draws two
//! opaque lobes of 99 224 triangles each (UV spheres stretched along z) around
//! benzene's 12 balls and 12 sticks, 1200 × 900 pixels at 3× supersampling, seen
//! obliquely in perspective; `render_translucent` the same with lobes at opacity
//! 0.6. The target is well under 0.5 s on 2 cores (median in divan's table; the
//! machine is shared).

use std::f64::consts::PI;
use std::sync::LazyLock;

use lobecast::chem::Molecule;
use lobecast::render::scene::{Painted, Scene, View, ViewSpec, ball_and_stick, frame, render};
use lobecast::surface::Mesh;

/// A UV sphere of `n` rings and `2n` segments (4n(n − 1) triangles, fans at the
/// poles), stretched into a lobe centred at height `z`; counter-clockwise outside.
fn lobe(n: usize, z: f64) -> Mesh {
    let mut m = Mesh::default();
    let (a, c) = (2.2, 2.8);
    for i in 0..=n {
        let t = PI * i as f64 / n as f64;
        for j in 0..2 * n {
            let p = PI * j as f64 / n as f64;
            let d = [t.sin() * p.cos(), t.sin() * p.sin(), t.cos()];
            m.positions.push([a * d[0], a * d[1], z + c * d[2]]);
            let g = [d[0] / a, d[1] / a, d[2] / c];
            let l = (g[0] * g[0] + g[1] * g[1] + g[2] * g[2]).sqrt();
            m.normals.push(g.map(|x| x / l));
        }
    }
    let at = |i: usize, j: usize| (i * 2 * n + j % (2 * n)) as u32;
    for i in 0..n {
        for j in 0..2 * n {
            if i > 0 {
                m.triangles.push([at(i, j), at(i + 1, j), at(i, j + 1)]);
            }
            if i + 1 < n {
                m.triangles
                    .push([at(i, j + 1), at(i + 1, j), at(i + 1, j + 1)]);
            }
        }
    }
    m
}

/// Benzene in the xy plane (C–C 1.39 Å, C–H 1.09 Å; from memory), in bohr.
static BENZENE: LazyLock<Molecule> = LazyLock::new(|| {
    let mut atoms = Vec::new();
    for k in 0..6 {
        let a = PI / 3.0 * k as f64;
        atoms.push(("C", [2.627 * a.cos(), 2.627 * a.sin(), 0.0]));
        atoms.push(("H", [4.687 * a.cos(), 4.687 * a.sin(), 0.0]));
    }
    Molecule::from_symbols(&atoms, 0).unwrap()
});

static LOBES: LazyLock<(Mesh, Mesh)> = LazyLock::new(|| (lobe(158, 3.2), lobe(158, -3.2)));

fn draw(opacity: f64) -> image::RgbaImage {
    let (up, down) = &*LOBES;
    let (balls, sticks) = ball_and_stick(&BENZENE);
    let scene = Scene {
        surfaces: vec![
            Painted {
                mesh: up,
                rgb: [236, 128, 32],
                opacity,
            },
            Painted {
                mesh: down,
                rgb: [118, 72, 172],
                opacity,
            },
        ],
        balls,
        sticks,
    };
    let view = View {
        spec: ViewSpec::Auto,
        turn_deg: [0.0; 2],
        perspective: true,
    };
    let camera = frame(
        &scene,
        &view.orientation(&BENZENE).unwrap(),
        true,
        1200.0 / 900.0,
    );
    render(&scene, &camera, 1200, 900, Some([255, 255, 255]))
}

fn main() {
    let (up, down) = &*LOBES;
    eprintln!("triangles: {}", up.triangles.len() + down.triangles.len());
    divan::main();
}

#[divan::bench(sample_count = 9, sample_size = 1)]
fn render_1200x900() -> image::RgbaImage {
    draw(1.0)
}

#[divan::bench(sample_count = 9, sample_size = 1)]
fn render_translucent() -> image::RgbaImage {
    draw(0.6)
}
