//! Exact gradients of the fields of an orbital set, for isosurface normals: the
//! vertices sit on the exact field, so the normals come from the exact ∇ of the same
//! expression `evaluate` uses, never from grid differences.
//!
//! With ψ = Σ_μ c_μ φ_μ: ∇ψ = Σ_μ c_μ ∇φ_μ, ∇ψ² = 2ψ∇ψ, and every reference term
//! w_μ φ_μ² (Mulliken populations, free-atom occupations) has gradient 2 w_μ φ_μ ∇φ_μ.

use super::FieldSampler;
use super::eval::Resolved;

/// Points per internal batch: the basis buffers hold BATCH × functions × 4 numbers
/// whatever the caller passes, and are allocated once per call.
pub const BATCH: usize = 256;

/// Reused buffers for one batch.
struct Work {
    phi: Vec<f64>,
    dphi: Vec<[f64; 3]>,
    psi: Vec<f64>,
    dpsi: Vec<[f64; 3]>,
    acc: Vec<[f64; 3]>,
}

impl FieldSampler {
    /// Fills `out` (points × fields, interleaved like `evaluate`) with the exact
    /// gradient of every field at every point, in field units per bohr.
    pub fn gradients(&self, points: &[[f64; 3]], out: &mut [[f64; 3]]) {
        let nf = self.fields.len();
        assert_eq!(
            out.len(),
            points.len() * nf,
            "output buffer must hold points × fields gradients"
        );
        if nf == 0 || points.is_empty() {
            return;
        }
        let b = BATCH.min(points.len());
        let mut work = Work {
            phi: vec![0.0; self.nbf * b],
            dphi: vec![[0.0; 3]; self.nbf * b],
            psi: vec![0.0; b],
            dpsi: vec![[0.0; 3]; b],
            acc: vec![[0.0; 3]; b],
        };
        for (chunk, dst) in points.chunks(BATCH).zip(out.chunks_mut(BATCH * nf)) {
            self.gradients_batch(chunk, dst, &mut work);
        }
    }

    fn gradients_batch(&self, points: &[[f64; 3]], out: &mut [[f64; 3]], w: &mut Work) {
        let n = points.len();
        let nf = self.fields.len();
        let phi = &mut w.phi[..self.nbf * n];
        let dphi = &mut w.dphi[..self.nbf * n];
        for (shell, &o) in self.shells.iter().zip(&self.offsets) {
            let range = o * n..(o + shell.len()) * n;
            shell.values(points, &mut phi[range.clone()]);
            shell.gradients(points, &mut dphi[range]);
        }
        let (phi, dphi) = (&*phi, &*dphi);
        let (psi, dpsi, acc) = (&mut w.psi[..n], &mut w.dpsi[..n], &mut w.acc[..n]);
        for (k, field) in self.fields.iter().enumerate() {
            acc.fill([0.0; 3]);
            match field {
                Resolved::Orbital(c) => {
                    combine(phi, dphi, c, n, psi, dpsi);
                    acc.copy_from_slice(dpsi);
                }
                Resolved::OrbitalDensity(c) => {
                    combine(phi, dphi, c, n, psi, dpsi);
                    add_square_gradient(acc, 1.0, psi, dpsi);
                }
                Resolved::OrbitalDeformation(c, q) => {
                    combine(phi, dphi, c, n, psi, dpsi);
                    add_square_gradient(acc, 1.0, psi, dpsi);
                    subtract_reference(acc, q, phi, dphi, n);
                }
                Resolved::Density(list) => {
                    for (occ, c) in list {
                        combine(phi, dphi, c, n, psi, dpsi);
                        add_square_gradient(acc, *occ, psi, dpsi);
                    }
                }
                Resolved::Deformation(list, reference) => {
                    for (occ, c) in list {
                        combine(phi, dphi, c, n, psi, dpsi);
                        add_square_gradient(acc, *occ, psi, dpsi);
                    }
                    subtract_reference(acc, reference, phi, dphi, n);
                }
            }
            for (slot, g) in out.iter_mut().skip(k).step_by(nf).zip(acc.iter()) {
                *slot = *g;
            }
        }
    }
}

/// ψ = Σ_μ c_μ φ_μ and ∇ψ = Σ_μ c_μ ∇φ_μ at every point (φ function-major).
fn combine(
    phi: &[f64],
    dphi: &[[f64; 3]],
    c: &[f64],
    n: usize,
    psi: &mut [f64],
    dpsi: &mut [[f64; 3]],
) {
    psi.fill(0.0);
    dpsi.fill([0.0; 3]);
    for (m, &cm) in c.iter().enumerate().filter(|(_, c)| **c != 0.0) {
        let range = m * n..(m + 1) * n;
        for (((v, g), p), dp) in psi
            .iter_mut()
            .zip(dpsi.iter_mut())
            .zip(&phi[range.clone()])
            .zip(&dphi[range])
        {
            *v += cm * p;
            for i in 0..3 {
                g[i] += cm * dp[i];
            }
        }
    }
}

/// acc += w ∇(ψ²) = 2 w ψ ∇ψ.
fn add_square_gradient(acc: &mut [[f64; 3]], w: f64, psi: &[f64], dpsi: &[[f64; 3]]) {
    for ((a, v), g) in acc.iter_mut().zip(psi).zip(dpsi) {
        for i in 0..3 {
            a[i] += 2.0 * w * v * g[i];
        }
    }
}

/// acc −= Σ_μ w_μ ∇(φ_μ²), the gradient of the reference `evaluate` subtracts.
fn subtract_reference(
    acc: &mut [[f64; 3]],
    weights: &[f64],
    phi: &[f64],
    dphi: &[[f64; 3]],
    n: usize,
) {
    for (m, &wm) in weights.iter().enumerate().filter(|(_, w)| **w != 0.0) {
        let range = m * n..(m + 1) * n;
        for ((a, p), dp) in acc.iter_mut().zip(&phi[range.clone()]).zip(&dphi[range]) {
            for i in 0..3 {
                a[i] -= 2.0 * wm * p * dp[i];
            }
        }
    }
}
