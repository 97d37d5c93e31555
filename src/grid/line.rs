//! Lines for profiles: from one end point to another (an atom or a point), extended
//! beyond both ends, sampled evenly.

use crate::chem::{LengthUnit, Molecule};
use crate::error::{Error, Result};

#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Endpoint {
    /// An atom, 0-based.
    Atom(usize),
    /// A point in bohr.
    Point([f64; 3]),
}

impl Endpoint {
    /// `atom:N` (from 1) or `x,y,z` (in `unit`).
    pub fn parse(text: &str, unit: LengthUnit) -> Result<Self> {
        let t = text.trim();
        let bad = || {
            Error::input(format!("cannot read the end point {text:?}"))
                .with_hint("give atom:N (atoms numbered from 1) or x,y,z")
        };
        if let Some(n) = t.strip_prefix("atom:") {
            return match n.trim().parse::<usize>() {
                Ok(n) if n >= 1 => Ok(Endpoint::Atom(n - 1)),
                _ => Err(bad()),
            };
        }
        let xs = t
            .split(',')
            .map(|s| s.trim().parse::<f64>().ok().filter(|v| v.is_finite()))
            .collect::<Option<Vec<_>>>()
            .ok_or_else(bad)?;
        match xs[..] {
            [x, y, z] => Ok(Endpoint::Point([x, y, z].map(|v| unit.to_bohr(v)))),
            _ => Err(bad()),
        }
    }

    pub fn position(&self, molecule: &Molecule) -> Result<[f64; 3]> {
        match *self {
            Endpoint::Point(p) => Ok(p),
            Endpoint::Atom(i) => molecule.atoms.get(i).map(|a| a.position).ok_or_else(|| {
                Error::input(format!(
                    "there is no atom {} here: the molecule has {} atoms",
                    i + 1,
                    molecule.atoms.len()
                ))
            }),
        }
    }
}

/// A segment from `start` to `end` (bohr), extended by `extend` beyond each end.
#[derive(Debug, Clone, PartialEq)]
pub struct Line {
    pub start: [f64; 3],
    pub end: [f64; 3],
    pub extend: f64,
}

impl Line {
    pub fn new(start: [f64; 3], end: [f64; 3], extend: f64) -> Result<Self> {
        if !(extend.is_finite() && extend >= 0.0) {
            return Err(Error::input(format!(
                "--extend must be zero or positive, got {extend} bohr"
            )));
        }
        let line = Line { start, end, extend };
        if line.length() < 1e-6 {
            return Err(Error::input("the two end points of the line coincide"));
        }
        Ok(line)
    }

    pub fn length(&self) -> f64 {
        crate::chem::molecule::distance(self.start, self.end)
    }

    fn direction(&self) -> [f64; 3] {
        let l = self.length();
        std::array::from_fn(|d| (self.end[d] - self.start[d]) / l)
    }

    /// The point at distance `s` (bohr) from `start` towards `end`.
    pub fn point(&self, s: f64) -> [f64; 3] {
        let u = self.direction();
        std::array::from_fn(|d| self.start[d] + s * u[d])
    }

    /// `n` ≥ 2 evenly spaced distances s from −extend to length + extend; each is
    /// computed as s₀ + i·step so none accumulates rounding.
    pub fn distances(&self, n: usize) -> Vec<f64> {
        let (a, b) = (-self.extend, self.length() + self.extend);
        let step = (b - a) / (n.max(2) - 1) as f64;
        (0..n.max(2)).map(|i| a + i as f64 * step).collect()
    }

    /// Atoms within `tolerance` (bohr) of the sampled stretch: (atom index, s, distance
    /// from the line), ordered along it.
    pub fn nuclei_near(&self, molecule: &Molecule, tolerance: f64) -> Vec<(usize, f64, f64)> {
        let u = self.direction();
        let mut out: Vec<(usize, f64, f64)> = molecule
            .atoms
            .iter()
            .enumerate()
            .filter_map(|(i, a)| {
                let r: [f64; 3] = std::array::from_fn(|d| a.position[d] - self.start[d]);
                let s = r[0] * u[0] + r[1] * u[1] + r[2] * u[2];
                let off = crate::chem::molecule::distance(a.position, self.point(s));
                let inside = s >= -self.extend - 1e-9 && s <= self.length() + self.extend + 1e-9;
                (inside && off <= tolerance).then_some((i, s, off))
            })
            .collect();
        out.sort_by(|a, b| a.1.total_cmp(&b.1));
        out
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn endpoints_and_samples() {
        assert_eq!(
            Endpoint::parse("atom:2", LengthUnit::Bohr).unwrap(),
            Endpoint::Atom(1)
        );
        assert!(Endpoint::parse("atom:0", LengthUnit::Bohr).is_err());
        assert!(Endpoint::parse("1,2", LengthUnit::Bohr).is_err());
        let line = Line::new([0.0, 0.0, -1.0], [0.0, 0.0, 1.0], 1.0).unwrap();
        let s = line.distances(5);
        assert_eq!(s, vec![-1.0, 0.0, 1.0, 2.0, 3.0]);
        assert_eq!(line.point(3.0), [0.0, 0.0, 2.0]);
        assert!(Line::new([0.0; 3], [0.0; 3], 0.0).is_err());
        assert!(Line::new([0.0; 3], [1.0, 0.0, 0.0], -1.0).is_err());
    }
}
