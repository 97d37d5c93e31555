//! The box options `volume` and `surface` share: spacing or points, padding, unit.

use clap::Args;

use super::common::{parse_count, shown};
use lobecast::chem::{LengthUnit, Molecule};
use lobecast::error::{Error, Result};
use lobecast::grid::{GridBox, Resolution};

/// Default box padding around the outermost nuclei (bohr).
pub const DEFAULT_PADDING_BOHR: f64 = 5.0;
/// Default point spacing (bohr); fine enough for valence orbitals (common practice).
pub const DEFAULT_SPACING_BOHR: f64 = 0.15;
/// Largest `--points`: 10000³ points is far beyond any cube a viewer opens.
pub const MAX_POINTS_PER_EDGE: u64 = 10_000;

#[derive(Debug, Args, Clone)]
pub struct BoxFlags {
    /// Distance between grid points, in --units [default: 0.15 bohr, which is 0.0794 Å]
    #[arg(long, conflicts_with = "points", value_name = "LENGTH")]
    pub spacing: Option<f64>,
    /// Exactly N points along the longest edge of the box (2 to 10000), instead of
    /// --spacing; the other edges get as many as the same spacing needs
    #[arg(long, value_name = "N")]
    pub points: Option<String>,
    /// Space between the outermost nuclei and the box faces, in --units
    /// [default: 5 bohr, which is 2.646 Å]
    #[arg(long, value_name = "LENGTH")]
    pub padding: Option<f64>,
    /// Unit of --spacing and --padding
    #[arg(long, value_parser = super::values::length_unit(), default_value = "angstrom")]
    pub units: LengthUnit,
}

impl BoxFlags {
    /// Whether any box option was given (a cube file's own grid takes none).
    pub fn any(&self) -> bool {
        self.spacing.is_some() || self.points.is_some() || self.padding.is_some()
    }

    /// Refuses bad lengths in the unit the user typed them in, before any work.
    pub fn check(&self) -> Result<()> {
        let unit = self.units.symbol();
        if let Some(h) = self.spacing
            && !(h.is_finite() && h > 0.0)
        {
            return Err(Error::input(format!(
                "--spacing must be a positive length, got {} {unit}",
                shown(h)
            )));
        }
        if let Some(p) = self.padding
            && !(p.is_finite() && p >= 0.0)
        {
            return Err(Error::input(format!(
                "--padding must be zero or a positive length, got {} {unit}",
                shown(p)
            )));
        }
        if let Some(n) = &self.points {
            parse_count("--points", n, 2, MAX_POINTS_PER_EDGE)?;
        }
        Ok(())
    }

    /// The box around `molecule` these options describe.
    pub fn grid(&self, molecule: &Molecule) -> Result<GridBox> {
        let padding = self
            .padding
            .map_or(DEFAULT_PADDING_BOHR, |p| self.units.to_bohr(p));
        let resolution = match (self.spacing, self.points.as_deref()) {
            (_, Some(n)) => {
                Resolution::Points(parse_count("--points", n, 2, MAX_POINTS_PER_EDGE)? as usize)
            }
            (Some(h), None) => Resolution::Spacing(self.units.to_bohr(h)),
            (None, None) => Resolution::Spacing(DEFAULT_SPACING_BOHR),
        };
        GridBox::around(molecule, padding, resolution)
    }
}
