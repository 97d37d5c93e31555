//! The model file: which molecule, which basis, which method. The syntax is TOML
//! (Tom's Obvious Minimal Language, specification v1.0.0, toml.io), read by the
//! `toml` crate; the keys are ours and documented in the README ("The model file").
//! Reading it yields plain data; nothing here solves or evaluates.
//!
//! ```toml
//! [molecule]
//! units = "bohr"            # or "angstrom" (default)
//! charge = 1
//! atoms = [{ element = "H", position = [0, 0, -1] }, { element = "H", position = [0, 0, 1] }]
//! # xyz = "file.xyz"        # instead of atoms; relative to the model file
//! [basis]
//! set = "slater-1s"
//! zeta = { H = 1.0 }        # optional, per element; default ζ = Z
//! [orbitals]
//! method = "one-electron"   # or "extended-huckel" (no [basis]: it brings its own)
//! # k = 1.75, off-diagonal = "weighted", parameters.C = { p = { energy = -11.0 } }
//! ```
//!
//! An XYZ file can stand in for a model file when the method comes from the command
//! line (`load_with`).

use std::collections::BTreeMap;
use std::path::{Path, PathBuf};

use serde::Deserialize;

use crate::basis::{Basis, BasisSpec};
use crate::chem::{Atom, LengthUnit, Molecule, elements};
use crate::error::{Error, Result};
use crate::io::xyz::parse_xyz;
use crate::solve::huckel_params::{ElementOverride, HuckelOptions, OffDiagonal, valence_basis};
use crate::solve::{Method, MethodKind, OrbitalSet};

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct ModelFile {
    molecule: Option<MoleculeSection>,
    basis: Option<BasisSpec>,
    #[serde(default)]
    orbitals: OrbitalsSection,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct MoleculeSection {
    #[serde(default)]
    units: LengthUnit,
    #[serde(default)]
    charge: i32,
    /// 2S + 1, for Hartree–Fock (default: 1 or 2 by the electron count).
    multiplicity: Option<u32>,
    atoms: Option<Vec<AtomEntry>>,
    xyz: Option<String>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct AtomEntry {
    element: String,
    position: [f64; 3],
}

#[derive(Debug, Deserialize, Default)]
#[serde(deny_unknown_fields)]
struct OrbitalsSection {
    #[serde(default)]
    method: MethodKind,
    /// The orbital file, for `method = "file"`; relative to the model file.
    path: Option<String>,
    /// Extended Hückel: the Wolfsberg–Helmholz constant.
    k: Option<f64>,
    /// Extended Hückel: "plain" or "weighted".
    #[serde(rename = "off-diagonal")]
    off_diagonal: Option<OffDiagonal>,
    /// Extended Hückel: per-element overrides of the exponents and H_ii (eV).
    parameters: Option<BTreeMap<String, ElementOverride>>,
    /// Hartree–Fock: the most SCF iterations before giving up.
    #[serde(rename = "max-iterations")]
    max_iterations: Option<usize>,
}

/// What the command line adds when the model is a bare XYZ file.
#[derive(Debug, Clone, Default)]
pub struct LoadOptions {
    pub method: Option<MethodKind>,
    pub charge: Option<i32>,
    /// The named basis set, for Hartree–Fock on an XYZ file.
    pub basis: Option<String>,
    /// Overrides the named set's pure or Cartesian convention for l ≥ 2.
    pub functions: Option<crate::basis::named::AngularForm>,
    pub multiplicity: Option<u32>,
    /// Hartree–Fock: overrides the most SCF iterations (model file or default).
    pub max_iterations: Option<usize>,
    /// Scale orbitals read from a file to ⟨ψ|ψ⟩ = 1 for this run.
    pub renormalize: bool,
    /// Hartree–Fock: how the first density is made (default: free atoms).
    pub guess: Option<crate::solve::scf::Guess>,
    /// The spin channel orbital fields use (unrestricted orbitals); not a property
    /// of the model, applied to the solved set by whoever solves it.
    pub spin: Option<crate::solve::orbitals::Channel>,
}

/// The most SCF iterations anyone may ask for (each costs a two-electron build).
pub const MAX_SCF_ITERATIONS: usize = 10_000;

/// Hartree–Fock options from the method name and the user's numbers, checked.
fn scf_options(
    kind: MethodKind,
    multiplicity: Option<u32>,
    max_iterations: Option<usize>,
) -> Result<crate::solve::scf::ScfOptions> {
    use crate::solve::scf::{Reference, ScfOptions};
    let reference = match kind {
        MethodKind::Uhf => Reference::Unrestricted,
        _ => Reference::Restricted,
    };
    let mut o = ScfOptions::new(reference);
    o.multiplicity = multiplicity;
    if let Some(n) = max_iterations {
        if !(1..=MAX_SCF_ITERATIONS).contains(&n) {
            return Err(Error::input(format!(
                "max-iterations must be 1 to {MAX_SCF_ITERATIONS}, got {n}"
            )));
        }
        o.max_iterations = n;
    }
    Ok(o)
}

fn is_scf(kind: MethodKind) -> bool {
    matches!(kind, MethodKind::Rhf | MethodKind::Uhf)
}

/// A read and checked model: what to solve and how, not yet solved.
#[derive(Debug, Clone)]
pub struct Model {
    pub path: PathBuf,
    pub molecule: Molecule,
    /// The basis as the model asks for it (to rebuild it at other geometries);
    /// `None` when the basis came from an orbital file or with extended Hückel.
    pub spec: Option<BasisSpec>,
    pub method: Method,
    /// Every file the model was read from (the model itself, an XYZ or orbital
    /// file), so that no output is ever written over one of them.
    pub inputs: Vec<PathBuf>,
}

impl Model {
    /// The orbitals the model asks for, within the default memory budget.
    pub fn solve(&self) -> Result<OrbitalSet> {
        crate::solve::orbitals_for(&self.molecule, &self.method)
    }

    /// The basis of a one-electron model or an orbital file (extended Hückel builds
    /// its own when it solves).
    pub fn basis(&self) -> Option<&Basis> {
        self.method.basis()
    }
}

/// Reads a model file (TOML) or, for a `.json` path, an orbital file directly.
pub fn load(path: &Path) -> Result<Model> {
    load_with(path, &LoadOptions::default())
}

/// Like `load`, and an `.xyz` path becomes a model with the method and charge of
/// `options` (which only an XYZ file takes: a model file says them itself).
/// `renormalize` scales orbitals read from a file to ⟨ψ|ψ⟩ = 1, with a note.
pub fn load_with(path: &Path, options: &LoadOptions) -> Result<Model> {
    let mut model = load_source(path, options)?;
    if let Some(g) = options.guess {
        let Method::HartreeFock { options: o, .. } = &mut model.method else {
            return Err(Error::input(
                "--guess goes with Hartree–Fock (--method rhf or uhf, or method = \"rhf\" in a model file)",
            ));
        };
        o.guess = g;
    }
    if options.renormalize {
        let Method::Given(set) = &mut model.method else {
            return Err(Error::input(
                "--renormalize applies to orbitals read from a file (an orbital file, or a model with method = \"file\"); solved orbitals are normalised already",
            ));
        };
        let (fixed, worst) = set.renormalize()?;
        if fixed > 0 {
            set.notes.push(format!(
                "{fixed} orbital(s) scaled to ⟨ψ|ψ⟩ = 1 for this run (--renormalize; the furthest from 1 had {worst:.6})"
            ));
        }
    }
    Ok(model)
}

fn load_source(path: &Path, options: &LoadOptions) -> Result<Model> {
    let is_xyz = path
        .extension()
        .is_some_and(|e| e.eq_ignore_ascii_case("xyz"));
    if is_xyz {
        return from_xyz(path, options);
    }
    if options.method.is_some()
        || options.charge.is_some()
        || options.basis.is_some()
        || options.functions.is_some()
        || options.multiplicity.is_some()
    {
        return Err(Error::input(format!(
            "--method, --basis, --charge and --multiplicity apply to an XYZ file; {} says them itself",
            path.display()
        ))
        .with_hint("set [orbitals] method, [basis] set and [molecule] charge and multiplicity in the model file"));
    }
    if let Some(n) = options.max_iterations {
        let mut model = load(path)?;
        let Method::HartreeFock { options: o, .. } = &mut model.method else {
            return Err(Error::input(
                "--max-iterations goes with Hartree–Fock (method rhf or uhf)",
            ));
        };
        *o = scf_options(
            if o.reference == crate::solve::scf::Reference::Unrestricted {
                MethodKind::Uhf
            } else {
                MethodKind::Rhf
            },
            o.multiplicity,
            Some(n),
        )?;
        return Ok(model);
    }
    if path
        .extension()
        .is_some_and(|e| e.eq_ignore_ascii_case("json"))
        || crate::io::orbitals::is_json_document(path)
    {
        return from_orbitals(path, vec![path.to_path_buf()]);
    }
    let text = std::fs::read_to_string(path)
        .map_err(|e| Error::reading(format!("model file {}", path.display()), e))?;
    parse(&text, path)
}

fn from_orbitals(file: &Path, inputs: Vec<PathBuf>) -> Result<Model> {
    let set = crate::io::orbitals::read(file)?;
    Ok(Model {
        path: inputs[0].clone(),
        molecule: set.molecule.clone(),
        spec: None,
        method: Method::Given(Box::new(set)),
        inputs,
    })
}

fn from_xyz(path: &Path, options: &LoadOptions) -> Result<Model> {
    let name = path.display().to_string();
    let method = options.method.ok_or_else(|| {
        Error::input(format!(
            "{name} is an XYZ file: say how to get its orbitals"
        ))
        .with_hint(
            "add --method rhf --basis 6-31g* (or --method extended-huckel); --charge Q for an ion",
        )
    })?;
    if !is_scf(method)
        && (options.basis.is_some()
            || options.functions.is_some()
            || options.multiplicity.is_some()
            || options.max_iterations.is_some())
    {
        return Err(Error::input(
            "--basis, --functions, --multiplicity and --max-iterations go with --method rhf or uhf",
        ));
    }
    let text =
        std::fs::read_to_string(path).map_err(|e| Error::reading(format!("xyz file {name}"), e))?;
    let frame = parse_xyz(&text, &name, LengthUnit::Angstrom)?;
    if frame.more_frames {
        eprintln!("note: {name} holds several frames; using the first");
    }
    let molecule =
        Molecule::new(frame.atoms, options.charge.unwrap_or(0)).map_err(|e| e.context(&name))?;
    match method {
        MethodKind::ExtendedHuckel => {
            huckel_coverage(&molecule).map_err(|e| e.context(&name))?;
            let huckel = HuckelOptions::default();
            // Built once here so that a missing parameter is refused on reading.
            valence_basis(&molecule, &huckel)?;
            Ok(Model {
                path: path.to_path_buf(),
                molecule,
                spec: None,
                method: Method::ExtendedHuckel(huckel),
                inputs: vec![path.to_path_buf()],
            })
        }
        MethodKind::Rhf | MethodKind::Uhf => {
            let set = options.basis.as_deref().ok_or_else(|| {
                Error::input(format!("--method {} needs --basis", method_name(method)))
                    .with_hint(format!("the basis sets: {}", crate::basis::sets::SET_NAMES))
            })?;
            let mut spec = BasisSpec::named(set);
            if let Some(f) = options.functions {
                spec = spec.with_functions(f);
            }
            let basis = spec.build(&molecule).map_err(|e| e.context(&name))?;
            let options = scf_options(method, options.multiplicity, options.max_iterations)?;
            crate::solve::scf::occupation::spin_counts(
                &molecule,
                options.multiplicity,
                options.reference,
            )
            .map_err(|e| e.context(&name))?;
            Ok(Model {
                path: path.to_path_buf(),
                molecule,
                spec: Some(spec),
                method: Method::HartreeFock { basis, options },
                inputs: vec![path.to_path_buf()],
            })
        }
        _ => Err(Error::input(format!(
            "{name}: an XYZ file needs --method rhf, uhf (with --basis) or extended-huckel (one-electron needs a model file)"
        ))),
    }
}

fn method_name(kind: MethodKind) -> &'static str {
    match kind {
        MethodKind::Uhf => "uhf",
        _ => "rhf",
    }
}

/// Extended Hückel here has s and p valence shells with n ≤ 3, so it treats H–Ar
/// only (built-in parameters: H, Li–F, Na–Cl; overrides may add He, Ne, Ar). Heavier
/// elements need d shells and a ghost centre has no valence electrons: refused here
/// with that reason rather than given wrong valence counts.
fn huckel_coverage(molecule: &Molecule) -> Result<()> {
    if let Some((i, a)) = molecule
        .atoms
        .iter()
        .enumerate()
        .find(|(_, a)| !(1..=18).contains(&a.element.atomic_number))
    {
        return Err(Error::input(format!(
            "atom {} is {} ({}): extended Hückel covers H–Ar only (s and p valence shells; built-in parameters for H, Li–F, Na–Cl)",
            i + 1,
            a.element.symbol,
            a.element.name
        ))
        .with_hint(
            "for heavier elements bring the orbitals from another program in an orbital file",
        ));
    }
    Ok(())
}

/// Parses model text; `path` names the file in errors and anchors relative paths.
pub fn parse(text: &str, path: &Path) -> Result<Model> {
    let name = path.display().to_string();
    let file: ModelFile = toml::from_str(text).map_err(|e| toml_error(&name, text, &e))?;
    let folder = path.parent().unwrap_or(Path::new("."));
    if file.orbitals.method == MethodKind::File {
        if file.molecule.is_some() || file.basis.is_some() {
            return Err(Error::input(format!(
                "{name}: with method = \"file\" the molecule and basis come from the orbital file; remove [molecule] and [basis]"
            )));
        }
        let rel = file.orbitals.path.ok_or_else(|| {
            Error::input(format!(
                "{name}: [orbitals] method = \"file\" needs path = \"orbitals.json\""
            ))
        })?;
        let orbitals = folder.join(rel);
        return from_orbitals(&orbitals, vec![path.to_path_buf(), orbitals.clone()]);
    }
    if file.orbitals.path.is_some() {
        return Err(Error::input(format!(
            "{name}: [orbitals] path is only used with method = \"file\""
        )));
    }
    let huckel_keys = file.orbitals.k.is_some()
        || file.orbitals.off_diagonal.is_some()
        || file.orbitals.parameters.is_some();
    let huckel = if file.orbitals.method == MethodKind::ExtendedHuckel {
        if file.basis.is_some() {
            return Err(Error::input(format!(
                "{name}: extended Hückel brings its own valence basis; remove [basis]"
            ))
            .with_hint("change exponents with [orbitals.parameters.El] s/p = { zeta = … }"));
        }
        let o = HuckelOptions {
            k: file.orbitals.k.unwrap_or(HuckelOptions::default().k),
            off_diagonal: file.orbitals.off_diagonal.unwrap_or_default(),
            parameters: file.orbitals.parameters.clone().unwrap_or_default(),
        };
        o.check().map_err(|e| e.context(&name))?;
        Some(o)
    } else if huckel_keys {
        return Err(Error::input(format!(
            "{name}: [orbitals] k, off-diagonal and parameters are only used with method = \"extended-huckel\""
        )));
    } else {
        None
    };
    let m = file
        .molecule
        .ok_or_else(|| Error::input(format!("{name}: the model needs a [molecule] section")))?;
    let spec = match (&huckel, file.basis) {
        (Some(_), _) => None,
        (None, Some(spec)) => Some(spec),
        (None, None) => {
            return Err(Error::input(format!(
                "{name}: the model needs a [basis] section"
            )));
        }
    };
    let mut inputs = vec![path.to_path_buf()];
    let atoms = match (m.atoms, m.xyz) {
        (Some(_), Some(_)) => {
            return Err(Error::input(format!(
                "{name}: [molecule] gives both atoms and xyz; give one"
            )));
        }
        (None, None) => {
            return Err(Error::input(format!(
                "{name}: [molecule] needs atoms = [...] or xyz = \"file\""
            )));
        }
        (Some(list), None) => list
            .iter()
            .enumerate()
            .map(|(i, a)| {
                let element = elements::by_symbol(&a.element).ok_or_else(|| {
                    Error::input(format!(
                        "{name}: atom {}: {}",
                        i + 1,
                        elements::unknown_symbol(&a.element)
                    ))
                })?;
                Ok(Atom {
                    element,
                    position: a.position.map(|x| m.units.to_bohr(x)),
                })
            })
            .collect::<Result<Vec<_>>>()?,
        (None, Some(xyz)) => {
            let xyz_path = folder.join(&xyz);
            let text = std::fs::read_to_string(&xyz_path).map_err(|e| {
                Error::reading(format!("xyz file {}", xyz_path.display()), e).context(&name)
            })?;
            let frame = parse_xyz(&text, &xyz_path.display().to_string(), m.units)?;
            inputs.push(xyz_path);
            frame.atoms
        }
    };
    crate::chem::molecule::check_separations(&atoms, |_| String::new())
        .map_err(|e| e.context(&name))?;
    let molecule = Molecule::new(atoms, m.charge).map_err(|e| e.context(&name))?;
    let scf = is_scf(file.orbitals.method);
    if !scf && (m.multiplicity.is_some() || file.orbitals.max_iterations.is_some()) {
        return Err(Error::input(format!(
            "{name}: [molecule] multiplicity and [orbitals] max-iterations are only used with method = \"rhf\" or \"uhf\""
        )));
    }
    if huckel.is_some() {
        huckel_coverage(&molecule).map_err(|e| e.context(&name))?;
    }
    let method = match (&spec, huckel) {
        (Some(spec), _) if scf => {
            let options = scf_options(
                file.orbitals.method,
                m.multiplicity,
                file.orbitals.max_iterations,
            )
            .map_err(|e| e.context(&name))?;
            crate::solve::scf::occupation::spin_counts(
                &molecule,
                options.multiplicity,
                options.reference,
            )
            .map_err(|e| e.context(&name))?;
            Method::HartreeFock {
                basis: spec.build(&molecule)?,
                options,
            }
        }
        (Some(spec), _) => Method::OneElectron {
            basis: spec.build(&molecule)?,
        },
        (None, Some(h)) => {
            // Built once here so that a missing parameter is refused on reading.
            valence_basis(&molecule, &h)?;
            Method::ExtendedHuckel(h)
        }
        (None, None) => return Err(Error::internal("a model without a basis")),
    };
    Ok(Model {
        path: path.to_path_buf(),
        molecule,
        spec,
        method,
        inputs,
    })
}

/// One line: file, line number, and TOML's own message (which names the key).
fn toml_error(name: &str, text: &str, e: &toml::de::Error) -> Error {
    let line = e.span().map(|s| {
        text.as_bytes()[..s.start.min(text.len())]
            .iter()
            .filter(|&&b| b == b'\n')
            .count()
            + 1
    });
    let msg = e.message().trim().replace('\n', " ");
    match line {
        Some(l) => Error::input(format!("{name} line {l}: {msg}")),
        None => Error::input(format!("{name}: {msg}")),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    const GOOD: &str = "[molecule]\nunits = \"bohr\"\ncharge = 1\natoms = [{ element = \"H\", position = [0, 0, -1] }, { element = \"h\", position = [0, 0, 1] }]\n[basis]\nset = \"slater-1s\"\nzeta = { H = 1.2 }\n";

    #[test]
    fn reads_a_model() {
        let m = parse(GOOD, Path::new("m.toml")).unwrap();
        assert_eq!(m.molecule.atoms.len(), 2);
        assert_eq!(m.molecule.atoms[1].position[2], 1.0);
        assert_eq!(m.molecule.electron_count(), 1);
        let basis = m.basis().unwrap();
        assert_eq!(basis.len(), 2);
        assert_eq!(basis.shells[1].label(0), "1s(ζ=1.200)");
    }

    #[test]
    fn unknown_key_names_key_and_line() {
        let text = GOOD.replace("charge = 1", "charge = 1\nchrage = 2");
        let e = parse(&text, Path::new("m.toml")).unwrap_err();
        assert!(
            e.message.contains("line 4") && e.message.contains("chrage"),
            "{}",
            e.message
        );
    }

    #[test]
    fn angstrom_is_the_default_unit() {
        let text = GOOD.replace("units = \"bohr\"\n", "");
        let m = parse(&text, Path::new("m.toml")).unwrap();
        // 1 Å in bohr with the CODATA 2018 Bohr radius.
        assert!((m.molecule.atoms[1].position[2] - 1.0 / 0.529_177_210_903).abs() < 1e-12);
    }
}

#[cfg(test)]
mod huckel_tests {
    use super::*;

    const EHT: &str = "[molecule]\natoms = [{ element = \"H\", position = [0, 0, 0] }, { element = \"Ne\", position = [0, 0, 1.5] }]\n[orbitals]\nmethod = \"extended-huckel\"\nk = 2.0\noff-diagonal = \"weighted\"\nparameters.ne = { s = { zeta = 2.9, energy = -48.5 }, p = { zeta = 2.9, energy = -21.6 } }\nparameters.H = { s = { energy = -13.0 } }\n";

    /// Overrides supply an element without built-in parameters (the numbers here
    /// are arbitrary test inputs, not reference values) and change H's H_ii.
    #[test]
    fn extended_huckel_with_overrides() {
        let m = parse(EHT, Path::new("m.toml")).unwrap();
        let Method::ExtendedHuckel(h) = &m.method else {
            panic!("extended Hückel expected, got {:?}", m.method.kind());
        };
        assert_eq!(valence_basis(&m.molecule, h).unwrap().basis.len(), 5);
        assert_eq!(h.k, 2.0);
        assert_eq!(h.off_diagonal, OffDiagonal::Weighted);
        let set = m.solve().unwrap();
        let occ: f64 = set.orbitals.iter().map(|o| o.occupation).sum();
        assert_eq!(occ, 9.0);
        let e = parse(
            &EHT.replace("[orbitals]", "[basis]\nset = \"sto-3g\"\n[orbitals]"),
            Path::new("m.toml"),
        )
        .unwrap_err();
        assert!(e.message.contains("remove [basis]"), "{}", e.message);
        let e = parse(
            &EHT.replace("parameters.ne", "parameters.Xx"),
            Path::new("m.toml"),
        )
        .unwrap_err();
        assert!(e.message.contains("Xx"), "{}", e.message);
    }

    /// Iron is an element (read from any file) but not one extended Hückel treats
    /// here, even with overrides: the error says which elements the method covers.
    #[test]
    fn extended_huckel_names_its_coverage() {
        let text = EHT
            .replace("\"Ne\"", "\"Fe\"")
            .replace("parameters.ne", "parameters.fe");
        let e = parse(&text, Path::new("m.toml")).unwrap_err();
        assert!(
            e.message.contains("Fe (iron)") && e.message.contains("covers H–Ar"),
            "{}",
            e.message
        );
        let e = MethodKind::parse("one-electorn").unwrap_err();
        assert_eq!(
            e.hint.as_deref(),
            Some("the methods for an XYZ file: rhf, uhf (with --basis), extended-huckel"),
            "the hint lists only what an XYZ file accepts"
        );
        let e = parse(
            &EHT.replace("position = [0, 0, 1.5]", "position = [0, 0, 0.05]"),
            Path::new("m.toml"),
        )
        .unwrap_err();
        assert!(e.message.contains("0.0500 Å apart"), "{}", e.message);
        let e = parse(&EHT.replace("\"Ne\"", "\"Qq\""), Path::new("m.toml")).unwrap_err();
        assert!(e.message.contains("H–Og"), "{}", e.message);
    }
}
