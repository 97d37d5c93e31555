//! The SCF iteration on plain matrices: build Fock matrices from densities,
//! extrapolate with DIIS, diagonalise in an orthonormal basis, occupy, repeat until
//! the energy and the orbital gradient both settle.
//!
//! Restricted runs have one channel whose density is the total (occupations up to
//! 2) and F = h + J[D] − ½K[D]; unrestricted runs have two channels with
//! F_σ = h + J[D_α + D_β] − K[D_σ] (Szabo and Ostlund, eqs. 3.154 and 3.349).
//! E_elec = ½ Σ_σ Tr D_σ (h + F_σ) in both cases.

use nalgebra::{DMatrix, SymmetricEigen};

use super::JkFn;
use super::diis::Diis;
use crate::error::{Error, Result};
use crate::solve::eigen::fix_sign;

/// Level shift switched on when plain DIIS has not converged after this many
/// iterations (hartree; common practice: a few tenths).
const LEVEL_SHIFT: f64 = 0.5;
const SHIFT_AFTER: usize = 40;
/// A full two-electron rebuild every so many incremental (ΔD) builds, so rounding
/// in the accumulated matrices cannot grow (common practice).
const FULL_REBUILD_EVERY: usize = 8;

/// Occupations of one channel's orbitals from (channel, eigenvalues, vectors).
pub type Occupy<'a> = dyn Fn(usize, &[f64], &DMatrix<f64>) -> Vec<f64> + 'a;

/// Coulomb and exchange matrices, one pair per channel.
type JkPairs = Vec<(DMatrix<f64>, DMatrix<f64>)>;

/// The fixed inputs of one SCF run.
pub struct Problem<'a> {
    pub overlap: &'a DMatrix<f64>,
    /// Kinetic plus nuclear attraction (no nuclear repulsion).
    pub core: &'a DMatrix<f64>,
    /// Orthogonaliser X (n × m, XᵀSX = 1) with near-dependent combinations dropped.
    pub x: &'a DMatrix<f64>,
    /// 1 channel (restricted, total density) or 2 (alpha, beta).
    pub channels: usize,
    pub jk: &'a JkFn<'a>,
    /// Build two-electron matrices from the density change (direct integrals).
    pub incremental: bool,
    /// Occupations of one channel's orbitals, given its eigenvalues and vectors.
    pub occupy: &'a Occupy<'a>,
    pub max_iterations: usize,
    pub energy_tolerance: f64,
    pub commutator_tolerance: f64,
}

/// One line of progress.
#[derive(Debug, Clone, Copy)]
pub struct IterationLine {
    pub iteration: usize,
    /// Electronic energy, hartree.
    pub energy: f64,
    pub delta: f64,
    pub commutator: f64,
    pub shifted: bool,
}

/// A converged run, per channel.
pub struct Converged {
    pub energies: Vec<Vec<f64>>,
    pub vectors: Vec<DMatrix<f64>>,
    pub occupations: Vec<Vec<f64>>,
    pub densities: Vec<DMatrix<f64>>,
    pub electronic: f64,
    pub one_electron: f64,
    pub iterations: usize,
    pub delta: f64,
    pub commutator: f64,
    pub shifted: bool,
}

/// Eigenvalues (ascending) and vectors of F in the orthonormal basis given by x.
pub fn diagonalise(f: &DMatrix<f64>, x: &DMatrix<f64>) -> (Vec<f64>, DMatrix<f64>) {
    let fo = x.transpose() * f * x;
    let e = SymmetricEigen::new(fo);
    let mut order: Vec<usize> = (0..e.eigenvalues.len()).collect();
    order.sort_by(|&a, &b| e.eigenvalues[a].total_cmp(&e.eigenvalues[b]));
    let mut c = DMatrix::zeros(x.nrows(), order.len());
    let mut values = Vec::with_capacity(order.len());
    for (col, &i) in order.iter().enumerate() {
        let mut v = x * e.eigenvectors.column(i);
        fix_sign(&mut v);
        c.set_column(col, &v);
        values.push(e.eigenvalues[i]);
    }
    (values, c)
}

/// D = Σ_i n_i c_i c_iᵀ over occupied columns.
pub fn density(c: &DMatrix<f64>, occ: &[f64]) -> DMatrix<f64> {
    let n = c.nrows();
    let mut d = DMatrix::zeros(n, n);
    for (i, &o) in occ.iter().enumerate().filter(|(_, o)| **o != 0.0) {
        let col = c.column(i);
        d.ger(o, &col, &col, 1.0);
    }
    d
}

/// Fock matrices from the channel densities and their J, K.
fn focks(core: &DMatrix<f64>, jk: &[(DMatrix<f64>, DMatrix<f64>)]) -> Vec<DMatrix<f64>> {
    if jk.len() == 1 {
        return vec![core + &jk[0].0 - &jk[0].1 * 0.5];
    }
    let j = &jk[0].0 + &jk[1].0;
    jk.iter().map(|(_, k)| core + &j - k).collect()
}

