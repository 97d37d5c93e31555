//! The tiled evaluation against the untiled one it replaced (`reference`, a
//! verbatim copy): every value of every field kind must agree to the bit, on
//! orthogonal slabs (separable path) and arbitrary points (direct path), for Slater
//! and Gaussian (Cartesian and pure, s to f) bases, with 1, 2 and many fields.

use super::reference::Old;
use super::{Field, FieldSampler};
use crate::basis::BasisSpec;
use crate::chem::Molecule;
use crate::chem::units::LengthUnit;
use crate::grid::Slab;
use crate::solve::huckel_params::HuckelOptions;
use crate::solve::{Method, OrbitalSet, orbitals_for};

/// Extended-Hückel benzene (examples/benzene.xyz, read here by hand so that this
/// test stays below the file readers): Slater 2s/2p sharing ζ on carbon, free-atom
/// reference.
fn benzene() -> OrbitalSet {
    let path = concat!(env!("CARGO_MANIFEST_DIR"), "/examples/benzene.xyz");
    let text = std::fs::read_to_string(path).unwrap();
    let atoms: Vec<(String, [f64; 3])> = text
        .lines()
        .skip(2)
        .filter(|l| !l.trim().is_empty())
        .map(|l| {
            let w: Vec<&str> = l.split_whitespace().collect();
            let c = |i: usize| LengthUnit::Angstrom.to_bohr(w[i].parse::<f64>().unwrap());
            (w[0].to_string(), [c(1), c(2), c(3)])
        })
        .collect();
    let atoms: Vec<(&str, [f64; 3])> = atoms.iter().map(|(s, p)| (s.as_str(), *p)).collect();
    let molecule = Molecule::from_symbols(&atoms, 0).unwrap();
    orbitals_for(&molecule, &Method::ExtendedHuckel(HuckelOptions::default())).unwrap()
}

/// One electron over two protons 2 bohr apart in `spec` (the ion of the examples).
fn one_electron(spec: &BasisSpec, lower: [f64; 3]) -> OrbitalSet {
    let molecule = Molecule::from_symbols(&[("H", lower), ("H", [0.0, 0.0, 1.0])], 1).unwrap();
    let basis = spec.build(&molecule).unwrap();
    orbitals_for(&molecule, &Method::OneElectron { basis }).unwrap()
}

/// The two-centre STO-3G model of the examples (contracted Gaussian s).
fn h2_sto3g() -> OrbitalSet {
    one_electron(&BasisSpec::named("sto-3g"), [0.0, 0.0, -1.0])
}

/// H2⁺ bent off its axis in contracted s, Cartesian p, pure and Cartesian d, pure
/// and Cartesian f shells (the model of tests/field_gradients.rs, extended).
fn gaussian_spdf() -> OrbitalSet {
    let text = "set = \"custom\"\n[shells]\nH = [\
        { l = 0, primitives = [[3.0, 0.4], [0.5, 0.7]] }, \
        { l = 1, primitives = [[1.0, 1.0]], cartesian = true }, \
        { l = 2, primitives = [[0.8, 1.0]] }, \
        { l = 2, primitives = [[1.5, 0.6], [0.4, 0.5]], cartesian = true }, \
        { l = 3, primitives = [[0.6, 1.0]] }, \
        { l = 3, primitives = [[0.7, 1.0]], cartesian = true }]\n";
    let spec: BasisSpec = toml::from_str(text).unwrap();
    one_electron(&spec, [0.3, 0.0, -1.0])
}

/// Long contractions of pure d and f functions: a lattice line then gathers more
/// terms than the kernel holds at once (`lattice::MAX_TERMS`), so it sums them in
/// several rounds.
fn long_contractions() -> OrbitalSet {
    let prims = |n: usize| {
        (0..n)
            .map(|k| {
                format!(
                    "[{}, {}]",
                    0.3 * 1.6f64.powi(k as i32),
                    1.0 / (k + 1) as f64
                )
            })
            .collect::<Vec<_>>()
            .join(", ")
    };
    let text = format!(
        "set = \"custom\"\n[shells]\nH = [\
        {{ l = 0, primitives = [{}] }}, \
        {{ l = 2, primitives = [{}] }}, \
        {{ l = 3, primitives = [{}] }}]\n",
        prims(40),
        prims(12),
        prims(12)
    );
    let spec: BasisSpec = toml::from_str(&text).unwrap();
    one_electron(&spec, [0.2, -0.1, -1.0])
}

fn field_sets(set: &OrbitalSet) -> Vec<Vec<Field>> {
    let parse = |l: &[&str]| {
        l.iter()
            .map(|f| Field::parse(f).unwrap())
            .collect::<Vec<_>>()
    };
    let mut sets = vec![
        parse(&["orbital:homo"]),
        parse(&["orbital:1", "orbital-density:homo"]),
        parse(&["orbital-deformation:homo", "density"]),
    ];
    let mut many: Vec<Field> = (1..=set.orbitals.len().min(40))
        .map(|i| Field::parse(&format!("orbital:{i}")).unwrap())
        .collect();
    many.extend(parse(&[
        "density",
        "orbital-density:1",
        "orbital-deformation:1",
    ]));
    // 3, 4 and 5 distinct orbitals: the fused lattice path takes up to four
    // (`lattice::fused::MAX_ORBITALS`), the two-step path more.
    for k in 3..=5 {
        if set.orbitals.len() >= k {
            let names: Vec<String> = (1..=k).map(|i| format!("orbital:{i}")).collect();
            let mut list: Vec<&str> = names.iter().map(String::as_str).collect();
            list.push("orbital-density:1");
            sets.push(parse(&list));
        }
    }
    if set.reference.is_some() {
        many.push(Field::Deformation);
        sets.push(parse(&["deformation"]));
    }
    sets.push(many);
    sets
}

