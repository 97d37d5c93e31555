//! Slater functions N r^(n−1) e^(−ζr) Y_lm, with real spherical harmonics Y_lm (l ≤ 3)
//! as in `harmonics`, evaluated exactly at points. N = (2ζ)^(n+1/2)/sqrt((2n)!)
//! normalises the radial part; Y_lm is normalised on the sphere.

use super::harmonics::{L_MAX, Polynomial, eval_polynomial, solid_harmonic};
use crate::error::{Error, Result};

/// Beyond ζr = this the function is below 1e-20 of its peak for n ≤ 6: screened out.
const SCREEN_ZETA_R: f64 = 60.0;

#[derive(Debug, Clone, PartialEq)]
pub struct SlaterShell {
    pub atom: usize,
    /// Centre in bohr (a copy of the atom's position, for fast evaluation).
    pub center: [f64; 3],
    pub n: u32,
    pub l: u32,
    /// Exponent ζ in bohr⁻¹.
    pub zeta: f64,
    /// The m values of the functions this shell carries, in order.
    pub ms: Vec<i32>,
    harmonics: Vec<Polynomial>,
    norm: f64,
}

impl SlaterShell {
    pub fn new(
        atom: usize,
        center: [f64; 3],
        n: u32,
        l: u32,
        zeta: f64,
        ms: Vec<i32>,
    ) -> Result<Self> {
        if !(1..=6).contains(&n) || l > L_MAX || l >= n {
            return Err(Error::input(format!(
                "Slater functions need 1 ≤ n ≤ 6 and l < n, l ≤ 3; got n = {n}, l = {l}"
            )));
        }
        if !(zeta.is_finite() && zeta > 0.0) {
            return Err(Error::input(format!(
                "Slater exponents must be positive, got {zeta}"
            )));
        }
        let harmonics = ms
            .iter()
            .map(|&m| {
                solid_harmonic(l, m)
                    .ok_or_else(|| Error::input(format!("m = {m} is out of range for l = {l}")))
            })
            .collect::<Result<Vec<_>>>()?;
        let fact: f64 = (1..=2 * n).map(f64::from).product();
        let norm = (2.0 * zeta).powf(n as f64 + 0.5) / fact.sqrt();
        Ok(SlaterShell {
            atom,
            center,
            n,
            l,
            zeta,
            ms,
            harmonics,
            norm,
        })
    }

    /// One 1s function.
    pub fn s1(atom: usize, center: [f64; 3], zeta: f64) -> Result<Self> {
        Self::new(atom, center, 1, 0, zeta, vec![0])
    }

    pub fn is_1s(&self) -> bool {
        self.n == 1 && self.l == 0
    }

    pub fn len(&self) -> usize {
        self.ms.len()
    }

    pub fn is_empty(&self) -> bool {
        self.ms.is_empty()
    }

    /// Values of every function at every point; `out` is functions × points.
    pub fn values(&self, points: &[[f64; 3]], out: &mut [f64]) {
        let np = points.len();
        let power = self.n as i32 - 1 - self.l as i32;
        for (p, pt) in points.iter().enumerate() {
            let (x, y, z) = (
                pt[0] - self.center[0],
                pt[1] - self.center[1],
                pt[2] - self.center[2],
            );
            let r = (x * x + y * y + z * z).sqrt();
            let radial = if self.zeta * r > SCREEN_ZETA_R {
                0.0
            } else {
                self.norm * r.powi(power) * (-self.zeta * r).exp()
            };
            for (f, h) in self.harmonics.iter().enumerate() {
                out[f * np + p] = if radial == 0.0 {
                    0.0
                } else {
                    radial * eval_polynomial(h, x, y, z)
                };
            }
        }
    }
}
