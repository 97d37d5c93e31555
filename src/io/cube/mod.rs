//! The cube volumetric format. It has no formal specification; the de-facto standard
//! layout, which every reader we know of accepts, is: two comment lines; the atom
//! count (negative when an orbital-index line follows the atoms) and the origin; three
//! axis lines (point count, negative for ångström, and step vector); one line per
//! atom (Z, charge, x y z); the optional orbital-index line; then the values, x
//! slowest and z fastest, six `%13.5E` numbers to a line. What we accept beyond that
//! and what we write exactly is in `reader.rs`, `writer.rs` and the README.

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
