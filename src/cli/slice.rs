//! `lobecast slice`: a PNG figure of one field, or several side by side, on a plane.

use std::path::PathBuf;
use std::time::Instant;

use clap::{Args, ValueEnum};

use super::common::{parse_count, print_notes, say};
use lobecast::chem::units::bohr_to_angstrom;
use lobecast::chem::{LengthUnit, Molecule};
use lobecast::error::{Error, Result};
use lobecast::field::Field;
use lobecast::grid::plane::{Axis, Plane, PlaneSpec, Window};
use lobecast::output::OutputPlan;
use lobecast::render::slice::{Contours, Figure, Nucleus, Panel, Rendered, Style, render};
use lobecast::render::text::formula_markup;
use lobecast::render::{Colour, Scale};
use lobecast::source::{FieldInfo, Sampler, Source};

/// Default space around the projected nuclei (Å): the 1s tails of hydrogen fall below
/// 1 % of their peak within it (exp(−4.7) for ζ = 1).
pub const DEFAULT_PADDING_ANGSTROM: f64 = 2.5;

#[derive(Debug, Clone, Copy, PartialEq, Eq, ValueEnum)]
pub enum Background {
    White,
    Transparent,
}

/// Accepted ranges of the count options (documented in README and `--help`).
pub const MAX_CONTOURS: u64 = 50;
pub const MAX_LEVELS: usize = 100;
pub const MAX_PANELS: usize = 16;
pub const MIN_SIZE: u64 = 200;
pub const MAX_SIZE: u64 = 10_000;
/// Fewest decades `--log` spans: below a tenth of a decade the scale is one colour.
pub const MIN_DECADES: f64 = 0.1;

#[derive(Debug, Args)]
pub struct SliceArgs {
    /// Model file (.toml), orbital file or QCSchema result (JSON), XYZ file (.xyz, with --method) or cube
    /// file (.cube, .cube.gz)
    pub source: PathBuf,
    #[command(flatten)]
    pub xyz: super::common::XyzFlags,
    /// Field to draw: orbital:N, orbital-density:N, orbital-deformation:N (N = number,
    /// homo, lumo, homo-1, lumo+1, …), density, deformation (against neutral spherical
    /// atoms), or stored:K (the K-th field of a cube file)
    #[arg(long, required_unless_present = "panels", conflicts_with = "panels")]
    pub field: Option<String>,
    /// Several fields side by side on the same plane, comma-separated (1 to 16); a
    /// field that is zero on the plane is drawn as a blank panel
    #[arg(long, value_name = "FIELD,FIELD,…")]
    pub panels: Option<String>,
    /// Put all panels on one colour scale, so their magnitudes compare honestly
    #[arg(long, requires = "panels")]
    pub shared_scale: bool,
    /// Maps per row for --panels, 1 to the number of panels [default: all in one row
    /// up to 3, else ⌈√n⌉ per row]
    #[arg(long, value_name = "N", allow_negative_numbers = true)]
    pub columns: Option<String>,
    /// xy, xz, yz (with @offset along the missing axis, in --units), atoms:I,J,K or atoms:I,J
    #[arg(long)]
    pub plane: String,
    /// With --plane atoms:I,J: the direction that, with the bond, spans the plane
    /// [default: the axis most nearly perpendicular to the bond]. With xy, xz or yz:
    /// which of the two axes points up (the other is horizontal)
    #[arg(long, value_parser = super::values::axis())]
    pub up: Option<Axis>,
    /// Output figure: FILE.png (raster) or FILE.svg (vectors, maps embedded as PNG)
    #[arg(long, value_name = "FILE")]
    pub png: PathBuf,
    /// Contour levels per sign, 0 to 50, evenly spaced between 0 and the largest
    /// |value|; 0 for none
    #[arg(
        long,
        value_name = "N",
        default_value = "4",
        conflicts_with = "levels",
        allow_negative_numbers = true
    )]
    pub contours: String,
    /// Explicit contour levels (at most 100), comma-separated, in the field's unit
    #[arg(long, value_name = "A,B,C", allow_hyphen_values = true)]
    pub levels: Option<String>,
    /// Also draw the zero contour (the nodal line of an orbital), solid and heavier
    #[arg(long)]
    pub zero_contour: bool,
    /// Colour scale by its colorous name [default: PURPLE_ORANGE for signed fields, VIRIDIS otherwise]
    #[arg(long)]
    pub scale: Option<String>,
    /// Logarithmic colours for non-negative fields, over this many decades below the
    /// maximum (0.1 to 12)
    #[arg(
        long,
        value_name = "DECADES",
        num_args = 0..=1,
        default_missing_value = "4",
        allow_negative_numbers = true
    )]
    pub log: Option<f64>,
    /// The end of the colour scale, in the field's unit: ±V for signed fields, 0 to V
    /// otherwise; values beyond are drawn in the end colours and contours follow
    /// (default: the largest |value| on the map). For all-electron deformation
    /// densities, whose core values dwarf the bonds, try 0.1
    #[arg(long, value_name = "V", allow_negative_numbers = true)]
    pub limit: Option<f64>,
    /// Show atom numbers beside the element symbols
    #[arg(long)]
    pub numbers: bool,
    /// Title instead of the automatic one (^{…} raises, _{…} lowers)
    #[arg(long)]
    pub title: Option<String>,
    /// Width of the figure in pixels, 200 to 10000. Every map is at least 300 px wide:
    /// when the maps of a row would be narrower the figure is made wider. Text keeps
    /// its pixel size, so a larger --size gives larger maps
    #[arg(
        long,
        value_name = "PIXELS",
        default_value = "1000",
        allow_negative_numbers = true
    )]
    pub size: String,
    /// Physical window W or W,H (in --units), centred on the nuclei
    /// [default: the nuclei plus 2.5 Å on every side]
    #[arg(long, value_name = "W[,H]", allow_hyphen_values = true)]
    pub extent: Option<String>,
    /// Unit of --extent and of a plane offset
    #[arg(long, value_parser = super::values::length_unit(), default_value = "angstrom")]
    pub units: LengthUnit,
    #[arg(long, value_enum, default_value_t = Background::White)]
    pub background: Background,
    #[command(flatten)]
    pub memory: super::common::MemoryFlag,
    #[command(flatten)]
    pub figure: super::common::FigureFlags,
}

