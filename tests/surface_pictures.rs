//! Isosurfaces of real orbitals through the library: vertices on the exact field,
//! closed oriented meshes, and pictures with the symmetry of the orbital.

mod common;

use common::example;
use lobecast::field::{Field, FieldSampler};
use lobecast::grid::{GridBox, Resolution};
use lobecast::io::model::LoadOptions;
use lobecast::render::scene::{Orientation, Painted, Scene, ball_and_stick, frame, render};
use lobecast::source::Source;
use lobecast::source::surfaces::{Isovalue, Timings, surfaces_of};
use lobecast::surface::measure::measure;

fn ion() -> Source {
    Source::load(&example("h2-cation.toml"), &LoadOptions::default()).unwrap()
}

/// The antibonding orbital at ±t: every vertex on the exact field to 1e-9 of t
/// (bracketed root finding along its edge), both lobes closed manifolds with χ = 2,
/// equal volumes (the orbital is odd under z → −z: the ion is homonuclear), and
/// normals along −∇f for the +t lobe (outwards, where |f| falls).
#[test]
fn antibonding_lobes_sit_on_the_exact_field() {
    let source = ion();
    let field = Field::parse("orbital:2").unwrap();
    let grid = GridBox::around(source.molecule(), 5.0, Resolution::Spacing(0.25)).unwrap();
    let found = surfaces_of(
        &source,
        &[field],
        &grid,
        Isovalue::Enclosing(0.9),
        1 << 30,
        &mut Timings::default(),
    )
    .unwrap();
    let f = &found[0];
    assert_eq!(f.surfaces.len(), 2);
    assert!((f.enclosed - 0.9).abs() < 1e-3, "enclosed {}", f.enclosed);
    let Source::Orbitals { set, .. } = &source else {
        unreachable!()
    };
    let exact = FieldSampler::new(set, &[field]).unwrap();
    let mut volumes = Vec::new();
    for s in &f.surfaces {
        let mut values = vec![0.0; s.mesh.positions.len()];
        exact.evaluate(&s.mesh.positions, &mut values);
        let worst = values
            .iter()
            .map(|v| (v - s.level).abs())
            .fold(0.0, f64::max);
        assert!(
            worst < 1e-9 * f.level,
            "vertex off the surface by {worst:e}"
        );
        let mut grads = vec![[0.0; 3]; s.mesh.positions.len()];
        exact.gradients(&s.mesh.positions, &mut grads);
        let sign = if s.level > 0.0 { -1.0 } else { 1.0 };
        for (n, g) in s.mesh.normals.iter().zip(&grads) {
            let gn = (g[0] * g[0] + g[1] * g[1] + g[2] * g[2]).sqrt();
            let cos = sign * (n[0] * g[0] + n[1] * g[1] + n[2] * g[2]) / gn;
            assert!(cos > 1.0 - 1e-9, "normal not along ∓∇f: cos {cos}");
        }
        let report = measure(&s.mesh).unwrap();
        assert!(report.is_closed_manifold(), "{:?}", report.problems());
        assert_eq!((report.euler, report.components.len()), (2, 1));
        volumes.push(report.volume);
    }
    assert!(
        volumes[0] > 0.0 && (volumes[0] - volumes[1]).abs() < 1e-3 * volumes[0],
        "{volumes:?}"
    );
}

/// The ion (bond along z) seen from the direction (1, 1, 0) with z up: the mirror
/// plane x = y of the orbital contains the line of sight and the screen's up, so it
/// maps the picture's left onto its right. The mesh has this symmetry exactly: the
/// grid is centred and the Freudenthal split, with its case table, is the same
/// under any exchange of axes (not under a single reflection x → −x; see
/// `a_symmetric_orbital_gives_a_symmetric_mesh`); the rasteriser's tie rule for
/// samples on an edge is the same under a left–right mirror. The
/// coverage (alpha on a transparent background) does not depend on the lights, so
/// it must match its mirror image to one colour step.
#[test]
fn a_symmetric_orbital_gives_a_mirror_symmetric_picture() {
    let source = ion();
    let grid = GridBox::around(source.molecule(), 5.0, Resolution::Spacing(0.2)).unwrap();
    let found = surfaces_of(
        &source,
        &[Field::parse("orbital:2").unwrap()],
        &grid,
        Isovalue::Fixed(0.05),
        1 << 30,
        &mut Timings::default(),
    )
    .unwrap();
    let (balls, sticks) = ball_and_stick(source.molecule());
    let scene = Scene {
        surfaces: found[0]
            .surfaces
            .iter()
            .map(|s| Painted {
                mesh: &s.mesh,
                rgb: [200, 120, 40],
                opacity: 0.5,
            })
            .collect(),
        balls,
        sticks,
    };
    let r = std::f64::consts::FRAC_1_SQRT_2;
    let o = Orientation::looking([-r, -r, 0.0], [0.0, 0.0, 1.0]).unwrap();
    let n = 240;
    let img = render(&scene, &frame(&scene, &o, false, 1.0), n, n, None);
    let mut worst = 0u8;
    let mut covered = 0;
    for j in 0..n {
        for i in 0..n {
            let a = img.get_pixel(i, j).0[3];
            let b = img.get_pixel(n - 1 - i, j).0[3];
            worst = worst.max(a.abs_diff(b));
            covered += (a > 0) as usize;
        }
    }
    assert!(covered > 5000, "the surface is drawn ({covered} px)");
    assert!(worst <= 1, "alpha differs from its mirror image by {worst}");
}

/// The mesh of the ion's antibonding orbital carries the orbital's mirror plane
/// x = y: every vertex and every triangle has its mirror image (to 1e-9 bohr).
#[test]
fn a_symmetric_orbital_gives_a_symmetric_mesh() {
    let source = ion();
    let grid = GridBox::around(source.molecule(), 5.0, Resolution::Spacing(0.2)).unwrap();
    let field = Field::parse("orbital:2").unwrap();
    let found = surfaces_of(
        &source,
        &[field],
        &grid,
        Isovalue::Fixed(0.05),
        1 << 30,
        &mut Timings::default(),
    )
    .unwrap();
    for s in &found[0].surfaces {
        let m = &s.mesh;
        let key = |p: [f64; 3]| p.map(|x| (x * 1e9).round() as i64);
        let mirrored = |t: &[u32; 3]| {
            let mut v = t.map(|i| {
                let p = m.positions[i as usize];
                key([p[1], p[0], p[2]])
            });
            v.sort();
            v
        };
        let triangles: std::collections::HashSet<[[i64; 3]; 3]> = m
            .triangles
            .iter()
            .map(|t| {
                let mut v = t.map(|i| key(m.positions[i as usize]));
                v.sort();
                v
            })
            .collect();
        let missing = m
            .triangles
            .iter()
            .filter(|t| !triangles.contains(&mirrored(t)))
            .count();
        assert_eq!(
            missing,
            0,
            "{missing} of {} triangles lack a mirror image",
            m.triangles.len()
        );
    }
}
