//! Contour lines by marching squares (Lorensen and Cline's method in two
//! dimensions) on a sampled plane, joined into polylines so that dashes run on
//! along a line instead of restarting in every cell.
//!
//! Coordinates are grid indices: (x, y) = (column, row) of the samples.

use std::collections::HashMap;

/// Values on a grid of `nx` × `ny` samples, row-major (row y, column x).
pub struct Grid<'a> {
    pub values: &'a [f64],
    pub nx: usize,
    pub ny: usize,
}

impl Grid<'_> {
    fn at(&self, x: usize, y: usize) -> f64 {
        self.values[y * self.nx + x]
    }

    fn horizontal_edges(&self) -> usize {
        (self.nx - 1) * self.ny
    }

    /// Edge between (x, y) and (x + 1, y).
    fn h(&self, x: usize, y: usize) -> usize {
        y * (self.nx - 1) + x
    }

    /// Edge between (x, y) and (x, y + 1).
    fn v(&self, x: usize, y: usize) -> usize {
        self.horizontal_edges() + y * self.nx + x
    }

    /// Where the level crosses an edge, by linear interpolation along it. Depends
    /// only on the edge, so the two cells sharing it agree exactly.
    fn crossing(&self, edge: usize, level: f64) -> (f64, f64) {
        let (x0, y0, x1, y1) = if edge < self.horizontal_edges() {
            let (y, x) = (edge / (self.nx - 1), edge % (self.nx - 1));
            (x, y, x + 1, y)
        } else {
            let e = edge - self.horizontal_edges();
            let (y, x) = (e / self.nx, e % self.nx);
            (x, y, x, y + 1)
        };
        let (a, b) = (self.at(x0, y0), self.at(x1, y1));
        let t = if b != a { (level - a) / (b - a) } else { 0.5 };
        let t = t.clamp(0.0, 1.0);
        (
            x0 as f64 + t * (x1 as f64 - x0 as f64),
            y0 as f64 + t * (y1 as f64 - y0 as f64),
        )
    }
}

/// The contour lines of `grid` at `level`; closed loops end where they start.
pub fn trace(grid: &Grid, level: f64) -> Vec<Vec<(f64, f64)>> {
    if grid.nx < 2 || grid.ny < 2 {
        return Vec::new();
    }
    // Segments as pairs of edge ids.
    let mut segments: Vec<(usize, usize)> = Vec::new();
    for y in 0..grid.ny - 1 {
        for x in 0..grid.nx - 1 {
            let c = [
                grid.at(x, y),
                grid.at(x + 1, y),
                grid.at(x + 1, y + 1),
                grid.at(x, y + 1),
            ];
            if c.iter().any(|v| !v.is_finite()) {
                continue;
            }
            let above = |k: usize| c[k] >= level;
            let case = (above(0) as u8)
                | (above(1) as u8) << 1
                | (above(2) as u8) << 2
                | (above(3) as u8) << 3;
            // Edges of the cell: bottom (0–1), right (1–2), top (3–2), left (0–3).
            let (b, r, t, l) = (
                grid.h(x, y),
                grid.v(x + 1, y),
                grid.h(x, y + 1),
                grid.v(x, y),
            );
            let centre_above = (c.iter().sum::<f64>() / 4.0) >= level;
            let pairs: &[(usize, usize)] = match case {
                0 | 15 => &[],
                1 | 14 => &[(l, b)],
                2 | 13 => &[(b, r)],
                3 | 12 => &[(l, r)],
                4 | 11 => &[(r, t)],
                6 | 9 => &[(b, t)],
                7 | 8 => &[(l, t)],
                // Saddles: the cell centre decides which corners connect.
                5 if centre_above => &[(l, t), (b, r)],
                5 => &[(l, b), (r, t)],
                10 if centre_above => &[(l, b), (r, t)],
                10 => &[(l, t), (b, r)],
                _ => unreachable!("four bits"),
            };
            segments.extend_from_slice(pairs);
        }
    }
    join(&segments)
        .into_iter()
        .map(|chain| chain.iter().map(|&e| grid.crossing(e, level)).collect())
        .collect()
}

