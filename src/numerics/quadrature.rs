//! Gauss–Legendre rules: one rule for every numerical integral in the library (the
//! two-centre Slater overlaps, the slab integrals of the build-up) and in the tests.

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

    /// The 5-point nodes and weights as tabulated (Abramowitz & Stegun, Handbook of
    /// Mathematical Functions, table 25.4; from memory): ±0.906179845938664 with
    /// 0.236926885056189, ±0.538469310105683 with 0.478628670499366, 0 with 128/225.
    #[test]
    fn five_point_rule_matches_the_table() {
        let mut r = gauss_legendre(5);
        r.sort_by(|a, b| a.0.total_cmp(&b.0));
        let table = [
            (-0.906_179_845_938_664, 0.236_926_885_056_189),
            (-0.538_469_310_105_683, 0.478_628_670_499_366),
            (0.0, 128.0 / 225.0),
            (0.538_469_310_105_683, 0.478_628_670_499_366),
            (0.906_179_845_938_664, 0.236_926_885_056_189),
        ];
        for ((x, w), (tx, tw)) in r.iter().zip(table) {
            assert!((x - tx).abs() < 1e-14 && (w - tw).abs() < 1e-14, "{x} {w}");
        }
    }
}
