//! Checks of the extractor against analytic surfaces (spheres, lobes, a torus) and
//! of its invariants (manifold, oriented, deterministic).

use super::*;
use crate::surface::measure::{MeshReport, measure};
use std::f64::consts::PI;

/// Values sampled on a box, kept with the box.
pub(crate) struct Sampled {
    pub origin: [f64; 3],
    pub axes: [[f64; 3]; 3],
    pub counts: [usize; 3],
    pub values: Vec<f64>,
}

impl Sampled {
    pub(crate) fn new(
        origin: [f64; 3],
        axes: [[f64; 3]; 3],
        counts: [usize; 3],
        f: &dyn Fn([f64; 3]) -> f64,
    ) -> Self {
        let mut values = Vec::with_capacity(counts.iter().product());
        for i in 0..counts[0] {
            for j in 0..counts[1] {
                for k in 0..counts[2] {
                    let q = [i as f64, j as f64, k as f64];
                    values.push(f(std::array::from_fn(|d| {
                        origin[d] + q[0] * axes[0][d] + q[1] * axes[1][d] + q[2] * axes[2][d]
                    })));
                }
            }
        }
        Sampled {
            origin,
            axes,
            counts,
            values,
        }
    }

    /// An axis-aligned cube from −half to +half with spacing h on every axis.
    pub(crate) fn cube(half: f64, h: f64, f: &dyn Fn([f64; 3]) -> f64) -> Self {
        let n = (2.0 * half / h).round() as usize + 1;
        let axes = [[h, 0.0, 0.0], [0.0, h, 0.0], [0.0, 0.0, h]];
        Self::new([-half; 3], axes, [n; 3], f)
    }

    pub(crate) fn lattice(&self) -> Lattice<'_> {
        Lattice {
            origin: self.origin,
            axes: self.axes,
            counts: self.counts,
            values: &self.values,
        }
    }
}

/// An off-grid centre for the sphere tests.
pub(crate) const CENTRE: [f64; 3] = [0.037, -0.061, 0.093];

pub(crate) fn dist(p: [f64; 3], c: [f64; 3]) -> f64 {
    ((p[0] - c[0]).powi(2) + (p[1] - c[1]).powi(2) + (p[2] - c[2]).powi(2)).sqrt()
}

/// Hydrogen 1s density e^(−2r)/π; its isosurface at t is the sphere of radius
/// −ln(πt)/2 (closed form of the 1s orbital, any quantum chemistry text).
pub(crate) fn hydrogen(c: [f64; 3]) -> impl Fn([f64; 3]) -> f64 + Sync {
    move |p| (-2.0 * dist(p, c)).exp() / PI
}

/// The level whose 1s density sphere has radius 2 bohr: e^(−4)/π.
pub(crate) fn t_r2() -> f64 {
    (-4f64).exp() / PI
}

/// Relative errors of area and volume against the sphere of radius r.
pub(crate) fn sphere_errors(r: &MeshReport, radius: f64) -> (f64, f64) {
    let area = 4.0 * PI * radius * radius;
    let volume = area * radius / 3.0;
    (r.area / area - 1.0, r.volume / volume - 1.0)
}

/// Normals and outward radial directions agree everywhere (smallest cosine).
pub(crate) fn min_radial_cosine(m: &Mesh, c: [f64; 3]) -> f64 {
    m.positions
        .iter()
        .zip(&m.normals)
        .map(|(p, n)| (0..3).map(|d| (p[d] - c[d]) * n[d]).sum::<f64>() / dist(*p, c))
        .fold(1.0, f64::min)
}

fn closed_sphere(r: &MeshReport) {
    assert_eq!((r.euler, r.components.len()), (2, 1), "{r:?}");
    assert!(r.is_closed_manifold(), "{:?}", r.problems());
}

