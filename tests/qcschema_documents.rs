//! QCSchema documents as orbital sources: shell forms the schema allows (fused,
//! general contractions, numbers as strings, rows or flat matrices), spin channels,
//! the normalisation warning, and lobecast's own `--qcschema` output read back.

mod common;

use common::{ok, run, write_file};
use lobecast::io::qcschema;
use serde_json::{Value, json};

/// H₂ at 1.4 bohr with the STO-3G contraction (Hehre, Stewart and Pople 1969, as
/// tabulated by the basis-set exchange; from memory) and the bonding / antibonding
/// pair; `c` is the flat row-major (functions × orbitals) matrix.
fn h2(c: Value) -> Value {
    let shell = json!({"angular_momentum": [0], "harmonic_type": "spherical",
        "exponents": ["3.42525091", "0.62391373", "0.16885540"],
        "coefficients": [["0.15432897", "0.53532814", "0.44463454"]]});
    json!({
        "schema_name": "qcschema_output", "schema_version": 1,
        "molecule": {"symbols": ["H", "H"], "geometry": [0.0, 0.0, 0.0, 0.0, 0.0, 1.4]},
        "driver": "energy", "model": {"method": "hf", "basis": "sto-3g"},
        "return_result": -1.1167, "success": true, "properties": {"scf_total_energy": -1.1167},
        "provenance": {"creator": "hand", "version": "1", "routine": "test"},
        "wavefunction": {
            "basis": {"name": "sto-3g", "center_data": {"H": {"electron_shells": [shell]}}, "atom_map": ["H", "H"]},
            "restricted": true, "scf_orbitals_a": c,
            "scf_eigenvalues_a": [-0.578, 0.670], "scf_occupations_a": [1.0, 0.0]
        }
    })
}

/// 1/√(2(1 ± S)) with S = 0.6593 for STO-3G H₂ at 1.4 bohr (Szabo and Ostlund,
/// Modern Quantum Chemistry, section 3.5.2; from memory).
fn h2_coefficients() -> (f64, f64) {
    let s: f64 = 0.659318;
    (
        1.0 / (2.0 * (1.0 + s)).sqrt(),
        1.0 / (2.0 * (1.0 - s)).sqrt(),
    )
}

#[test]
fn flat_and_row_matrices_read_alike_and_columns_are_orbitals() {
    let (g, u) = h2_coefficients();
    let flat = h2(json!([g, u, g, -u]));
    let rows = h2(json!([[g, u], [g, -u]]));
    let a = qcschema::parse(&flat.to_string(), "flat").unwrap();
    let b = qcschema::parse(&rows.to_string(), "rows").unwrap();
    for set in [&a, &b] {
        assert_eq!(set.orbitals[0].coefficients, vec![g, g]);
        assert_eq!(set.orbitals[1].coefficients, vec![u, -u]);
        // Restricted per-spin occupation 1 is a doubly filled orbital.
        assert_eq!(set.orbitals[0].occupation, 2.0);
        assert_eq!(set.spin.total_energy, Some(-1.1167));
        // The document says hf/sto-3g: both cautions go with the numbers.
        use lobecast::solve::Caveat;
        assert!(set.has_caveat(Caveat::Uncorrelated) && set.has_caveat(Caveat::MinimalBasis));
        assert_eq!(set.caveats.len(), 2);
        // Normalised to the overlap's precision: ⟨ψ|ψ⟩ = 2c²(1 ± S) = 1.

        let s = set.overlap.as_ref().unwrap();
        assert!((s[(0, 1)] - 0.659318).abs() < 2e-6, "S = {}", s[(0, 1)]);
    }
}

#[test]
fn fused_and_general_contractions_expand_in_row_order() {
    // A 6-31G-like sp shell fused as [0, 1], and a general contraction of two s
    // rows: 1 + 3 + 2 functions on the one atom.
    let sp = json!({"angular_momentum": [0, 1], "harmonic_type": "cartesian",
        "exponents": [3.0, 0.7], "coefficients": [[-0.1, 1.1], [0.2, 0.9]]});
    let general = json!({"angular_momentum": [0], "harmonic_type": "spherical",
        "exponents": [5.0, 1.0], "coefficients": [[1.0, 0.0], [0.0, 1.0]]});
    let mut doc = h2(json!([]));
    doc["molecule"] =
        json!({"symbols": ["Li"], "geometry": [0.0, 0.0, 0.0], "molecular_multiplicity": 2});
    doc["wavefunction"]["basis"] = json!({"center_data": {"Li": {"electron_shells": [sp, general]}}, "atom_map": ["Li"], "nbf": 6});
    let mut c = vec![0.0; 36];
    for i in 0..6 {
        c[i * 6 + i] = 1.0;
    }
    doc["wavefunction"]["restricted"] = json!(false);
    doc["wavefunction"]["scf_orbitals_a"] = json!(c);
    doc["wavefunction"]["scf_orbitals_b"] = json!(c);
    for s in ["a", "b"] {
        doc["wavefunction"][format!("scf_eigenvalues_{s}")] = json!([0.0, 0.1, 0.2, 0.3, 0.4, 0.5]);
    }
    doc["wavefunction"]["scf_occupations_a"] = json!([1.0, 1.0, 0.0, 0.0, 0.0, 0.0]);
    doc["wavefunction"]["scf_occupations_b"] = json!([1.0, 0.0, 0.0, 0.0, 0.0, 0.0]);
    let set = qcschema::parse(&doc.to_string(), "fused").unwrap();
    let labels: Vec<String> = set
        .basis
        .function_labels()
        .into_iter()
        .map(|(_, l)| l)
        .collect();
    let kinds: Vec<&str> = labels
        .iter()
        .map(|l| l.split('(').next().unwrap())
        .collect();
    assert_eq!(kinds, ["s", "x", "y", "z", "s", "s"], "{labels:?}");
    // The fused p row has the second coefficient row's weights, the general
    // contraction's rows are one primitive each.
    let prims: Vec<Vec<(f64, f64)>> = set
        .basis
        .shells
        .iter()
        .map(|s| match s {
            lobecast::basis::Shell::Gaussian(g) => g.primitives.clone(),
            _ => unreachable!(),
        })
        .collect();
    assert_eq!(prims[1], vec![(3.0, 0.2), (0.7, 0.9)]);
    assert_eq!(prims[2], vec![(5.0, 1.0), (1.0, 0.0)]);
    assert_eq!(prims[3], vec![(5.0, 0.0), (1.0, 1.0)]);
    assert!(set.spin.beta.is_some());
    assert_eq!(set.molecule.charge, 0);
}

