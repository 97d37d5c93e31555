//! Degenerate orbitals in one canonical form.
//!
//! An eigensolver returns any orthonormal basis of a degenerate level, so the same
//! molecule can print π pairs as 45° mixtures of p_x and p_y. Every solved set (and
//! every set read from an orbital file) is therefore rotated, level by level, to a
//! form fixed by the molecule alone:
//!
//! 1. A degenerate set is a run of orbitals whose energies lie within `tolerance` of
//!    the run's lowest: 1e-6 of the unit the method reports (1e-6 eV for extended
//!    Hückel, 1e-6 hartree otherwise).
//! 2. Only sets whose occupations are equal (to 1e-12) are rotated: then the density
//!    Σ nᵢ cᵢcᵢᵀ, the energies and the occupations do not change.
//! 3. Each basis function μ gets three axis weights
//!    w_a(μ) = (R_μ,a − G_a)²/bohr² + (⟨â²⟩_μ − 1/3), a = x, y, z: the squared offset of
//!    its centre from the centre of nuclear charge G, plus the anisotropy of its
//!    angular part (⟨â²⟩ is the mean of cos² of the angle to axis a over |Y|² on the
//!    sphere: 3/5 for p_a, 1/5 for the other p, 1/3 for s). The k×k matrices
//!    M_a = C_dᵀ ½(S W_a + W_a S) C_d are a Mulliken-style estimate of where and along
//!    which axis each member lies (S = 1 when the overlap is unknown).
//! 4. The set is rotated by the orthogonal U that maximises Σ_a Σ_i (UᵀM_aU)_ii²
//!    (joint diagonalisation by Jacobi sweeps, each 2×2 angle in closed form), so each
//!    member is as aligned with one axis as the set allows. U is orthogonal, so the
//!    members stay orthonormal in any metric they were orthonormal in.
//! 5. A pair the criterion cannot tell apart (its angle is free) is turned so the
//!    later member has no coefficient on the first basis function either carries.
//! 6. Members are ordered by their x, then y, then z weight (largest first), and each
//!    is signed so its largest coefficient is positive (the first of equal ones).

use std::ops::Range;

use super::orbitals::OrbitalSet;
use crate::basis::harmonics::{Polynomial, cartesian_components, solid_harmonic};
use crate::basis::{Basis, Shell};
use crate::chem::units::HARTREE_IN_EV;

/// Relative size (of 1) of the tolerance in the method's own energy unit.
pub const RELATIVE: f64 = 1e-6;

/// The degeneracy tolerance in hartree: 1e-6 of the unit the method reports.
pub fn tolerance(reports_ev: bool) -> f64 {
    if reports_ev {
        RELATIVE / HARTREE_IN_EV
    } else {
        RELATIVE
    }
}

/// Runs of levels (sorted energies) each within `tol` of the run's first, singletons
/// included; aufbau shares electrons over exactly these runs.
pub fn groups(energies: &[f64], tol: f64) -> Vec<Range<usize>> {
    let mut out = Vec::new();
    let mut i = 0;
    while i < energies.len() {
        let mut j = i + 1;
        while j < energies.len() && energies[j] - energies[i] < tol {
            j += 1;
        }
        out.push(i..j);
        i = j;
    }
    out
}

/// The degenerate sets (two or more orbitals) of an orbital set.
pub fn sets(set: &OrbitalSet) -> Vec<Range<usize>> {
    let e: Vec<f64> = set.orbitals.iter().map(|o| o.energy).collect();
    groups(&e, set.degeneracy)
        .into_iter()
        .filter(|r| r.len() > 1)
        .collect()
}

/// The degenerate set holding orbital `index` (0-based), if it is in one.
pub fn set_of(set: &OrbitalSet, index: usize) -> Option<Range<usize>> {
    sets(set).into_iter().find(|r| r.contains(&index))
}

/// Whether a set is rotated: only when its occupations are equal (to 1e-12), so
/// that the density does not change.
pub fn equally_occupied(set: &OrbitalSet, r: &Range<usize>) -> bool {
    let occ = set.orbitals[r.start].occupation;
    set.orbitals[r.clone()]
        .iter()
        .all(|o| (o.occupation - occ).abs() <= 1e-12)
}

