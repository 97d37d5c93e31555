//! Contracted Gaussian shells: Cartesian (each component x^a y^b z^c e^(−αr²)
//! normalised as it stands) or pure (real solid harmonics), contraction coefficients
//! multiplying normalised primitives, and the contracted function renormalised to 1.
//!
//! Internally a shell is Σ_k d_k e^(−α_k r²) times, for each of its functions, a fixed
//! combination of the Cartesian monomials of degree l (`rows`). The d_k fold in the
//! radial normalisation (2α/π)^(3/4) (4α)^(l/2) shared by every component; the rows
//! carry the α-independent angular factors. Integrals and grid evaluation both work
//! on this form, shell by shell.

use super::harmonics::{cartesian_components, double_factorial_odd, solid_harmonic};
use super::slater::{exp_neg, powers};
use crate::error::{Error, Result};
use std::f64::consts::PI;

#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Angular {
    /// Cartesian component with these powers, normalised as it stands.
    Cartesian([u32; 3]),
    /// Cartesian component scaled like x^l of its shell (the convention QCSchema
    /// documents take from the CCA standard): of a d shell, xx has norm 1 and xy 1/3.
    /// Kept as read so a document's coefficients go back out unchanged.
    CartesianShared([u32; 3]),
    /// Real solid harmonic of this m.
    Pure(i32),
}

impl Angular {
    /// The factor s with φ(this) = s · φ(the same component normalised as it stands):
    /// √(Π(2pᵢ−1)!! / (2l−1)!!) for a shared-scale component, 1 otherwise.
    pub fn own_norm_factor(self) -> f64 {
        match self {
            Angular::CartesianShared(p) => {
                let l = p.iter().sum::<u32>();
                (p.iter().map(|&k| double_factorial_odd(k)).product::<f64>()
                    / double_factorial_odd(l))
                .sqrt()
            }
            _ => 1.0,
        }
    }

    /// The Cartesian powers of a Cartesian component, either scaling.
    pub fn powers(self) -> Option<[u32; 3]> {
        match self {
            Angular::Cartesian(p) | Angular::CartesianShared(p) => Some(p),
            Angular::Pure(_) => None,
        }
    }
}

#[derive(Debug, Clone, PartialEq)]
pub struct GaussianShell {
    pub atom: usize,
    pub center: [f64; 3],
    pub l: u32,
    /// (exponent, coefficient of the normalised primitive) as given by the basis set.
    pub primitives: Vec<(f64, f64)>,
    /// The exponents alone, for the integral engine.
    pub exponents: Vec<f64>,
    /// The functions this shell contributes, in order.
    pub functions: Vec<Angular>,
    /// Scaled contraction coefficients d_k (see the module doc).
    pub d: Vec<f64>,
    /// One row per function over `cartesian_components(l)`.
    pub rows: Vec<Vec<f64>>,
}

/// Most primitives one contracted shell may have. Published contractions use at
/// most a few dozen (common practice); the integral work of a shell pair grows as
/// the product of their primitive counts, so a shell of thousands would make small
/// inputs run for minutes.
pub const MAX_PRIMITIVES: usize = 100;

/// (2α/π)^(3/4) (4α)^(l/2): the α-dependent factor of a normalised Cartesian primitive.
fn radial_norm(alpha: f64, l: u32) -> f64 {
    (2.0 * alpha / PI).powf(0.75) * (4.0 * alpha).powf(0.5 * l as f64)
}

/// Ratio of the pure normalisation sqrt(2(2α)^(l+3/2)/Γ(l+3/2)) to `radial_norm`,
/// which does not depend on α.
fn pure_factor(l: u32) -> f64 {
    let gamma = double_factorial_odd(l + 1) * PI.sqrt() / 2f64.powi(l as i32 + 1);
    (2.0 * 2f64.powf(l as f64 + 1.5) / gamma).sqrt() / radial_norm(1.0, l)
}

