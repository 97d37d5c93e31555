//! The orbital file (JSON, versions 1 and 2; schema in the README, "The orbital
//! file"): the neutral way to bring orbitals in from another program and take them
//! out. Reading is strict: every error names the field at fault. Version 2 adds
//! spin channels, the charge, multiplicity, nuclear repulsion and total energy, and
//! fixes orbital energies to be eigenvalues; lobecast writes version 2.

use std::path::Path;

use serde::{Deserialize, Serialize};

use crate::basis::Basis;
use crate::chem::units::{BOHR_IN_ANGSTROM, HARTREE_IN_EV};
use crate::chem::{Atom, elements};
use crate::error::{Error, Result};
use crate::solve::orbitals::{Orbital, OrbitalSet};

mod assemble;
mod basis;
mod write;

use assemble::elements_check;
pub use assemble::{Decoded, assemble, norm_warning};
use basis::basis_shells;
pub use write::to_json;

pub const FORMAT: &str = "lobecast-orbitals";
/// The version lobecast writes; it reads 1 and 2.
pub const VERSION: u32 = 2;

/// The largest inferred charge a title shows (common practice: molecular ions in
/// reports rarely carry more than ±3).
const MAX_SHOWN_CHARGE: f64 = 3.0;

/// The most basis functions a file may have (documented in the README). The overlap
/// matrix and its products are dense n × n: 10 000 functions need 0.8 GB per matrix
/// and about 5·10⁷ function pairs of integrals, the most a laptop run should take.
pub const MAX_BASIS_FUNCTIONS: usize = 10_000;

/// ⟨ψ|ψ⟩ further than this from 1 is reported (a `warning:`; the orbital is used as
/// given, so densities scale with it).
pub const NORM_TOLERANCE: f64 = 1e-6;

#[derive(Debug, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
struct Doc {
    format: String,
    version: u32,
    length_unit: String,
    energy_unit: String,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    method: Option<String>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    charge: Option<i32>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    multiplicity: Option<u32>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    nuclear_repulsion: Option<f64>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    total_energy: Option<f64>,
    atoms: Vec<AtomEntry>,
    basis: Vec<BasisEntry>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    orbitals: Option<Vec<OrbitalEntry>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    orbitals_alpha: Option<Vec<OrbitalEntry>>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    orbitals_beta: Option<Vec<OrbitalEntry>>,
    /// Numbers reported with the orbitals (Mulliken charges, dipole, ⟨S²⟩); written
    /// for the reader's information, not read back.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    properties: Option<serde_json::Value>,
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    notes: Vec<String>,
    /// Free-atom valence occupation of every basis function, for valence-only sets
    /// (extended Hückel): the deformation reference, and the electron count of the
    /// neutral atoms, so the charge reads back right.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    reference_occupations: Option<Vec<f64>>,
}

#[derive(Debug, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
struct AtomEntry {
    element: String,
    atomic_number: u32,
    position: [f64; 3],
}

#[derive(Debug, Serialize, Deserialize)]
#[serde(tag = "type", rename_all = "lowercase", deny_unknown_fields)]
enum BasisEntry {
    Slater {
        atom: usize,
        n: u32,
        l: u32,
        m: i32,
        zeta: f64,
    },
    Gaussian {
        atom: usize,
        #[serde(default, skip_serializing_if = "Option::is_none")]
        powers: Option<[u32; 3]>,
        #[serde(default, skip_serializing_if = "Option::is_none")]
        l: Option<u32>,
        #[serde(default, skip_serializing_if = "Option::is_none")]
        m: Option<i32>,
        primitives: Vec<[f64; 2]>,
    },
}

#[derive(Debug, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
struct OrbitalEntry {
    energy: f64,
    occupation: f64,
    coefficients: Vec<f64>,
}

/// The largest orbital document read (2 GiB): a 10 000-function set written in
/// full takes about that much text, and parsing holds the text and its numbers.
pub const MAX_DOCUMENT_BYTES: u64 = 2 << 30;

