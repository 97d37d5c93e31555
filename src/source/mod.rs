//! What a figure or profile is drawn from. A `Source` gives the atoms and evaluates
//! fields at arbitrary points; the figure code never knows which kind it has.
//!
//! Plug-in point: a new kind of input is one more `Source` variant, one more arm in
//! `load`, `molecule`, `sampler`, `info` and `provenance`, and one `Sampler` variant
//! whose `evaluate` fills the values. Model and orbital files give exact values;
//! cube files are interpolated trilinearly (`cube::Volume::value_at`) and give NaN,
//! "no data", outside their box.

pub mod budget;
pub mod scale;
pub mod surfaces;

use std::path::{Path, PathBuf};

use crate::chem::elements::by_number;
use crate::chem::units::hartree_to_ev;
use crate::chem::{Atom, Molecule};
use crate::error::{Error, Result};
use crate::field::{Field, FieldSampler};
use crate::io::cube::{CubeInfo, CubeReader, Volume};
use crate::io::model;
use crate::solve::OrbitalSet;

pub enum Source {
    /// Orbitals built from a model file or read from an orbital file: exact values
    /// anywhere.
    Orbitals {
        set: OrbitalSet,
        inputs: Vec<PathBuf>,
    },
    /// A cube file: stored values, interpolated between grid points.
    Volume {
        volume: Volume,
        molecule: Molecule,
        inputs: Vec<PathBuf>,
    },
}

/// Evaluates prepared fields at points, values interleaved per point.
pub enum Sampler<'a> {
    Orbitals(FieldSampler),
    /// Stored field indices (from 0) of a volume.
    Volume(&'a Volume, Vec<usize>),
}

impl Sampler<'_> {
    /// How many values each point gets.
    pub fn fields(&self) -> usize {
        match self {
            Sampler::Orbitals(s) => s.field_count(),
            Sampler::Volume(_, f) => f.len(),
        }
    }

    pub fn evaluate(&self, points: &[[f64; 3]], out: &mut [f64]) {
        match self {
            Sampler::Orbitals(s) => s.evaluate(points, out),
            Sampler::Volume(v, fields) => {
                let nf = fields.len();
                for (p, vals) in points.iter().zip(out.chunks_exact_mut(nf)) {
                    for (o, &f) in vals.iter_mut().zip(fields) {
                        // Outside the cube's box there is no value: NaN, which
                        // figures hatch and CSV files leave empty.
                        *o = v.value_at(f, *p).unwrap_or(f64::NAN);
                    }
                }
            }
        }
    }
}

/// How a field is labelled in figures (markup) and in plain output.
#[derive(Debug, Clone)]
pub struct FieldInfo {
    /// "orbital 1, E = −0.5648 hartree (−15.37 eV)"; for extended Hückel
    /// "orbital 6, E = −13.22 eV".
    pub heading: String,
    /// "ψ_{1}".
    pub quantity: String,
    /// "ψ": the symbol without the orbital number.
    pub family: String,
    /// "ψ_{1}, E = −0.5648 hartree": a panel heading.
    pub short: String,
    /// "bohr^{−3/2}".
    pub unit: String,
    /// Plain text for CSV headers and messages.
    pub plain: String,
    pub signed: bool,
}

impl Source {
    /// Reads a source by its file type, every stored field of a cube, within the
    /// default memory budget. `options` say how to treat an XYZ file.
    pub fn load(path: &Path, options: &model::LoadOptions) -> Result<Self> {
        Self::load_for(path, options, None, crate::budget::DEFAULT_MEMORY)
    }

    /// Reads a source for drawing `fields` (`None`: all of a cube's stored fields),
    /// within `memory` bytes: a solve or a cube's kept fields estimated to need more
    /// are refused before they start. A cube keeps only the stored fields drawn.
    pub fn load_for(
        path: &Path,
        options: &model::LoadOptions,
        fields: Option<&[Field]>,
        memory: u64,
    ) -> Result<Self> {
        let ext = path
            .extension()
            .map(|e| e.to_string_lossy().to_ascii_lowercase())
            .unwrap_or_default();
        let json_doc =
            !matches!(ext.as_str(), "cube" | "gz") && crate::io::orbitals::is_json_document(path);
        match ext.as_str() {
            _ if json_doc => Self::from_model(path, options, memory),
            "toml" | "json" | "xyz" => Self::from_model(path, options, memory),
            "cube" | "gz" => {
                let reader = CubeReader::open(path)?;
                let kept = match fields {
                    Some(f) => f.iter().map(|f| stored_index(reader.info(), f)).collect::<Result<Vec<_>>>()?,
                    None => (0..reader.info().fields).collect(),
                };
                let volume = Volume::keeping(reader, &kept, memory)?;
                let atoms = volume
                    .info
                    .header
                    .atoms
                    .iter()
                    .map(|a| {
                        let element = by_number(a.atomic_number).ok_or_else(|| {
                            Error::input(format!("{}: atomic number {} is outside H–Ar", path.display(), a.atomic_number))
                        })?;
                        Ok(Atom { element, position: a.position })
                    })
                    .collect::<Result<Vec<_>>>()?;
                let molecule = Molecule::new(atoms, 0)?;
                Ok(Source::Volume { volume, molecule, inputs: vec![path.to_path_buf()] })
            }
            _ => Err(Error::input(format!(
                "cannot use {} as a source: expected a model file (.toml), an orbital file or QCSchema result (JSON), an XYZ file with --method, or a cube file (.cube, .cube.gz)",
                path.display()
            ))
            .with_hint("e.g. examples/h2-cation.toml")),
        }
    }