/// "1e-6 eV" or "1e-6 hartree": the tolerance in the unit the method reports.
pub fn tolerance_text(set: &OrbitalSet) -> &'static str {
    if (set.degeneracy - tolerance(true)).abs() < 1e-15 {
        "1e-6 eV"
    } else {
        "1e-6 hartree"
    }
}

/// "orbitals 7 and 8" or "orbitals 6, 7 and 8" (numbered from 1).
pub fn members(r: &Range<usize>) -> String {
    let n: Vec<String> = r.clone().map(|i| (i + 1).to_string()).collect();
    match n.split_last() {
        Some((last, rest)) if !rest.is_empty() => {
            format!("orbitals {} and {last}", rest.join(", "))
        }
        _ => format!("orbital {}", n.join("")),
    }
}

/// One note per degenerate set that is only partly filled, e.g. "orbitals 7 and 8
/// are degenerate and share 2 electrons evenly (1.00 each)": such a level is an open
/// shell, and one determinant of it is a choice the numbers do not show.
pub fn sharing_notes(set: &OrbitalSet) -> Vec<String> {
    let tol = tolerance_text(set);
    sets(set)
        .into_iter()
        .filter_map(|r| {
            let each = set.orbitals[r.start].occupation;
            let total: f64 = set.orbitals[r.clone()].iter().map(|o| o.occupation).sum();
            (total > 1e-12 && total < 2.0 * r.len() as f64 - 1e-12).then(|| {
                format!(
                    "{} are degenerate (within {tol}) and share {} electron{} evenly ({each:.2} each)",
                    members(&r),
                    trim(total),
                    if (total - 1.0).abs() < 1e-12 { "" } else { "s" }
                )
            })
        })
        .collect()
}

fn trim(x: f64) -> String {
    if (x - x.round()).abs() < 1e-9 {
        format!("{}", x.round())
    } else {
        format!("{x:.2}")
    }
}

/// Rotates every equally occupied degenerate set to the canonical form of the module
/// doc. Returns how many sets were left as they are because their occupations differ.
pub fn canonicalise(set: &mut OrbitalSet) -> usize {
    let n = set.basis.len();
    if set.orbitals.iter().any(|o| o.coefficients.len() != n) {
        return 0;
    }
    let weights = axis_weights(set);
    let mut skipped = 0;
    for r in sets(set) {
        if !equally_occupied(set, &r) {
            skipped += 1;
            continue;
        }
        let mut c: Vec<Vec<f64>> = set.orbitals[r.clone()]
            .iter()
            .map(|o| o.coefficients.clone())
            .collect();
        rotate(&mut c, set.overlap.as_ref(), &weights);
        for (o, v) in set.orbitals[r].iter_mut().zip(c) {
            o.coefficients = v;
        }
    }
    skipped
}

/// The joint diagonalisation, ordering and signs (steps 4–6) on one set's vectors.
fn rotate(c: &mut [Vec<f64>], s: Option<&nalgebra::DMatrix<f64>>, w: &[[f64; 3]]) {
    let k = c.len();
    let mut m = moments(c, s, w);
    let scale: f64 = m
        .iter()
        .flat_map(|ma| ma.iter().flatten())
        .map(|v| v * v)
        .sum();
    for _sweep in 0..100 {
        let mut largest = 0.0f64;
        for i in 0..k {
            for j in i + 1..k {
                let theta = pair_angle(&m, c, i, j, scale);
                if theta.abs() > 1e-15 {
                    apply(&mut m, c, i, j, theta);
                }
                largest = largest.max(theta.abs());
            }
        }
        if largest < 1e-13 {
            break;
        }
    }
    // Order by the weights along x, then y, then z (largest first), read to 1e-8 so
    // rounding noise cannot swap members.
    let key = |i: usize| -> [i64; 3] { [0, 1, 2].map(|a| -((m[a][i][i] * 1e8).round() as i64)) };
    let mut order: Vec<usize> = (0..k).collect();
    order.sort_by_key(|&i| (key(i), i));
    let sorted: Vec<Vec<f64>> = order.iter().map(|&i| c[i].clone()).collect();
    for (dst, mut v) in c.iter_mut().zip(sorted) {
        fix_sign(&mut v);
        *dst = v;
    }
}

