//! Fast fixed-layout number formatting for cube files: the `%13.5E` style (sign,
//! one digit, five decimals, `E`, signed exponent of at least two digits, right
//! aligned in 13 columns). Formatting dominates cube writing, so this avoids the
//! general-purpose float formatter.

/// Exact powers of ten representable in f64 (10^0 … 10^22).
const POW10: [f64; 23] = [
    1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16,
    1e17, 1e18, 1e19, 1e20, 1e21, 1e22,
];

/// Multiplies by 10^k, exactly for |k| ≤ 22 and to within rounding otherwise.
fn scale10(x: f64, k: i32) -> f64 {
    let mut x = x;
    let mut k = k;
    while k > 22 {
        x *= 1e22;
        k -= 22;
    }
    while k < -22 {
        x /= 1e22;
        k += 22;
    }
    if k >= 0 {
        x * POW10[k as usize]
    } else {
        x / POW10[(-k) as usize]
    }
}

/// Appends `v` in `%13.5E` layout. Non-finite values are written as `NaN`/`Inf`
/// right-aligned, which a strict reader will refuse, as it should.
pub fn push_e13(buf: &mut Vec<u8>, v: f64) {
    if !v.is_finite() {
        let s = if v.is_nan() {
            "NaN"
        } else if v > 0.0 {
            "Inf"
        } else {
            "-Inf"
        };
        buf.extend(std::iter::repeat_n(b' ', 13 - s.len()));
        buf.extend_from_slice(s.as_bytes());
        return;
    }
    if v == 0.0 {
        buf.extend_from_slice(b"  0.00000E+00");
        return;
    }
    let a = v.abs();
    let mut e = a.log10().floor() as i32;
    let mut m = scale10(a, 5 - e).round_ties_even() as u64;
    if m >= 1_000_000 {
        e += 1;
        m = scale10(a, 5 - e).round_ties_even() as u64;
    } else if m < 100_000 {
        e -= 1;
        m = scale10(a, 5 - e).round_ties_even() as u64;
    }
    if m >= 1_000_000 {
        // 9.999995… rounds up to 10.00000: renormalise.
        e += 1;
        m = 100_000;
    }
    let mut digits = [0u8; 6];
    for d in digits.iter_mut().rev() {
        *d = b'0' + (m % 10) as u8;
        m /= 10;
    }
    let ae = e.unsigned_abs();
    let exp_len = if ae >= 100 { 3 } else { 2 };
    let len = 7 + 2 + exp_len; // d.ddddd, E and sign, exponent digits
    let pad = 13usize.saturating_sub(len + usize::from(v < 0.0));
    buf.extend(std::iter::repeat_n(b' ', pad));
    if v < 0.0 {
        buf.push(b'-');
    }
    buf.push(digits[0]);
    buf.push(b'.');
    buf.extend_from_slice(&digits[1..]);
    buf.push(b'E');
    buf.push(if e < 0 { b'-' } else { b'+' });
    if ae >= 100 {
        buf.push(b'0' + (ae / 100) as u8);
    }
    buf.push(b'0' + (ae / 10 % 10) as u8);
    buf.push(b'0' + (ae % 10) as u8);
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The reference is Rust's own correctly rounded `{:.5E}` (the standard library),
    /// rewritten to the C layout of a signed, two-digit exponent.
    fn reference(v: f64) -> String {
        let s = format!("{v:.5E}");
        let (mant, exp) = s.split_once('E').unwrap();
        let e: i32 = exp.parse().unwrap();
        format!(
            "{:>13}",
            format!("{mant}E{}{:02}", if e < 0 { '-' } else { '+' }, e.abs())
        )
    }

    #[test]
    fn matches_the_standard_formatter() {
        let mut seed = 0x2545_f491_4f6c_dd1du64;
        let mut next = || {
            seed ^= seed << 13;
            seed ^= seed >> 7;
            seed ^= seed << 17;
            seed
        };
        let mut cases = vec![
            1.0, -1.0, 9.999995, 9.9999949, 0.1, 1e-5, 123456.5, -2.5e-300, 1.7e308, 5e-324,
        ];
        for _ in 0..200_000 {
            let mant = (next() >> 11) as f64 / (1u64 << 53) as f64 * 10.0;
            let exp = (next() % 80) as i32 - 40;
            let sign = if next() % 2 == 0 { 1.0 } else { -1.0 };
            cases.push(sign * mant * 10f64.powi(exp));
        }
        for v in cases {
            let mut buf = Vec::new();
            push_e13(&mut buf, v);
            let ours = String::from_utf8(buf).unwrap();
            assert_eq!(ours, reference(v), "formatting {v:e}");
        }
    }

    #[test]
    fn zero_and_width() {
        let mut buf = Vec::new();
        push_e13(&mut buf, 0.0);
        push_e13(&mut buf, -0.5);
        assert_eq!(
            String::from_utf8(buf).unwrap(),
            "  0.00000E+00 -5.00000E-01"
        );
    }
}
