//! `lobecast curve`: energy curves of a two-atom one-electron model. With the
//! `slater-1s` set on two identical atoms the closed forms give S, J and K too;
//! any other basis is solved at every separation.

use std::path::PathBuf;

use clap::Args;

use super::common::{load_model, print_notes, print_out, say};
use super::curve_charts as charts;
use super::curve_report as report;
use lobecast::basis::{Basis, BasisSpec, Shell};
use lobecast::chem::{LengthUnit, Molecule};
use lobecast::error::{Error, Result};
use lobecast::field::buildup;
use lobecast::io::model::Model;
use lobecast::output::OutputPlan;
use lobecast::solve::curve::{self, ZetaChoice};
use lobecast::solve::one_electron::MINIMAL_BASIS_CAVEAT;
use lobecast::solve::{Method, OrbitalSet};

#[derive(Debug, Args)]
pub struct CurveArgs {
    /// Model file (TOML) with exactly two atoms and one electron
    pub model: PathBuf,
    /// First separation R (in --units)
    #[arg(long, allow_negative_numbers = true)]
    pub from: f64,
    /// Last separation R (in --units), included when the steps land on it
    #[arg(long, allow_negative_numbers = true)]
    pub to: f64,
    /// Step in R (in --units)
    #[arg(long, allow_negative_numbers = true)]
    pub step: f64,
    /// Unit of --from, --to and --step
    #[arg(long, value_parser = super::values::length_unit(), default_value = "angstrom")]
    pub units: LengthUnit,
    /// Choose the 1s exponent ζ that minimises the bonding energy at every R (slater-1s only)
    #[arg(long)]
    pub optimize_zeta: bool,
    /// Number of lowest states to report for bases other than slater-1s (1 to 100)
    /// [default: 2]
    #[arg(long, value_name = "K")]
    pub states: Option<String>,
    /// Write the curve as CSV (lengths in bohr and Å, energies in hartree)
    #[arg(long, value_name = "FILE")]
    pub csv: Option<PathBuf>,
    /// Write the curve and its refined equilibrium as JSON
    #[arg(long, value_name = "FILE")]
    pub json: Option<PathBuf>,
    /// Add the build-up columns: electrons gained or lost between the nuclei by the
    /// bonding and antibonding orbitals (orbitals 1 and 2), and their deformation
    /// density at the bond midpoint; with --png also FILE-buildup.png
    #[arg(long)]
    pub buildup: bool,
    /// Draw the energies as a chart, FILE.png or FILE.svg (and, for the slater-1s
    /// closed forms, S, J and K beside it in FILE-integrals.png or .svg)
    #[arg(long, value_name = "FILE")]
    pub png: Option<PathBuf>,
    #[command(flatten)]
    pub figure: super::common::FigureFlags,
}

/// Checks what every curve needs: two atoms, one electron, a basis to rebuild.
fn two_atom_model(model: &Model) -> Result<(&Molecule, &BasisSpec, &Basis)> {
    let m = &model.molecule;
    if m.atoms.len() != 2 {
        return Err(Error::input(format!(
            "curve needs a model of exactly two atoms; this one has {}",
            m.atoms.len()
        )));
    }
    let (spec, basis) = match (&model.spec, &model.method) {
        (Some(spec), Method::OneElectron { basis }) => (spec, basis),
        _ => {
            return Err(Error::input(
                "curve needs a model that lobecast solves (method = \"one-electron\"), not an orbital file",
            ));
        }
    };
    let nuclear = m.atoms[0].element.atomic_number + m.atoms[1].element.atomic_number;
    if m.electron_count() != 1 {
        return Err(Error::input(format!(
            "curve treats a one-electron ion, but this model has {} electrons (nuclear charges {nuclear} minus charge {})",
            m.electron_count(),
            m.charge
        ))
        .with_hint(format!("set [molecule] charge = {}", nuclear - 1)));
    }
    Ok((m, spec, basis))
}

/// The one-electron orbitals of the two-atom `template` moved to separation `r`.
fn solve_at(template: &Molecule, spec: &BasisSpec, r: f64) -> Result<OrbitalSet> {
    let molecule = curve::at_separation(template, r)?;
    let method = Method::OneElectron {
        basis: spec.build(&molecule)?,
    };
    lobecast::solve::orbitals_for(&molecule, &method)
}

/// The most states `--states` reports.
pub const MAX_STATES: u64 = 100;