#[test]
fn hydrogen_sphere_on_and_off_the_grid() {
    for c in [[0.0; 3], CENTRE] {
        let s = Sampled::cube(3.0, 0.2, &hydrogen(c));
        let ex = extract(&s.lattice(), t_r2(), Phase::Positive).unwrap();
        let r = measure(&ex.mesh).unwrap();
        let (da, dv) = sphere_errors(&r, 2.0);
        eprintln!(
            "1s lattice, centre {c:?}: area {da:+.3e}, volume {dv:+.3e}, {} triangles",
            r.triangles
        );
        // Tolerance of the brief for a 0.2 bohr lattice (0.5 %).
        assert!(da.abs() < 5e-3 && dv.abs() < 5e-3, "{da} {dv}");
        closed_sphere(&r);
        assert_eq!(ex.open_edges, 0);
        assert!(
            min_radial_cosine(&ex.mesh, c) > 0.9,
            "normals must point outward"
        );
        assert!(
            ex.mesh
                .normals
                .iter()
                .all(|n| ((n[0] * n[0] + n[1] * n[1] + n[2] * n[2]) - 1.0).abs() < 1e-12)
        );
    }
}

#[test]
fn skewed_and_left_handed_axes() {
    let skew = [[0.2, 0.0, 0.0], [0.06, 0.19, 0.0], [0.04, -0.05, 0.18]];
    let mirrored = [skew[1], skew[0], skew[2]];
    for axes in [skew, mirrored] {
        let (inv, _) = invert(axes);
        // Index-space half-widths that hold a ball of 2.6 bohr: u = invᵀ x.
        let half: [f64; 3] = std::array::from_fn(|d| {
            (2.6 * (0..3).map(|e| inv[e][d] * inv[e][d]).sum::<f64>().sqrt()).ceil()
        });
        let origin =
            std::array::from_fn(|d| CENTRE[d] - (0..3).map(|a| half[a] * axes[a][d]).sum::<f64>());
        let counts = half.map(|h| 2 * h as usize + 1);
        let s = Sampled::new(origin, axes, counts, &hydrogen(CENTRE));
        let ex = extract(&s.lattice(), t_r2(), Phase::Positive).unwrap();
        let r = measure(&ex.mesh).unwrap();
        let (da, dv) = sphere_errors(&r, 2.0);
        eprintln!("1s skewed lattice: area {da:+.3e}, volume {dv:+.3e}");
        // Tolerance of the brief for skewed axes (1 %); a positive volume shows
        // the winding is outward for a left-handed frame too.
        assert!(da.abs() < 1e-2 && dv.abs() < 1e-2, "{da} {dv}");
        closed_sphere(&r);
        assert!(min_radial_cosine(&ex.mesh, CENTRE) > 0.9);
    }
}

/// A 2p_z-like function z·e^(−r): one lobe of each sign.
#[test]
fn p_lobes() {
    let s = Sampled::cube(8.0, 0.25, &|p| p[2] * (-dist(p, [0.0; 3])).exp());
    let pos = extract(&s.lattice(), 0.05, Phase::Positive).unwrap();
    let neg = extract(&s.lattice(), -0.05, Phase::Negative).unwrap();
    let (rp, rn) = (measure(&pos.mesh).unwrap(), measure(&neg.mesh).unwrap());
    closed_sphere(&rp);
    closed_sphere(&rn);
    assert!(pos.mesh.positions.iter().all(|p| p[2] > 0.0));
    assert!(neg.mesh.positions.iter().all(|p| p[2] < 0.0));
    // The two lobes are mirror images (z → −z); only the split differs.
    assert!(
        (rp.volume / rn.volume - 1.0).abs() < 1e-2,
        "{} {}",
        rp.volume,
        rn.volume
    );
    let mut both = pos.mesh.clone();
    let shift = both.positions.len() as u32;
    both.positions.extend(&neg.mesh.positions);
    both.normals.extend(&neg.mesh.normals);
    both.triangles
        .extend(neg.mesh.triangles.iter().map(|t| t.map(|v| v + shift)));
    let r = measure(&both).unwrap();
    assert_eq!((r.components.len(), r.euler), (2, 4));
}

