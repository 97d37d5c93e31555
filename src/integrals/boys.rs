//! The Boys function F_n(T) = ∫₀¹ t^(2n) e^(−T t²) dt, which carries every
//! distance dependence of the nuclear-attraction integrals over Gaussians.
//!
//! Two regimes, each used where it is numerically stable:
//!
//! * small and moderate T: the everywhere-convergent series with positive terms
//!   F_n(T) = e^(−T) Σ_k (2T)^k / [(2n+1)(2n+3)…(2n+2k+1)] for the highest order,
//!   then the downward recursion F_(n−1) = (2T F_n + e^(−T)) / (2n−1), which only
//!   adds positive numbers;
//! * large T: F₀(T) = ½ √(π/T) erf(√T) and the upward recursion
//!   F_(n+1) = ((2n+1) F_n − e^(−T)) / (2T), stable there because e^(−T) is
//!   negligible against (2n+1) F_n, so nothing cancels.
//!
//! The switch grows with the highest order: the cancellation ratio of the upward
//! step, e^(−T) T^(n+½) / Γ(n+3/2), stays below a few 10⁻³ for T ≥ 25 + n (an
//! estimate from the large-T form of F_n, for n up to 100; the tests measure n ≤ 12),
//! while the series needs about 2T + 30 terms below the switch.
//!
//! The series costs up to ~100 terms, too slow for electron repulsion (one call per
//! primitive quartet). For orders up to `TABLE_NMAX` and T < `TABLE_TMAX` a table of
//! F_k on a grid of step `TABLE_STEP`, filled once from the series, gives the highest
//! order by a Taylor expansion about the nearest grid point,
//! F_n(T₀ + δ) = Σ_k F_(n+k)(T₀) (−δ)^k / k! (since dF_n/dT = −F_(n+1)), with
//! |δ| ≤ 0.05 and `TAYLOR` terms leaving a remainder below 0.05⁹/9! ≈ 5e-18 relative;
//! the lower orders follow by the same downward recursion.

/// The smallest T at which the upward recursion is used for orders up to `nmax`.
fn upward_from(nmax: usize) -> f64 {
    25.0 + nmax as f64
}

/// Highest order the table serves (electron repulsion over f shells needs 12).
const TABLE_NMAX: usize = 16;
/// Terms of the Taylor expansion about a grid point.
const TAYLOR: usize = 9;
const TABLE_STEP: f64 = 0.1;
/// Above this the upward recursion serves every order up to `TABLE_NMAX`
/// (`upward_from(16)` = 41 is the one exception, handled by the series).
const TABLE_TMAX: f64 = 40.0;
const TABLE_ORDERS: usize = TABLE_NMAX + TAYLOR;
const TABLE_POINTS: usize = (TABLE_TMAX / TABLE_STEP) as usize + 1;

/// 1/k and 1/(2k − 1): multiplications instead of divisions on the hot path.
const INV: [f64; TAYLOR] = {
    let mut v = [0.0; TAYLOR];
    let mut k = 1;
    while k < TAYLOR {
        v[k] = 1.0 / k as f64;
        k += 1;
    }
    v
};
const INV_ODD: [f64; TABLE_NMAX + 1] = {
    let mut v = [0.0; TABLE_NMAX + 1];
    let mut k = 1;
    while k <= TABLE_NMAX {
        v[k] = 1.0 / (2 * k - 1) as f64;
        k += 1;
    }
    v
};

/// F_k(i·step) for k < `TABLE_ORDERS`, point-major.
static TABLE: std::sync::LazyLock<Vec<f64>> = std::sync::LazyLock::new(|| {
    let mut table = vec![0.0; TABLE_POINTS * TABLE_ORDERS];
    for (i, row) in table.chunks_exact_mut(TABLE_ORDERS).enumerate() {
        reference(i as f64 * TABLE_STEP, row);
    }
    table
});

