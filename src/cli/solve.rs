//! `lobecast solve`: orbital energies, occupations and make-up of a model.

use std::path::PathBuf;

use clap::Args;

use super::common::{XyzFlags, load_model_with, print_notes, print_out, say};
use lobecast::chem::units::hartree_to_ev;
use lobecast::error::Result;
use lobecast::solve::{Method, MethodKind, OrbitalSet, degenerate, orbitals_reporting};

#[derive(Debug, Args)]
pub struct SolveArgs {
    /// Model file (TOML), orbital source (a lobecast orbital file or a QCSchema
    /// result with a wave function, told apart by content), or XYZ file with --method
    pub model: PathBuf,
    #[command(flatten)]
    pub xyz: XyzFlags,
    /// Write the orbitals as an orbital file (JSON, bohr and hartree)
    #[arg(long, value_name = "FILE")]
    pub json: Option<PathBuf>,
    /// Write the orbitals as a QCSchema result document (qcschema_output version 1,
    /// bohr and hartree; Gaussian basis sets only)
    #[arg(long, value_name = "FILE")]
    pub qcschema: Option<PathBuf>,
    /// Memory budget (e.g. 512M, 8G): a solve estimated to need more is refused
    /// before it starts
    #[arg(long, value_name = "SIZE", default_value = lobecast::budget::DEFAULT_MEMORY_TEXT, value_parser = lobecast::budget::parse_size)]
    pub memory: u64,
}

pub fn run(args: SolveArgs) -> Result<()> {
    let model = load_model_with(&args.model, &args.xyz)?;
    // Planned before anything is printed: with `--json -` the report goes to
    // standard error, so the JSON on standard output stays parseable.
    let mut plan = lobecast::output::OutputPlan::new(&model.inputs);
    let json = plan.add_opt(args.json.as_deref(), false)?;
    let qcschema = plan.add_opt(args.qcschema.as_deref(), false)?;
    // A basis the schema cannot carry is refused before the solve, where it is known.
    if qcschema.is_some() {
        if let Some(b) = model.basis() {
            if !b.all_gaussian() {
                return Err(lobecast::error::Error::input(format!(
                    "--qcschema cannot write these orbitals: the basis ({}) has Slater functions",
                    b.name
                ))
                .with_hint("QCSchema documents carry Gaussian basis sets: use --method rhf/uhf or a Gaussian basis"));
            }
        }
    }
    // A long solve (over about 1e11 operations) shows a spinner on standard error
    // when it is a terminal; a Hartree–Fock run shows its integrals and iterations.
    let mut spinner = None;
    let mut scf_progress = super::scf_report::ScfProgress::new();
    let set = orbitals_reporting(
        &model.molecule,
        &model.method,
        args.memory,
        &mut |e| {
            if e.work > 1e11 && !matches!(model.method, Method::HartreeFock { .. }) {
                let what = format!("solving in {} basis functions", e.functions);
                spinner = Some(super::progress::spinner(&what));
            }
        },
        &mut |stage| scf_progress.on(stage),
    );
    scf_progress.finish();
    if let Some(s) = spinner {
        s.finish_and_clear();
    }
    let set = set?;
    if qcschema.is_some() {
        lobecast::io::qcschema::check(&set)?;
    }
    // The electrons the orbitals hold, as occupied: fractional occupations stay
    // fractional (an orbital file may carry them).
    let occupied: f64 = set.occupied().map(|o| o.occupation).sum();
    let electrons = if (occupied - occupied.round()).abs() <= 1e-9 {
        format!("{}", occupied.round())
    } else {
        format!("{occupied:.4}")
    };
    let what = format!(
        "lobecast solve: {} from {}, {}",
        set.molecule.formula_with_charge(),
        model.path.display(),
        set.method
    );
    if let Some(r) = set.spin.scf.as_deref() {
        say!(
            "{what}, {electrons} electrons ({} alpha, {} beta), multiplicity {}, {} basis functions",
            r.alpha_electrons,
            r.beta_electrons,
            set.spin.multiplicity.unwrap_or(1),
            set.basis.len()
        );
        print_out(&super::scf_report::report(&set, r))?;
    } else if set.reference.is_some() || set.origin == MethodKind::ExtendedHuckel {
        say!("{what}, {electrons} valence electron(s); orbital energies only (no total energy)");
    } else if set.origin == MethodKind::File {
        say!(
            "{what}, {electrons} electron(s); orbital energies as the file states them{}",
            set.spin.total_energy.map_or(String::new(), |e| format!(
                "; total energy {e:.10} hartree (from the file)"
            ))
        );
    } else {
        say!(
            "{what}, {electrons} electron(s); energies include the nuclear repulsion {:.8} hartree",
            set.molecule.nuclear_repulsion()
        );
    }
    if set.origin == MethodKind::File {
        say!("{}", basis_summary(&set));
    }
    if let Some(beta) = &set.spin.beta {
        say!("alpha orbitals:");
        print_out(&table(&set))?;
        let mut b = set.clone();
        b.orbitals = beta.clone();
        say!("beta orbitals:");
        print_out(&table(&b))?;
    } else {
        print_out(&table(&set))?;
    }
    if let Some(q) = set.mulliken_charges() {
        print_out(&charges(&set, &q))?;
    }
    print_notes(&set.statements())?;
    if json.is_some() || qcschema.is_some() {
        let qc_text = qcschema
            .map(|_| lobecast::io::qcschema::to_json(&set))
            .transpose()?;
        let mut out = plan.open()?;
        if let Some(slot) = json {
            out.put(slot, lobecast::io::orbitals::to_json(&set).as_bytes())?;
        }
        if let (Some(slot), Some(text)) = (qcschema, qc_text) {
            out.put(slot, text.as_bytes())?;
        }
        for name in out.commit()? {
            say!("wrote {name}");
        }
    }
    Ok(())
}

