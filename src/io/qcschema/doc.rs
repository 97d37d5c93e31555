//! The parts of a QCSchema result document lobecast reads, as serde types. Fields
//! lobecast has no use for are skipped unread (the schema has many); the ones read
//! are typed, so a wrong type is reported with its JSON path (serde_path_to_error).
//! Numbers of a basis set may be JSON strings, as the schema allows.

use std::collections::BTreeMap;

use serde::Deserialize;
use serde::de::{self, Deserializer, SeqAccess, Visitor};

/// The top level of `qcschema_output` (version 1) and `qcschema_atomic_result`
/// (version 2): both carry `molecule`, `properties`, `wavefunction`.
#[derive(Debug, Deserialize)]
pub struct Document {
    pub schema_name: String,
    #[serde(default)]
    pub success: Option<bool>,
    pub molecule: Option<MoleculeDoc>,
    #[serde(default)]
    pub model: Option<ModelDoc>,
    #[serde(default)]
    pub input_data: Option<InputData>,
    #[serde(default)]
    pub properties: Option<Properties>,
    #[serde(default)]
    pub wavefunction: Option<Wavefunction>,
    #[serde(default)]
    pub provenance: Option<Provenance>,
    #[serde(default)]
    pub extras: Option<Extras>,
}

/// `extras.lobecast.notes`: the cautions lobecast wrote with its own orbitals.
#[derive(Debug, Deserialize)]
pub struct Extras {
    #[serde(default)]
    pub lobecast: Option<OwnExtras>,
}

#[derive(Debug, Deserialize)]
pub struct OwnExtras {
    #[serde(default)]
    pub notes: Vec<String>,
}

/// Version 2 keeps the model under `input_data.specification`.
#[derive(Debug, Deserialize)]
pub struct InputData {
    #[serde(default)]
    pub specification: Option<Specification>,
}

#[derive(Debug, Deserialize)]
pub struct Specification {
    #[serde(default)]
    pub model: Option<ModelDoc>,
}

#[derive(Debug, Deserialize)]
pub struct ModelDoc {
    #[serde(default)]
    pub method: Option<String>,
    /// A name, or (version 1) a whole basis object: only a name is shown.
    #[serde(default)]
    pub basis: Option<serde_json::Value>,
}

#[derive(Debug, Deserialize)]
pub struct Provenance {
    #[serde(default)]
    pub creator: Option<String>,
    #[serde(default)]
    pub version: Option<String>,
}

/// The molecule: geometry in bohr, flat (3 per atom) or one row per atom.
#[derive(Debug, Deserialize)]
pub struct MoleculeDoc {
    pub symbols: Vec<String>,
    pub geometry: Matrix,
    #[serde(default)]
    pub molecular_charge: Option<f64>,
    #[serde(default)]
    pub molecular_multiplicity: Option<f64>,
    #[serde(default)]
    pub real: Option<Vec<bool>>,
    #[serde(default)]
    pub atomic_numbers: Option<Vec<u64>>,
}

#[derive(Debug, Default, Deserialize)]
pub struct Properties {
    #[serde(default)]
    pub calcinfo_nalpha: Option<u64>,
    #[serde(default)]
    pub calcinfo_nbeta: Option<u64>,
    #[serde(default)]
    pub scf_total_energy: Option<f64>,
}

#[derive(Debug, Deserialize)]
pub struct Wavefunction {
    pub basis: BasisSetDoc,
    pub restricted: bool,
    #[serde(default)]
    pub scf_orbitals_a: Option<Matrix>,
    #[serde(default)]
    pub scf_orbitals_b: Option<Matrix>,
    #[serde(default)]
    pub scf_eigenvalues_a: Option<Vec<f64>>,
    #[serde(default)]
    pub scf_eigenvalues_b: Option<Vec<f64>>,
    #[serde(default)]
    pub scf_occupations_a: Option<Vec<f64>>,
    #[serde(default)]
    pub scf_occupations_b: Option<Vec<f64>>,
    /// The "return results": names of the fields above that hold the primary result.
    #[serde(default)]
    pub orbitals_a: Option<String>,
    #[serde(default)]
    pub orbitals_b: Option<String>,
    #[serde(default)]
    pub eigenvalues_a: Option<String>,
    #[serde(default)]
    pub eigenvalues_b: Option<String>,
    #[serde(default)]
    pub occupations_a: Option<String>,
    #[serde(default)]
    pub occupations_b: Option<String>,
}

#[derive(Debug, Deserialize)]
pub struct BasisSetDoc {
    #[serde(default)]
    pub name: Option<String>,
    pub center_data: BTreeMap<String, CenterDoc>,
    pub atom_map: Vec<String>,
    #[serde(default)]
    pub nbf: Option<u64>,
}

#[derive(Debug, Deserialize)]
pub struct CenterDoc {
    pub electron_shells: Vec<ShellDoc>,
    #[serde(default)]
    pub ecp_electrons: Option<i64>,
    #[serde(default)]
    pub ecp_potentials: Option<Vec<de::IgnoredAny>>,
}

