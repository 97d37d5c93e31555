//! A QCSchema basis set (`wavefunction.basis`) as lobecast shells, and back.
//!
//! Conventions, as the QCSchema wavefunction documentation states them ("AO basis
//! functions are ordered according to the CCA standard"): atoms in `atom_map`
//! order, shells in `electron_shells` order, a fused shell (`angular_momentum`
//! [0, 1]) or a general contraction (several coefficient rows) as its segments in
//! row order; within a shell Cartesian components x^a y^b z^c with a descending,
//! then b descending (xx, xy, xz, yy, yz, zz), all scaled like x^l (so xy of a d
//! shell has norm 1/3), and real solid harmonics m = −l … +l, each normalised.
//! Contraction coefficients multiply normalised primitives (the basis-set
//! exchange's convention, which the schema's basis model copies); each contracted
//! function is then normalised, so an overall scale of a row does not matter.

use std::collections::BTreeMap;

use super::doc::{BasisSetDoc, CenterDoc, ShellDoc};
use crate::basis::harmonics::{L_MAX, cartesian_components};
use crate::basis::{Angular, Basis, GaussianShell, Shell};
use crate::chem::Atom;

/// The error of one field: its JSON path and what is wrong with it.
pub type FieldResult<T> = std::result::Result<T, (String, String)>;

/// Functions a shell of angular momentum l holds in the given form.
pub fn function_count(l: u64, pure: bool) -> u64 {
    if pure {
        2 * l + 1
    } else {
        (l + 1) * (l + 2) / 2
    }
}

/// The shells of the document's basis on `atoms`; at most `max_functions` functions
/// (counted before any is built).
pub fn read_basis(doc: &BasisSetDoc, atoms: &[Atom], max_functions: usize) -> FieldResult<Basis> {
    let base = "wavefunction.basis";
    if doc.atom_map.len() != atoms.len() {
        return Err((
            format!("{base}.atom_map"),
            format!(
                "has {} entries but the molecule has {} atoms",
                doc.atom_map.len(),
                atoms.len()
            ),
        ));
    }
    // Every centre checked and counted once, then the count over the atoms.
    let mut per_center: BTreeMap<&str, u64> = BTreeMap::new();
    for (key, center) in &doc.center_data {
        per_center.insert(
            key,
            check_center(center, &format!("{base}.center_data.{key}"))?,
        );
    }
    let mut total: u64 = 0;
    for (i, key) in doc.atom_map.iter().enumerate() {
        let n = per_center.get(key.as_str()).ok_or_else(|| {
            (
                format!("{base}.atom_map[{i}]"),
                format!("{key:?} is not a key of center_data"),
            )
        })?;
        total = total.saturating_add(*n);
    }
    if total > max_functions as u64 {
        return Err((
            base.into(),
            format!("{total} basis functions is over lobecast's limit of {max_functions}"),
        ));
    }
    if let Some(n) = doc.nbf {
        if n != total {
            return Err((
                format!("{base}.nbf"),
                format!("says {n} but the shells hold {total} functions"),
            ));
        }
    }
    if total == 0 {
        return Err((base.into(), "holds no basis functions".into()));
    }
    let mut shells = Vec::new();
    for (i, key) in doc.atom_map.iter().enumerate() {
        let center = &doc.center_data[key];
        for (k, s) in center.electron_shells.iter().enumerate() {
            let path = format!("{base}.center_data.{key}.electron_shells[{k}]");
            let pure = s.harmonic_type == "spherical";
            let exps: Vec<f64> = s.exponents.iter().map(|x| x.0).collect();
            for (row, coefs) in s.coefficients.iter().enumerate() {
                let l = if s.angular_momentum.len() == 1 {
                    s.angular_momentum[0]
                } else {
                    s.angular_momentum[row]
                } as u32;
                let primitives = exps.iter().zip(coefs).map(|(a, c)| (*a, c.0)).collect();
                let functions = if pure {
                    (-(l as i32)..=l as i32).map(Angular::Pure).collect()
                } else {
                    cartesian_components(l)
                        .into_iter()
                        .map(Angular::CartesianShared)
                        .collect()
                };
                let g = GaussianShell::new(i, atoms[i].position, l, primitives, functions)
                    .map_err(|e| (format!("{path}.coefficients[{row}]"), e.message))?;
                shells.push(Shell::Gaussian(g));
            }
        }
    }
    Ok(Basis {
        name: doc.name.clone().unwrap_or_else(|| "QCSchema basis".into()),
        shells,
    })
}

