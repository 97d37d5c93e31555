//! The cube volumetric format (the de-facto standard layout: two comment lines, atom
//! count and origin, three axis lines, atoms, optional orbital-index line, values).

pub mod arith;
pub mod format;
mod header;
pub mod number;
pub mod reader;
pub mod sink;
pub mod stats;
pub mod volume;
pub mod writer;

pub use header::header_for;
pub use reader::{CubeInfo, CubeReader};
pub use volume::Volume;
pub use writer::{CubeAtom, CubeHeader, write_streaming};
