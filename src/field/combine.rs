//! From a tile's basis values to its field values. Every orbital any field needs is
//! evaluated once per tile as a small matrix product (orbitals × points), then the
//! fields are read off it: densities as Σ_i n_i ψ_i² from the orbital tile.
//!
//! The product is hand-written rather than a library GEMM on purpose: each ψ_i(p)
//! must stay the sum Σ_μ c_iμ φ_μ(p) taken from 0.0 in increasing μ without fused
//! multiply-adds, which is what the evaluation always computed and what a blocked
//! library kernel (which splits and reorders the μ sum) does not promise. Register
//! blocks of 4 orbitals × 8 points (or 1 × 8) keep that order per value.
//! Functions whose values are exactly zero on the tile are left out of the sum,
//! and so are zero coefficients: adding ±0 to a partial sum that starts at +0.0
//! never changes it (IEEE 754 round-to-nearest: x + ±0 = x for x ≠ −0, and such a
//! sum is never −0).

use super::TILE;
use super::eval::Resolved;
use std::collections::HashMap;

#[derive(Debug, Clone)]
enum Recipe {
    Orbital(usize),
    OrbitalDensity(usize),
    OrbitalDeformation(usize, Vec<f64>),
    Density(Vec<(f64, usize)>),
    Deformation(Vec<(f64, usize)>, Vec<f64>),
}

#[derive(Debug, Clone)]
pub(super) struct Combo {
    /// Coefficients of the distinct orbitals, function-major: coef[μ·norb + i].
    coef: Vec<f64>,
    pub(super) norb: usize,
    recipes: Vec<Recipe>,
}

impl Combo {
    pub(super) fn new(fields: &[Resolved], nbf: usize) -> Self {
        let mut index: HashMap<Vec<u64>, usize> = HashMap::new();
        let mut list: Vec<Vec<f64>> = Vec::new();
        let mut id = |c: &[f64]| -> usize {
            let key: Vec<u64> = c.iter().map(|v| v.to_bits()).collect();
            *index.entry(key).or_insert_with(|| {
                list.push(c.to_vec());
                list.len() - 1
            })
        };
        let recipes: Vec<Recipe> = fields
            .iter()
            .map(|f| match f {
                Resolved::Orbital(c) => Recipe::Orbital(id(c)),
                Resolved::OrbitalDensity(c) => Recipe::OrbitalDensity(id(c)),
                Resolved::OrbitalDeformation(c, q) => Recipe::OrbitalDeformation(id(c), q.clone()),
                Resolved::Density(l) => {
                    Recipe::Density(l.iter().map(|(n, c)| (*n, id(c))).collect())
                }
                Resolved::Deformation(l, r) => {
                    Recipe::Deformation(l.iter().map(|(n, c)| (*n, id(c))).collect(), r.clone())
                }
            })
            .collect();
        let norb = list.len();
        let mut coef = vec![0.0; nbf * norb];
        for (i, c) in list.iter().enumerate() {
            for (m, &v) in c.iter().enumerate() {
                coef[m * norb + i] = v;
            }
        }
        Combo {
            coef,
            norb,
            recipes,
        }
    }

    /// Coefficients of the distinct orbitals, function-major: coef[μ·norb + i].
    pub(super) fn coefficients(&self) -> &[f64] {
        &self.coef
    }

    /// Whether some field reads the basis values themselves (the deformations),
    /// not only orbitals.
    pub(super) fn needs_basis_values(&self) -> bool {
        self.recipes
            .iter()
            .any(|r| matches!(r, Recipe::OrbitalDeformation(..) | Recipe::Deformation(..)))
    }

    /// ψ_i on the first n points of the tile: psi[i·TILE + t], from phi (functions ×
    /// TILE) over the functions in `active` (increasing). Points up to n rounded up to
    /// the block width are computed too and ignored.
    pub(super) fn orbitals(&self, phi: &[f64], active: &[u32], n: usize, psi: &mut [f64]) {
        #[cfg(target_arch = "x86_64")]
        if std::arch::is_x86_feature_detected!("avx") {
            // SAFETY: the CPU supports AVX, checked just above.
            return unsafe { self.orbitals_avx(phi, active, n, psi) };
        }
        self.orbitals_any(phi, active, n, psi)
    }

