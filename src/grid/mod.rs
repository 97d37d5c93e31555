//! Where to evaluate: boxes of points (and, later, planes and lines), and the
//! parallel sampler that walks a box slab by slab.

pub mod line;
pub mod plane;
mod sampler;
pub mod slab_rule;

pub use sampler::{Slab, sample_all, stream_slabs, stream_slots};

use crate::chem::Molecule;
use crate::error::{Error, Result};

/// How finely to sample a box.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Resolution {
    /// Distance between neighbouring points (bohr).
    Spacing(f64),
    /// Number of points along the longest edge.
    Points(usize),
}

/// A box of points: point (i, j, k) sits at origin + i·axes[0] + j·axes[1] + k·axes[2]
/// (bohr), with i the slowest and k the fastest index, as in the cube layout.
#[derive(Debug, Clone, PartialEq)]
pub struct GridBox {
    pub origin: [f64; 3],
    pub axes: [[f64; 3]; 3],
    pub counts: [usize; 3],
}

/// Boxes beyond this many points are refused before any work (a typo in --spacing).
pub const MAX_POINTS: usize = 20_000_000_000;

impl GridBox {
    /// An axis-aligned box around the nuclei with `padding` (bohr) on every side,
    /// centred on the molecule so that its symmetry carries over to the grid.
    pub fn around(molecule: &Molecule, padding: f64, resolution: Resolution) -> Result<Self> {
        if !(padding.is_finite() && padding >= 0.0) {
            return Err(Error::input(format!(
                "the padding must be zero or positive, got {padding}"
            )));
        }
        let (lo, hi) = molecule.bounds();
        let extent: [f64; 3] = std::array::from_fn(|d| hi[d] - lo[d] + 2.0 * padding);
        let longest = extent.iter().cloned().fold(0.0, f64::max);
        let h = match resolution {
            Resolution::Spacing(h) if h.is_finite() && h > 0.0 => h,
            Resolution::Spacing(h) => {
                return Err(Error::input(format!(
                    "the spacing must be positive, got {h}"
                )));
            }
            // Rounded up to the header's six decimals so that n points still span
            // the longest edge; that edge is then given exactly n points below.
            Resolution::Points(n) if n >= 2 && longest > 0.0 => {
                ((longest / (n - 1) as f64) * 1e6).ceil() / 1e6
            }
            Resolution::Points(n) => {
                return Err(Error::input(format!(
                    "--points needs at least 2 points and a box of non-zero size (got {n} points, longest edge {longest} bohr)"
                )));
            }
        };
        // The cube header prints six decimals; snapping spacing and origin to them
        // makes the file describe exactly the points that were evaluated.
        let h = snap(h).max(1e-6);
        let mut counts = [1usize; 3];
        let mut origin = [0.0; 3];
        let mut total: f64 = 1.0;
        let long_axis = (0..3).fold(0, |best, d| if extent[d] > extent[best] { d } else { best });
        for d in 0..3 {
            let n = match resolution {
                Resolution::Points(n) if d == long_axis => n as f64,
                _ => (extent[d] / h - 1e-9).ceil().max(0.0) + 1.0,
            };
            total *= n;
            counts[d] = n as usize;
            let centre = 0.5 * (lo[d] + hi[d]);
            origin[d] = snap(centre - 0.5 * (n - 1.0) * h);
        }
        if total > MAX_POINTS as f64 {
            return Err(Error::input(format!(
                "the box would hold {total:.3e} points at spacing {h} bohr"
            )));
        }
        let axes = [[h, 0.0, 0.0], [0.0, h, 0.0], [0.0, 0.0, h]];
        Ok(GridBox {
            origin,
            axes,
            counts,
        })
    }

    /// Whether the axes run along x, y and z in that order (then slabs are lattices).
    pub fn is_axis_aligned(&self) -> bool {
        let [a, b, c] = self.axes;
        a[1] == 0.0 && a[2] == 0.0 && b[0] == 0.0 && b[2] == 0.0 && c[0] == 0.0 && c[1] == 0.0
    }

    pub fn point_count(&self) -> usize {
        self.counts.iter().product()
    }

