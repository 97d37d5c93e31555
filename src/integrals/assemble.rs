//! Whole matrices from shell-pair blocks: S, and H = T + V + E_nn·S so that the
//! eigenvalues are total energies of a one-electron system at fixed nuclei.

use nalgebra::DMatrix;
use rayon::prelude::*;

use super::gaussian::{CartesianShell, kinetic_block, nuclear_block, overlap_block};
use super::two_centre::two_centre_1s;
use crate::basis::{Basis, GaussianShell, Shell};
use crate::chem::Molecule;
use crate::chem::molecule::distance;
use crate::error::{Error, Result};

#[derive(Debug, Clone)]
pub struct OneElectronMatrices {
    pub overlap: DMatrix<f64>,
    pub hamiltonian: DMatrix<f64>,
}

pub(super) fn cartesian(g: &GaussianShell) -> CartesianShell<'_> {
    CartesianShell {
        l: g.l,
        center: g.center,
        exponents: &g.exponents,
        coefficients: &g.d,
    }
}

/// rowsₐ · C · rows_bᵀ: from Cartesian components to the shells' own functions.
pub(super) fn transform(a: &GaussianShell, b: &GaussianShell, cart: &[f64]) -> Vec<f64> {
    let nb_cart = b.rows.first().map_or(0, Vec::len);
    let mut out = vec![0.0; a.len() * b.len()];
    for (fa, ra) in a.rows.iter().enumerate() {
        for (fb, rb) in b.rows.iter().enumerate() {
            let mut s = 0.0;
            for (i, wa) in ra.iter().enumerate().filter(|(_, w)| **w != 0.0) {
                for (j, wb) in rb.iter().enumerate().filter(|(_, w)| **w != 0.0) {
                    s += wa * wb * cart[i * nb_cart + j];
                }
            }
            out[fa * b.len() + fb] = s;
        }
    }
    out
}

pub(super) fn gaussians(basis: &Basis) -> Option<Vec<&GaussianShell>> {
    basis
        .shells
        .iter()
        .map(|s| match s {
            Shell::Gaussian(g) => Some(g),
            Shell::Slater(_) => None,
        })
        .collect()
}

/// Fills symmetric matrices from the upper-triangle shell pairs, computed in parallel.
pub(super) fn build(
    basis: &Basis,
    shells: &[&GaussianShell],
    block: impl Fn(&GaussianShell, &GaussianShell) -> Vec<f64> + Sync,
) -> DMatrix<f64> {
    let offsets = basis.offsets();
    let pairs: Vec<(usize, usize)> = (0..shells.len())
        .flat_map(|i| (i..shells.len()).map(move |j| (i, j)))
        .collect();
    let blocks: Vec<Vec<f64>> = pairs
        .par_iter()
        .map(|&(i, j)| block(shells[i], shells[j]))
        .collect();
    let n = basis.len();
    let mut m = DMatrix::zeros(n, n);
    for (&(i, j), b) in pairs.iter().zip(&blocks) {
        let (a, bs) = (shells[i], shells[j]);
        for fa in 0..a.len() {
            for fb in 0..bs.len() {
                let v = b[fa * bs.len() + fb];
                m[(offsets[i] + fa, offsets[j] + fb)] = v;
                m[(offsets[j] + fb, offsets[i] + fa)] = v;
            }
        }
    }
    m
}

/// S and H for an all-Gaussian basis, any geometry.
pub fn gaussian_matrices(molecule: &Molecule, basis: &Basis) -> Result<OneElectronMatrices> {
    let shells = gaussians(basis)
        .ok_or_else(|| Error::input("analytic integrals need an all-Gaussian basis"))?;
    let nuclei: Vec<(f64, [f64; 3])> = molecule
        .atoms
        .iter()
        .map(|a| (a.charge(), a.position))
        .collect();
    let overlap = build(basis, &shells, |a, b| {
        transform(a, b, &overlap_block(&cartesian(a), &cartesian(b)))
    });
    let enn = molecule.nuclear_repulsion();
    let core = build(basis, &shells, |a, b| {
        let (ca, cb) = (cartesian(a), cartesian(b));
        let t = kinetic_block(&ca, &cb);
        let v = nuclear_block(&ca, &cb, &nuclei);
        let sum: Vec<f64> = t.iter().zip(&v).map(|(t, v)| t + v).collect();
        transform(a, b, &sum)
    });
    let hamiltonian = core + &overlap * enn;
    Ok(OneElectronMatrices {
        overlap,
        hamiltonian,
    })
}

