//! Pieces several subcommands share: loading a model, length flags, notes.

use std::path::Path;

use clap::Args;

use lobecast::budget::check_count;
use lobecast::error::{Error, Result};
use lobecast::io::model::{self, LoadOptions, Model};
use lobecast::solve::MethodKind;

/// Loads a model file (TOML) or an orbital file.
pub fn load_model(path: &Path) -> Result<Model> {
    model::load(path)
}

/// How to treat an XYZ file given in place of a model file.
#[derive(Debug, Args, Clone, Default)]
pub struct XyzFlags {
    /// For an XYZ file: how to get the orbitals: rhf or uhf (Hartree–Fock, with
    /// --basis), or extended-huckel (qualitative valence orbitals)
    #[arg(long, value_name = "METHOD")]
    pub method: Option<String>,
    /// For an XYZ file with --method rhf/uhf: the basis set (sto-3g, 3-21g, 6-31g,
    /// 6-31g*, 6-31g**, cc-pvdz)
    #[arg(long, value_name = "SET")]
    pub basis: Option<String>,
    /// For an XYZ file with --basis: d (and f) functions as pure real solid harmonics
    /// or Cartesian components [default: the set's own convention: Pople sets
    /// Cartesian, cc-pvdz pure]
    #[arg(long, value_name = "FORM", value_parser = super::values::angular_form())]
    pub functions: Option<lobecast::basis::named::AngularForm>,
    /// For an XYZ file: the net charge of the molecule [default: 0]
    #[arg(long, allow_negative_numbers = true, value_name = "Q")]
    pub charge: Option<i32>,
    /// For an XYZ file with --method rhf/uhf: the spin multiplicity 2S+1
    /// [default: 1 for an even electron count, 2 for an odd one]
    #[arg(long, value_name = "M", allow_negative_numbers = true)]
    pub multiplicity: Option<i64>,
    /// Hartree–Fock: the most SCF iterations before giving up [default: 128]
    #[arg(long, value_name = "N", allow_negative_numbers = true)]
    pub max_iterations: Option<i64>,
    /// Hartree–Fock: the first density, from superposed spherical free atoms or from
    /// the core Hamiltonian's orbitals [default: atoms]
    #[arg(long, value_name = "START", value_parser = super::values::guess())]
    pub guess: Option<lobecast::solve::scf::Guess>,
    /// Orbitals read from a file: scale each to ⟨ψ|ψ⟩ = 1 for this run (a note says
    /// how many were off and by how much)
    #[arg(long)]
    pub renormalize: bool,
    /// Unrestricted orbitals: the spin channel that orbital fields use [default: alpha]
    #[arg(long, value_name = "SPIN", value_parser = super::values::channel())]
    pub spin: Option<lobecast::solve::orbitals::Channel>,
}

impl XyzFlags {
    pub fn options(&self) -> Result<LoadOptions> {
        let multiplicity = self
            .multiplicity
            .map(|m| {
                u32::try_from(m)
                    .ok()
                    .filter(|&m| (1..=1000).contains(&m))
                    .ok_or_else(|| {
                        Error::input(format!("--multiplicity must be 1 to 1000, got {m}"))
                    })
            })
            .transpose()?;
        let max = lobecast::io::model::MAX_SCF_ITERATIONS;
        let max_iterations = self
            .max_iterations
            .map(|n| {
                usize::try_from(n)
                    .ok()
                    .filter(|&n| (1..=max).contains(&n))
                    .ok_or_else(|| {
                        Error::input(format!("--max-iterations must be 1 to {max}, got {n}"))
                    })
            })
            .transpose()?;
        Ok(LoadOptions {
            method: self.method.as_deref().map(MethodKind::parse).transpose()?,
            charge: self.charge,
            basis: self.basis.clone(),
            functions: self.functions,
            multiplicity,
            max_iterations,
            spin: self.spin,
            renormalize: self.renormalize,
            guess: self.guess,
        })
    }
}

/// `--memory`, for the commands that hold large data (same parsing and default as
/// `solve`'s). Every refusal over the budget names the estimate and this option.
#[derive(Debug, Args, Clone)]
pub struct MemoryFlag {
    /// Memory budget (e.g. 512M, 8G): a job estimated to need more is refused
    /// before it starts, with the estimate
    #[arg(long, value_name = "SIZE", default_value = lobecast::budget::DEFAULT_MEMORY_TEXT, value_parser = lobecast::budget::parse_size)]
    pub memory: u64,
}

