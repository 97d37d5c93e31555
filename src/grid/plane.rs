//! Planes for slices: `xy`, `xz`, `yz` (optionally `@offset` along the missing axis),
//! `atoms:I,J,K` (through three atoms) and `atoms:I,J` with an up direction (the
//! plane holding the bond and that direction), and the pixel grid on a window of one.

use nalgebra::Vector3;

use crate::chem::units::bohr_to_angstrom;
use crate::chem::{LengthUnit, Molecule};
use crate::error::{Error, Result};

/// A Cartesian axis, for `--up`.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Axis {
    X,
    Y,
    Z,
}

impl Axis {
    fn index(self) -> usize {
        self as usize
    }
}

const NAMES: [&str; 3] = ["x", "y", "z"];

impl std::str::FromStr for Axis {
    type Err = String;
    fn from_str(s: &str) -> std::result::Result<Self, String> {
        match s.to_ascii_lowercase().as_str() {
            "x" => Ok(Axis::X),
            "y" => Ok(Axis::Y),
            "z" => Ok(Axis::Z),
            _ => Err(format!("unknown axis {s:?} (x, y or z)")),
        }
    }
}

#[derive(Debug, Clone, PartialEq)]
pub enum PlaneSpec {
    /// Two Cartesian axes (u, v) and the offset (bohr) along the third.
    Axes { u: usize, v: usize, offset: f64 },
    /// Through three atoms (0-based).
    ThreeAtoms([usize; 3]),
    /// Holding the bond between two atoms (0-based) and a direction.
    Bond([usize; 2]),
}

const ACCEPTED: &str =
    "xy, xz, yz (optionally @offset, e.g. xz@0.5), atoms:I,J,K or atoms:I,J with --up x|y|z";

impl PlaneSpec {
    /// Parses a plane; an offset is read in `unit`.
    pub fn parse(text: &str, unit: LengthUnit) -> Result<Self> {
        let t = text.trim().to_ascii_lowercase();
        let bad = |why: &str| {
            Error::input(format!("cannot read the plane {text:?}: {why}"))
                .with_hint(format!("planes are {ACCEPTED}"))
        };
        if let Some(list) = t.strip_prefix("atoms:") {
            let ids = list
                .split(',')
                .map(|s| match s.trim().parse::<usize>() {
                    Ok(n) if n >= 1 => Ok(n - 1),
                    _ => Err(bad("atom numbers start at 1")),
                })
                .collect::<Result<Vec<_>>>()?;
            return match ids[..] {
                [a, b, c] => Ok(PlaneSpec::ThreeAtoms([a, b, c])),
                [a, b] => Ok(PlaneSpec::Bond([a, b])),
                _ => Err(bad("give two or three atom numbers")),
            };
        }
        let (axes, offset) = match t.split_once('@') {
            Some((a, o)) => (
                a,
                o.trim()
                    .parse::<f64>()
                    .ok()
                    .filter(|v| v.is_finite())
                    .ok_or_else(|| bad("the offset is not a number"))?,
            ),
            None => (t.as_str(), 0.0),
        };
        let (u, v) = match axes.trim() {
            "xy" => (0, 1),
            "xz" => (0, 2),
            "yz" => (1, 2),
            _ => return Err(bad("unknown plane")),
        };
        Ok(PlaneSpec::Axes {
            u,
            v,
            offset: unit.to_bohr(offset),
        })
    }

