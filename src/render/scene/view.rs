//! Where the camera looks from: the `--view` forms, and the orthonormal screen axes
//! they give for a molecule.
//!
//! Conventions (common practice for molecule figures, our own wording):
//! * `+x` puts the camera on the +x side looking towards −x (a view *from* +x), so
//!   `+z` shows the xy plane as a textbook draws it (x right, y up).
//! * Screen up is +z unless the view is along z, then +y, so a +z lobe appears above
//!   its nucleus in side views. Explicit views use the same rule, with the preferred
//!   up made perpendicular to the line of sight.
//! * `atoms:I,J` looks down the bond from atom I towards atom J.
//! * `normal:I,J,K` looks onto the plane from the side where I → J → K turns
//!   counter-clockwise, i.e. from the side (J − I) × (K − I) points to.
//! * `turn_deg = [a, b]` then orbits the camera: first by a about the screen's
//!   horizontal axis (positive: the camera rises and looks down), then by b about its
//!   vertical axis (positive: the camera moves to the right).

use std::str::FromStr;

use super::auto;
use super::vec3::{V3, axis, cross, dot, norm, scale, sub, unit};
use crate::chem::Molecule;
use crate::error::{Error, Result};

/// Where the camera looks from; see the module notes for the conventions.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum ViewSpec {
    /// Along the axis of smallest spread of the nuclei, turned obliquely.
    Auto,
    /// From the positive or negative side of axis 0 (x), 1 (y) or 2 (z).
    Axis { axis: usize, positive: bool },
    /// Down the bond from atom I to atom J (numbers from 1).
    Atoms(usize, usize),
    /// Onto the plane of atoms I, J, K (numbers from 1).
    Normal(usize, usize, usize),
}

const FORMS: &str = "+x, -x, +y, -y, +z, -z, atoms:I,J, normal:I,J,K or auto \
                     (I, J, K atom numbers from 1)";

impl FromStr for ViewSpec {
    type Err = Error;

    fn from_str(s: &str) -> Result<Self> {
        let t = s.trim().to_ascii_lowercase();
        let bad = |why: &str| {
            Error::input(format!("view {s:?}: {why}"))
                .with_hint(format!("a view is one of {FORMS}"))
        };
        if t == "auto" {
            return Ok(ViewSpec::Auto);
        }
        if let [sign @ (b'+' | b'-'), a @ (b'x' | b'y' | b'z')] = t.as_bytes() {
            return Ok(ViewSpec::Axis {
                axis: (a - b'x') as usize,
                positive: *sign == b'+',
            });
        }
        let (kind, list) = t.split_once(':').ok_or_else(|| bad("unknown view"))?;
        let numbers = list
            .split(',')
            .map(|n| match n.trim().parse::<usize>() {
                Ok(0) => Err(bad("atoms are numbered from 1")),
                Ok(k) => Ok(k),
                Err(_) => Err(bad(&format!("{:?} is not an atom number", n.trim()))),
            })
            .collect::<Result<Vec<_>>>()?;
        let distinct = (1..numbers.len()).all(|i| !numbers[..i].contains(&numbers[i]));
        let spec = match (kind.trim(), numbers.as_slice()) {
            ("atoms", &[i, j]) => ViewSpec::Atoms(i, j),
            ("normal", &[i, j, k]) => ViewSpec::Normal(i, j, k),
            ("atoms", _) => return Err(bad("atoms: takes two atom numbers")),
            ("normal", _) => return Err(bad("normal: takes three atom numbers")),
            _ => return Err(bad("unknown view")),
        };
        if !distinct {
            return Err(bad("the atoms must be different"));
        }
        Ok(spec)
    }
}

/// A view: where from, an extra turn, and whether to draw in perspective.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct View {
    pub spec: ViewSpec,
    /// Degrees about the screen's horizontal axis, then its vertical axis.
    pub turn_deg: [f64; 2],
    pub perspective: bool,
}

/// Orthonormal screen axes in world space, right-handed as seen by the viewer:
/// `right × up = −forward`, with `forward` the direction the camera looks in.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Orientation {
    pub forward: [f64; 3],
    pub up: [f64; 3],
    pub right: [f64; 3],
}

impl Orientation {
    /// The orientation looking along `forward` with screen up as close to `up` as
    /// possible; `None` when the two are (nearly) parallel or zero.
    pub fn looking(forward: V3, up: V3) -> Option<Orientation> {
        let f = unit(forward)?;
        let perp = sub(up, scale(f, dot(up, f)));
        if norm(perp).is_nan() || norm(perp) <= 1e-6 * norm(up) {
            return None;
        }
        let u = unit(perp)?;
        Some(Orientation {
            forward: f,
            up: u,
            right: cross(f, u),
        })
    }

