//! `lobecast inspect`: what a cube file holds, and the statistics of each field,
//! computed by streaming so that any file size fits in memory.

use super::common::print_out;
use std::path::{Path, PathBuf};

use clap::Args;
use serde::Serialize;

use lobecast::chem::elements::by_number;
use lobecast::chem::units::bohr_to_angstrom;
use lobecast::error::Result;
use lobecast::io::cube::stats::{FieldSummary, Measure, summarize};
use lobecast::io::cube::{CubeInfo, CubeReader};

#[derive(Debug, Args)]
pub struct InspectArgs {
    /// Cube file (plain or gzip-compressed)
    pub cube: PathBuf,
    /// Fraction of the field that the reported isovalue surface encloses: of ∫|f| dV
    /// for a non-negative field, of ∫f² dV for a signed one (surfaces at ±value)
    #[arg(long, default_value_t = 0.9, value_name = "FRACTION")]
    pub enclose: f64,
    /// What the fraction is of, instead of choosing by sign: abs (∫|f|) or square
    /// (∫f²; use it for an orbital that happens to be positive everywhere)
    #[arg(long, value_parser = super::values::measure(), value_name = "MEASURE")]
    pub measure: Option<Measure>,
    /// Print JSON on standard output instead of the report
    #[arg(long)]
    pub json: bool,
}

pub fn run(args: InspectArgs) -> Result<()> {
    let path = args.cube.clone();
    let open = move || CubeReader::open(&path);
    let (info, fields) = summarize(&open, args.enclose, args.measure)?;
    if args.json {
        let report = JsonReport::new(&args.cube, &info, &fields, args.enclose);
        let text = serde_json::to_string_pretty(&report)
            .map_err(|e| lobecast::Error::internal(format!("cannot format JSON: {e}")))?;
        print_out(&(text + "\n"))
    } else {
        print_out(&report(&args.cube, &info, &fields, args.enclose))
    }
}

/// Appends one formatted line to a String (formatting into a String cannot fail).
macro_rules! outln {
    ($out:expr, $($arg:tt)*) => {{
        use std::fmt::Write as _;
        let _ = writeln!($out, $($arg)*);
    }};
}

fn symbol(z: u32) -> String {
    by_number(z).map_or(format!("Z={z}"), |e| e.symbol.to_string())
}

fn norm(v: [f64; 3]) -> f64 {
    nalgebra::Vector3::from(v).norm()
}

/// The three box edges (n − 1)·aᵢ.
fn edges(info: &CubeInfo) -> [[f64; 3]; 3] {
    let g = &info.header.grid;
    std::array::from_fn(|a| g.axes[a].map(|x| x * (g.counts[a] - 1) as f64))
}

fn report(path: &Path, info: &CubeInfo, fields: &[FieldSummary], enclose: f64) -> String {
    let mut out = String::new();
    let h = &info.header;
    let g = &h.grid;
    outln!(
        out,
        "{}: {}{}",
        path.display(),
        if info.angstrom {
            "lengths given in ångström (shown here in bohr)"
        } else {
            "lengths in bohr"
        },
        if info.gzip { ", gzip-compressed" } else { "" }
    );
    outln!(out, "title:   {}", h.title);
    outln!(out, "comment: {}", h.comment);
    outln!(out, "atoms: {}", h.atoms.len());
    for (n, a) in h.atoms.iter().enumerate() {
        let p = a.position;
        outln!(
            out,
            "  {:>4} {:<4} charge {:>8.4}  at {:>11.6} {:>11.6} {:>11.6} bohr",
            n + 1,
            symbol(a.atomic_number),
            a.charge,
            p[0],
            p[1],
            p[2]
        );
    }
    let [nx, ny, nz] = g.counts;
    outln!(out, "grid: {nx} × {ny} × {nz} = {} points", g.point_count());
    let o = g.origin;
    outln!(
        out,
        "  origin   {:>11.6} {:>11.6} {:>11.6} bohr   ({:.6} {:.6} {:.6} Å)",
        o[0],
        o[1],
        o[2],
        bohr_to_angstrom(o[0]),
        bohr_to_angstrom(o[1]),
        bohr_to_angstrom(o[2])
    );
    for (a, (ax, e)) in g.axes.iter().zip(edges(info)).enumerate() {
        outln!(
            out,
            "  step {}   {:>11.6} {:>11.6} {:>11.6} bohr   (|step| {:.6} bohr; edge {:.6} bohr = {:.6} Å)",
            a + 1,
            ax[0],
            ax[1],
            ax[2],
            norm(*ax),
            norm(e),
            bohr_to_angstrom(norm(e))
        );
    }
    let dv = g.voxel_volume();
    outln!(
        out,
        "  voxel volume {dv:.6e} bohr³ ({:.6e} Å³)",
        dv * bohr_to_angstrom(1.0).powi(3)
    );
    for (n, f) in fields.iter().enumerate() {
        let s = &f.stats;
        let which = match &h.orbital_numbers {
            Some(nums) => format!(" (orbital {})", nums[n]),
            None => String::new(),
        };
        outln!(
            out,
            "field {}{which}: {}",
            n + 1,
            if f.stats.signed() {
                "signed"
            } else {
                "non-negative"
            }
        );
        outln!(
            out,
            "  min {:>14.6e}   max {:>14.6e}   mean {:>14.6e}",
            s.min,
            s.max,
            s.mean()
        );
        outln!(
            out,
            "  ∫f dV {:>14.6e}   ∫f² dV {:>14.6e}",
            s.sum * dv,
            s.sum_sq * dv
        );
        let of = match f.measure {
            Measure::Abs => "∫|f| dV",
            Measure::Square => "∫f² dV",
        };
        let pm = if s.signed() { "±" } else { "" };
        match f.isovalue {
            None => outln!(out, "  isovalue: none (the field is zero everywhere)"),
            Some(t) => outln!(
                out,
                "  isovalue {pm}{t:.6e} encloses {:.4} % of {of}",
                100.0 * enclose
            ),
        }
    }
    out
}

