//! `lobecast surface`: 3-D pictures of isosurfaces around a ball-and-stick molecule
//! (PNG) and the surfaces as meshes for other 3-D tools (glTF, PLY, OBJ).

use std::path::PathBuf;
use std::time::Instant;

use clap::Args;

use super::common::{FigureFlags, MemoryFlag, XyzFlags, parse_count, print_notes, say, shown};
use super::slice::Background;
use super::surface_figure::{Drawn, draw};
use lobecast::error::{Error, Result};
use lobecast::field::Field;
use lobecast::grid::GridBox;
use lobecast::io::mesh::MeshFormat;
use lobecast::output::OutputPlan;
use lobecast::render::scene::{View, ViewSpec};
use lobecast::source::Source;
use lobecast::source::surfaces::{FieldSurfaces, Isovalue, Timings, surfaces_of};

/// Default picture width (pixels) and the accepted range of each side.
pub const DEFAULT_WIDTH: u32 = 1200;
pub const SIZE_RANGE: (u64, u64) = (200, 8000);
pub const MAX_PANELS: usize = 8;
/// Translucent surfaces below this opacity are invisible in print.
pub const MIN_OPACITY: f64 = 0.05;

#[derive(Debug, Args)]
pub struct SurfaceArgs {
    /// Model file (.toml), orbital file or QCSchema result (JSON), XYZ file (.xyz, with --method) or cube
    /// file (.cube, .cube.gz)
    pub source: PathBuf,
    #[command(flatten)]
    pub xyz: XyzFlags,
    /// Field to draw: orbital:N, orbital-density:N, orbital-deformation:N (N = number,
    /// homo, lumo, homo-1, …), density, deformation, or stored:K of a cube file
    #[arg(long, required_unless_present = "panels", conflicts_with = "panels")]
    pub field: Option<String>,
    /// Several fields side by side with one camera, comma-separated (1 to 8)
    #[arg(long, value_name = "FIELD,FIELD,…")]
    pub panels: Option<String>,
    /// Isovalue in the field's unit (bohr^-3/2 for orbitals, e/bohr^3 for densities);
    /// signed fields get surfaces at +T and −T
    #[arg(
        long,
        value_name = "T",
        conflicts_with = "enclose",
        allow_negative_numbers = true
    )]
    pub iso: Option<f64>,
    /// Choose the isovalue whose surfaces enclose this fraction of the field's measure
    /// (∫f² for signed fields, ∫|f| for densities), as `inspect` does
    #[arg(
        long,
        value_name = "F",
        default_value_t = 0.90,
        allow_negative_numbers = true
    )]
    pub enclose: f64,
    /// Output picture: FILE.png, or FILE.svg (captions as vectors, scenes embedded as PNG)
    #[arg(long, value_name = "FILE", required_unless_present = "mesh")]
    pub png: Option<PathBuf>,
    /// Output mesh, by extension: .glb (glTF 2.0 binary), .ply or .obj; lengths in bohr
    #[arg(long, value_name = "FILE")]
    pub mesh: Option<PathBuf>,
    /// Also put the ball-and-stick molecule into the mesh file, as separate parts
    #[arg(long, requires = "mesh")]
    pub mesh_molecule: bool,
    /// Where to look from: +x, -x, +y, -y, +z, -z (from that side along the axis; up is
    /// +z, or +y looking along z), atoms:I,J (down the bond from atom I to J),
    /// normal:I,J,K (onto the plane of three atoms), or auto (along the direction the
    /// nuclei spread least, turned 30° and 25° to show depth)
    #[arg(long, default_value = "auto", allow_hyphen_values = true)]
    pub view: String,
    /// Then turn the view A degrees about the screen's horizontal axis and B degrees
    /// about its vertical axis (with auto, added to its own turn)
    #[arg(long, value_name = "A,B", allow_hyphen_values = true)]
    pub turn: Option<String>,
    /// Perspective projection instead of orthographic
    #[arg(long)]
    pub perspective: bool,
    /// Width, or width and height, of the picture in pixels (200 to 8000 each)
    /// [default: 1200 wide, panels 4:3]
    #[arg(long, value_name = "W[,H]")]
    pub size: Option<String>,
    /// Picture background
    #[arg(long, value_enum, default_value_t = Background::White)]
    pub background: Background,
    /// Surface opacity from 0.05 to 1; translucent surfaces show the molecule inside
    #[arg(long, default_value_t = 1.0, allow_negative_numbers = true)]
    pub opacity: f64,
    /// Title instead of the automatic one (^{…} raises, _{…} lowers)
    #[arg(long)]
    pub title: Option<String>,
    /// The box for wave-function sources, as for `volume` (a cube file is used on
    /// its own grid)
    #[command(flatten)]
    pub grid: super::box_flags::BoxFlags,
    #[command(flatten)]
    pub memory: MemoryFlag,
    #[command(flatten)]
    pub figure: FigureFlags,
}

