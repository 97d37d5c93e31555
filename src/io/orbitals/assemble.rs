//! From decoded orbitals to an `OrbitalSet`: what every orbital source shares once
//! its own format is read (the charge against the occupations, the normalisation
//! check, energy order, the method's name). The lobecast orbital file and QCSchema
//! documents both end here, so both are checked alike.

use crate::basis::{Basis, Shell};
use crate::chem::{Atom, Molecule};
use crate::error::{Error, Result};
use crate::solve::MethodKind;
use crate::solve::orbitals::{Orbital, OrbitalSet};

use super::{MAX_SHOWN_CHARGE, NORM_TOLERANCE};

/// A source's content in lobecast's units (bohr, hartree) and basis conventions,
/// each part already checked against its own format.
pub struct Decoded {
    pub atoms: Vec<Atom>,
    pub basis: Basis,
    /// Restricted: occupations 0–2; unrestricted: the alpha orbitals, 0–1.
    pub alpha: Vec<Orbital>,
    pub beta: Option<Vec<Orbital>>,
    pub charge: Option<i32>,
    /// Where the charge is stated, for messages.
    pub charge_field: &'static str,
    pub multiplicity: Option<u32>,
    /// Hartree, including the nuclear repulsion, where the source states it.
    pub total_energy: Option<f64>,
    /// What made the orbitals, as the source says it.
    pub method: Option<String>,
    pub notes: Vec<String>,
    /// Free-atom valence occupations of a valence-only set.
    pub reference: Option<Vec<f64>>,
    /// The source's energies were meant in eV (decides the degeneracy tolerance).
    pub energy_in_ev: bool,
    /// How messages name orbital i (of the beta channel when the flag is set): its
    /// path in the source.
    pub orbital_name: Box<dyn Fn(bool, usize) -> String>,
}

/// Builds the set: the charge inferred from (or checked against) the occupations,
/// the normalisation warned about, levels put in increasing energy.
pub fn assemble(d: Decoded, name: &str) -> Result<OrbitalSet> {
    let Decoded {
        atoms,
        basis,
        alpha: mut orbitals,
        mut beta,
        charge,
        charge_field,
        multiplicity,
        total_energy,
        method,
        notes,
        reference,
        energy_in_ev,
        orbital_name,
    } = d;
    let bad = |field: String, msg: String| Error::input(format!("{name}: {field}: {msg}"));
    let electrons: f64 = orbitals
        .iter()
        .chain(beta.iter().flatten())
        .map(|o| o.occupation)
        .sum();
    // A valence-only set counts the neutral atoms' valence electrons, not Z.
    let nuclear: f64 = match &reference {
        Some(r) => r.iter().sum(),
        None => atoms.iter().map(Atom::charge).sum(),
    };
    // Without a stated charge it is inferred from the occupations, and shown in
    // titles only when they add up to a whole number of electrons and the charge is
    // one an ion plausibly carries (|q| ≤ MAX_SHOWN_CHARGE); a larger one almost
    // always means a file of valence or active orbitals only, not a highly charged ion.
    let inferred = (nuclear - electrons).round();
    let whole = (electrons - electrons.round()).abs() <= 1e-6;
    if let Some(q) = charge {
        if !whole || (f64::from(q) - (nuclear - electrons)).abs() > 1e-6 {
            return Err(bad(
                charge_field.into(),
                format!(
                    "{q} disagrees with the occupations, which hold {electrons} electrons against a nuclear charge of {nuclear}"
                ),
            ));
        }
    }
    let plausible = charge.is_some() || inferred.abs() <= MAX_SHOWN_CHARGE;
    let mut molecule = Molecule::new(atoms, inferred as i32).map_err(|e| e.context(name))?;
    molecule.charge_known = whole && plausible;
    // Our own caveats come back as data; other notes stay text.
    let (caveats, mut notes): (Vec<_>, Vec<_>) = notes
        .into_iter()
        .partition(|n| crate::solve::Caveat::from_text(n).is_some());
    let caveats: Vec<crate::solve::Caveat> = caveats
        .iter()
        .filter_map(|n| crate::solve::Caveat::from_text(n))
        .collect();
    if whole && !plausible {
        notes.push(format!(
            "the occupations hold {} electrons against a nuclear charge of {}; taking the file to hold part of the orbitals only, no charge is shown",
            electrons.round(),
            nuclear
        ));
    }
    crate::solve::estimate::check_primitive_pairs(&basis).map_err(|e| e.context(name))?;
    let overlap = overlap_for(&molecule, &basis);
    match &overlap {
        Some(s) => {
            for (is_beta, list) in [(false, Some(&orbitals)), (true, beta.as_ref())] {
                let Some(list) = list else { continue };
                let label = |i| orbital_name(is_beta, i);
                let check = norm_warning(s, list, &label).map_err(|(i, n)| {
                    bad(
                        label(i),
                        format!("⟨ψ|ψ⟩ = {n:.3e}: the orbital vanishes (numerically zero)"),
                    )
                })?;
                if let Some(w) = check {
                    eprintln!("warning: {name}: {w}");
                }
            }
        }
        None => eprintln!(
            "note: {name}: lobecast has no overlap integrals for this basis (it mixes Slater and Gaussian functions, or has Slater functions beyond s and p), so the orbitals' normalisation is not checked"
        ),
    }
    for list in std::iter::once(&mut orbitals).chain(beta.iter_mut()) {
        if list.windows(2).any(|w| w[1].energy < w[0].energy) {
            list.sort_by(|a, b| a.energy.total_cmp(&b.energy));
            notes.push("the orbitals were renumbered in increasing energy".into());
        }
    }
    let method = method.unwrap_or_else(|| format!("orbital file {name}"));
    // The file's method text, read once here: lobecast's own extended-Hückel files
    // say so, and their energies are meant in eV.
    let origin = if method.starts_with("extended Hückel") {
        MethodKind::ExtendedHuckel
    } else {
        MethodKind::File
    };
    // 1e-6 of the unit the energies are meant in: eV for extended Hückel or a file
    // written in eV, hartree otherwise.
    let in_ev = origin == MethodKind::ExtendedHuckel || energy_in_ev;
    let mut set = OrbitalSet {
        molecule,
        basis,
        overlap,
        orbitals,
        origin,
        method,
        caveats,
        notes,
        reference,
        degeneracy: crate::solve::degenerate::tolerance(in_ev),
        spin: crate::solve::orbitals::Spin {
            beta,
            multiplicity,
            total_energy,
            ..Default::default()
        },
    };
    crate::solve::degenerate::canonicalise(&mut set);
    Ok(set)
}

