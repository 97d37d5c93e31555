//! `lobecast volume`: sample fields on a box around the molecule into a cube file.

use std::io::IsTerminal;
use std::path::PathBuf;
use std::time::Instant;

use clap::Args;

use super::common::{XyzFlags, load_model_with, print_notes, say};
use lobecast::error::{Error, Result};
use lobecast::field::{Field, FieldSampler};
use lobecast::grid::GridBox;
use lobecast::io::cube::sink::CubeSink;
use lobecast::io::cube::write_streaming;
use lobecast::output::OutputPlan;

#[derive(Debug, Args)]
pub struct VolumeArgs {
    /// Model file (TOML), orbital file or QCSchema result (JSON), or XYZ file with --method
    pub model: PathBuf,
    #[command(flatten)]
    pub xyz: XyzFlags,
    /// Field to sample; repeat for several (stored together in one multi-orbital cube).
    /// orbital:N, orbital-density:N, orbital-deformation:N (N = number, homo, lumo,
    /// homo-1, lumo+1, …), density, or deformation (against neutral spherical atoms)
    #[arg(long = "field", required = true, value_name = "FIELD")]
    pub fields: Vec<String>,
    #[command(flatten)]
    pub grid: super::box_flags::BoxFlags,
    /// Output cube file (lengths in bohr; a name ending in .gz is gzip-compressed)
    #[arg(long, value_name = "FILE")]
    pub out: PathBuf,
    #[command(flatten)]
    pub memory: super::common::MemoryFlag,
    /// Refuse to write a file larger than this many bytes
    #[arg(long, default_value_t = 4_000_000_000, value_name = "BYTES")]
    pub max_bytes: u64,
}

pub fn run(args: VolumeArgs) -> Result<()> {
    let started = Instant::now();
    let fields = args
        .fields
        .iter()
        .map(|f| Field::parse(f))
        .collect::<Result<Vec<_>>>()?;
    let model = load_model_with(&args.model, &args.xyz)?;
    let mut plan = OutputPlan::new(&model.inputs);
    let slot = plan.add(&args.out)?;
    args.grid.check()?;
    let mut set = lobecast::solve::orbitals_within(
        &model.molecule,
        &model.method,
        args.memory.memory,
        &mut |_| {},
    )?;
    if let Some(c) = args.xyz.spin {
        set.show(c)?;
    }
    let sampler = FieldSampler::new(&set, &fields)?;
    let grid = args.grid.grid(&set.molecule)?;
    let source = model.path.display().to_string();
    let header = lobecast::io::cube::header_for(&set, &fields, grid.clone(), &source)?;
    let bytes = header.predicted_bytes();
    if bytes > args.max_bytes {
        return Err(Error::input(format!(
            "the cube would be {:.2} GB ({} points × {} fields), above --max-bytes {}",
            bytes as f64 / 1e9,
            grid.point_count(),
            fields.len(),
            args.max_bytes
        ))
        .with_hint("use a coarser --spacing, fewer --points, or raise --max-bytes"));
    }
    header.check_fits()?;
    let mut out = plan.open()?;
    let bar = progress_bar(&grid);
    {
        let mut w = CubeSink::new(out.writer(slot), &args.out);
        write_streaming(
            &header,
            |s, v| sampler.evaluate_slab(s, v),
            &mut w,
            &|done| bar.set_position(done as u64),
        )?;
        w.finish()?;
    }
    bar.finish_and_clear();
    let written = out.commit()?.remove(0);
    let [nx, ny, nz] = grid.counts;
    say!(
        "wrote {}: {} field(s), {nx}×{ny}×{nz} points at {:.6} bohr spacing, {:.1} MB, in {:.2} s",
        written,
        fields.len(),
        grid.axes[0][0],
        bytes as f64 / 1e6,
        started.elapsed().as_secs_f64()
    );
    for f in &fields {
        say!("  {}", f.describe(&set)?);
    }
    print_notes(&set.statements())?;
    Ok(())
}

/// A bar on standard error for large grids when it is a terminal; hidden otherwise.
fn progress_bar(grid: &GridBox) -> indicatif::ProgressBar {
    if grid.point_count() < 2_000_000 || !std::io::stderr().is_terminal() {
        return indicatif::ProgressBar::hidden();
    }
    let bar = indicatif::ProgressBar::new(grid.counts[0] as u64);
    if let Ok(style) =
        indicatif::ProgressStyle::with_template("{msg} [{bar:40}] {pos}/{len} slabs, {eta} left")
    {
        bar.set_style(style.progress_chars("=> "));
    }
    bar.set_message("sampling and writing");
    bar
}
