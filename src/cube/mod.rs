//! The cube volumetric format (the de-facto standard layout: two comment lines, atom
//! count and origin, three axis lines, atoms, optional orbital-index line, values).

pub mod format;
pub mod writer;

pub use writer::{CubeAtom, CubeHeader, write_streaming};
