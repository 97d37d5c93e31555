//! What `solve` prints for a Hartree–Fock run: progress while it works, then the
//! energy and its parts, convergence, dipole and ⟨S²⟩. The orbital tables and
//! Mulliken charges are `solve`'s own.

use std::io::IsTerminal;

use indicatif::ProgressBar;

use lobecast::chem::units::hartree_to_ev;
use lobecast::solve::OrbitalSet;
use lobecast::solve::scf::properties::DEBYE_PER_AU;
use lobecast::solve::scf::{Guess, ScfReport, Stage};

/// Progress on standard error, drawn only on a terminal: a spinner while the
/// integrals are computed, then one line per iteration.
pub struct ScfProgress {
    bar: Option<ProgressBar>,
    terminal: bool,
}

impl ScfProgress {
    pub fn new() -> Self {
        ScfProgress {
            bar: None,
            terminal: std::io::stderr().is_terminal(),
        }
    }

    pub fn on(&mut self, stage: Stage) {
        if !self.terminal {
            return;
        }
        match stage {
            Stage::Path(what) => {
                let bar = self
                    .bar
                    .get_or_insert_with(|| super::progress::spinner(what));
                bar.set_message(what.to_string());
            }
            Stage::Integrals(f) => {
                if let Some(bar) = &self.bar {
                    bar.set_message(format!("two-electron integrals {:.0} %", 100.0 * f));
                }
            }
            Stage::Iteration(line) => {
                let text = format!(
                    "SCF {:>4}  E(electronic) = {:>18.10} hartree  ΔE = {:>10.2e}  RMS[F,D] = {:>9.2e}{}",
                    line.iteration,
                    line.energy,
                    line.delta,
                    line.commutator,
                    if line.shifted { "  (level shift)" } else { "" }
                );
                match &self.bar {
                    Some(bar) => bar.println(text),
                    None => eprintln!("{text}"),
                }
            }
        }
    }

    pub fn finish(self) {
        if let Some(bar) = self.bar {
            bar.finish_and_clear();
        }
    }
}

/// The run's numbers as text.
pub fn report(set: &OrbitalSet, r: &ScfReport) -> String {
    let mut t = String::new();
    let guess = match r.guess {
        Guess::Atoms => "superposed spherical free atoms",
        Guess::Core => "core Hamiltonian",
    };
    t += &format!("two-electron integrals: {}\n", r.two_electron_path);
    t += &format!(
        "SCF converged in {} iterations (start: {guess}{}): |ΔE| = {:.1e} hartree, RMS commutator FDS−SDF = {:.1e}\n",
        r.iterations,
        if r.level_shifted {
            ", level shift used"
        } else {
            ""
        },
        r.delta_energy.abs(),
        r.commutator
    );
    t += &format!(
        "energy/hartree:  nuclear repulsion {:>18.10}\n                 one-electron      {:>18.10}\n                 two-electron      {:>18.10}\n                 total             {:>18.10}  ({:.6} eV)\n",
        r.nuclear_repulsion,
        r.one_electron,
        r.two_electron,
        r.total_energy,
        hartree_to_ev(r.total_energy)
    );
    let d = &r.dipole;
    let charged = set.molecule.charge != 0;
    t += &format!(
        "dipole moment: {:.6} e·bohr = {:.6} D; components (x, y, z) {:+.6} {:+.6} {:+.6} e·bohr, about the centre of nuclear charge{}\n",
        d.magnitude_au(),
        d.magnitude_au() * DEBYE_PER_AU,
        d.au[0],
        d.au[1],
        d.au[2],
        if charged {
            " (an ion's dipole depends on that choice)"
        } else {
            ""
        }
    );
    if let Some((s2, exact)) = r.s_squared {
        t += &format!(
            "<S^2> = {s2:.6} (exact {exact:.6} for multiplicity {}): spin contamination {:.2e}\n",
            set.spin.multiplicity.unwrap_or(1),
            s2 - exact
        );
    }
    t
}