/// F_n(T) = ∫_0^1 t^(2n) exp(−T t²) dt for n = 0..out.len()-1, accurate to 1e-14
/// relative for all T ≥ 0.
pub fn boys(t: f64, out: &mut [f64]) {
    let Some(nmax) = out.len().checked_sub(1) else {
        return;
    };
    debug_assert!(t >= 0.0, "Boys function argument must be ≥ 0, got {t}");
    if nmax <= TABLE_NMAX && t < TABLE_TMAX {
        let i = (t * (1.0 / TABLE_STEP) + 0.5) as usize;
        let row = &TABLE[i * TABLE_ORDERS..(i + 1) * TABLE_ORDERS];
        let x = i as f64 * TABLE_STEP - t;
        let top = &row[nmax..nmax + TAYLOR];
        let mut s = top[TAYLOR - 1];
        for k in (0..TAYLOR - 1).rev() {
            s = top[k] + s * x * INV[k + 1];
        }
        out[nmax] = s;
        if nmax > 0 {
            let e = (-t).exp();
            for n in (1..=nmax).rev() {
                out[n - 1] = (2.0 * t * out[n] + e) * INV_ODD[n];
            }
        }
        return;
    }
    reference(t, out);
}

/// The series or the upward recursion, without the table: fills the table and
/// serves what it does not cover.
fn reference(t: f64, out: &mut [f64]) {
    let Some(nmax) = out.len().checked_sub(1) else {
        return;
    };
    let e = (-t).exp();
    if t < upward_from(nmax) {
        out[nmax] = e * series(nmax, t);
        for n in (1..=nmax).rev() {
            out[n - 1] = (2.0 * t * out[n] + e) / (2 * n - 1) as f64;
        }
    } else {
        // erfc(√40) ≈ 1e-19: erf is 1 in double precision from there on.
        let erf = if t < TABLE_TMAX {
            libm::erf(t.sqrt())
        } else {
            1.0
        };
        out[0] = 0.5 * (std::f64::consts::PI / t).sqrt() * erf;
        let inv2t = 0.5 / t;
        for n in 0..nmax {
            out[n + 1] = ((2 * n + 1) as f64 * out[n] - e) * inv2t;
        }
    }
}

/// Σ_k (2T)^k / [(2n+1)(2n+3)…(2n+2k+1)], summed until the remaining tail cannot
/// change the sum (terms decrease geometrically once 2T < 2n+2k+3).
fn series(n: usize, t: f64) -> f64 {
    let two_t = 2.0 * t;
    let mut denom = (2 * n + 1) as f64;
    let mut term = 1.0 / denom;
    let mut sum = term;
    loop {
        denom += 2.0;
        let ratio = two_t / denom;
        term *= ratio;
        sum += term;
        // Once the ratio is below ½ the tail is smaller than the last term.
        if ratio < 0.5 && term < sum * 1e-17 {
            return sum;
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn zero_argument_is_exact() {
        // F_n(0) = 1/(2n+1) (direct integration; common practice).
        let mut f = [0.0; 8];
        boys(0.0, &mut f);
        for (n, v) in f.iter().enumerate() {
            assert_eq!(*v, 1.0 / (2 * n + 1) as f64);
        }
    }

    #[test]
    fn both_regimes_agree_at_the_switch() {
        let nmax = 6;
        let t = upward_from(nmax);
        let mut below = [0.0; 7];
        let mut above = [0.0; 7];
        reference(f64::from_bits(t.to_bits() - 1), &mut below);
        reference(t, &mut above);
        for n in 0..=nmax {
            assert!((below[n] - above[n]).abs() <= 2e-14 * above[n], "n = {n}");
        }
    }

    /// The table path against the series it was filled from, between grid points
    /// and at the edges of the table, orders 0..=16 (the series is the reference).
    #[test]
    fn table_matches_the_series() {
        let mut worst = 0.0f64;
        for k in 0..4000 {
            let t = k as f64 * 0.010_003_7;
            for len in [1, 5, 13, 17] {
                let (mut fast, mut slow) = ([0.0; 17], [0.0; 17]);
                boys(t, &mut fast[..len]);
                reference(t, &mut slow[..len]);
                for n in 0..len {
                    worst = worst.max((fast[n] - slow[n]).abs() / slow[n]);
                }
            }
        }
        assert!(worst < 4e-15, "table vs series: {worst:e}");
    }
}