    pub fn point(&self, i: usize, j: usize, k: usize) -> [f64; 3] {
        let (a, b, c) = (i as f64, j as f64, k as f64);
        std::array::from_fn(|d| {
            self.origin[d] + a * self.axes[0][d] + b * self.axes[1][d] + c * self.axes[2][d]
        })
    }

    /// Volume of one voxel (bohr³): |a1 · (a2 × a3)|.
    pub fn voxel_volume(&self) -> f64 {
        let [a, b, c] = self.axes;
        let cross = [
            b[1] * c[2] - b[2] * c[1],
            b[2] * c[0] - b[0] * c[2],
            b[0] * c[1] - b[1] * c[0],
        ];
        (a[0] * cross[0] + a[1] * cross[1] + a[2] * cross[2]).abs()
    }

    /// The points of slab i (all j, k), k fastest, into `out`.
    pub fn slab_points(&self, i: usize, out: &mut Vec<[f64; 3]>) {
        out.clear();
        for j in 0..self.counts[1] {
            for k in 0..self.counts[2] {
                out.push(self.point(i, j, k));
            }
        }
    }
}

/// Rounds to the six decimals of the cube header.
fn snap(x: f64) -> f64 {
    (x * 1e6).round() / 1e6
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::chem::{Atom, elements::by_symbol};

    #[test]
    fn box_is_centred_and_covers_the_padding() {
        let h = by_symbol("H").unwrap();
        let m = Molecule::new(
            vec![
                Atom {
                    element: h,
                    position: [0.0, 0.0, -1.0],
                },
                Atom {
                    element: h,
                    position: [0.0, 0.0, 1.0],
                },
            ],
            1,
        )
        .unwrap();
        let g = GridBox::around(&m, 5.0, Resolution::Spacing(0.1)).unwrap();
        assert_eq!(g.counts, [101, 101, 121]);
        let far = g.point(100, 100, 120);
        assert!((g.origin[2] + 6.0).abs() < 1e-12 && (far[2] - 6.0).abs() < 1e-9);
        assert!((g.voxel_volume() - 1e-3).abs() < 1e-15);
        assert!(GridBox::around(&m, 5.0, Resolution::Spacing(0.0)).is_err());
        let g = GridBox::around(&m, 5.0, Resolution::Points(61)).unwrap();
        assert_eq!(g.counts[2], 61);
    }

    /// `--points N` puts exactly N points on the longest edge, whatever N and box
    /// (issue: 2 gave 2×3×2 and 100 gave 74×101×99). Exactness is the documented
    /// contract (common practice), checked over many N and box shapes.
    #[test]
    fn points_gives_exactly_n_on_the_longest_edge() {
        let mol = |atoms: &[(&str, [f64; 3])]| Molecule::from_symbols(atoms, 0).unwrap();
        for (coords, pad) in [("H2", 5.0), ("H2O", 3.0), ("CO", 0.5)] {
            let m = match coords {
                "H2" => mol(&[("H", [0.0, 0.0, 0.0]), ("H", [0.0, 0.0, 1.4])]),
                "H2O" => mol(&[
                    ("O", [0.0, 0.0, 0.2217]),
                    ("H", [0.0, 1.4309, -0.8867]),
                    ("H", [0.0, -1.4309, -0.8867]),
                ]),
                _ => mol(&[("C", [0.0, 0.0, 0.0]), ("O", [0.0, 0.0, 2.1316])]),
            };
            for n in [2, 3, 7, 50, 100, 101, 257, 1000] {
                let g = GridBox::around(&m, pad, Resolution::Points(n)).unwrap();
                assert_eq!(
                    *g.counts.iter().max().unwrap(),
                    n,
                    "{coords} n={n}: {:?}",
                    g.counts
                );
                let h = g.axes[0][0];
                let (lo, hi) = m.bounds();
                for d in 0..3 {
                    // Every edge still covers the nuclei plus padding.
                    let span = (g.counts[d] - 1) as f64 * h;
                    assert!(
                        span + 1e-9 >= hi[d] - lo[d] + 2.0 * pad,
                        "{coords} n={n} d={d}"
                    );
                }
            }
        }
    }
}
