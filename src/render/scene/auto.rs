//! The automatic view: look along the axis in which the nuclei spread least, with
//! the axis of largest spread across the screen, then orbit by a fixed oblique turn.
//!
//! The axes are the eigenvectors of the covariance of the nuclear positions (the
//! principal axes, common practice). Eigenvalues within 0.1 % of the largest
//! (plus 1e-12 bohr², for a single atom) count as tied; within a tied set the axis
//! is the one nearest x, then y, then z. The camera takes the side of that axis
//! from which, after the turn below, screen up leans to +z (then +y, +x). So a
//! planar molecule is seen face-on before the turn, a linear one side-on, a single
//! atom like the `+x` view.
//!
//! `DEFAULT_TURN_DEG` = [−30°, 25°] then orbits the camera 30° about the screen
//! horizontal (the axis of largest spread) and 25° about the screen vertical, so
//! that depth shows both ways: lobes pointing at the camera swing clear of the
//! molecule, and atoms behind one another separate. A planar molecule is seen
//! acos(cos 30° cos 25°) ≈ 38° off its normal, from the side that puts +z up (for
//! a molecule in the xy plane: from above, +z lobes above the ring); a linear one
//! is 25° off side-on, its length foreshortened only to cos 25° ≈ 0.91. Chosen by
//! looking at ethylene, water and the diatomic ion: at [−45°, 0°] the π lobes of
//! ethylene hid both carbons.

use nalgebra::{Matrix3, SymmetricEigen};

use super::vec3::{V3, axis, cross, dot, scale, sub, unit};
use super::view::Orientation;
use crate::chem::Molecule;

/// Orbit applied after the principal-axis view, [about horizontal, about vertical].
pub const DEFAULT_TURN_DEG: [f64; 2] = [-30.0, 25.0];

/// Relative tolerance under which two spreads count as equal.
const TIE: f64 = 1e-3;

/// The principal-axis orientation of `molecule`, before the default turn.
pub fn orientation(molecule: &Molecule) -> Orientation {
    let n = molecule.atoms.len().max(1) as f64;
    let mut mean = [0.0; 3];
    for a in &molecule.atoms {
        mean = super::vec3::add(mean, scale(a.position, 1.0 / n));
    }
    let mut cov = Matrix3::<f64>::zeros();
    for a in &molecule.atoms {
        let d = sub(a.position, mean);
        for i in 0..3 {
            for j in 0..3 {
                cov[(i, j)] += d[i] * d[j] / n;
            }
        }
    }
    let eig = SymmetricEigen::new(cov);
    let mut pairs: Vec<(f64, V3)> = (0..3)
        .map(|k| {
            let v = eig.eigenvectors.column(k);
            (eig.eigenvalues[k], [v[0], v[1], v[2]])
        })
        .collect();
    pairs.sort_by(|a, b| a.0.total_cmp(&b.0));
    let tol = TIE * pairs[2].0.abs() + 1e-12;
    let tied = |lambda: f64| -> Vec<V3> {
        (pairs.iter())
            .filter(|(l, _)| (l - lambda).abs() <= tol)
            .map(|p| p.1)
            .collect()
    };
    let view_axis = pick(&tied(pairs[0].0), None);
    let across = pick(&tied(pairs[2].0), Some(view_axis));
    // up = right × forward. The camera takes the side of the view axis from which,
    // after the default turn, screen up leans to +z (then +y, then +x): lobes on
    // the +z side of the molecule appear above it.
    let mut forward = scale(view_axis, -1.0);
    let mut up = cross(across, forward);
    let (sin, cos) = DEFAULT_TURN_DEG[0].to_radians().sin_cos();
    let turned_up = super::vec3::add(scale(up, cos), scale(forward, sin));
    if let Some(k) = [2, 1, 0].into_iter().find(|&k| turned_up[k].abs() > 1e-9) {
        if turned_up[k] < 0.0 {
            forward = scale(forward, -1.0);
            up = scale(up, -1.0);
        }
    }
    Orientation {
        forward,
        up,
        right: across,
    }
}

/// The unit vector of span(`set`) (less its component along `except`) nearest to
/// x, then y, then z; a single vector is returned with its largest component
/// positive.
fn pick(set: &[V3], except: Option<V3>) -> V3 {
    let strip = |v: V3| match except {
        Some(e) => sub(v, scale(e, dot(v, e))),
        None => v,
    };
    let basis: Vec<V3> = orthonormal(&set.iter().map(|v| strip(*v)).collect::<Vec<_>>());
    if let [v] = basis.as_slice() {
        let k = (0..3)
            .max_by(|&a, &b| v[a].abs().total_cmp(&v[b].abs()).then(b.cmp(&a)))
            .unwrap_or(0);
        return if v[k] < 0.0 { scale(*v, -1.0) } else { *v };
    }
    for k in 0..3 {
        let e = axis(k);
        let p = basis.iter().fold([0.0; 3], |acc, b| {
            super::vec3::add(acc, scale(*b, dot(e, *b)))
        });
        // In a 2- or 3-dimensional subspace some axis projects with length ≥ √(2/3).
        if dot(p, p) >= 0.25 {
            if let Some(u) = unit(p) {
                return u;
            }
        }
    }
    basis.first().copied().unwrap_or(axis(0))
}

/// Gram–Schmidt, dropping vectors that are (nearly) dependent on the earlier ones.
fn orthonormal(vs: &[V3]) -> Vec<V3> {
    let mut out: Vec<V3> = Vec::new();
    for v in vs {
        let mut w = *v;
        for b in &out {
            w = sub(w, scale(*b, dot(w, *b)));
        }
        if let Some(u) = unit(w).filter(|_| dot(w, w) > 1e-12) {
            out.push(u);
        }
    }
    out
}
