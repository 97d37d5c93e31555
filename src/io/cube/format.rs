//! Fast fixed-layout number formatting for cube files: the `%13.5E` style (sign,
//! one digit, five decimals, `E`, signed exponent of at least two digits, right
//! aligned in 13 columns). Formatting dominates cube writing, so this avoids the
//! general-purpose float formatter.

use std::sync::LazyLock;

/// Powers of ten 10^k for k in −350..=350, each the correctly rounded f64 (exact for
/// 0 ≤ k ≤ 22), so that scaling is one multiplication or division.
const POW_OFFSET: i32 = 350;
static POW10: LazyLock<Powers> = LazyLock::new(|| {
    let all: Vec<f64> = (-POW_OFFSET..=POW_OFFSET)
        .map(|k| format!("1e{k}").parse().expect("a power of ten parses"))
        .collect();
    let p = |k: i32| all[(k + POW_OFFSET) as usize];
    // The factors `scale10` multiplies by for k = 0..=105, so that the usual values
    // scale without its branches: up to 22 one exact power (times 1.0, which is
    // exact), beyond it the same two halves in the same order.
    let split = (0..=FAST_K)
        .map(|k| {
            if k <= 22 {
                (p(k), 1.0)
            } else {
                (p(k / 2), p(k - k / 2))
            }
        })
        .collect();
    Powers { all, split }
});

/// The largest k = 5 − e of the fast path: |v| ≥ 2^−330 gives e ≥ −100.
const FAST_K: i32 = 105;

/// The power table and the split factors of the fast path.
pub(super) struct Powers {
    all: Vec<f64>,
    split: Vec<(f64, f64)>,
}

/// x · 10^k. Positive k up to 22 multiply by an exact power; negative k divide by
/// one, which keeps the result correctly rounded where possible.
#[inline(always)]
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
    let bytes = e13_bits(v, pow10())?.to_le_bytes();
    let mut out = [0u8; 13];
    out.copy_from_slice(&bytes[..13]);
    Ok(out)
}

/// The powers of ten the formatter scales by; a loop over many values takes the
/// slice once rather than checking the lazy table per value.
pub(super) fn pow10() -> &'static Powers {
    &POW10
}

/// [`e13`]'s bytes as the low 13 bytes of a little-endian u128 (the top three zero),
/// so that a caller with room can store all 16 at once; `pow` is [`pow10`].
#[inline(always)]
pub(super) fn e13_bits(v: f64, powers: &Powers) -> Result<u128, NotFinite> {
    let pow = &powers.all[..];
    let a = v.abs();
    let e2 = (a.to_bits() >> 52) as i32 - 1023;
    // The usual values, 2^−330 ≤ |v| < 2^19 (finite, nonzero, normal): the steps of
    // `decompose` without its rare branches, returned only where `decompose` would
    // neither renormalise nor leave the two-digit exponent range (else the general
    // path below recomputes the same numbers).
    if (-330..19).contains(&e2) {
        let mut e = (e2 * 78913) >> 18;
        if a >= pow[(e + 1 + POW_OFFSET) as usize] {
            e += 1;
        }
        let (s1, s2) = powers.split[(5 - e) as usize];
        let m = round_even(a * s1 * s2);
        if (100_000..1_000_000).contains(&m) && e >= MIN_EXPONENT {
            return Ok(common_bits(v < 0.0, e, m));
        }
    }
    general(v, pow)
}

/// Every value by the general steps: non-finite refused, zero and tiny values as
/// zero, huge ones with four decimals.
#[inline(never)]
fn general(v: f64, pow: &[f64]) -> Result<u128, NotFinite> {
    if !v.is_finite() {
        return Err(NotFinite(v));
    }
    if v == 0.0 {
        return Ok(ZERO_BITS);
    }
    let (e, m) = decompose(v.abs(), 5, pow);
    if e < MIN_EXPONENT {
        return Ok(ZERO_BITS);
    }
    if e <= MAX_EXPONENT {
        return Ok(common_bits(v < 0.0, e, m));
    }
    let mut wide = [0u8; 16];
    wide[..13].copy_from_slice(&huge(v, pow));
    Ok(u128::from_le_bytes(wide))
}

