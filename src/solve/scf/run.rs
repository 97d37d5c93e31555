//! One Hartree–Fock run from a molecule and a basis to an `OrbitalSet`: checks,
//! one-electron matrices, the two-electron path (stored integrals when they fit a
//! quarter of the memory budget, direct otherwise), the starting density, the
//! iteration, and the reported properties.

use nalgebra::DMatrix;

use super::atoms::{self, FreeAtom};
use super::iterate::{self, IterationLine, Problem};
use super::occupation::spin_counts;
use super::{Guess, JkFn, Reference, ScfOptions, ScfReport, properties};
use crate::basis::Basis;
use crate::budget::check_memory;
use crate::chem::Molecule;
use crate::error::{Error, Result};
use crate::integrals::two_electron::{DirectJk, PackedEri, TwoElectron};
use crate::integrals::{dipole_matrices, gaussian_matrices};
use crate::solve::MethodKind;
use crate::solve::degenerate::{canonicalise, tolerance};
use crate::solve::orbitals::{Caveat, Orbital, OrbitalSet, Spin};

/// Integrals (and their bounds) below this are not computed (hartree; common
/// practice for energies converged to 1e-10 is 1e-12 to 1e-14).
pub const SCREENING: f64 = 1e-13;

/// The most basis functions a Hartree–Fock run takes: the dense n × n matrices of
/// the iteration then need about 1.5 GB, and direct integral work grows as n⁴.
pub const MAX_FUNCTIONS: usize = 4000;

/// What a long run reports while it works.
pub enum Stage<'a> {
    /// Which two-electron path was chosen.
    Path(&'a str),
    /// Fraction of the stored integrals computed.
    Integrals(f64),
    Iteration(&'a IterationLine),
}

pub fn solve(
    molecule: &Molecule,
    basis: &Basis,
    options: &ScfOptions,
    progress: &mut (dyn FnMut(Stage) + Send),
) -> Result<OrbitalSet> {
    let counts = spin_counts(molecule, options.multiplicity, options.reference)?;
    if !basis.all_gaussian() {
        return Err(Error::input("Hartree–Fock needs a Gaussian basis set")
            .with_hint("use a named set such as sto-3g, 6-31g* or cc-pvdz"));
    }
    let n = basis.len();
    if n > MAX_FUNCTIONS {
        return Err(Error::input(format!(
            "{n} basis functions is over the Hartree–Fock limit of {MAX_FUNCTIONS}"
        )));
    }
    let channels = match options.reference {
        Reference::Restricted => 1,
        Reference::Unrestricted => 2,
    };
    // S, h, X, and per channel F, D, C, DIIS history (8 deep, F and error).
    let matrices = 8.0 * (n as f64).powi(2) * (4.0 + channels as f64 * 20.0);
    check_memory(matrices, options.memory, "the Hartree–Fock matrices")?;
    let m = gaussian_matrices(molecule, basis)?;
    let enn = molecule.nuclear_repulsion();
    let core = &m.hamiltonian - &m.overlap * enn;
    let x = atoms::orthogonaliser(&m.overlap)?;
    let dropped = n - x.ncols();
    if counts.alpha > x.ncols() {
        return Err(Error::input(format!(
            "{} needs {} alpha orbitals but the basis spans only {}",
            molecule.formula_with_charge(),
            counts.alpha,
            x.ncols()
        )));
    }

    let stored = PackedEri::bytes_for(n).filter(|&b| b <= options.memory / 4);
    let engine: Box<dyn TwoElectron> = match stored {
        Some(_) => {
            progress(Stage::Path("computing stored two-electron integrals"));
            Box::new(PackedEri::build(basis, SCREENING, &mut |f| {
                progress(Stage::Integrals(f))
            })?)
        }
        None => Box::new(DirectJk::new(basis, SCREENING)?),
    };
    let path = engine.describe();
    progress(Stage::Path(&path));
    let incremental = stored.is_none();
    let jk = |d: &[&DMatrix<f64>]| engine.jk(d);

    let make_jk = |b: &Basis| -> Result<Box<JkFn<'static>>> {
        let e = PackedEri::build(b, SCREENING, &mut |_| {})?;
        Ok(Box::new(move |d: &[&DMatrix<f64>]| e.jk(d)))
    };
    let free = atoms::free_atoms(molecule, basis, &make_jk)?;
    let offsets = atom_offsets(molecule, basis);
    let start = match options.guess {
        Guess::Atoms => {
            let sad = superposition(&free, &offsets, n);
            match channels {
                1 => vec![sad],
                _ => vec![&sad * 0.5, &sad * 0.5],
            }
        }
        Guess::Core => {
            let (_, c) = iterate::diagonalise(&core, &x);
            let fill = |k: usize, w: f64| {
                let occ: Vec<f64> = (0..c.ncols())
                    .map(|i| if i < k { w } else { 0.0 })
                    .collect();
                iterate::density(&c, &occ)
            };
            match channels {
                1 => vec![fill(counts.alpha, 2.0)],
                _ => vec![fill(counts.alpha, 1.0), fill(counts.beta, 1.0)],
            }
        }
    };
    let counts_per = [counts.alpha, counts.beta];
    let weight = if channels == 1 { 2.0 } else { 1.0 };
    let occupy = |ch: usize, _: &[f64], c: &DMatrix<f64>| -> Vec<f64> {
        (0..c.ncols())
            .map(|i| if i < counts_per[ch] { weight } else { 0.0 })
            .collect()
    };
    let problem = Problem {
        overlap: &m.overlap,
        core: &core,
        x: &x,
        channels,
        jk: &jk,
        incremental,
        occupy: &occupy,
        max_iterations: options.max_iterations,
        energy_tolerance: options.energy_tolerance,
        commutator_tolerance: options.commutator_tolerance,
    };
    let done = iterate::run(&problem, start, &mut |line| {
        progress(Stage::Iteration(line))
    })?;

    let total = done
        .densities
        .iter()
        .fold(DMatrix::zeros(n, n), |a, d| a + d);
    let origin = properties::nuclear_centre(molecule);
    let r = dipole_matrices(basis, origin)?;
    let dipole = properties::dipole(molecule, &total, &r, origin);
    let s_squared = (channels == 2).then(|| {
        (
            properties::s_squared(
                &m.overlap,
                &done.vectors[0],
                &done.vectors[1],
                counts.alpha,
                counts.beta,
            ),
            counts.exact_s_squared(),
        )
    });
    let orbitals = |ch: usize| -> Vec<Orbital> {
        (0..done.energies[ch].len())
            .map(|i| Orbital {
                energy: done.energies[ch][i],
                occupation: done.occupations[ch][i],
                coefficients: done.vectors[ch].column(i).iter().copied().collect(),
            })
            .collect()
    };
    let free_orbitals = expand(&free, &offsets, n);
    let mut report = ScfReport {
        total_energy: done.electronic + enn,
        nuclear_repulsion: enn,
        one_electron: done.one_electron,
        two_electron: done.electronic - done.one_electron,
        iterations: done.iterations,
        delta_energy: done.delta,
        commutator: done.commutator,
        two_electron_path: path,
        guess: options.guess,
        level_shifted: done.shifted,
        mulliken: Vec::new(),
        dipole,
        s_squared,
        alpha_electrons: counts.alpha,
        beta_electrons: counts.beta,
    };
    let name = match options.reference {
        Reference::Restricted => "rhf",
        Reference::Unrestricted => "uhf",
    };
    let mut caveats = vec![Caveat::Uncorrelated];
    if basis.kind().is_minimal() {
        caveats.push(Caveat::MinimalBasis);
    }
    let mut notes = Vec::new();
    if dropped > 0 {
        notes.push(format!(
            "{dropped} near-linear-dependent combination(s) of the basis were dropped"
        ));
    }
    let mut set = OrbitalSet {
        molecule: molecule.clone(),
        basis: basis.clone(),
        overlap: Some(m.overlap.clone()),
        orbitals: orbitals(0),
        origin: match options.reference {
            Reference::Restricted => MethodKind::Rhf,
            Reference::Unrestricted => MethodKind::Uhf,
        },
        method: format!("{name}, {}", basis.name),
        caveats,
        notes,
        reference: None,
        degeneracy: tolerance(false),
        spin: Spin {
            beta: (channels == 2).then(|| orbitals(1)),
            multiplicity: Some(counts.multiplicity),
            total_energy: Some(done.electronic + enn),
            free_atoms: Some(free_orbitals),
            scf: None,
            shown: Default::default(),
        },
    };
    if channels == 1 {
        canonicalise(&mut set);
    }
    report.mulliken = set.mulliken_charges().unwrap_or_default();
    set.spin.scf = Some(Box::new(report));
    Ok(set)
}