    /// A model, orbital source or XYZ file, solved (or read) within `memory` bytes.
    fn from_model(path: &Path, options: &model::LoadOptions, memory: u64) -> Result<Self> {
        let m = model::load_with(path, options)?;
        let mut set = crate::solve::orbitals_within(&m.molecule, &m.method, memory, &mut |_| {})?;
        if let Some(c) = options.spin {
            set.show(c)?;
        }
        Ok(Source::Orbitals {
            set,
            inputs: m.inputs,
        })
    }

    /// Bytes the source holds for sampling (a cube's kept values; orbitals are small).
    pub fn held_bytes(&self) -> f64 {
        match self {
            Source::Volume { volume, .. } => volume.held_bytes() as f64,
            Source::Orbitals { .. } => 0.0,
        }
    }

    /// Whether values can be missing (NaN): a cube file has none outside its box.
    pub fn has_box(&self) -> bool {
        matches!(self, Source::Volume { .. })
    }

    pub fn molecule(&self) -> &Molecule {
        match self {
            Source::Orbitals { set, .. } => &set.molecule,
            Source::Volume { molecule, .. } => molecule,
        }
    }

    /// Every file read, so that no output replaces one of them.
    pub fn inputs(&self) -> &[PathBuf] {
        match self {
            Source::Orbitals { inputs, .. } | Source::Volume { inputs, .. } => inputs,
        }
    }

    /// The figure footnotes the source's caveats ask for (none for a cube file,
    /// which carries no method).
    pub fn caveat_footnotes(&self) -> Vec<String> {
        match self {
            Source::Orbitals { set, .. } => set
                .caveats
                .iter()
                .filter_map(|c| c.figure_note())
                .map(str::to_string)
                .collect(),
            Source::Volume { .. } => Vec::new(),
        }
    }

    /// Statements that must go with the figure (the minimal-basis caution, …).
    pub fn notes(&self) -> Vec<String> {
        match self {
            Source::Orbitals { set, .. } => set.statements(),
            Source::Volume { .. } => Vec::new(),
        }
    }

    /// The method that made the orbitals (none for a cube file).
    pub fn method(&self) -> Option<&str> {
        match self {
            Source::Orbitals { set, .. } => Some(&set.method),
            Source::Volume { .. } => None,
        }
    }

    /// How the values were obtained, for captions.
    pub fn provenance(&self) -> String {
        match self {
            Source::Orbitals { set, .. } => {
                format!(
                    "{}; values computed exactly at every sample point",
                    set.method
                )
            }
            Source::Volume { inputs, .. } => format!(
                "values of the cube file {} interpolated trilinearly between its points (no values outside its box)",
                inputs[0].display()
            ),
        }
    }

    pub fn sampler(&self, fields: &[Field]) -> Result<Sampler<'_>> {
        match self {
            Source::Orbitals { set, .. } => Ok(Sampler::Orbitals(FieldSampler::new(set, fields)?)),
            Source::Volume { volume, .. } => {
                let idx = fields
                    .iter()
                    .map(|f| held_index(volume, f))
                    .collect::<Result<Vec<_>>>()?;
                Ok(Sampler::Volume(volume, idx))
            }
        }
    }

    pub fn info(&self, field: &Field) -> Result<FieldInfo> {
        match self {
            Source::Orbitals { set, .. } => orbital_info(set, field),
            Source::Volume { volume, .. } => {
                let k = held_index(volume, field)?;
                let signed = volume.field_values(k).any(|v| v < 0.0);
                // lobecast's own cubes name each field's unit on the comment line.
                let info = &volume.info;
                let (unit, plain_unit) = match crate::io::cube::arith::stored_units(
                    &info.header.comment,
                    info.fields,
                )[k]
                {
                    Some("bohr^-3/2") => ("bohr^{−3/2}", "bohr^-3/2"),
                    Some(_) => ("e bohr^{−3}", "e/bohr^3"),
                    None => ("units of the file", "units of the file"),
                };
                Ok(FieldInfo {
                    heading: format!("stored field {} of the cube file", k + 1),
                    quantity: format!("f_{{{}}}", k + 1),
                    family: "f".into(),
                    short: format!("f_{{{}}}", k + 1),
                    unit: unit.into(),
                    plain: format!("stored field {} ({plain_unit})", k + 1),
                    signed,
                })
            }
        }
    }
}

/// The stored field a `--field` means, which must be among those read.
fn held_index(volume: &Volume, field: &Field) -> Result<usize> {
    let k = stored_index(&volume.info, field)?;
    if !volume.holds(k) {
        return Err(Error::internal(format!(
            "stored field {} was not read from the cube file",
            k + 1
        )));
    }
    Ok(k)
}

