//! `lobecast solve`: orbital energies, occupations and make-up of a model.

use std::path::PathBuf;

use clap::Args;

use super::common::{load_model, print_notes, print_out, say};
use crate::chem::units::hartree_to_ev;
use crate::error::Result;
use crate::solve::{OrbitalSet, orbitals_for};

#[derive(Debug, Args)]
pub struct SolveArgs {
    /// Model file (TOML) or orbital file (.json)
    pub model: PathBuf,
    /// Write the orbitals as an orbital file (JSON, bohr and hartree)
    #[arg(long, value_name = "FILE")]
    pub json: Option<PathBuf>,
}

pub fn run(args: SolveArgs) -> Result<()> {
    let model = load_model(&args.model)?;
    if let Some(path) = &args.json {
        crate::output::check_not_input(path, &model.inputs)?;
    }
    let set = orbitals_for(&model)?;
    say!(
        "lobecast solve: {} from {}, {}, {} electron(s); energies include the nuclear repulsion {:.8} hartree",
        set.molecule.formula_with_charge(),
        model.path.display(),
        set.method,
        set.molecule.electron_count(),
        set.molecule.nuclear_repulsion()
    );
    print_out(&table(&set))?;
    print_notes(&set.notes)?;
    if let Some(path) = &args.json {
        crate::output::write_bytes(
            path,
            &model.inputs,
            crate::solve::orbital_file::to_json(&set).as_bytes(),
        )?;
        eprintln!("wrote {}", path.display());
    }
    Ok(())
}

fn table(set: &OrbitalSet) -> String {
    let mut t = format!(
        "{:>4} {:>16} {:>12} {:>5}  {}\n",
        "#", "energy/hartree", "energy/eV", "occ", "largest coefficients"
    );
    for (i, o) in set.orbitals.iter().enumerate() {
        t += &format!(
            "{:>4} {:16.8} {:12.5} {:5.2}  {}\n",
            i + 1,
            o.energy,
            hartree_to_ev(o.energy),
            o.occupation,
            character(set, &o.coefficients)
        );
    }
    t
}

/// The biggest few coefficients with their atoms and functions, e.g.
/// "H1 1s(ζ=1.000) +0.5480, H2 1s(ζ=1.000) −0.5480".
fn character(set: &OrbitalSet, c: &[f64]) -> String {
    let labels = set.basis.function_labels();
    let mut order: Vec<usize> = (0..c.len()).collect();
    // Equal magnitudes (to 1e-9) keep basis order, so symmetric orbitals read A then B.
    order.sort_by_key(|&m| (-(c[m].abs() * 1e9).round() as i64, m));
    order
        .iter()
        .take(4)
        .filter(|&&m| c[m].abs() > 1e-3)
        .map(|&m| {
            let (atom, label) = &labels[m];
            format!(
                "{}{} {label} {:+.4}",
                set.molecule.atoms[*atom].element.symbol,
                atom + 1,
                c[m]
            )
        })
        .collect::<Vec<_>>()
        .join(", ")
}
