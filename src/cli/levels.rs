//! `lobecast levels`: the orbital energy-level diagram (PNG) and, with fragments,
//! the weight of every fragment orbital in every molecular orbital (CSV).

use std::path::PathBuf;

use clap::Args;

use super::common::{XyzFlags, load_model_with, parse_count, print_notes, say, shown};
use super::levels_thumbs as thumbs;
use lobecast::chem::units::{HARTREE_IN_EV, hartree_to_ev};
use lobecast::error::{Error, Result};
use lobecast::output::OutputPlan;
use lobecast::plot::levels::{Column, Diagram, Level, Link, draw};
use lobecast::render::text::formula_markup;
use lobecast::solve::fragments::{self, Fragment, FragmentSpec};
use lobecast::solve::{Method, OrbitalSet, orbitals_within};

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
    /// Energies shown, LOW,HIGH in --unit [default: the frontier levels]
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
struct Request {
    ev: bool,
    window: Option<(f64, f64)>,
    around: usize,
    size: u32,
    fragments: Option<FragmentSpec>,
    thumbnails: Vec<lobecast::field::Field>,
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
    let set = orbitals_within(
        &model.molecule,
        &model.method,
        args.memory.memory,
        &mut |_| {},
    )?;
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

/// Every (molecular orbital, fragment orbital) pair with its weight; energies in
/// the shortest form that reads back to the same number.
fn csv_text(set: &OrbitalSet, frags: &[Fragment], w: &[Vec<Vec<f64>>]) -> String {
    let mut t = String::from(
        "orbital,energy_ev,energy_hartree,occupation,fragment,fragment_orbital,fragment_energy_ev,fragment_energy_hartree,weight\n",
    );
    for (i, o) in set.orbitals.iter().enumerate() {
        let head = format!(
            "{},{:e},{:e},{}",
            i + 1,
            hartree_to_ev(o.energy),
            o.energy,
            o.occupation
        );
        if frags.is_empty() {
            t += &format!("{head},,,,,\n");
        }
        for (f, frag) in frags.iter().enumerate() {
            for (a, fo) in frag.set.orbitals.iter().enumerate() {
                t += &format!(
                    "{head},{},{},{:e},{:e},{:e}\n",
                    f + 1,
                    a + 1,
                    hartree_to_ev(fo.energy),
                    fo.energy,
                    w[i][f][a]
                );
            }
        }
    }
    t
}

/// An energy of the diagram's unit as a footnote shows it, with a true minus sign.
fn signed(x: f64, ev: bool) -> String {
    let digits = if ev { 2 } else { 4 };
    format!("{x:.digits$}").replace('-', "−")
}

/// "1-3, 5": atom numbers (from 1) in short form.
fn atom_list(atoms: &[usize]) -> String {
    let mut parts: Vec<String> = Vec::new();
    let mut i = 0;
    while i < atoms.len() {
        let mut j = i;
        while j + 1 < atoms.len() && atoms[j + 1] == atoms[j] + 1 {
            j += 1;
        }
        parts.push(if j > i {
            format!("{}–{}", atoms[i] + 1, atoms[j] + 1)
        } else {
            format!("{}", atoms[i] + 1)
        });
        i = j + 1;
    }
    parts.join(", ")
}

fn levels_of(set: &OrbitalSet, to_unit: &dyn Fn(f64) -> f64) -> Vec<Level> {
    let orbitals = set.orbitals.iter().enumerate();
    orbitals
        .map(|(i, o)| Level {
            energy: to_unit(o.energy),
            number: i + 1,
            occupation: o.occupation,
        })
        .collect()
}

/// What the figure shows: the window, the columns cut to it, links and notes.
fn diagram(
    args: &LevelsArgs,
    req: &Request,
    set: &OrbitalSet,
    frags: &[Fragment],
    w: &[Vec<Vec<f64>>],
) -> Result<Diagram> {
    let to_unit = |e: f64| if req.ev { hartree_to_ev(e) } else { e };
    let unit = if req.ev { "eV" } else { "hartree" };
    let mol = levels_of(set, &to_unit);
    let sides: Vec<Vec<Level>> = frags.iter().map(|f| levels_of(&f.set, &to_unit)).collect();
    let homo = set.orbitals.iter().rposition(|o| o.occupation > 1e-12);
    let lumo = homo.map_or(0, |h| h + 1);
    let links: Vec<Link> = w
        .iter()
        .enumerate()
        .flat_map(|(i, per)| {
            per.iter().enumerate().flat_map(move |(f, ws)| {
                ws.iter()
                    .enumerate()
                    .filter(|(_, x)| **x > args.threshold)
                    .map(move |(a, x)| Link {
                        side: f,
                        molecular: i + 1,
                        level: a + 1,
                        weight: *x,
                    })
            })
        })
        .collect();
    let window = req.window.unwrap_or_else(|| {
        let first = homo.map_or(0, |h| h.saturating_sub(req.around));
        let last = lumo.saturating_add(req.around).min(mol.len() - 1);
        let (mut lo, mut hi) = (mol[first].energy, mol[last].energy);
        for l in links
            .iter()
            .filter(|l| (first + 1..=last + 1).contains(&l.molecular))
        {
            let e = sides[l.side][l.level - 1].energy;
            (lo, hi) = (lo.min(e), hi.max(e));
        }
        let pad = if hi > lo {
            0.06 * (hi - lo)
        } else {
            to_unit(0.05)
        };
        (lo - pad, hi + pad)
    });
    let inside = |l: &&Level| l.energy >= window.0 && l.energy <= window.1;
    let cut = |ls: &[Level]| ls.iter().filter(inside).cloned().collect::<Vec<_>>();
    let middle = cut(&mol);
    if middle.is_empty() {
        return Err(Error::input(format!(
            "no orbital level lies in --window {} to {} {unit}: the levels run from {} to {}",
            signed(window.0, req.ev),
            signed(window.1, req.ev),
            signed(mol[0].energy, req.ev),
            signed(mol[mol.len() - 1].energy, req.ev)
        )));
    }
    let side_cols: Vec<Vec<Level>> = sides.iter().map(|s| cut(s)).collect();
    let left_out = mol.len() - middle.len();
    let frag_out: usize = sides
        .iter()
        .zip(&side_cols)
        .map(|(a, b)| a.len() - b.len())
        .sum();

    let formula = set.molecule.formula_with_charge();
    let mut notes = vec![format!("Method: {}.", set.method)];
    notes.extend(
        set.caveats
            .iter()
            .filter_map(|c| c.figure_note())
            .map(str::to_string),
    );
    notes.push(format!(
        "Levels within {DEGENERATE_EV:.0e} eV{} are degenerate and drawn side by side; arrows are electrons (a degenerate set's electrons as whole arrows, singles before pairs).",
        if req.ev { String::new() } else { format!(" ({:.1e} hartree)", DEGENERATE_EV / HARTREE_IN_EV) }
    ));
    if !frags.is_empty() {
        notes.push(format!(
            "Fragments solved alone, neutral, same method and basis. A line joins a molecular level to a fragment level whose weight (squared overlap projection, normalised over all fragment orbitals) exceeds {}; heavier lines, larger weights.",
            args.threshold
        ));
    }
    if left_out + frag_out > 0 {
        notes.push(format!(
            "Outside the window {} to {} {unit}, not drawn: {left_out} molecular and {frag_out} fragment level(s).",
            signed(window.0, req.ev),
            signed(window.1, req.ev)
        ));
    }
    let mut columns: Vec<Column> = frags
        .iter()
        .zip(side_cols)
        .map(|(f, levels)| Column {
            caption: vec![
                formula_markup(&f.set.molecule.formula()),
                format!("atoms {}", atom_list(&f.atoms)),
            ],
            levels,
        })
        .collect();
    let middle = Column {
        caption: vec![formula_markup(&formula), String::from("molecule")],
        levels: middle,
    };
    if columns.len() > 2 {
        columns.clear();
    }
    Ok(Diagram {
        title: args
            .title
            .clone()
            .unwrap_or_else(|| format!("{} orbital levels", formula_markup(&formula))),
        axis: format!("orbital energy ({unit})"),
        unit: unit.to_string(),
        window,
        middle,
        sides: columns,
        links,
        homo: homo.map(|h| h + 1),
        lumo: (lumo < mol.len()).then_some(lumo + 1),
        degeneracy: to_unit(DEGENERATE_EV / HARTREE_IN_EV),
        footnotes: notes,
        width: req.size,
        thumbnails: Vec::new(),
    })
}
