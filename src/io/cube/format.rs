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

/// The smallest decimal exponent written: values whose magnitude rounds below
/// 1.00000E-99 are written as zero, so that every value keeps a two-digit exponent
/// and a separating space (`-7.27096E-122` would fill all 13 columns and run into its
/// neighbour). Nothing physical is lost: the layout's six significant digits are
/// relative to each value, and such values are 1e-99 below any field's scale.
pub const MIN_EXPONENT: i32 = -99;
/// The largest exponent written with five decimals; larger magnitudes (never reached by
/// a physical field) are written with four decimals, `1.2346E+123`, still 13 columns
/// with a leading space.
pub const MAX_EXPONENT: i32 = 99;

/// A value that cannot be written: NaN or an infinity.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct NotFinite(pub f64);

impl std::fmt::Display for NotFinite {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(f, "{}", self.0)
    }
}

/// Appends `v` in `%13.5E` layout: always exactly 13 columns starting with a space, so
/// that every value reads back in the fixed-width layout. Magnitudes below 1e-99 are
/// written as zero (see [`MIN_EXPONENT`]), above 9.99999E+99 with four decimals (see
/// [`MAX_EXPONENT`]). Non-finite values are refused and nothing is appended.
#[inline]
pub fn push_e13(buf: &mut Vec<u8>, v: f64) -> Result<(), NotFinite> {
    buf.extend_from_slice(&e13(v)?);
    Ok(())
}

/// The 13 bytes [`push_e13`] appends, for writing into a pre-sized slot.
#[inline(always)]
pub fn e13(v: f64) -> Result<[u8; 13], NotFinite> {
    if !v.is_finite() {
        return Err(NotFinite(v));
    }
    if v == 0.0 {
        return Ok(*ZERO);
    }
    let (mut e, mut m) = decompose(v.abs(), 5);
    if e < MIN_EXPONENT {
        return Ok(*ZERO);
    }
    let decimals = if e > MAX_EXPONENT {
        (e, m) = decompose(v.abs(), 4);
        // Rounding the largest doubles to four decimals can overshoot the largest
        // double (1.79769E+308 → 1.7977E+308, which reads back as infinity): round
        // those toward zero instead.
        if e == 308 && m > 17_976 {
            m = 17_976;
        }
        4
    } else {
        5
    };
    if decimals == 5 && e.unsigned_abs() < 100 {
        return Ok(common(v < 0.0, e, m));
    }
    let ae = e.unsigned_abs() as usize;
    let mut out = [b' '; 13];
    let mut p = 13;
    p -= 2;
    out[p..p + 2].copy_from_slice(&PAIRS[2 * (ae % 100)..2 * (ae % 100) + 2]);
    if ae >= 100 {
        p -= 1;
        out[p] = b'0' + (ae / 100) as u8;
    }
    p -= 2;
    out[p] = b'E';
    out[p + 1] = if e < 0 { b'-' } else { b'+' };
    if decimals == 5 {
        // The usual case, by digit pairs: hi is 10..99 (the leading digit, the point,
        // then the first decimal), lo the other four decimals.
        let (hi, lo) = ((m / 10_000) as usize, (m % 10_000) as usize);
        p -= 4;
        out[p..p + 2].copy_from_slice(&PAIRS[2 * (lo / 100)..2 * (lo / 100) + 2]);
        out[p + 2..p + 4].copy_from_slice(&PAIRS[2 * (lo % 100)..2 * (lo % 100) + 2]);
        p -= 3;
        out[p] = PAIRS[2 * hi];
        out[p + 1] = b'.';
        out[p + 2] = PAIRS[2 * hi + 1];
    } else {
        // Four decimals (huge values only): digit by digit from the last.
        for _ in 0..decimals {
            p -= 1;
            out[p] = b'0' + (m % 10) as u8;
            m /= 10;
        }
        p -= 2;
        out[p] = b'0' + m as u8;
        out[p + 1] = b'.';
    }
    if v < 0.0 {
        p -= 1;
        out[p] = b'-';
    }
    debug_assert!(p >= 1, "a written value must keep its separating space");
    Ok(out)
}

/// The usual layout, ` -d.dddddE±dd`, assembled in one 128-bit register and stored
/// once: building it byte by byte in memory and copying it out made every value wait
/// on store forwarding, the largest single cost of cube writing in the profile.
#[inline(always)]
fn common(negative: bool, e: i32, m: u64) -> [u8; 13] {
    let pair = |k: u64| -> u128 {
        let k = 2 * k as usize;
        u128::from(PAIRS[k]) | (u128::from(PAIRS[k + 1]) << 8)
    };
    let (lead, rest) = (m / 100_000, m % 100_000);
    let ae = u64::from(e.unsigned_abs());
    let mut x: u128 = u128::from(b' ')
        | (u128::from(if negative { b'-' } else { b' ' }) << 8)
        | (u128::from(b'0' + lead as u8) << 16)
        | (u128::from(b'.') << 24)
        | (u128::from(b'0' + (rest / 10_000) as u8) << 32)
        | (pair((rest / 100) % 100) << 40)
        | (pair(rest % 100) << 56)
        | (u128::from(b'E') << 72)
        | (u128::from(if e < 0 { b'-' } else { b'+' }) << 80);
    x |= pair(ae) << 88;
    let bytes = x.to_le_bytes();
    let mut out = [0u8; 13];
    out.copy_from_slice(&bytes[..13]);
    out
}

