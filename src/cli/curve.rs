//! `lobecast curve`: the energy curve of a two-centre one-electron model.

use std::path::PathBuf;

use clap::Args;
use serde::Serialize;

use super::common::{length, load_model, print_notes};
use crate::basis::{BasisFunction, BasisSetName};
use crate::chem::LengthUnit;
use crate::chem::units::{bohr_to_angstrom, hartree_to_ev};
use crate::error::{Error, Result};
use crate::output::write_bytes;
use crate::solve::curve::{self, CurvePoint, Equilibrium, ZetaChoice};
use crate::solve::one_electron::MINIMAL_BASIS_CAVEAT;

#[derive(Debug, Args)]
pub struct CurveArgs {
    /// Model file (TOML) with exactly two identical atoms and one electron
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
    #[arg(long, value_enum, default_value_t = LengthUnit::Angstrom)]
    pub units: LengthUnit,
    /// Choose the 1s exponent ζ that minimises the bonding energy at every R
    #[arg(long)]
    pub optimize_zeta: bool,
    /// Write the curve as CSV (lengths in bohr and Å, energies in hartree)
    #[arg(long, value_name = "FILE")]
    pub csv: Option<PathBuf>,
    /// Write the curve and its refined equilibrium as JSON
    #[arg(long, value_name = "FILE")]
    pub json: Option<PathBuf>,
    /// Draw the energies as a PNG chart, and S, J and K beside it in FILE-integrals.png
    #[arg(long, value_name = "FILE")]
    pub png: Option<PathBuf>,
}

/// What the model must be for the closed forms: two identical nuclei, one electron,
/// the slater-1s set. Returns (Z, ζ, element symbol).
fn two_centre_parameters(model: &crate::model::Model) -> Result<(f64, f64, &'static str)> {
    let m = &model.molecule;
    if m.atoms.len() != 2 {
        return Err(Error::input(format!(
            "curve needs a model of exactly two atoms; this one has {}",
            m.atoms.len()
        )));
    }
    let (a, b) = (&m.atoms[0], &m.atoms[1]);
    if a.element != b.element {
        return Err(Error::input(format!(
            "curve needs two identical atoms; this model has {} and {}",
            a.element.symbol, b.element.symbol
        )));
    }
    if m.electron_count() != 1 {
        return Err(Error::input(format!(
            "curve treats a one-electron ion, but this model has {} electrons (nuclear charges {} minus charge {})",
            m.electron_count(),
            2 * a.element.atomic_number,
            m.charge
        ))
        .with_hint(format!("set [molecule] charge = {}", 2 * a.element.atomic_number - 1)));
    }
    if model.basis.name != BasisSetName::Slater1s {
        return Err(Error::input("curve needs the slater-1s basis set"));
    }
    let BasisFunction::Slater1s(fa) = &model.basis.functions[0];
    Ok((a.charge(), fa.zeta, a.element.symbol))
}

pub fn run(args: CurveArgs) -> Result<()> {
    let model = load_model(&args.model)?;
    let (z, zeta, symbol) = two_centre_parameters(&model)?;
    let rs = curve::separations(
        length(args.from, args.units),
        length(args.to, args.units),
        length(args.step, args.units),
    )?;
    let pngs = args.png.as_ref().map(|p| (p.clone(), integrals_path(p)));
    let png_paths = pngs.iter().flat_map(|(a, b)| [a, b]);
    for path in [&args.csv, &args.json]
        .into_iter()
        .flatten()
        .chain(png_paths)
    {
        crate::output::check_not_input(path, &model.inputs)?;
    }
    let choice = if args.optimize_zeta {
        ZetaChoice::Optimized
    } else {
        ZetaChoice::Fixed(zeta)
    };
    let points = curve::scan(z, choice, &rs);
    let eq = curve::equilibrium(z, choice, &points);
    let limit = curve::separated_limit(z);
    let zeta_text = if args.optimize_zeta {
        "optimised at each R".to_string()
    } else {
        format!("{zeta}")
    };
    println!(
        "lobecast curve: {}, one electron, Z = {z}, one 1s Slater function per nucleus, ζ = {zeta_text}; {} separations",
        model.molecule.formula_with_charge(),
        points.len()
    );
    print!("{}", table(&points, args.optimize_zeta));
    match &eq {
        Some(e) => println!("{}", equilibrium_line(e, limit, args.optimize_zeta)),
        None => println!(
            "no minimum inside the scan: the lowest bonding energy is at an end; widen --from/--to"
        ),
    }
    print_notes(&[MINIMAL_BASIS_CAVEAT.to_string()]);
    if let Some(path) = &args.csv {
        write_bytes(
            path,
            &model.inputs,
            csv(&points, z, &zeta_text, args.optimize_zeta).as_bytes(),
        )?;
        eprintln!("wrote {}", path.display());
    }
    if let Some(path) = &args.json {
        let doc = CurveJson::new(&model.path, symbol, z, &zeta_text, &points, eq, limit);
        let text =
            serde_json::to_string_pretty(&doc).map_err(|e| Error::internal(e.to_string()))?;
        write_bytes(path, &model.inputs, (text + "\n").as_bytes())?;
        eprintln!("wrote {}", path.display());
    }
    if let Some((energy_png, integrals_png)) = &pngs {
        let data = chart_data(&model, &points, eq, limit, &zeta_text);
        let energies = crate::plot::curve::energies(&data)?;
        write_bytes(energy_png, &model.inputs, &energies.encode_png())?;
        eprintln!("wrote {}", energy_png.display());
        let integrals = crate::plot::curve::integrals(&data)?;
        write_bytes(integrals_png, &model.inputs, &integrals.encode_png())?;
        eprintln!("wrote {}", integrals_png.display());
    }
    Ok(())
}