/// Checks one centre's shells and returns how many functions it holds.
fn check_center(center: &CenterDoc, path: &str) -> FieldResult<u64> {
    if center.ecp_electrons.is_some_and(|n| n != 0) || center.ecp_potentials.is_some() {
        return Err((
            format!("{path}.ecp_electrons"),
            "effective core potentials are not supported: lobecast's densities count every electron".into(),
        ));
    }
    if center.electron_shells.is_empty() {
        return Err((format!("{path}.electron_shells"), "is empty".into()));
    }
    let mut n: u64 = 0;
    for (k, s) in center.electron_shells.iter().enumerate() {
        n = n.saturating_add(check_shell(s, &format!("{path}.electron_shells[{k}]"))?);
    }
    Ok(n)
}

fn check_shell(s: &ShellDoc, path: &str) -> FieldResult<u64> {
    let pure = match s.harmonic_type.as_str() {
        "spherical" => true,
        "cartesian" => false,
        t => {
            return Err((
                format!("{path}.harmonic_type"),
                format!("expected \"spherical\" or \"cartesian\", found {t:?}"),
            ));
        }
    };
    if s.angular_momentum.is_empty() {
        return Err((format!("{path}.angular_momentum"), "is empty".into()));
    }
    if let Some((j, l)) = s
        .angular_momentum
        .iter()
        .enumerate()
        .find(|(_, l)| **l > L_MAX as u64)
    {
        return Err((
            format!("{path}.angular_momentum[{j}]"),
            format!("l = {l} is not supported: lobecast handles s, p, d and f (l ≤ {L_MAX})"),
        ));
    }
    if s.exponents.is_empty() || s.exponents.len() > crate::basis::gaussian::MAX_PRIMITIVES {
        return Err((
            format!("{path}.exponents"),
            format!(
                "needs 1 to {} exponents, found {}",
                crate::basis::gaussian::MAX_PRIMITIVES,
                s.exponents.len()
            ),
        ));
    }
    if let Some((j, x)) = s
        .exponents
        .iter()
        .enumerate()
        .find(|(_, x)| !(x.0.is_finite() && x.0 > 0.0))
    {
        return Err((
            format!("{path}.exponents[{j}]"),
            format!("must be a positive number, found {}", x.0),
        ));
    }
    if s.coefficients.is_empty() {
        return Err((format!("{path}.coefficients"), "is empty".into()));
    }
    let fused = s.angular_momentum.len() > 1;
    if fused && s.angular_momentum.len() != s.coefficients.len() {
        return Err((
            format!("{path}.coefficients"),
            format!(
                "has {} row(s), but a shell fusing {} angular momenta needs one row each",
                s.coefficients.len(),
                s.angular_momentum.len()
            ),
        ));
    }
    let mut n: u64 = 0;
    for (row, c) in s.coefficients.iter().enumerate() {
        if c.len() != s.exponents.len() {
            return Err((
                format!("{path}.coefficients[{row}]"),
                format!(
                    "has {} numbers but the shell has {} exponents",
                    c.len(),
                    s.exponents.len()
                ),
            ));
        }
        if let Some(j) = c.iter().position(|x| !x.0.is_finite()) {
            return Err((
                format!("{path}.coefficients[{row}][{j}]"),
                "is not a finite number".into(),
            ));
        }
        if c.iter().all(|x| x.0 == 0.0) {
            return Err((
                format!("{path}.coefficients[{row}]"),
                "all zero: the contracted function would vanish".into(),
            ));
        }
        let l = if fused {
            s.angular_momentum[row]
        } else {
            s.angular_momentum[0]
        };
        n = n.saturating_add(function_count(l, pure));
    }
    Ok(n)
}