/// Reads and validates an orbital source: a lobecast orbital file, or a QCSchema
/// result document with a wave function (told apart by content, not by name).
pub fn read(path: &Path) -> Result<OrbitalSet> {
    let what = format!("orbital file {}", path.display());
    let file = std::fs::File::open(path).map_err(|e| Error::reading(&what, e))?;
    let size = file.metadata().map_err(|e| Error::reading(&what, e))?.len();
    if size > MAX_DOCUMENT_BYTES {
        return Err(Error::input(format!(
            "{}: {} is over the {} an orbital document may take",
            path.display(),
            crate::budget::show_bytes(size as f64),
            crate::budget::show_bytes(MAX_DOCUMENT_BYTES as f64)
        )));
    }
    // The text, plus its numbers as f64 (at most 4 bytes of text make one).
    crate::budget::check_memory(
        3.0 * size as f64,
        crate::budget::DEFAULT_MEMORY,
        &format!("reading {}", path.display()),
    )?;
    let mut text = String::new();
    std::io::Read::read_to_string(
        &mut std::io::Read::take(file, MAX_DOCUMENT_BYTES),
        &mut text,
    )
    .map_err(|e| Error::reading(&what, e))?;
    let name = path.display().to_string();
    if crate::io::qcschema::is_document(&text) {
        return crate::io::qcschema::parse(&text, &name);
    }
    parse(&text, &name)
}

/// Whether a file holds a JSON document (an orbital file or a QCSchema result),
/// whatever its name: its first non-blank byte opens an object. A model file (TOML)
/// never starts with '{'.
pub fn is_json_document(path: &Path) -> bool {
    let mut head = [0u8; 256];
    let Ok(mut f) = std::fs::File::open(path) else {
        return false;
    };
    let n = std::io::Read::read(&mut f, &mut head).unwrap_or(0);
    head[..n]
        .iter()
        .find(|b| !b.is_ascii_whitespace())
        .is_some_and(|&b| b == b'{')
}

/// Atoms closer than 0.1 Å are refused (ghost centres excepted); `place` names atom i.
pub fn check_atoms(atoms: &[Atom], place: impl Fn(usize) -> String) -> Result<()> {
    elements_check(atoms, place)
}

pub fn parse(text: &str, name: &str) -> Result<OrbitalSet> {
    let doc: Doc = serde_json::from_str(text).map_err(|e| {
        Error::input(format!(
            "{name} line {} column {}: {}",
            e.line(),
            e.column(),
            strip_position(&e.to_string())
        ))
    })?;
    let bad = |field: String, msg: String| Error::input(format!("{name}: {field}: {msg}"));
    let (length, energy) = units(&doc).map_err(|(f, m)| bad(f, m))?;
    let atoms = read_atoms(&doc.atoms, length).map_err(|(f, m)| bad(f, m))?;
    elements_check(&atoms, |i| format!(", atoms[{i}]")).map_err(|e| e.context(name))?;
    let (list, beta_list) = channels(&doc).map_err(|(f, m)| bad(f, m))?;
    let nbf = doc.basis.len();
    let count = list.len() + beta_list.map_or(0, |b| b.len());
    let estimate = 8.0 * (2.0 * (nbf as f64).powi(2) + 2.0 * (count as f64) * nbf as f64);
    if nbf > MAX_BASIS_FUNCTIONS {
        return Err(bad(
            "basis".into(),
            format!(
                "{nbf} functions is over the limit of {MAX_BASIS_FUNCTIONS}: the overlap matrix and its products would need about {} of memory",
                crate::budget::show_bytes(estimate)
            ),
        ));
    }
    crate::budget::check_memory(
        estimate,
        crate::budget::DEFAULT_MEMORY,
        &format!("{name}: the overlap matrix of {nbf} functions and the orbitals"),
    )?;
    for (field, l) in [(list_name(&doc), Some(list)), ("orbitals_beta", beta_list)] {
        if let Some(l) = l.filter(|l| l.len() > nbf) {
            return Err(bad(
                field.into(),
                format!(
                    "{} orbitals, but a basis of {nbf} functions holds at most {nbf} independent orbitals",
                    l.len()
                ),
            ));
        }
    }
    let shells = basis_shells(&doc.basis, &atoms, length).map_err(|(f, m)| bad(f, m))?;
    let basis = Basis {
        name: "orbital file".into(),
        shells,
    };
    let nbf = basis.len();
    let most = if beta_list.is_some() { 1.0 } else { 2.0 };
    let orbitals =
        read_orbitals(list, nbf, energy, most, list_name(&doc)).map_err(|(f, m)| bad(f, m))?;
    let beta = beta_list
        .map(|b| read_orbitals(b, nbf, energy, 1.0, "orbitals_beta"))
        .transpose()
        .map_err(|(f, m)| bad(f, m))?;
    let reference = doc.reference_occupations.clone();
    if let Some(r) = &reference {
        if r.len() != basis.len() || r.iter().any(|v| !(v.is_finite() && *v >= 0.0)) {
            return Err(bad(
                "reference_occupations".into(),
                format!(
                    "needs one non-negative number per basis function ({}), got {} values",
                    basis.len(),
                    r.len()
                ),
            ));
        }
    }
    if let Some(m) = doc.multiplicity {
        if m == 0 || m > 1000 {
            return Err(bad(
                "multiplicity".into(),
                format!("must be 1 to 1000, found {m}"),
            ));
        }
    }
    for (field, v) in [
        ("total_energy", doc.total_energy),
        ("nuclear_repulsion", doc.nuclear_repulsion),
    ] {
        if v.is_some_and(|v| !v.is_finite()) {
            return Err(bad(field.into(), "not a finite number".into()));
        }
    }
    let list = list_name(&doc);
    assemble(
        Decoded {
            atoms,
            basis,
            alpha: orbitals,
            beta,
            charge: doc.charge,
            charge_field: "charge",
            multiplicity: doc.multiplicity,
            total_energy: doc.total_energy.map(|e| e * energy),
            method: doc.method,
            notes: doc.notes,
            reference,
            energy_in_ev: doc.energy_unit == "ev",
            orbital_name: Box::new(move |beta, i| {
                format!("{}[{i}]", if beta { "orbitals_beta" } else { list })
            }),
        },
        name,
    )
}

