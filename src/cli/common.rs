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

/// Writes to standard output; a closed pipe (`lobecast … | head`) ends the output
/// quietly instead of panicking as `println!` would.
pub fn print_out(text: &str) -> Result<()> {
    use std::io::Write;
    match std::io::stdout().lock().write_all(text.as_bytes()) {
        Err(e) if e.kind() != std::io::ErrorKind::BrokenPipe => Err(crate::Error::internal(
            format!("cannot write to standard output: {e}"),
        )),
        _ => Ok(()),
    }
}

/// `println!` through `print_out`, returning early on a real write error.
macro_rules! say {
    ($($arg:tt)*) => {
        $crate::cli::common::print_out(&format!("{}\n", format_args!($($arg)*)))?
    };
}
pub(crate) use say;

/// Prints the statements that must accompany the numbers.
pub fn print_notes(notes: &[String]) -> Result<()> {
    for n in notes {
        print_out(&format!("note: {n}\n"))?;
    }
    Ok(())
}