    /// Orbits the camera by `deg[0]` about the screen horizontal (positive: up) and
    /// then by `deg[1]` about the screen vertical (positive: to the right).
    pub fn turned(self, deg: [f64; 2]) -> Orientation {
        let (s, c) = deg[0].to_radians().sin_cos();
        let (f, up) = (self.forward, self.up);
        let forward = add_scaled(scale(f, c), up, -s);
        let up = add_scaled(scale(up, c), f, s);
        let (s, c) = deg[1].to_radians().sin_cos();
        let r = self.right;
        Orientation {
            forward: add_scaled(scale(forward, c), r, -s),
            up,
            right: add_scaled(scale(r, c), forward, s),
        }
    }
}

fn add_scaled(a: V3, b: V3, s: f64) -> V3 {
    [a[0] + s * b[0], a[1] + s * b[1], a[2] + s * b[2]]
}

/// Screen up for a line of sight: +z, or +y when looking (nearly) along z.
fn preferred_up(forward: V3) -> V3 {
    let f = unit(forward).unwrap_or(axis(0));
    if f[2].abs() > 0.99 { axis(1) } else { axis(2) }
}

impl View {
    /// The screen axes for this view of `molecule`. Errors: an atom number beyond
    /// the molecule, atoms at one place, three atoms on a line, a non-finite turn.
    pub fn orientation(&self, molecule: &Molecule) -> Result<Orientation> {
        if !self.turn_deg.iter().all(|t| t.is_finite()) {
            return Err(Error::input(format!(
                "the view turn {:?} degrees is not a finite angle",
                self.turn_deg
            )));
        }
        let atom = |i: usize| -> Result<V3> {
            match i.checked_sub(1).and_then(|k| molecule.atoms.get(k)) {
                Some(a) => Ok(a.position),
                None => Err(Error::input(format!(
                    "view: there is no atom {i}; the molecule has atoms 1 to {}",
                    molecule.atoms.len()
                ))),
            }
        };
        let base = match self.spec {
            ViewSpec::Auto => {
                return Ok(
                    auto::orientation(molecule).turned(add2(auto::DEFAULT_TURN_DEG, self.turn_deg))
                );
            }
            ViewSpec::Axis { axis: k, positive } => {
                if k > 2 {
                    return Err(Error::input(format!("view: axis {k} is not x, y or z")));
                }
                let f = scale(axis(k), if positive { -1.0 } else { 1.0 });
                looking_default(f)
            }
            ViewSpec::Atoms(i, j) => {
                let d = sub(atom(j)?, atom(i)?);
                if i == j || norm(d) < crate::chem::molecule::COINCIDENT_BOHR {
                    return Err(Error::input(format!(
                        "view atoms:{i},{j}: the two atoms are at one place, so they give no direction"
                    )));
                }
                looking_default(d)
            }
            ViewSpec::Normal(i, j, k) => {
                let (a, b, c) = (atom(i)?, atom(j)?, atom(k)?);
                let (u, v) = (sub(b, a), sub(c, a));
                let n = cross(u, v);
                // sin of the angle at I below 1e-4 (0.006°): no plane to speak of.
                if norm(n) <= 1e-4 * norm(u) * norm(v) || norm(u) == 0.0 || norm(v) == 0.0 {
                    return Err(Error::input(format!(
                        "view normal:{i},{j},{k}: the three atoms lie on a line, so they span no plane"
                    ))
                    .with_hint("pick three atoms that are not in a row, or use atoms:I,J"));
                }
                looking_default(scale(n, -1.0))
            }
        };
        Ok(if self.turn_deg == [0.0, 0.0] {
            base
        } else {
            base.turned(self.turn_deg)
        })
    }
}

fn add2(a: [f64; 2], b: [f64; 2]) -> [f64; 2] {
    [a[0] + b[0], a[1] + b[1]]
}

/// Looks along `forward` (non-zero) with the preferred up; never fails because the
/// preferred up is chosen away from the line of sight.
fn looking_default(forward: V3) -> Orientation {
    Orientation::looking(forward, preferred_up(forward))
        .or_else(|| Orientation::looking(forward, axis(0)))
        .expect("a non-zero direction has a perpendicular among +y, +z, +x")
}
