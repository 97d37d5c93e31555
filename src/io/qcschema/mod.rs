//! QCSchema result documents (MolSSI's open JSON standard for quantum-chemistry
//! results; see the README, "QCSchema documents", for the version followed): read
//! as an orbital source when they carry a wave function, written by
//! `solve --qcschema`. Recognised by content (`schema_name`), never by file name.
//! Every error names the JSON path of the field at fault.

use serde::Deserialize;

use crate::error::{Error, Result};
use crate::solve::orbitals::OrbitalSet;

mod basis;
mod doc;
mod read;
mod write;

pub use write::{check, to_json};

/// The result schemas read: version 1's name (and its older spelling) and
/// version 2's.
const RESULT_NAMES: [&str; 3] = [
    "qcschema_output",
    "qc_schema_output",
    "qcschema_atomic_result",
];

/// Appended to the method's name of orbitals read from a document, for titles and
/// footnotes; `write` takes it off again, so a document reads back unchanged.
pub(crate) const SOURCE_MARK: &str = " (QCSchema)";

/// Whether a JSON text is a QCSchema document rather than a lobecast orbital file:
/// it has a top-level `schema_name`, or, without one, a `molecule` or `wavefunction`
/// and no `format`. Reads the whole text once without keeping anything else. A text
/// that is not valid JSON is judged by the keys it names, so its syntax error comes
/// from the reader of the format it was meant to be.
pub fn is_document(text: &str) -> bool {
    #[derive(Deserialize)]
    struct Probe {
        schema_name: Option<serde::de::IgnoredAny>,
        format: Option<serde::de::IgnoredAny>,
        molecule: Option<serde::de::IgnoredAny>,
        wavefunction: Option<serde::de::IgnoredAny>,
    }
    match serde_json::from_str::<Probe>(text) {
        Ok(p) => {
            p.schema_name.is_some()
                || (p.format.is_none() && (p.molecule.is_some() || p.wavefunction.is_some()))
        }
        Err(_) => {
            !text.contains("\"lobecast-orbitals\"")
                && [
                    "schema_name",
                    "wavefunction",
                    "molecule",
                    "driver",
                    "return_result",
                    "provenance",
                    "protocols",
                ]
                .iter()
                .any(|k| text.contains(&format!("\"{k}\"")))
        }
    }
}