    /// Places the plane on a molecule. With `atoms:I,J`, `up` is the direction that
    /// spans the plane with the bond (without it, the Cartesian axis most nearly
    /// perpendicular to the bond). With `xy`, `xz`, `yz` it is the axis drawn upwards;
    /// the plane's normal is refused, as is any `up` with `atoms:I,J,K`.
    pub fn resolve(&self, molecule: &Molecule, up: Option<Axis>) -> Result<Plane> {
        let atom = |i: usize| {
            molecule.atoms.get(i).map(|a| a.position).ok_or_else(|| {
                Error::input(format!(
                    "there is no atom {} here: the molecule has {} atoms",
                    i + 1,
                    molecule.atoms.len()
                ))
            })
        };
        match *self {
            PlaneSpec::Axes { u, v, offset } => {
                let n = 3 - u - v;
                let mut origin = [0.0; 3];
                origin[n] = offset;
                // --up names the axis drawn upwards: v as written, or u (the two swap);
                // the plane's normal cannot point up in the picture.
                let (u, v, turned) = match up.map(Axis::index) {
                    None => (u, v, false),
                    Some(a) if a == v => (u, v, false),
                    Some(a) if a == u => (v, u, true),
                    Some(a) => {
                        return Err(Error::input(format!(
                            "--up {} is perpendicular to the plane {}{}, so it cannot point up in it",
                            NAMES[a],
                            NAMES[u.min(v)],
                            NAMES[u.max(v)]
                        ))
                        .with_hint(format!(
                            "give --up {} or --up {} (the axis drawn upwards), or leave it out",
                            NAMES[u.min(v)],
                            NAMES[u.max(v)]
                        )));
                    }
                };
                Ok(Plane {
                    origin,
                    u: unit_vector(u),
                    v: unit_vector(v),
                    u_label: NAMES[u].into(),
                    v_label: NAMES[v].into(),
                    description: format!(
                        "plane {}{} at {} = {:.3} Å{}",
                        NAMES[u.min(v)],
                        NAMES[u.max(v)],
                        NAMES[n],
                        bohr_to_angstrom(offset),
                        if turned {
                            format!(", {} up", NAMES[v])
                        } else {
                            String::new()
                        }
                    ),
                })
            }
            PlaneSpec::ThreeAtoms(_) if up.is_some() => Err(Error::input(
                "--up does not apply to a plane through three atoms: the atoms fix its orientation",
            )
            .with_hint("leave out --up, or use atoms:I,J with --up x|y|z")),
            PlaneSpec::ThreeAtoms([i, j, k]) => {
                let (a, b, c) = (atom(i)?, atom(j)?, atom(k)?);
                let u = (v3(b) - v3(a))
                    .try_normalize(MIN_LENGTH)
                    .ok_or_else(|| same(i, j))?;
                let w = v3(c) - v3(a);
                let v = (w - u * w.dot(&u))
                    .try_normalize(MIN_LENGTH)
                    .ok_or_else(|| {
                        Error::input(format!(
                            "atoms {}, {} and {} lie on one line, so they fix no plane",
                            i + 1,
                            j + 1,
                            k + 1
                        ))
                        .with_hint("use atoms:I,J with --up x|y|z for a plane through a bond")
                    })?;
                Ok(Plane {
                    origin: centroid(&[a, b, c]),
                    u: u.into(),
                    v: v.into(),
                    u_label: format!("u (atom {} → {})", i + 1, j + 1),
                    v_label: format!("v (towards atom {})", k + 1),
                    description: format!(
                        "plane through atoms {}, {}, {}; origin at their centroid",
                        i + 1,
                        j + 1,
                        k + 1
                    ),
                })
            }
            PlaneSpec::Bond([i, j]) => {
                let (a, b) = (atom(i)?, atom(j)?);
                let u = (v3(b) - v3(a))
                    .try_normalize(MIN_LENGTH)
                    .ok_or_else(|| same(i, j))?;
                let up = up.unwrap_or_else(|| {
                    *[Axis::Z, Axis::Y, Axis::X]
                        .iter()
                        .min_by(|p, q| u[p.index()].abs().total_cmp(&u[q.index()].abs()))
                        .expect("three axes")
                });
                let e = Vector3::ith(up.index(), 1.0);
                let v = (e - u * e.dot(&u))
                    .try_normalize(MIN_LENGTH)
                    .ok_or_else(|| {
                        Error::input(format!(
                            "the bond {}–{} runs along {}, so --up {} fixes no plane",
                            i + 1,
                            j + 1,
                            NAMES[up.index()],
                            NAMES[up.index()]
                        ))
                        .with_hint("choose another --up axis")
                    })?;
                Ok(Plane {
                    origin: centroid(&[a, b]),
                    u: u.into(),
                    v: v.into(),
                    u_label: format!("u (atom {} → {})", i + 1, j + 1),
                    v_label: format!("v (towards +{})", NAMES[up.index()]),
                    description: format!(
                        "plane holding the bond {}–{} and the {} direction; origin at the bond midpoint",
                        i + 1,
                        j + 1,
                        NAMES[up.index()]
                    ),
                })
            }
        }
    }
}

fn same(i: usize, j: usize) -> Error {
    Error::input(format!("atoms {} and {} coincide", i + 1, j + 1))
}

/// A plane with orthonormal in-plane directions u and v (bohr throughout).
#[derive(Debug, Clone, PartialEq)]
pub struct Plane {
    pub origin: [f64; 3],
    pub u: [f64; 3],
    pub v: [f64; 3],
    /// Axis names for figures, e.g. "x" or "u (atom 1 → 2)".
    pub u_label: String,
    pub v_label: String,
    /// One line saying which plane this is, for captions.
    pub description: String,
}

