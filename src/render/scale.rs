//! Colour scales and the mapping of field values onto them. The gradients are the
//! colorous crate's (ported from d3-scale-chromatic) under the crate's own names;
//! only perceptually ordered, colour-blind-readable ones are offered.
//!
//! Our default for orbital phase is PURPLE_ORANGE, which runs from purple (t = 0) to
//! orange (t = 1), so positive lobes are orange and negative lobes purple, with a near-white zero: the two hues differ in
//! lightness as well as hue, so they stay apart for red–green colour-blind readers
//! and in greyscale print. Non-negative fields default to VIRIDIS.

use crate::error::{Error, Result};

use super::canvas::Colour;

/// Which kind of field a scale suits.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Kind {
    /// Symmetric about a zero colour in the middle.
    Diverging,
    /// From a low end to a high end.
    Sequential,
}

#[derive(Debug, Clone, Copy)]
pub struct Scale {
    /// The colorous constant's name, e.g. "PURPLE_ORANGE".
    pub name: &'static str,
    pub kind: Kind,
    gradient: colorous::Gradient,
}

/// Diverging scales of ColorBrewer marked colour-blind safe there (from memory);
/// sequential ones are the perceptually uniform matplotlib scales and cividis.
const SCALES: &[(&str, Kind, colorous::Gradient)] = &[
    ("PURPLE_ORANGE", Kind::Diverging, colorous::PURPLE_ORANGE),
    ("BROWN_GREEN", Kind::Diverging, colorous::BROWN_GREEN),
    ("PURPLE_GREEN", Kind::Diverging, colorous::PURPLE_GREEN),
    ("PINK_GREEN", Kind::Diverging, colorous::PINK_GREEN),
    ("RED_BLUE", Kind::Diverging, colorous::RED_BLUE),
    ("VIRIDIS", Kind::Sequential, colorous::VIRIDIS),
    ("CIVIDIS", Kind::Sequential, colorous::CIVIDIS),
    ("INFERNO", Kind::Sequential, colorous::INFERNO),
    ("MAGMA", Kind::Sequential, colorous::MAGMA),
    ("PLASMA", Kind::Sequential, colorous::PLASMA),
];

pub const DEFAULT_SIGNED: &str = "PURPLE_ORANGE";
pub const DEFAULT_NON_NEGATIVE: &str = "VIRIDIS";

pub fn names(kind: Kind) -> Vec<&'static str> {
    SCALES.iter().filter(|s| s.1 == kind).map(|s| s.0).collect()
}

impl Scale {
    /// Looks a scale up by its colorous name (any case, `-` for `_` accepted).
    pub fn by_name(name: &str) -> Result<Self> {
        let want = name.trim().to_ascii_uppercase().replace('-', "_");
        SCALES
            .iter()
            .find(|s| s.0 == want)
            .map(|&(name, kind, gradient)| Scale {
                name,
                kind,
                gradient,
            })
            .ok_or_else(|| {
                Error::input(format!("unknown colour scale {name:?}")).with_hint(format!(
                    "diverging (signed fields): {}; sequential (non-negative fields): {}",
                    names(Kind::Diverging).join(", "),
                    names(Kind::Sequential).join(", ")
                ))
            })
    }

    pub fn default_for(signed: bool) -> Self {
        let name = if signed {
            DEFAULT_SIGNED
        } else {
            DEFAULT_NON_NEGATIVE
        };
        Scale::by_name(name).expect("the defaults are in the table")
    }

    /// The colour at t in [0, 1] (clamped).
    pub fn at(&self, t: f64) -> Colour {
        let t = if t.is_nan() { 0.5 } else { t.clamp(0.0, 1.0) };
        let c = self.gradient.eval_continuous(t);
        Colour::rgb(c.r, c.g, c.b)
    }
}

/// How values become positions on a scale.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Mapping {
    /// −max → 0, 0 → ½, +max → 1.
    Symmetric { max: f64 },
    /// 0 → 0, max → 1.
    Linear { max: f64 },
    /// max·10^(−decades) and below → 0, max → 1, logarithmic between.
    Log { max: f64, decades: f64 },
}

impl Mapping {
    pub fn t(&self, v: f64) -> f64 {
        match *self {
            Mapping::Symmetric { max } => 0.5 + 0.5 * v / max,
            Mapping::Linear { max } => v / max,
            Mapping::Log { max, decades } => {
                if v <= 0.0 {
                    0.0
                } else {
                    1.0 + (v / max).log10() / decades
                }
            }
        }
    }

    /// The values at the two ends of the colour bar.
    pub fn range(&self) -> (f64, f64) {
        match *self {
            Mapping::Symmetric { max } => (-max, max),
            Mapping::Linear { max } => (0.0, max),
            Mapping::Log { max, decades } => (max * 10f64.powf(-decades), max),
        }
    }

    pub fn max(&self) -> f64 {
        self.range().1
    }

    /// Inverse of `t`: the value at position t on the bar.
    pub fn value(&self, t: f64) -> f64 {
        match *self {
            Mapping::Symmetric { max } => (2.0 * t - 1.0) * max,
            Mapping::Linear { max } => t * max,
            Mapping::Log { max, decades } => max * 10f64.powf((t - 1.0) * decades),
        }
    }

    pub fn is_log(&self) -> bool {
        matches!(self, Mapping::Log { .. })
    }
}

/// The mapping for a set of values: symmetric about zero for signed fields (so the
/// zero colour means zero), from zero otherwise. A field that is zero everywhere
/// gets a unit range rather than a division by zero.
pub fn mapping_for(values: &[f64], signed: bool, log_decades: Option<f64>) -> Mapping {
    let max = values
        .iter()
        .filter(|v| v.is_finite())
        .fold(
            0.0f64,
            |m, v| if signed { m.max(v.abs()) } else { m.max(*v) },
        );
    let max = if max > 0.0 { max } else { 1.0 };
    match (signed, log_decades) {
        (true, _) => Mapping::Symmetric { max },
        (false, Some(decades)) => Mapping::Log { max, decades },
        (false, None) => Mapping::Linear { max },
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn default_phase_pair_is_orange_positive_purple_negative() {
        let s = Scale::default_for(true);
        let pos = s.at(1.0);
        let neg = s.at(0.0);
        // Orange has more red than blue, purple more blue than red (common practice).
        assert!(pos.r > pos.b && neg.b > neg.r, "{pos:?} {neg:?}");
        // The zero colour is the gradient's own midpoint: light and close to grey
        // (colorous smooths the ColorBrewer points with a basis spline).
        let zero = s.at(0.5);
        let spread = zero.r.max(zero.g).max(zero.b) - zero.r.min(zero.g).min(zero.b);
        assert!(
            zero.r.min(zero.g).min(zero.b) > 225 && spread < 12,
            "{zero:?}"
        );
    }

    #[test]
    fn mappings_invert_and_names_check() {
        let m = Mapping::Log {
            max: 2.0,
            decades: 3.0,
        };
        assert!((m.value(m.t(0.05)) - 0.05).abs() < 1e-15);
        assert_eq!(mapping_for(&[-3.0, 1.0], true, None).range(), (-3.0, 3.0));
        assert!(Scale::by_name("purple-orange").is_ok());
        assert!(Scale::by_name("jet").is_err());
    }
}
