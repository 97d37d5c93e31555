//! The molecule and the orbitals of a QCSchema result, in lobecast's terms.
//!
//! Orbital matrices are (functions × orbitals), read row-major when flat, as
//! qcelemental (the schema's reference implementation) reshapes them. A restricted
//! document's occupations are per spin (0–1) and its beta quantities are skipped;
//! when it still gives beta occupations that differ (a restricted open shell), the
//! one set of orbitals serves both spins.

use super::basis::FieldResult;
use super::doc::{MoleculeDoc, Properties, Wavefunction};
use crate::chem::{Atom, elements};
use crate::solve::orbitals::Orbital;

/// The atoms (bohr), the stated charge and multiplicity.
pub fn read_molecule(m: MoleculeDoc) -> FieldResult<(Vec<Atom>, Option<i32>, Option<u32>)> {
    let n = m.symbols.len();
    if n == 0 {
        return Err(("molecule.symbols".into(), "is empty".into()));
    }
    let (xyz, cols) = m
        .geometry
        .row_major(n, "atom")
        .map_err(|e| ("molecule.geometry".to_string(), e))?;
    if cols != 3 {
        return Err((
            "molecule.geometry".into(),
            format!(
                "has {} numbers for {n} atoms; expected 3 per atom",
                xyz.len()
            ),
        ));
    }
    for (field, len) in [
        ("real", m.real.as_ref().map(Vec::len)),
        ("atomic_numbers", m.atomic_numbers.as_ref().map(Vec::len)),
    ] {
        if let Some(len) = len.filter(|&l| l != n) {
            return Err((
                format!("molecule.{field}"),
                format!("has {len} entries for {n} atoms"),
            ));
        }
    }
    let mut atoms = Vec::with_capacity(n);
    for (i, s) in m.symbols.iter().enumerate() {
        let element = elements::by_symbol(s).ok_or_else(|| {
            (
                format!("molecule.symbols[{i}]"),
                elements::unknown_symbol(s),
            )
        })?;
        if let Some(z) = m.atomic_numbers.as_ref().map(|z| z[i]) {
            if z != u64::from(element.atomic_number) {
                return Err((
                    format!("molecule.atomic_numbers[{i}]"),
                    format!("{s} is {} but the document says {z}", element.atomic_number),
                ));
            }
        }
        let p = [xyz[3 * i], xyz[3 * i + 1], xyz[3 * i + 2]];
        if p.iter().any(|x| !x.is_finite()) {
            return Err((format!("molecule.geometry (atom {i})"), "not finite".into()));
        }
        // A ghost atom keeps its basis functions but has no nucleus or electrons.
        let real = m.real.as_ref().is_none_or(|r| r[i]);
        let element = if real {
            element
        } else {
            elements::by_number(0).expect("the table has the ghost centre")
        };
        atoms.push(Atom {
            element,
            position: p,
        });
    }
    let charge = m
        .molecular_charge
        .map(|q| whole(q, -1000.0, 1000.0).ok_or("molecule.molecular_charge"))
        .transpose()
        .map_err(|f| {
            (
                f.to_string(),
                "must be a whole number from −1000 to 1000".into(),
            )
        })?;
    let multiplicity = m
        .molecular_multiplicity
        .map(|q| whole(q, 1.0, 1000.0).ok_or("molecule.molecular_multiplicity"))
        .transpose()
        .map_err(|f| {
            (
                f.to_string(),
                "must be a whole number from 1 to 1000".into(),
            )
        })?;
    Ok((atoms, charge, multiplicity.map(|m| m as u32)))
}

fn whole(x: f64, lo: f64, hi: f64) -> Option<i32> {
    (x.is_finite() && x.fract() == 0.0 && (lo..=hi).contains(&x)).then_some(x as i32)
}

/// The spin channels: `(alpha, beta)`, alpha with occupations 0–2 when restricted.
pub fn read_orbitals(
    wf: Wavefunction,
    nbf: usize,
    props: &Properties,
) -> FieldResult<(Vec<Orbital>, Option<Vec<Orbital>>)> {
    let Wavefunction {
        restricted,
        scf_orbitals_a,
        scf_orbitals_b,
        scf_eigenvalues_a,
        scf_eigenvalues_b,
        scf_occupations_a,
        scf_occupations_b,
        orbitals_a,
        orbitals_b,
        eigenvalues_a,
        eigenvalues_b,
        occupations_a,
        occupations_b,
        ..
    } = wf;
    // The return-result indices may only point at the SCF fields lobecast reads.
    for (index, value, target) in [
        ("orbitals_a", &orbitals_a, "scf_orbitals_a"),
        ("orbitals_b", &orbitals_b, "scf_orbitals_b"),
        ("eigenvalues_a", &eigenvalues_a, "scf_eigenvalues_a"),
        ("eigenvalues_b", &eigenvalues_b, "scf_eigenvalues_b"),
        ("occupations_a", &occupations_a, "scf_occupations_a"),
        ("occupations_b", &occupations_b, "scf_occupations_b"),
    ] {
        if let Some(v) = value.as_deref().filter(|v| *v != target) {
            return Err((
                format!("wavefunction.{index}"),
                format!("names {v:?}; lobecast reads the SCF orbitals ({target})"),
            ));
        }
    }
    let a = channel(
        "a",
        scf_orbitals_a,
        scf_eigenvalues_a,
        scf_occupations_a.clone(),
        props.calcinfo_nalpha,
        nbf,
    )?;
    if restricted {
        let occ_b = match (&scf_occupations_b, props.calcinfo_nbeta) {
            (Some(b), _) => Some(occupations("b", b.clone(), a.len())?),
            (None, Some(n)) if scf_occupations_a.is_none() => Some(aufbau(n, a.len(), "b")?),
            _ => None,
        };
        return Ok(match occ_b {
            Some(ob) if ob.iter().zip(&a).any(|(b, o)| *b != o.occupation) => {
                let beta = a
                    .iter()
                    .zip(ob)
                    .map(|(o, occupation)| Orbital {
                        occupation,
                        ..o.clone()
                    })
                    .collect();
                (a, Some(beta))
            }
            _ => (
                a.into_iter()
                    .map(|o| Orbital {
                        occupation: 2.0 * o.occupation,
                        ..o
                    })
                    .collect(),
                None,
            ),
        });
    }
    let b = channel(
        "b",
        scf_orbitals_b,
        scf_eigenvalues_b,
        scf_occupations_b,
        props.calcinfo_nbeta,
        nbf,
    )?;
    Ok((a, Some(b)))
}

