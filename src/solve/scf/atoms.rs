//! Spherical free atoms in the molecule's own basis: the starting density of the
//! SCF (superposition of atomic densities) and the reference of the deformation
//! density, from one recipe.
//!
//! Recipe: for each element, restricted Hartree–Fock on the neutral atom alone, in
//! the functions the basis places on it, with fractional occupations: the
//! ground-state configuration by the aufbau order 1s 2s 2p 3s 3p 4s 3d 4p (H–Kr;
//! exceptions such as Cr and Cu are not made), every electron shared equally between
//! the two spins, and an open shell's electrons spread evenly over its 2l + 1
//! components. The density is then spherical, D = Σ n_i c_i c_iᵀ, and the Fock
//! matrix F = h + J[D] − ½K[D]. This is the spin- and spherically averaged atom of
//! the superposition-of-atomic-densities guess (J. Almlöf, K. Faegri, K. Korsell,
//! J. Comput. Chem. 3, 385 (1982); S. Lehtola, J. Chem. Theory Comput. 15, 1593
//! (2019) — both from memory). Orbitals are assigned to shells by their angular
//! character: the share of cᵀSc carried by functions of each l.

use nalgebra::DMatrix;

use super::iterate::{self, Problem};
use crate::basis::{Basis, Shell};
use crate::chem::{Atom, Molecule};
use crate::error::{Error, Result};
use crate::integrals::gaussian_matrices;
use crate::solve::eigen::DEPENDENCE_THRESHOLD;

/// Builds the Coulomb/exchange function for a basis (the atom's own).
pub type JkFactory<'a> = dyn Fn(&Basis) -> Result<Box<super::JkFn<'static>>> + 'a;

/// Shells in aufbau order as (l, capacity), H–Kr.
const AUFBAU: [(u32, u32); 8] = [
    (0, 2),
    (0, 2),
    (1, 6),
    (0, 2),
    (1, 6),
    (0, 2),
    (2, 10),
    (1, 6),
];

/// The heaviest element the aufbau table above covers.
pub const MAX_Z: u32 = 36;

/// One free atom's occupied orbitals over its own functions.
#[derive(Debug, Clone)]
pub struct FreeAtom {
    /// (occupation, coefficients over the atom's functions).
    pub orbitals: Vec<(f64, Vec<f64>)>,
    /// Σ n_i c_i c_iᵀ over the atom's functions.
    pub density: DMatrix<f64>,
    /// Total energy of the averaged atom, hartree.
    pub energy: f64,
}

/// Electrons per shell of each l, in order of filling, for atomic number z.
fn configuration(z: u32) -> [Vec<f64>; 3] {
    let mut left = z;
    let mut out: [Vec<f64>; 3] = Default::default();
    for (l, cap) in AUFBAU {
        if left == 0 {
            break;
        }
        let put = left.min(cap);
        out[l as usize].push(f64::from(put));
        left -= put;
    }
    out
}

/// The free atom of every atom of the molecule (atoms of one element, carrying the
/// same shells, are solved once).
pub fn free_atoms(
    molecule: &Molecule,
    basis: &Basis,
    make_jk: &JkFactory,
) -> Result<Vec<Option<FreeAtom>>> {
    let mut solved: Vec<(u32, Vec<Shell>, Option<FreeAtom>)> = Vec::new();
    let mut out = Vec::with_capacity(molecule.atoms.len());
    for (i, atom) in molecule.atoms.iter().enumerate() {
        let shells: Vec<Shell> = basis
            .shells
            .iter()
            .filter(|s| s.atom() == i)
            .map(|s| relocate(s, atom.position))
            .collect();
        let z = atom.element.atomic_number;
        if let Some((_, _, done)) = solved.iter().find(|(zz, sh, _)| *zz == z && *sh == shells) {
            out.push(done.clone());
            continue;
        }
        let free = if z == 0 || shells.is_empty() {
            None
        } else {
            Some(solve_atom(atom, basis, shells.clone(), make_jk)?)
        };
        solved.push((z, shells, free.clone()));
        out.push(free);
    }
    Ok(out)
}

/// The shell as atom 0 of a one-atom basis (same centre).
fn relocate(s: &Shell, _at: [f64; 3]) -> Shell {
    let mut s = s.clone();
    match &mut s {
        Shell::Gaussian(g) => g.atom = 0,
        Shell::Slater(t) => t.atom = 0,
    }
    s
}