pub fn run(args: CurveArgs) -> Result<()> {
    let meta = args.figure.meta(None)?;
    let format = super::common::figure_format(args.png.as_deref())?;
    let states = match &args.states {
        Some(k) => super::common::parse_count("--states", k, 1, MAX_STATES)? as usize,
        None => 2,
    };
    let model = load_model(&args.model)?;
    let (molecule, spec, basis) = two_atom_model(&model)?;
    let rs = curve::separations_in(args.from, args.to, args.step, args.units)?;
    let (a, b) = (&molecule.atoms[0], &molecule.atoms[1]);
    let closed_form = spec.is_slater_1s() && a.element == b.element;
    if closed_form && args.states.is_some() {
        return Err(Error::input(
            "--states applies to bases other than slater-1s on two identical atoms, whose curve always gives the bonding and antibonding states",
        ));
    }
    if args.png.is_some() && !closed_form && states < 2 {
        return Err(Error::input("--png needs at least two states (--states 2)"));
    }
    // Every output is checked before the scan; the integral chart exists only for
    // the closed form and the build-up chart only with --buildup.
    let mut plan = OutputPlan::new(&model.inputs);
    let csv = plan.add_opt(args.csv.as_deref(), false)?;
    let json = plan.add_opt(args.json.as_deref(), false)?;
    let energy_png = plan.add_opt(args.png.as_deref(), true)?;
    if args.png.as_deref() == Some(std::path::Path::new("-")) && (closed_form || args.buildup) {
        return Err(Error::input(
            "--png - sends one chart to standard output, but this curve draws more than one (FILE-integrals.png or FILE-buildup.png beside FILE)",
        )
        .with_hint("give --png a file name"));
    }
    let integrals_png = match &args.png {
        Some(p) if closed_form => Some(plan.add_binary(&suffixed(p, "integrals"))?),
        _ => None,
    };
    let buildup_png = match &args.png {
        Some(p) if args.buildup => Some(plan.add_binary(&suffixed(p, "buildup"))?),
        _ => None,
    };
    if args.optimize_zeta && !closed_form {
        return Err(Error::input(
            "--optimize-zeta works with the slater-1s set on two identical atoms",
        ));
    }
    let chart;
    let mut buildups = None;
    let doc = if closed_form {
        let Shell::Slater(s) = &basis.shells[0] else {
            return Err(Error::internal("slater-1s without a Slater shell"));
        };
        let choice = if args.optimize_zeta {
            ZetaChoice::Optimized
        } else {
            ZetaChoice::Fixed(s.zeta)
        };
        let z = a.charge();
        let points = curve::scan(z, choice, &rs);
        let eq = curve::equilibrium(z, choice, &points);
        chart = Some(charts::two_centre(&model, &points, eq, choice));
        if args.buildup {
            let zetas: Vec<f64> = points.iter().map(|p| p.zeta).collect();
            buildups = Some(buildup::along_curve(&rs, |i, r| {
                let mut spec = spec.clone();
                spec.zeta = [(a.element.symbol.to_string(), zetas[i])].into();
                solve_at(molecule, &spec, r)
            })?);
        }
        report::TwoCentre {
            model: &model,
            z,
            choice,
            points,
            eq,
            buildup: buildups.as_deref(),
        }
        .into_document()
    } else {
        let points = curve::scan_states(molecule, spec, &rs, states)?;
        let eq = curve::states_equilibrium(molecule, spec, &points)?;
        chart = charts::states(&model, &points, eq);
        if args.buildup {
            buildups = Some(buildup::along_curve(&rs, |_, r| {
                solve_at(molecule, spec, r)
            })?);
        }
        report::States {
            model: &model,
            points,
            eq,
            buildup: buildups.as_deref(),
        }
        .into_document()
    };
    print_out(&doc.table)?;
    say!("{}", doc.equilibrium_line);
    if doc.minimal_basis {
        print_notes(&[MINIMAL_BASIS_CAVEAT.to_string()])?;
    }
    let mut files = Vec::new();
    if let Some(slot) = csv {
        files.push((slot, doc.csv.into_bytes()));
    }
    if let Some(slot) = json {
        files.push((slot, doc.json.into_bytes()));
    }
    if let Some(slot) = energy_png {
        let data = chart
            .as_ref()
            .ok_or_else(|| Error::input("--png needs at least two states (--states 2)"))?;
        files.push((
            slot,
            lobecast::plot::curve::energies(data)?.encode(format, &meta)?,
        ));
        if let Some(slot) = integrals_png {
            files.push((
                slot,
                lobecast::plot::curve::integrals(data)?.encode(format, &meta)?,
            ));
        }
        if let (Some(slot), Some(b)) = (buildup_png, &buildups) {
            files.push((
                slot,
                charts::buildup(&model, &rs, b)?.encode(format, &meta)?,
            ));
        }
    }
    let mut out = plan.open()?;
    for (slot, bytes) in &files {
        out.put(*slot, bytes)?;
    }
    for name in out.commit()? {
        say!("wrote {name}");
    }
    Ok(())
}

/// `curve.png` → `curve-integrals.png`: where the companion charts go.
pub fn suffixed(png: &std::path::Path, what: &str) -> PathBuf {
    let stem = png
        .file_stem()
        .map(|s| s.to_string_lossy().into_owned())
        .unwrap_or_default();
    let ext = png
        .extension()
        .map(|e| format!(".{}", e.to_string_lossy()))
        .unwrap_or_else(|| ".png".into());
    png.with_file_name(format!("{stem}-{what}{ext}"))
}
