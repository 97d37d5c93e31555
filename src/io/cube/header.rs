//! The header of a cube file of fields sampled from orbitals: title, the comment
//! line that names each field with its unit and the method, atoms, grid and (for
//! several fields) the orbital-index line. Built here once, so every writer of such
//! cubes states the same things in the same words.

use super::writer::{CubeAtom, CubeHeader};
use crate::error::Result;
use crate::field::Field;
use crate::grid::GridBox;
use crate::solve::OrbitalSet;

/// The header for `fields` of `set` sampled on `grid`; `source` names the input
/// file in the title.
pub fn header_for(
    set: &OrbitalSet,
    fields: &[Field],
    grid: GridBox,
    source: &str,
) -> Result<CubeHeader> {
    let descriptions = fields
        .iter()
        .map(|f| f.describe(set))
        .collect::<Result<Vec<_>>>()?;
    Ok(CubeHeader {
        title: format!(
            "lobecast volume: {} from {source}",
            set.molecule.formula_with_charge()
        ),
        comment: format!(
            "{}; {}; lobecast {}",
            descriptions.join("; "),
            set.method,
            env!("CARGO_PKG_VERSION")
        ),
        atoms: set
            .molecule
            .atoms
            .iter()
            .map(|a| CubeAtom {
                atomic_number: a.element.atomic_number,
                charge: a.charge(),
                position: a.position,
            })
            .collect(),
        grid,
        orbital_numbers: if fields.len() > 1 {
            Some(
                fields
                    .iter()
                    .map(|f| f.orbital_number(set))
                    .collect::<Result<Vec<_>>>()?,
            )
        } else {
            None
        },
    })
}
