//! Numbers in cube files: a strict, fast parser for the value tokens (decimal or
//! exponent form with `E`, `e`, `D` or `d`, and the Fortran form `3.86160-106` with
//! no exponent letter), and the byte classes the tokenizer splits on.

/// Longest number token accepted (a double needs at most ~25 characters).
pub const MAX_TOKEN: usize = 64;

#[inline]
pub fn is_space(b: u8) -> bool {
    matches!(b, b' ' | b'\n' | b'\r' | b'\t' | 0x0b | 0x0c)
}

pub fn parse_int(s: &[u8]) -> Option<i64> {
    std::str::from_utf8(s).ok()?.parse().ok()
}

/// Powers of ten exactly representable in a double.
const EXACT_POW10: [f64; 23] = [
    1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16,
    1e17, 1e18, 1e19, 1e20, 1e21, 1e22,
];

/// Parses a finite number in decimal or exponent form (`E`, `e`, `D`, `d`).
/// Short mantissas with small exponents take the exact fast path (an integer below
/// 2^53 times or divided by an exact power of ten is correctly rounded, Clinger 1990);
/// everything else goes through the standard library's correctly rounded parser.
#[inline]
pub fn parse_finite(s: &[u8]) -> std::result::Result<f64, String> {
    match fast_parse(s) {
        Some(v) => Ok(v),
        None => parse_slow(s),
    }
}

/// The general case: `D` exponents rewritten, the exponent letter put back into the
/// Fortran form (`3.86160-106`, `1.0+100`: a sign straight after the mantissa's last
/// digit), then the standard parser.
#[cold]
#[inline(never)]
fn parse_slow(s: &[u8]) -> std::result::Result<f64, String> {
    if s.len() > MAX_TOKEN {
        return Err("an entry is too long to be a number".into());
    }
    // Each input byte becomes at most two (a Fortran sign gains its letter).
    let mut owned = [0u8; 2 * MAX_TOKEN];
    let mut n = 0;
    let has_letter = s.iter().any(|b| matches!(b, b'E' | b'e' | b'D' | b'd'));
    for (i, &b) in s.iter().enumerate() {
        let fortran_sign = !has_letter
            && matches!(b, b'+' | b'-')
            && i > 0
            && (s[i - 1].is_ascii_digit() || s[i - 1] == b'.')
            && s.get(i + 1).is_some_and(u8::is_ascii_digit);
        if fortran_sign {
            owned[n] = b'E';
            n += 1;
        }
        owned[n] = if b == b'D' || b == b'd' { b'E' } else { b };
        n += 1;
    }
    let text = std::str::from_utf8(&owned[..n]).unwrap_or("");
    // The standard parser also takes "inf", "NaN" and "infinity": refuse those here,
    // and anything that is not plainly a number.
    let plain = !text.is_empty()
        && text
            .bytes()
            .all(|b| b.is_ascii_digit() || matches!(b, b'+' | b'-' | b'.' | b'E' | b'e'));
    let shown = || String::from_utf8_lossy(s).into_owned();
    if !plain {
        return Err(if text.parse::<f64>().is_ok() {
            format!("'{}' is not a finite number", shown())
        } else {
            format!("'{}' is not a number", shown())
        });
    }
    match text.parse::<f64>() {
        Ok(v) if v.is_finite() => Ok(v),
        Ok(_) => Err(format!("'{}' is too large for a double", shown())),
        Err(_) => Err(format!("'{}' is not a number", shown())),
    }
}

/// An optional sign at `s[*i]`, stepped over; true for minus.
#[inline]
fn sign(s: &[u8], i: &mut usize) -> bool {
    match s.get(*i) {
        Some(b'-') => {
            *i += 1;
            true
        }
        Some(b'+') => {
            *i += 1;
            false
        }
        _ => false,
    }
}