    /// `orbitals_any` with 4-wide AVX multiplies and adds: the same IEEE 754
    /// operations in the same order (no fused multiply-add).
    #[cfg(target_arch = "x86_64")]
    #[target_feature(enable = "avx")]
    fn orbitals_avx(&self, phi: &[f64], active: &[u32], n: usize, psi: &mut [f64]) {
        self.orbitals_any(phi, active, n, psi)
    }

    #[inline(always)]
    fn orbitals_any(&self, phi: &[f64], active: &[u32], n: usize, psi: &mut [f64]) {
        let norb = self.norb;
        let mut i = 0;
        while i + 4 <= norb {
            for t in (0..n).step_by(8) {
                block::<4, 8>(&self.coef, norb, i, phi, active, t, psi);
            }
            i += 4;
        }
        for i in i..norb {
            for t in (0..n).step_by(8) {
                block::<1, 8>(&self.coef, norb, i, phi, active, t, psi);
            }
        }
    }

    /// The fields on the first n points of the tile, interleaved into `out` (n × fields).
    pub(super) fn fields(
        &self,
        phi: &[f64],
        psi: &[f64],
        n: usize,
        acc: &mut [f64],
        out: &mut [f64],
    ) {
        let nf = self.recipes.len();
        let psi_of = |i: usize| &psi[i * TILE..i * TILE + n];
        let acc = &mut acc[..n];
        for (k, recipe) in self.recipes.iter().enumerate() {
            let slots = out.iter_mut().skip(k).step_by(nf);
            match recipe {
                Recipe::Orbital(i) => slots.zip(psi_of(*i)).for_each(|(o, v)| *o = *v),
                Recipe::OrbitalDensity(i) => slots.zip(psi_of(*i)).for_each(|(o, v)| *o = v * v),
                Recipe::OrbitalDeformation(i, q) => {
                    for (t, (o, v)) in slots.zip(psi_of(*i)).enumerate() {
                        let atomic: f64 = q
                            .iter()
                            .enumerate()
                            .map(|(m, qm)| qm * phi[m * TILE + t] * phi[m * TILE + t])
                            .sum();
                        *o = v * v - atomic;
                    }
                }
                Recipe::Density(list) => {
                    density(list, &psi_of, acc);
                    slots.zip(acc.iter()).for_each(|(o, v)| *o = *v);
                }
                Recipe::Deformation(list, reference) => {
                    density(list, &psi_of, acc);
                    for (m, &r0) in reference.iter().enumerate().filter(|(_, r)| **r != 0.0) {
                        for (r, p) in acc.iter_mut().zip(&phi[m * TILE..m * TILE + n]) {
                            *r -= r0 * p * p;
                        }
                    }
                    slots.zip(acc.iter()).for_each(|(o, v)| *o = *v);
                }
            }
        }
    }
}

/// Σ_i n_i ψ_i² accumulated from 0.0 in increasing i.
fn density<'a>(list: &[(f64, usize)], psi_of: &impl Fn(usize) -> &'a [f64], acc: &mut [f64]) {
    acc.fill(0.0);
    for (occ, i) in list {
        for (r, v) in acc.iter_mut().zip(psi_of(*i)) {
            *r += occ * v * v;
        }
    }
}

/// psi rows i..i+NO at points t..t+NP: Σ_μ c_iμ φ_μ(p) from 0.0 in the order of
/// `active`, accumulated in registers.
#[inline(always)]
fn block<const NO: usize, const NP: usize>(
    coef: &[f64],
    norb: usize,
    i: usize,
    phi: &[f64],
    active: &[u32],
    t: usize,
    psi: &mut [f64],
) {
    let mut acc = [[0.0f64; NP]; NO];
    for &m in active {
        let m = m as usize;
        let ph: &[f64; NP] = phi[m * TILE + t..][..NP].try_into().unwrap();
        let c: &[f64; NO] = coef[m * norb + i..][..NO].try_into().unwrap();
        for o in 0..NO {
            for q in 0..NP {
                acc[o][q] += c[o] * ph[q];
            }
        }
    }
    for (o, a) in acc.iter().enumerate() {
        psi[(i + o) * TILE + t..][..NP].copy_from_slice(a);
    }
}
