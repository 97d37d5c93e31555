//! Isosurfaces as indexed triangle meshes: extraction from a sampled box, exact
//! vertex placement on a wave-function field, and the measures that check a mesh
//! (area, enclosed volume, Euler characteristic, components, open edges).
//! Ball-and-stick shapes for the molecule are meshes too, so that every mesh writer
//! and the 3-D rasteriser take one kind of data.
//!
//! Everything is in bohr. Nothing here draws pixels or writes files.

pub mod extract;
pub mod measure;
pub mod place;
pub mod shapes;

/// An indexed triangle mesh with shared (welded) vertices.
///
/// Triangles wind counter-clockwise seen from the side the normals point to; for an
/// isosurface that is the outside, where |f| decreases.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct Mesh {
    /// Vertex positions (bohr).
    pub positions: Vec<[f64; 3]>,
    /// Unit normals, one per vertex.
    pub normals: Vec<[f64; 3]>,
    /// Vertex indices, three per triangle.
    pub triangles: Vec<[u32; 3]>,
}

impl Mesh {
    pub fn is_empty(&self) -> bool {
        self.triangles.is_empty()
    }
}

/// Which side of zero an isosurface of a signed field bounds.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Phase {
    /// f = +t, enclosing f > t (the only phase of a non-negative field).
    Positive,
    /// f = −t, enclosing f < −t.
    Negative,
}

/// One isosurface of a field.
#[derive(Debug, Clone)]
pub struct Surface {
    pub phase: Phase,
    /// The field's value on the surface (negative for `Phase::Negative`).
    pub level: f64,
    pub mesh: Mesh,
    /// Edges that belong to one triangle only: where the surface meets the box.
    pub open_edges: usize,
}