#[inline]
fn fast_parse(s: &[u8]) -> Option<f64> {
    let mut i = 0;
    let neg = sign(s, &mut i);
    let mut mant: u64 = 0;
    let mut digits = 0u32;
    let mut scale: i32 = 0;
    let mut any = false;
    while i < s.len() && s[i].is_ascii_digit() {
        mant = mant.wrapping_mul(10).wrapping_add((s[i] - b'0') as u64);
        digits += (mant != 0) as u32;
        any = true;
        i += 1;
    }
    if i < s.len() && s[i] == b'.' {
        i += 1;
        while i < s.len() && s[i].is_ascii_digit() {
            mant = mant.wrapping_mul(10).wrapping_add((s[i] - b'0') as u64);
            digits += (mant != 0) as u32;
            scale -= 1;
            any = true;
            i += 1;
        }
    }
    if !any || digits > 15 {
        return None;
    }
    if i < s.len() {
        // A letter, or the Fortran form's bare sign (`3.86160-106`).
        if matches!(s[i], b'E' | b'e' | b'D' | b'd') {
            i += 1;
        } else if !matches!(s[i], b'+' | b'-') {
            return None;
        }
        s.get(i)?;
        let eneg = sign(s, &mut i);
        let mut e: i32 = 0;
        let start = i;
        while i < s.len() && s[i].is_ascii_digit() && i - start < 6 {
            e = e * 10 + (s[i] - b'0') as i32;
            i += 1;
        }
        if i == start || i != s.len() {
            return None;
        }
        scale += if eneg { -e } else { e };
    }
    let m = mant as f64;
    let v = if m == 0.0 {
        0.0
    } else if (0..=22).contains(&scale) {
        m * EXACT_POW10[scale as usize]
    } else if (-22..0).contains(&scale) {
        m / EXACT_POW10[(-scale) as usize]
    } else {
        return None;
    };
    Some(if neg { -v } else { v })
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The reference is the standard library's correctly rounded parser.
    #[test]
    fn fast_path_matches_the_standard_parser() {
        for s in [
            "1.23450E-05",
            "-9.99999E+99",
            "0.00000E+00",
            "-0.0",
            "12",
            "1e22",
            "3.5e-22",
            "123456789012345",
            "4.94066E-324",
            "1.7976931348623157e308",
            "0.1",
            "+2.5E+00",
        ] {
            let ours = parse_finite(s.as_bytes()).unwrap();
            assert_eq!(ours.to_bits(), s.parse::<f64>().unwrap().to_bits(), "{s}");
        }
        assert_eq!(parse_finite(b"1.5D-03").unwrap(), 1.5e-3);
        assert_eq!(parse_finite(b"-2.25d+01").unwrap(), -22.5);
    }

    /// Issue 10, item 17: Fortran writes a three-digit exponent without its letter
    /// (the E format drops it when the exponent needs three digits; common practice
    /// of Fortran E editing). The reference is the standard parser on the same number
    /// written with its `E`.
    #[test]
    fn fortran_exponents_without_a_letter() {
        for (fortran, with_e) in [
            ("3.86160-106", "3.86160E-106"),
            ("-3.86160-106", "-3.86160E-106"),
            ("1.0+100", "1.0E+100"),
            ("2.5-3", "2.5E-3"),
            ("-7.-5", "-7.E-5"),
            ("1.79769+308", "1.79769E+308"),
            ("4.94066-324", "4.94066E-324"),
        ] {
            let ours = parse_finite(fortran.as_bytes()).unwrap();
            assert_eq!(
                ours.to_bits(),
                with_e.parse::<f64>().unwrap().to_bits(),
                "{fortran}"
            );
        }
        for bad in [
            "1.0-", "1.0+-5", "1-2-3", "1e5-3", "-+1", "1.0+1e2", "1.0 -5", "+",
        ] {
            assert!(parse_finite(bad.as_bytes()).is_err(), "{bad}");
        }
    }

    #[test]
    fn refuses_what_is_not_a_finite_number() {
        for s in [
            "NaN", "nan", "inf", "-Inf", "Infinity", "1e999", "abc", "1.0.0", "1e", "--1", "",
            "1,5", "0x10",
        ] {
            assert!(parse_finite(s.as_bytes()).is_err(), "{s}");
        }
    }

    /// Regression: a 64-byte token with many Fortran signs once overflowed the
    /// rewrite buffer (a byte-mutation case, CI run of an earlier submission).
    #[test]
    fn longest_token_with_many_fortran_signs_is_an_error_not_a_panic() {
        let token = "1-".repeat(MAX_TOKEN / 2);
        assert_eq!(token.len(), MAX_TOKEN);
        assert!(parse_finite(token.as_bytes()).is_err());
        let one_sign = format!("{}-1", "1".repeat(MAX_TOKEN - 2));
        assert!(parse_finite(one_sign.as_bytes()).is_ok());
    }
}
