//! An orbital set as a QCSchema version 1 result (`qcschema_output`, bohr and
//! hartree), with its wave function in the conventions `basis.rs` reads: what is
//! written reads back to the same numbers. Only Gaussian bases whose shells hold
//! every function of their l can be written; anything else is refused before a
//! byte is written.

use serde_json::{Map, Value, json};

use crate::basis::harmonics::cartesian_components;
use crate::basis::{Angular, GaussianShell, Shell};
use crate::error::{Error, Result};
use crate::solve::MethodKind;
use crate::solve::orbitals::{Orbital, OrbitalSet};

/// Whether `set` can be written, and if not why: checked before any work is saved.
pub fn check(set: &OrbitalSet) -> Result<()> {
    shells(set).map(|_| ())
}

/// The document as JSON text.
pub fn to_json(set: &OrbitalSet) -> Result<String> {
    let shells = shells(set)?;
    let factors: Vec<f64> = shells
        .iter()
        .flat_map(|g| g.functions.iter().map(|f| to_shared(*f)))
        .collect();
    let mol = &set.molecule;
    let symbols: Vec<&str> = mol.atoms.iter().map(|a| a.element.symbol).collect();
    let geometry: Vec<f64> = mol.atoms.iter().flat_map(|a| a.position).collect();
    // The one-electron solver's levels include the nuclear repulsion: the schema's
    // eigenvalues do not.
    let shift = if set.origin == MethodKind::OneElectron {
        mol.nuclear_repulsion()
    } else {
        0.0
    };
    let nbf = set.basis.len();
    let matrix = |list: &[Orbital]| -> Vec<f64> {
        let nmo = list.len();
        let mut m = vec![0.0; nbf * nmo];
        for (i, o) in list.iter().enumerate() {
            for (mu, c) in o.coefficients.iter().enumerate() {
                m[mu * nmo + i] = c * factors[mu];
            }
        }
        m
    };
    let energies =
        |list: &[Orbital]| -> Vec<f64> { list.iter().map(|o| o.energy - shift).collect() };
    let mut wf = Map::new();
    wf.insert("basis".into(), basis_json(set, &shells));
    let (alpha_occ, beta_occ) = match &set.spin.beta {
        Some(b) => (occ(&set.orbitals), Some((b.as_slice(), occ(b)))),
        None if set
            .orbitals
            .iter()
            .all(|o| o.occupation == 0.0 || o.occupation == 2.0) =>
        {
            (
                set.orbitals.iter().map(|o| o.occupation / 2.0).collect(),
                None,
            )
        }
        // Singly or fractionally filled restricted levels: one set of orbitals, the
        // electrons split as in a restricted open shell (alpha first).
        None => {
            let a: Vec<f64> = set.orbitals.iter().map(|o| o.occupation.min(1.0)).collect();
            let b: Vec<f64> = set
                .orbitals
                .iter()
                .map(|o| (o.occupation - 1.0).max(0.0))
                .collect();
            (a, Some((set.orbitals.as_slice(), b)))
        }
    };
    let separate_beta = set.spin.beta.is_some();
    wf.insert("restricted".into(), json!(!separate_beta));
    wf.insert("scf_orbitals_a".into(), json!(matrix(&set.orbitals)));
    wf.insert("scf_eigenvalues_a".into(), json!(energies(&set.orbitals)));
    wf.insert("scf_occupations_a".into(), json!(alpha_occ));
    for k in ["orbitals", "eigenvalues", "occupations"] {
        wf.insert(format!("{k}_a"), json!(format!("scf_{k}_a")));
    }
    if let Some((b, b_occ)) = &beta_occ {
        if separate_beta {
            wf.insert("scf_orbitals_b".into(), json!(matrix(b)));
            wf.insert("scf_eigenvalues_b".into(), json!(energies(b)));
            wf.insert("orbitals_b".into(), json!("scf_orbitals_b"));
            wf.insert("eigenvalues_b".into(), json!("scf_eigenvalues_b"));
        }
        wf.insert("scf_occupations_b".into(), json!(b_occ));
        wf.insert("occupations_b".into(), json!("scf_occupations_b"));
    }
    let n_alpha: f64 = alpha_occ.iter().sum();
    let n_beta: f64 = match &beta_occ {
        Some((_, b)) => b.iter().sum(),
        None => n_alpha,
    };
    let multiplicity = set
        .spin
        .multiplicity
        .unwrap_or_else(|| ((n_alpha - n_beta).abs().round() as u32) + 1);
    let mut props = Map::new();
    props.insert("calcinfo_natom".into(), json!(mol.atoms.len()));
    props.insert("calcinfo_nbasis".into(), json!(nbf));
    props.insert("calcinfo_nmo".into(), json!(set.orbitals.len()));
    if whole(n_alpha) && whole(n_beta) {
        props.insert("calcinfo_nalpha".into(), json!(n_alpha.round() as u64));
        props.insert("calcinfo_nbeta".into(), json!(n_beta.round() as u64));
    }
    props.insert(
        "nuclear_repulsion_energy".into(),
        json!(mol.nuclear_repulsion()),
    );
    if let Some(e) = set.spin.total_energy {
        props.insert("scf_total_energy".into(), json!(e));
        props.insert("return_energy".into(), json!(e));
    }
    let (driver, result) = match set.spin.total_energy {
        Some(e) => ("energy", json!(e)),
        None => ("properties", json!({})),
    };
    let method = match set.origin {
        MethodKind::Rhf | MethodKind::Uhf => "hf".to_string(),
        _ => set
            .method
            .strip_suffix(super::SOURCE_MARK)
            .unwrap_or(&set.method)
            .to_string(),
    };
    let cautions: Vec<&str> = set.caveats.iter().map(|c| c.text()).collect();
    let doc = json!({
        "schema_name": "qcschema_output",
        "schema_version": 1,
        "molecule": {
            "schema_name": "qcschema_molecule",
            "schema_version": 2,
            "symbols": symbols,
            "geometry": geometry,
            "molecular_charge": mol.charge,
            "molecular_multiplicity": multiplicity,
        },
        "driver": driver,
        "model": { "method": method, "basis": set.basis.name },
        "keywords": {},
        "protocols": { "wavefunction": "all" },
        "properties": Value::Object(props),
        "wavefunction": Value::Object(wf),
        "return_result": result,
        "success": true,
        "provenance": {
            "creator": "lobecast",
            "version": env!("CARGO_PKG_VERSION"),
            "routine": "lobecast solve --qcschema",
        },
        // The cautions only: they read back as cautions. Other notes describe
        // this run and are not carried.
        "extras": { "lobecast": { "notes": cautions } },
    });
    serde_json::to_string_pretty(&doc)
        .map_err(|e| Error::input(format!("cannot write the QCSchema document: {e}")))
}

