//! Surface meshes for other 3-D tools, one file per format: glTF 2.0 binary (`.glb`),
//! PLY (`.ply`) and Wavefront OBJ (`.obj`), chosen by the output name's extension.
//!
//! A document is a list of named, coloured parts: the isosurfaces, and (only when
//! asked) the ball-and-stick molecule. Every format keeps lengths in bohr and says so
//! in the file, since none of the three has a unit field of its own that tools honour
//! (glTF assumes metres). Parts without triangles are left out of every format.
//!
//! Everything is checked before a byte is encoded: counts against u32 and the encoded
//! size against 4 GiB (the largest GLB file; the same cap keeps PLY and OBJ output
//! within what a writer should hold in memory), opacities, and finite coordinates.

pub mod gltf;
pub mod obj;
pub mod ply;

use std::path::Path;

use crate::error::{Error, Result};
use crate::surface::Mesh;

/// The largest file any mesh writer produces: 2³² − 1 bytes, the most the GLB
/// header's u32 length field can state (glTF 2.0 specification, "GLB File Format").
pub const MAX_FILE_BYTES: u64 = u32::MAX as u64;

/// The three mesh formats.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum MeshFormat {
    Glb,
    Ply,
    Obj,
}

impl MeshFormat {
    /// The format named by the file's extension, in any letter case.
    pub fn from_path(path: &Path) -> Result<Self> {
        let ext = path
            .extension()
            .and_then(|e| e.to_str())
            .map(str::to_ascii_lowercase);
        match ext.as_deref() {
            Some("glb") => Ok(MeshFormat::Glb),
            Some("ply") => Ok(MeshFormat::Ply),
            Some("obj") => Ok(MeshFormat::Obj),
            _ => Err(Error::input(format!(
                "{}: unknown mesh format; the name must end in .glb, .ply or .obj",
                path.display()
            ))),
        }
    }
}

/// One named mesh with a colour.
#[derive(Debug, Clone)]
pub struct Part<'a> {
    pub name: String,
    pub mesh: &'a Mesh,
    /// sRGB, as the user and the element table give colours.
    pub rgb: [u8; 3],
    /// 1 is opaque; must lie in [0, 1].
    pub opacity: f64,
}

/// What a mesh file holds.
#[derive(Debug, Clone)]
pub struct MeshDocument<'a> {
    pub surfaces: Vec<Part<'a>>,
    /// Ball-and-stick parts; empty unless asked for.
    pub molecule: Vec<Part<'a>>,
    /// One line on what the surfaces show, e.g. "orbital 5 at ±0.05 bohr^-3/2".
    pub description: String,
}

impl MeshDocument<'_> {
    /// Surfaces then molecule, skipping parts with no triangles, each flagged
    /// `true` when it belongs to the molecule.
    pub(crate) fn parts(&self) -> impl Iterator<Item = (&Part<'_>, bool)> {
        let surfaces = self.surfaces.iter().map(|p| (p, false));
        let molecule = self.molecule.iter().map(|p| (p, true));
        surfaces.chain(molecule).filter(|(p, _)| !p.mesh.is_empty())
    }

    /// Vertex and triangle totals over the written parts.
    pub(crate) fn totals(&self) -> (u64, u64) {
        self.parts().fold((0, 0), |(v, t), (p, _)| {
            (
                v + p.mesh.positions.len() as u64,
                t + p.mesh.triangles.len() as u64,
            )
        })
    }
}

/// Encodes `doc` as one file of `format`.
pub fn encode(format: MeshFormat, doc: &MeshDocument) -> Result<Vec<u8>> {
    validate(doc)?;
    match format {
        MeshFormat::Glb => gltf::encode(doc),
        MeshFormat::Ply => ply::encode(doc),
        MeshFormat::Obj => obj::encode(doc),
    }
}

/// The program and version written into every mesh file.
pub fn generator() -> String {
    format!("lobecast {}", env!("CARGO_PKG_VERSION"))
}

/// Refuses an encoded size above `MAX_FILE_BYTES` (an `estimate` in bytes, from
/// checked or u128 arithmetic by the caller) before anything is allocated.
pub(crate) fn check_size(estimate: u128, format: &str) -> Result<()> {
    if estimate > u128::from(MAX_FILE_BYTES) {
        return Err(Error::input(format!(
            "the {format} mesh file would take about {:.1} GiB, more than the 4 GiB a mesh file may hold",
            estimate as f64 / f64::from(1u32 << 30)
        ))
        .with_hint("use a coarser grid or fewer surfaces"));
    }
    Ok(())
}

