//! Gauss–Legendre rules, shared by the integrals that are done numerically (the
//! two-centre Slater overlaps). Kept apart so one rule serves every caller.

use std::f64::consts::PI;

/// Gauss–Legendre nodes and weights on [−1, 1]: Newton iteration on P_n from the
/// usual cosine estimate of the roots (common practice).
pub fn gauss_legendre(n: usize) -> Vec<(f64, f64)> {
    let legendre = |x: f64| {
        let (mut p0, mut p1) = (1.0, x);
        for k in 1..n {
            let k = k as f64;
            (p0, p1) = (p1, ((2.0 * k + 1.0) * x * p1 - k * p0) / (k + 1.0));
        }
        (p1, n as f64 * (x * p1 - p0) / (x * x - 1.0))
    };
    (0..n)
        .map(|i| {
            let mut x = (PI * (i as f64 + 0.75) / (n as f64 + 0.5)).cos();
            for _ in 0..100 {
                let (p, dp) = legendre(x);
                x -= p / dp;
                if (p / dp).abs() < 1e-15 {
                    break;
                }
            }
            let dp = legendre(x).1;
            (x, 2.0 / ((1.0 - x * x) * dp * dp))
        })
        .collect()
}

/// `panels` equal panels on [a, b], each with the rule `gl`: (node, weight) pairs.
pub fn composite(a: f64, b: f64, panels: usize, gl: &[(f64, f64)]) -> Vec<(f64, f64)> {
    let h = (b - a) / panels as f64;
    (0..panels)
        .flat_map(|p| {
            let mid = a + h * (p as f64 + 0.5);
            gl.iter()
                .map(move |&(x, w)| (mid + 0.5 * h * x, 0.5 * h * w))
        })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    /// A 10-point rule integrates x^18 exactly: ∫_{-1}^{1} x^18 dx = 2/19.
    #[test]
    fn exact_for_polynomials() {
        let s: f64 = gauss_legendre(10).iter().map(|(x, w)| w * x.powi(18)).sum();
        assert!((s - 2.0 / 19.0).abs() < 1e-14);
    }
}
