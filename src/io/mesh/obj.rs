//! Wavefront OBJ files (the text geometry format of the Advanced Visualizer; no
//! materials file, so colours stay in the glTF and PLY files):
//!
//! ```text
//! # generator: lobecast VERSION
//! # length unit: bohr
//! # description: …
//! o NAME                       (one block per part)
//! v x y z                      (its vertices)
//! vn nx ny nz                  (their normals, in the same order)
//! f a//a b//b c//c             (its triangles; 1-based indices over the whole file)
//! ```
//! Numbers are f32 written shortest so that they read back to the same f32: plain
//! decimals for 10⁻⁴ ≤ |x| < 10⁷, exponent form otherwise, never more than 16
//! characters. Molecule parts are named "molecule/…".

use std::io::Write as _;

use super::{MeshDocument, check_size, generator};
use crate::error::Result;

/// Longest number `number` writes (sign, nine digits, point, exponent).
const NUMBER_CHARS: u128 = 16;

/// An upper bound of the body's size, in u128 so no count can overflow: a `v` or
/// `vn` line is at most 3 + 3·16 + 3 characters, an `f` line 2 + 3·22 + 3.
pub fn body_bytes_bound(vertices: u64, triangles: u64) -> u128 {
    let vertex_line = 3 + 3 * NUMBER_CHARS + 3;
    let face_line = 2 + 3 * (10 + 2 + 10) + 3;
    2 * vertex_line * u128::from(vertices) + face_line * u128::from(triangles)
}

/// Encodes a checked document (see `super::encode`).
pub(super) fn encode(doc: &MeshDocument) -> Result<Vec<u8>> {
    let (vertices, triangles) = doc.totals();
    let head = format!(
        "# generator: {}\n# length unit: bohr\n# description: {}\n",
        generator(),
        one_line(&doc.description)
    );
    let names: u128 = doc.parts().map(|(p, _)| p.name.len() as u128 + 20).sum();
    let bound = head.len() as u128 + names + body_bytes_bound(vertices, triangles);
    check_size(bound, "OBJ")?;
    let mut text: Vec<u8> = Vec::new();
    crate::budget::reserve(&mut text, bound as usize, "the OBJ file")?;
    text.extend_from_slice(head.as_bytes());

    // Writing into memory cannot fail, so the writes' results are not checked.
    let mut offset = 1u64; // OBJ counts from 1
    for (part, in_molecule) in doc.parts() {
        let prefix = if in_molecule { "molecule/" } else { "" };
        let _ = writeln!(text, "o {prefix}{}", one_line(&part.name));
        let m = part.mesh;
        for (tag, list) in [("v", &m.positions), ("vn", &m.normals)] {
            for p in list {
                let _ = writeln!(
                    text,
                    "{tag} {} {} {}",
                    number(p[0]),
                    number(p[1]),
                    number(p[2])
                );
            }
        }
        for t in &m.triangles {
            let [a, b, c] = t.map(|i| offset + u64::from(i));
            let _ = writeln!(text, "f {a}//{a} {b}//{b} {c}//{c}");
        }
        offset += m.positions.len() as u64;
    }
    Ok(text)
}

/// `x` as f32, written shortest so that it parses back to the same f32.
pub fn number(x: f64) -> String {
    let v = x as f32;
    let a = v.abs();
    if a == 0.0 || (1e-4..1e7).contains(&a) {
        format!("{v}")
    } else {
        format!("{v:e}")
    }
}

/// A name or comment stays on its line: control characters become spaces.
fn one_line(text: &str) -> String {
    text.chars()
        .map(|c| if c.is_control() { ' ' } else { c })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::super::{MeshFormat, encode as encode_doc, sample};
    use super::*;

    #[test]
    fn obj_lines_read_back_exactly() {
        let meshes = sample::meshes();
        let doc = sample::document(&meshes, true);
        let bytes = encode_doc(MeshFormat::Obj, &doc).unwrap();
        let text = String::from_utf8(bytes).unwrap();
        assert!(text.lines().any(|l| l == "# length unit: bohr"));
        let objects: Vec<&str> = text.lines().filter_map(|l| l.strip_prefix("o ")).collect();
        assert_eq!(
            objects,
            [
                "orbital 1 +",
                "orbital 1 -",
                "molecule/H1",
                "molecule/H1-H2"
            ]
        );
        let floats = |tag: &str| -> Vec<f32> {
            let prefix = format!("{tag} ");
            text.lines()
                .filter_map(|l| l.strip_prefix(&prefix))
                .flat_map(|l| l.split(' ').map(|x| x.parse::<f32>().unwrap()))
                .collect()
        };
        let written = sample::written(&doc);
        let want = |pick: fn(&crate::surface::Mesh) -> &Vec<[f64; 3]>| -> Vec<f32> {
            written
                .iter()
                .flat_map(|m| pick(m).iter().flatten().map(|&c| c as f32))
                .collect()
        };
        assert_eq!(floats("v"), want(|m| &m.positions));
        assert_eq!(floats("vn"), want(|m| &m.normals));
        let faces: Vec<u64> = text
            .lines()
            .filter_map(|l| l.strip_prefix("f "))
            .flat_map(|l| {
                l.split(' ').map(|c| {
                    let (a, b) = c.split_once("//").unwrap();
                    assert_eq!(a, b);
                    a.parse::<u64>().unwrap()
                })
            })
            .collect();
        let mut expected = Vec::new();
        let mut offset = 1;
        for m in &written {
            expected.extend(m.triangles.iter().flatten().map(|&i| offset + u64::from(i)));
            offset += m.positions.len() as u64;
        }
        assert_eq!(faces, expected);
    }

    #[test]
    fn numbers_round_trip_within_sixteen_characters() {
        let mut x = -3.0e38f64;
        let values = std::iter::from_fn(|| {
            x = x * -0.37 + 1e-46;
            Some(x)
        });
        for v in values
            .take(400)
            .chain([0.0, -0.0, 1e-4, 9_999_999.0, 1.0 / 3.0, 1e-45])
        {
            let s = number(v);
            assert!(s.len() as u128 <= NUMBER_CHARS, "{s}");
            assert_eq!(s.parse::<f32>().unwrap(), v as f32, "{s}");
        }
    }
}