/// Options read and checked before the source is loaded.
pub struct Request {
    pub fields: Vec<Field>,
    pub isovalue: Isovalue,
    pub size: (u32, Option<u32>),
    pub view: View,
    pub mesh: Option<MeshFormat>,
}

pub fn run(args: SurfaceArgs) -> Result<()> {
    let started = Instant::now();
    let meta = args.figure.meta(args.title.clone())?;
    super::common::figure_format(args.png.as_deref())?;
    let request = read_request(&args)?;
    let source = Source::load_for(
        &args.source,
        &args.xyz.options()?,
        Some(&request.fields),
        args.memory.memory,
    )?;
    let mut plan = OutputPlan::new(source.inputs());
    let png_slot = plan.add_opt(args.png.as_deref(), true)?;
    let mesh_slot = plan.add_opt(args.mesh.as_deref(), true)?;
    let orientation = request.view.orientation(source.molecule())?;
    let grid = grid_for(&args, &source)?;
    let mut timings = Timings::default();
    let found = surfaces_of(
        &source,
        &request.fields,
        &grid,
        request.isovalue,
        args.memory.memory,
        &mut timings,
    )?;
    let drawn: Drawn = draw(&args, &request, &source, &found, &orientation, &grid, meta)?;
    let mut out = plan.open()?;
    if let (Some(slot), Some(bytes)) = (png_slot, &drawn.png) {
        out.put(slot, bytes)?;
    }
    if let (Some(slot), Some(bytes)) = (mesh_slot, &drawn.mesh) {
        out.put(slot, bytes)?;
    }
    let written = out.commit()?;
    report(&written, &found, &grid, &source, &timings, &drawn, started)?;
    print_notes(&source.notes())?;
    Ok(())
}

fn read_request(args: &SurfaceArgs) -> Result<Request> {
    let (text, option) = match (&args.panels, &args.field) {
        (Some(p), _) => (p.as_str(), "--panels"),
        (None, Some(f)) => (f.as_str(), "--field"),
        (None, None) => ("", "--field"),
    };
    let fields = text
        .split(',')
        .filter(|s| !s.trim().is_empty())
        .map(Field::parse)
        .collect::<Result<Vec<_>>>()?;
    if fields.is_empty() || fields.len() > MAX_PANELS {
        return Err(Error::input(format!(
            "{option} takes 1 to {MAX_PANELS} fields, got {}",
            fields.len()
        )));
    }
    let isovalue = match args.iso {
        Some(t) if t.is_finite() && t > 0.0 => Isovalue::Fixed(t),
        Some(t) => {
            return Err(
                Error::input(format!("--iso must be a positive value, got {}", shown(t)))
                    .with_hint("signed fields get surfaces at +T and −T from one positive T"),
            );
        }
        None if args.enclose > 0.0 && args.enclose < 1.0 => Isovalue::Enclosing(args.enclose),
        None => {
            return Err(Error::input(format!(
                "--enclose takes a fraction above 0 and below 1, got {}",
                shown(args.enclose)
            )));
        }
    };
    if !(args.opacity.is_finite() && (MIN_OPACITY..=1.0).contains(&args.opacity)) {
        return Err(Error::input(format!(
            "--opacity takes {MIN_OPACITY} to 1, got {}",
            shown(args.opacity)
        )));
    }
    let size = parse_size(args.size.as_deref())?;
    // The picture with its copies (canvas, raster, PNG), before any work; a height
    // left to the layout is at most twice the width (two rows of 4:3 panels).
    let (w, h) = (size.0 as f64, size.1.map_or(2.0 * size.0 as f64, f64::from));
    lobecast::budget::check_memory(
        lobecast::source::budget::picture_memory(w, h),
        args.memory.memory,
        &format!("a picture of {w}×{h} pixels"),
    )?;
    let spec: ViewSpec = args.view.parse().map_err(|e: Error| e.context("--view"))?;
    let turn_deg = match &args.turn {
        Some(t) => parse_turn(t)?,
        None => [0.0, 0.0],
    };
    let view = View {
        spec,
        turn_deg,
        perspective: args.perspective,
    };
    let mesh = args
        .mesh
        .as_deref()
        .map(MeshFormat::from_path)
        .transpose()?;
    args.grid.check()?;
    Ok(Request {
        fields,
        isovalue,
        size,
        view,
        mesh,
    })
}

