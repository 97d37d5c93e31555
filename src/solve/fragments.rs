//! Fragments of a molecule and the weight of each fragment orbital in each molecular
//! orbital, for correlation (level) diagrams.
//!
//! Every fragment is the sub-molecule of its atoms, **neutral**, solved alone by the
//! molecule's own method in the same functions (a one-electron model keeps its shells,
//! extended Hückel builds the same valence set). Each fragment function is the
//! molecular function on the same atom at the same place among that atom's shells,
//! which is checked, so both live in one basis and one overlap matrix S.
//!
//! The projection of molecular orbital i (coefficients c) on fragment orbital a
//! (coefficients d on fragment functions ν, mapped to molecular functions m(ν)) is
//! p_ia = Σ_μν c_μ S_μ,m(ν) d_ν, and its weight is w_ia = p_ia² / Σ_b p_ib², the sum
//! over every orbital of every fragment, so the weights of one molecular orbital sum
//! to 1 by construction.

use super::{Method, OrbitalSet, orbitals_within};
use crate::basis::{Basis, Shell};
use crate::chem::Molecule;
use crate::error::{Error, Result};

/// More fragments than this are refused: atom lists are typed by hand.
pub const MAX_FRAGMENTS: usize = 64;

/// Fragments as typed: 1-based inclusive atom ranges per group, not yet checked
/// against a molecule (so a mistyped list is refused before anything is loaded).
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct FragmentSpec {
    groups: Vec<Vec<(u64, u64)>>,
}

impl FragmentSpec {
    /// Reads `1-3:4-6` or `1,5,6:2-4` (groups split by ':', atoms by ',', ranges `a-b`).
    pub fn parse(text: &str) -> Result<Self> {
        let bad = |why: &str| {
            Error::input(format!("cannot read --fragments {text:?}: {why}"))
                .with_hint("give 1-based atom lists split by ':', e.g. 1-3:4-6 or 1:2")
        };
        let parts: Vec<&str> = text.split(':').collect();
        if parts.len() < 2 {
            return Err(bad("at least two fragments are needed"));
        }
        if parts.len() > MAX_FRAGMENTS {
            return Err(bad(&format!("at most {MAX_FRAGMENTS} fragments")));
        }
        let number = |s: &str| -> Result<u64> {
            match s.trim().parse::<u64>() {
                Ok(n) if n >= 1 => Ok(n),
                _ => Err(bad(&format!("{:?} is not an atom number from 1", s.trim()))),
            }
        };
        let mut groups = Vec::new();
        for part in parts {
            let mut group = Vec::new();
            for item in part.split(',') {
                if item.trim().is_empty() {
                    return Err(bad("an empty atom list"));
                }
                let range = match item.split_once('-') {
                    Some((a, b)) => (number(a)?, number(b)?),
                    None => (number(item)?, number(item)?),
                };
                if range.0 > range.1 {
                    return Err(bad(&format!("the range {} runs backwards", item.trim())));
                }
                group.push(range);
            }
            groups.push(group);
        }
        Ok(FragmentSpec { groups })
    }

    /// Number of fragments.
    pub fn len(&self) -> usize {
        self.groups.len()
    }

    pub fn is_empty(&self) -> bool {
        self.groups.is_empty()
    }

    /// 0-based atoms of each fragment for a molecule of `atoms` atoms: every atom
    /// must be in exactly one fragment (so the fragments' functions are the
    /// molecule's, each once).
    pub fn resolve(&self, atoms: usize) -> Result<Vec<Vec<usize>>> {
        let mut owner = vec![None; atoms];
        let mut out = Vec::new();
        for (g, group) in self.groups.iter().enumerate() {
            let mut list = Vec::new();
            for &(lo, hi) in group {
                if hi > atoms as u64 {
                    return Err(Error::input(format!(
                        "--fragments names atom {hi}, but the molecule has {atoms} atoms"
                    )));
                }
                for (a, slot) in owner
                    .iter_mut()
                    .enumerate()
                    .take(hi as usize)
                    .skip(lo as usize - 1)
                {
                    if let Some(other) = *slot {
                        return Err(Error::input(format!(
                            "--fragments puts atom {} in fragment {} and in fragment {}",
                            a + 1,
                            other + 1,
                            g + 1
                        )));
                    }
                    *slot = Some(g);
                    list.push(a);
                }
            }
            list.sort_unstable();
            out.push(list);
        }
        if let Some(a) = owner.iter().position(Option::is_none) {
            return Err(Error::input(format!(
                "--fragments leaves atom {} out: every atom must be in one fragment",
                a + 1
            )));
        }
        Ok(out)
    }
}

/// One fragment solved alone.
#[derive(Debug, Clone)]
pub struct Fragment {
    /// 0-based atoms of the molecule, in increasing order.
    pub atoms: Vec<usize>,
    pub set: OrbitalSet,
    /// For each fragment function, the molecular function it equals.
    pub map: Vec<usize>,
}