impl Plane {
    pub fn point(&self, a: f64, b: f64) -> [f64; 3] {
        std::array::from_fn(|d| self.origin[d] + a * self.u[d] + b * self.v[d])
    }

    /// In-plane coordinates of a point and its signed distance from the plane.
    pub fn project(&self, p: [f64; 3]) -> (f64, f64, f64) {
        let r = v3(p) - v3(self.origin);
        let (u, v) = (v3(self.u), v3(self.v));
        (r.dot(&u), r.dot(&v), r.dot(&u.cross(&v)))
    }

    /// The window around the projected nuclei with `padding` (bohr) on every side,
    /// centred on them so the molecule's symmetry carries over to the pixels.
    pub fn window_around(&self, molecule: &Molecule, padding: f64) -> Window {
        let mut lo = [f64::INFINITY; 2];
        let mut hi = [f64::NEG_INFINITY; 2];
        for a in &molecule.atoms {
            let (x, y, _) = self.project(a.position);
            lo = [lo[0].min(x), lo[1].min(y)];
            hi = [hi[0].max(x), hi[1].max(y)];
        }
        Window::centred(
            [0.5 * (lo[0] + hi[0]), 0.5 * (lo[1] + hi[1])],
            hi[0] - lo[0] + 2.0 * padding,
            hi[1] - lo[1] + 2.0 * padding,
        )
    }
}

/// A rectangle in plane coordinates (bohr).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Window {
    pub u0: f64,
    pub u1: f64,
    pub v0: f64,
    pub v1: f64,
}

impl Window {
    pub fn centred(centre: [f64; 2], width: f64, height: f64) -> Self {
        Window {
            u0: centre[0] - 0.5 * width,
            u1: centre[0] + 0.5 * width,
            v0: centre[1] - 0.5 * height,
            v1: centre[1] + 0.5 * height,
        }
    }

    pub fn width(&self) -> f64 {
        self.u1 - self.u0
    }

    pub fn height(&self) -> f64 {
        self.v1 - self.v0
    }

    pub fn centre(&self) -> [f64; 2] {
        [0.5 * (self.u0 + self.u1), 0.5 * (self.v0 + self.v1)]
    }
}

/// One sample per pixel centre of an `nx` × `ny` image of a window; row 0 is the top
/// (largest v), as in the image.
#[derive(Debug, Clone, PartialEq)]
pub struct PixelGrid {
    pub plane: Plane,
    pub window: Window,
    pub nx: usize,
    pub ny: usize,
}

impl PixelGrid {
    /// Plane coordinates (bohr) of pixel centre (col, row).
    pub fn coords(&self, col: usize, row: usize) -> (f64, f64) {
        let w = &self.window;
        let du = w.width() / self.nx as f64;
        let dv = w.height() / self.ny as f64;
        (
            w.u0 + (col as f64 + 0.5) * du,
            w.v1 - (row as f64 + 0.5) * dv,
        )
    }

    /// Pixel position (fractional column, row of pixel centres) of plane coordinates.
    pub fn to_pixel(&self, a: f64, b: f64) -> (f64, f64) {
        let w = &self.window;
        (
            (a - w.u0) / w.width() * self.nx as f64 - 0.5,
            (w.v1 - b) / w.height() * self.ny as f64 - 0.5,
        )
    }

    /// Evaluates `eval` (points → `per_point` values each) at every pixel centre,
    /// rows in parallel; values come back row-major and interleaved per point.
    pub fn sample<E>(&self, per_point: usize, eval: E) -> Vec<f64>
    where
        E: Fn(&[[f64; 3]], &mut [f64]) + Sync,
    {
        use rayon::prelude::*;
        let mut out = vec![0.0; self.nx * self.ny * per_point];
        out.par_chunks_mut(self.nx * per_point)
            .enumerate()
            .for_each_init(Vec::new, |points, (row, chunk)| {
                self.row_points(row, points);
                eval(points, chunk);
            });
        out
    }

    /// The points of one row, left to right.
    pub fn row_points(&self, row: usize, out: &mut Vec<[f64; 3]>) {
        out.clear();
        for col in 0..self.nx {
            let (a, b) = self.coords(col, row);
            out.push(self.plane.point(a, b));
        }
    }
}

fn unit_vector(d: usize) -> [f64; 3] {
    let mut v = [0.0; 3];
    v[d] = 1.0;
    v
}

