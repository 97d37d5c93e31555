//! Normalised 1s Slater functions, φ(r) = sqrt(ζ³/π) · exp(−ζ|r − C|).

use std::f64::consts::PI;

#[derive(Debug, Clone, PartialEq)]
pub struct Slater1s {
    /// Index of the atom the function sits on.
    pub atom: usize,
    /// Centre in bohr (a copy of the atom's position, kept here for fast evaluation).
    pub center: [f64; 3],
    /// Orbital exponent ζ in bohr⁻¹.
    pub zeta: f64,
}

impl Slater1s {
    pub fn norm(&self) -> f64 {
        (self.zeta.powi(3) / PI).sqrt()
    }

    /// Value at a point (bohr); result in bohr^(-3/2).
    pub fn value(&self, p: [f64; 3]) -> f64 {
        self.norm() * (-self.zeta * self.distance(p)).exp()
    }

    /// Values at many points, written to `out`; the normalisation is hoisted out of
    /// the loop because this is the grid hot path.
    pub fn values(&self, points: &[[f64; 3]], out: &mut [f64]) {
        let n = self.norm();
        for (o, p) in out.iter_mut().zip(points) {
            *o = n * (-self.zeta * self.distance(*p)).exp();
        }
    }

    fn distance(&self, p: [f64; 3]) -> f64 {
        let c = self.center;
        ((p[0] - c[0]).powi(2) + (p[1] - c[1]).powi(2) + (p[2] - c[2]).powi(2)).sqrt()
    }
}
