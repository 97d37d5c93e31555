//! Overlaps of Slater s and p functions (any n) on two centres, for the valence
//! basis of extended Hückel.
//!
//! In the bond frame (A at −R/2, B at +R/2 on z) only the σ/π pairs (s|s), (s|pσ),
//! (pσ|s), (pσ|pσ) and (pπ|pπ) are nonzero. Each is a two-dimensional integral in
//! prolate spheroidal coordinates λ = (r_A + r_B)/R ∈ [1, ∞), μ = (r_A − r_B)/R ∈
//! [−1, 1], with the φ integral done by hand (2π for σ, π for π). In these
//! coordinates the integrand is a polynomial in λ, μ times e^(−(R/2)[(ζA+ζB)λ +
//! (ζA−ζB)μ]), so Gauss–Legendre in μ and on panels in λ converges to ~1e-13 with
//! the rule below; the tests check it against closed forms and a separate
//! cylindrical quadrature. Outside the bond frame, p functions rotate as vectors.

use std::f64::consts::PI;
use std::sync::OnceLock;

use nalgebra::DMatrix;

use crate::basis::{Basis, Shell, SlaterShell};
use crate::chem::molecule::distance;
use crate::error::{Error, Result};
use crate::numerics::quadrature::{composite, gauss_legendre};

/// Beyond R·min(ζ) = this every overlap is below 1e-22: taken as zero.
const SCREEN: f64 = 60.0;
/// λ − 1 is integrated up to where the exponential has fallen by e^(−TAIL).
const TAIL: f64 = 70.0;

/// The bond-frame overlaps of one shell pair (only the ones its l values allow).
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct BondFrame {
    /// (s|s), (s|pσ), (pσ|s) or (pσ|pσ) by the shells' l; pσ points from A to B (+z).
    pub sigma: f64,
    /// (pπ|pπ), for two p shells.
    pub pi: f64,
}

/// (node, weight) pairs of one quadrature rule.
type Rule = Vec<(f64, f64)>;

/// The λ-panel and μ rules, computed once.
fn rules() -> &'static (Rule, Rule) {
    static RULES: OnceLock<(Rule, Rule)> = OnceLock::new();
    RULES.get_or_init(|| (gauss_legendre(24), gauss_legendre(32)))
}

fn radial_norm(n: u32, zeta: f64) -> f64 {
    let fact: f64 = (1..=2 * n).map(f64::from).product();
    (2.0 * zeta).powf(n as f64 + 0.5) / fact.sqrt()
}

/// Bond-frame overlaps of shell a (on A, l ≤ 1) and shell b (on B, l ≤ 1) at R > 0.
pub fn bond_frame(na: u32, la: u32, za: f64, nb: u32, lb: u32, zb: f64, r: f64) -> BondFrame {
    if r * za.min(zb) > SCREEN {
        return BondFrame::default();
    }
    let (gl_lambda, gl_mu) = rules();
    let h = 0.5 * r;
    // Relative to its value at λ = 1 the integrand falls as e^(−(R/2)(ζA+ζB)(λ−1)).
    let t_max = TAIL / (h * (za + zb));
    let lambdas = composite(0.0, t_max, 24, gl_lambda);
    let (ca, cb) = (radial_norm(na, za), radial_norm(nb, zb));
    let ang_s = (1.0 / (4.0 * PI)).sqrt();
    let ang_p = (3.0 / (4.0 * PI)).sqrt();
    let (mut sigma, mut pi) = (0.0, 0.0);
    for &(t, wl) in &lambdas {
        let lam = 1.0 + t;
        for &(mu, wm) in gl_mu {
            let ra = h * (lam + mu);
            let rb = h * (lam - mu);
            let e = (-h * ((za + zb) * lam + (za - zb) * mu)).exp();
            let jac = h * h * h * (lam * lam - mu * mu) * wl * wm;
            // Each function's radial power times its angular factor, as polynomials:
            // s: r^(n−1)/√4π; pσ: r^(n−2)·z'·√(3/4π); pπ: r^(n−2)·ρ cos φ·√(3/4π).
            let fa = |l: u32, rr: f64, zrel: f64| match l {
                0 => rr.powi(na as i32 - 1) * ang_s,
                _ => rr.powi(na as i32 - 2) * zrel * ang_p,
            };
            let fb = |l: u32, rr: f64, zrel: f64| match l {
                0 => rr.powi(nb as i32 - 1) * ang_s,
                _ => rr.powi(nb as i32 - 2) * zrel * ang_p,
            };
            let za_rel = h * (lam * mu + 1.0);
            let zb_rel = h * (lam * mu - 1.0);
            let w = jac * e * ca * cb;
            sigma += w * fa(la, ra, za_rel) * fb(lb, rb, zb_rel) * 2.0 * PI;
            if la == 1 && lb == 1 {
                let rho2 = h * h * (lam * lam - 1.0) * (1.0 - mu * mu);
                let pa = ra.powi(na as i32 - 2) * ang_p;
                let pb = rb.powi(nb as i32 - 2) * ang_p;
                pi += w * pa * pb * rho2 * PI;
            }
        }
    }
    BondFrame { sigma, pi }
}

