//! Slater functions N r^(n−1) e^(−ζr) Y_lm, with real spherical harmonics Y_lm (l ≤ 3)
//! as in `harmonics`, evaluated exactly at points. N = (2ζ)^(n+1/2)/sqrt((2n)!)
//! normalises the radial part; Y_lm is normalised on the sphere.

use super::harmonics::{L_MAX, Polynomial, solid_harmonic};
use crate::error::{Error, Result};

/// Beyond ζr = this the function is below 1e-20 of its peak for n ≤ 6: screened out.
pub(crate) const SCREEN_ZETA_R: f64 = 60.0;

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
        for (p, pt) in points.iter().enumerate() {
            let d = [
                pt[0] - self.center[0],
                pt[1] - self.center[1],
                pt[2] - self.center[2],
            ];
            let r = (d[0] * d[0] + d[1] * d[1] + d[2] * d[2]).sqrt();
            let radial = self.radial(r, || (-self.zeta * r).exp());
            self.angular(d, radial, &mut out[p..], np);
        }
    }

    /// Values at `d.len()` points from their offsets `d` to the centre, distances `r`
    /// and `e` = e^(−ζr), which every shell with this centre and ζ shares (the s and p
    /// shells of a valence set): the same numbers `values` computes. `out` is
    /// functions × `stride`.
    pub(crate) fn values_shared(
        &self,
        d: &[[f64; 3]],
        r: &[f64],
        e: &[f64],
        out: &mut [f64],
        stride: usize,
    ) {
        if self.l == 0 {
            return self.values_shared_s(r, e, out, stride);
        }
        for (p, ((d, &r), &e)) in d.iter().zip(r).zip(e).enumerate() {
            let radial = self.radial(r, || e);
            self.angular(*d, radial, &mut out[p..], stride);
        }
    }

    /// `values_shared` for an s shell, function by function over the points: the
    /// same operations as `radial` and `angular` (r^0 is the 1.0 `powi_binary`
    /// returns), in loops without calls or data-dependent branches.
    fn values_shared_s(&self, r: &[f64], e: &[f64], out: &mut [f64], stride: usize) {
        let k = self.n as i32 - 1;
        let (zeta, norm) = (self.zeta, self.norm);
        for (f, h) in self.harmonics.iter().enumerate() {
            let c = h[0].0;
            let row = &mut out[f * stride..f * stride + r.len()];
            for ((o, &r), &e) in row.iter_mut().zip(r).zip(e) {
                let power = if k == 0 { 1.0 } else { powi_binary(r, k) };
                let radial = if zeta * r > SCREEN_ZETA_R {
                    0.0
                } else {
                    norm * power * e
                };
                *o = if radial == 0.0 { 0.0 } else { radial * c };
            }
        }
    }

    /// N r^(n−1−l) e^(−ζr), or 0 beyond the screening distance.
    #[inline(always)]
    fn radial(&self, r: f64, e: impl FnOnce() -> f64) -> f64 {
        if self.zeta * r > SCREEN_ZETA_R {
            0.0
        } else {
            self.norm * powi_binary(r, self.n as i32 - 1 - self.l as i32) * e()
        }
    }

    /// radial × Y_lm for every function into out[f·stride]; the polynomial sums its
    /// terms in the order and with the products `eval_polynomial` uses.
    #[inline(always)]
    fn angular(&self, d: [f64; 3], radial: f64, out: &mut [f64], stride: usize) {
        if self.l == 0 {
            // Y_00 is one constant term c·1·1·1 = c: the polynomial is c exactly.
            for (f, h) in self.harmonics.iter().enumerate() {
                out[f * stride] = if radial == 0.0 { 0.0 } else { radial * h[0].0 };
            }
            return;
        }
        let [px, py, pz] = d.map(powers);
        for (f, h) in self.harmonics.iter().enumerate() {
            out[f * stride] = if radial == 0.0 {
                0.0
            } else {
                radial
                    * h.iter()
                        .map(|(c, [a, b, e])| {
                            c * px[*a as usize] * py[*b as usize] * pz[*e as usize]
                        })
                        .sum::<f64>()
            };
        }
    }

    /// Gradients of every function at every point; `out` is functions × points like
    /// `values`. With φ = N R(r) P(x, y, z), R = r^k e^(−ζr), k = n − 1 − l and P the
    /// solid harmonic: ∇φ = N [R′(r) P r̂ + R ∇P], R′ = (k r^(k−1) − ζ r^k) e^(−ζr).
    /// At r = 0 the first term is taken as 0: for l ≥ 1 that is its limit (P ~ r^l),
    /// for s functions with k ≤ 1 the function has a cusp there and 0 is the
    /// symmetric choice. Points screened out by `values` get a zero gradient.
    pub fn gradients(&self, points: &[[f64; 3]], out: &mut [[f64; 3]]) {
        let np = points.len();
        let k = self.n as i32 - 1 - self.l as i32;
        for (p, pt) in points.iter().enumerate() {
            let d = [
                pt[0] - self.center[0],
                pt[1] - self.center[1],
                pt[2] - self.center[2],
            ];
            let r = (d[0] * d[0] + d[1] * d[1] + d[2] * d[2]).sqrt();
            if self.zeta * r > SCREEN_ZETA_R {
                for f in 0..self.harmonics.len() {
                    out[f * np + p] = [0.0; 3];
                }
                continue;
            }
            let e = self.norm * (-self.zeta * r).exp();
            let radial = e * r.powi(k);
            // N R′(r) and r̂; the product is taken as zero at r = 0 (see above).
            let rise = if k == 0 {
                0.0
            } else {
                k as f64 * r.powi(k - 1)
            };
            let slope = e * (rise - self.zeta * r.powi(k));
            let unit = if r == 0.0 { [0.0; 3] } else { d.map(|c| c / r) };
            for (f, h) in self.harmonics.iter().enumerate() {
                let (value, grad) = polynomial_with_gradient(h, d);
                out[f * np + p] =
                    std::array::from_fn(|i| slope * value * unit[i] + radial * grad[i]);
            }
        }
    }
}