/// Solves each fragment (neutral) by the molecule's method within `memory` bytes.
/// Orbitals read from a file are refused: there is no Hamiltonian to solve a
/// fragment with.
pub fn solve_fragments(
    set: &OrbitalSet,
    method: &Method,
    groups: &[Vec<usize>],
    memory: u64,
) -> Result<Vec<Fragment>> {
    groups
        .iter()
        .map(|atoms| {
            let molecule = Molecule::new(
                atoms
                    .iter()
                    .map(|&a| set.molecule.atoms[a].clone())
                    .collect(),
                0,
            )?;
            let method = match method {
                Method::Given(_) => return Err(given_refused()),
                Method::OneElectron { basis } => Method::OneElectron {
                    basis: sub_basis(basis, atoms),
                },
                Method::ExtendedHuckel(o) => Method::ExtendedHuckel(o.clone()),
                Method::HartreeFock { .. } => {
                    return Err(Error::input(
                        "fragments are solved with one-electron or extended-Hückel orbitals only, not Hartree–Fock",
                    )
                    .with_hint("draw the Hartree–Fock levels without --fragments"));
                }
            };
            let fragment = orbitals_within(&molecule, &method, memory, &mut |_| {})?;
            let map = function_map(&set.basis, &fragment.basis, atoms)?;
            Ok(Fragment {
                atoms: atoms.clone(),
                set: fragment,
                map,
            })
        })
        .collect()
}

/// The refusal for orbitals from a file, shared with the command line's early check.
pub fn given_refused() -> Error {
    Error::input("--fragments needs a method to solve each fragment with, but these orbitals were read from a file")
        .with_hint("give a model file or an XYZ file with --method extended-huckel")
}

/// The shells of `atoms`, renumbered to the fragment's atoms.
fn sub_basis(basis: &Basis, atoms: &[usize]) -> Basis {
    let shells = basis
        .shells
        .iter()
        .filter_map(|s| {
            let k = atoms.iter().position(|&a| a == s.atom())?;
            Some(with_atom(s, k))
        })
        .collect();
    Basis {
        name: basis.name.clone(),
        shells,
    }
}

fn with_atom(s: &Shell, atom: usize) -> Shell {
    let mut s = s.clone();
    match &mut s {
        Shell::Slater(x) => x.atom = atom,
        Shell::Gaussian(x) => x.atom = atom,
    }
    s
}

/// For each fragment function, the molecular function on the same atom at the same
/// place among that atom's shells; the two shells must be equal.
fn function_map(molecule: &Basis, fragment: &Basis, atoms: &[usize]) -> Result<Vec<usize>> {
    let offsets = molecule.offsets();
    let mut seen = vec![0usize; atoms.len()];
    let mut map = Vec::with_capacity(fragment.len());
    for s in &fragment.shells {
        let fa = s.atom();
        let ma = atoms[fa];
        let k = seen[fa];
        seen[fa] += 1;
        let found = molecule
            .shells
            .iter()
            .enumerate()
            .filter(|(_, m)| m.atom() == ma)
            .nth(k);
        match found {
            Some((j, m)) if *m == with_atom(s, ma) => map.extend(offsets[j]..offsets[j] + m.len()),
            _ => {
                return Err(Error::internal(format!(
                    "fragment shell {} of atom {} has no equal shell in the molecule's basis",
                    k + 1,
                    ma + 1
                )));
            }
        }
    }
    Ok(map)
}

/// Weights w[i][f][a] of orbital a of fragment f in molecular orbital i; each
/// molecular orbital's weights sum to 1. Needs the molecular overlap matrix.
pub fn weights(set: &OrbitalSet, fragments: &[Fragment]) -> Result<Vec<Vec<Vec<f64>>>> {
    let s = set.overlap.as_ref().ok_or_else(|| {
        Error::input("fragment weights need the overlap matrix, which this source does not have")
    })?;
    let n = set.basis.len();
    set.orbitals
        .iter()
        .enumerate()
        .map(|(i, o)| {
            // S c, so that p_ia = Σ_ν (S c)_m(ν) d_aν.
            let sc: Vec<f64> = (0..n)
                .map(|m| (0..n).map(|k| s[(m, k)] * o.coefficients[k]).sum())
                .collect();
            let p: Vec<Vec<f64>> = fragments
                .iter()
                .map(|f| {
                    f.set
                        .orbitals
                        .iter()
                        .map(|fo| {
                            let d = &fo.coefficients;
                            f.map.iter().zip(d).map(|(&m, dv)| sc[m] * dv).sum::<f64>()
                        })
                        .collect()
                })
                .collect();
            let total: f64 = p.iter().flatten().map(|x| x * x).sum();
            if total.partial_cmp(&0.0) != Some(std::cmp::Ordering::Greater) {
                return Err(Error::internal(format!(
                    "molecular orbital {} has no projection on any fragment orbital",
                    i + 1
                )));
            }
            Ok(p.into_iter()
                .map(|v| v.into_iter().map(|x| x * x / total).collect())
                .collect())
        })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn lists_are_read_and_checked() {
        let f = FragmentSpec::parse("1-3:4,6,5").unwrap();
        assert_eq!(f.resolve(6).unwrap(), vec![vec![0, 1, 2], vec![3, 4, 5]]);
        assert_eq!(
            FragmentSpec::parse("1:2")
                .unwrap()
                .resolve(2)
                .unwrap()
                .len(),
            2
        );
        for bad in ["1-3", "1-:2", "0:1", "a:b", "3-1:2", "1,,2:3", ""] {
            assert!(FragmentSpec::parse(bad).is_err(), "{bad}");
        }
        let f = FragmentSpec::parse("1-2:2-3").unwrap();
        assert!(f.resolve(3).unwrap_err().message.contains("atom 2"));
        let f = FragmentSpec::parse("1:99999999999").unwrap();
        assert!(f.resolve(2).unwrap_err().message.contains("has 2 atoms"));
        let f = FragmentSpec::parse("1:2").unwrap();
        assert!(f.resolve(3).unwrap_err().message.contains("atom 3 out"));
    }
}
