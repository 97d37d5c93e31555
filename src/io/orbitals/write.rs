//! Writing an orbital set as an orbital file, version 2 (bohr, hartree).

use super::{AtomEntry, BasisEntry, Doc, FORMAT, OrbitalEntry, VERSION};
use crate::basis::{Angular, Shell};
use crate::solve::MethodKind;
use crate::solve::orbitals::OrbitalSet;

/// Writes an orbital set as an orbital file (bohr, hartree).
pub fn to_json(set: &OrbitalSet) -> String {
    let atoms = set
        .molecule
        .atoms
        .iter()
        .map(|a| AtomEntry {
            element: a.element.symbol.into(),
            atomic_number: a.element.atomic_number,
            position: a.position,
        })
        .collect();
    let mut basis = Vec::with_capacity(set.basis.len());
    for shell in &set.basis.shells {
        match shell {
            Shell::Slater(s) => basis.extend(s.ms.iter().map(|&m| BasisEntry::Slater {
                atom: s.atom,
                n: s.n,
                l: s.l,
                m,
                zeta: s.zeta,
            })),
            Shell::Gaussian(g) => basis.extend(g.functions.iter().map(|f| {
                let primitives = g.primitives.iter().map(|&(a, c)| [a, c]).collect();
                match *f {
                    Angular::Cartesian(p) | Angular::CartesianShared(p) => BasisEntry::Gaussian {
                        atom: g.atom,
                        powers: Some(p),
                        l: None,
                        m: None,
                        primitives,
                    },
                    Angular::Pure(m) => BasisEntry::Gaussian {
                        atom: g.atom,
                        powers: None,
                        l: Some(g.l),
                        m: Some(m),
                        primitives,
                    },
                }
            })),
        }
    }
    // Version 2 energies are eigenvalues: the one-electron solver's include the
    // nuclear repulsion (they are total energies of its one electron), so it comes off.
    let one_electron = set.origin == MethodKind::OneElectron;
    let enn = set.molecule.nuclear_repulsion();
    let shift = if one_electron { enn } else { 0.0 };
    // The file's Cartesian functions are each normalised: shared-scale ones (read
    // from a QCSchema document) carry their factor into the coefficients.
    let factors = set.basis.function_factors();
    let entries = |list: &[crate::solve::Orbital]| -> Vec<OrbitalEntry> {
        list.iter()
            .map(|o| OrbitalEntry {
                energy: o.energy - shift,
                occupation: o.occupation,
                coefficients: o
                    .coefficients
                    .iter()
                    .zip(&factors)
                    .map(|(c, f)| c * f)
                    .collect(),
            })
            .collect()
    };
    let total_energy = set.spin.total_energy.or_else(|| {
        one_electron.then(|| set.orbitals.iter().map(|o| o.occupation * o.energy).sum())
    });
    let multiplicity = set.spin.multiplicity.or_else(|| one_electron.then_some(2));
    let (orbitals, orbitals_alpha, orbitals_beta) = match &set.spin.beta {
        Some(b) => (None, Some(entries(&set.orbitals)), Some(entries(b))),
        None => (Some(entries(&set.orbitals)), None, None),
    };
    let doc = Doc {
        format: FORMAT.into(),
        version: VERSION,
        length_unit: "bohr".into(),
        energy_unit: "hartree".into(),
        method: Some(set.method.clone()),
        charge: set.molecule.charge_known.then_some(set.molecule.charge),
        multiplicity,
        nuclear_repulsion: (set.origin != MethodKind::ExtendedHuckel).then_some(enn),
        total_energy,
        atoms,
        basis,
        orbitals,
        orbitals_alpha,
        orbitals_beta,
        properties: set.spin.scf.as_deref().map(properties),
        notes: set.statements(),
        reference_occupations: set.reference.clone(),
    };
    serde_json::to_string_pretty(&doc).expect("orbital sets serialise") + "\n"
}

/// The SCF report's numbers, for the reader's information.
fn properties(r: &crate::solve::scf::ScfReport) -> serde_json::Value {
    serde_json::json!({
        "energy_parts": {
            "nuclear_repulsion": r.nuclear_repulsion,
            "one_electron": r.one_electron,
            "two_electron": r.two_electron,
        },
        "scf_iterations": r.iterations,
        "mulliken_charges": r.mulliken,
        "dipole": {
            "au": r.dipole.au,
            "origin": r.dipole.origin,
            "origin_is": "centre of nuclear charge",
        },
        "s_squared": r.s_squared.map(|s| s.0),
    })
}