/// Atoms closer than 0.1 Å are refused (ghost centres excepted), named by their
/// index in the file.
pub fn elements_check(atoms: &[Atom], name: impl Fn(usize) -> String) -> Result<()> {
    crate::chem::molecule::check_separations(atoms, name)
}

/// The overlap matrix where lobecast has the integrals: all-Gaussian bases, 1s Slater
/// functions of equal exponents, and Slater s and p functions.
fn overlap_for(molecule: &Molecule, basis: &Basis) -> Option<nalgebra::DMatrix<f64>> {
    crate::integrals::overlap_matrix(molecule, basis).or_else(|| {
        basis
            .shells
            .iter()
            .all(|s| matches!(s, Shell::Slater(_)))
            .then(|| crate::integrals::slater_overlap_matrix(basis).ok())
            .flatten()
    })
}

/// ⟨ψ|ψ⟩ = cᵀSc of every orbital (in source order). `Err((i, n))` for a vanishing
/// orbital (n ≤ 1e-12); otherwise a warning naming the worst orbital when any is
/// further than `NORM_TOLERANCE` from 1.
pub fn norm_warning(
    s: &nalgebra::DMatrix<f64>,
    orbitals: &[Orbital],
    orbital_name: &dyn Fn(usize) -> String,
) -> std::result::Result<Option<String>, (usize, f64)> {
    let mut worst: Option<(usize, f64)> = None;
    let mut off = 0;
    for (i, o) in orbitals.iter().enumerate() {
        let c = nalgebra::DVector::from_column_slice(&o.coefficients);
        let n = c.dot(&(s * &c));
        if n.is_nan() || n <= 1e-12 {
            return Err((i, n));
        }
        let d = (n - 1.0).abs();
        if d > NORM_TOLERANCE {
            off += 1;
            if worst.is_none_or(|(_, w)| d > (w - 1.0).abs()) {
                worst = Some((i, n));
            }
        }
    }
    Ok(worst.map(|(i, n)| {
        format!(
            "{} has ⟨ψ|ψ⟩ = {n:.6} (the worst of {off} orbital(s) off 1 by more than {NORM_TOLERANCE:e}); the orbitals are used as given, so densities scale with ⟨ψ|ψ⟩ (--renormalize scales them to 1 for the run)",
            orbital_name(i)
        )
    }))
}
