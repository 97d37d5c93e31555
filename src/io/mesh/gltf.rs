//! glTF 2.0 binary files (`.glb`), after the Khronos glTF 2.0 specification
//! (sections 3.6 "Binary data storage" … 3.9 "Materials" and 4.4 "GLB file format"):
//!
//! ```text
//! header   u32 magic 0x46546C67 ("glTF") | u32 version 2 | u32 total length
//! chunk 0  u32 length | u32 type 0x4E4F534A ("JSON") | JSON, padded with spaces to 4 bytes
//! chunk 1  u32 length | u32 type 0x004E4942 ("BIN\0") | buffer 0, padded with zeros
//! ```
//! all little-endian. Per part, in the order written, the buffer holds its positions
//! (3 × f32 per vertex), unit normals (3 × f32) and triangle indices (u32), each in a
//! bufferView of its own with its target (34962 ARRAY_BUFFER, 34963
//! ELEMENT_ARRAY_BUFFER) and one accessor; POSITION carries min and max as the
//! specification requires. Each part is a mesh with one triangle primitive, a node
//! of the part's name, and a material: `baseColorFactor` in linear RGB (the sRGB
//! colour through the IEC 61966-2-1 transfer function), metallic 0, roughness 0.5,
//! `alphaMode` BLEND when the part is see-through. Surface nodes sit at the scene's
//! root, molecule nodes under one parent node "molecule".
//!
//! glTF assumes metres; these files are in bohr, recorded in `asset.extras`
//! (`length_unit`, `description`) next to `asset.generator`.

use serde_json::{Value, json};

use super::{MeshDocument, Part, check_size, generator};
use crate::error::{Error, Result};

const MAGIC: u32 = 0x4654_6C67;
const JSON_CHUNK: u32 = 0x4E4F_534A;
const BIN_CHUNK: u32 = 0x004E_4942;
const ARRAY_BUFFER: u32 = 34962;
const ELEMENT_ARRAY_BUFFER: u32 = 34963;
const FLOAT: u32 = 5126;
const UNSIGNED_INT: u32 = 5125;
const TRIANGLES: u32 = 4;
/// Header (12 bytes) and two chunk headers (8 bytes each).
const FRAMING: u64 = 28;

/// Bytes of buffer a mesh takes: positions and normals (24 bytes per vertex) and
/// indices (12 bytes per triangle), in u128 so no count can overflow.
pub fn buffer_bytes(vertices: u64, triangles: u64) -> u128 {
    24 * u128::from(vertices) + 12 * u128::from(triangles)
}

/// Encodes a checked document (see `super::encode`).
pub(super) fn encode(doc: &MeshDocument) -> Result<Vec<u8>> {
    let (vertices, triangles) = doc.totals();
    let bin_len = buffer_bytes(vertices, triangles);
    check_size(bin_len + u128::from(FRAMING), "glTF")?;
    let bin_len = bin_len as usize; // ≤ 4 GiB, checked above

    let mut json = Json::default();
    let mut bin = Vec::new();
    crate::budget::reserve(&mut bin, bin_len, "the glTF buffer")?;
    let mut molecule_nodes = Vec::new();
    for (part, in_molecule) in doc.parts() {
        let node = json.add_part(part, &mut bin)?;
        if in_molecule {
            molecule_nodes.push(node);
        } else {
            json.roots.push(node);
        }
    }
    if !molecule_nodes.is_empty() {
        json.nodes
            .push(json!({"name": "molecule", "children": molecule_nodes}));
        json.roots.push(json.nodes.len() - 1);
    }
    let text = json.finish(doc, bin.len());
    let mut text = serde_json::to_vec(&text)
        .map_err(|e| Error::internal(format!("glTF JSON encoding failed: {e}")))?;
    text.resize(text.len().next_multiple_of(4), b' ');
    bin.resize(bin.len().next_multiple_of(4), 0);

    let total = FRAMING + text.len() as u64 + bin.len() as u64;
    check_size(u128::from(total), "glTF")?;
    let mut out = Vec::with_capacity(total as usize);
    for word in [MAGIC, 2, total as u32, text.len() as u32, JSON_CHUNK] {
        out.extend_from_slice(&word.to_le_bytes());
    }
    out.extend_from_slice(&text);
    for word in [bin.len() as u32, BIN_CHUNK] {
        out.extend_from_slice(&word.to_le_bytes());
    }
    out.extend_from_slice(&bin);
    Ok(out)
}

/// The JSON arrays as they grow, part by part.
#[derive(Default)]
struct Json {
    nodes: Vec<Value>,
    meshes: Vec<Value>,
    materials: Vec<Value>,
    accessors: Vec<Value>,
    views: Vec<Value>,
    /// Nodes at the scene's root.
    roots: Vec<usize>,
}