impl GaussianShell {
    /// Builds a shell. `functions` lists which components it carries; every one must
    /// have angular momentum `l`.
    pub fn new(
        atom: usize,
        center: [f64; 3],
        l: u32,
        primitives: Vec<(f64, f64)>,
        functions: Vec<Angular>,
    ) -> Result<Self> {
        if l > super::harmonics::L_MAX {
            return Err(Error::input(format!(
                "Gaussian functions up to l = 3 are supported, got l = {l}"
            )));
        }
        if primitives.is_empty() {
            return Err(Error::input(
                "a Gaussian function needs at least one primitive",
            ));
        }
        if primitives.len() > MAX_PRIMITIVES {
            return Err(Error::input(format!(
                "a Gaussian shell may have 1 to {MAX_PRIMITIVES} primitives, this one has {}",
                primitives.len()
            )));
        }
        for (a, c) in &primitives {
            if !(a.is_finite() && *a > 0.0) {
                return Err(Error::input(format!(
                    "Gaussian exponents must be positive, got {a}"
                )));
            }
            if !c.is_finite() {
                return Err(Error::input(format!(
                    "contraction coefficient {c} is not finite"
                )));
            }
        }
        let comps = cartesian_components(l);
        let mut rows = Vec::with_capacity(functions.len());
        for f in &functions {
            let mut row = vec![0.0; comps.len()];
            match *f {
                Angular::Cartesian(p) | Angular::CartesianShared(p) => {
                    if p.iter().sum::<u32>() != l {
                        return Err(Error::input(format!("powers {p:?} do not sum to l = {l}")));
                    }
                    let i = comps
                        .iter()
                        .position(|c| *c == p)
                        .expect("components cover every power triple");
                    row[i] = f.own_norm_factor()
                        / (double_factorial_odd(p[0])
                            * double_factorial_odd(p[1])
                            * double_factorial_odd(p[2]))
                        .sqrt();
                }
                Angular::Pure(m) => {
                    let poly = solid_harmonic(l, m).ok_or_else(|| {
                        Error::input(format!("m = {m} is out of range for l = {l}"))
                    })?;
                    for (c, p) in poly {
                        let i = comps
                            .iter()
                            .position(|q| *q == p)
                            .expect("harmonic terms have degree l");
                        row[i] += c * pure_factor(l);
                    }
                }
            }
            rows.push(row);
        }
        // Self-overlap of the contraction of normalised primitives; the same for every
        // component of the shell.
        let e = l as f64 + 1.5;
        let mut self_overlap = 0.0;
        for (ai, ci) in &primitives {
            for (aj, cj) in &primitives {
                self_overlap += ci * cj * (2.0 * (ai * aj).sqrt() / (ai + aj)).powf(e);
            }
        }
        if self_overlap.is_nan() || self_overlap <= 0.0 {
            return Err(Error::input(
                "the contraction coefficients give a function of zero norm",
            ));
        }
        let renorm = 1.0 / self_overlap.sqrt();
        let d = primitives
            .iter()
            .map(|(a, c)| c * radial_norm(*a, l) * renorm)
            .collect();
        let exponents = primitives.iter().map(|p| p.0).collect();
        Ok(GaussianShell {
            atom,
            center,
            l,
            primitives,
            exponents,
            functions,
            d,
            rows,
        })
    }

    /// Every function of angular momentum l: pure (2l+1) or Cartesian ((l+1)(l+2)/2).
    pub fn full(
        atom: usize,
        center: [f64; 3],
        l: u32,
        primitives: Vec<(f64, f64)>,
        pure: bool,
    ) -> Result<Self> {
        let functions = if pure {
            (-(l as i32)..=l as i32).map(Angular::Pure).collect()
        } else {
            cartesian_components(l)
                .into_iter()
                .map(Angular::Cartesian)
                .collect()
        };
        Self::new(atom, center, l, primitives, functions)
    }

    pub fn len(&self) -> usize {
        self.functions.len()
    }

    pub fn is_empty(&self) -> bool {
        self.functions.is_empty()
    }

    /// Values of every function at every point, direct evaluation; `out` is
    /// functions × points (function-major).
    pub fn values(&self, points: &[[f64; 3]], out: &mut [f64]) {
        let n = points.len();
        for (p, pt) in points.iter().enumerate() {
            let d = [
                pt[0] - self.center[0],
                pt[1] - self.center[1],
                pt[2] - self.center[2],
            ];
            let r2 = d[0] * d[0] + d[1] * d[1] + d[2] * d[2];
            let radial: f64 = self
                .primitives
                .iter()
                .zip(&self.d)
                .map(|((a, _), d)| d * exp_neg(-a * r2))
                .sum();
            self.angular(d, radial, &mut out[p..], n);
        }
    }

