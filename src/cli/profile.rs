//! `lobecast profile`: field values along a line, as CSV and as a line chart.

use std::path::PathBuf;
use std::time::Instant;

use clap::Args;

use super::common::parse_count;
use super::common::{print_notes, say};
use lobecast::chem::units::bohr_to_angstrom;
use lobecast::chem::{LengthUnit, Molecule};
use lobecast::error::{Error, Result};
use lobecast::field::Field;
use lobecast::grid::line::{Endpoint, Line};
use lobecast::output::{OutputPlan, Slot};
use lobecast::plot::profile::{Profile, Series, draw};
use lobecast::render::Colour;
use lobecast::render::text::formula_markup;
use lobecast::source::{FieldInfo, Source};

/// Accepted ranges of the count options (documented in README and `--help`); a
/// chart 4000 px wide is already far larger than any page or screen needs.
pub const MAX_POINTS: u64 = 1_000_000;
pub const MAX_SIZE: u64 = 4000;
pub const MAX_FIELDS: usize = 16;

/// Nuclei closer than this to the line (bohr) are marked on the chart.
pub const ON_LINE_BOHR: f64 = 0.05;

#[derive(Debug, Args)]
pub struct ProfileArgs {
    /// Model file (.toml), orbital file or QCSchema result (JSON), XYZ file (.xyz, with --method) or cube
    /// file (.cube, .cube.gz)
    pub source: PathBuf,
    #[command(flatten)]
    pub xyz: super::common::XyzFlags,
    /// Field to follow: orbital:N, orbital-density:N, orbital-deformation:N (N = number,
    /// homo, lumo, …), density, deformation, or stored:K (the K-th field of a cube
    /// file); repeat for several, 1 to 16 (one column and one line each)
    #[arg(long = "field", required = true, value_name = "FIELD")]
    pub fields: Vec<String>,
    /// Start: atom:N or x,y,z (in --units)
    #[arg(long, allow_hyphen_values = true)]
    pub from: String,
    /// End: atom:N or x,y,z (in --units)
    #[arg(long, allow_hyphen_values = true)]
    pub to: String,
    /// Length added beyond both ends, zero or positive, e.g. 2, 2ang or 3.5bohr (a bare
    /// number is in --units)
    #[arg(long, default_value = "0", allow_hyphen_values = true)]
    pub extend: String,
    /// Number of evenly spaced samples, 2 to 1000000
    #[arg(
        long,
        value_name = "N",
        default_value = "401",
        allow_negative_numbers = true
    )]
    pub points: String,
    /// Unit of coordinates and of a bare --extend
    #[arg(long, value_parser = super::values::length_unit(), default_value = "angstrom")]
    pub units: LengthUnit,
    /// Write the samples as CSV
    #[arg(long, value_name = "FILE")]
    pub csv: Option<PathBuf>,
    /// Draw the profile as a line chart: FILE.png or FILE.svg
    #[arg(long, value_name = "FILE")]
    pub png: Option<PathBuf>,
    /// Title instead of the automatic one
    #[arg(long)]
    pub title: Option<String>,
    /// Width of the chart in pixels, 200 to 4000
    #[arg(
        long,
        value_name = "PIXELS",
        default_value = "1000",
        allow_negative_numbers = true
    )]
    pub size: String,
    #[command(flatten)]
    pub memory: super::common::MemoryFlag,
    #[command(flatten)]
    pub figure: super::common::FigureFlags,
}

pub fn run(args: ProfileArgs) -> Result<()> {
    let started = Instant::now();
    args.figure.meta(None)?;
    super::common::figure_format(args.png.as_deref())?;
    let request = read_request(&args)?;
    let source = Source::load_for(
        &args.source,
        &args.xyz.options()?,
        Some(&request.fields),
        args.memory.memory,
    )?;
    let mut plan = OutputPlan::new(source.inputs());
    let csv_slot = plan.add_opt(args.csv.as_deref(), false)?;
    let png_slot = plan.add_opt(args.png.as_deref(), true)?;
    let scene = plan_scene(&args, &request, &source)?;
    check_cost(
        &source,
        &request.fields,
        request.points,
        args.csv.is_some(),
        args.png.is_some().then_some(request.size),
        args.memory.memory,
    )?;
    let samples = sample(&args, &request, &source, &scene.line)?;
    let mut files = Vec::new();
    if let Some(slot) = csv_slot {
        let text = csv(&args, &scene, &samples);
        files.push((slot, text.into_bytes()));
    }
    if let Some(slot) = png_slot {
        files.push((
            slot,
            chart_png(&args, &source, &scene, &samples, request.size)?,
        ));
    }
    write_and_report(plan, &files, &samples, started)?;
    print_notes(&source.notes())?;
    Ok(())
}