impl Json {
    /// Appends one part's data to `bin` and its objects to the arrays; returns its node.
    fn add_part(&mut self, part: &Part, bin: &mut Vec<u8>) -> Result<usize> {
        let m = part.mesh;
        let count = m.positions.len();
        let mut min = [f32::INFINITY; 3];
        let mut max = [f32::NEG_INFINITY; 3];
        let start = bin.len();
        for p in &m.positions {
            for k in 0..3 {
                let c = p[k] as f32;
                min[k] = min[k].min(c);
                max[k] = max[k].max(c);
                bin.extend_from_slice(&c.to_le_bytes());
            }
        }
        let position = self.accessor(start, bin.len(), ARRAY_BUFFER, FLOAT, count, "VEC3");
        // Widened exactly to f64, so a reader parsing the JSON as doubles gets the
        // stored f32 values back bit for bit (an f32 printed shortest would not).
        self.accessors[position]["min"] = json!(min.map(f64::from));
        self.accessors[position]["max"] = json!(max.map(f64::from));

        let start = bin.len();
        for n in &m.normals {
            let length = (n[0] * n[0] + n[1] * n[1] + n[2] * n[2]).sqrt();
            if length == 0.0 {
                return Err(Error::internal(format!(
                    "{}: a vertex normal has length zero",
                    part.name
                )));
            }
            for c in n {
                bin.extend_from_slice(&((c / length) as f32).to_le_bytes());
            }
        }
        let normal = self.accessor(start, bin.len(), ARRAY_BUFFER, FLOAT, count, "VEC3");

        let start = bin.len();
        for i in m.triangles.iter().flatten() {
            bin.extend_from_slice(&i.to_le_bytes());
        }
        let n_indices = 3 * m.triangles.len();
        let indices = self.accessor(
            start,
            bin.len(),
            ELEMENT_ARRAY_BUFFER,
            UNSIGNED_INT,
            n_indices,
            "SCALAR",
        );

        let mut material = json!({
            "name": part.name,
            "pbrMetallicRoughness": {
                "baseColorFactor": [
                    linear(part.rgb[0]), linear(part.rgb[1]), linear(part.rgb[2]), part.opacity
                ],
                "metallicFactor": 0.0,
                "roughnessFactor": 0.5
            }
        });
        if part.opacity < 1.0 {
            material["alphaMode"] = json!("BLEND");
        }
        self.materials.push(material);
        self.meshes.push(json!({
            "name": part.name,
            "primitives": [{
                "attributes": {"POSITION": position, "NORMAL": normal},
                "indices": indices,
                "material": self.materials.len() - 1,
                "mode": TRIANGLES
            }]
        }));
        self.nodes
            .push(json!({"name": part.name, "mesh": self.meshes.len() - 1}));
        Ok(self.nodes.len() - 1)
    }

    /// A bufferView over `bin[start..end]` and an accessor reading all of it.
    fn accessor(
        &mut self,
        start: usize,
        end: usize,
        target: u32,
        component: u32,
        count: usize,
        kind: &str,
    ) -> usize {
        self.views.push(json!({
            "buffer": 0, "byteOffset": start, "byteLength": end - start, "target": target
        }));
        self.accessors.push(json!({
            "bufferView": self.views.len() - 1,
            "componentType": component,
            "count": count,
            "type": kind
        }));
        self.accessors.len() - 1
    }

    fn finish(self, doc: &MeshDocument, bin_len: usize) -> Value {
        json!({
            "asset": {
                "version": "2.0",
                "generator": generator(),
                "extras": {"length_unit": "bohr", "description": doc.description}
            },
            "scene": 0,
            "scenes": [{"nodes": self.roots}],
            "nodes": self.nodes,
            "meshes": self.meshes,
            "materials": self.materials,
            "accessors": self.accessors,
            "bufferViews": self.views,
            "buffers": [{"byteLength": bin_len}]
        })
    }
}

/// An 8-bit sRGB component as a linear intensity in [0, 1] (IEC 61966-2-1).
pub fn linear(srgb: u8) -> f64 {
    let c = f64::from(srgb) / 255.0;
    if c <= 0.04045 {
        c / 12.92
    } else {
        ((c + 0.055) / 1.055).powf(2.4)
    }
}

#[cfg(test)]
mod tests {
    use super::super::{MeshFormat, encode as encode_doc, sample};
    use super::*;

    fn word(b: &[u8], at: usize) -> u32 {
        u32::from_le_bytes(b[at..at + 4].try_into().unwrap())
    }

    /// A small GLB reader: header, both chunks, the JSON.
    fn read(bytes: &[u8]) -> (Value, &[u8]) {
        assert_eq!(word(bytes, 0), MAGIC);
        assert_eq!(word(bytes, 4), 2);
        assert_eq!(word(bytes, 8) as usize, bytes.len());
        let json_len = word(bytes, 12) as usize;
        assert_eq!(word(bytes, 16), JSON_CHUNK);
        assert_eq!(json_len % 4, 0);
        let json = &bytes[20..20 + json_len];
        let at = 20 + json_len;
        let bin_len = word(bytes, at) as usize;
        assert_eq!(word(bytes, at + 4), BIN_CHUNK);
        assert_eq!(bin_len % 4, 0);
        assert_eq!(at + 8 + bin_len, bytes.len());
        (serde_json::from_slice(json).unwrap(), &bytes[at + 8..])
    }

