//! What to evaluate: the `Field` enum, parsed from `orbital:N`, `orbital-density:N`,
//! `orbital-deformation:N`, `density` and `deformation`, and its batched evaluation at points.

pub mod buildup;
mod combine;
mod eval;
pub mod gradient;
mod groups;
#[cfg(test)]
mod identity;
mod lattice;
#[cfg(test)]
mod reference;
mod scratch;

/// Points per evaluation tile: a tile's basis values (functions × TILE doubles) stay
/// in the second-level cache for the ~100 functions of the molecules this tool is
/// for. A multiple of 8, the widest register block of `combine`.
const TILE: usize = 128;

pub use eval::FieldSampler;

use crate::error::{Error, Result};
use crate::solve::{OrbitalSelector, OrbitalSet};

#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Field {
    /// ψ_N itself (signed), bohr^(-3/2).
    Orbital(OrbitalSelector),
    /// |ψ_N|², bohr⁻³.
    OrbitalDensity(OrbitalSelector),
    /// |ψ_N|² − Σ_μ q_μ φ_μ², with q_μ the Mulliken gross populations of orbital N:
    /// where the orbital gains and loses density against its own atomic pieces.
    /// It integrates to zero. bohr⁻³.
    OrbitalDeformation(OrbitalSelector),
    /// Σ_i n_i |ψ_i|² over occupied orbitals (both spins), bohr⁻³.
    Density,
    /// ρ_α − ρ_β of unrestricted orbitals, bohr⁻³. Integrates to 2S.
    SpinDensity,
    /// Density minus the superposition of neutral, spherical free atoms in the same
    /// functions: Σ_i n_i |ψ_i|² − Σ_μ n⁰_μ φ_μ², with n⁰ the free-atom ground-state
    /// occupations (p spread evenly). Integrates to −charge. bohr⁻³.
    Deformation,
    /// The K-th field stored in a cube file (from 1), interpolated between its points.
    Stored(usize),
}

const ACCEPTED: &str = "orbital:N, orbital-density:N, orbital-deformation:N (N a number, homo, lumo, homo-1, lumo+1, …), density, spin-density, deformation, or stored:K for the K-th field of a cube file";

impl Field {
    pub fn parse(text: &str) -> Result<Self> {
        let t = text.trim();
        let bad = || {
            Error::input(format!("unknown field {text:?}"))
                .with_hint(format!("fields are {ACCEPTED}"))
        };
        match t.split_once(':') {
            None if t.eq_ignore_ascii_case("density") => Ok(Field::Density),
            None if t.eq_ignore_ascii_case("deformation") => Ok(Field::Deformation),
            None if t.eq_ignore_ascii_case("spin-density") => Ok(Field::SpinDensity),
            None => Err(bad()),
            Some((kind, k)) if kind.eq_ignore_ascii_case("stored") => {
                match k.trim().parse::<usize>() {
                    Ok(k) if k >= 1 => Ok(Field::Stored(k)),
                    _ => Err(Error::input(format!(
                        "stored:K needs a field number from 1, got {k:?}"
                    ))),
                }
            }
            Some((kind, sel)) => {
                let sel = OrbitalSelector::parse(sel)?;
                match kind.to_ascii_lowercase().as_str() {
                    "orbital" => Ok(Field::Orbital(sel)),
                    "orbital-density" => Ok(Field::OrbitalDensity(sel)),
                    "orbital-deformation" => Ok(Field::OrbitalDeformation(sel)),
                    _ => Err(bad()),
                }
            }
        }
    }

    pub fn selector(&self) -> Option<OrbitalSelector> {
        match self {
            Field::Orbital(s) | Field::OrbitalDensity(s) | Field::OrbitalDeformation(s) => Some(*s),
            Field::Density | Field::SpinDensity | Field::Deformation | Field::Stored(_) => None,
        }
    }

    /// Whether the field takes both signs (drives colour scales and isovalues).
    pub fn is_signed(&self) -> bool {
        matches!(
            self,
            Field::Orbital(_)
                | Field::OrbitalDeformation(_)
                | Field::Deformation
                | Field::SpinDensity
        )
    }

    /// Unit of the field's values in atomic units.
    pub fn unit(&self) -> &'static str {
        match self {
            Field::Orbital(_) => "bohr^-3/2",
            Field::Stored(_) => "the file's units",
            _ => "e/bohr^3",
        }
    }

    /// A one-line description with the resolved orbital number and energy.
    pub fn describe(&self, set: &OrbitalSet) -> Result<String> {
        let kind = match self {
            Field::Orbital(_) => "orbital",
            Field::OrbitalDensity(_) => "orbital density",
            Field::OrbitalDeformation(_) => "orbital deformation density",
            Field::Density => return Ok(format!("electron density ({})", self.unit())),
            Field::SpinDensity => {
                return Ok("spin density ρ_α − ρ_β (bohr^-3)".to_string());
            }
            Field::Deformation => {
                return Ok(format!(
                    "deformation density against neutral spherical atoms ({})",
                    self.unit()
                ));
            }
            Field::Stored(_) => return Err(stored_needs_cube()),
        };
        let i = self
            .selector()
            .expect("orbital fields carry a selector")
            .resolve(set.shown())?;
        let o = &set.shown()[i];
        let kind = if set.is_unrestricted() {
            format!("{} {kind}", set.spin.shown.name())
        } else {
            kind.to_string()
        };
        Ok(format!(
            "{kind} {} (E = {:.6} hartree, occupation {}) in {}",
            i + 1,
            o.energy,
            o.occupation,
            self.unit()
        ))
    }

    /// The 1-based orbital number a field refers to, 0 for the total density.
    pub fn orbital_number(&self, set: &OrbitalSet) -> Result<usize> {
        match (self, self.selector()) {
            (Field::Stored(_), _) => Err(stored_needs_cube()),
            (_, Some(s)) => Ok(s.resolve(set.shown())? + 1),
            (_, None) => Ok(0),
        }
    }
}

pub(crate) fn stored_needs_cube() -> Error {
    Error::input("stored:K selects a field of a cube file; this source holds orbitals")
        .with_hint("use orbital:N, orbital-density:N, orbital-deformation:N or density")
}

impl std::fmt::Display for Field {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            Field::Orbital(s) => write!(f, "orbital:{s}"),
            Field::OrbitalDensity(s) => write!(f, "orbital-density:{s}"),
            Field::OrbitalDeformation(s) => write!(f, "orbital-deformation:{s}"),
            Field::Density => write!(f, "density"),
            Field::Deformation => write!(f, "deformation"),
            Field::SpinDensity => write!(f, "spin-density"),
            Field::Stored(k) => write!(f, "stored:{k}"),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn parses_fields() {
        assert_eq!(
            Field::parse("orbital:2").unwrap(),
            Field::Orbital(OrbitalSelector::Number(2))
        );
        assert_eq!(
            Field::parse("orbital-deformation:homo").unwrap(),
            Field::OrbitalDeformation(OrbitalSelector::Homo(0))
        );
        assert_eq!(Field::parse("DENSITY").unwrap(), Field::Density);
        assert!(Field::parse("orbitals:1").is_err());
        assert!(Field::parse("orbital:x").is_err());
        assert_eq!(
            Field::parse("orbital-density:lumo+1").unwrap().to_string(),
            "orbital-density:lumo+1"
        );
    }
}
