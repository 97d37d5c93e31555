//! PLY files (the Stanford polygon file format, Turk 1994), binary little-endian:
//!
//! ```text
//! ply
//! format binary_little_endian 1.0
//! comment generator: lobecast VERSION
//! comment length unit: bohr
//! comment description: …
//! comment part NAME: vertices FIRST-LAST, faces FIRST-LAST   (one per part)
//! element vertex V
//! property float x | y | z | nx | ny | nz
//! property uchar red | green | blue
//! element face F
//! property list uchar int vertex_indices
//! end_header
//! ```
//! then V records of 27 bytes (six f32, three u8) and F records of 13 bytes (the
//! count 3 as u8, three i32). PLY has no parts: every part is concatenated into one
//! vertex and one face list, its sRGB colour on each of its vertices, and the
//! `comment part` lines say which ranges belong to which part (0-based, inclusive).

use std::fmt::Write as _;

use super::{MeshDocument, check_size, generator};
use crate::error::Result;

/// Bytes of one vertex record and one face record.
const VERTEX_BYTES: u128 = 27;
const FACE_BYTES: u128 = 13;

/// The size of the body after the header, in u128 so no count can overflow.
pub fn body_bytes(vertices: u64, triangles: u64) -> u128 {
    VERTEX_BYTES * u128::from(vertices) + FACE_BYTES * u128::from(triangles)
}

/// Encodes a checked document (see `super::encode`).
pub(super) fn encode(doc: &MeshDocument) -> Result<Vec<u8>> {
    let (vertices, triangles) = doc.totals();
    let header = header(doc, vertices, triangles);
    let total = header.len() as u128 + body_bytes(vertices, triangles);
    // 4 GiB also keeps every index below 2^31, as the `int` indices need.
    check_size(total, "PLY")?;
    let mut out = Vec::new();
    crate::budget::reserve(&mut out, total as usize, "the PLY file")?;
    out.extend_from_slice(header.as_bytes());
    for (part, _) in doc.parts() {
        let m = part.mesh;
        for (p, n) in m.positions.iter().zip(&m.normals) {
            for c in p.iter().chain(n) {
                out.extend_from_slice(&(*c as f32).to_le_bytes());
            }
            out.extend_from_slice(&part.rgb);
        }
    }
    let mut offset = 0u32;
    for (part, _) in doc.parts() {
        for t in &part.mesh.triangles {
            out.push(3);
            for i in t {
                // Below 2^31: the whole file is under 4 GiB at 27 bytes a vertex.
                out.extend_from_slice(&((offset + i) as i32).to_le_bytes());
            }
        }
        offset += part.mesh.positions.len() as u32;
    }
    Ok(out)
}

fn header(doc: &MeshDocument, vertices: u64, triangles: u64) -> String {
    let mut h = String::from("ply\nformat binary_little_endian 1.0\n");
    let _ = writeln!(h, "comment generator: {}", generator());
    h.push_str("comment length unit: bohr\n");
    let _ = writeln!(h, "comment description: {}", one_line(&doc.description));
    let (mut v, mut f) = (0u64, 0u64);
    for (part, in_molecule) in doc.parts() {
        let (nv, nf) = (
            part.mesh.positions.len() as u64,
            part.mesh.triangles.len() as u64,
        );
        let role = if in_molecule { "molecule part" } else { "part" };
        let _ = writeln!(
            h,
            "comment {role} {}: vertices {}-{}, faces {}-{}",
            one_line(&part.name),
            v,
            v + nv - 1,
            f,
            f + nf - 1
        );
        (v, f) = (v + nv, f + nf);
    }
    let _ = writeln!(h, "element vertex {vertices}");
    for name in ["x", "y", "z", "nx", "ny", "nz"] {
        let _ = writeln!(h, "property float {name}");
    }
    for name in ["red", "green", "blue"] {
        let _ = writeln!(h, "property uchar {name}");
    }
    let _ = writeln!(h, "element face {triangles}");
    h.push_str("property list uchar int vertex_indices\nend_header\n");
    h
}

/// The header is ASCII lines (Turk 1994): control characters become spaces and
/// anything beyond ASCII becomes '?'.
fn one_line(text: &str) -> String {
    text.chars()
        .map(|c| match c {
            c if c.is_ascii_control() || c.is_control() => ' ',
            c if !c.is_ascii() => '?',
            c => c,
        })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::super::{MeshFormat, encode as encode_doc, sample};

    #[test]
    fn ply_header_and_body_read_back_exactly() {
        let meshes = sample::meshes();
        let doc = sample::document(&meshes, true);
        let bytes = encode_doc(MeshFormat::Ply, &doc).unwrap();
        let end = b"end_header\n";
        let split = bytes.windows(end.len()).position(|w| w == end).unwrap() + end.len();
        let header = std::str::from_utf8(&bytes[..split]).unwrap();
        assert!(header.is_ascii());
        let lines: Vec<&str> = header.lines().collect();
        assert_eq!(&lines[..2], ["ply", "format binary_little_endian 1.0"]);
        assert!(lines.contains(&"comment length unit: bohr"));
        assert!(lines.contains(&"comment description: orbital 1 at ?0.05 bohr^-3/2"));
        assert!(lines.contains(&"comment molecule part H1-H2: vertices 246-295, faces 480-527"));
        let count = |element: &str| -> usize {
            let prefix = format!("element {element} ");
            lines
                .iter()
                .find_map(|l| l.strip_prefix(&prefix))
                .unwrap()
                .parse()
                .unwrap()
        };
        let written = sample::written(&doc);
        let nv: usize = written.iter().map(|m| m.positions.len()).sum();
        let nf: usize = written.iter().map(|m| m.triangles.len()).sum();
        assert_eq!((count("vertex"), count("face")), (nv, nf));
        let props: Vec<&str> = lines
            .iter()
            .filter_map(|l| l.strip_prefix("property "))
            .collect();
        assert_eq!(props.len(), 10);
        assert_eq!(props[9], "list uchar int vertex_indices");

        let body = &bytes[split..];
        assert_eq!(body.len(), 27 * nv + 13 * nf);
        let f32_at = |at: usize| f32::from_le_bytes(body[at..at + 4].try_into().unwrap());
        let colours = [
            [200, 40, 40],
            [40, 80, 220],
            [255, 255, 255],
            [128, 128, 128],
        ];
        let (mut v, mut f, mut offset) = (0, 27 * nv, 0u32);
        for (m, rgb) in written.iter().zip(colours) {
            for (p, n) in m.positions.iter().zip(&m.normals) {
                let rec: Vec<f32> = (0..6).map(|k| f32_at(v + 4 * k)).collect();
                let want: Vec<f32> = p.iter().chain(n).map(|&c| c as f32).collect();
                assert_eq!(rec, want);
                assert_eq!(body[v + 24..v + 27], rgb);
                v += 27;
            }
            for t in &m.triangles {
                assert_eq!(body[f], 3);
                let got: Vec<i32> = (0..3)
                    .map(|k| {
                        i32::from_le_bytes(body[f + 1 + 4 * k..f + 5 + 4 * k].try_into().unwrap())
                    })
                    .collect();
                assert_eq!(got, t.map(|i| (offset + i) as i32));
                f += 13;
            }
            offset += m.positions.len() as u32;
        }
    }
}