/// The Jacobi angle for members i and j: the closed-form maximiser of
/// Σ_a (M_a,ii − M_a,jj)² in [−π/4, π/4], or, when every angle is as good (the pair
/// is isotropic to 1e-12 of Σ‖M_a‖²), the angle that clears member j's coefficient
/// on the first function either member carries.
fn pair_angle(m: &[Vec<Vec<f64>>; 3], c: &[Vec<f64>], i: usize, j: usize, scale: f64) -> f64 {
    let (mut g00, mut g01, mut g11) = (0.0, 0.0, 0.0);
    for ma in m {
        let (d, o) = (ma[i][i] - ma[j][j], 2.0 * ma[i][j]);
        g00 += d * d;
        g01 += d * o;
        g11 += o * o;
    }
    let gap = ((g00 - g11) * (g00 - g11) + 4.0 * g01 * g01).sqrt();
    if gap > 1e-12 * scale {
        return 0.25 * (2.0 * g01).atan2(g00 - g11);
    }
    let first = (0..c[i].len()).find(|&mu| c[i][mu].hypot(c[j][mu]) > 1e-8);
    match first {
        Some(mu) if c[i][mu] != 0.0 => (c[j][mu] / c[i][mu]).atan(),
        Some(mu) if c[j][mu] != 0.0 => std::f64::consts::FRAC_PI_2,
        _ => 0.0,
    }
}

/// ψ_i ← cos θ ψ_i + sin θ ψ_j, ψ_j ← −sin θ ψ_i + cos θ ψ_j, and the same on M_a.
fn apply(m: &mut [Vec<Vec<f64>>; 3], c: &mut [Vec<f64>], i: usize, j: usize, theta: f64) {
    let (sn, cs) = theta.sin_cos();
    for mu in 0..c[i].len() {
        let (a, b) = (c[i][mu], c[j][mu]);
        c[i][mu] = cs * a + sn * b;
        c[j][mu] = -sn * a + cs * b;
    }
    for ma in m.iter_mut() {
        for row in ma.iter_mut() {
            let (a, b) = (row[i], row[j]);
            row[i] = cs * a + sn * b;
            row[j] = -sn * a + cs * b;
        }
        let (ri, rj) = (ma[i].clone(), ma[j].clone());
        for (col, (a, b)) in ri.into_iter().zip(rj).enumerate() {
            ma[i][col] = cs * a + sn * b;
            ma[j][col] = -sn * a + cs * b;
        }
    }
}

/// M_a,ij = ½ (cᵢᵀ S W_a cⱼ + cᵢᵀ W_a S cⱼ).
fn moments(
    c: &[Vec<f64>],
    s: Option<&nalgebra::DMatrix<f64>>,
    w: &[[f64; 3]],
) -> [Vec<Vec<f64>>; 3] {
    let sc: Vec<Vec<f64>> = c
        .iter()
        .map(|v| match s {
            Some(s) => (0..v.len())
                .map(|r| (0..v.len()).map(|q| s[(r, q)] * v[q]).sum())
                .collect(),
            None => v.clone(),
        })
        .collect();
    let k = c.len();
    [0, 1, 2].map(|a| {
        let mut ma = vec![vec![0.0; k]; k];
        for i in 0..k {
            for j in 0..k {
                let x: f64 = (0..w.len())
                    .map(|mu| w[mu][a] * (sc[i][mu] * c[j][mu] + c[i][mu] * sc[j][mu]))
                    .sum();
                ma[i][j] = 0.5 * x;
            }
        }
        ma
    })
}

/// Step 3's weights for every basis function.
fn axis_weights(set: &OrbitalSet) -> Vec<[f64; 3]> {
    let atoms = &set.molecule.atoms;
    let total: f64 = atoms.iter().map(|a| a.charge()).sum();
    let g = [0, 1, 2].map(|a| {
        if total > 0.0 {
            atoms
                .iter()
                .map(|t| t.charge() * t.position[a])
                .sum::<f64>()
                / total
        } else {
            atoms.iter().map(|t| t.position[a]).sum::<f64>() / atoms.len().max(1) as f64
        }
    });
    angular_parts(&set.basis)
        .into_iter()
        .map(|(centre, poly)| {
            let shape = anisotropy(&poly);
            [0, 1, 2].map(|a| (centre[a] - g[a]).powi(2) + shape[a])
        })
        .collect()
}