const ZERO: &[u8; 13] = b"  0.00000E+00";

/// The decimal exponent e and the rounded mantissa m (decimals + 1 digits) with
/// a ≈ m · 10^(e − decimals), for a finite a > 0.
#[inline(always)]
fn decompose(a: f64, decimals: i32) -> (i32, u64) {
    let pow: &[f64] = &POW10;
    let (lo, hi) = (10u64.pow(decimals as u32), 10u64.pow(decimals as u32 + 1));
    // floor(log10 a) from the binary exponent (log10 2 ≈ 78913 / 2^18), then one
    // comparison against the table corrects the estimate.
    let e2 = ((a.to_bits() >> 52) & 0x7ff) as i32 - 1023;
    let mut e = (e2 * 78913) >> 18;
    if e2 == -1023 {
        e = a.log10().floor() as i32; // subnormal: rare, take the slow road
    } else if e + 1 + POW_OFFSET < pow.len() as i32 && a >= pow[(e + 1 + POW_OFFSET) as usize] {
        e += 1;
    }
    let mut m = scale10(a, decimals - e, pow).round_ties_even() as u64;
    if m >= hi {
        // 9.999995… rounds up to 10.00000: renormalise.
        e += 1;
        m = scale10(a, decimals - e, pow).round_ties_even() as u64;
    } else if m < lo {
        e -= 1;
        m = scale10(a, decimals - e, pow).round_ties_even() as u64;
    }
    (e, m)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The reference is Rust's own correctly rounded `{:.5E}` (the standard library),
    /// rewritten to the C layout of a signed, two-digit exponent.
    fn reference(v: f64, decimals: usize) -> String {
        let s = format!("{v:.decimals$E}");
        let (mant, exp) = s.split_once('E').unwrap();
        let e: i32 = exp.parse().unwrap();
        format!(
            "{:>13}",
            format!("{mant}E{}{:02}", if e < 0 { '-' } else { '+' }, e.abs())
        )
    }

    fn ours(v: f64) -> String {
        let mut buf = Vec::new();
        push_e13(&mut buf, v).unwrap();
        String::from_utf8(buf).unwrap()
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
            1.0, -1.0, 9.999995, 9.9999949, 0.1, 1e-5, 123456.5, -2.5e-99, 9.99999e99, 1e-99,
        ];
        for _ in 0..200_000 {
            let mant = (next() >> 11) as f64 / (1u64 << 53) as f64 * 10.0;
            let exp = (next() % 180) as i32 - 90;
            let sign = if next() % 2 == 0 { 1.0 } else { -1.0 };
            cases.push(sign * mant * 10f64.powi(exp));
        }
        for v in cases.into_iter().filter(|v| v.abs() >= 1e-99) {
            assert_eq!(ours(v), reference(v, 5), "formatting {v:e}");
        }
    }

    /// Issue 10, item 1: `-7.27096E-122` filled all 13 columns. Magnitudes that round
    /// below 1e-99 are zero; huge ones take four decimals (reference: the standard
    /// library's `{:.4E}`); every value is 13 columns with a leading space.
    #[test]
    fn extreme_exponents_keep_the_layout() {
        for v in [-7.27096e-122, 2.5e-300, -5e-324, 9.99994e-100, -1e-100] {
            assert_eq!(ours(v), "  0.00000E+00", "{v:e}");
        }
        // 9.999996e-100 rounds up to 1.00000E-99, which fits.
        assert_eq!(ours(-9.999996e-100), " -1.00000E-99");
        for v in [1.7e308, -1.234567e123, 9.999996e99, 1e100] {
            assert_eq!(ours(v), reference(v, 4), "{v:e}");
            assert!(ours(v).starts_with(' ') && ours(v).len() == 13);
        }
        assert_eq!(ours(-9.999996e99), " -1.0000E+100");
        // The largest double rounds toward zero so that it reads back as finite.
        assert_eq!(ours(-f64::MAX), " -1.7976E+308");
        assert_eq!(ours(f64::MAX), "  1.7976E+308");
    }

    #[test]
    fn non_finite_values_are_refused() {
        for v in [f64::NAN, f64::INFINITY, f64::NEG_INFINITY] {
            let mut buf = Vec::new();
            assert!(push_e13(&mut buf, v).is_err());
            assert!(buf.is_empty());
        }
    }

    #[test]
    fn zero_and_width() {
        assert_eq!(ours(0.0) + &ours(-0.5), "  0.00000E+00 -5.00000E-01");
        assert_eq!(ours(-0.0), "  0.00000E+00");
    }
}