#[derive(Serialize)]
struct JsonAtom {
    atomic_number: u32,
    symbol: String,
    charge: f64,
    position_bohr: [f64; 3],
}

#[derive(Serialize)]
struct JsonField {
    index: usize,
    orbital: Option<usize>,
    signed: bool,
    /// "integral_abs" or "integral_squared": what `enclose` is a fraction of.
    enclosed_measure: &'static str,
    min: f64,
    max: f64,
    mean: f64,
    integral: f64,
    integral_squared: f64,
    /// Magnitude of the level; surfaces at ± this value for a signed field.
    isovalue: Option<f64>,
}

#[derive(Serialize)]
struct JsonReport {
    format: &'static str,
    version: u32,
    file: String,
    gzip: bool,
    length_unit_in_file: &'static str,
    title: String,
    comment: String,
    points: [usize; 3],
    origin_bohr: [f64; 3],
    axes_bohr: [[f64; 3]; 3],
    voxel_volume_bohr3: f64,
    edges_bohr: [f64; 3],
    edges_angstrom: [f64; 3],
    atoms: Vec<JsonAtom>,
    enclose: f64,
    fields: Vec<JsonField>,
}

impl JsonReport {
    fn new(path: &Path, info: &CubeInfo, fields: &[FieldSummary], enclose: f64) -> Self {
        let h = &info.header;
        let dv = h.grid.voxel_volume();
        let e = edges(info).map(norm);
        JsonReport {
            format: "lobecast-inspect",
            version: 1,
            file: path.display().to_string(),
            gzip: info.gzip,
            length_unit_in_file: if info.angstrom { "angstrom" } else { "bohr" },
            title: h.title.clone(),
            comment: h.comment.clone(),
            points: h.grid.counts,
            origin_bohr: h.grid.origin,
            axes_bohr: h.grid.axes,
            voxel_volume_bohr3: dv,
            edges_bohr: e,
            edges_angstrom: e.map(bohr_to_angstrom),
            atoms: h
                .atoms
                .iter()
                .map(|a| JsonAtom {
                    atomic_number: a.atomic_number,
                    symbol: symbol(a.atomic_number),
                    charge: a.charge,
                    position_bohr: a.position,
                })
                .collect(),
            enclose,
            fields: fields
                .iter()
                .enumerate()
                .map(|(n, f)| JsonField {
                    index: n + 1,
                    orbital: h.orbital_numbers.as_ref().map(|v| v[n]),
                    signed: f.stats.signed(),
                    enclosed_measure: match f.measure {
                        Measure::Abs => "integral_abs",
                        Measure::Square => "integral_squared",
                    },
                    min: f.stats.min,
                    max: f.stats.max,
                    mean: f.stats.mean(),
                    integral: f.stats.sum * dv,
                    integral_squared: f.stats.sum_sq * dv,
                    isovalue: f.isovalue,
                })
                .collect(),
        }
    }
}
