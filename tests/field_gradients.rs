//! Analytic gradients of every field against central differences of its values, on
//! an extended-Hückel (Slater) molecule and a Gaussian one with s to f shells.

use lobecast::chem::Molecule;
use lobecast::field::Field;
use lobecast::field::FieldSampler;
use lobecast::solve::OrbitalSet;
use lobecast::solve::huckel_params::HuckelOptions;

/// Central differences with h = 1e-5 bohr: truncation h²/6 |F‴| and rounding
/// ~ε |F| / h are both ~1e-10 to 1e-9 of the largest gradient for these valence
/// exponents (ζ ≤ 2.3, α ≤ 3), so 1e-7 keeps a margin of ~100 while a missing
/// factor or term shows up at order 1 (textbook error analysis).
const H: f64 = 1e-5;
const TOL: f64 = 1e-7;

/// Extended-Hückel water (Slater valence basis, free-atom reference occupations),
/// geometry of examples/water.xyz converted with bohr = 0.529177210903 Å.
fn water() -> OrbitalSet {
    let b = 0.529177210903;
    let m = Molecule::from_symbols(
        &[
            ("O", [0.0, 0.0, 0.0]),
            ("H", [0.75695 / b, 0.0, 0.585882 / b]),
            ("H", [-0.75695 / b, 0.0, 0.585882 / b]),
        ],
        0,
    )
    .unwrap();
    lobecast::solve::huckel::solve(&m, &HuckelOptions::default()).unwrap()
}

/// One-electron H2⁺, slightly bent off its axis, in Gaussian s (contracted),
/// Cartesian p, pure d and Cartesian f shells: every Gaussian path at once.
fn gaussian_h2_cation() -> OrbitalSet {
    let text = "[molecule]\nunits = \"bohr\"\ncharge = 1\n\
        atoms = [{ element = \"H\", position = [0, 0, -1] }, { element = \"H\", position = [0.3, 0, 1] }]\n\
        [basis]\nset = \"custom\"\n[basis.shells]\nH = [\
        { l = 0, primitives = [[3.0, 0.4], [0.5, 0.7]] }, \
        { l = 1, primitives = [[1.0, 1.0]], cartesian = true }, \
        { l = 2, primitives = [[0.8, 1.0]] }, \
        { l = 3, primitives = [[0.7, 1.0]], cartesian = true }]\n";
    lobecast::io::model::parse(text, std::path::Path::new("t.toml"))
        .unwrap()
        .solve()
        .unwrap()
}

/// Points 0.4 to 4 bohr around the centroid, at least 0.3 bohr from every nucleus
/// (s-type Slater functions have a cusp there).
fn points(set: &OrbitalSet) -> Vec<[f64; 3]> {
    let atoms: Vec<[f64; 3]> = set.molecule.atoms.iter().map(|a| a.position).collect();
    let c: [f64; 3] =
        std::array::from_fn(|i| atoms.iter().map(|a| a[i]).sum::<f64>() / atoms.len() as f64);
    (0..300)
        .map(|k| {
            let t = k as f64 + 0.5;
            let z = 1.0 - 2.0 * t / 300.0;
            let s = (1.0 - z * z).sqrt();
            let a = 2.399_963 * t;
            let r = 0.4 + 3.6 * ((k * 37) % 300) as f64 / 300.0;
            [c[0] + r * s * a.cos(), c[1] + r * s * a.sin(), c[2] + r * z]
        })
        .filter(|p| {
            atoms
                .iter()
                .all(|a| lobecast::chem::molecule::distance(*a, *p) > 0.3)
        })
        .collect()
}

/// Largest deviation of `gradients` from central differences of `evaluate` for
/// each field, relative to the largest gradient component of that field.
fn worst_errors(set: &OrbitalSet, fields: &[&str]) -> Vec<f64> {
    let fields: Vec<Field> = fields.iter().map(|f| Field::parse(f).unwrap()).collect();
    let sampler = FieldSampler::new(set, &fields).unwrap();
    let pts = points(set);
    let (n, nf) = (pts.len(), fields.len());
    let mut grad = vec![[0.0; 3]; n * nf];
    sampler.gradients(&pts, &mut grad);
    let mut fd = vec![[0.0; 3]; n * nf];
    let (mut plus, mut minus) = (vec![0.0; n * nf], vec![0.0; n * nf]);
    for i in 0..3 {
        let shift = |s: f64| -> Vec<[f64; 3]> {
            pts.iter()
                .map(|p| {
                    let mut q = *p;
                    q[i] += s;
                    q
                })
                .collect()
        };
        sampler.evaluate(&shift(H), &mut plus);
        sampler.evaluate(&shift(-H), &mut minus);
        for (k, g) in fd.iter_mut().enumerate() {
            g[i] = (plus[k] - minus[k]) / (2.0 * H);
        }
    }
    (0..nf)
        .map(|k| {
            let of_field = |v: &[[f64; 3]]| v.iter().skip(k).step_by(nf).copied().collect();
            let (a, b): (Vec<[f64; 3]>, Vec<[f64; 3]>) = (of_field(&grad), of_field(&fd));
            let scale = a.iter().flatten().fold(0.0f64, |m, v| m.max(v.abs()));
            assert!(scale > 0.0, "{}: zero gradient everywhere", fields[k]);
            a.iter()
                .zip(&b)
                .flat_map(|(x, y)| (0..3).map(move |i| (x[i] - y[i]).abs() / scale))
                .fold(0.0, f64::max)
        })
        .collect()
}

#[test]
fn every_field_of_huckel_water_matches_central_differences() {
    let fields = [
        "orbital:homo",
        "orbital:1",
        "orbital-density:homo-1",
        "orbital-deformation:homo-2",
        "density",
        "deformation",
    ];
    let errors = worst_errors(&water(), &fields);
    for (f, e) in fields.iter().zip(&errors) {
        eprintln!("water {f}: worst relative error {e:.2e}");
        assert!(*e < TOL, "{f}: {e:e}");
    }
}

#[test]
fn gaussian_fields_match_central_differences() {
    let fields = [
        "orbital:1",
        "orbital:4",
        "orbital-density:1",
        "orbital-deformation:1",
        "orbital-deformation:3",
        "density",
    ];
    let errors = worst_errors(&gaussian_h2_cation(), &fields);
    for (f, e) in fields.iter().zip(&errors) {
        eprintln!("Gaussian H2+ {f}: worst relative error {e:.2e}");
        assert!(*e < TOL, "{f}: {e:e}");
    }
}

/// Batching is invisible: 300 points at once (two internal batches) give the
/// same numbers, bit for bit, as one point at a time.
#[test]
fn batches_give_the_same_gradients_as_single_points() {
    let set = water();
    let fields = [Field::Density, Field::Deformation];
    let sampler = FieldSampler::new(&set, &fields).unwrap();
    let pts = points(&set);
    assert!(pts.len() > lobecast::field::gradient::BATCH);
    let mut all = vec![[0.0; 3]; pts.len() * 2];
    sampler.gradients(&pts, &mut all);
    for (p, pt) in pts.iter().enumerate() {
        let mut one = [[0.0; 3]; 2];
        sampler.gradients(&[*pt], &mut one);
        assert_eq!(one, [all[2 * p], all[2 * p + 1]]);
    }
}