/// The options of one profile, read and checked before the source is loaded, so a
/// mistyped option is refused without waiting for the load.
struct Request {
    points: usize,
    size: u32,
    fields: Vec<Field>,
    from: Endpoint,
    to: Endpoint,
    extend: f64,
}

/// Reads and checks every option that does not need the source; the order of the
/// checks decides which message a command with several mistakes gets.
fn read_request(args: &ProfileArgs) -> Result<Request> {
    if args.csv.is_none() && args.png.is_none() {
        return Err(Error::input(
            "nothing to write: give --csv FILE and/or --png FILE",
        ));
    }
    let points = parse_count("--points", &args.points, 2, MAX_POINTS)? as usize;
    let size = parse_count("--size", &args.size, 200, MAX_SIZE)? as u32;
    if args.fields.len() > MAX_FIELDS {
        return Err(Error::input(format!(
            "--field may be given 1 to {MAX_FIELDS} times, got {}",
            args.fields.len()
        )));
    }
    let fields = args
        .fields
        .iter()
        .map(|f| Field::parse(f))
        .collect::<Result<Vec<_>>>()?;
    let from = Endpoint::parse(&args.from, args.units)?;
    let to = Endpoint::parse(&args.to, args.units)?;
    let extend = parse_length("--extend", &args.extend, args.units)?;
    Ok(Request {
        points,
        size,
        fields,
        from,
        to,
        extend,
    })
}

/// The line on the molecule and what each field is, known once the source is loaded.
struct Scene {
    line: Line,
    infos: Vec<FieldInfo>,
}

/// Places the line on the molecule and checks that a chart's fields share one unit,
/// before anything is sampled.
fn plan_scene(args: &ProfileArgs, request: &Request, source: &Source) -> Result<Scene> {
    let molecule = source.molecule();
    let line = Line::new(
        request.from.position(molecule)?,
        request.to.position(molecule)?,
        request.extend,
    )?;
    let infos = request
        .fields
        .iter()
        .map(|f| source.info(f))
        .collect::<Result<Vec<_>>>()?;
    if args.png.is_some() && infos.iter().any(|i| i.unit != infos[0].unit) {
        return Err(Error::input("a profile chart needs fields of one unit")
            .with_hint("draw orbitals and densities in separate charts"));
    }
    Ok(Scene { line, infos })
}

/// The samples along the line: distances `s` from the start (bohr), the points, and
/// the values of all `nf` fields, point by point.
struct Samples {
    s: Vec<f64>,
    points: Vec<[f64; 3]>,
    values: Vec<f64>,
    nf: usize,
}

/// Evaluates every field at evenly spaced points, and refuses a line on which no
/// sample has a value (it misses a cube's box).
fn sample(args: &ProfileArgs, request: &Request, source: &Source, line: &Line) -> Result<Samples> {
    let sampler = source.sampler(&request.fields)?;
    let s = line.distances(request.points);
    let points: Vec<[f64; 3]> = s.iter().map(|&d| line.point(d)).collect();
    let nf = request.fields.len();
    let mut values = vec![0.0; points.len() * nf];
    sampler.evaluate(&points, &mut values);
    if values.iter().all(|v| v.is_nan()) {
        return Err(Error::input(format!(
            "the line from {} to {} misses the cube's box: no sample has a value",
            args.from, args.to
        ))
        .with_hint("choose end points, or a shorter --extend, inside the box"));
    }
    Ok(Samples {
        s,
        points,
        values,
        nf,
    })
}