/// Loads a model file, an orbital file, or an XYZ file with the method flags.
pub fn load_model_with(path: &Path, flags: &XyzFlags) -> Result<Model> {
    model::load_with(path, &flags.options()?)
}

/// Writes a report to standard output (to standard error while an output file goes
/// to standard output, so the data stays clean); a closed pipe (`lobecast … | head`)
/// ends the output quietly instead of panicking as `println!` would.
pub fn print_out(text: &str) -> Result<()> {
    use std::io::Write;
    let written = if lobecast::output::stdout_taken() {
        std::io::stderr().lock().write_all(text.as_bytes())
    } else {
        std::io::stdout().lock().write_all(text.as_bytes())
    };
    match written {
        Err(e) if e.kind() != std::io::ErrorKind::BrokenPipe => Err(lobecast::Error::internal(
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

/// Reads a count option and checks it against its documented range. Negative and
/// huge values are read as numbers first, so the message can say why they are refused.
pub fn parse_count(name: &str, text: &str, min: u64, max: u64) -> Result<u64> {
    let whole = text.trim().parse::<i128>().map_err(|_| {
        Error::input(format!(
            "{name} takes a whole number from {min} to {max}, got {text:?}"
        ))
    })?;
    let value = u64::try_from(whole).map_err(|_| {
        Error::input(format!(
            "{name} {whole} is outside the accepted range {min} to {max}"
        ))
    })?;
    check_count(name, value, min, max).map_err(|e| {
        if name == "--size" {
            e.with_hint("--size is the width of the figure in pixels")
        } else {
            e
        }
    })?;
    Ok(value)
}

/// A number the user typed, shown back in a message: plain for ordinary
/// magnitudes, in exponent form for huge or tiny ones (never 300 digits).
pub fn shown(x: f64) -> String {
    let a = x.abs();
    if a != 0.0 && !(1e-4..1e6).contains(&a) {
        format!("{x:e}")
    } else {
        format!("{x}")
    }
}

/// `--dpi`, for every command that writes a PNG figure.
#[derive(Debug, Args, Clone)]
pub struct FigureFlags {
    /// Physical resolution recorded in the figure (dots per inch, 10 to 10000; an SVG
    /// states the matching size): the size at which a report's layout program places it
    #[arg(long, value_name = "DPI", default_value_t = lobecast::io::png::DEFAULT_DPI, allow_negative_numbers = true)]
    pub dpi: f64,
}

impl FigureFlags {
    /// What every PNG records besides its pixels: resolution, title, and the command
    /// line that made it.
    pub fn meta(&self, title: Option<String>) -> Result<lobecast::io::png::PngMeta> {
        let (lo, hi) = lobecast::io::png::DPI_RANGE;
        if !(self.dpi >= lo && self.dpi <= hi) {
            return Err(Error::input(format!(
                "--dpi must be between {lo} and {hi}, got {}",
                shown(self.dpi)
            )));
        }
        Ok(lobecast::io::png::PngMeta {
            dpi: self.dpi,
            title: title.map(|t| lobecast::render::text::plain(&t)),
            command: Some(command_line()),
        })
    }
}

/// The figure format `--png FILE` asks for, from FILE's extension (`.png`, `.svg`;
/// `-` is PNG on standard output), checked before any work is done.
pub fn figure_format(path: Option<&Path>) -> Result<lobecast::render::FigureFormat> {
    match path {
        Some(p) => lobecast::render::FigureFormat::from_path(p).map_err(|e| e.context("--png")),
        None => Ok(lobecast::render::FigureFormat::Png),
    }
}

/// The command line as typed (arguments with spaces quoted), for provenance.
pub fn command_line() -> String {
    std::env::args_os()
        .map(|a| {
            let a = a.to_string_lossy().into_owned();
            if a.is_empty() || a.contains(|c: char| c.is_whitespace() || c == '\'') {
                format!("'{}'", a.replace('\'', r"'\''"))
            } else {
                a
            }
        })
        .collect::<Vec<_>>()
        .join(" ")
}