/// The error of one field: its path in the file and what is wrong with it.
type FieldResult<T> = std::result::Result<T, (String, String)>;

/// The format and version checked, and the factors that take the file's lengths to
/// bohr and its energies to hartree.
fn units(doc: &Doc) -> FieldResult<(f64, f64)> {
    if doc.format != FORMAT {
        return Err((
            "format".into(),
            format!("expected {FORMAT:?}, found {:?}", doc.format),
        ));
    }
    if !(1..=VERSION).contains(&doc.version) {
        return Err((
            "version".into(),
            format!(
                "this lobecast reads versions 1 and {VERSION}, found {}",
                doc.version
            ),
        ));
    }
    if doc.version == 1 {
        let v2 = [
            ("charge", doc.charge.is_some()),
            ("multiplicity", doc.multiplicity.is_some()),
            ("nuclear_repulsion", doc.nuclear_repulsion.is_some()),
            ("total_energy", doc.total_energy.is_some()),
            ("orbitals_alpha", doc.orbitals_alpha.is_some()),
            ("orbitals_beta", doc.orbitals_beta.is_some()),
            ("properties", doc.properties.is_some()),
        ];
        if let Some((field, _)) = v2.iter().find(|(_, present)| *present) {
            return Err((
                (*field).into(),
                "is a version 2 field; this file says version 1".into(),
            ));
        }
    }
    let length = match doc.length_unit.as_str() {
        "bohr" => 1.0,
        "angstrom" => 1.0 / BOHR_IN_ANGSTROM,
        u => {
            return Err((
                "length_unit".into(),
                format!("expected \"bohr\" or \"angstrom\", found {u:?}"),
            ));
        }
    };
    let energy = match doc.energy_unit.as_str() {
        "hartree" => 1.0,
        "ev" => 1.0 / HARTREE_IN_EV,
        u => {
            return Err((
                "energy_unit".into(),
                format!("expected \"hartree\" or \"ev\", found {u:?}"),
            ));
        }
    };
    Ok((length, energy))
}

