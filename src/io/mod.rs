//! File formats, one file each, each opening with its layout and its specification:
//! model files (TOML), XYZ, the orbital file (JSON), QCSchema results (JSON), cube files, surface meshes (glTF, PLY, OBJ), PNG.
//! Reading gives
//! plain data to the rooms below; nothing here solves or evaluates.

pub mod cube;
pub mod mesh;
pub mod model;
pub mod orbitals;
pub mod png;
pub mod qcschema;
pub mod xyz;