#[test]
fn restricted_open_shell_occupations_keep_both_spins() {
    // H₂⁺ as a restricted open shell: one alpha electron, none beta.
    let (g, u) = h2_coefficients();
    let mut doc = h2(json!([g, u, g, -u]));
    doc["wavefunction"]["scf_occupations_b"] = json!([0.0, 0.0]);
    doc["molecule"]["molecular_charge"] = json!(1.0);
    doc["molecule"]["molecular_multiplicity"] = json!(2);
    let set = qcschema::parse(&doc.to_string(), "rohf").unwrap();
    assert_eq!(set.orbitals[0].occupation, 1.0);
    let beta = set.spin.beta.as_ref().expect("two channels");
    assert_eq!(beta[0].occupation, 0.0);
    assert_eq!(beta[0].coefficients, set.orbitals[0].coefficients);
    assert_eq!(set.molecule.charge, 1);
}

#[test]
fn unnormalised_orbitals_warn_and_renormalize_fixes_them() {
    let d = tempfile::tempdir().unwrap();
    let (g, u) = h2_coefficients();
    // The bonding orbital scaled by 1.2: ⟨ψ|ψ⟩ = 1.44.
    let doc = h2(json!([1.2 * g, u, 1.2 * g, -u]));
    write_file(d.path(), "h2.json", &doc.to_string());
    let out = run(d.path(), &["solve", "h2.json"]);
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(out.status.success(), "{err}");
    assert!(
        err.contains("wavefunction.scf_orbitals_a orbital 0") && err.contains("1.440000"),
        "{err}"
    );
    // Electron count of the density on a grid (0.15 bohr spacing, common practice):
    // 2.88 as given, 2 after --renormalize.
    for (flags, want) in [(vec![], 2.88), (vec!["--renormalize"], 2.0)] {
        let mut args = vec![
            "volume",
            "h2.json",
            "--field",
            "density",
            "--units",
            "bohr",
            "--spacing",
            "0.15",
            "--padding",
            "7",
            "--out",
            "d.cube",
        ];
        args.extend(flags);
        ok(d.path(), &args);
        let text = std::fs::read_to_string(d.path().join("d.cube")).unwrap();
        let total = cube_integral(&text);
        assert!((total - want).abs() < 2e-3, "∫ρ = {total}, want {want}");
    }
}

/// Σ values × voxel volume of an orthogonal single-field cube.
fn cube_integral(text: &str) -> f64 {
    let lines: Vec<&str> = text.lines().collect();
    let natoms: i64 = lines[2].split_whitespace().next().unwrap().parse().unwrap();
    let mut vol = 1.0;
    for k in 0..3 {
        let f: Vec<f64> = lines[3 + k]
            .split_whitespace()
            .map(|x| x.parse().unwrap())
            .collect();
        vol *= f[1 + k];
    }
    let start = 6 + natoms.unsigned_abs() as usize;
    let sum: f64 = lines[start..]
        .iter()
        .flat_map(|l| l.split_whitespace())
        .map(|x| x.parse::<f64>().unwrap())
        .sum();
    sum * vol
}

#[test]
fn own_output_reads_back_to_the_same_document() {
    let d = tempfile::tempdir().unwrap();
    // Water at an experimental geometry (common practice), Cartesian d (6-31G*), and
    // the water cation UHF in cc-pVDZ (pure d).
    write_file(
        d.path(),
        "w.xyz",
        "3\nwater\nO 0 0 0.1173\nH 0 0.7572 -0.4692\nH 0 -0.7572 -0.4692\n",
    );
    for (i, args) in [
        vec!["--method", "rhf", "--basis", "6-31g*"],
        vec!["--method", "uhf", "--basis", "cc-pvdz", "--charge", "1"],
    ]
    .iter()
    .enumerate()
    {
        let first = format!("a{i}.json");
        let second = format!("b{i}.json");
        let mut cmd = vec!["solve", "w.xyz", "--qcschema", first.as_str()];
        cmd.extend(args.iter().copied());
        ok(d.path(), &cmd);
        ok(d.path(), &["solve", &first, "--qcschema", &second]);
        let a = std::fs::read(d.path().join(&first)).unwrap();
        let b = std::fs::read(d.path().join(&second)).unwrap();
        assert!(a == b, "{first} and {second} differ");
        let v: Value = serde_json::from_slice(&a).unwrap();
        assert_eq!(v["schema_name"], "qcschema_output");
        assert_eq!(v["wavefunction"]["restricted"], json!(i == 0));
    }
}

#[test]
fn qcschema_output_refused_for_slater_bases_before_any_file() {
    let d = tempfile::tempdir().unwrap();
    let model = common::example("h2-cation.toml");
    let out = run(
        d.path(),
        &["solve", model.to_str().unwrap(), "--qcschema", "x.json"],
    );
    common::assert_input_error(d.path(), &out, "Slater", &[]);
}