/// Magnitudes of 1e100 and more, with four decimals (see [`MAX_EXPONENT`]).
#[cold]
#[inline(never)]
fn huge(v: f64, pow: &[f64]) -> [u8; 13] {
    let (e, mut m) = decompose(v.abs(), 4, pow);
    // Rounding the largest doubles to four decimals can overshoot the largest
    // double (1.79769E+308 → 1.7977E+308, which reads back as infinity): round
    // those toward zero instead.
    if e == 308 && m > 17_976 {
        m = 17_976;
    }
    let decimals = 4;
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
    // Four decimals (huge values only): digit by digit from the last.
    for _ in 0..decimals {
        p -= 1;
        out[p] = b'0' + (m % 10) as u8;
        m /= 10;
    }
    p -= 2;
    out[p] = b'0' + m as u8;
    out[p + 1] = b'.';
    if v < 0.0 {
        p -= 1;
        out[p] = b'-';
    }
    debug_assert!(p >= 1, "a written value must keep its separating space");
    out
}

/// The usual layout as bytes (tests).
#[cfg(test)]
fn common(negative: bool, e: i32, m: u64) -> [u8; 13] {
    let bytes = common_bits(negative, e, m).to_le_bytes();
    let mut out = [0u8; 13];
    out.copy_from_slice(&bytes[..13]);
    out
}

/// The usual layout, ` -d.dddddE±dd`, for m in 100 000..=999 999 and |e| ≤ 99, as
/// the little-endian bits of its 13 bytes (the top three zero), assembled in
/// registers and stored once: building it byte by byte in memory made every value
/// wait on store forwarding. The six digits come from two lookups of three (one
/// division by 1000 instead of four by powers of ten), the exponent's four bytes
/// from one.
#[inline(always)]
fn common_bits(negative: bool, e: i32, m: u64) -> u128 {
    let (hi, lo) = ((m / 1000) as usize, (m % 1000) as usize);
    u128::from(b' ')
        | (u128::from(if negative { b'-' } else { b' ' }) << 8)
        | (u128::from(DIGITS.dot3[hi]) << 16)
        | (u128::from(DIGITS.three[lo]) << 48)
        | (u128::from(DIGITS.exp[(e + 99) as usize]) << 72)
}

/// Lookup tables of the usual layout, little-endian byte strings: `three[k]` is k's
/// three digits, `dot3[k]` the first of them, the point, then the other two, and
/// `exp[e + 99]` is `E±dd`.
struct Digits {
    three: [u32; 1000],
    dot3: [u32; 1000],
    exp: [u32; 199],
}

const fn digits() -> Digits {
    let mut t = Digits {
        three: [0; 1000],
        dot3: [0; 1000],
        exp: [0; 199],
    };
    let mut k = 0;
    while k < 1000 {
        let (a, b, c) = (
            (b'0' + (k / 100) as u8) as u32,
            (b'0' + (k / 10 % 10) as u8) as u32,
            (b'0' + (k % 10) as u8) as u32,
        );
        t.three[k] = a | (b << 8) | (c << 16);
        t.dot3[k] = a | ((b'.' as u32) << 8) | (b << 16) | (c << 24);
        k += 1;
    }
    let mut i = 0;
    while i < 199 {
        let e = i as i32 - 99;
        let ae = e.unsigned_abs();
        let sign = if e < 0 { b'-' } else { b'+' };
        t.exp[i] = (b'E' as u32)
            | ((sign as u32) << 8)
            | ((b'0' as u32 + ae / 10) << 16)
            | ((b'0' as u32 + ae % 10) << 24);
        i += 1;
    }
    t
}

static DIGITS: Digits = digits();

const ZERO: &[u8; 13] = b"  0.00000E+00";
const ZERO_BITS: u128 = {
    let mut wide = [0u8; 16];
    let mut i = 0;
    while i < 13 {
        wide[i] = ZERO[i];
        i += 1;
    }
    u128::from_le_bytes(wide)
};

/// x rounded to the nearest integer, ties to even, as `f64::round_ties_even`
/// (which baseline x86-64 compiles to a libm call). Below 2^52 adding and
/// subtracting 2^52 does it: the sum lies in [2^52, 2^53), where the spacing of
/// doubles is 1, so the addition itself rounds x to an integer, ties to even (IEEE
/// 754 round-to-nearest-even), and the subtraction is exact.
#[inline(always)]
fn round_even(x: f64) -> u64 {
    const TWO52: f64 = 4_503_599_627_370_496.0;
    if (0.0..TWO52).contains(&x) {
        ((x + TWO52) - TWO52) as i64 as u64
    } else {
        x.round_ties_even() as u64
    }
}

