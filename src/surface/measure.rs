//! Measures that check a mesh: area, enclosed volume, Euler characteristic, the
//! connected components, open edges, and whether it is an oriented 2-manifold
//! (every edge shared by exactly two triangles that run along it in opposite
//! directions). A closed isosurface of genus g has χ = 2 − 2g per component.

use rayon::prelude::*;

use super::Mesh;
use crate::error::{Error, Result};

/// One connected component (triangles linked through shared vertices).
#[derive(Debug, Clone, PartialEq)]
pub struct Component {
    pub triangles: usize,
    /// V − E + F of this component alone.
    pub euler: i64,
    pub open_edges: usize,
}

#[derive(Debug, Clone, PartialEq)]
pub struct MeshReport {
    pub area: f64,
    /// By the divergence theorem: positive for a closed, outward-wound surface.
    pub volume: f64,
    /// Vertices used by at least one triangle.
    pub vertices: usize,
    pub edges: usize,
    pub triangles: usize,
    pub euler: i64,
    /// In the order of their first triangle.
    pub components: Vec<Component>,
    /// Edges of one triangle only (a surface cut by the box).
    pub open_edges: usize,
    /// Edges of three or more triangles.
    pub crowded_edges: usize,
    /// Edges whose two triangles run along them in the same direction.
    pub misoriented_edges: usize,
    /// Triangles naming one vertex twice.
    pub degenerate_triangles: usize,
}

impl MeshReport {
    /// What keeps the mesh from being an oriented manifold (empty when it is one).
    pub fn problems(&self) -> Vec<String> {
        let counts = [
            (
                self.crowded_edges,
                "edges shared by more than two triangles",
            ),
            (
                self.misoriented_edges,
                "edges whose two triangles disagree in orientation",
            ),
            (self.degenerate_triangles, "triangles that repeat a vertex"),
        ];
        counts
            .iter()
            .filter(|(n, _)| *n > 0)
            .map(|(n, what)| format!("{n} {what}"))
            .collect()
    }

    /// Ok for an oriented manifold (with or without open edges).
    pub fn check_manifold(&self) -> Result<()> {
        let problems = self.problems();
        if problems.is_empty() {
            Ok(())
        } else {
            Err(Error::internal(format!(
                "the mesh is not a manifold: {}",
                problems.join(", ")
            )))
        }
    }

    /// A closed oriented manifold: no open edges and nothing wrong.
    pub fn is_closed_manifold(&self) -> bool {
        self.open_edges == 0 && self.problems().is_empty()
    }
}

/// Sum of the triangle areas (bohr²).
pub fn area(mesh: &Mesh) -> f64 {
    let p = &mesh.positions;
    mesh.triangles
        .par_iter()
        .map(|t| {
            let [a, b, c] = t.map(|v| p[v as usize]);
            0.5 * norm(cross(sub(b, a), sub(c, a)))
        })
        .sum()
}

/// Σ p0·(p1 × p2)/6 over the triangles, taken about the centre of the bounding box
/// to keep the sum's cancellation small (the result is the same for a closed mesh).
pub fn volume(mesh: &Mesh) -> f64 {
    let p = &mesh.positions;
    let (mut lo, mut hi) = ([f64::INFINITY; 3], [f64::NEG_INFINITY; 3]);
    for q in p {
        for d in 0..3 {
            lo[d] = lo[d].min(q[d]);
            hi[d] = hi[d].max(q[d]);
        }
    }
    let centre: [f64; 3] = std::array::from_fn(|d| 0.5 * (lo[d] + hi[d]));
    mesh.triangles
        .par_iter()
        .map(|t| {
            let [a, b, c] = t.map(|v| sub(p[v as usize], centre));
            dot(a, cross(b, c)) / 6.0
        })
        .sum()
}

