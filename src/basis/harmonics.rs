//! Angular parts: Cartesian components and real solid harmonics up to l = 3.
//!
//! Real solid harmonics (README, "Units and conventions"): no Condon–Shortley phase, m < 0 sine-type,
//! m > 0 cosine-type; l = 1: m = −1, 0, +1 ↔ y, z, x; l = 2: m = −2…+2 ↔ xy, yz,
//! 3z²−r², xz, x²−y². Each is scaled so that Y = R/r^l has unit norm on the sphere.
//! The polynomials are the standard table of real spherical harmonics (from memory);
//! their normalisation and orthogonality are checked by quadrature in the tests.

use std::f64::consts::PI;

/// Highest angular momentum lobecast handles.
pub const L_MAX: u32 = 3;

/// Cartesian components x^a y^b z^c with a + b + c = l, x power descending, then y:
/// (l,0,0), (l−1,1,0), (l−1,0,1), (l−2,2,0), …
pub fn cartesian_components(l: u32) -> Vec<[u32; 3]> {
    let mut out = Vec::with_capacity(((l + 1) * (l + 2) / 2) as usize);
    for a in (0..=l).rev() {
        for b in (0..=l - a).rev() {
            out.push([a, b, l - a - b]);
        }
    }
    out
}

/// (2n − 1)!! with (−1)!! = 1.
pub fn double_factorial_odd(n: u32) -> f64 {
    (1..=n).map(|k| (2 * k - 1) as f64).product()
}

/// A polynomial in x, y, z: (coefficient, powers) terms.
pub type Polynomial = Vec<(f64, [u32; 3])>;

/// The real solid harmonic R_lm as a polynomial, or `None` outside l ≤ 3, |m| ≤ l.
pub fn solid_harmonic(l: u32, m: i32) -> Option<Polynomial> {
    let c = |num: f64, den: f64| (num / (den * PI)).sqrt();
    let p = match (l, m) {
        (0, 0) => vec![(c(1.0, 4.0), [0, 0, 0])],
        (1, -1) => vec![(c(3.0, 4.0), [0, 1, 0])],
        (1, 0) => vec![(c(3.0, 4.0), [0, 0, 1])],
        (1, 1) => vec![(c(3.0, 4.0), [1, 0, 0])],
        (2, -2) => vec![(c(15.0, 4.0), [1, 1, 0])],
        (2, -1) => vec![(c(15.0, 4.0), [0, 1, 1])],
        (2, 0) => {
            let k = c(5.0, 16.0);
            vec![(2.0 * k, [0, 0, 2]), (-k, [2, 0, 0]), (-k, [0, 2, 0])]
        }
        (2, 1) => vec![(c(15.0, 4.0), [1, 0, 1])],
        (2, 2) => {
            let k = c(15.0, 16.0);
            vec![(k, [2, 0, 0]), (-k, [0, 2, 0])]
        }
        (3, -3) => {
            let k = c(35.0, 32.0);
            vec![(3.0 * k, [2, 1, 0]), (-k, [0, 3, 0])]
        }
        (3, -2) => vec![(c(105.0, 4.0), [1, 1, 1])],
        (3, -1) => {
            let k = c(21.0, 32.0);
            vec![(4.0 * k, [0, 1, 2]), (-k, [2, 1, 0]), (-k, [0, 3, 0])]
        }
        (3, 0) => {
            let k = c(7.0, 16.0);
            vec![
                (2.0 * k, [0, 0, 3]),
                (-3.0 * k, [2, 0, 1]),
                (-3.0 * k, [0, 2, 1]),
            ]
        }
        (3, 1) => {
            let k = c(21.0, 32.0);
            vec![(4.0 * k, [1, 0, 2]), (-k, [3, 0, 0]), (-k, [1, 2, 0])]
        }
        (3, 2) => {
            let k = c(105.0, 16.0);
            vec![(k, [2, 0, 1]), (-k, [0, 2, 1])]
        }
        (3, 3) => {
            let k = c(35.0, 32.0);
            vec![(k, [3, 0, 0]), (-3.0 * k, [1, 2, 0])]
        }
        _ => return None,
    };
    Some(p)
}