pub fn run(args: SliceArgs) -> Result<()> {
    let started = Instant::now();
    let meta = args.figure.meta(None)?;
    let format = super::common::figure_format(Some(&args.png))?;
    let request = read_request(&args)?;
    let source = Source::load_for(
        &args.source,
        &args.xyz.options()?,
        Some(&request.fields),
        args.memory.memory,
    )?;
    let mut plan = OutputPlan::new(source.inputs());
    let png_slot = plan.add_binary(&args.png)?;
    let scene = plan_scene(&args, &request, &source)?;
    let sampler = source.sampler(&request.fields)?;
    let largest = lobecast::source::scale::largest(&source, &sampler);
    let figure = describe(&args, &request.fields, &source, &scene, &largest);
    let style = style(&args, &request);
    check_cost(
        &source,
        &request.fields,
        &figure,
        &style,
        args.memory.memory,
    )?;
    let drawn = sample_and_draw(&figure, &style, &sampler, request.fields.len())?;
    refuse_empty(&drawn.rendered, &request.fields, &figure, &largest)?;
    let mut out = plan.open()?;
    out.put(png_slot, &drawn.rendered.canvas.encode(format, &meta)?)?;
    let written = out.commit()?.remove(0);
    report(&written, &drawn, &scene.infos, started)?;
    print_notes(&source.notes())?;
    Ok(())
}

/// The options of one figure, read and checked before the source is loaded, so a
/// mistyped option is refused without waiting for the load.
struct Request {
    fields: Vec<Field>,
    size: u32,
    columns: usize,
    spec: PlaneSpec,
    scale: Option<Scale>,
    contours: Contours,
    extent: Option<(f64, f64)>,
}

/// Reads and checks every option that does not need the source; the order of the
/// checks decides which message a command with several mistakes gets.
fn read_request(args: &SliceArgs) -> Result<Request> {
    let field_text = args
        .panels
        .clone()
        .or(args.field.clone())
        .unwrap_or_default();
    let fields = field_text
        .split(',')
        .filter(|s| !s.trim().is_empty())
        .map(Field::parse)
        .collect::<Result<Vec<_>>>()?;
    let option = if args.panels.is_some() {
        "--panels"
    } else {
        "--field"
    };
    if fields.is_empty() || fields.len() > MAX_PANELS {
        return Err(Error::input(format!(
            "{option} takes 1 to {MAX_PANELS} fields, got {}",
            fields.len()
        )));
    }
    let size = parse_count("--size", &args.size, MIN_SIZE, MAX_SIZE)? as u32;
    let columns = match &args.columns {
        Some(c) => parse_count("--columns", c, 1, fields.len() as u64)? as usize,
        None => 0,
    };
    let spec = PlaneSpec::parse(&args.plane, args.units)?;
    let scale = args.scale.as_deref().map(Scale::by_name).transpose()?;
    let contours = match &args.levels {
        Some(l) => Contours::Levels(parse_levels(l)?),
        None => {
            Contours::Auto(parse_count("--contours", &args.contours, 0, MAX_CONTOURS)? as usize)
        }
    };
    if let Some(d) = args.log
        && !(d.is_finite() && (MIN_DECADES..=12.0).contains(&d))
    {
        return Err(Error::input(format!(
            "--log takes {MIN_DECADES} to 12 decades, got {}",
            super::common::shown(d)
        )));
    }
    if let Some(v) = args.limit
        && !(v.is_finite() && v > 0.0 && v < 1e300)
    {
        return Err(Error::input(format!(
            "--limit takes a positive value in the field's unit, got {}",
            super::common::shown(v)
        )));
    }
    let extent = args
        .extent
        .as_deref()
        .map(|e| parse_extent(e, args.units))
        .transpose()?;
    Ok(Request {
        fields,
        size,
        columns,
        spec,
        scale,
        contours,
        extent,
    })
}