    /// Values at `d.len()` points from their offsets `d` to the centre and the
    /// primitives' e^(−α_k r²) (`ex`, primitive-major with stride `ex_stride`), which
    /// every shell with this centre and these exponents shares (the s and p shells
    /// of an sp set): the same numbers `values` computes. `out` is functions × `stride`.
    pub(crate) fn values_shared(
        &self,
        d: &[[f64; 3]],
        ex: &[f64],
        ex_stride: usize,
        out: &mut [f64],
        stride: usize,
    ) {
        for (p, d) in d.iter().enumerate() {
            let radial: f64 = self
                .d
                .iter()
                .enumerate()
                .map(|(k, d)| d * ex[k * ex_stride + p])
                .sum();
            self.angular(*d, radial, &mut out[p..], stride);
        }
    }

    /// radial × (row · monomials) for every function into out[f·stride]; monomials
    /// from power tables with the products `powi` makes (see `slater::powers`).
    #[inline(always)]
    fn angular(&self, d: [f64; 3], radial: f64, out: &mut [f64], stride: usize) {
        if self.l == 0 {
            // The one monomial is 1.0: the row sum is its single term, exactly.
            for (f, row) in self.rows.iter().enumerate() {
                out[f * stride] = radial * row[0];
            }
            return;
        }
        let [px, py, pz] = d.map(powers);
        let comps = CARTESIAN[self.l as usize];
        let mut mono = [0.0; 10];
        for (m, c) in mono.iter_mut().zip(comps.iter()) {
            *m = px[c[0] as usize] * py[c[1] as usize] * pz[c[2] as usize];
        }
        for (f, row) in self.rows.iter().enumerate() {
            out[f * stride] = radial * row.iter().zip(&mono).map(|(r, m)| r * m).sum::<f64>();
        }
    }
}

/// `cartesian_components(l)` for l ≤ 3 as constants, so the hot path does not
/// allocate them.
pub(crate) const CARTESIAN: [&[[u32; 3]]; 4] = [
    &[[0, 0, 0]],
    &[[1, 0, 0], [0, 1, 0], [0, 0, 1]],
    &[
        [2, 0, 0],
        [1, 1, 0],
        [1, 0, 1],
        [0, 2, 0],
        [0, 1, 1],
        [0, 0, 2],
    ],
    &[
        [3, 0, 0],
        [2, 1, 0],
        [2, 0, 1],
        [1, 2, 0],
        [1, 1, 1],
        [1, 0, 2],
        [0, 3, 0],
        [0, 2, 1],
        [0, 1, 2],
        [0, 0, 3],
    ],
];

impl GaussianShell {
    /// Gradients of every function at every point; `out` is functions × points like
    /// `values`. Per primitive, ∂/∂x [x^a y^b z^c e^(−αr²)] = (a x^(a−1) − 2α x^(a+1))
    /// y^b z^c e^(−αr²); summed over primitives this is E ∇M + M E′ r⃗ with
    /// E = Σ d_k e^(−α_k r²), E′ = −2 Σ α_k d_k e^(−α_k r²) and M the `rows`
    /// combination of monomials, so the same rows serve values and gradients.
    pub fn gradients(&self, points: &[[f64; 3]], out: &mut [[f64; 3]]) {
        let n = points.len();
        let comps = cartesian_components(self.l);
        // Per component: the monomial and its three partial derivatives.
        let mut mono = vec![0.0; comps.len()];
        let mut dmono = vec![[0.0; 3]; comps.len()];
        for (p, pt) in points.iter().enumerate() {
            let r = [
                pt[0] - self.center[0],
                pt[1] - self.center[1],
                pt[2] - self.center[2],
            ];
            let r2 = r[0] * r[0] + r[1] * r[1] + r[2] * r[2];
            let (mut e, mut de) = (0.0, 0.0);
            for ((a, _), d) in self.primitives.iter().zip(&self.d) {
                let g = d * (-a * r2).exp();
                e += g;
                de -= 2.0 * a * g;
            }
            for ((m, dm), c) in mono.iter_mut().zip(dmono.iter_mut()).zip(&comps) {
                let pw = |i: usize, k: u32| r[i].powi(k as i32);
                let f = [pw(0, c[0]), pw(1, c[1]), pw(2, c[2])];
                *m = f[0] * f[1] * f[2];
                for i in 0..3 {
                    let deriv = if c[i] == 0 {
                        0.0
                    } else {
                        c[i] as f64 * pw(i, c[i] - 1)
                    };
                    let (j, k) = ((i + 1) % 3, (i + 2) % 3);
                    dm[i] = deriv * f[j] * f[k];
                }
            }
            for (f, row) in self.rows.iter().enumerate() {
                let mut m = 0.0;
                let mut dm = [0.0; 3];
                for ((w, mv), dv) in row.iter().zip(&mono).zip(&dmono) {
                    m += w * mv;
                    for i in 0..3 {
                        dm[i] += w * dv[i];
                    }
                }
                out[f * n + p] = std::array::from_fn(|i| e * dm[i] + de * m * r[i]);
            }
        }
    }
}

