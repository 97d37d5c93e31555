//! The command line: clap definitions (one file per subcommand) and the mapping of
//! errors to exit codes. No science lives here.

mod box_flags;
mod combine;
mod common;
mod curve;
mod curve_charts;
mod curve_report;
pub mod demo;
mod inspect;
mod levels;
mod levels_diagram;
mod levels_thumbs;
mod profile;
mod progress;
mod scf_report;
mod slice;
mod solve;
mod surface;
mod surface_figure;
mod values;
mod volume;

use clap::{Parser, Subcommand};

use lobecast::error::Error;

type Result<T, E> = std::result::Result<T, E>;

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
    /// Draw the orbital energy levels (PNG), optionally with two fragments' levels and
    /// the weights joining them (CSV)
    Levels(levels::LevelsArgs),
    /// Draw isosurfaces in 3-D around the molecule (PNG) and write them as meshes
    /// (glTF, PLY, OBJ)
    Surface(surface::SurfaceArgs),
}

/// Runs the program on the process arguments and returns the exit status.
pub fn main() -> i32 {
    let cli = match parse(std::env::args_os()) {
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
        Command::Levels(a) => levels::run(a),
        Command::Surface(a) => surface::run(a),
    };
    match result {
        Ok(()) => 0,
        Err(e) => report(&e),
    }
}

/// Parses the arguments. Every option that takes a value accepts a negative number
/// (`--extent -5`), so that the command can say why the value is wrong instead of
/// clap calling it an unknown flag.
fn parse<I, T>(args: I) -> Result<Cli, clap::Error>
where
    I: IntoIterator<Item = T>,
    T: Into<std::ffi::OsString> + Clone,
{
    use clap::{CommandFactory, FromArgMatches};
    let command = Cli::command().mut_subcommands(|sub| {
        sub.mut_args(|a| {
            if a.get_action().takes_values() {
                a.allow_negative_numbers(true)
            } else {
                a
            }
        })
    });
    let matches = command.try_get_matches_from(args)?;
    Cli::from_arg_matches(&matches)
}

/// Prints `error: …` (and `hint: …`) on standard error and returns the exit status.
pub fn report(e: &Error) -> i32 {
    eprintln!("error: {}", e.message);
    if let Some(h) = &e.hint {
        eprintln!("hint: {h}");
    }
    e.kind.exit_status()
}

/// Help and version go to standard output with status 0; `lobecast` alone prints
/// the help with status 2. Usage errors become one `error:` line that keeps clap's
/// whole message (every missing argument, the offending value), with clap's tip
/// and the command's usage line as hints; status 2.
fn clap_exit(e: clap::Error) -> i32 {
    use clap::error::ErrorKind as K;
    match e.kind() {
        // Through `print_out`: `lobecast --help | head` ends quietly, not in a panic.
        K::DisplayHelp | K::DisplayVersion => match common::print_out(&e.to_string()) {
            Ok(()) => 0,
            Err(err) => report(&err),
        },
        K::DisplayHelpOnMissingArgumentOrSubcommand => {
            let _ = common::print_out(&e.to_string());
            2
        }
        _ => {
            let (message, hints) = one_line(&e.render().to_string());
            let hint = if hints.is_empty() {
                "run 'lobecast --help' or 'lobecast COMMAND --help' for usage".to_string()
            } else {
                hints.join("; ")
            };
            report(&Error::input(message).with_hint(hint))
        }
    }
}

/// Folds clap's rendered error (a first line, indented continuation lines, a blank
/// line, `tip:` lines and a `Usage:` line) into one message and a list of hints.
fn one_line(text: &str) -> (String, Vec<String>) {
    let mut message = String::new();
    let mut hints = Vec::new();
    let mut in_first_paragraph = true;
    for line in text.lines() {
        let t = line.trim();
        if t.is_empty() {
            in_first_paragraph = false;
            continue;
        }
        if let Some(tip) = t.strip_prefix("tip: ") {
            hints.push(tip.to_string());
        } else if let Some(usage) = t.strip_prefix("Usage: ") {
            hints.push(format!("usage: {usage}"));
        } else if t.starts_with("For more information") {
            continue;
        } else if in_first_paragraph {
            let t = t.strip_prefix("error: ").unwrap_or(t);
            if message.is_empty() {
                message = t.to_string();
            } else {
                let sep = if message.ends_with(':') { " " } else { ", " };
                message.push_str(sep);
                message.push_str(t);
            }
        }
    }
    if message.is_empty() {
        message = "bad usage".into();
    }
    (message, hints)
}

#[cfg(test)]
mod tests {
    use super::*;

    // The layout below is clap's rendered error (common practice for clap 4).
    #[test]
    fn missing_arguments_are_all_named_on_one_line() {
        let text = "error: the following required arguments were not provided:\n  --from <FROM>\n  --to <TO>\n\nUsage: lobecast curve --from <FROM> --to <TO> <MODEL>\n\nFor more information, try '--help'.\n";
        let (m, h) = one_line(text);
        assert_eq!(
            m,
            "the following required arguments were not provided: --from <FROM>, --to <TO>"
        );
        assert_eq!(
            h,
            vec!["usage: lobecast curve --from <FROM> --to <TO> <MODEL>"]
        );
    }

    #[test]
    fn real_clap_errors_keep_their_detail() {
        let e = parse(["lobecast", "curve", "m.toml"]).unwrap_err();
        let (m, _) = one_line(&e.render().to_string());
        assert!(
            m.contains("--from") && m.contains("--to") && m.contains("--step"),
            "{m}"
        );
        let e = parse(["lobecast", "volume", "m.toml", "--bogus"]).unwrap_err();
        let (m, h) = one_line(&e.render().to_string());
        assert!(m.contains("--bogus"), "{m}");
        assert!(!h.is_empty());
    }

    #[test]
    fn negative_numbers_are_values() {
        let cli = parse([
            "lobecast", "volume", "m.toml", "--field", "density", "--out", "x.cube", "--points",
            "-5",
        ]);
        assert!(cli.is_ok(), "-5 must reach the command as a value");
    }
}
