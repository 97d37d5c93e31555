//! A quadrature rule for the slab between two parallel planes: the planes through
//! points A and B perpendicular to AB, unbounded sideways. Used to count the
//! electrons an orbital gains or loses between two nuclei.
//!
//! Cylindrical coordinates about the AB axis: u along the axis (Gauss–Legendre on
//! panels graded toward both planes, where the nuclear cusps sit), the distance ρ from
//! the axis mapped from t ∈ [0, 1) by ρ = L t/(1 − t) (Gauss–Legendre on panels graded
//! toward the axis), and a uniform rule in the angle, exact for fields symmetric
//! about the axis and spectrally accurate for smooth ones (8 angles: exact for the first three
//! harmonics of the angle).

use std::f64::consts::PI;

use crate::numerics::quadrature::gauss_legendre;

/// Nodes and weights on [a, b] from panels whose edges are `edges` (increasing).
fn panels(edges: &[f64], rule: &[(f64, f64)]) -> Vec<(f64, f64)> {
    let mut out = Vec::with_capacity((edges.len() - 1) * rule.len());
    for w in edges.windows(2) {
        let (a, b) = (w[0], w[1]);
        for (x, wt) in rule {
            out.push((0.5 * (b - a) * x + 0.5 * (a + b), 0.5 * (b - a) * wt));
        }
    }
    out
}

/// Panel edges on [0, 1] graded geometrically toward both ends.
fn graded_both(levels: usize) -> Vec<f64> {
    let mut e = vec![0.0];
    for k in (1..=levels).rev() {
        e.push(0.5 * 0.25f64.powi(k as i32));
    }
    e.push(0.5);
    let n = e.len();
    for k in (0..n - 1).rev() {
        e.push(1.0 - e[k]);
    }
    e
}

/// Points and weights of the slab between the planes through `a` and `b`.
/// `length` (bohr) sets the radial mapping: about the decay length of the field.
pub fn between_planes(a: [f64; 3], b: [f64; 3], length: f64) -> Vec<([f64; 3], f64)> {
    let d: [f64; 3] = std::array::from_fn(|k| b[k] - a[k]);
    let r = (d[0] * d[0] + d[1] * d[1] + d[2] * d[2]).sqrt();
    let e = d.map(|x| x / r);
    // Two unit vectors perpendicular to the axis.
    let helper = if e[0].abs() < 0.9 {
        [1.0, 0.0, 0.0]
    } else {
        [0.0, 1.0, 0.0]
    };
    let dot = helper[0] * e[0] + helper[1] * e[1] + helper[2] * e[2];
    let mut e1: [f64; 3] = std::array::from_fn(|k| helper[k] - dot * e[k]);
    let n1 = (e1[0] * e1[0] + e1[1] * e1[1] + e1[2] * e1[2]).sqrt();
    e1 = e1.map(|x| x / n1);
    let e2 = [
        e[1] * e1[2] - e[2] * e1[1],
        e[2] * e1[0] - e[0] * e1[2],
        e[0] * e1[1] - e[1] * e1[0],
    ];
    let rule = gauss_legendre(12);
    let us = panels(
        &graded_both(6).iter().map(|t| t * r).collect::<Vec<_>>(),
        &rule,
    );
    let mut t_edges = vec![0.0];
    for k in (1..=8).rev() {
        t_edges.push(0.5f64.powi(k));
    }
    t_edges.extend([0.75, 0.9, 0.97, 0.995, 1.0]);
    let ts = panels(&t_edges, &rule);
    let nphi = 8;
    let mut out = Vec::with_capacity(us.len() * ts.len() * nphi);
    for &(u, wu) in &us {
        for &(t, wt) in &ts {
            let rho = length * t / (1.0 - t);
            let drho = length / ((1.0 - t) * (1.0 - t));
            for j in 0..nphi {
                let phi = 2.0 * PI * (j as f64 + 0.5) / nphi as f64;
                let (c, s) = (phi.cos(), phi.sin());
                let p = std::array::from_fn(|k| a[k] + u * e[k] + rho * (c * e1[k] + s * e2[k]));
                out.push((p, wu * wt * drho * rho * 2.0 * PI / nphi as f64));
            }
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    /// ∫ over the slab of e^(−2r)/π from a point on one face: with r² = ρ² + u², the
    /// plane integral is 2π∫_u^∞ r e^(−2r) dr = π e^(−2u)(2u + 1)/2, so the slab of
    /// width w gives (1/π)·(π/2)∫_0^w (2u+1)e^(−2u) du = [1 − (w + 1)e^(−2w)]/2
    /// (derived here; common practice).
    #[test]
    fn integrates_a_cusp_on_the_face_exactly() {
        let w: f64 = 2.0;
        let rule = between_planes([0.0, 0.0, -1.0], [0.0, 0.0, 1.0], 1.0);
        let s: f64 = rule
            .iter()
            .map(|(p, wt)| {
                let r = (p[0] * p[0] + p[1] * p[1] + (p[2] + 1.0) * (p[2] + 1.0)).sqrt();
                wt * (-2.0 * r).exp() / PI
            })
            .sum();
        let exact = 0.5 * (1.0 - (w + 1.0) * (-2.0 * w).exp());
        assert!((s - exact).abs() < 1e-9, "{s} vs {exact}");
    }
}