/// [1, x, x², x³] with the products `f64::powi` makes for these exponents (x·x and
/// x·(x·x)), so tables replace calls without changing a bit (checked by test).
#[inline(always)]
pub(crate) fn powers(x: f64) -> [f64; 4] {
    let x2 = x * x;
    [1.0, x, x2, x * x2]
}

/// e^x, with the arguments where binary64 e^x underflows to exactly 0 answered
/// without the library's slow underflow path (e^−746 < 2^−1075, half the smallest
/// subnormal, rounds to 0): the same bits, checked by test.
#[inline(always)]
pub(crate) fn exp_neg(x: f64) -> f64 {
    if x < -746.0 { 0.0 } else { x.exp() }
}

/// x^n for n ≥ 0 by the binary powering `f64::powi` performs at run time
/// (compiler-builtins `__powidf2`), inlined: same bits, no call.
#[inline(always)]
pub(crate) fn powi_binary(x: f64, n: i32) -> f64 {
    let (mut a, mut k, mut acc) = (x, n.unsigned_abs(), 1.0);
    loop {
        if k & 1 != 0 {
            acc *= a;
        }
        k >>= 1;
        if k == 0 {
            break;
        }
        a *= a;
    }
    if n < 0 { 1.0 / acc } else { acc }
}

/// P(x, y, z) and ∇P for a polynomial given as (coefficient, powers) terms.
fn polynomial_with_gradient(poly: &Polynomial, d: [f64; 3]) -> (f64, [f64; 3]) {
    let mut value = 0.0;
    let mut grad = [0.0; 3];
    for (c, pw) in poly {
        let f: [f64; 3] = std::array::from_fn(|i| d[i].powi(pw[i] as i32));
        value += c * f[0] * f[1] * f[2];
        for i in 0..3 {
            if pw[i] > 0 {
                let (j, k) = ((i + 1) % 3, (i + 2) % 3);
                grad[i] += c * pw[i] as f64 * d[i].powi(pw[i] as i32 - 1) * f[j] * f[k];
            }
        }
    }
    (value, grad)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The tables must reproduce `powi` bit for bit (the premise of using them), over
    /// signs, tiny, huge and subnormal-producing magnitudes.
    #[test]
    fn power_tables_are_powi_bit_for_bit() {
        let mut xs = vec![0.0, -0.0, 1.0, -1.0, 1e-300, -3e-110, 1e100, 7.5e-3];
        let mut v = 0.123_456_789f64;
        for _ in 0..2000 {
            v = (v * 3.987_654_321 + 0.1).fract();
            xs.push((v - 0.5) * 40.0);
            xs.push((v - 0.5) * 1e-3);
        }
        for &x in &xs {
            let t = powers(x);
            for (n, v) in t.iter().enumerate() {
                assert_eq!(v.to_bits(), x.powi(n as i32).to_bits(), "{x}^{n}");
            }
            for k in [1.0, 5.0, 50.0, 700.0, 745.0, 745.2, 746.0, 800.0, 1e5] {
                let y = -k * x.abs();
                assert_eq!(exp_neg(y).to_bits(), y.exp().to_bits(), "exp({y})");
            }
            for n in -2..=7 {
                let want = x.powi(std::hint::black_box(n));
                assert_eq!(powi_binary(x, n).to_bits(), want.to_bits(), "{x}^{n}");
            }
        }
    }

    /// The hydrogen 1s function φ = e^(−r)/√π has ∇φ = −φ r̂ (closed form, textbook);
    /// only rounding separates the two, hence 1e-14.
    #[test]
    fn hydrogen_1s_gradient_is_minus_phi_times_r_hat() {
        let s = SlaterShell::s1(0, [0.5, -1.0, 0.25], 1.0).unwrap();
        let pts = [
            [1.5, -1.0, 0.25],
            [0.5, 0.3, -0.4],
            [-1.7, 2.2, 3.1],
            [0.51, -1.0, 0.25],
            [4.0, -6.0, 8.0],
        ];
        let mut g = vec![[0.0; 3]; pts.len()];
        s.gradients(&pts, &mut g);
        for (p, gp) in pts.iter().zip(&g) {
            let d: [f64; 3] = std::array::from_fn(|i| p[i] - s.center[i]);
            let r = (d[0] * d[0] + d[1] * d[1] + d[2] * d[2]).sqrt();
            let phi = (-r).exp() / std::f64::consts::PI.sqrt();
            for i in 0..3 {
                let expect = -phi * d[i] / r;
                assert!((gp[i] - expect).abs() <= 1e-14 * phi, "{p:?}: {gp:?}");
            }
        }
    }
}