fn whole(x: f64) -> bool {
    (x - x.round()).abs() <= 1e-9
}

/// Per-spin occupations of unrestricted orbitals (0–1 already).
fn occ(list: &[Orbital]) -> Vec<f64> {
    list.iter().map(|o| o.occupation).collect()
}

/// The factor taking a coefficient on our function to one on the document's: the
/// document scales every Cartesian component like x^l.
fn to_shared(f: Angular) -> f64 {
    match f {
        Angular::Cartesian(p) => 1.0 / Angular::CartesianShared(p).own_norm_factor(),
        _ => 1.0,
    }
}

/// The Gaussian shells, each checked to hold every function of its l in the
/// document's order; ghost centres refused (the schema names an element for each).
fn shells(set: &OrbitalSet) -> Result<Vec<&GaussianShell>> {
    let refuse = |why: String| {
        Error::input(format!("--qcschema cannot write these orbitals: {why}"))
            .with_hint("QCSchema documents carry Gaussian basis sets: use --method rhf/uhf or a Gaussian basis")
    };
    if set
        .molecule
        .atoms
        .iter()
        .any(|a| a.element.atomic_number == 0)
    {
        return Err(refuse(
            "the molecule has a dummy or ghost centre (X)".into(),
        ));
    }
    let mut out = Vec::with_capacity(set.basis.shells.len());
    for s in &set.basis.shells {
        let Shell::Gaussian(g) = s else {
            return Err(refuse(format!(
                "the basis ({}) has Slater functions",
                set.basis.name
            )));
        };
        let l = g.l;
        let pure: Vec<Angular> = (-(l as i32)..=l as i32).map(Angular::Pure).collect();
        let cart: Vec<[u32; 3]> = cartesian_components(l);
        let is_cart = g.functions.len() == cart.len()
            && g.functions
                .iter()
                .zip(&cart)
                .all(|(f, p)| f.powers() == Some(*p))
            && (g
                .functions
                .iter()
                .all(|f| matches!(f, Angular::Cartesian(_)))
                || g.functions
                    .iter()
                    .all(|f| matches!(f, Angular::CartesianShared(_))));
        if g.functions != pure && !is_cart {
            return Err(refuse(format!(
                "a shell of l = {l} on atom {} holds only some of its functions",
                g.atom + 1
            )));
        }
        out.push(g);
    }
    if let Some(i) = (0..set.molecule.atoms.len()).find(|&i| out.iter().all(|g| g.atom != i)) {
        return Err(refuse(format!("atom {} carries no basis functions", i + 1)));
    }
    Ok(out)
}

/// `wavefunction.basis`: one centre per atom, shared by atoms of one element whose
/// shells are the same.
fn basis_json(set: &OrbitalSet, shells: &[&GaussianShell]) -> Value {
    let n = set.molecule.atoms.len();
    let mut per_atom: Vec<Vec<Value>> = vec![Vec::new(); n];
    for g in shells {
        let pure = matches!(g.functions[0], Angular::Pure(_));
        per_atom[g.atom].push(json!({
            "angular_momentum": [g.l],
            "harmonic_type": if pure { "spherical" } else { "cartesian" },
            "exponents": g.primitives.iter().map(|p| p.0).collect::<Vec<f64>>(),
            "coefficients": [g.primitives.iter().map(|p| p.1).collect::<Vec<f64>>()],
        }));
    }
    let mut centers = Map::new();
    let mut atom_map = Vec::with_capacity(n);
    for (i, shells) in per_atom.into_iter().enumerate() {
        let symbol = set.molecule.atoms[i].element.symbol;
        let center = json!({ "electron_shells": shells });
        let key = match centers.get(symbol) {
            None => symbol.to_string(),
            Some(c) if *c == center => symbol.to_string(),
            Some(_) => format!("{symbol}{}", i + 1),
        };
        centers.entry(key.clone()).or_insert(center);
        atom_map.push(key);
    }
    json!({
        "name": set.basis.name,
        "center_data": Value::Object(centers),
        "atom_map": atom_map,
        "nbf": set.basis.len(),
    })
}
