//! Turning a molecule and a basis into orbitals: the generalised eigenproblem, the
//! one-electron solver, extended Hückel, occupations, degenerate sets, orbital
//! selection and energy curves. `solve` takes a molecule and a `Method`.

pub mod curve;
pub mod degenerate;
pub mod eigen;
pub mod estimate;
pub mod fragments;
pub mod huckel;
pub mod huckel_params;
mod method;
pub mod one_electron;
pub mod orbitals;
pub mod scf;

pub use method::{Method, MethodKind, orbitals_for, orbitals_reporting, orbitals_within};
pub use orbitals::{Caveat, Orbital, OrbitalSelector, OrbitalSet};
