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

/// The smallest T at which the upward recursion is used for orders up to `nmax`.
fn upward_from(nmax: usize) -> f64 {
    25.0 + nmax as f64
}

/// F_n(T) = ∫_0^1 t^(2n) exp(−T t²) dt for n = 0..out.len()-1, accurate to 1e-14
/// relative for all T ≥ 0.
pub fn boys(t: f64, out: &mut [f64]) {
    let Some(nmax) = out.len().checked_sub(1) else {
        return;
    };
    debug_assert!(t >= 0.0, "Boys function argument must be ≥ 0, got {t}");
    let e = (-t).exp();
    if t < upward_from(nmax) {
        out[nmax] = e * series(nmax, t);
        for n in (1..=nmax).rev() {
            out[n - 1] = (2.0 * t * out[n] + e) / (2 * n - 1) as f64;
        }
    } else {
        let s = t.sqrt();
        out[0] = 0.5 * (std::f64::consts::PI / t).sqrt() * libm::erf(s);
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
        boys(f64::from_bits(t.to_bits() - 1), &mut below);
        boys(t, &mut above);
        for n in 0..=nmax {
            assert!((below[n] - above[n]).abs() <= 2e-14 * above[n], "n = {n}");
        }
    }
}
