//! One- and two-electron integrals over basis functions: matrices, and the
//! electron-repulsion stores that J and K are built from. Nothing allocates per
//! grid point or per integral.

pub mod assemble;
pub mod boys;
pub mod dipole;
pub mod gaussian;
pub mod hermite;
pub mod slater_overlap;
pub mod two_centre;
pub mod two_electron;

pub use assemble::{OneElectronMatrices, gaussian_matrices, overlap_matrix, slater_1s_matrices};
pub use dipole::dipole_matrices;
pub use slater_overlap::slater_overlap_matrix;