/// One spin channel's orbitals (occupations 0–1).
fn channel(
    s: &str,
    coefficients: Option<super::doc::Matrix>,
    eigenvalues: Option<Vec<f64>>,
    occ: Option<Vec<f64>>,
    count: Option<u64>,
    nbf: usize,
) -> FieldResult<Vec<Orbital>> {
    let field = |f: &str| format!("wavefunction.scf_{f}_{s}");
    let c = coefficients.ok_or_else(|| {
        (
            field("orbitals"),
            "missing: the document carries no orbitals to draw (ask the program for the wavefunction, e.g. protocols.wavefunction = \"orbitals_and_eigenvalues\")".to_string(),
        )
    })?;
    let (c, nmo) = c
        .row_major(nbf, "basis function")
        .map_err(|e| (field("orbitals"), e))?;
    if nmo > nbf {
        return Err((
            field("orbitals"),
            format!("holds {nmo} orbitals, more than the {nbf} basis functions allow"),
        ));
    }
    let e = eigenvalues.ok_or_else(|| {
        (
            field("eigenvalues"),
            "missing: lobecast needs the orbital energies".to_string(),
        )
    })?;
    if e.len() != nmo {
        return Err((
            field("eigenvalues"),
            format!("has {} values for {nmo} orbitals", e.len()),
        ));
    }
    if let Some(i) = e.iter().position(|x| !x.is_finite()) {
        return Err((
            format!("{}[{i}]", field("eigenvalues")),
            "not finite".into(),
        ));
    }
    let occ = match (occ, count) {
        (Some(o), _) => occupations(s, o, nmo)?,
        (None, Some(n)) => aufbau(n, nmo, s)?,
        (None, None) => {
            return Err((
                field("occupations"),
                "missing, and properties.calcinfo_nalpha/nbeta do not say how many orbitals are filled".into(),
            ));
        }
    };
    let mut out = Vec::with_capacity(nmo);
    for i in 0..nmo {
        let coefficients: Vec<f64> = (0..nbf).map(|mu| c[mu * nmo + i]).collect();
        if let Some(mu) = coefficients.iter().position(|x| !x.is_finite()) {
            return Err((
                field("orbitals"),
                format!("function {mu} of orbital {i} is not finite"),
            ));
        }
        if coefficients.iter().all(|&x| x == 0.0) {
            return Err((
                field("orbitals"),
                format!("orbital {i} (column {i}) is all zero"),
            ));
        }
        out.push(Orbital {
            energy: e[i],
            occupation: occ[i],
            coefficients,
        });
    }
    Ok(out)
}

/// Per-spin occupations, each 0 to 1.
fn occupations(s: &str, o: Vec<f64>, nmo: usize) -> FieldResult<Vec<f64>> {
    let field = format!("wavefunction.scf_occupations_{s}");
    if o.len() != nmo {
        return Err((field, format!("has {} values for {nmo} orbitals", o.len())));
    }
    if let Some(i) = o.iter().position(|x| !(0.0..=1.0).contains(x)) {
        return Err((
            format!("{field}[{i}]"),
            format!("{} is outside 0 to 1 (occupations are per spin)", o[i]),
        ));
    }
    Ok(o)
}

/// The lowest `n` orbitals (in document order) filled, for a document that states
/// only the electron count.
fn aufbau(n: u64, nmo: usize, s: &str) -> FieldResult<Vec<f64>> {
    let spin = if s == "a" { "nalpha" } else { "nbeta" };
    if n > nmo as u64 {
        return Err((
            format!("properties.calcinfo_{spin}"),
            format!("{n} electrons do not fit in {nmo} orbitals"),
        ));
    }
    Ok((0..nmo)
        .map(|i| if (i as u64) < n { 1.0 } else { 0.0 })
        .collect())
}
