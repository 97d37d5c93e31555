//! File formats, one file each, each opening with its layout and its specification:
//! model files (TOML), XYZ, the orbital file (JSON), cube files, surface meshes (glTF, PLY, OBJ), PNG,
//! base64 for rasters inside SVG figures. Reading gives
//! plain data to the rooms below; nothing here solves or evaluates.

pub mod base64;
pub mod cube;
pub mod mesh;
pub mod model;
pub mod orbitals;
pub mod png;
pub mod xyz;
