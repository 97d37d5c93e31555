//! Hardening of solving and orbital selection as a hostile user meets them: huge
//! or out-of-range orbital selectors, molecules and shells too large to solve, and
//! count options out of range. Each case must give exit status 2, one `error:` line
//! (plus at most a `hint:` line) and no file left behind.

mod common;

use common::{H2, assert_input_error, run, write_file};

/// The reported case: `lumo+18446744073709551615` wrapped around and wrote the HOMO
/// with exit status 0. H2⁺ in slater-1s has two orbitals, the lower one occupied.
#[test]
fn huge_orbital_offsets_are_refused() {
    let d = tempfile::tempdir().unwrap();
    write_file(d.path(), "h2.toml", H2);
    let cases: &[(&str, &str)] = &[
        (
            "orbital:lumo+18446744073709551615",
            "past the last orbital: lumo is orbital 2 and the set has 2 orbitals (1 to 2)",
        ),
        (
            "orbital:lumo+18446744073709551614",
            "the set has 2 orbitals (1 to 2)",
        ),
        (
            "orbital:lumo+1",
            "orbital:lumo+1 is orbital 3 but the set has 2 orbitals (1 to 2); lumo is orbital 2, so lumo+K needs K from 0 to 0",
        ),
        (
            "orbital-density:homo-1",
            "below orbital 1: homo is orbital 1 and the set has 2 orbitals (1 to 2), so homo-K needs K from 0 to 0",
        ),
        ("orbital:homo-18446744073709551615", "below orbital 1"),
        ("orbital:0", "numbered from 1"),
        (
            "orbital:3",
            "orbital:3 is orbital 3 but the set has 2 orbitals",
        ),
    ];
    for (field, needle) in cases {
        let out = run(
            d.path(),
            &[
                "volume", "h2.toml", "--field", field, "--points", "8", "--out", "o.cube",
            ],
        );
        assert_input_error(d.path(), &out, needle, &["h2.toml"]);
    }
}

/// The reported case: an XYZ file of 20 000 atoms made `solve` grow to 9 GB. 20 000
/// hydrogen atoms on a 1.5 Å cubic lattice (no two closer than 0.1 Å) give 20 000
/// valence functions, about 27 GiB by the estimate: refused before any matrix is
/// built, with the estimate in GiB in the message.
#[test]
fn twenty_thousand_atoms_are_refused_with_the_estimate() {
    let d = tempfile::tempdir().unwrap();
    let mut xyz = String::from("20000\nhydrogen lattice\n");
    for k in 0..20_000 {
        let (i, j, l) = (k % 30, (k / 30) % 30, k / 900);
        xyz += &format!(
            "H {:.3} {:.3} {:.3}\n",
            1.5 * i as f64,
            1.5 * j as f64,
            1.5 * l as f64
        );
    }
    write_file(d.path(), "big.xyz", &xyz);
    let out = run(
        d.path(),
        &[
            "solve",
            "big.xyz",
            "--method",
            "extended-huckel",
            "--json",
            "o.json",
        ],
    );
    let err = assert_input_error(d.path(), &out, "GiB", &["big.xyz"]);
    assert!(
        err.contains("20000 basis functions") && err.contains("over the budget of 8.0 GiB"),
        "{err}"
    );
    // A smaller budget refuses a small molecule too, naming the budget given.
    write_file(d.path(), "h2.xyz", "2\nH2\nH 0 0 0\nH 0 0 0.74\n");
    let out = run(
        d.path(),
        &[
            "solve",
            "h2.xyz",
            "--method",
            "extended-huckel",
            "--memory",
            "1",
        ],
    );
    assert_input_error(d.path(), &out, "over the budget", &["big.xyz", "h2.xyz"]);
    let out = run(
        d.path(),
        &[
            "solve",
            "h2.xyz",
            "--method",
            "extended-huckel",
            "--memory",
            "lots",
        ],
    );
    assert_eq!(out.status.code(), Some(2));
}

/// The reported case: one Gaussian of 5 000 primitives took 16 s. Shells are
/// limited to 100 primitives (documented in the README).
#[test]
fn a_five_thousand_primitive_shell_is_refused() {
    let d = tempfile::tempdir().unwrap();
    let prims: Vec<String> = (0..5000)
        .map(|k| format!("[{}, 1.0]", 0.1 * 1.001f64.powi(k)))
        .collect();
    let model = format!(
        "[molecule]\nunits = \"bohr\"\ncharge = 0\natoms = [{{ element = \"H\", position = [0, 0, 0] }}]\n\
         [basis]\nset = \"custom\"\n[basis.shells]\nH = [{{ l = 0, primitives = [{}] }}]\n",
        prims.join(", ")
    );
    write_file(d.path(), "wide.toml", &model);
    let out = run(d.path(), &["solve", "wide.toml"]);
    assert_input_error(
        d.path(),
        &out,
        "1 to 100 primitives, this one has 5000",
        &["wide.toml"],
    );
}

/// Hardening item 7: 1000 functions of 100 primitives each (5 × 10⁹ primitive
/// pairs, hours of integrals) are refused at once with the count, before any
/// integral; the limit is 10⁹ pairs (src/solve/estimate.rs, measured there).
#[test]
fn a_basis_of_too_many_primitive_pairs_is_refused_at_once() {
    let d = tempfile::tempdir().unwrap();
    let prims: Vec<String> = (0..100)
        .map(|k| format!("[{}, 1.0]", 0.1 * 1.07f64.powi(k)))
        .collect();
    let basis: Vec<String> = (0..1000)
        .map(|i| {
            format!(
                r#"{{"atom": {}, "type": "gaussian", "powers": [0, 0, 0], "primitives": [{}]}}"#,
                i % 2,
                prims.join(", ")
            )
        })
        .collect();
    let mut coefficients = vec!["0.0"; 1000];
    coefficients[0] = "1.0";
    let doc = format!(
        r#"{{"format": "lobecast-orbitals", "version": 1, "length_unit": "bohr", "energy_unit": "hartree",
          "atoms": [{{"element": "H", "atomic_number": 1, "position": [0, 0, -0.7]}},
                    {{"element": "H", "atomic_number": 1, "position": [0, 0, 0.7]}}],
          "basis": [{}],
          "orbitals": [{{"energy": -0.5, "occupation": 1.0, "coefficients": [{}]}}]}}"#,
        basis.join(", "),
        coefficients.join(", ")
    );
    write_file(d.path(), "wide.json", &doc);
    let started = std::time::Instant::now();
    let out = run(d.path(), &["solve", "wide.json"]);
    assert_input_error(d.path(), &out, "5.00e9 pairs", &["wide.json"]);
    assert!(
        started.elapsed().as_secs() < 20,
        "refused before any integral"
    );
}