/// `curve.png` → `curve-integrals.png`: where the S, J, K chart goes.
pub fn integrals_path(png: &std::path::Path) -> PathBuf {
    let stem = png
        .file_stem()
        .map(|s| s.to_string_lossy().into_owned())
        .unwrap_or_default();
    let ext = png
        .extension()
        .map(|e| format!(".{}", e.to_string_lossy()))
        .unwrap_or_else(|| ".png".into());
    png.with_file_name(format!("{stem}-integrals{ext}"))
}

fn chart_data(
    model: &crate::model::Model,
    points: &[CurvePoint],
    eq: Option<Equilibrium>,
    limit: f64,
    zeta_text: &str,
) -> crate::plot::curve::CurveData {
    let col = |f: fn(&CurvePoint) -> f64| points.iter().map(f).collect::<Vec<f64>>();
    let formula = crate::render::text::formula_markup(&model.molecule.formula_with_charge());
    crate::plot::curve::CurveData {
        title: format!("{formula}, one 1s Slater function per nucleus, ζ = {zeta_text}"),
        r: col(|p| p.r),
        overlap: col(|p| p.model.s),
        coulomb: col(|p| p.model.coulomb),
        exchange: col(|p| p.model.exchange),
        e_bonding: col(|p| p.model.e_bonding),
        e_antibonding: col(|p| p.model.e_antibonding),
        equilibrium: eq.map(|e| (e.r, e.energy)),
        limit,
        footnotes: vec![
            "Total energies at fixed nuclei (nuclear repulsion included); 1 hartree = 27.211386 eV, 1 bohr = 0.529177 Å.".into(),
            "Minimal basis: energies are variational upper bounds and the bond is too weak; use them for trends.".into(),
        ],
        width: 1000,
    }
}

fn table(points: &[CurvePoint], with_zeta: bool) -> String {
    let mut t = format!(
        "{:>9} {:>9} {:>10} {:>12} {:>12} {:>13} {:>13}{}\n",
        "R/bohr",
        "R/Å",
        "S",
        "J/hartree",
        "K/hartree",
        "E+/hartree",
        "E-/hartree",
        if with_zeta {
            format!(" {:>8}", "ζ")
        } else {
            String::new()
        }
    );
    for p in points {
        let m = &p.model;
        t += &format!(
            "{:9.4} {:9.4} {:10.6} {:12.7} {:12.7} {:13.8} {:13.8}{}\n",
            p.r,
            bohr_to_angstrom(p.r),
            m.s,
            m.coulomb,
            m.exchange,
            m.e_bonding,
            m.e_antibonding,
            if with_zeta {
                format!(" {:8.5}", p.zeta)
            } else {
                String::new()
            }
        );
    }
    t
}