/// Counts, opacities and coordinates, checked once for all formats.
fn validate(doc: &MeshDocument) -> Result<()> {
    let (vertices, _) = doc.totals();
    if doc.parts().next().is_none() {
        return Err(
            Error::input("there is no surface to write: every part is empty")
                .with_hint("choose an isovalue inside the field's range"),
        );
    }
    if vertices > u64::from(u32::MAX) {
        return Err(Error::input(format!(
            "the mesh has {vertices} vertices, more than a mesh file can index (2^32 - 1)"
        ))
        .with_hint("use a coarser grid"));
    }
    for (part, _) in doc.parts() {
        let m = part.mesh;
        let name = &part.name;
        if !(0.0..=1.0).contains(&part.opacity) {
            return Err(Error::input(format!(
                "{name}: opacity {} is outside 0 to 1",
                part.opacity
            )));
        }
        if m.normals.len() != m.positions.len() {
            return Err(Error::internal(format!(
                "{name}: {} normals for {} vertices",
                m.normals.len(),
                m.positions.len()
            )));
        }
        let n = m.positions.len() as u64;
        if m.triangles.iter().flatten().any(|&i| u64::from(i) >= n) {
            return Err(Error::internal(format!(
                "{name}: a triangle refers to a vertex past the {n} it has"
            )));
        }
        // f32 is what every format stores: a coordinate must stay finite in it.
        let finite = |v: &[f64; 3]| v.iter().all(|&c| (c as f32).is_finite());
        if !m.positions.iter().all(finite) || !m.normals.iter().all(finite) {
            return Err(Error::internal(format!(
                "{name}: a vertex position or normal is not a finite number"
            )));
        }
    }
    Ok(())
}

/// A small document shared by the format tests: two lobes (one see-through), an
/// empty part that every format must skip, and a molecule of one ball and one stick.
#[cfg(test)]
pub(crate) mod sample {
    use super::{MeshDocument, Part};
    use crate::surface::Mesh;
    use crate::surface::shapes::{cylinder, sphere};

    pub fn meshes() -> Vec<Mesh> {
        vec![
            sphere([0.1, -0.2, 1.4], 1.3, 2),
            sphere([0.0, 0.3, -1.5], 0.8, 1),
            Mesh::default(),
            sphere([0.0, 0.0, 0.0], 0.4, 1),
            cylinder([0.0, 0.0, 0.0], [0.0, 0.0, 1.4], 0.15, 12),
        ]
    }