/// Chains segments that share edges into polylines of edge ids.
fn join(segments: &[(usize, usize)]) -> Vec<Vec<usize>> {
    let mut by_edge: HashMap<usize, Vec<usize>> = HashMap::new();
    for (i, &(a, b)) in segments.iter().enumerate() {
        by_edge.entry(a).or_default().push(i);
        by_edge.entry(b).or_default().push(i);
    }
    let mut used = vec![false; segments.len()];
    let other = |s: usize, e: usize| {
        let (a, b) = segments[s];
        if a == e { b } else { a }
    };
    let next = |e: usize, used: &[bool]| -> Option<usize> {
        by_edge.get(&e)?.iter().copied().find(|&s| !used[s])
    };
    let mut chains = Vec::new();
    // Open chains start at an edge used by a single segment (the grid border), so
    // walk those first; what remains are closed loops.
    let mut starts: Vec<usize> = by_edge
        .iter()
        .filter(|(_, s)| s.len() == 1)
        .map(|(e, _)| *e)
        .collect();
    starts.sort_unstable();
    let loop_starts: Vec<usize> = (0..segments.len()).map(|s| segments[s].0).collect();
    for start in starts.into_iter().chain(loop_starts) {
        let Some(first) = next(start, &used) else {
            continue;
        };
        let mut chain = vec![start];
        let mut seg = first;
        let mut edge = start;
        loop {
            used[seg] = true;
            edge = other(seg, edge);
            chain.push(edge);
            match next(edge, &used) {
                Some(s) => seg = s,
                None => break,
            }
        }
        chains.push(chain);
    }
    chains
}

/// `n` levels per sign, evenly spaced between zero and ±max (neither included).
pub fn auto_levels(max: f64, n: usize, signed: bool) -> Vec<f64> {
    let step = max / (n as f64 + 1.0);
    let mut levels: Vec<f64> = (1..=n).map(|k| k as f64 * step).collect();
    if signed {
        let neg: Vec<f64> = levels.iter().rev().map(|v| -v).collect();
        levels = neg.into_iter().chain(levels).collect();
    }
    levels
}

/// `n` levels per sign spread evenly in the logarithm over `decades` below max.
pub fn log_levels(max: f64, n: usize, decades: f64) -> Vec<f64> {
    (0..n)
        .map(|k| max * 10f64.powf(-decades * (k as f64 + 0.5) / n as f64))
        .rev()
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_cone_gives_one_closed_circle() {
        // f = distance from the centre: the level-r contour is the circle of radius r
        // (common practice); linear interpolation of a cone is exact along the axes.
        let n = 41;
        let values: Vec<f64> = (0..n * n)
            .map(|i| {
                let (x, y) = ((i % n) as f64 - 20.0, (i / n) as f64 - 20.0);
                (x * x + y * y).sqrt()
            })
            .collect();
        let lines = trace(
            &Grid {
                values: &values,
                nx: n,
                ny: n,
            },
            10.0,
        );
        assert_eq!(lines.len(), 1);
        let line = &lines[0];
        assert_eq!(line.first(), line.last(), "closed");
        for (x, y) in line {
            let r = ((x - 20.0).powi(2) + (y - 20.0).powi(2)).sqrt();
            assert!((r - 10.0).abs() < 0.05, "r = {r}");
        }
    }

    #[test]
    fn lines_leaving_the_grid_stay_open() {
        let values: Vec<f64> = (0..100).map(|i| (i % 10) as f64).collect();
        let lines = trace(
            &Grid {
                values: &values,
                nx: 10,
                ny: 10,
            },
            4.5,
        );
        assert_eq!(lines.len(), 1);
        assert_eq!(lines[0].len(), 10);
        assert!(lines[0].iter().all(|p| (p.0 - 4.5).abs() < 1e-12));
        assert_eq!(auto_levels(1.0, 1, true), vec![-0.5, 0.5]);
    }
}