pub fn run(
    p: &Problem,
    mut densities: Vec<DMatrix<f64>>,
    progress: &mut dyn FnMut(&IterationLine),
) -> Result<Converged> {
    let mut diis = Diis::new(8);
    let mut previous: Option<(Vec<DMatrix<f64>>, JkPairs)> = None;
    let mut since_full = 0;
    let mut last_energy: Option<f64> = None;
    let mut shifted = false;
    let (mut delta, mut rms) = (f64::NAN, f64::NAN);
    for iteration in 1..=p.max_iterations {
        let jk = match previous.take() {
            Some((old_d, old_jk)) if p.incremental && since_full < FULL_REBUILD_EVERY => {
                since_full += 1;
                let change: Vec<DMatrix<f64>> =
                    densities.iter().zip(&old_d).map(|(a, b)| a - b).collect();
                let refs: Vec<&DMatrix<f64>> = change.iter().collect();
                (p.jk)(&refs)
                    .into_iter()
                    .zip(old_jk)
                    .map(|((dj, dk), (j, k))| (j + dj, k + dk))
                    .collect()
            }
            _ => {
                since_full = 0;
                let refs: Vec<&DMatrix<f64>> = densities.iter().collect();
                (p.jk)(&refs)
            }
        };
        let f = focks(p.core, &jk);
        let energy: f64 = densities
            .iter()
            .zip(&f)
            .map(|(d, f)| 0.5 * d.dot(&(p.core + f)))
            .sum();
        // Orbital gradients Xᵀ(FDS − SDF)X per channel.
        let errors: Vec<DMatrix<f64>> = f
            .iter()
            .zip(&densities)
            .map(|(f, d)| {
                let fds = f * d * p.overlap;
                p.x.transpose() * (&fds - fds.transpose()) * p.x
            })
            .collect();
        let count: usize = errors.iter().map(|e| e.len()).sum();
        rms = (errors.iter().map(|e| e.norm_squared()).sum::<f64>() / count as f64).sqrt();
        delta = last_energy.map_or(f64::INFINITY, |e| energy - e);
        last_energy = Some(energy);
        progress(&IterationLine {
            iteration,
            energy,
            delta,
            commutator: rms,
            shifted,
        });
        if delta.abs() < p.energy_tolerance && rms < p.commutator_tolerance {
            return Ok(finish(p, &f, energy, iteration, delta, rms, shifted));
        }
        if !shifted && iteration >= SHIFT_AFTER {
            shifted = true;
            diis.clear();
        }
        let mut next = diis.extrapolate(&f, &errors);
        let mut new_d = Vec::with_capacity(p.channels);
        for (ch, fx) in next.iter_mut().enumerate() {
            if shifted {
                // Raise the virtual space: F + b (S − S P S), P the occupied projector.
                let (e, c) = diagonalise(&f[ch], p.x);
                let occ = (p.occupy)(ch, &e, &c);
                let occupied: Vec<f64> = occ.iter().map(|&o| f64::from(o > 0.0)).collect();
                let proj = density(&c, &occupied);
                *fx += (p.overlap - p.overlap * proj * p.overlap) * LEVEL_SHIFT;
            }
            let (e, c) = diagonalise(fx, p.x);
            let occ = (p.occupy)(ch, &e, &c);
            new_d.push(density(&c, &occ));
        }
        previous = Some((std::mem::replace(&mut densities, new_d), jk));
    }
    Err(Error::unconverged(format!(
        "the SCF did not converge in {} iterations: last ΔE = {delta:.3e} hartree (needs < {:.0e}), RMS commutator = {rms:.3e} (needs < {:.0e})",
        p.max_iterations, p.energy_tolerance, p.commutator_tolerance
    ))
    .with_hint("raise --max-iterations, try --guess core, or check the geometry, charge and multiplicity"))
}

/// The orbitals of the converged Fock matrices (no shift), with the energy parts.
fn finish(
    p: &Problem,
    f: &[DMatrix<f64>],
    electronic: f64,
    iterations: usize,
    delta: f64,
    commutator: f64,
    shifted: bool,
) -> Converged {
    let mut out = Converged {
        energies: Vec::new(),
        vectors: Vec::new(),
        occupations: Vec::new(),
        densities: Vec::new(),
        electronic,
        one_electron: 0.0,
        iterations,
        delta,
        commutator,
        shifted,
    };
    for (ch, fx) in f.iter().enumerate() {
        let (e, c) = diagonalise(fx, p.x);
        let occ = (p.occupy)(ch, &e, &c);
        let d = density(&c, &occ);
        out.one_electron += d.dot(p.core);
        out.energies.push(e);
        out.vectors.push(c);
        out.occupations.push(occ);
        out.densities.push(d);
    }
    out
}