    /// The f32 values an accessor points at (every accessor here is 4-byte data).
    fn data(j: &Value, bin: &[u8], accessor: &Value) -> Vec<[u8; 4]> {
        let view = &j["bufferViews"][accessor["bufferView"].as_u64().unwrap() as usize];
        let start = view["byteOffset"].as_u64().unwrap() as usize;
        let len = view["byteLength"].as_u64().unwrap() as usize;
        bin[start..start + len]
            .chunks_exact(4)
            .map(|c| c.try_into().unwrap())
            .collect()
    }

    #[test]
    fn glb_reads_back_exactly() {
        let meshes = sample::meshes();
        let doc = sample::document(&meshes, true);
        let bytes = encode_doc(MeshFormat::Glb, &doc).unwrap();
        let (j, bin) = read(&bytes);
        assert_eq!(j["asset"]["version"], "2.0");
        assert!(
            j["asset"]["generator"]
                .as_str()
                .unwrap()
                .starts_with("lobecast ")
        );
        assert_eq!(j["asset"]["extras"]["length_unit"], "bohr");
        assert_eq!(
            j["buffers"][0]["byteLength"].as_u64().unwrap() as usize,
            bin.len()
        );
        let written = sample::written(&doc);
        assert_eq!(j["meshes"].as_array().unwrap().len(), written.len());
        assert_eq!(j["materials"].as_array().unwrap().len(), written.len());
        for (k, m) in written.iter().enumerate() {
            let prim = &j["meshes"][k]["primitives"][0];
            let acc =
                |name: &str| &j["accessors"][prim["attributes"][name].as_u64().unwrap() as usize];
            let (pos, nrm) = (acc("POSITION"), acc("NORMAL"));
            let idx = &j["accessors"][prim["indices"].as_u64().unwrap() as usize];
            assert_eq!(pos["count"].as_u64().unwrap() as usize, m.positions.len());
            assert_eq!(
                idx["count"].as_u64().unwrap() as usize,
                3 * m.triangles.len()
            );
            assert_eq!(idx["componentType"], UNSIGNED_INT);
            let p: Vec<f32> = data(&j, bin, pos)
                .iter()
                .map(|b| f32::from_le_bytes(*b))
                .collect();
            let expected: Vec<f32> = m.positions.iter().flatten().map(|&c| c as f32).collect();
            assert_eq!(p, expected);
            for axis in 0..3 {
                let along = p.iter().skip(axis).step_by(3);
                let lo = along.clone().fold(f32::INFINITY, |a, &b| a.min(b));
                let hi = along.fold(f32::NEG_INFINITY, |a, &b| a.max(b));
                assert_eq!(pos["min"][axis].as_f64().unwrap(), f64::from(lo));
                assert_eq!(pos["max"][axis].as_f64().unwrap(), f64::from(hi));
            }
            let n: Vec<f32> = data(&j, bin, nrm)
                .iter()
                .map(|b| f32::from_le_bytes(*b))
                .collect();
            for v in n.chunks_exact(3) {
                let len = (v[0] * v[0] + v[1] * v[1] + v[2] * v[2]).sqrt();
                assert!((len - 1.0).abs() < 1e-6, "normal length {len}");
            }
            let i: Vec<u32> = data(&j, bin, idx)
                .iter()
                .map(|b| u32::from_le_bytes(*b))
                .collect();
            assert_eq!(i, m.triangles.iter().flatten().copied().collect::<Vec<_>>());
        }
        // Surfaces at the root, molecule parts under "molecule".
        let roots = j["scenes"][0]["nodes"].as_array().unwrap();
        assert_eq!(roots.len(), 3);
        let molecule = &j["nodes"][roots[2].as_u64().unwrap() as usize];
        assert_eq!(molecule["name"], "molecule");
        assert_eq!(molecule["children"], json!([2, 3]));
        assert_eq!(j["nodes"][0]["name"], "orbital 1 +");
        // The see-through lobe blends, the opaque one does not.
        assert_eq!(j["materials"][0]["alphaMode"], "BLEND");
        assert_eq!(
            j["materials"][0]["pbrMetallicRoughness"]["baseColorFactor"][3],
            0.6
        );
        assert!(j["materials"][1].get("alphaMode").is_none());
        let grey = &j["materials"][3]["pbrMetallicRoughness"]["baseColorFactor"];
        assert_eq!(grey[0].as_f64().unwrap(), linear(128));
    }

    #[test]
    fn srgb_to_linear_follows_iec_61966_2_1() {
        assert_eq!(linear(0), 0.0);
        assert_eq!(linear(255), 1.0);
        // 0.5 grey (128/255) is 0.2158605 linear; 10/255 sits on the linear segment
        // (10/255/12.92 = 0.0030353). Reference values of the sRGB standard, from memory.
        assert!((linear(128) - 0.215_860_5).abs() < 1e-6);
        assert!((linear(10) - 0.003_035_3).abs() < 1e-7);
        // The two pieces meet at 0.04045 (continuity of the standard's curve).
        let (c, lin) = (0.04045, 0.04045 / 12.92);
        assert!((((c + 0.055) / 1.055f64).powf(2.4) - lin).abs() < 1e-7);
    }
}