/// (3z² − r²)·e^(−r): the negative part is a ring (a torus, χ = 0 by Euler's
/// formula for genus 1), the positive part two lobes on the z axis.
#[test]
fn d_ring_is_a_torus() {
    let s = Sampled::cube(8.0, 0.25, &|p| {
        let r2 = p[0] * p[0] + p[1] * p[1] + p[2] * p[2];
        (3.0 * p[2] * p[2] - r2) * (-r2.sqrt()).exp()
    });
    let ring = measure(&extract(&s.lattice(), -0.2, Phase::Negative).unwrap().mesh).unwrap();
    assert_eq!((ring.components.len(), ring.euler), (1, 0), "{ring:?}");
    assert!(ring.is_closed_manifold() && ring.volume > 0.0);
    let lobes = measure(&extract(&s.lattice(), 0.2, Phase::Positive).unwrap().mesh).unwrap();
    let chis: Vec<i64> = lobes.components.iter().map(|c| c.euler).collect();
    assert_eq!(chis, [2, 2]);
    assert!(lobes.is_closed_manifold());
}

#[test]
fn cut_by_the_box_and_the_same_on_any_thread_count() {
    let axes = [[0.2, 0.0, 0.0], [0.0, 0.2, 0.0], [0.0, 0.0, 0.2]];
    // x from −3 to 1.4: the box cuts the sphere of radius 2 at x = 1.4.
    let s = Sampled::new([-3.0; 3], axes, [23, 31, 31], &hydrogen(CENTRE));
    let run = |threads: usize| {
        let pool = rayon::ThreadPoolBuilder::new()
            .num_threads(threads)
            .build()
            .unwrap();
        pool.install(|| extract(&s.lattice(), t_r2(), Phase::Positive).unwrap())
    };
    let (a, b, c) = (run(1), run(2), run(2));
    let r = measure(&a.mesh).unwrap();
    assert!(
        a.open_edges > 0 && a.open_edges == r.open_edges,
        "{} {}",
        a.open_edges,
        r.open_edges
    );
    r.check_manifold().unwrap();
    // A sphere cut once is a disc: χ = 1.
    assert_eq!((r.components.len(), r.euler), (1, 1));
    for other in [&b, &c] {
        assert_eq!(a.mesh, other.mesh);
        assert_eq!(
            (&a.edge_ends, a.open_edges),
            (&other.edge_ends, other.open_edges)
        );
    }
}

#[test]
fn values_on_the_level_and_nan() {
    // f = z on a lattice holding z = 0.5 exactly: the plane through those points,
    // many vertices on lattice points, must stay a manifold of the box's
    // cross-section area (2 × 2 bohr).
    let s = Sampled::cube(1.0, 0.25, &|p| p[2]);
    let ex = extract(&s.lattice(), 0.5, Phase::Positive).unwrap();
    let r = measure(&ex.mesh).unwrap();
    r.check_manifold().unwrap();
    assert_eq!((r.components.len(), r.euler), (1, 1));
    assert!((r.area - 4.0).abs() < 1e-12, "{}", r.area);
    // A NaN inside the sphere counts as outside: a small void appears.
    let mut s = Sampled::cube(3.0, 0.2, &hydrogen(CENTRE));
    s.values[(15 * 31 + 15) * 31 + 15] = f64::NAN;
    let r = measure(&extract(&s.lattice(), t_r2(), Phase::Positive).unwrap().mesh).unwrap();
    assert!(r.is_closed_manifold());
    assert_eq!((r.components.len(), r.euler), (2, 4));
}

#[test]
fn bad_boxes_are_refused() {
    let v = vec![0.0; 7];
    let lat = Lattice {
        origin: [0.0; 3],
        axes: [[1.0, 0.0, 0.0], [0.0, 1.0, 0.0], [0.0, 0.0, 1.0]],
        counts: [2, 2, 2],
        values: &v,
    };
    assert!(extract(&lat, 0.1, Phase::Positive).is_err());
    let v = vec![0.0; 8];
    let flat = Lattice {
        axes: [[1.0, 0.0, 0.0], [0.0, 1.0, 0.0], [1.0, 1.0, 0.0]],
        values: &v,
        ..lat
    };
    assert!(extract(&flat, 0.1, Phase::Positive).is_err());
    let lat = Lattice { values: &v, ..flat };
    let ok = Lattice {
        axes: [[1.0, 0.0, 0.0], [0.0, 1.0, 0.0], [0.0, 0.0, 1.0]],
        ..lat
    };
    assert!(extract(&ok, f64::NAN, Phase::Positive).is_err());
    assert!(extract(&ok, 0.1, Phase::Positive).unwrap().mesh.is_empty());
}