/// The decimal exponent e and the rounded mantissa m (decimals + 1 digits) with
/// a ≈ m · 10^(e − decimals), for a finite a > 0.
#[inline(always)]
fn decompose(a: f64, decimals: i32, pow: &[f64]) -> (i32, u64) {
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
    let mut m = round_even(scale10(a, decimals - e, pow));
    if m >= hi {
        // 9.999995… rounds up to 10.00000: renormalise.
        e += 1;
        m = round_even(scale10(a, decimals - e, pow));
    } else if m < lo {
        e -= 1;
        m = round_even(scale10(a, decimals - e, pow));
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

    /// The table-driven digits against the standard library's integer formatting
    /// (an independent construction of the layout): every mantissa with a few
    /// exponents, every exponent with a few mantissas, both signs.
    #[test]
    fn every_mantissa_and_exponent_is_laid_out() {
        let expected = |neg: bool, e: i32, m: u64| {
            let s = m.to_string();
            let sign = if e < 0 { '-' } else { '+' };
            let text = format!(
                "{}{}.{}E{sign}{:02}",
                if neg { "-" } else { "" },
                &s[..1],
                &s[1..],
                e.abs()
            );
            format!("{text:>13}")
        };
        let check = |neg: bool, e: i32, m: u64| {
            let got = common(neg, e, m);
            assert_eq!(
                std::str::from_utf8(&got).unwrap(),
                expected(neg, e, m),
                "m={m} e={e}"
            );
        };
        for m in 100_000..=999_999 {
            for e in [-99, -7, 0, 5, 99] {
                check(m % 2 == 0, e, m);
            }
        }
        for e in -99..=99 {
            for m in [100_000, 123_456, 500_000, 999_999] {
                check(false, e, m);
                check(true, e, m);
            }
        }
    }

    /// The fast path gives the general path's bytes: values next to every power of
    /// ten and every rounding boundary 9.999995·10^k (a few ulps either side), and
    /// random values over the whole fast range and beyond it.
    #[test]
    fn fast_path_matches_the_general_path() {
        let powers = pow10();
        let mut cases = Vec::new();
        for k in -101..=7 {
            for base in [1.0, 9.999995, 9.9999949999, 5.000005, 1.000005] {
                let x: f64 = format!("{base}e{k}").parse().unwrap();
                for d in -4i64..=4 {
                    cases.push(f64::from_bits((x.to_bits() as i64 + d) as u64));
                }
            }
        }
        let mut seed = 0x853c_49e6_748f_ea9bu64;
        for _ in 0..300_000 {
            seed ^= seed << 13;
            seed ^= seed >> 7;
            seed ^= seed << 17;
            // Binary exponents −340..=30: across both ends of the fast range.
            let e = seed % 371 + 1023 - 340;
            cases.push(f64::from_bits((e << 52) | (seed >> 12)));
        }
        for v in cases.into_iter().flat_map(|v| [v, -v]) {
            assert_eq!(
                e13_bits(v, powers).unwrap(),
                general(v, &powers.all).unwrap(),
                "{v:e}"
            );
        }
    }

    /// The add-and-subtract rounding against the standard library's.
    #[test]
    fn rounding_ties_to_even() {
        for x in [
            0.0,
            0.5,
            1.5,
            2.5,
            99_999.5,
            100_000.5,
            999_999.5,
            123_456.499_999_999_99,
            4.5e15,
            9.1e15,
            1e20,
        ] {
            assert_eq!(round_even(x), x.round_ties_even() as u64, "{x}");
        }
        let mut seed = 0x9e37_79b9_7f4a_7c15u64;
        for _ in 0..1_000_000 {
            seed ^= seed << 13;
            seed ^= seed >> 7;
            seed ^= seed << 17;
            let x = (seed >> 11) as f64 / (1u64 << 53) as f64 * 1e7;
            let half = (x.floor() + 0.5) * if seed % 3 == 0 { 1.0 } else { 0.0 };
            for v in [x, half] {
                assert_eq!(round_even(v), v.round_ties_even() as u64, "{v}");
            }
        }
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
