//! Arithmetic between cube files: grid comparison and the streaming weighted sum
//! behind `combine`. Inputs are read in lockstep, a few rows at a time, so memory
//! stays bounded however large the files.

use std::io::Write;

use super::format::{NotFinite, push_e13};
use super::reader::CubeReader;
use super::writer::{CubeAtom, CubeHeader, PER_LINE, WIDTH, not_finite_error};
use crate::error::{Error, Result};
use crate::grid::GridBox;

/// Grids whose origins or step vectors differ by more than this (bohr) are
/// different grids; below it the difference is the header's printed precision.
pub const GRID_TOLERANCE_BOHR: f64 = 1e-6;

/// Checks that `b` has the same points as `a`; the error says how they differ.
pub fn compare_grids(a: &GridBox, b: &GridBox, name_a: &str, name_b: &str) -> Result<()> {
    let differ = |what: String| {
        Error::input(format!("the grids of {name_a} and {name_b} differ: {what}"))
            .with_hint("combine needs the same points in every input; resample one of them")
    };
    if a.counts != b.counts {
        let c = |g: &GridBox| format!("{}×{}×{}", g.counts[0], g.counts[1], g.counts[2]);
        return Err(differ(format!("{} points against {} points", c(a), c(b))));
    }
    let xyz = ["x", "y", "z"];
    for (d, name) in xyz.iter().enumerate() {
        let dev = (a.origin[d] - b.origin[d]).abs();
        if dev.is_nan() || dev > GRID_TOLERANCE_BOHR {
            return Err(differ(format!(
                "the origins differ by {dev:.3e} bohr in {name} ({} against {})",
                a.origin[d], b.origin[d]
            )));
        }
    }
    for ax in 0..3 {
        for (d, name) in xyz.iter().enumerate() {
            let dev = (a.axes[ax][d] - b.axes[ax][d]).abs();
            if dev.is_nan() || dev > GRID_TOLERANCE_BOHR {
                return Err(differ(format!(
                    "step vector {} differs by {dev:.3e} bohr in {name} ({} against {})",
                    ax + 1,
                    a.axes[ax][d],
                    b.axes[ax][d]
                )));
            }
        }
    }
    Ok(())
}

/// How two atom lists differ, if they do (a warning for `combine`, not an error:
/// fragment densities legitimately carry fewer atoms).
pub fn atoms_difference(a: &[CubeAtom], b: &[CubeAtom]) -> Option<String> {
    if a.len() != b.len() {
        return Some(format!("{} atoms against {}", a.len(), b.len()));
    }
    for (n, (x, y)) in a.iter().zip(b).enumerate() {
        let far = (0..3).any(|d| (x.position[d] - y.position[d]).abs() > GRID_TOLERANCE_BOHR);
        if x.atomic_number != y.atomic_number || far {
            return Some(format!(
                "atom {} is Z={} at {:?} against Z={} at {:?} (bohr)",
                n + 1,
                x.atomic_number,
                x.position,
                y.atomic_number,
                y.position
            ));
        }
    }
    None
}

/// The unit of each stored field as lobecast's own writer names it in the comment
/// line (one `; `-separated part per field, `bohr^-3/2` for orbitals, `e/bohr^3` for
/// densities); `None` where the part names neither, as in files from elsewhere.
pub fn stored_units(comment: &str, fields: usize) -> Vec<Option<&'static str>> {
    let parts: Vec<&str> = comment.split("; ").collect();
    (0..fields)
        .map(|k| {
            let part = parts.get(k).copied().unwrap_or("");
            if part.contains("bohr^-3/2") {
                Some("bohr^-3/2")
            } else if part.contains("e/bohr^3") {
                Some("e/bohr^3")
            } else {
                None
            }
        })
        .collect()
}

/// One term of a weighted sum: an open file, the stored field to take (from 0) and
/// its weight.
pub struct Term {
    pub reader: CubeReader,
    pub field: usize,
    pub weight: f64,
}

/// Writes `header` (a single field on the terms' common grid) and then Σ wᵢ fᵢ point
/// by point, in the writer's layout (six per line, a new line after each row). The
/// grids must already have been compared. Chunks hold about 64 k points, whatever
/// the row length or number of fields.
pub fn write_weighted_sum<W: Write>(
    header: &CubeHeader,
    terms: &mut [Term],
    out: &mut W,
) -> Result<()> {
    let io = |e: std::io::Error| Error::io("writing the cube file", e);
    out.write_all(header.text().as_bytes()).map_err(io)?;
    let row = header.grid.counts[2];
    let total = header.grid.point_count();
    let chunk = 65_536usize;
    let mut sum = vec![0.0; chunk];
    let mut buf = Vec::with_capacity(chunk * (WIDTH + 1));
    let mut bufs: Vec<Vec<f64>> = terms
        .iter()
        .map(|t| vec![0.0; chunk * t.reader.info().fields])
        .collect();
    let (mut done, mut in_row) = (0, 0);
    while done < total {
        let points = chunk.min(total - done);
        sum[..points].fill(0.0);
        for (t, b) in terms.iter_mut().zip(&mut bufs) {
            let f = t.reader.info().fields;
            let want = points * f;
            let got = t.reader.read_values(&mut b[..want])?;
            if got != want {
                return Err(Error::internal(format!(
                    "{} ended early while combining",
                    t.reader.name()
                )));
            }
            for (s, vals) in sum[..points].iter_mut().zip(b[..want].chunks_exact(f)) {
                *s += t.weight * vals[t.field];
            }
        }
        buf.clear();
        for (n, &v) in sum[..points].iter().enumerate() {
            push_e13(&mut buf, v).map_err(|NotFinite(v)| {
                not_finite_error(&header.grid, done + n, 0, v)
                    .with_hint("the weights or the stored values are too large for their sum")
            })?;
            in_row += 1;
            if in_row == row || in_row % PER_LINE == 0 {
                buf.push(b'\n');
            }
            if in_row == row {
                in_row = 0;
            }
        }
        out.write_all(&buf).map_err(io)?;
        done += points;
    }
    // The last read_values of each term has already refused surplus values.
    out.flush().map_err(io)
}