fn solve_atom(
    atom: &Atom,
    basis: &Basis,
    shells: Vec<Shell>,
    make_jk: &JkFactory,
) -> Result<FreeAtom> {
    let z = atom.element.atomic_number;
    let symbol = atom.element.symbol;
    if z > MAX_Z {
        return Err(Error::input(format!(
            "the free-atom reference covers H–Kr, not {symbol}"
        )));
    }
    let ls: Vec<u32> = shells
        .iter()
        .flat_map(|s| {
            let l = match s {
                Shell::Gaussian(g) => g.l,
                Shell::Slater(t) => t.l,
            };
            std::iter::repeat_n(l, s.len())
        })
        .collect();
    let one = Basis {
        name: basis.name.clone(),
        shells,
    };
    let lone = Molecule::new(
        vec![Atom {
            element: atom.element,
            position: atom.position,
        }],
        0,
    )?;
    let m = gaussian_matrices(&lone, &one)?;
    let x = orthogonaliser(&m.overlap)?;
    let config = configuration(z);
    let capacity: Vec<usize> = (0..3)
        .map(|l| ls.iter().filter(|&&k| k as usize == l).count())
        .collect();
    for (l, shells) in config.iter().enumerate() {
        if shells.len() * (2 * l + 1) > capacity[l] {
            return Err(Error::input(format!(
                "the {} basis gives {symbol} too few functions of l = {l} for its ground-state configuration",
                basis.name
            )));
        }
    }
    let s = m.overlap.clone();
    let occupy = move |_: usize, _: &[f64], c: &DMatrix<f64>| -> Vec<f64> {
        let mut taken = [0usize; 3];
        (0..c.ncols())
            .map(|i| {
                let col = c.column(i);
                let sc = &s * col;
                let mut share = [0.0f64; 4];
                for (mu, &l) in ls.iter().enumerate() {
                    share[(l as usize).min(3)] += col[mu] * sc[mu];
                }
                let l = (0..4)
                    .max_by(|&a, &b| share[a].total_cmp(&share[b]))
                    .unwrap_or(0);
                if l > 2 {
                    return 0.0;
                }
                let width = 2 * l + 1;
                let shell = taken[l] / width;
                taken[l] += 1;
                config[l].get(shell).map_or(0.0, |e| e / width as f64)
            })
            .collect()
    };
    let jk = make_jk(&one)?;
    let problem = Problem {
        overlap: &m.overlap,
        core: &m.hamiltonian,
        x: &x,
        channels: 1,
        jk: &*jk,
        incremental: false,
        occupy: &occupy,
        max_iterations: 200,
        energy_tolerance: 1e-10,
        commutator_tolerance: 1e-7,
    };
    let (e0, c0) = iterate::diagonalise(&m.hamiltonian, &x);
    let start = iterate::density(&c0, &occupy(0, &e0, &c0));
    let done = iterate::run(&problem, vec![start], &mut |_| {})
        .map_err(|e| e.context(format!("the free {symbol} atom")))?;
    let c = &done.vectors[0];
    let orbitals = done.occupations[0]
        .iter()
        .enumerate()
        .filter(|(_, o)| **o > 0.0)
        .map(|(i, &o)| (o, c.column(i).iter().copied().collect()))
        .collect();
    Ok(FreeAtom {
        orbitals,
        density: done.densities[0].clone(),
        energy: done.electronic,
    })
}

/// Canonical orthogonaliser X = U s^(−½) over overlap eigenvalues above the
/// dependence threshold (P.-O. Löwdin's canonical orthogonalisation).
pub fn orthogonaliser(s: &DMatrix<f64>) -> Result<DMatrix<f64>> {
    let se = nalgebra::SymmetricEigen::new(s.clone());
    let keep: Vec<usize> = (0..s.nrows())
        .filter(|&i| se.eigenvalues[i] > DEPENDENCE_THRESHOLD)
        .collect();
    if keep.is_empty() {
        return Err(Error::input(
            "the overlap matrix has no positive eigenvalues",
        ));
    }
    let mut x = DMatrix::zeros(s.nrows(), keep.len());
    for (col, &i) in keep.iter().enumerate() {
        x.set_column(col, &(se.eigenvectors.column(i) / se.eigenvalues[i].sqrt()));
    }
    Ok(x)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Ground-state configurations by the aufbau order (any general chemistry text).
    #[test]
    fn configurations() {
        assert_eq!(configuration(1), [vec![1.0], vec![], vec![]]);
        assert_eq!(configuration(6), [vec![2.0, 2.0], vec![2.0], vec![]]);
        assert_eq!(
            configuration(17),
            [vec![2.0, 2.0, 2.0], vec![6.0, 5.0], vec![]]
        );
        assert_eq!(
            configuration(26),
            [vec![2.0, 2.0, 2.0, 2.0], vec![6.0, 6.0], vec![6.0]]
        );
    }
}