fn parse_size(text: Option<&str>) -> Result<(u32, Option<u32>)> {
    let Some(text) = text else {
        return Ok((DEFAULT_WIDTH, None));
    };
    let (lo, hi) = SIZE_RANGE;
    let mut parts = text.split(',');
    let w = parse_count("--size", parts.next().unwrap_or(""), lo, hi)? as u32;
    let h = parts
        .next()
        .map(|h| parse_count("--size", h, lo, hi))
        .transpose()?
        .map(|h| h as u32);
    if parts.next().is_some() {
        return Err(Error::input(format!(
            "--size takes W or W,H in pixels, got {text:?}"
        )));
    }
    Ok((w, h))
}

fn parse_turn(text: &str) -> Result<[f64; 2]> {
    let bad = || {
        Error::input(format!(
            "--turn takes two angles in degrees, A,B, got {text:?}"
        ))
    };
    let parts: Vec<f64> = text
        .split(',')
        .map(|p| p.trim().parse::<f64>().map_err(|_| bad()))
        .collect::<Result<_>>()?;
    match parts[..] {
        [a, b] if a.is_finite() && b.is_finite() && a.abs() <= 3600.0 && b.abs() <= 3600.0 => {
            Ok([a, b])
        }
        _ => Err(bad()),
    }
}

/// The box for a wave function (the `volume` defaults), or the cube file's own grid.
fn grid_for(args: &SurfaceArgs, source: &Source) -> Result<GridBox> {
    match source {
        Source::Volume { .. } if args.grid.any() => Err(Error::input(
            "--spacing, --points and --padding apply to wave-function sources; a cube file's surfaces are taken on its own grid",
        )),
        Source::Volume { volume, .. } => Ok(volume.info.header.grid.clone()),
        Source::Orbitals { set, .. } => args.grid.grid(&set.molecule),
    }
}

fn report(
    written: &[String],
    found: &[FieldSurfaces],
    grid: &GridBox,
    source: &Source,
    timings: &Timings,
    drawn: &Drawn,
    started: Instant,
) -> Result<()> {
    let [nx, ny, nz] = grid.counts;
    say!("wrote {}", written.join(", "));
    say!(
        "grid {nx}×{ny}×{nz} points at {:.4} bohr spacing ({}); sampling {:.2} s, extraction {:.2} s, drawing {:.2} s, total {:.2} s",
        lobecast::source::surfaces::spacing(grid),
        if source.has_box() {
            "the cube file's own grid"
        } else {
            "vertices on the exact field"
        },
        timings.sampling.as_secs_f64(),
        timings.extraction.as_secs_f64(),
        drawn.seconds,
        started.elapsed().as_secs_f64()
    );
    for f in found {
        say!(
            "  {}: isovalue {}{:.4e}, enclosing {:.1} % of {}",
            f.info.plain,
            if f.info.signed { "±" } else { "" },
            f.level,
            100.0 * f.enclosed,
            f.measure_text()
        );
        for s in &f.surfaces {
            let m = lobecast::surface::measure::measure(&s.mesh)?;
            say!(
                "    f = {:+.4e}: {} triangles, {} vertices, area {:.4} bohr², enclosed volume {:.4} bohr³{}",
                s.level,
                s.mesh.triangles.len(),
                s.mesh.positions.len(),
                m.area,
                m.volume,
                if s.open_edges > 0 {
                    " — open where it meets the box"
                } else {
                    ", closed"
                }
            );
        }
        if f.surfaces.iter().any(|s| s.open_edges > 0) {
            say!(
                "    note: the surface reaches the edge of the box and is cut open there; a larger --padding closes it"
            );
        }
    }
    Ok(())
}
