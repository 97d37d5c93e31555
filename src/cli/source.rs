//! What a figure or profile is drawn from. A `Source` gives the atoms and evaluates
//! fields at arbitrary points; the figure code never knows which kind it has.
//!
//! Plug-in point: a new kind of input (a cube file through `cube::Volume`, an orbital
//! file, an XYZ file with method flags) is one more `Source` variant, one more arm
//! in `load`, `molecule`, `sampler`, `info` and `provenance`, and one `Sampler`
//! variant whose `evaluate` fills the values (for a cube: trilinear `value_at`).

use std::path::{Path, PathBuf};

use crate::chem::Molecule;
use crate::chem::units::hartree_to_ev;
use crate::error::{Error, Result};
use crate::field::{Field, FieldSampler};
use crate::model;
use crate::solve::{OrbitalSet, orbitals_for};

pub enum Source {
    /// Orbitals built from a model file: exact values anywhere.
    Orbitals {
        set: OrbitalSet,
        inputs: Vec<PathBuf>,
    },
}

/// Evaluates prepared fields at points, values interleaved per point.
pub enum Sampler {
    Orbitals(FieldSampler),
}

impl Sampler {
    pub fn evaluate(&self, points: &[[f64; 3]], out: &mut [f64]) {
        match self {
            Sampler::Orbitals(s) => s.evaluate(points, out),
        }
    }
}

/// How a field is labelled in figures (markup) and in plain output.
#[derive(Debug, Clone)]
pub struct FieldInfo {
    /// "orbital 1, E = −0.5648 hartree (−15.37 eV)".
    pub heading: String,
    /// "ψ_{1}".
    pub quantity: String,
    /// "ψ": the symbol without the orbital number.
    pub family: String,
    /// "ψ_{1}, E = −0.5648 hartree": a panel heading.
    pub short: String,
    /// "bohr^{−3/2}".
    pub unit: String,
    /// Plain text for CSV headers and messages.
    pub plain: String,
    pub signed: bool,
}

impl Source {
    /// Reads a source by its file type.
    pub fn load(path: &Path) -> Result<Self> {
        let ext = path
            .extension()
            .map(|e| e.to_string_lossy().to_ascii_lowercase())
            .unwrap_or_default();
        match ext.as_str() {
            "toml" => {
                let m = model::load(path)?;
                let set = orbitals_for(&m)?;
                Ok(Source::Orbitals {
                    set,
                    inputs: m.inputs,
                })
            }
            _ => Err(Error::input(format!(
                "cannot use {} as a source: expected a model file (.toml)",
                path.display()
            ))
            .with_hint("give a lobecast model file, e.g. examples/h2-cation.toml")),
        }
    }

    pub fn molecule(&self) -> &Molecule {
        match self {
            Source::Orbitals { set, .. } => &set.molecule,
        }
    }

    /// Every file read, so that no output replaces one of them.
    pub fn inputs(&self) -> &[PathBuf] {
        match self {
            Source::Orbitals { inputs, .. } => inputs,
        }
    }

    /// Statements that must go with the figure (the minimal-basis caution, …).
    pub fn notes(&self) -> Vec<String> {
        match self {
            Source::Orbitals { set, .. } => set.notes.clone(),
        }
    }

    /// How the values were obtained, for captions.
    pub fn provenance(&self) -> String {
        match self {
            Source::Orbitals { set, .. } => {
                format!(
                    "{}; values computed exactly at every sample point",
                    set.method
                )
            }
        }
    }

    pub fn sampler(&self, fields: &[Field]) -> Result<Sampler> {
        match self {
            Source::Orbitals { set, .. } => Ok(Sampler::Orbitals(FieldSampler::new(set, fields)?)),
        }
    }

    pub fn info(&self, field: &Field) -> Result<FieldInfo> {
        match self {
            Source::Orbitals { set, .. } => orbital_info(set, field),
        }
    }
}

fn orbital_info(set: &OrbitalSet, field: &Field) -> Result<FieldInfo> {
    let n = field.orbital_number(set)?;
    let energy = |n: usize| {
        let e = set.orbitals[n - 1].energy;
        format!(
            "E = {} hartree ({} eV)",
            minus(format!("{e:.4}")),
            minus(format!("{:.2}", hartree_to_ev(e)))
        )
    };
    let (heading, quantity, plain) = match field {
        Field::Orbital(_) => (
            format!("orbital {n}, {}", energy(n)),
            format!("ψ_{{{n}}}"),
            format!("orbital {n}"),
        ),
        Field::OrbitalDensity(_) => (
            format!("density of orbital {n}, {}", energy(n)),
            format!("|ψ_{{{n}}}|^{{2}}"),
            format!("orbital density {n}"),
        ),
        Field::OrbitalDeformation(_) => (
            format!("deformation density of orbital {n}, {}", energy(n)),
            format!("Δρ_{{{n}}}"),
            format!("orbital deformation density {n}"),
        ),
        Field::Density => (
            "electron density".to_string(),
            "ρ".to_string(),
            "electron density".to_string(),
        ),
    };
    let unit = match field {
        Field::Orbital(_) => "bohr^{−3/2}",
        _ => "e bohr^{−3}",
    };
    let short = match field {
        Field::Density => quantity.clone(),
        _ => format!(
            "{quantity}, E_{{{n}}} = {} hartree",
            minus(format!("{:.4}", set.orbitals[n - 1].energy))
        ),
    };
    let family = match field {
        Field::Orbital(_) => "ψ",
        Field::OrbitalDensity(_) => "|ψ|^{2}",
        Field::OrbitalDeformation(_) => "Δρ",
        Field::Density => "ρ",
    };
    Ok(FieldInfo {
        heading,
        family: family.to_string(),
        short,
        quantity,
        unit: unit.to_string(),
        plain: format!("{plain} ({})", field.unit()),
        signed: field.is_signed(),
    })
}

/// Replaces a hyphen-minus with a true minus sign for figures.
pub fn minus(s: String) -> String {
    s.replace('-', "−")
}