/// First basis function of each atom's functions (they need not be contiguous in
/// general, so every function's atom is kept).
fn atom_offsets(molecule: &Molecule, basis: &Basis) -> Vec<Vec<usize>> {
    let mut out = vec![Vec::new(); molecule.atoms.len()];
    for (mu, (atom, _)) in basis.function_labels().into_iter().enumerate() {
        out[atom].push(mu);
    }
    out
}

/// Σ_A D_A placed in the molecule's basis.
fn superposition(free: &[Option<FreeAtom>], functions: &[Vec<usize>], n: usize) -> DMatrix<f64> {
    let mut d = DMatrix::zeros(n, n);
    for (atom, f) in free.iter().enumerate() {
        let Some(f) = f else { continue };
        let idx = &functions[atom];
        for (a, &i) in idx.iter().enumerate() {
            for (b, &j) in idx.iter().enumerate() {
                d[(i, j)] = f.density[(a, b)];
            }
        }
    }
    d
}

/// The free atoms' occupied orbitals as coefficient vectors over the whole basis.
fn expand(free: &[Option<FreeAtom>], functions: &[Vec<usize>], n: usize) -> Vec<(f64, Vec<f64>)> {
    let mut out = Vec::new();
    for (atom, f) in free.iter().enumerate() {
        let Some(f) = f else { continue };
        for (occ, c) in &f.orbitals {
            let mut full = vec![0.0; n];
            for (k, &mu) in functions[atom].iter().enumerate() {
                full[mu] = c[k];
            }
            out.push((*occ, full));
        }
    }
    out
}