/// Where the figure looks and what each field is, known once the source is loaded.
struct Scene {
    plane: Plane,
    window: Window,
    infos: Vec<FieldInfo>,
}

/// Resolves the plane and window on the molecule and checks the fields against the
/// options that depend on them, all before anything is sampled.
fn plan_scene(args: &SliceArgs, request: &Request, source: &Source) -> Result<Scene> {
    let molecule = source.molecule();
    let plane = request.spec.resolve(molecule, args.up)?;
    let window = match request.extent {
        Some((w, h)) => {
            let centre = plane.window_around(molecule, 0.0).centre();
            Window::centred(centre, w, h)
        }
        None => plane.window_around(molecule, args.units_padding()),
    };
    let infos = request
        .fields
        .iter()
        .map(|f| source.info(f))
        .collect::<Result<Vec<_>>>()?;
    if args.log.is_some() && infos.iter().any(|i| i.signed) {
        return Err(
            Error::input("--log is for non-negative fields; this one takes both signs")
                .with_hint("signed fields are drawn on a linear scale symmetric about zero"),
        );
    }
    Ok(Scene {
        plane,
        window,
        infos,
    })
}

/// Builds what the figure shows (title, footnotes, nuclei, panels) apart from how it
/// is drawn, so the cost check can lay it out before sampling.
fn describe(
    args: &SliceArgs,
    fields: &[Field],
    source: &Source,
    scene: &Scene,
    largest: &[f64],
) -> Figure {
    let infos = &scene.infos;
    let formula = formula_markup(&source.molecule().formula_with_charge());
    let title = args.title.clone().unwrap_or_else(|| {
        if infos.len() == 1 {
            format!("{formula} · {}", infos[0].heading)
        } else {
            let list: Vec<&str> = infos.iter().map(|i| i.quantity.as_str()).collect();
            format!("{formula} · {}", list.join(", "))
        }
    });
    Figure {
        title,
        footnotes: footnotes(args, fields, source, &scene.plane),
        plane: scene.plane.clone(),
        window: scene.window,
        nuclei: project_nuclei(source.molecule(), &scene.plane),
        panels: infos
            .iter()
            .zip(largest)
            .map(|(i, l)| Panel {
                heading: i.short.clone(),
                quantity: i.quantity.clone(),
                family: i.family.clone(),
                unit: i.unit.clone(),
                signed: i.signed,
                largest: Some(*l),
            })
            .collect(),
        gap_note: "Hatched: outside the cube's box, where the file holds no values.".to_string(),
    }
}

/// Every nucleus placed on the plane, marked near when it lies within its covalent
/// radius of it, so the figure can tell atoms in the plane from those behind it.
fn project_nuclei(molecule: &Molecule, plane: &Plane) -> Vec<Nucleus> {
    molecule
        .atoms
        .iter()
        .enumerate()
        .map(|(i, a)| {
            let (u, v, d) = plane.project(a.position);
            Nucleus {
                symbol: a.element.symbol.to_string(),
                number: i + 1,
                u,
                v,
                distance: d,
                near: d.abs() <= LengthUnit::Angstrom.to_bohr(a.element.covalent_radius_angstrom),
            }
        })
        .collect()
}

