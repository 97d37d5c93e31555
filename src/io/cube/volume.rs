//! A cube file held in memory, for commands that need random access to the values
//! (slices and surfaces interpolate it at arbitrary points). Statistics over files of
//! any size do not need this: they stream (see `stats`).
//!
//! Only the stored fields a command draws are kept, and their memory (points × kept
//! fields × 8 bytes) is checked against the caller's budget and reserved in one
//! piece before any value is read, so a large file is refused with the estimate, or
//! with the system's refusal, instead of aborting part-way. Values stay f64: the
//! reader accepts exponents up to ±99, beyond the range of f32, and keeps every
//! stored value exactly as written.

use std::path::Path;

use super::arith::compare_grids;
use super::reader::{CubeInfo, CubeReader};
use crate::budget::{DEFAULT_MEMORY, check_memory, reserve};
use crate::error::{Error, Result};

/// Bytes per value held (f64).
pub const BYTES_PER_VALUE: usize = 8;

#[derive(Debug, Clone)]
pub struct Volume {
    pub info: CubeInfo,
    /// The stored fields held (from 0, ascending, each once).
    pub kept: Vec<usize>,
    /// The values of the kept fields in file order: point (i, j, k) with k fastest,
    /// the kept fields of one point together.
    pub values: Vec<f64>,
    /// Inverse of the matrix whose columns are the three step vectors: turns a
    /// displacement from the origin into fractional grid indices.
    inverse: [[f64; 3]; 3],
}

impl Volume {
    /// Reads a whole cube file (plain or gzip), every field, within the default
    /// memory budget.
    pub fn read(path: &Path) -> Result<Self> {
        Self::from_reader(CubeReader::open(path)?)
    }

    /// Reads the values that follow an already parsed header, every field, within
    /// the default memory budget.
    pub fn from_reader(r: CubeReader) -> Result<Self> {
        let all: Vec<usize> = (0..r.info().fields).collect();
        Self::keeping(r, &all, DEFAULT_MEMORY)
    }

    /// Bytes needed to hold `kept` fields of a cube with `points` points, as an f64
    /// so that the product cannot wrap.
    pub fn estimate(points: usize, kept: usize) -> f64 {
        points as f64 * kept as f64 * BYTES_PER_VALUE as f64
    }

    /// Reads the values that follow an already parsed header, keeping only the stored
    /// fields `kept` (from 0; order and repeats do not matter). Refuses before
    /// reading when they would need more than `budget` bytes.
    pub fn keeping(mut r: CubeReader, kept: &[usize], budget: u64) -> Result<Self> {
        let info = r.info().clone();
        let nf = info.fields;
        let mut kept = kept.to_vec();
        kept.sort_unstable();
        kept.dedup();
        if let Some(&bad) = kept.iter().find(|&&k| k >= nf) {
            return Err(Error::input(format!(
                "{}: stored field {} asked for, but the file holds {nf}",
                r.name(),
                bad + 1
            )));
        }
        let [nx, ny, nz] = info.header.grid.counts;
        let what = format!(
            "{}: {} of {nf} stored field(s) on {nx}×{ny}×{nz} points",
            r.name(),
            kept.len()
        );
        check_memory(
            Self::estimate(info.point_count(), kept.len()),
            budget,
            &what,
        )?;
        let inverse = invert(info.header.grid.axes).ok_or_else(|| {
            Error::input(format!("{}: the step vectors span no volume", r.name()))
        })?;
        let mut values = Vec::new();
        reserve(&mut values, info.point_count() * kept.len(), &what)?;
        let mut keep = vec![false; nf];
        for &k in &kept {
            keep[k] = true;
        }
        let all = kept.len() == nf;
        let mut chunk = vec![0.0; info.value_count().clamp(1, 1 << 16)];
        // Field of the next value read: values come point by point, fields together.
        let mut field = 0;
        loop {
            let n = r.read_values(&mut chunk)?;
            if n == 0 {
                break;
            }
            if all {
                values.extend_from_slice(&chunk[..n]);
                continue;
            }
            for &v in &chunk[..n] {
                if keep[field] {
                    values.push(v);
                }
                field += 1;
                if field == nf {
                    field = 0;
                }
            }
        }
        Ok(Volume {
            info,
            kept,
            values,
            inverse,
        })
    }

    /// Bytes the values take.
    pub fn held_bytes(&self) -> usize {
        self.values.len() * BYTES_PER_VALUE
    }

    /// Whether stored field `field` (from 0) was kept.
    pub fn holds(&self, field: usize) -> bool {
        self.kept.binary_search(&field).is_ok()
    }

    /// Where stored field `field` sits among the kept ones. Asking for a field that
    /// was not kept is a bug in the caller, which chose what to keep.
    fn slot(&self, field: usize) -> usize {
        self.kept
            .binary_search(&field)
            .unwrap_or_else(|_| panic!("stored field {} was not read", field + 1))
    }

    pub fn fields(&self) -> usize {
        self.info.fields
    }