/// Draws the line chart as PNG or SVG bytes: one line per field against the distance in Å,
/// with the nuclei on the line marked.
fn chart_png(
    args: &ProfileArgs,
    source: &Source,
    scene: &Scene,
    samples: &Samples,
    size: u32,
) -> Result<Vec<u8>> {
    let (infos, nf) = (&scene.infos, samples.nf);
    let columns: Vec<Vec<f64>> = (0..nf)
        .map(|k| samples.values.iter().skip(k).step_by(nf).copied().collect())
        .collect();
    let s_ang: Vec<f64> = samples.s.iter().map(|v| bohr_to_angstrom(*v)).collect();
    let molecule = source.molecule();
    let formula = formula_markup(&molecule.formula_with_charge());
    let y_label = if nf == 1 {
        format!("{} / {}", infos[0].quantity, infos[0].unit)
    } else {
        format!("{} / {}", infos[0].family, infos[0].unit)
    };
    let chart = Profile {
        title: args.title.clone().unwrap_or_else(|| {
            let list: Vec<&str> = infos.iter().map(|i| i.quantity.as_str()).collect();
            format!(
                "{formula} · {} from {} to {}",
                list.join(", "),
                args.from,
                args.to
            )
        }),
        s: &s_ang,
        series: infos
            .iter()
            .zip(&columns)
            .map(|(i, v)| Series {
                label: i.short.clone(),
                values: v,
            })
            .collect(),
        y_label,
        x_label: format!("distance from {} / Å", args.from),
        nuclei: nuclei_on_line(molecule, &scene.line),
        footnotes: chart_footnotes(source, samples),
        width: size,
        background: Colour::WHITE,
    };
    let format = super::common::figure_format(args.png.as_deref())?;
    draw(&chart)?.encode(format, &args.figure.meta(None)?)
}

/// Labels (symbol and number) and distances (Å) of the nuclei that lie on the line,
/// so the chart shows where the atoms are.
fn nuclei_on_line(molecule: &Molecule, line: &Line) -> Vec<(String, f64)> {
    line.nuclei_near(molecule, ON_LINE_BOHR)
        .into_iter()
        .map(|(i, d, _)| {
            (
                format!("{}{}", molecule.atoms[i].element.symbol, i + 1),
                bohr_to_angstrom(d),
            )
        })
        .collect()
}

/// The notes under the chart: the sampling and provenance, gaps where a cube holds
/// no values, and the source's caveats.
fn chart_footnotes(source: &Source, samples: &Samples) -> Vec<String> {
    let s = &samples.s;
    let mut f = vec![format!(
        "{} samples, {:.3} Å apart; {}.",
        s.len(),
        bohr_to_angstrom(s[1] - s[0]),
        source.provenance()
    )];
    if samples.values.iter().any(|v| v.is_nan()) {
        f.push("Gaps in a line: outside the cube's box, where the file holds no values.".into());
    }
    f.extend(source.caveat_footnotes());
    f
}

/// Writes all files together only now that each is complete, then tells what was
/// written and how long the profile took.
fn write_and_report(
    plan: OutputPlan,
    files: &[(Slot, Vec<u8>)],
    samples: &Samples,
    started: Instant,
) -> Result<()> {
    let mut out = plan.open()?;
    for (slot, bytes) in files {
        out.put(*slot, bytes)?;
    }
    for name in out.commit()? {
        say!("wrote {name}");
    }
    let s = &samples.s;
    say!(
        "profile of {} field(s) at {} points over {:.4} Å in {:.3} s",
        samples.nf,
        s.len(),
        bohr_to_angstrom(s[s.len() - 1] - s[0]),
        started.elapsed().as_secs_f64()
    );
    Ok(())
}

/// Bytes of CSV text per number written (shortest round-trip form, sign, exponent
/// and separator; common practice for an upper bound).
const CSV_BYTES_PER_NUMBER: f64 = 26.0;

/// Refuses a profile whose values, points, CSV text and chart (drawn
/// at its own size) would need more than `budget` bytes with
/// the source's own values, or whose sampling would take more than `MAX_WORK`
/// operations, before anything is sampled.
fn check_cost(
    source: &Source,
    fields: &[Field],
    points: usize,
    csv: bool,
    png_width: Option<u32>,
    budget: u64,
) -> Result<()> {
    use lobecast::source::budget::{MAX_WORK, picture_memory, samples_memory, work_per_point};
    let n = points as f64;
    let nf = fields.len();
    // Points (3 coordinates) and distances, in bohr and in Å.
    let mut memory = source.held_bytes() + samples_memory(n, nf) + n * (24.0 + 16.0);
    if csv {
        memory += n * (4 + nf) as f64 * CSV_BYTES_PER_NUMBER;
    }
    if let Some(w) = png_width {
        let (w, h) = (w as f64, (w as f64 * 0.62).ceil());
        memory += picture_memory(w, h);
    }
    let what = format!("a profile of {nf} field(s) at {points} points");
    lobecast::budget::check_memory(memory, budget, &what).map_err(|e| {
        e.with_hint("raise the budget with --memory, or ask for fewer --points or fields")
    })?;
    let work = n * work_per_point(source, fields);
    lobecast::budget::check_work(
        work,
        MAX_WORK,
        &what,
        "ask for fewer --points or fields (the limit is fixed)",
    )
}