/// Each function's centre and angular polynomial, in basis order.
fn angular_parts(basis: &Basis) -> Vec<([f64; 3], Polynomial)> {
    let mut out = Vec::with_capacity(basis.len());
    for shell in &basis.shells {
        match shell {
            Shell::Slater(s) => {
                for &m in &s.ms {
                    out.push((s.center, solid_harmonic(s.l, m).unwrap_or_default()));
                }
            }
            Shell::Gaussian(g) => {
                let comps = cartesian_components(g.l);
                for row in &g.rows {
                    let poly = row
                        .iter()
                        .zip(&comps)
                        .filter(|(c, _)| **c != 0.0)
                        .map(|(c, p)| (*c, *p))
                        .collect();
                    out.push((g.center, poly));
                }
            }
        }
    }
    out
}

/// ⟨â²⟩ − 1/3 for a = x, y, z over |P(r̂)|² on the unit sphere (0 for a vanishing P).
pub fn anisotropy(poly: &Polynomial) -> [f64; 3] {
    let mut num = [0.0; 3];
    let mut den = 0.0;
    for (c1, p1) in poly {
        for (c2, p2) in poly {
            let p = [p1[0] + p2[0], p1[1] + p2[1], p1[2] + p2[2]];
            den += c1 * c2 * sphere_mean(p);
            for (a, n) in num.iter_mut().enumerate() {
                let mut q = p;
                q[a] += 2;
                *n += c1 * c2 * sphere_mean(q);
            }
        }
    }
    if den <= 0.0 {
        return [0.0; 3];
    }
    num.map(|n| n / den - 1.0 / 3.0)
}

/// Mean of x^a y^b z^c over the unit sphere: (a−1)!!(b−1)!!(c−1)!!/(a+b+c+1)!! for
/// even powers, 0 otherwise (the standard moment formula; common practice).
fn sphere_mean(p: [u32; 3]) -> f64 {
    if p.iter().any(|e| e % 2 == 1) {
        return 0.0;
    }
    let odd = |n: u32| -> f64 { (1..=n).step_by(2).map(f64::from).product() };
    odd(p[0].saturating_sub(1)) * odd(p[1].saturating_sub(1)) * odd(p[2].saturating_sub(1))
        / odd(p[0] + p[1] + p[2] + 1)
}

/// Largest coefficient positive (the first of equal ones, to 1e-9).
fn fix_sign(c: &mut [f64]) {
    let max = c.iter().fold(0.0f64, |m, v| m.max(v.abs()));
    if let Some(first) = c.iter().find(|v| v.abs() > max * (1.0 - 1e-9)) {
        if *first < 0.0 {
            c.iter_mut().for_each(|v| *v = -*v);
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Sphere means: ⟨x²⟩ = 1/3, ⟨x⁴⟩ = 1/5, ⟨x²y²⟩ = 1/15 (standard moments of the
    /// unit sphere; common practice), so p_x has ⟨x̂²⟩ = 3/5 and ⟨ŷ²⟩ = 1/5.
    #[test]
    fn sphere_moments_and_p_anisotropy() {
        assert!((sphere_mean([2, 0, 0]) - 1.0 / 3.0).abs() < 1e-15);
        assert!((sphere_mean([4, 0, 0]) - 0.2).abs() < 1e-15);
        assert!((sphere_mean([2, 2, 0]) - 1.0 / 15.0).abs() < 1e-15);
        assert_eq!(sphere_mean([1, 1, 0]), 0.0);
        let px = anisotropy(&vec![(1.0, [1, 0, 0])]);
        assert!((px[0] - (0.6 - 1.0 / 3.0)).abs() < 1e-15);
        assert!((px[1] - (0.2 - 1.0 / 3.0)).abs() < 1e-15);
        let s = anisotropy(&vec![(1.0, [0, 0, 0])]);
        assert!(s.iter().all(|v| v.abs() < 1e-15));
        // Any real harmonic averages to 1/3 over the three axes: Σ_a ⟨â²⟩ = 1.
        for m in -2..=2 {
            let d = anisotropy(&solid_harmonic(2, m).unwrap());
            assert!(d.iter().sum::<f64>().abs() < 1e-14, "m = {m}: {d:?}");
        }
    }

    #[test]
    fn groups_chain_from_the_first_member() {
        let g = groups(&[-1.0, -0.5, -0.5 + 4e-7, -0.5 + 8e-7, 0.2], 1e-6);
        assert_eq!(g, vec![0..1, 1..4, 4..5]);
    }
}
