//! Length and energy units. The library works in bohr and hartree throughout; these
//! conversions are used only at the edges (model files, CLI flags, reports).

use serde::Deserialize;

/// CODATA 2018 recommended value of the Bohr radius in ångström.
pub const BOHR_IN_ANGSTROM: f64 = 0.529_177_210_903;
/// CODATA 2018 recommended value of the hartree in electronvolt.
pub const HARTREE_IN_EV: f64 = 27.211_386_245_988;

/// A length unit accepted in model files and on the command line.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Deserialize, Default)]
#[serde(rename_all = "lowercase")]
pub enum LengthUnit {
    #[default]
    Angstrom,
    Bohr,
}

impl LengthUnit {
    /// Converts a length given in this unit to bohr.
    pub fn to_bohr(self, value: f64) -> f64 {
        match self {
            LengthUnit::Angstrom => value / BOHR_IN_ANGSTROM,
            LengthUnit::Bohr => value,
        }
    }

    pub fn symbol(self) -> &'static str {
        match self {
            LengthUnit::Angstrom => "Å",
            LengthUnit::Bohr => "bohr",
        }
    }
}

impl std::str::FromStr for LengthUnit {
    type Err = String;
    fn from_str(s: &str) -> Result<Self, String> {
        match s.to_ascii_lowercase().as_str() {
            "angstrom" => Ok(LengthUnit::Angstrom),
            "bohr" => Ok(LengthUnit::Bohr),
            _ => Err(format!("unknown length unit {s:?} (angstrom or bohr)")),
        }
    }
}

pub fn bohr_to_angstrom(bohr: f64) -> f64 {
    bohr * BOHR_IN_ANGSTROM
}

pub fn hartree_to_ev(hartree: f64) -> f64 {
    hartree * HARTREE_IN_EV
}