    /// The value of `field` (from 0) at grid point (i, j, k).
    pub fn at(&self, field: usize, i: usize, j: usize, k: usize) -> f64 {
        let [_, ny, nz] = self.info.header.grid.counts;
        self.values[((i * ny + j) * nz + k) * self.kept.len() + self.slot(field)]
    }

    /// The values of one field, in cube order.
    pub fn field_values(&self, field: usize) -> impl Iterator<Item = f64> + '_ {
        self.values
            .iter()
            .skip(self.slot(field))
            .step_by(self.kept.len())
            .copied()
    }

    /// Trilinear interpolation of `field` at `point` (bohr). The point is first
    /// expressed in fractional grid indices (u, v, w) through the inverse of the step
    /// vectors, so skewed grids interpolate along their own axes; the value is then the
    /// weighted mean of the 8 corners of the enclosing cell, weights (1−s) and s per
    /// axis. It reproduces the stored values at grid points and any function linear in
    /// u, v, w exactly. `None` outside the box (beyond 1e-9 of a cell); along an axis
    /// with a single point only that plane is inside.
    pub fn value_at(&self, field: usize, point: [f64; 3]) -> Option<f64> {
        let g = &self.info.header.grid;
        let d: [f64; 3] = std::array::from_fn(|e| point[e] - g.origin[e]);
        let mut base = [0usize; 3];
        let mut frac = [0.0; 3];
        for a in 0..3 {
            let u = (0..3).map(|e| self.inverse[a][e] * d[e]).sum::<f64>();
            let n = g.counts[a];
            let top = (n - 1) as f64;
            if !(-1e-9..=top + 1e-9).contains(&u) {
                return None;
            }
            let u = u.clamp(0.0, top);
            let cell = (u.floor() as usize).min(n.saturating_sub(2));
            base[a] = cell;
            frac[a] = if n == 1 { 0.0 } else { u - cell as f64 };
        }
        let mut sum = 0.0;
        for corner in 0..8 {
            let mut w = 1.0;
            let mut idx = [0usize; 3];
            for a in 0..3 {
                let up = (corner >> a) & 1 == 1;
                if up && g.counts[a] == 1 {
                    w = 0.0;
                    break;
                }
                w *= if up { frac[a] } else { 1.0 - frac[a] };
                idx[a] = base[a] + up as usize;
            }
            if w != 0.0 {
                sum += w * self.at(field, idx[0], idx[1], idx[2]);
            }
        }
        Some(sum)
    }

    /// Σ f · dV over the grid for one field (bohr³ times the field's unit).
    pub fn integral(&self, field: usize) -> f64 {
        self.field_values(field).sum::<f64>() * self.info.header.grid.voxel_volume()
    }

    /// Adds `weight` × field `field` of `other` to field `into` of this volume, after
    /// checking that the grids agree (as `combine` does for files).
    pub fn add_scaled(
        &mut self,
        into: usize,
        other: &Volume,
        field: usize,
        weight: f64,
    ) -> Result<()> {
        compare_grids(
            &self.info.header.grid,
            &other.info.header.grid,
            "this volume",
            "the other",
        )?;
        let (fa, fb) = (self.kept.len(), other.kept.len());
        let (into, field) = (self.slot(into), other.slot(field));
        for (dst, src) in self
            .values
            .chunks_exact_mut(fa)
            .zip(other.values.chunks_exact(fb))
        {
            dst[into] += weight * src[field];
        }
        Ok(())
    }
}

/// The inverse of the matrix with columns a₁, a₂, a₃ (rows of the result map a
/// displacement to fractional indices); `None` when they span no volume.
fn invert(axes: [[f64; 3]; 3]) -> Option<[[f64; 3]; 3]> {
    let [a, b, c] = axes;
    let cross = |x: [f64; 3], y: [f64; 3]| {
        [
            x[1] * y[2] - x[2] * y[1],
            x[2] * y[0] - x[0] * y[2],
            x[0] * y[1] - x[1] * y[0],
        ]
    };
    let (bc, ca, ab) = (cross(b, c), cross(c, a), cross(a, b));
    let det = a[0] * bc[0] + a[1] * bc[1] + a[2] * bc[2];
    if det == 0.0 || !det.is_finite() {
        return None;
    }
    // Row r of the inverse is the reciprocal vector of axis r: a_r* · a_s = δ_rs.
    Some([bc, ca, ab].map(|r| r.map(|x| x / det)))
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Reciprocal vectors: a_r* · a_s = δ_rs by construction (common practice).
    #[test]
    fn inverse_of_skewed_axes() {
        let axes = [[0.2, 0.0, 0.0], [0.05, 0.3, 0.0], [0.01, -0.02, 0.25]];
        let inv = invert(axes).unwrap();
        for (r, row) in inv.iter().enumerate() {
            for (s, axis) in axes.iter().enumerate() {
                let dot: f64 = (0..3).map(|e| row[e] * axis[e]).sum();
                assert!((dot - if r == s { 1.0 } else { 0.0 }).abs() < 1e-12);
            }
        }
    }
}