fn assert_same(new: &[f64], old: &[f64], what: &str) {
    assert_eq!(new.len(), old.len());
    for (k, (a, b)) in new.iter().zip(old).enumerate() {
        assert_eq!(
            a.to_bits(),
            b.to_bits(),
            "{what}: value {k}: {a:e} against {b:e}"
        );
    }
}

/// Slabs of axis-aligned lattices: lines longer and shorter than a tile, point counts
/// that are not multiples of it, and slabs far enough out that primitives and lines
/// are screened away.
fn check_slabs(set: &OrbitalSet, name: &str) {
    let lattices: [(usize, usize, f64); 3] = [(23, 37, 0.35), (7, 300, 0.2), (40, 9, 1.3)];
    for fields in field_sets(set) {
        let sampler = FieldSampler::new(set, &fields).unwrap();
        let nf = fields.len();
        for (ny, nz, h) in lattices {
            let ys: Vec<f64> = (0..ny)
                .map(|j| -0.5 * h * ny as f64 + h * j as f64 + 0.013)
                .collect();
            let zs: Vec<f64> = (0..nz)
                .map(|k| -0.5 * h * nz as f64 + h * k as f64 - 0.021)
                .collect();
            for x in [0.0, 0.77, -3.1, 9.5, 17.0, 31.0] {
                let points: Vec<[f64; 3]> = ys
                    .iter()
                    .flat_map(|&y| zs.iter().map(move |&z| [x, y, z]))
                    .collect();
                // Listed and unlisted: the sampler lists none on a lattice.
                let slab = Slab::new(&points, Some((x, &ys, &zs)));
                let bare = Slab::new(&[], Some((x, &ys, &zs)));
                let mut new = vec![f64::NAN; points.len() * nf];
                let mut old = vec![f64::NAN; points.len() * nf];
                sampler.evaluate_slab(&bare, &mut new);
                Old(&sampler).evaluate_slab(&slab, &mut old);
                assert_same(
                    &new,
                    &old,
                    &format!("{name}, {nf} fields, slab {ny}×{nz} at x = {x}"),
                );
            }
        }
    }
}

/// A skewed lattice around the molecule and points far out (beyond the Slater
/// screening radius and where every Gaussian exponential underflows), on the direct
/// path, through both `evaluate` and `evaluate_slab` without a lattice.
fn check_points(set: &OrbitalSet, name: &str) {
    let mut points: Vec<[f64; 3]> = Vec::new();
    for i in 0..15 {
        for j in 0..13 {
            for k in 0..11 {
                let (a, b, c) = (i as f64 - 7.0, j as f64 - 6.0, k as f64 - 5.0);
                points.push([0.6 * a + 0.2 * b, 0.55 * b + 0.15 * c, 0.5 * c + 0.1 * a]);
            }
        }
    }
    for k in 0..300 {
        let t = k as f64 * 0.37;
        let r = 20.0 + 0.3 * k as f64;
        points.push([r * t.cos(), r * t.sin() * 0.6, r * 0.8 * t.sin()]);
    }
    for fields in field_sets(set) {
        let sampler = FieldSampler::new(set, &fields).unwrap();
        let nf = fields.len();
        let mut new = vec![f64::NAN; points.len() * nf];
        let mut old = vec![f64::NAN; points.len() * nf];
        sampler.evaluate(&points, &mut new);
        Old(&sampler).evaluate(&points, &mut old);
        assert_same(&new, &old, &format!("{name}, {nf} fields, points"));
        let slab = Slab::new(&points[..1000], None);
        let mut new = vec![f64::NAN; 1000 * nf];
        sampler.evaluate_slab(&slab, &mut new);
        assert_same(
            &new,
            &old[..1000 * nf],
            &format!("{name}, {nf} fields, skewed slab"),
        );
    }
}

#[test]
fn slater_benzene_is_bit_identical() {
    let set = benzene();
    check_slabs(&set, "extended-Hückel benzene");
    check_points(&set, "extended-Hückel benzene");
}

#[test]
fn gaussian_sto3g_is_bit_identical() {
    let set = h2_sto3g();
    check_slabs(&set, "STO-3G H2+");
    check_points(&set, "STO-3G H2+");
}

#[test]
fn gaussian_s_to_f_is_bit_identical() {
    let set = gaussian_spdf();
    check_slabs(&set, "Gaussian s–f H2+");
    check_points(&set, "Gaussian s–f H2+");
}

#[test]
fn long_contractions_are_bit_identical() {
    let set = long_contractions();
    check_slabs(&set, "long contractions");
    check_points(&set, "long contractions");
}

/// No points, no fields: nothing to write and no panic, as before.
#[test]
fn empty_requests_are_fine() {
    let set = h2_sto3g();
    let sampler = FieldSampler::new(&set, &[Field::Density]).unwrap();
    sampler.evaluate(&[], &mut []);
    let none = FieldSampler::new(&set, &[]).unwrap();
    none.evaluate(&[[0.0; 3]; 5], &mut []);
}
