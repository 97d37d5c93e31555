//! One-electron integrals over basis functions. Only matrices come out of here; no
//! function allocates per grid point.

pub mod assemble;
pub mod boys;
pub mod gaussian;
pub mod hermite;
pub mod slater_overlap;
pub mod two_centre;

pub use assemble::{OneElectronMatrices, gaussian_matrices, overlap_matrix, slater_1s_matrices};
pub use slater_overlap::slater_overlap_matrix;
