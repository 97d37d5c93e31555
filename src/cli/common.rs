//! Pieces several subcommands share: loading a model, length flags, notes.

use std::path::Path;

use crate::chem::LengthUnit;
use crate::error::Result;
use crate::model::{self, Model};

/// Loads a model file (TOML).
pub fn load_model(path: &Path) -> Result<Model> {
    model::load(path)
}

/// Converts a length flag to bohr.
pub fn length(value: f64, unit: LengthUnit) -> f64 {
    unit.to_bohr(value)
}

/// Prints the statements that must accompany the numbers.
pub fn print_notes(notes: &[String]) {
    for n in notes {
        println!("note: {n}");
    }
}