/// A length with an optional unit suffix: "2", "2ang", "2Å", "3.5bohr". `name` is the
/// option, for messages; a negative length is read and then refused with its unit.
pub fn parse_length(name: &str, text: &str, default: LengthUnit) -> Result<f64> {
    let t = text.trim().to_ascii_lowercase();
    let (num, unit) = if let Some(n) = t.strip_suffix("bohr") {
        (n, LengthUnit::Bohr)
    } else if let Some(n) = ["angstrom", "ang", "å", "a"]
        .iter()
        .find_map(|s| t.strip_suffix(s))
    {
        (n, LengthUnit::Angstrom)
    } else {
        (t.as_str(), default)
    };
    let v = num
        .trim()
        .parse::<f64>()
        .ok()
        .filter(|v| v.is_finite())
        .ok_or_else(|| {
            Error::input(format!("cannot read the length {name} {text:?}"))
                .with_hint("give a number, optionally with ang or bohr, e.g. 2ang")
        })?;
    if v < 0.0 {
        return Err(Error::input(format!(
            "{name} must be zero or positive, got {} {}",
            super::common::shown(v),
            unit.symbol()
        )));
    }
    if unit.to_bohr(v) > LengthUnit::Angstrom.to_bohr(super::slice::MAX_EXTENT_ANGSTROM) {
        return Err(Error::input(format!(
            "{name} must be at most {} Å, got {} {}",
            super::slice::MAX_EXTENT_ANGSTROM,
            super::common::shown(v),
            unit.symbol()
        )));
    }
    Ok(unit.to_bohr(v))
}

/// Numbers are written in Rust's shortest round-trip form, so reading them back
/// gives exactly the values computed; a sample without a value has an empty cell.
fn csv(args: &ProfileArgs, scene: &Scene, samples: &Samples) -> String {
    let (line, infos) = (&scene.line, &scene.infos);
    let (s, points, values) = (&samples.s, &samples.points, &samples.values);
    let nf = infos.len();
    let mut t = format!(
        "# lobecast {} profile from {} to {} (extended by {} bohr at both ends) of {}\n\
         # s: distance from the start point along the line; x, y, z: the sample point; lengths in bohr\n",
        env!("CARGO_PKG_VERSION"),
        args.from,
        args.to,
        line.extend,
        args.source.display()
    );
    for (k, i) in infos.iter().enumerate() {
        t += &format!("# field_{}: {}\n", k + 1, i.plain);
    }
    t += "s_bohr,x_bohr,y_bohr,z_bohr";
    for k in 0..nf {
        t += &format!(",field_{}", k + 1);
    }
    t += "\n";
    for (i, (d, p)) in s.iter().zip(points).enumerate() {
        t += &format!("{d:e},{:e},{:e},{:e}", p[0], p[1], p[2]);
        for v in &values[i * nf..(i + 1) * nf] {
            // No value (outside a cube's box): an empty cell.
            if v.is_nan() {
                t += ",";
            } else {
                t += &format!(",{v:e}");
            }
        }
        t += "\n";
    }
    t
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn lengths_take_suffixes() {
        let a = LengthUnit::Angstrom;
        let e = "--extend";
        assert_eq!(parse_length(e, "3bohr", a).unwrap(), 3.0);
        assert_eq!(
            parse_length(e, "2ang", LengthUnit::Bohr).unwrap(),
            a.to_bohr(2.0)
        );
        assert_eq!(parse_length(e, "2", a).unwrap(), a.to_bohr(2.0));
        let neg = parse_length(e, "-1", a).unwrap_err();
        assert!(neg.message.contains("got -1 Å"), "{}", neg.message);
        assert!(parse_length(e, "two", a).is_err());
    }
}
