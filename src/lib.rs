//! lobecast: LCAO molecular orbitals turned into cube volumes, figures and the
//! integrals and energies behind them. Lengths are in bohr and energies in hartree
//! everywhere inside the library; conversions happen only at the edges.
//!
//! The data flow is model → `Molecule` + `Basis` → `OrbitalSet` → `Field` → sampled
//! on a grid → sinks (cube files, tables). Each stage is a plain function on plain data.

pub mod basis;
pub mod budget;
pub mod chem;
pub mod error;
pub mod field;
pub mod grid;
pub mod integrals;
pub mod io;
pub mod numerics;
pub mod output;
pub mod plot;
pub mod render;
pub mod solve;
pub mod source;
pub mod surface;

pub use error::{Error, Result};