/// The notes under the figure: where the values come from, the source's caveats,
/// and what a deformation or a shared scale means.
fn footnotes(args: &SliceArgs, fields: &[Field], source: &Source, plane: &Plane) -> Vec<String> {
    let mut footnotes = vec![format!("{}; {}", plane.description, source.provenance())];
    footnotes.extend(source.caveat_footnotes());
    if fields
        .iter()
        .any(|f| matches!(f, Field::OrbitalDeformation(_)))
    {
        footnotes.push(
            "Δρ_{N} = |ψ_{N}|^{2} − Σ_{μ} q_{μ} φ_{μ}^{2}, with q_{μ} the Mulliken gross populations of orbital N."
                .to_string(),
        );
    }
    if args.shared_scale {
        footnotes.push("All panels share one colour scale.".to_string());
    }
    if let Some(v) = args.limit {
        footnotes.push(format!(
            "Colours end at {} (--limit): larger values are drawn in the end colours.",
            super::common::shown(v)
        ));
    }
    footnotes
}

/// How the figure is drawn (size, colours, contours, layout), kept apart from what
/// it shows.
fn style(args: &SliceArgs, request: &Request) -> Style {
    Style {
        width: request.size,
        background: match args.background {
            Background::White => Colour::WHITE,
            Background::Transparent => Colour::TRANSPARENT,
        },
        scale: request.scale,
        log_decades: args.log,
        limit: args.limit,
        contours: request.contours.clone(),
        zero_contour: args.zero_contour,
        nuclei: true,
        numbers: args.numbers,
        shared_scale: args.shared_scale,
        columns: request.columns,
    }
}

/// The drawn figure and the seconds spent evaluating the fields, for the report.
struct Drawn {
    rendered: Rendered,
    eval_seconds: f64,
}

/// Samples all `nf` fields in one pass over the map's pixel centres, timing it, and
/// draws the figure from the per-panel values.
fn sample_and_draw(figure: &Figure, style: &Style, sampler: &Sampler, nf: usize) -> Result<Drawn> {
    let mut eval_seconds = 0.0;
    let rendered = render(figure, style, |grid| {
        let t = Instant::now();
        let all = grid.sample(nf, |p, v| sampler.evaluate(p, v));
        eval_seconds = t.elapsed().as_secs_f64();
        (0..nf)
            .map(|k| all.iter().skip(k).step_by(nf).copied().collect())
            .collect()
    })?;
    Ok(Drawn {
        rendered,
        eval_seconds,
    })
}

/// Tells what was written, how fast the sampling went and each panel's colour range
/// (or that it was drawn blank).
fn report(written: &str, drawn: &Drawn, infos: &[FieldInfo], started: Instant) -> Result<()> {
    let rendered = &drawn.rendered;
    let nf = infos.len();
    let g = &rendered.grid;
    let samples = g.nx * g.ny * nf;
    say!(
        "wrote {}: {}×{} px; {} map(s) of {}×{} samples ({:.2} × {:.2} Å), evaluated in {:.3} s ({:.1} million samples/s); total {:.2} s",
        written,
        rendered.canvas.width(),
        rendered.canvas.height(),
        nf,
        g.nx,
        g.ny,
        bohr_to_angstrom(g.window.width()),
        bohr_to_angstrom(g.window.height()),
        drawn.eval_seconds,
        samples as f64 / drawn.eval_seconds.max(1e-9) / 1e6,
        started.elapsed().as_secs_f64()
    );
    for (k, (info, m)) in infos.iter().zip(&rendered.maps).enumerate() {
        if rendered.blank[k] {
            say!("  {}: zero on this plane, drawn blank", info.plain);
        } else {
            let (lo, hi) = m.mapping.range();
            say!("  {}: colour range {lo:.6e} to {hi:.6e}", info.plain);
        }
    }
    Ok(())
}

/// Refuses a figure whose sampled values, picture and source would need more than
/// `budget` bytes, or whose sampling would take more than `MAX_WORK` operations,
/// before anything is sampled.
fn check_cost(
    source: &Source,
    fields: &[Field],
    figure: &Figure,
    style: &Style,
    budget: u64,
) -> Result<()> {
    use lobecast::source::budget::{MAX_WORK, picture_memory, samples_memory, work_per_point};
    let lay = lobecast::render::slice::layout(figure, style)?;
    let (nx, ny) = (lay.grid.nx, lay.grid.ny);
    let points = (nx * ny) as f64;
    let (width, height) = (lay.width(), lay.height_estimate());
    let what = format!(
        "a figure of {} map(s) of {nx}×{ny} samples on a {width}×{height}-px canvas",
        fields.len()
    );
    // Only ways that exist from here: --size 200 cannot shrink, one panel has no
    // fewer, and more columns than panels do not exist.
    let mut ways = Vec::new();
    if fields.len() > 1 {
        ways.push("fewer panels");
        if lay.rows() > 1 {
            ways.push("more --columns");
        }
    }
    if style.width > MIN_SIZE as u32 {
        ways.push("a smaller --size");
    }
    if ways.is_empty() {
        ways.push("a wider, less tall --extent");
    }
    let less = format!("ask for less: {}", ways.join(", "));
    let memory = source.held_bytes()
        + samples_memory(points, fields.len())
        + picture_memory(width as f64, height as f64);
    lobecast::budget::check_memory(memory, budget, &what)
        .map_err(|e| e.with_hint(format!("raise the budget with --memory, or {less}")))?;
    let work = points * work_per_point(source, fields);
    lobecast::budget::check_work(
        work,
        MAX_WORK,
        &what,
        &format!("{less} (the limit is fixed)"),
    )
}

