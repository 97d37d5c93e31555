//! `lobecast levels`: the orbital energy-level diagram (PNG) and, with fragments,
//! the weight of every fragment orbital in every molecular orbital (CSV).

use std::path::PathBuf;

use clap::Args;

use super::common::{XyzFlags, load_model_with, parse_count, print_notes, say, shown};
use super::levels_diagram::{csv_text, diagram};
use super::levels_thumbs as thumbs;
use lobecast::error::{Error, Result};
use lobecast::output::OutputPlan;
use lobecast::plot::levels::draw;
use lobecast::solve::fragments::{self, FragmentSpec};
use lobecast::solve::{Method, orbitals_within};

pub const MAX_SIZE: u64 = 4000;
pub const MAX_AROUND: u64 = 10_000;
/// Levels closer than this (eV) are drawn side by side as one degenerate level.
pub const DEGENERATE_EV: f64 = 1e-4;

#[derive(Debug, Args)]
pub struct LevelsArgs {
    /// Model file (.toml), orbital file (.json, levels only) or XYZ file with --method
    pub source: PathBuf,
    #[command(flatten)]
    pub xyz: XyzFlags,
    /// Two fragments as 1-based atom lists split by ':', e.g. 1-3:4-6 or 1:2; every
    /// atom in exactly one; each is solved alone, neutral, by the same method
    #[arg(long, value_name = "ATOMS")]
    pub fragments: Option<String>,
    /// Draw a line where a fragment orbital's weight in a molecular orbital exceeds
    /// this (0 to 1)
    #[arg(long, default_value = "0.1", allow_negative_numbers = true)]
    pub threshold: f64,
    /// Energy unit of the axis and the window: ev or hartree
    #[arg(long, default_value = "ev")]
    pub unit: String,
    /// Energies shown, LOW,HIGH in --unit [default: the frontier levels; core levels
    /// below −3 hartree are left out]
    #[arg(long, allow_hyphen_values = true, value_name = "LOW,HIGH")]
    pub window: Option<String>,
    /// Levels shown below the HOMO and above the LUMO when no --window is given, 0 to 10000
    #[arg(
        long,
        value_name = "N",
        default_value = "5",
        allow_negative_numbers = true
    )]
    pub levels_around: String,
    /// Write the diagram as a figure: FILE.png or FILE.svg
    #[arg(long, value_name = "FILE")]
    pub png: Option<PathBuf>,
    /// Write every level (and with --fragments every weight) as CSV
    #[arg(long, value_name = "FILE")]
    pub csv: Option<PathBuf>,
    /// Title instead of the automatic one
    #[arg(long)]
    pub title: Option<String>,
    /// Width of the figure in pixels, 300 to 4000; a diagram grows to at least 420
    /// (680 with fragments) so that its text never overlaps
    #[arg(
        long,
        value_name = "PIXELS",
        default_value = "900",
        allow_negative_numbers = true
    )]
    pub size: String,
    /// Small 3-D pictures of these orbitals beside their levels, e.g. homo-1,homo,lumo
    /// (up to 6; surfaces enclosing 90 % of ∫ψ² dV, as `surface` draws them)
    #[arg(long, value_name = "ORBITALS")]
    pub thumbnails: Option<String>,
    #[command(flatten)]
    pub memory: super::common::MemoryFlag,
    #[command(flatten)]
    pub figure: super::common::FigureFlags,
}

/// The options, read and checked before anything is loaded.
pub(super) struct Request {
    pub(super) ev: bool,
    pub(super) window: Option<(f64, f64)>,
    pub(super) around: usize,
    pub(super) size: u32,
    pub(super) fragments: Option<FragmentSpec>,
    pub(super) thumbnails: Vec<lobecast::field::Field>,
}