fn equilibrium_line(e: &Equilibrium, limit: f64, with_zeta: bool) -> String {
    let de = limit - e.energy;
    format!(
        "equilibrium of the bonding state: R_e = {:.5} bohr ({:.5} Å), E = {:.8} hartree{}; \
         binding energy D_e = {:.6} hartree = {:.4} eV (from the separated limit {:.4} hartree)",
        e.r,
        bohr_to_angstrom(e.r),
        e.energy,
        if with_zeta {
            format!(" at ζ = {:.6}", e.zeta)
        } else {
            String::new()
        },
        de,
        hartree_to_ev(de),
        limit
    )
}

fn csv(points: &[CurvePoint], z: f64, zeta_text: &str, with_zeta: bool) -> String {
    let mut t = format!(
        "# lobecast {} energy curve: two identical nuclei of charge Z = {z}, one electron, one normalised 1s Slater function per nucleus, zeta = {zeta_text}\n\
         # units: r_bohr in bohr, r_angstrom in angstrom, overlap dimensionless, all energies in hartree\n\
         # overlap S = <phiA|phiB>; E_atom = zeta^2/2 - Z*zeta (one 1s function on its own nucleus)\n\
         # coulomb J = H_AA - E_atom; exchange K = H_AB - E_atom*S; H includes the nuclear repulsion Z^2/R\n\
         # e_bonding = E_atom + (J+K)/(1+S); e_antibonding = E_atom + (J-K)/(1-S); for zeta = Z: J = Z^2/R + <phiA|-Z/rB|phiA>, K = S*Z^2/R + <phiB|-Z/rB|phiA>\n\
         # caution: {MINIMAL_BASIS_CAVEAT}\n\
         r_bohr,r_angstrom,overlap,coulomb,exchange,e_bonding,e_antibonding{}\n",
        env!("CARGO_PKG_VERSION"),
        if with_zeta { ",zeta" } else { "" }
    );
    for p in points {
        let m = &p.model;
        t += &format!(
            "{},{},{:.12e},{:.12e},{:.12e},{:.12e},{:.12e}",
            p.r,
            bohr_to_angstrom(p.r),
            m.s,
            m.coulomb,
            m.exchange,
            m.e_bonding,
            m.e_antibonding
        );
        if with_zeta {
            t += &format!(",{:.10}", p.zeta);
        }
        t += "\n";
    }
    t
}

#[derive(Serialize)]
struct CurveJson {
    format: &'static str,
    version: u32,
    model: String,
    element: &'static str,
    nuclear_charge: f64,
    zeta: String,
    length_unit: &'static str,
    energy_unit: &'static str,
    separated_limit_hartree: f64,
    equilibrium: Option<EquilibriumJson>,
    points: Vec<PointJson>,
    notes: Vec<String>,
}

#[derive(Serialize)]
struct EquilibriumJson {
    r_bohr: f64,
    r_angstrom: f64,
    energy_hartree: f64,
    binding_energy_hartree: f64,
    binding_energy_ev: f64,
    zeta: f64,
}

#[derive(Serialize)]
struct PointJson {
    r_bohr: f64,
    r_angstrom: f64,
    overlap: f64,
    coulomb: f64,
    exchange: f64,
    e_bonding: f64,
    e_antibonding: f64,
    zeta: f64,
}

impl CurveJson {
    fn new(
        path: &std::path::Path,
        element: &'static str,
        z: f64,
        zeta: &str,
        points: &[CurvePoint],
        eq: Option<Equilibrium>,
        limit: f64,
    ) -> Self {
        CurveJson {
            format: "lobecast-curve",
            version: 1,
            model: path.display().to_string(),
            element,
            nuclear_charge: z,
            zeta: zeta.to_string(),
            length_unit: "bohr",
            energy_unit: "hartree",
            separated_limit_hartree: limit,
            equilibrium: eq.map(|e| EquilibriumJson {
                r_bohr: e.r,
                r_angstrom: bohr_to_angstrom(e.r),
                energy_hartree: e.energy,
                binding_energy_hartree: limit - e.energy,
                binding_energy_ev: hartree_to_ev(limit - e.energy),
                zeta: e.zeta,
            }),
            points: points
                .iter()
                .map(|p| PointJson {
                    r_bohr: p.r,
                    r_angstrom: bohr_to_angstrom(p.r),
                    overlap: p.model.s,
                    coulomb: p.model.coulomb,
                    exchange: p.model.exchange,
                    e_bonding: p.model.e_bonding,
                    e_antibonding: p.model.e_antibonding,
                    zeta: p.zeta,
                })
                .collect(),
            notes: vec![MINIMAL_BASIS_CAVEAT.to_string()],
        }
    }
}