/// The atoms, each element checked against its atomic number, positions in bohr.
fn read_atoms(entries: &[AtomEntry], length: f64) -> FieldResult<Vec<Atom>> {
    let mut atoms = Vec::with_capacity(entries.len());
    for (i, a) in entries.iter().enumerate() {
        let element = elements::by_symbol(&a.element).ok_or_else(|| {
            (
                format!("atoms[{i}].element"),
                elements::unknown_symbol(&a.element),
            )
        })?;
        if element.atomic_number != a.atomic_number {
            return Err((
                format!("atoms[{i}].atomic_number"),
                format!(
                    "{} is {} but the file says {}",
                    a.element, element.atomic_number, a.atomic_number
                ),
            ));
        }
        if a.position.iter().any(|x| !x.is_finite()) {
            return Err((format!("atoms[{i}].position"), "not finite".into()));
        }
        atoms.push(Atom {
            element,
            position: a.position.map(|x| x * length),
        });
    }
    Ok(atoms)
}

/// The orbitals, each checked (length, finite, occupation, not vanishing), energies
/// in hartree; and the occupations checked against what `nbf` functions can hold.
/// The orbital lists: `orbitals` (restricted), or `orbitals_alpha` and
/// `orbitals_beta` (unrestricted, version 2), never both kinds.
fn channels(doc: &Doc) -> FieldResult<(&[OrbitalEntry], Option<&[OrbitalEntry]>)> {
    match (&doc.orbitals, &doc.orbitals_alpha, &doc.orbitals_beta) {
        (Some(o), None, None) => Ok((o, None)),
        (None, Some(a), Some(b)) => Ok((a, Some(b))),
        (None, None, None) => Err((
            "orbitals".into(),
            "missing: the file holds no orbitals".into(),
        )),
        (Some(_), _, _) => Err((
            "orbitals".into(),
            "give either orbitals (restricted) or orbitals_alpha and orbitals_beta, not both"
                .into(),
        )),
        (None, Some(_), None) => Err((
            "orbitals_beta".into(),
            "missing: orbitals_alpha needs orbitals_beta".into(),
        )),
        (None, None, Some(_)) => Err((
            "orbitals_alpha".into(),
            "missing: orbitals_beta needs orbitals_alpha".into(),
        )),
    }
}

fn list_name(doc: &Doc) -> &'static str {
    if doc.orbitals.is_some() {
        "orbitals"
    } else {
        "orbitals_alpha"
    }
}

fn read_orbitals(
    entries: &[OrbitalEntry],
    nbf: usize,
    energy: f64,
    most: f64,
    list: &str,
) -> FieldResult<Vec<Orbital>> {
    let mut orbitals = Vec::with_capacity(entries.len());
    for (i, o) in entries.iter().enumerate() {
        if o.coefficients.len() != nbf {
            return Err((
                format!("{list}[{i}].coefficients"),
                format!(
                    "has {} entries but the basis has {nbf} functions",
                    o.coefficients.len()
                ),
            ));
        }
        if !o.energy.is_finite() || o.coefficients.iter().any(|c| !c.is_finite()) {
            return Err((
                format!("{list}[{i}]"),
                "energy and coefficients must be finite numbers".into(),
            ));
        }
        if !(0.0..=most).contains(&o.occupation) {
            return Err((
                format!("{list}[{i}].occupation"),
                format!("must be between 0 and {most}, found {}", o.occupation),
            ));
        }
        if o.coefficients.iter().all(|&c| c == 0.0) {
            return Err((
                format!("{list}[{i}].coefficients"),
                "all zero: an orbital must not vanish everywhere".into(),
            ));
        }
        orbitals.push(Orbital {
            energy: o.energy * energy,
            occupation: o.occupation,
            coefficients: o.coefficients.clone(),
        });
    }
    if orbitals.is_empty() {
        return Err((list.into(), "the file holds no orbitals".into()));
    }
    let electrons: f64 = orbitals.iter().map(|o| o.occupation).sum();
    let occupied = orbitals.iter().filter(|o| o.occupation > 0.0).count();
    if occupied > nbf || electrons > most * nbf as f64 + 1e-9 {
        return Err((
            list.into(),
            format!(
                "{occupied} occupied orbitals with {electrons} electrons, but a basis of {nbf} functions holds at most {nbf} orbitals and {} electrons ({most} per function)",
                most * nbf as f64
            ),
        ));
    }
    Ok(orbitals)
}

/// serde_json appends " at line L column C"; we print the position first instead.
fn strip_position(msg: &str) -> String {
    msg.rsplit_once(" at line ")
        .map_or(msg, |(m, _)| m)
        .to_string()
}
