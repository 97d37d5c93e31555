//! Dipole integrals ⟨μ| (r − O)_k |ν⟩ for dipole moments, by McMurchie–Davidson:
//! with x − O_x = (x − P_x) + X_PO and ∫ (x − P_x) Λ_t dx = √(π/p) δ_t1, the 1-D
//! moment of a primitive pair is √(π/p) (E_1^{ij} + X_PO E_0^{ij}), and the 3-D
//! integral is that times the two 1-D overlaps √(π/p) E_0 of the other directions
//! (Helgaker, Jørgensen, Olsen, ch. 9.5).

use std::f64::consts::PI;

use nalgebra::DMatrix;

use super::assemble::{build, cartesian, gaussians, transform};
use super::gaussian::{CartesianShell, cartesian_components};
use super::hermite::{Hermite1d, MAX_L};
use crate::basis::Basis;
use crate::error::{Error, Result};

/// ⟨a| (r − origin)_k |b⟩ over all component pairs, row-major [component of a][of b].
fn dipole_block(a: &CartesianShell, b: &CartesianShell, origin: [f64; 3], k: usize) -> Vec<f64> {
    let (ca, cb) = (cartesian_components(a.l), cartesian_components(b.l));
    let (la, lb) = (a.l as usize, b.l as usize);
    let mut out = vec![0.0; ca.len() * cb.len()];
    for (&alpha, &da) in a.exponents.iter().zip(a.coefficients) {
        for (&beta, &db) in b.exponents.iter().zip(b.coefficients) {
            let p = alpha + beta;
            let e: [Hermite1d; 3] = std::array::from_fn(|d| {
                Hermite1d::new(la, lb, alpha, beta, a.center[d], b.center[d])
            });
            let xpo = (alpha * a.center[k] + beta * b.center[k]) / p - origin[k];
            let scale = da * db * (PI / p) * (PI / p).sqrt();
            for (i, pa) in ca.iter().enumerate() {
                for (j, pb) in cb.iter().enumerate() {
                    let mut v = scale;
                    for (d, ed) in e.iter().enumerate() {
                        let (ia, jb) = (pa[d] as usize, pb[d] as usize);
                        v *= if d == k {
                            let e1 = ed.coefficients(ia, jb).get(1).copied().unwrap_or(0.0);
                            e1 + xpo * ed.overlap(ia, jb)
                        } else {
                            ed.overlap(ia, jb)
                        };
                    }
                    out[i * cb.len() + j] += v;
                }
            }
        }
    }
    out
}

/// ⟨μ| (r − origin)_k |ν⟩ for k = x, y, z over the basis functions (bohr). The
/// electronic dipole moment is then −Σ_μν D_μν M^k_μν.
pub fn dipole_matrices(basis: &Basis, origin: [f64; 3]) -> Result<[DMatrix<f64>; 3]> {
    let shells = gaussians(basis)
        .ok_or_else(|| Error::input("dipole integrals need an all-Gaussian basis"))?;
    if let Some(s) = shells.iter().find(|s| s.l as usize > MAX_L) {
        return Err(Error::input(format!(
            "dipole integrals are implemented up to l = {MAX_L}, got l = {}",
            s.l
        )));
    }
    for s in &shells {
        super::two_electron::check_shell(s)?;
    }
    if !origin.iter().all(|c| c.is_finite()) {
        return Err(Error::input("the dipole origin must be finite"));
    }
    Ok(std::array::from_fn(|k| {
        build(basis, &shells, |a, b| {
            transform(a, b, &dipole_block(&cartesian(a), &cartesian(b), origin, k))
        })
    }))
}