fn read_request(args: &LevelsArgs) -> Result<Request> {
    if args.png.is_none() && args.csv.is_none() {
        return Err(Error::input(
            "nothing to write: give --png FILE and/or --csv FILE",
        ));
    }
    let ev = match args.unit.trim().to_ascii_lowercase().as_str() {
        "ev" => true,
        "hartree" => false,
        _ => {
            return Err(Error::input(format!("unknown --unit {:?}", args.unit))
                .with_hint("give ev or hartree"));
        }
    };
    if !(0.0..=1.0).contains(&args.threshold) {
        return Err(Error::input(format!(
            "--threshold must be between 0 and 1, got {}",
            shown(args.threshold)
        )));
    }
    let around = parse_count("--levels-around", &args.levels_around, 0, MAX_AROUND)? as usize;
    let size = parse_count("--size", &args.size, 300, MAX_SIZE)? as u32;
    let window = args.window.as_deref().map(parse_window).transpose()?;
    let fragments = args
        .fragments
        .as_deref()
        .map(FragmentSpec::parse)
        .transpose()?;
    if let Some(f) = &fragments
        && args.png.is_some()
        && f.len() != 2
    {
        return Err(Error::input(format!(
            "a level diagram draws two fragments, got {}",
            f.len()
        ))
        .with_hint("more fragments are written with --csv alone"));
    }
    let thumbnails = match (&args.thumbnails, &args.png) {
        (Some(t), Some(_)) => thumbs::parse(t)?,
        (Some(_), None) => {
            return Err(Error::input(
                "--thumbnails are drawn in the figure: give --png FILE",
            ));
        }
        (None, _) => Vec::new(),
    };
    Ok(Request {
        ev,
        window,
        around,
        size,
        fragments,
        thumbnails,
    })
}

fn parse_window(text: &str) -> Result<(f64, f64)> {
    let bad = || {
        Error::input(format!("cannot read --window {text:?}"))
            .with_hint("give LOW,HIGH in --unit with LOW below HIGH, e.g. -20,5")
    };
    let (a, b) = text.split_once(',').ok_or_else(bad)?;
    let (a, b): (f64, f64) = (
        a.trim().parse().map_err(|_| bad())?,
        b.trim().parse().map_err(|_| bad())?,
    );
    if !(a.is_finite() && b.is_finite() && a < b) {
        return Err(bad());
    }
    Ok((a, b))
}

pub fn run(args: LevelsArgs) -> Result<()> {
    let mut meta = args.figure.meta(None)?;
    let format = super::common::figure_format(args.png.as_deref())?;
    let req = read_request(&args)?;
    let model = load_model_with(&args.source, &args.xyz)?;
    let groups = match &req.fragments {
        Some(_) if matches!(model.method, Method::Given(_)) => {
            return Err(fragments::given_refused());
        }
        Some(f) => Some(f.resolve(model.molecule.atoms.len())?),
        None => None,
    };
    let mut plan = OutputPlan::new(&model.inputs);
    let png = plan.add_opt(args.png.as_deref(), true)?;
    let csv = plan.add_opt(args.csv.as_deref(), false)?;
    let mut set = orbitals_within(
        &model.molecule,
        &model.method,
        args.memory.memory,
        &mut |_| {},
    )?;
    // The diagram draws one channel: alpha, or beta on request.
    if let Some(c) = args.xyz.spin {
        set.show(c)?;
        set.orbitals = set.shown().to_vec();
    }
    if set.orbitals.is_empty() {
        return Err(Error::input("the source has no orbitals to draw"));
    }
    let (frags, weights) = match &groups {
        Some(g) => {
            let f = fragments::solve_fragments(&set, &model.method, g, args.memory.memory)?;
            let w = fragments::weights(&set, &f)?;
            (f, w)
        }
        None => (Vec::new(), Vec::new()),
    };
    let mut files = Vec::new();
    if let Some(slot) = csv {
        files.push((slot, csv_text(&set, &frags, &weights).into_bytes()));
    }
    if let Some(slot) = png {
        let mut d = diagram(&args, &req, &set, &frags, &weights)?;
        let numbers = thumbs::numbers(&req.thumbnails, &set)?;
        if let Some(n) = numbers
            .iter()
            .find(|n| !d.middle.levels.iter().any(|l| l.number == **n))
        {
            return Err(Error::input(format!(
                "--thumbnails: orbital {n} is outside the diagram's energy window"
            ))
            .with_hint("widen --window or --levels-around, or choose orbitals near the frontier"));
        }
        if !numbers.is_empty() {
            d.thumbnails = thumbs::pictures(&set, &req.thumbnails, &numbers, args.memory.memory)?;
            d.footnotes.push(format!(
                "Pictures: surfaces enclosing {:.0} % of ∫ψ² dV (orange ψ > 0, purple ψ < 0), one view and scale for all.",
                100.0 * thumbs::ENCLOSE
            ));
        }
        meta.title = Some(lobecast::render::text::plain(&d.title));
        files.push((slot, draw(&d)?.encode(format, &meta)?));
    }
    let mut out = plan.open()?;
    for (slot, bytes) in &files {
        out.put(*slot, bytes)?;
    }
    for name in out.commit()? {
        say!("wrote {name}");
    }
    print_notes(&set.statements())?;
    Ok(())
}