#[derive(Debug, Deserialize)]
pub struct ShellDoc {
    pub angular_momentum: Vec<u64>,
    pub harmonic_type: String,
    pub exponents: Vec<Real>,
    pub coefficients: Vec<Vec<Real>>,
}

/// A number written as a JSON number or as a string holding one (the schema allows
/// both for exponents and coefficients).
#[derive(Debug, Clone, Copy)]
pub struct Real(pub f64);

impl<'de> Deserialize<'de> for Real {
    fn deserialize<D: Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        struct V;
        impl Visitor<'_> for V {
            type Value = Real;
            fn expecting(&self, f: &mut std::fmt::Formatter) -> std::fmt::Result {
                f.write_str("a number, or a string holding one")
            }
            fn visit_f64<E: de::Error>(self, v: f64) -> Result<Real, E> {
                Ok(Real(v))
            }
            fn visit_i64<E: de::Error>(self, v: i64) -> Result<Real, E> {
                Ok(Real(v as f64))
            }
            fn visit_u64<E: de::Error>(self, v: u64) -> Result<Real, E> {
                Ok(Real(v as f64))
            }
            fn visit_str<E: de::Error>(self, v: &str) -> Result<Real, E> {
                v.trim()
                    .replace(['D', 'd'], "e")
                    .parse()
                    .map(Real)
                    .map_err(|_| E::custom(format!("{v:?} is not a number")))
            }
        }
        d.deserialize_any(V)
    }
}

/// A matrix as the schema's producers write it: flat, row-major (qcelemental
/// reshapes to (rows, −1)), or one array per row.
#[derive(Debug)]
pub enum Matrix {
    Flat(Vec<f64>),
    Rows(Vec<Vec<f64>>),
}

impl<'de> Deserialize<'de> for Matrix {
    fn deserialize<D: Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        /// One element: a number (flat form) or an array of numbers (a row).
        enum Item {
            Num(f64),
            Row(Vec<f64>),
        }
        impl<'de> Deserialize<'de> for Item {
            fn deserialize<D: Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
                struct V;
                impl<'de> Visitor<'de> for V {
                    type Value = Item;
                    fn expecting(&self, f: &mut std::fmt::Formatter) -> std::fmt::Result {
                        f.write_str("a number or an array of numbers")
                    }
                    fn visit_f64<E: de::Error>(self, v: f64) -> Result<Item, E> {
                        Ok(Item::Num(v))
                    }
                    fn visit_i64<E: de::Error>(self, v: i64) -> Result<Item, E> {
                        Ok(Item::Num(v as f64))
                    }
                    fn visit_u64<E: de::Error>(self, v: u64) -> Result<Item, E> {
                        Ok(Item::Num(v as f64))
                    }
                    fn visit_seq<A: SeqAccess<'de>>(self, mut seq: A) -> Result<Item, A::Error> {
                        let mut row = Vec::new();
                        while let Some(x) = seq.next_element::<f64>()? {
                            row.push(x);
                        }
                        Ok(Item::Row(row))
                    }
                }
                d.deserialize_any(V)
            }
        }
        let items: Vec<Item> = Vec::deserialize(d)?;
        let rows = items.iter().filter(|i| matches!(i, Item::Row(_))).count();
        if rows == 0 {
            Ok(Matrix::Flat(
                items
                    .into_iter()
                    .map(|i| match i {
                        Item::Num(x) => x,
                        Item::Row(_) => unreachable!("no rows"),
                    })
                    .collect(),
            ))
        } else if rows == items.len() {
            Ok(Matrix::Rows(
                items
                    .into_iter()
                    .map(|i| match i {
                        Item::Row(r) => r,
                        Item::Num(_) => unreachable!("all rows"),
                    })
                    .collect(),
            ))
        } else {
            Err(de::Error::custom(
                "mixes numbers and arrays: give a flat array or one array per row",
            ))
        }
    }
}

impl Matrix {
    /// The values row-major with `cols` per row, or what is wrong with the shape;
    /// `row` says what a row stands for ("atom", "basis function").
    pub fn row_major(
        self,
        rows: usize,
        row: &str,
    ) -> std::result::Result<(Vec<f64>, usize), String> {
        match self {
            Matrix::Flat(v) => {
                if rows == 0 || v.is_empty() || v.len() % rows != 0 {
                    return Err(format!(
                        "has {} numbers, not a multiple of {rows} (one row per {row})",
                        v.len()
                    ));
                }
                let cols = v.len() / rows;
                Ok((v, cols))
            }
            Matrix::Rows(r) => {
                if r.len() != rows {
                    return Err(format!(
                        "has {} row(s), expected {rows} (one per {row})",
                        r.len()
                    ));
                }
                let cols = r.first().map_or(0, Vec::len);
                if cols == 0 {
                    return Err("has empty rows".into());
                }
                if let Some(i) = r.iter().position(|x| x.len() != cols) {
                    return Err(format!(
                        "row {i} has {} numbers, row 0 has {cols}",
                        r[i].len()
                    ));
                }
                Ok((r.into_iter().flatten().collect(), cols))
            }
        }
    }
}