    pub fn document(m: &[Mesh], with_molecule: bool) -> MeshDocument<'_> {
        let part = |name: &str, i: usize, rgb, opacity| Part {
            name: name.into(),
            mesh: &m[i],
            rgb,
            opacity,
        };
        MeshDocument {
            surfaces: vec![
                part("orbital 1 +", 0, [200, 40, 40], 0.6),
                part("orbital 1 -", 1, [40, 80, 220], 1.0),
                part("empty", 2, [0, 0, 0], 1.0),
            ],
            molecule: if with_molecule {
                vec![
                    part("H1", 3, [255, 255, 255], 1.0),
                    part("H1-H2", 4, [128, 128, 128], 1.0),
                ]
            } else {
                vec![]
            },
            description: "orbital 1 at ±0.05 bohr^-3/2".into(),
        }
    }

    /// The meshes every format writes, in file order (the empty one left out).
    pub fn written<'a>(doc: &'a MeshDocument<'a>) -> Vec<&'a Mesh> {
        doc.parts().map(|(p, _)| p.mesh).collect()
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::error::Kind;
    use crate::surface::shapes::sphere;

    #[test]
    fn format_from_extension_in_any_case() {
        assert_eq!(
            MeshFormat::from_path(Path::new("a/s.GLB")).unwrap(),
            MeshFormat::Glb
        );
        assert_eq!(
            MeshFormat::from_path(Path::new("s.Ply")).unwrap(),
            MeshFormat::Ply
        );
        assert_eq!(
            MeshFormat::from_path(Path::new("s.obj")).unwrap(),
            MeshFormat::Obj
        );
        for bad in ["s.stl", "s", "glb"] {
            let e = MeshFormat::from_path(Path::new(bad)).unwrap_err();
            assert_eq!(e.kind, Kind::Input);
            assert!(e.message.contains(".glb, .ply or .obj"), "{}", e.message);
        }
    }

    fn doc_of(mesh: &Mesh, opacity: f64) -> MeshDocument<'_> {
        MeshDocument {
            surfaces: vec![Part {
                name: "lobe".into(),
                mesh,
                rgb: [200, 40, 40],
                opacity,
            }],
            molecule: vec![],
            description: "test".into(),
        }
    }

    #[test]
    fn bad_parts_are_refused_before_encoding() {
        let mut m = sphere([0.0; 3], 1.0, 1);
        for format in [MeshFormat::Glb, MeshFormat::Ply, MeshFormat::Obj] {
            assert_eq!(
                encode(format, &doc_of(&m, 1.5)).unwrap_err().kind,
                Kind::Input
            );
            assert_eq!(
                encode(format, &doc_of(&m, f64::NAN)).unwrap_err().kind,
                Kind::Input
            );
        }
        m.positions[3][1] = f64::NAN;
        assert_eq!(
            encode(MeshFormat::Ply, &doc_of(&m, 1.0)).unwrap_err().kind,
            Kind::Internal
        );
        m.positions[3][1] = 1e39; // finite in f64, infinite in f32
        assert_eq!(
            encode(MeshFormat::Obj, &doc_of(&m, 1.0)).unwrap_err().kind,
            Kind::Internal
        );
        m.positions[3][1] = 0.0;
        m.triangles[0][2] = 10_000;
        assert_eq!(
            encode(MeshFormat::Glb, &doc_of(&m, 1.0)).unwrap_err().kind,
            Kind::Internal
        );
    }

    /// Writes the sample document in every format for the interop script:
    /// `MESH_SAMPLE_DIR=DIR cargo test --release --lib io::mesh -- --ignored`, then
    /// `python .ci/interop/check_mesh_files.py --files DIR/s.glb DIR/s.ply DIR/s.obj`.
    #[test]
    #[ignore = "writes files for .ci/interop/check_mesh_files.py"]
    fn write_sample_files() {
        let dir =
            std::path::PathBuf::from(std::env::var("MESH_SAMPLE_DIR").expect("MESH_SAMPLE_DIR"));
        let m = sample::meshes();
        for (stem, with_molecule) in [("s", false), ("m", true)] {
            let doc = sample::document(&m, with_molecule);
            for (ext, format) in [
                ("glb", MeshFormat::Glb),
                ("ply", MeshFormat::Ply),
                ("obj", MeshFormat::Obj),
            ] {
                let path = dir.join(format!("{stem}.{ext}"));
                std::fs::write(&path, encode(format, &doc).unwrap()).unwrap();
                eprintln!("wrote {}", path.display());
            }
        }
    }

    #[test]
    fn empty_documents_are_refused() {
        let empty = Mesh::default();
        let e = encode(MeshFormat::Glb, &doc_of(&empty, 1.0)).unwrap_err();
        assert_eq!(e.kind, Kind::Input);
    }

    #[test]
    fn size_cap_is_four_gibibytes() {
        assert!(check_size(u128::from(MAX_FILE_BYTES), "PLY").is_ok());
        let e = check_size(u128::from(MAX_FILE_BYTES) + 1, "PLY").unwrap_err();
        assert_eq!(e.kind, Kind::Input);
        assert!(e.message.contains("4 GiB"));
        // Each format's estimate crosses the cap where its record sizes say (27-byte
        // PLY vertices, 12 bytes of glTF indices per triangle; counted by hand).
        let v = (MAX_FILE_BYTES / 27) + 1;
        assert!(check_size(ply::body_bytes(v, 0), "PLY").is_err());
        assert!(check_size(ply::body_bytes(v - 1, 0), "PLY").is_ok());
        assert!(check_size(gltf::buffer_bytes(0, (MAX_FILE_BYTES / 12) + 1), "glTF").is_err());
        assert!(check_size(obj::body_bytes_bound(u64::from(u32::MAX), 0), "OBJ").is_err());
        assert!(check_size(gltf::buffer_bytes(u64::MAX, u64::MAX), "glTF").is_err());
    }
}