/// Positions are plain arrays between rooms; the vector algebra is nalgebra's.
fn v3(a: [f64; 3]) -> Vector3<f64> {
    Vector3::from(a)
}

/// Shorter directions (bohr) fix no plane: coincident or collinear atoms.
const MIN_LENGTH: f64 = 1e-6;

fn centroid(points: &[[f64; 3]]) -> [f64; 3] {
    std::array::from_fn(|d| points.iter().map(|p| p[d]).sum::<f64>() / points.len() as f64)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::chem::{Atom, elements::by_symbol};

    fn water_like() -> Molecule {
        let o = by_symbol("O").unwrap();
        let h = by_symbol("H").unwrap();
        let at = |element, position| Atom { element, position };
        Molecule::new(
            vec![
                at(o, [0.0, 0.0, 0.0]),
                at(h, [1.5, 0.0, 1.0]),
                at(h, [-1.5, 0.0, 1.0]),
            ],
            0,
        )
        .unwrap()
    }

    #[test]
    fn planes_parse_and_contain_their_atoms() {
        let m = water_like();
        assert_eq!(
            PlaneSpec::parse("xz@0.5", LengthUnit::Bohr).unwrap(),
            PlaneSpec::Axes {
                u: 0,
                v: 2,
                offset: 0.5
            }
        );
        assert!(PlaneSpec::parse("xq", LengthUnit::Bohr).is_err());
        assert!(PlaneSpec::parse("atoms:0,1", LengthUnit::Bohr).is_err());
        let p = PlaneSpec::parse("atoms:1,2,3", LengthUnit::Bohr)
            .unwrap()
            .resolve(&m, None)
            .unwrap();
        for a in &m.atoms {
            assert!(
                p.project(a.position).2.abs() < 1e-12,
                "atom lies in the plane"
            );
        }
        // The three atoms lie in y = 0, so the normal is ±y (geometry, common practice).
        assert!((v3(p.u).cross(&v3(p.v))[1].abs() - 1.0).abs() < 1e-12);
        let bond = PlaneSpec::Bond([1, 2]).resolve(&m, Some(Axis::Z)).unwrap();
        assert!((bond.v[2] - 1.0).abs() < 1e-12);
        assert!(PlaneSpec::Bond([1, 2]).resolve(&m, Some(Axis::X)).is_err());
        assert!(PlaneSpec::Bond([1, 7]).resolve(&m, None).is_err());
    }

    #[test]
    fn up_turns_an_axis_plane_or_is_refused() {
        let m = water_like();
        let xy = PlaneSpec::parse("xy", LengthUnit::Bohr).unwrap();
        // Default and --up y: x across, y up.
        let p = xy.resolve(&m, Some(Axis::Y)).unwrap();
        assert_eq!((p.u, p.v), ([1.0, 0.0, 0.0], [0.0, 1.0, 0.0]));
        // --up x: y across, x up.
        let p = xy.resolve(&m, Some(Axis::X)).unwrap();
        assert_eq!((p.u, p.v), ([0.0, 1.0, 0.0], [1.0, 0.0, 0.0]));
        assert_eq!((p.u_label.as_str(), p.v_label.as_str()), ("y", "x"));
        assert!(p.description.contains("x up"), "{}", p.description);
        // --up z is the normal of xy: refused, naming the plane.
        let e = xy.resolve(&m, Some(Axis::Z)).unwrap_err();
        assert!(e.message.contains("plane xy"), "{}", e.message);
        assert!(
            PlaneSpec::ThreeAtoms([0, 1, 2])
                .resolve(&m, Some(Axis::Z))
                .is_err()
        );
    }

    #[test]
    fn pixel_centres_are_symmetric_about_the_window_centre() {
        let m = water_like();
        let plane = PlaneSpec::parse("xz", LengthUnit::Bohr)
            .unwrap()
            .resolve(&m, None)
            .unwrap();
        let grid = PixelGrid {
            window: Window::centred([0.0, 0.0], 4.0, 2.0),
            plane,
            nx: 5,
            ny: 3,
        };
        assert_eq!(grid.coords(2, 1), (0.0, 0.0));
        let (a, b) = grid.coords(0, 0);
        assert!((a + 1.6).abs() < 1e-12 && (b - 2.0 / 3.0).abs() < 1e-12);
        let (c, r) = grid.to_pixel(a, b);
        assert!(c.abs() < 1e-12 && r.abs() < 1e-12);
    }
}