/// Reads a QCSchema result document into an orbital set.
pub fn parse(text: &str, name: &str) -> Result<OrbitalSet> {
    let bad = |field: String, msg: String| Error::input(format!("{name}: {field}: {msg}"));
    let mut de = serde_json::Deserializer::from_str(text);
    let doc: doc::Document = serde_path_to_error::deserialize(&mut de).map_err(|e| {
        let path = e.path().to_string();
        let inner = e.into_inner();
        let msg = inner.to_string();
        let msg = msg
            .rsplit_once(" at line ")
            .map_or(msg.as_str(), |(m, _)| m);
        let missing = msg
            .strip_prefix("missing field `")
            .and_then(|m| m.strip_suffix('`'));
        if let Some(field) = missing {
            let at = if path == "." {
                String::new()
            } else {
                format!("{path}.")
            };
            bad(format!("{at}{field}"), "missing".into())
        } else if path == "." || inner.is_syntax() || inner.is_eof() {
            Error::input(format!(
                "{name} line {} column {}: {msg}",
                inner.line(),
                inner.column()
            ))
        } else {
            bad(path, msg.to_string())
        }
    })?;
    if !RESULT_NAMES.contains(&doc.schema_name.as_str()) {
        return Err(bad(
            "schema_name".into(),
            format!(
                "{:?} is not a QCSchema result; lobecast reads a result with a wave function (schema_name \"qcschema_output\" or \"qcschema_atomic_result\")",
                doc.schema_name
            ),
        ));
    }
    if doc.success == Some(false) {
        return Err(bad(
            "success".into(),
            "false: the document reports a failed computation".into(),
        ));
    }
    let molecule = doc
        .molecule
        .ok_or_else(|| bad("molecule".into(), "missing".into()))?;
    let (atoms, charge, multiplicity) =
        read::read_molecule(molecule).map_err(|(f, m)| bad(f, m))?;
    crate::io::orbitals::check_atoms(&atoms, |i| format!(", molecule.symbols[{i}]"))
        .map_err(|e| e.context(name))?;
    let wf = doc.wavefunction.ok_or_else(|| {
        bad(
            "wavefunction".into(),
            "missing: the document carries no orbitals (run the program with the wavefunction protocol set to \"orbitals_and_eigenvalues\" or \"all\")".into(),
        )
    })?;
    let basis = basis::read_basis(&wf.basis, &atoms, crate::io::orbitals::MAX_BASIS_FUNCTIONS)
        .map_err(|(f, m)| bad(f, m))?;
    let nbf = basis.len();
    let estimate = 8.0 * 4.0 * (nbf as f64).powi(2);
    crate::budget::check_memory(
        estimate,
        crate::budget::DEFAULT_MEMORY,
        &format!("{name}: the overlap matrix of {nbf} functions and the orbitals"),
    )?;
    let props = doc.properties.unwrap_or_default();
    let (alpha, beta) = read::read_orbitals(wf, nbf, &props).map_err(|(f, m)| bad(f, m))?;
    if let Some(e) = props.scf_total_energy.filter(|e| !e.is_finite()) {
        return Err(bad(
            "properties.scf_total_energy".into(),
            format!("{e} is not finite"),
        ));
    }
    let model = doc.model.or_else(|| {
        doc.input_data
            .and_then(|i| i.specification)
            .and_then(|s| s.model)
    });
    let method = match model.as_ref().and_then(|m| m.method.clone()) {
        Some(m) => format!("{m}{SOURCE_MARK}"),
        None => format!("orbitals{SOURCE_MARK}"),
    };
    let mut notes = vec![describe(
        model.as_ref(),
        doc.provenance.as_ref(),
        &basis.name,
    )];
    // lobecast's own cautions come back as such (`assemble` turns them into data),
    // and the ones the document's model calls for are added: Hartree–Fock lacks
    // correlation, a minimal (STO-nG) basis gives qualitative shapes only.
    notes.extend(
        doc.extras
            .and_then(|e| e.lobecast)
            .map(|l| l.notes)
            .unwrap_or_default(),
    );
    let method_name = model
        .as_ref()
        .and_then(|m| m.method.as_deref())
        .unwrap_or("")
        .to_ascii_lowercase();
    let basis_name = model
        .as_ref()
        .and_then(|m| m.basis.as_ref())
        .and_then(|b| b.as_str())
        .unwrap_or(&basis.name)
        .to_ascii_lowercase();
    let mut add = |c: crate::solve::Caveat| {
        if !notes.iter().any(|n| n == c.text()) {
            notes.push(c.text().to_string());
        }
    };
    if ["hf", "scf", "rhf", "uhf", "rohf"].contains(&method_name.as_str()) {
        add(crate::solve::Caveat::Uncorrelated);
    }
    if basis_name.starts_with("sto-") {
        add(crate::solve::Caveat::MinimalBasis);
    }
    crate::io::orbitals::assemble(
        crate::io::orbitals::Decoded {
            atoms,
            basis,
            alpha,
            beta,
            charge,
            charge_field: "molecule.molecular_charge",
            multiplicity,
            total_energy: props.scf_total_energy,
            method: Some(method),
            notes,
            reference: None,
            energy_in_ev: false,
            orbital_name: Box::new(move |b, i| {
                let s = if b { "b" } else { "a" };
                format!("wavefunction.scf_orbitals_{s} orbital {i} (column {i})")
            }),
        },
        name,
    )
}

/// "read from a QCSchema document by Psi4 1.9: hf/6-31G*", as far as it says.
fn describe(model: Option<&doc::ModelDoc>, prov: Option<&doc::Provenance>, basis: &str) -> String {
    let method = model.and_then(|m| m.method.clone());
    let basis_name = model
        .and_then(|m| m.basis.as_ref())
        .and_then(|b| b.as_str().map(str::to_string))
        .unwrap_or_else(|| basis.to_string());
    let creator = prov.and_then(|p| p.creator.clone()).map(|c| {
        match prov
            .and_then(|p| p.version.clone())
            .filter(|v| !v.is_empty())
        {
            Some(v) => format!("{c} {v}"),
            None => c,
        }
    });
    let by = creator.map_or(String::new(), |c| format!(" by {c}"));
    match method {
        Some(m) => format!("read from a QCSchema document{by}: {m}/{basis_name}"),
        None => format!("read from a QCSchema document{by}: basis {basis_name}"),
    }
}