/// Refuses a figure that would show nothing: a plane that misses a cube's box, or a
/// single field that is zero on the plane (panels draw such a field blank instead).
fn refuse_empty(r: &Rendered, fields: &[Field], fig: &Figure, largest: &[f64]) -> Result<()> {
    let plane = &fig.plane.description;
    if r.values.iter().flatten().all(|v| v.is_nan()) {
        return Err(Error::input(format!(
            "the {plane} misses the cube's box: no point of the map has a value"
        ))
        .with_hint("choose a plane offset, or an --extent, inside the box"));
    }
    if let [true] = r.blank[..] {
        if largest[0] == 0.0 {
            return Err(Error::input(format!(
                "{} is zero everywhere in this source: there is nothing to draw",
                fields[0]
            )));
        }
        let ratio = r.peaks[0] / largest[0];
        let why = match fields[0] {
            Field::Orbital(_) | Field::OrbitalDensity(_) => "the orbital has a node in this plane",
            _ => "the field vanishes on this plane",
        };
        return Err(Error::input(format!(
            "{} is zero on the {plane}: its largest |value| on the map is {:.1e}, {ratio:.1e} of its largest |value| in space",
            fields[0], r.peaks[0]
        ))
        .with_hint(format!("{why}; choose another plane, or an offset from it")));
    }
    Ok(())
}

impl SliceArgs {
    fn units_padding(&self) -> f64 {
        LengthUnit::Angstrom.to_bohr(DEFAULT_PADDING_ANGSTROM)
    }
}

fn parse_levels(text: &str) -> Result<Vec<f64>> {
    let levels = text
        .split(',')
        .map(|s| s.trim().parse::<f64>().ok().filter(|v| v.is_finite() && *v != 0.0))
        .collect::<Option<Vec<_>>>()
        .ok_or_else(|| {
            Error::input(format!("cannot read --levels {text:?}"))
                .with_hint("give non-zero numbers separated by commas, e.g. -0.05,0.05,0.1 (use --zero-contour for 0)")
        })?;
    if levels.len() > MAX_LEVELS {
        return Err(Error::input(format!(
            "--levels takes 1 to {MAX_LEVELS} levels, got {}",
            levels.len()
        )));
    }
    Ok(levels)
}

/// `W` (a square) or `W,H`, in `unit`, to bohr. Each must be a positive length, at
/// most 1000 Å (a window far larger than any molecule shows nothing).
fn parse_extent(text: &str, unit: LengthUnit) -> Result<(f64, f64)> {
    let name = unit.symbol();
    let v = text
        .split(',')
        .map(|s| s.trim().parse::<f64>().ok().filter(|v| v.is_finite()))
        .collect::<Option<Vec<_>>>()
        .ok_or_else(|| {
            Error::input(format!("cannot read --extent {text:?}"))
                .with_hint(format!("give a positive width W, or W,H, in {name}"))
        })?;
    let max_bohr = LengthUnit::Angstrom.to_bohr(MAX_EXTENT_ANGSTROM);
    for x in &v {
        if *x <= 0.0 {
            return Err(Error::input(format!(
                "--extent must be positive, got {} {name}",
                super::common::shown(*x)
            )));
        }
        if unit.to_bohr(*x) > max_bohr {
            return Err(Error::input(format!(
                "--extent must be at most {MAX_EXTENT_ANGSTROM} Å, got {} {name}",
                super::common::shown(*x)
            )));
        }
    }
    match v[..] {
        [w] => Ok((unit.to_bohr(w), unit.to_bohr(w))),
        [w, h] => Ok((unit.to_bohr(w), unit.to_bohr(h))),
        _ => Err(Error::input(format!("cannot read --extent {text:?}")).with_hint("give W or W,H")),
    }
}

/// The largest accepted --extent (Å).
pub const MAX_EXTENT_ANGSTROM: f64 = 1000.0;