/// The orbital table. A member of a degenerate set carries the set's mark (D1, D2,
/// …) in the `set` column, and a line under the table names each set's members.
fn table(set: &OrbitalSet) -> String {
    let sets = degenerate::sets(set);
    let mut t = format!(
        "{:>4} {:>16} {:>12} {:>5} {:>4} {:>3}  {}\n",
        "#", "energy/hartree", "energy/eV", "occ", "", "set", "largest coefficients"
    );
    let homo = set.orbitals.iter().rposition(|o| o.occupation > 1e-12);
    let lumo = homo.map_or(0, |h| h + 1);
    for (i, o) in set.orbitals.iter().enumerate() {
        let mark = if Some(i) == homo {
            "HOMO"
        } else if i == lumo {
            "LUMO"
        } else {
            ""
        };
        let tag = sets
            .iter()
            .position(|r| r.contains(&i))
            .map_or(String::new(), |k| format!("D{}", k + 1));
        t += &format!(
            "{:>4} {:16.8} {:12.5} {:5.2} {mark:>4} {tag:>3}  {}\n",
            i + 1,
            o.energy,
            hartree_to_ev(o.energy),
            o.occupation,
            character(set, &o.coefficients)
        );
    }
    for (k, r) in sets.iter().enumerate() {
        let form = if degenerate::equally_occupied(set, r) {
            "shown in the axis-aligned form (see README, degenerate orbitals)"
        } else {
            "occupations differ, left as given"
        };
        t += &format!(
            "D{}: {} are degenerate (within {}); {form}\n",
            k + 1,
            degenerate::members(r),
            degenerate::tolerance_text(set)
        );
    }
    t
}

/// "basis 6-31G*: 19 functions on 3 atoms (s 7, p 6, d 6 Cartesian)": what an
/// orbital source's orbitals are made of.
fn basis_summary(set: &OrbitalSet) -> String {
    use lobecast::basis::{Angular, Shell};
    let mut counts = [0usize; 4];
    let mut forms = Vec::new();
    let mut slater = 0;
    for s in &set.basis.shells {
        match s {
            Shell::Gaussian(g) => {
                counts[g.l as usize] += g.len();
                if g.l >= 2 {
                    let form = if matches!(g.functions[0], Angular::Pure(_)) {
                        "pure"
                    } else {
                        "Cartesian"
                    };
                    if !forms.contains(&form) {
                        forms.push(form);
                    }
                }
            }
            Shell::Slater(s) => slater += s.ms.len(),
        }
    }
    let mut parts: Vec<String> = ["s", "p", "d", "f"]
        .iter()
        .zip(counts)
        .filter(|(_, n)| *n > 0)
        .map(|(l, n)| format!("{l} {n}"))
        .collect();
    if slater > 0 {
        parts.push(format!("Slater {slater}"));
    }
    let forms = if forms.is_empty() {
        String::new()
    } else {
        format!("; d/f {}", forms.join(" and "))
    };
    format!(
        "basis {}: {} functions in {} shells on {} atoms ({}{forms})",
        set.basis.name,
        set.basis.len(),
        set.basis.shells.len(),
        set.molecule.atoms.len(),
        parts.join(", ")
    )
}

/// Mulliken charges per atom (valence electrons of the free atom minus the gross
/// population), labelled with the method's caution.
fn charges(set: &OrbitalSet, q: &[f64]) -> String {
    let kind = if set.origin == MethodKind::ExtendedHuckel {
        "semi-empirical, qualitative"
    } else {
        "they depend strongly on the basis set"
    };
    let mut t = format!("Mulliken charges ({kind}):\n");
    for (i, (a, q)) in set.molecule.atoms.iter().zip(q).enumerate() {
        t += &format!("{:>4} {:<2} {:+9.4}\n", i + 1, a.element.symbol, q);
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