/// Which stored field of a cube a `--field` means: `stored:K`, or `orbital:N` where the
/// file's orbital-index line lists N.
fn stored_index(info: &CubeInfo, field: &Field) -> Result<usize> {
    let nf = info.fields;
    let listed = info.header.orbital_numbers.clone().unwrap_or_default();
    match field {
        Field::Stored(k) if *k <= nf => Ok(k - 1),
        Field::Orbital(crate::solve::OrbitalSelector::Number(n)) if listed.contains(n) => {
            Ok(listed.iter().position(|x| x == n).expect("listed"))
        }
        _ => Err(Error::input(format!("the cube file holds {nf} stored field(s); {field} is not among them"))
            .with_hint(format!("use --field stored:K with K from 1 to {nf}, or orbital:N for an orbital listed in the file ({listed:?})"))),
    }
}

fn orbital_info(set: &OrbitalSet, field: &Field) -> Result<FieldInfo> {
    if matches!(field, Field::Stored(_)) {
        return Err(crate::field::stored_needs_cube());
    }
    let n = field.orbital_number(set)?;
    // Extended-Hückel energies are stated in eV, the method's own unit (its
    // parameters are in eV); other methods give hartree with eV beside it.
    let in_ev = is_extended_huckel(set);
    let energy = |n: usize| {
        let e = set.shown()[n - 1].energy;
        if in_ev {
            format!("E = {} eV", minus(format!("{:.2}", hartree_to_ev(e))))
        } else {
            format!(
                "E = {} hartree ({} eV)",
                minus(format!("{e:.4}")),
                minus(format!("{:.2}", hartree_to_ev(e)))
            )
        }
    };
    let short_energy = |n: usize| {
        let e = set.shown()[n - 1].energy;
        if in_ev {
            format!("{} eV", minus(format!("{:.2}", hartree_to_ev(e))))
        } else {
            format!("{} hartree", minus(format!("{e:.4}")))
        }
    };
    // "orbital 8 (one of 2 degenerate)": the drawn member is one choice of its set.
    let which = match n
        .checked_sub(1)
        .and_then(|i| crate::solve::degenerate::set_of(set, i))
    {
        Some(r) => format!("{} {n} (one of {} degenerate)", set.orbital_word(), r.len()),
        None => format!("{} {n}", set.orbital_word()),
    };
    let (heading, quantity, plain) = match field {
        Field::Orbital(_) => (
            format!("{which}, {}", energy(n)),
            format!("ψ_{{{n}}}"),
            format!("orbital {n}"),
        ),
        Field::OrbitalDensity(_) => (
            format!("density of {which}, {}", energy(n)),
            format!("|ψ_{{{n}}}|^{{2}}"),
            format!("orbital density {n}"),
        ),
        Field::OrbitalDeformation(_) => (
            format!("deformation density of {which}, {}", energy(n)),
            format!("Δρ_{{{n}}}"),
            format!("orbital deformation density {n}"),
        ),
        Field::Deformation => (
            if set.spin.free_atoms.is_some() {
                "deformation density (against spherical free atoms in the same basis)".to_string()
            } else {
                "deformation density (valence, against neutral spherical atoms)".to_string()
            },
            "Δρ".to_string(),
            "deformation density".to_string(),
        ),
        Field::SpinDensity => (
            "spin density ρ_{α} − ρ_{β}".to_string(),
            "ρ_{α} − ρ_{β}".to_string(),
            "spin density".to_string(),
        ),
        Field::Density | Field::Stored(_) => (
            "electron density".to_string(),
            "ρ".to_string(),
            "electron density".to_string(),
        ),
    };
    let unit = match field {
        Field::Orbital(_) => "bohr^{−3/2}",
        _ => "e bohr^{−3}",
    };
    let short = match field {
        Field::Density | Field::Deformation | Field::SpinDensity => quantity.clone(),
        _ => format!("{quantity}, E_{{{n}}} = {}", short_energy(n)),
    };
    let family = match field {
        Field::Orbital(_) => "ψ",
        Field::OrbitalDensity(_) => "|ψ|^{2}",
        Field::OrbitalDeformation(_) | Field::Deformation => "Δρ",
        Field::Density | Field::Stored(_) => "ρ",
        Field::SpinDensity => "ρ_{α} − ρ_{β}",
    };
    Ok(FieldInfo {
        heading,
        family: family.to_string(),
        short,
        quantity,
        unit: unit.to_string(),
        plain: format!("{plain} ({})", field.unit()),
        signed: field.is_signed(),
    })
}

/// Whether the orbitals come from extended Hückel, whose energies figures give in eV.
pub fn is_extended_huckel(set: &OrbitalSet) -> bool {
    set.origin == crate::solve::MethodKind::ExtendedHuckel
}

/// Replaces a hyphen-minus with a true minus sign for figures.
pub fn minus(s: String) -> String {
    s.replace('-', "−")
}