/// S and H for one 1s Slater function per atom, where closed forms exist: one atom,
/// or two identical atoms carrying the same exponent.
pub fn slater_1s_matrices(molecule: &Molecule, basis: &Basis) -> Result<OneElectronMatrices> {
    let why = "the slater-1s set uses exact closed forms, which lobecast has for one atom \
               or for two identical atoms with the same exponent; use a Gaussian set (sto-3g, 6-31g*, cc-pvdz, …) or \
               even-tempered Gaussian functions for other molecules";
    let zetas: Vec<f64> = basis
        .shells
        .iter()
        .map(|s| match s {
            Shell::Slater(s) if s.is_1s() => Ok(s.zeta),
            _ => Err(Error::input(
                "slater-1s matrices need 1s Slater functions only",
            )),
        })
        .collect::<Result<_>>()?;
    match (molecule.atoms.as_slice(), zetas.as_slice()) {
        ([a], [zeta]) => {
            let e = 0.5 * zeta * zeta - a.charge() * zeta;
            Ok(OneElectronMatrices {
                overlap: DMatrix::from_element(1, 1, 1.0),
                hamiltonian: DMatrix::from_element(1, 1, e),
            })
        }
        ([a, b], [za, zb]) => {
            if a.element != b.element || za != zb {
                return Err(Error::input(format!(
                    "slater-1s cannot treat {}–{} with exponents {za} and {zb}",
                    a.element.symbol, b.element.symbol
                ))
                .with_hint(why));
            }
            let m = two_centre_1s(a.charge(), *za, distance(a.position, b.position));
            Ok(OneElectronMatrices {
                overlap: DMatrix::from_row_slice(2, 2, &[1.0, m.s, m.s, 1.0]),
                hamiltonian: DMatrix::from_row_slice(2, 2, &[m.h_aa, m.h_ab, m.h_ab, m.h_aa]),
            })
        }
        _ => Err(Error::input(format!(
            "slater-1s cannot treat a molecule of {} atoms",
            molecule.atoms.len()
        ))
        .with_hint(why)),
    }
}

/// The overlap matrix where lobecast can compute it: all-Gaussian bases (analytic),
/// 1s Slater functions on pairs of centres with equal exponents or on one centre, or
/// any Slater s and p functions (`slater_overlap`).
/// `None` otherwise; fields that need it (Mulliken populations) then say so.
pub fn overlap_matrix(_molecule: &Molecule, basis: &Basis) -> Option<DMatrix<f64>> {
    if let Some(shells) = gaussians(basis) {
        return Some(build(basis, &shells, |a, b| {
            transform(a, b, &overlap_block(&cartesian(a), &cartesian(b)))
        }));
    }
    let s1: Option<Vec<_>> = basis
        .shells
        .iter()
        .map(|s| match s {
            Shell::Slater(s) if s.is_1s() => Some(s),
            _ => None,
        })
        .collect();
    let Some(s1) = s1 else {
        // Slater s and p functions (e.g. an extended-Hückel basis read back from an
        // orbital file): the numerically exact two-centre overlaps.
        return super::slater_overlap_matrix(basis).ok();
    };
    let n = s1.len();
    let mut m = DMatrix::identity(n, n);
    for i in 0..n {
        for j in i + 1..n {
            let (a, b) = (s1[i], s1[j]);
            let r = distance(a.center, b.center);
            let v = if r < 1e-12 {
                (2.0 * (a.zeta * b.zeta).sqrt() / (a.zeta + b.zeta)).powi(3)
            } else if a.zeta == b.zeta {
                two_centre_1s(1.0, a.zeta, r).s
            } else {
                return None;
            };
            m[(i, j)] = v;
            m[(j, i)] = v;
        }
    }
    Some(m)
}
