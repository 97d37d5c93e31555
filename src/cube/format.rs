//! Fast fixed-layout number formatting for cube files: the `%13.5E` style (sign,
//! one digit, five decimals, `E`, signed exponent of at least two digits, right
//! aligned in 13 columns). Formatting dominates cube writing, so this avoids the
//! general-purpose float formatter.

use std::sync::LazyLock;

/// Powers of ten 10^k for k in −350..=350, each the correctly rounded f64 (exact for
/// 0 ≤ k ≤ 22), so that scaling is one multiplication or division.
const POW_OFFSET: i32 = 350;
static POW10: LazyLock<Vec<f64>> = LazyLock::new(|| {
    (-POW_OFFSET..=POW_OFFSET)
        .map(|k| format!("1e{k}").parse().expect("a power of ten parses"))
        .collect()
});

/// x · 10^k. Positive k up to 22 multiply by an exact power; negative k divide by
/// one, which keeps the result correctly rounded where possible.
#[inline]
fn scale10(x: f64, k: i32, pow: &[f64]) -> f64 {
    if (0..=22).contains(&k) {
        x * pow[(k + POW_OFFSET) as usize]
    } else if (-22..0).contains(&k) {
        x / pow[(POW_OFFSET - k) as usize]
    } else if k > 0 {
        // Beyond 10^22 split the factor so that neither part over- or underflows.
        x * pow[(POW_OFFSET + k / 2) as usize] * pow[(POW_OFFSET + k - k / 2) as usize]
    } else {
        x / pow[(POW_OFFSET - k / 2) as usize] / pow[(POW_OFFSET - (k - k / 2)) as usize]
    }
}

/// Two-digit pairs "00" … "99" for fast integer output.
const PAIRS: &[u8; 200] = b"0001020304050607080910111213141516171819\
2021222324252627282930313233343536373839\
4041424344454647484950515253545556575859\
6061626364656667686970717273747576777879\
8081828384858687888990919293949596979899";

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
    let pow: &[f64] = &POW10;
    let a = v.abs();
    // floor(log10 a) from the binary exponent (log10 2 ≈ 78913 / 2^18), then one
    // comparison against the table corrects the estimate.
    let e2 = ((a.to_bits() >> 52) & 0x7ff) as i32 - 1023;
    let mut e = (e2 * 78913) >> 18;
    if e2 == -1023 {
        e = a.log10().floor() as i32; // subnormal: rare, take the slow road
    } else if e + 1 + POW_OFFSET < pow.len() as i32 && a >= pow[(e + 1 + POW_OFFSET) as usize] {
        e += 1;
    }
    let mut m = scale10(a, 5 - e, pow).round_ties_even() as u64;
    if m >= 1_000_000 {
        // 9.999995… rounds up to 10.00000: renormalise.
        e += 1;
        m = scale10(a, 5 - e, pow).round_ties_even() as u64;
    } else if m < 100_000 {
        e -= 1;
        m = scale10(a, 5 - e, pow).round_ties_even() as u64;
    }
    let mut out = [b' '; 14];
    let ae = e.unsigned_abs() as usize;
    // Right-align in 13 columns (14 when the exponent has three digits).
    let width = if ae >= 100 { 14 } else { 13 };
    let mut p = width;
    p -= 2;
    out[p..p + 2].copy_from_slice(&PAIRS[2 * (ae % 100)..2 * (ae % 100) + 2]);
    if ae >= 100 {
        p -= 1;
        out[p] = b'0' + (ae / 100) as u8;
    }
    p -= 2;
    out[p] = b'E';
    out[p + 1] = if e < 0 { b'-' } else { b'+' };
    let (hi, lo) = ((m / 10_000) as usize, (m % 10_000) as usize);
    p -= 4;
    out[p..p + 2].copy_from_slice(&PAIRS[2 * (lo / 100)..2 * (lo / 100) + 2]);
    out[p + 2..p + 4].copy_from_slice(&PAIRS[2 * (lo % 100)..2 * (lo % 100) + 2]);
    // hi is 10..99: the leading digit, the point, then the first decimal.
    p -= 3;
    out[p] = PAIRS[2 * hi];
    out[p + 1] = b'.';
    out[p + 2] = PAIRS[2 * hi + 1];
    if v < 0.0 {
        p -= 1;
        out[p] = b'-';
    }
    let start = if width == 14 { p.min(1) } else { 0 };
    buf.extend_from_slice(&out[start..width]);
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