/// Cartesian direction of the real p function with quantum number m (y, z, x for
/// m = −1, 0, +1, as in `basis::harmonics`).
fn p_direction(m: i32) -> [f64; 3] {
    match m {
        -1 => [0.0, 1.0, 0.0],
        0 => [0.0, 0.0, 1.0],
        _ => [1.0, 0.0, 0.0],
    }
}

fn dot(a: [f64; 3], b: [f64; 3]) -> f64 {
    nalgebra::Vector3::from(a).dot(&nalgebra::Vector3::from(b))
}

/// Overlap block of two Slater shells (functions of a × functions of b, row-major).
pub fn shell_pair(a: &SlaterShell, b: &SlaterShell) -> Result<Vec<f64>> {
    if a.l > 1 || b.l > 1 {
        return Err(Error::input(
            "Slater overlaps are available for s and p functions only",
        ));
    }
    let r = distance(a.center, b.center);
    let mut out = vec![0.0; a.len() * b.len()];
    if r < 1e-10 {
        // One centre: different l or m are orthogonal; same l, m overlap radially.
        if a.l == b.l {
            let n = (a.n + b.n) as i32;
            let fact: f64 = (1..=n).map(f64::from).product();
            let radial = radial_norm(a.n, a.zeta) * radial_norm(b.n, b.zeta) * fact
                / (a.zeta + b.zeta).powi(n + 1);
            for (i, ma) in a.ms.iter().enumerate() {
                for (j, mb) in b.ms.iter().enumerate() {
                    if ma == mb {
                        out[i * b.len() + j] = radial;
                    }
                }
            }
        }
        return Ok(out);
    }
    let axis = [
        (b.center[0] - a.center[0]) / r,
        (b.center[1] - a.center[1]) / r,
        (b.center[2] - a.center[2]) / r,
    ];
    let f = bond_frame(a.n, a.l, a.zeta, b.n, b.l, b.zeta, r);
    for (i, &ma) in a.ms.iter().enumerate() {
        for (j, &mb) in b.ms.iter().enumerate() {
            out[i * b.len() + j] = match (a.l, b.l) {
                (0, 0) => f.sigma,
                (0, _) => dot(p_direction(mb), axis) * f.sigma,
                (_, 0) => dot(p_direction(ma), axis) * f.sigma,
                _ => {
                    let (u, v) = (p_direction(ma), p_direction(mb));
                    let (ue, ve) = (dot(u, axis), dot(v, axis));
                    ue * ve * f.sigma + (dot(u, v) - ue * ve) * f.pi
                }
            };
        }
    }
    Ok(out)
}

/// The overlap matrix of a basis of Slater s and p shells, shell pairs in parallel.
pub fn slater_overlap_matrix(basis: &Basis) -> Result<DMatrix<f64>> {
    use rayon::prelude::*;
    let shells: Vec<&SlaterShell> = basis
        .shells
        .iter()
        .map(|s| match s {
            Shell::Slater(s) => Ok(s),
            Shell::Gaussian(_) => Err(Error::input(
                "Slater overlaps need a basis of Slater functions only",
            )),
        })
        .collect::<Result<_>>()?;
    let offsets = basis.offsets();
    let pairs: Vec<(usize, usize)> = (0..shells.len())
        .flat_map(|i| (i..shells.len()).map(move |j| (i, j)))
        .collect();
    let blocks = pairs
        .par_iter()
        .map(|&(i, j)| shell_pair(shells[i], shells[j]))
        .collect::<Result<Vec<_>>>()?;
    let n = basis.len();
    let mut m = DMatrix::zeros(n, n);
    for (&(i, j), b) in pairs.iter().zip(&blocks) {
        let nb = shells[j].len();
        for fa in 0..shells[i].len() {
            for fb in 0..nb {
                let v = b[fa * nb + fb];
                m[(offsets[i] + fa, offsets[j] + fb)] = v;
                m[(offsets[j] + fb, offsets[i] + fa)] = v;
            }
        }
    }
    Ok(m)
}
