//! Surface meshes for other 3-D tools, one file per format: glTF 2.0 binary (`.glb`),
//! PLY (`.ply`) and Wavefront OBJ (`.obj`), chosen by the output name's extension.

pub mod gltf;
pub mod obj;
pub mod ply;