/// Every measure at once. Fails if a triangle names a vertex that does not exist.
pub fn measure(mesh: &Mesh) -> Result<MeshReport> {
    let nv = mesh.positions.len();
    if let Some(t) = mesh
        .triangles
        .iter()
        .find(|t| t.iter().any(|&v| v as usize >= nv))
    {
        return Err(Error::input(format!(
            "a triangle {t:?} names a vertex beyond the mesh's {nv} vertices"
        )));
    }
    // Union-find over vertices: triangles sharing a vertex are one component.
    let mut parent: Vec<u32> = (0..nv as u32).collect();
    let mut used = vec![false; nv];
    for t in &mesh.triangles {
        t.iter().for_each(|&v| used[v as usize] = true);
        let r = find(&mut parent, t[0]);
        for &v in &t[1..] {
            let s = find(&mut parent, v);
            parent[s as usize] = r;
        }
    }
    // Components numbered in the order of their first triangle.
    let mut id = vec![u32::MAX; nv];
    let mut count = 0u32;
    for t in &mesh.triangles {
        let r = find(&mut parent, t[0]) as usize;
        if id[r] == u32::MAX {
            id[r] = count;
            count += 1;
        }
    }
    let of: Vec<usize> = (0..nv as u32)
        .map(|v| id[find(&mut parent, v) as usize] as usize)
        .collect();
    let blank = Component {
        triangles: 0,
        euler: 0,
        open_edges: 0,
    };
    let mut components = vec![blank; count as usize];
    let mut degenerate_triangles = 0;
    for t in &mesh.triangles {
        let c = &mut components[of[t[0] as usize]];
        c.triangles += 1;
        c.euler += 1;
        degenerate_triangles += (t[0] == t[1] || t[1] == t[2] || t[2] == t[0]) as usize;
    }
    for v in (0..nv).filter(|&v| used[v]) {
        components[of[v]].euler += 1;
    }
    // Each edge once per triangle: (low << 32 | high) << 1 | (low came first).
    let mut keys: Vec<u64> = mesh
        .triangles
        .iter()
        .flat_map(|t| (0..3).map(move |e| (t[e], t[(e + 1) % 3])))
        .map(|(a, b)| ((a.min(b) as u64) << 33) | ((a.max(b) as u64) << 1) | (a < b) as u64)
        .collect();
    keys.par_sort_unstable();
    let (mut edges, mut open, mut crowded, mut misoriented) = (0, 0, 0, 0);
    for group in keys.chunk_by(|x, y| x >> 1 == y >> 1) {
        edges += 1;
        let c = of[(group[0] >> 33) as usize];
        components[c].euler -= 1;
        match group.len() {
            1 => {
                open += 1;
                components[c].open_edges += 1;
            }
            2 => misoriented += (group[0] & 1 == group[1] & 1) as usize,
            _ => crowded += 1,
        }
    }
    Ok(MeshReport {
        area: area(mesh),
        volume: volume(mesh),
        vertices: used.iter().filter(|&&u| u).count(),
        edges,
        triangles: mesh.triangles.len(),
        euler: components.iter().map(|c| c.euler).sum(),
        components,
        open_edges: open,
        crowded_edges: crowded,
        misoriented_edges: misoriented,
        degenerate_triangles,
    })
}

fn find(parent: &mut [u32], mut v: u32) -> u32 {
    while parent[v as usize] != v {
        let up = parent[parent[v as usize] as usize];
        parent[v as usize] = up;
        v = up;
    }
    v
}

fn sub(a: [f64; 3], b: [f64; 3]) -> [f64; 3] {
    [a[0] - b[0], a[1] - b[1], a[2] - b[2]]
}

fn cross(a: [f64; 3], b: [f64; 3]) -> [f64; 3] {
    [
        a[1] * b[2] - a[2] * b[1],
        a[2] * b[0] - a[0] * b[2],
        a[0] * b[1] - a[1] * b[0],
    ]
}

fn dot(a: [f64; 3], b: [f64; 3]) -> f64 {
    a[0] * b[0] + a[1] * b[1] + a[2] * b[2]
}

fn norm(a: [f64; 3]) -> f64 {
    dot(a, a).sqrt()
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The unit tetrahedron (0, e1, e2, e3) wound outward.
    fn tetrahedron() -> Mesh {
        Mesh {
            positions: vec![[0.0; 3], [1.0, 0.0, 0.0], [0.0, 1.0, 0.0], [0.0, 0.0, 1.0]],
            normals: vec![[0.0, 0.0, 1.0]; 4],
            triangles: vec![[0, 2, 1], [0, 1, 3], [0, 3, 2], [1, 2, 3]],
        }
    }

    #[test]
    fn tetrahedron_measures() {
        let r = measure(&tetrahedron()).unwrap();
        // Closed forms: three right triangles of area 1/2 and an equilateral one of
        // side √2 (area √3/2); volume 1/6; a sphere-like closed surface has χ = 2.
        assert!(
            (r.area - (1.5 + 3f64.sqrt() / 2.0)).abs() < 1e-12,
            "{}",
            r.area
        );
        assert!((r.volume - 1.0 / 6.0).abs() < 1e-12, "{}", r.volume);
        assert_eq!((r.vertices, r.edges, r.triangles, r.euler), (4, 6, 4, 2));
        assert_eq!(r.components.len(), 1);
        assert!(r.is_closed_manifold());
    }

    #[test]
    fn open_flipped_and_two_pieces() {
        let mut m = tetrahedron();
        m.triangles.pop();
        let r = measure(&m).unwrap();
        // A tetrahedron without one face is a disc: χ = 1, its three rim edges open.
        assert_eq!((r.open_edges, r.euler), (3, 1));
        assert!(r.check_manifold().is_ok() && !r.is_closed_manifold());

        let mut m = tetrahedron();
        m.triangles[3] = [1, 3, 2];
        let r = measure(&m).unwrap();
        // One face wound the wrong way disagrees with its three neighbours; the
        // volume then is not the tetrahedron's.
        assert_eq!(r.misoriented_edges, 3);
        assert!(r.check_manifold().is_err());

        let mut m = tetrahedron();
        let shifted: Vec<[f64; 3]> = m
            .positions
            .iter()
            .map(|p| [p[0] + 5.0, p[1], p[2]])
            .collect();
        m.positions.extend(shifted);
        let more: Vec<[u32; 3]> = m.triangles.iter().map(|t| t.map(|v| v + 4)).collect();
        m.triangles.extend(more);
        let r = measure(&m).unwrap();
        // Two disjoint tetrahedra: two components of χ = 2 each, twice the volume.
        assert_eq!(
            r.components.iter().map(|c| c.euler).collect::<Vec<_>>(),
            [2, 2]
        );
        assert!((r.volume - 2.0 / 6.0).abs() < 1e-12);

        m.triangles.push([0, 1, 9]);
        assert!(
            measure(&m).is_err(),
            "a vertex beyond the list must be refused"
        );
    }
}