/// Contributions below this (absolute, for functions normalised to 1) are skipped on
/// a slab or a line; far below the 1e-5 printed precision of a cube file.
pub const SCREEN: f64 = 1e-17;

impl GaussianShell {
    /// Values on a slab of an axis-aligned lattice (x fixed; all y × z, z fastest),
    /// using separability: e^(−αr²) = e^(−αx²) e^(−αy²) e^(−αz²), so each primitive
    /// needs only ny + nz exponentials per slab instead of ny × nz. Primitives and
    /// lines whose contribution is below `SCREEN` are skipped. `out` is
    /// functions × (ny·nz), overwritten.
    pub fn values_lattice(&self, x: f64, ys: &[f64], zs: &[f64], out: &mut [f64]) {
        let (ny, nz) = (ys.len(), zs.len());
        let n = ny * nz;
        out[..self.len() * n].fill(0.0);
        let l = self.l as usize;
        let comps = cartesian_components(self.l);
        let dx = x - self.center[0];
        let mut ytab = vec![0.0; (l + 1) * ny];
        let mut ztab = vec![0.0; (l + 1) * nz];
        for ((alpha, _), d) in self.primitives.iter().zip(&self.d) {
            let ex = d * (-alpha * dx * dx).exp();
            let xpow: Vec<f64> = (0..=l).map(|a| ex * dx.powi(a as i32)).collect();
            let xmax = xpow.iter().fold(0.0f64, |m, v| m.max(v.abs()));
            if xmax < SCREEN {
                continue;
            }
            fill_axis(&mut ytab, ys, self.center[1], *alpha, l);
            fill_axis(&mut ztab, zs, self.center[2], *alpha, l);
            let zmax = ztab.iter().fold(0.0f64, |m, v| m.max(v.abs()));
            for j in 0..ny {
                let ymax = (0..=l).fold(0.0f64, |m, b| m.max(ytab[b * ny + j].abs()));
                if xmax * ymax * zmax < SCREEN {
                    continue;
                }
                for (ci, c) in comps.iter().enumerate() {
                    let coef = xpow[c[0] as usize] * ytab[c[1] as usize * ny + j];
                    if coef == 0.0 {
                        continue;
                    }
                    let zrow = &ztab[c[2] as usize * nz..(c[2] as usize + 1) * nz];
                    for (f, row) in self.rows.iter().enumerate() {
                        let w = row[ci] * coef;
                        if w != 0.0 {
                            let dst = &mut out[f * n + j * nz..f * n + (j + 1) * nz];
                            for (o, zv) in dst.iter_mut().zip(zrow) {
                                *o += w * zv;
                            }
                        }
                    }
                }
            }
        }
    }
}

/// table[p·len + i] = (t_i − c)^p e^(−α (t_i − c)²) for p = 0..=l.
fn fill_axis(table: &mut [f64], ts: &[f64], c: f64, alpha: f64, l: usize) {
    let len = ts.len();
    for (i, t) in ts.iter().enumerate() {
        let d = t - c;
        let mut v = (-alpha * d * d).exp();
        for p in 0..=l {
            table[p * len + i] = v;
            v *= d;
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The constant table is the one `harmonics` builds (the order the rows use).
    #[test]
    fn cartesian_table_matches_harmonics() {
        for l in 0..=3u32 {
            assert_eq!(CARTESIAN[l as usize], cartesian_components(l).as_slice());
        }
    }
}