/// Short names of the real harmonics, for tables: "s", "py", "dz2", "fxyz", …
pub fn harmonic_name(l: u32, m: i32) -> &'static str {
    const NAMES: [&[&str]; 4] = [
        &["s"],
        &["py", "pz", "px"],
        &["dxy", "dyz", "dz2", "dxz", "dx2-y2"],
        &[
            "fy(3x2-y2)",
            "fxyz",
            "fyz2",
            "fz3",
            "fxz2",
            "fz(x2-y2)",
            "fx(x2-3y2)",
        ],
    ];
    NAMES
        .get(l as usize)
        .and_then(|n| n.get((m + l as i32) as usize))
        .copied()
        .unwrap_or("?")
}

/// Name of a Cartesian component: "s", "x", "xy", "zzz", …
pub fn cartesian_name(p: [u32; 3]) -> String {
    if p == [0, 0, 0] {
        return "s".into();
    }
    ["x", "y", "z"]
        .iter()
        .zip(p)
        .map(|(s, n)| s.repeat(n as usize))
        .collect()
}

/// Evaluates a polynomial at (x, y, z).
pub fn eval_polynomial(poly: &[(f64, [u32; 3])], x: f64, y: f64, z: f64) -> f64 {
    poly.iter()
        .map(|(c, [a, b, e])| c * x.powi(*a as i32) * y.powi(*b as i32) * z.powi(*e as i32))
        .sum()
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Gauss–Legendre nodes in cos θ (Golub–Welsch-free Newton iteration, a textbook
    /// method) times a uniform rule in φ integrate polynomials of degree ≤ 6 on the
    /// sphere exactly.
    fn sphere_rule() -> Vec<([f64; 3], f64)> {
        let n = 12;
        let mut nodes = Vec::new();
        for i in 0..n {
            let mut x = (PI * (i as f64 + 0.75) / (n as f64 + 0.5)).cos();
            let mut dp = 0.0;
            for _ in 0..100 {
                let (mut p0, mut p1) = (1.0, x);
                for k in 2..=n {
                    let p2 = ((2 * k - 1) as f64 * x * p1 - (k - 1) as f64 * p0) / k as f64;
                    p0 = p1;
                    p1 = p2;
                }
                dp = n as f64 * (x * p1 - p0) / (x * x - 1.0);
                x -= p1 / dp;
            }
            let w = 2.0 / ((1.0 - x * x) * dp * dp);
            for j in 0..2 * n {
                let phi = 2.0 * PI * j as f64 / (2 * n) as f64;
                let s = (1.0 - x * x).sqrt();
                nodes.push((
                    [s * phi.cos(), s * phi.sin(), x],
                    w * 2.0 * PI / (2 * n) as f64,
                ));
            }
        }
        nodes
    }

    #[test]
    fn harmonics_are_orthonormal_on_the_sphere() {
        let rule = sphere_rule();
        let all: Vec<(u32, i32)> = (0..=L_MAX)
            .flat_map(|l| (-(l as i32)..=l as i32).map(move |m| (l, m)))
            .collect();
        for &(l1, m1) in &all {
            for &(l2, m2) in &all {
                let (p1, p2) = (
                    solid_harmonic(l1, m1).unwrap(),
                    solid_harmonic(l2, m2).unwrap(),
                );
                let s: f64 = rule
                    .iter()
                    .map(|([x, y, z], w)| {
                        w * eval_polynomial(&p1, *x, *y, *z) * eval_polynomial(&p2, *x, *y, *z)
                    })
                    .sum();
                let expect = if (l1, m1) == (l2, m2) { 1.0 } else { 0.0 };
                assert!((s - expect).abs() < 1e-13, "⟨{l1}{m1}|{l2}{m2}⟩ = {s}");
            }
        }
    }

    #[test]
    fn design_order_of_p_and_d() {
        // README conventions: l = 1, m = −1, 0, +1 ↔ y, z, x; l = 2, m = −2 ↔ xy, m = 2 ↔ x²−y².
        assert_eq!(solid_harmonic(1, -1).unwrap()[0].1, [0, 1, 0]);
        assert_eq!(solid_harmonic(1, 1).unwrap()[0].1, [1, 0, 0]);
        assert_eq!(solid_harmonic(2, -2).unwrap()[0].1, [1, 1, 0]);
        assert_eq!(
            cartesian_components(2),
            vec![
                [2, 0, 0],
                [1, 1, 0],
                [1, 0, 1],
                [0, 2, 0],
                [0, 1, 1],
                [0, 0, 2]
            ]
        );
        assert_eq!(cartesian_components(3).len(), 10);
        assert_eq!(harmonic_name(2, 0), "dz2");
        assert_eq!(cartesian_name([1, 0, 2]), "xzz");
    }
}
