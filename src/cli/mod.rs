//! The command line: clap definitions (one file per subcommand) and the mapping of
//! errors to exit codes. No science lives here.

mod combine;
mod common;
mod curve;
mod curve_charts;
mod curve_report;
pub mod demo;
mod inspect;
mod profile;
mod slice;
mod solve;
pub mod source;
mod volume;

use clap::{Parser, Subcommand};

use crate::error::{Error, Kind};

#[derive(Debug, Parser)]
#[command(
    name = "lobecast",
    version,
    about = "LCAO molecular orbitals to cube volumes, energy curves and the integrals behind them",
    long_about = "lobecast builds molecular orbitals as linear combinations of atom-centred functions \
                  and turns them into cube volumes for 3-D viewers and into the overlap, Coulomb and \
                  exchange integrals and energies behind them.\n\nLengths on the command line are in \
                  ångström unless --units bohr is given; energies are reported in hartree (and eV)."
)]
pub struct Cli {
    #[command(subcommand)]
    command: Command,
}

#[derive(Debug, Subcommand)]
enum Command {
    /// Write the built-in gallery: energy curves, orbital and deformation figures, cube files
    Demo(demo::DemoArgs),
    /// Solve a model and print its orbital energies, occupations and make-up
    Solve(solve::SolveArgs),
    /// Scan the separation of a two-centre one-electron model: S, J, K and both energies
    Curve(curve::CurveArgs),
    /// Sample one or more fields on a box and write a cube file
    Volume(volume::VolumeArgs),
    /// Show what a cube file holds: header, grid, and per field min, max, mean,
    /// integrals and the isovalue enclosing a chosen fraction
    Inspect(inspect::InspectArgs),
    /// Weighted sum of cube fields on one grid (e.g. a.cube:1 b.cube:-1)
    Combine(combine::CombineArgs),
    /// Draw a field (or several side by side) on a plane as a PNG figure
    Slice(slice::SliceArgs),
    /// Follow fields along a line between atoms or points: CSV and a PNG chart
    Profile(profile::ProfileArgs),
}

/// Runs the program on the process arguments and returns the exit status.
pub fn main() -> i32 {
    let cli = match Cli::try_parse() {
        Ok(cli) => cli,
        Err(e) => return clap_exit(e),
    };
    let result = match cli.command {
        Command::Demo(a) => demo::run(a),
        Command::Solve(a) => solve::run(a),
        Command::Curve(a) => curve::run(a),
        Command::Volume(a) => volume::run(a),
        Command::Inspect(a) => inspect::run(a),
        Command::Combine(a) => combine::run(a),
        Command::Slice(a) => slice::run(a),
        Command::Profile(a) => profile::run(a),
    };
    match result {
        Ok(()) => 0,
        Err(e) => report(&e),
    }
}

/// Prints `error: …` (and `hint: …`) on standard error and returns the exit status.
pub fn report(e: &Error) -> i32 {
    eprintln!("error: {}", e.message);
    if let Some(h) = &e.hint {
        eprintln!("hint: {h}");
    }
    match e.kind {
        Kind::Input => 2,
        Kind::Internal => 1,
    }
}

/// Help and version go to standard output with status 0; usage errors are cut to
/// the one-line `error:` form with a hint, status 2.
fn clap_exit(e: clap::Error) -> i32 {
    use clap::error::ErrorKind as K;
    match e.kind() {
        K::DisplayHelp | K::DisplayVersion => {
            print!("{e}");
            0
        }
        _ => {
            let text = e.render().to_string();
            let first = text.lines().next().unwrap_or("error: bad usage");
            let message = first.strip_prefix("error: ").unwrap_or(first).to_string();
            report(
                &Error::input(message)
                    .with_hint("run 'lobecast --help' or 'lobecast COMMAND --help' for usage"),
            )
        }
    }
}
