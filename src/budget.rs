//! Memory and work budgets: every command estimates what a job will need before it
//! allocates, and refuses with the estimate in the message when it would not fit.
//! A refusal is better than an abort under a memory limit or a run that never ends.

use crate::error::{Error, Result};

/// Default memory budget, 8 GiB: a third of the 24 GiB this tool is developed on,
/// leaving room for the rest of a shared machine. `--memory` overrides it.
pub const DEFAULT_MEMORY: u64 = 8 << 30;

/// The `--memory` default as shown in `--help`.
pub const DEFAULT_MEMORY_TEXT: &str = "8G";

/// Reads a size such as `512M`, `8G`, `1.5G` or a plain number of bytes. Suffixes are
/// binary (K = 1024 bytes); a trailing `B` or `iB` is accepted.
pub fn parse_size(text: &str) -> std::result::Result<u64, String> {
    let t = text.trim();
    let upper = t.to_ascii_uppercase();
    let stripped = upper
        .strip_suffix("IB")
        .or_else(|| upper.strip_suffix('B'))
        .unwrap_or(&upper);
    let (number, shift) = match stripped.chars().last() {
        Some('K') => (&stripped[..stripped.len() - 1], 10),
        Some('M') => (&stripped[..stripped.len() - 1], 20),
        Some('G') => (&stripped[..stripped.len() - 1], 30),
        Some('T') => (&stripped[..stripped.len() - 1], 40),
        _ => (stripped, 0),
    };
    let value: f64 = number
        .trim()
        .parse()
        .map_err(|_| format!("\"{t}\" is not a size (examples: 512M, 8G, 1.5G)"))?;
    let bytes = value * (1u64 << shift) as f64;
    if !bytes.is_finite() || bytes < 1.0 || bytes > (1u64 << 50) as f64 {
        return Err(format!(
            "\"{t}\" is outside the accepted sizes, 1 byte to 1024T"
        ));
    }
    Ok(bytes as u64)
}

/// Formats a byte count for messages: `1.5 GiB`, `320 MiB`.
pub fn show_bytes(bytes: f64) -> String {
    const GIB: f64 = (1u64 << 30) as f64;
    const MIB: f64 = (1u64 << 20) as f64;
    if bytes >= GIB {
        format!("{:.1} GiB", bytes / GIB)
    } else if bytes >= MIB {
        format!("{:.0} MiB", bytes / MIB)
    } else {
        format!("{:.0} KiB", (bytes / 1024.0).max(1.0))
    }
}

/// Refuses a job whose estimated memory exceeds the budget. `what` says what the
/// memory is for ("the stored fields of a 1000×1000×1000 cube"). The estimate is an
/// f64 so that products of user counts cannot wrap before they are compared.
pub fn check_memory(estimate: f64, budget: u64, what: &str) -> Result<()> {
    // NaN (an estimate that overflowed) is refused too.
    if estimate.is_nan() || estimate > budget as f64 {
        return Err(Error::input(format!(
            "{what} would need about {} of memory, over the budget of {}",
            show_bytes(estimate),
            show_bytes(budget as f64)
        ))
        .with_hint("raise the budget with --memory (e.g. --memory 16G) or ask for less"));
    }
    Ok(())
}

/// Reserves room for exactly `n` more values, turning a refusal by the system (a
/// memory limit, an exhausted machine) into an error instead of an abort. It is the
/// same kind of error as an estimate over the budget (exit status 2): the job does
/// not fit, and asking for less or giving the process more memory fixes it.
pub fn reserve<T>(v: &mut Vec<T>, n: usize, what: &str) -> Result<()> {
    v.try_reserve_exact(n).map_err(|_| {
        let bytes = n as f64 * std::mem::size_of::<T>() as f64;
        Error::input(format!(
            "{what} would need about {} of memory, which the system refused to give",
            show_bytes(bytes)
        ))
        .with_hint("free memory or lift the process's memory limit (ulimit -v), or ask for less")
    })
}

/// Refuses a job whose estimated work (rough floating-point operations) exceeds
/// `limit`, naming the estimate; `hint` says how to ask for less.
pub fn check_work(estimate: f64, limit: f64, what: &str, hint: &str) -> Result<()> {
    if estimate.is_nan() || estimate > limit {
        return Err(Error::input(format!(
            "{what} would take about {estimate:.1e} operations, over the limit of {limit:.0e}"
        ))
        .with_hint(hint.to_string()));
    }
    Ok(())
}

/// Refuses a count option outside its documented range, naming the range.
pub fn check_count(name: &str, value: u64, min: u64, max: u64) -> Result<()> {
    if value < min || value > max {
        return Err(Error::input(format!(
            "{name} {value} is outside the accepted range {min} to {max}"
        )));
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    // Expected values are plain binary multiples (common practice for memory sizes).
    #[test]
    fn sizes_read_with_binary_suffixes() {
        assert_eq!(parse_size("512M").unwrap(), 512 << 20);
        assert_eq!(parse_size("8g").unwrap(), 8 << 30);
        assert_eq!(parse_size("1.5GiB").unwrap(), 3 << 29);
        assert_eq!(parse_size("4096").unwrap(), 4096);
        assert!(parse_size("-1G").is_err());
        assert!(parse_size("lots").is_err());
        assert!(parse_size("1e30").is_err());
    }

    #[test]
    fn over_budget_is_refused_with_both_figures() {
        let e = check_memory(7.8e9, 4 << 30, "the stored fields").unwrap_err();
        assert!(e.message.contains("7.3 GiB") && e.message.contains("4.0 GiB"));
        assert!(check_memory(f64::NAN, 1 << 30, "x").is_err());
        assert!(check_memory(1e6, 1 << 30, "x").is_ok());
    }

    #[test]
    fn refused_reservation_is_an_error() {
        let mut v: Vec<f64> = Vec::new();
        let e = reserve(&mut v, usize::MAX / 16, "a test buffer").unwrap_err();
        assert!(e.message.contains("system refused"), "{}", e.message);
        assert!(reserve(&mut v, 10, "x").is_ok() && v.capacity() >= 10);
    }

    #[test]
    fn counts_outside_range_name_it() {
        let e = check_count("--contours", u64::MAX, 0, 200).unwrap_err();
        assert!(e.message.contains("0 to 200"));
        assert!(check_count("--contours", 12, 0, 200).is_ok());
    }
}
