//! The two-centre orbitals sampled on a grid: normalisation, the zero integral of the
//! deformation density, the nodal plane, and the exact values at the bond midpoint.

mod common;

use std::f64::consts::PI;

use lobecast::field::FieldSampler;
use lobecast::grid::{GridBox, Resolution, sample_all};
use lobecast::integrals::two_centre::two_centre_1s;
use lobecast::solve::OrbitalSet;

use common::fields;

fn set() -> OrbitalSet {
    common::solve_model(common::H2)
}

/// Riemann sums over the box at 0.1 bohr with the default 5 bohr padding. The
/// tolerance 1e-3 is the project's requirement; the neglected tail beyond 5 bohr of
/// e^(−2r) is ~1e-4 (common practice).
#[test]
fn integrals_on_the_grid() {
    let set = set();
    let grid = GridBox::around(&set.molecule, 5.0, Resolution::Spacing(0.1)).unwrap();
    let list = fields(&[
        "orbital-density:1",
        "orbital-density:2",
        "orbital-deformation:1",
        "orbital-deformation:2",
        "density",
    ]);
    let sampler = FieldSampler::new(&set, &list).unwrap();
    let values = sample_all(&grid, list.len(), |s, v| sampler.evaluate_slab(s, v));
    let dv = grid.voxel_volume();
    let sums: Vec<f64> = (0..list.len())
        .map(|k| values.iter().skip(k).step_by(list.len()).sum::<f64>() * dv)
        .collect();
    for (k, expected) in [(0, 1.0), (1, 1.0), (2, 0.0), (3, 0.0), (4, 1.0)] {
        assert!(
            (sums[k] - expected).abs() < 1e-3,
            "{}: ∫ = {} (expected {expected})",
            list[k],
            sums[k]
        );
    }
}

#[test]
fn antibonding_orbital_vanishes_on_the_mid_plane() {
    let set = set();
    let grid = GridBox::around(&set.molecule, 5.0, Resolution::Spacing(0.1)).unwrap();
    let sampler = FieldSampler::new(&set, &fields(&["orbital:2"])).unwrap();
    let values = sample_all(&grid, 1, |s, v| sampler.evaluate_slab(s, v));
    let [nx, ny, nz] = grid.counts;
    let mid = (0..nz)
        .find(|&k| grid.point(0, 0, k)[2].abs() < 1e-9)
        .expect("a grid plane at z = 0");
    let max = values.iter().fold(0.0f64, |m, v| m.max(v.abs()));
    for i in 0..nx {
        for j in 0..ny {
            let v = values[(i * ny + j) * nz + mid];
            assert!(v.abs() <= 1e-14 * max, "ψ₂ = {v} on the mid-plane");
        }
    }
}

/// At the midpoint φA = φB = e^(−ζR/2)·sqrt(ζ³/π) =: φm, and by symmetry each atom
/// holds half the orbital's population, so the orbital deformation densities are
/// exactly φm²·(1 − S)/(1 + S) (bonding: 2φm²/(1+S) − φm²) and −φm² (antibonding,
/// whose orbital vanishes there). Derived here from the 1s function and S.
#[test]
fn deformation_at_the_midpoint_has_the_closed_form() {
    let set = set();
    let sampler = FieldSampler::new(
        &set,
        &fields(&["orbital-deformation:1", "orbital-deformation:2"]),
    )
    .unwrap();
    let mut v = [0.0; 2];
    sampler.evaluate(&[[0.0, 0.0, 0.0]], &mut v);
    let s = two_centre_1s(1.0, 1.0, 2.0).s;
    let phi_m2 = (-2.0f64).exp() / PI;
    assert!(
        v[0] > 0.0 && v[1] < 0.0,
        "bonding gains, antibonding loses: {v:?}"
    );
    assert!(
        (v[0] - phi_m2 * (1.0 - s) / (1.0 + s)).abs() < 1e-15,
        "bonding {}",
        v[0]
    );
    assert!((v[1] + phi_m2).abs() < 1e-15, "antibonding {}", v[1]);
}
