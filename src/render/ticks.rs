//! Tick positions at "nice" numbers (1, 2, 2.5 or 5 times a power of ten, common
//! practice) and their labels, shared by axes and colour bars.

/// About `target` nicely spaced values inside [lo, hi], ends included when nice.
pub fn nice(lo: f64, hi: f64, target: usize) -> Vec<f64> {
    if !(lo.is_finite() && hi.is_finite()) || hi <= lo {
        return vec![lo];
    }
    let raw = (hi - lo) / target.max(1) as f64;
    let e = raw.log10().floor() as i32;
    // A step m × 10^e; values are i·m·10^e computed so that 0.3 comes out as 0.3.
    let at = |i: i64, m: f64| {
        if e < 0 {
            i as f64 * m / 10f64.powi(-e)
        } else {
            i as f64 * m * 10f64.powi(e)
        }
    };
    let m = [1.0, 2.0, 2.5, 5.0, 10.0]
        .into_iter()
        .find(|m| (hi - lo) / at(1, *m) <= target as f64 + 1.0)
        .unwrap_or(10.0);
    let step = at(1, m);
    let first = (lo / step - 1e-9).ceil() as i64;
    let last = (hi / step + 1e-9).floor() as i64;
    (first..=last)
        .map(|i| if i == 0 { 0.0 } else { at(i, m) })
        .collect()
}

/// The densest nice ticks (at most `max_target` intervals, at least 2) whose labels
/// `fits` accepts; labels are measured, not guessed from the length, so they never
/// overlap however small the map. Returns the ticks and their decimal places.
pub fn fitted(
    lo: f64,
    hi: f64,
    max_target: usize,
    fits: impl Fn(&[f64], usize) -> bool,
) -> (Vec<f64>, usize) {
    let mut last = (vec![lo], 2);
    for target in (2..=max_target.max(2)).rev() {
        let t = nice(lo, hi, target);
        let d = decimals(if t.len() > 1 { t[1] - t[0] } else { 1.0 });
        if fits(&t, d) {
            return (t, d);
        }
        last = (t, d);
    }
    // Even two intervals crowd: keep only the two ends of the last try.
    let (t, d) = last;
    let ends = match (t.first(), t.last()) {
        (Some(a), Some(b)) if t.len() > 2 => vec![*a, *b],
        _ => t,
    };
    (ends, d)
}

/// Powers of ten inside [lo, hi] (both positive), for logarithmic bars.
pub fn decades(lo: f64, hi: f64) -> Vec<f64> {
    let a = (lo.log10() - 1e-9).ceil() as i32;
    let b = (hi.log10() + 1e-9).floor() as i32;
    (a..=b).map(|e| 10f64.powi(e)).collect()
}

/// Decimal places that tell apart ticks spaced by `step`.
pub fn decimals(step: f64) -> usize {
    if step <= 0.0 || !step.is_finite() {
        return 2;
    }
    let d = -(step.log10() - 1e-9).floor();
    let d = d.max(0.0) as usize;
    // 2.5 × 10^k needs one more place.
    let scaled = step * 10f64.powi(d as i32);
    if (scaled - scaled.round()).abs() > 1e-6 {
        d + 1
    } else {
        d
    }
}

/// A label with a true minus sign.
pub fn label(v: f64, decimals: usize) -> String {
    let s = format!("{:.*}", decimals, v);
    let s = if s
        .trim_start_matches('-')
        .chars()
        .all(|c| c == '0' || c == '.')
    {
        s.trim_start_matches('-').to_string()
    } else {
        s
    };
    s.replace('-', "−")
}

/// A power of ten as markup, e.g. "10^{−3}".
pub fn power_label(v: f64) -> String {
    let e = v.log10().round() as i32;
    match e {
        0 => "1".into(),
        1 => "10".into(),
        e => format!("10^{{{}}}", e.to_string().replace('-', "−")),
    }
}

/// A common factor 10^k that brings values of magnitude `max` into [0.1, 1000), so
/// bars of tiny deformation densities read 2.5 rather than 0.0025.
pub fn common_exponent(max: f64) -> i32 {
    if max <= 0.0 || !max.is_finite() {
        return 0;
    }
    let e = max.log10().floor() as i32;
    if (-1..3).contains(&e) { 0 } else { e }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn ticks_are_nice_and_inside() {
        assert_eq!(
            nice(-0.32, 0.32, 6),
            vec![-0.3, -0.2, -0.1, 0.0, 0.1, 0.2, 0.3]
        );
        assert_eq!(nice(0.0, 10.0, 4), vec![0.0, 2.0, 4.0, 6.0, 8.0, 10.0]);
        assert_eq!(nice(0.0, 1.0, 3), vec![0.0, 0.25, 0.5, 0.75, 1.0]);
        assert_eq!(decimals(0.25), 2);
        assert_eq!(decimals(2.0), 0);
        assert_eq!(label(-0.1, 1), "−0.1");
        assert_eq!(label(-0.0001, 1), "0.0");
        assert_eq!(decades(0.0005, 0.3), vec![0.001, 0.01, 0.1]);
        assert_eq!(power_label(0.001), "10^{−3}");
        assert_eq!(common_exponent(0.004), -3);
        assert_eq!(common_exponent(0.3), 0);
    }
}
