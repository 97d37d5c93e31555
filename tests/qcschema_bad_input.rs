//! Malformed QCSchema documents: each gets one `error:` line naming the JSON path of
//! the field at fault, exit status 2, no output file, in well under a second — and
//! counts the document claims (10⁹ functions, electrons, l) are never allocated
//! (each case runs under a 1 GiB address-space limit).

mod common;

use common::{assert_input_error, ok, write_file};
use serde_json::{Value, json};
use std::time::{Duration, Instant};

/// A valid water-like document: O with a fused sp shell and a d shell, two H.
fn base() -> Value {
    let o = json!({"electron_shells": [
        {"angular_momentum": [0], "harmonic_type": "spherical", "exponents": [130.7, 23.8, 6.44], "coefficients": [[0.154, 0.535, 0.444]]},
        {"angular_momentum": [0, 1], "harmonic_type": "cartesian", "exponents": [5.03, 1.17, 0.38], "coefficients": [[-0.1, 0.4, 0.7], [0.16, 0.61, 0.39]]},
    ]});
    let h = json!({"electron_shells": [
        {"angular_momentum": [0], "harmonic_type": "spherical", "exponents": [3.43, 0.62, 0.17], "coefficients": [[0.154, 0.535, 0.444]]}
    ]});
    let nbf = 7;
    let mut c = vec![0.0; nbf * nbf];
    for i in 0..nbf {
        c[i * nbf + i] = 1.0;
    }
    json!({
        "schema_name": "qcschema_output", "schema_version": 1,
        "molecule": {"symbols": ["O", "H", "H"],
                     "geometry": [0.0, 0.0, 0.22, 0.0, 1.43, -0.89, 0.0, -1.43, -0.89],
                     "molecular_charge": 0, "molecular_multiplicity": 1},
        "driver": "energy", "model": {"method": "hf", "basis": "test"}, "return_result": -75.0,
        "success": true, "properties": {"calcinfo_nalpha": 5, "calcinfo_nbeta": 5},
        "provenance": {"creator": "test", "version": "0", "routine": "hand"},
        "wavefunction": {
            "basis": {"name": "test", "center_data": {"O": o, "H": h}, "atom_map": ["O", "H", "H"], "nbf": nbf},
            "restricted": true, "scf_orbitals_a": c,
            "scf_eigenvalues_a": [-20.0, -1.3, -0.7, -0.5, -0.4, 0.6, 0.8],
            "scf_occupations_a": [1.0, 1.0, 1.0, 1.0, 1.0, 0.0, 0.0]
        }
    })
}

/// (what is changed, the change, a piece of the expected message).
type Case = (&'static str, fn(&mut Value), &'static str);

fn cases() -> Vec<Case> {
    vec![
        (
            "no wavefunction",
            |d| drop(d.as_object_mut().unwrap().remove("wavefunction")),
            "wavefunction: missing",
        ),
        (
            "a molecule document",
            |d| d["schema_name"] = json!("qcschema_molecule"),
            "schema_name",
        ),
        (
            "a failed computation",
            |d| d["success"] = json!(false),
            "success",
        ),
        (
            "no molecule",
            |d| drop(d.as_object_mut().unwrap().remove("molecule")),
            "molecule: missing",
        ),
        (
            "unknown element",
            |d| d["molecule"]["symbols"][1] = json!("Qq"),
            "molecule.symbols[1]",
        ),
        (
            "short geometry",
            |d| d["molecule"]["geometry"] = json!([0.0, 0.0, 0.0, 1.0, 1.0]),
            "molecule.geometry",
        ),
        (
            "text in geometry",
            |d| d["molecule"]["geometry"][2] = json!("abc"),
            "molecule.geometry[2]",
        ),
        (
            "atomic number disagrees",
            |d| d["molecule"]["atomic_numbers"] = json!([7, 1, 1]),
            "molecule.atomic_numbers[0]",
        ),
        (
            "half charge",
            |d| d["molecule"]["molecular_charge"] = json!(0.5),
            "molecule.molecular_charge",
        ),
        (
            "multiplicity 0",
            |d| d["molecule"]["molecular_multiplicity"] = json!(0),
            "molecule.molecular_multiplicity",
        ),
        (
            "charge disagrees with occupations",
            |d| d["molecule"]["molecular_charge"] = json!(2),
            "molecule.molecular_charge",
        ),
        (
            "coincident atoms",
            |d| {
                d["molecule"]["geometry"][4] = json!(0.0);
                d["molecule"]["geometry"][5] = json!(0.22);
            },
            "molecule.symbols",
        ),
        (
            "unknown harmonic type",
            |d| {
                d["wavefunction"]["basis"]["center_data"]["O"]["electron_shells"][0]["harmonic_type"] =
                    json!("polar")
            },
            "center_data.O.electron_shells[0].harmonic_type",
        ),
        (
            "l = 4",
            |d| {
                d["wavefunction"]["basis"]["center_data"]["H"]["electron_shells"][0]["angular_momentum"] =
                    json!([4])
            },
            "center_data.H.electron_shells[0].angular_momentum[0]",
        ),
        (
            "l = 10⁹",
            |d| {
                d["wavefunction"]["basis"]["center_data"]["H"]["electron_shells"][0]["angular_momentum"] =
                    json!([1_000_000_000u64])
            },
            "angular_momentum[0]",
        ),
        (
            "negative l",
            |d| {
                d["wavefunction"]["basis"]["center_data"]["H"]["electron_shells"][0]["angular_momentum"] =
                    json!([-1])
            },
            "angular_momentum[0]",
        ),
        (
            "negative exponent",
            |d| {
                d["wavefunction"]["basis"]["center_data"]["O"]["electron_shells"][0]["exponents"]
                    [1] = json!(-23.8)
            },
            "electron_shells[0].exponents[1]",
        ),
        (
            "exponent not a number",
            |d| {
                d["wavefunction"]["basis"]["center_data"]["O"]["electron_shells"][0]["exponents"]
                    [0] = json!("1.2.3")
            },
            "electron_shells[0].exponents[0]",
        ),
        (
            "coefficient row too short",
            |d| {
                d["wavefunction"]["basis"]["center_data"]["O"]["electron_shells"][1]["coefficients"]
                    [1] = json!([0.1, 0.2])
            },
            "electron_shells[1].coefficients[1]",
        ),
        (
            "fused shell with one row",
            |d| {
                d["wavefunction"]["basis"]["center_data"]["O"]["electron_shells"][1]["coefficients"] =
                    json!([[0.1, 0.2, 0.3]])
            },
            "electron_shells[1].coefficients",
        ),
        (
            "core potential",
            |d| d["wavefunction"]["basis"]["center_data"]["O"]["ecp_electrons"] = json!(2),
            "center_data.O.ecp_electrons",
        ),
        (
            "unknown centre",
            |d| d["wavefunction"]["basis"]["atom_map"][2] = json!("N"),
            "atom_map[2]",
        ),
        (
            "atom map too short",
            |d| d["wavefunction"]["basis"]["atom_map"] = json!(["O", "H"]),
            "wavefunction.basis.atom_map",
        ),
        (
            "nbf claims 10⁹",
            |d| d["wavefunction"]["basis"]["nbf"] = json!(1_000_000_000u64),
            "wavefunction.basis.nbf",
        ),
        (
            "restricted not a boolean",
            |d| d["wavefunction"]["restricted"] = json!("yes"),
            "wavefunction.restricted",
        ),
        (
            "orbital matrix of the wrong size",
            |d| d["wavefunction"]["scf_orbitals_a"] = json!([1.0, 0.0, 0.0]),
            "wavefunction.scf_orbitals_a",
        ),
        (
            "orbital matrix mixing rows and numbers",
            |d| d["wavefunction"]["scf_orbitals_a"] = json!([[1.0], 0.0]),
            "wavefunction.scf_orbitals_a",
        ),
        (
            "no orbitals",
            |d| {
                drop(
                    d["wavefunction"]
                        .as_object_mut()
                        .unwrap()
                        .remove("scf_orbitals_a"),
                )
            },
            "wavefunction.scf_orbitals_a",
        ),
        (
            "eigenvalues of the wrong length",
            |d| d["wavefunction"]["scf_eigenvalues_a"] = json!([-1.0]),
            "wavefunction.scf_eigenvalues_a",
        ),
        (
            "occupation 2 per spin",
            |d| d["wavefunction"]["scf_occupations_a"][0] = json!(2.0),
            "wavefunction.scf_occupations_a[0]",
        ),
        (
            "unrestricted without beta",
            |d| d["wavefunction"]["restricted"] = json!(false),
            "wavefunction.scf_orbitals_b",
        ),
        (
            "localized orbitals named",
            |d| d["wavefunction"]["orbitals_a"] = json!("localized_orbitals_a"),
            "wavefunction.orbitals_a",
        ),
        (
            "10⁹ electrons claimed",
            |d| {
                drop(
                    d["wavefunction"]
                        .as_object_mut()
                        .unwrap()
                        .remove("scf_occupations_a"),
                );
                d["properties"]["calcinfo_nalpha"] = json!(1_000_000_000u64);
            },
            "properties.calcinfo_nalpha",
        ),
        ("truncated text", |_| {}, "line 1 column"),
    ]
}

#[test]
fn the_base_document_reads() {
    let d = tempfile::tempdir().unwrap();
    write_file(d.path(), "base.json", &base().to_string());
    let out = ok(d.path(), &["solve", "base.json"]);
    assert!(out.contains("H2O") && out.contains("HOMO"), "{out}");
}

#[test]
fn every_malformed_document_names_its_json_path() {
    let list = cases();
    assert!(
        list.len() >= 20,
        "the corpus must hold at least 20 documents"
    );
    for (what, change, needle) in list {
        let d = tempfile::tempdir().unwrap();
        let mut doc = base();
        change(&mut doc);
        let mut text = doc.to_string();
        if what == "truncated text" {
            text.truncate(text.len() / 2);
        }
        write_file(d.path(), "bad.json", &text);
        let start = Instant::now();
        // Under a 1 GiB address-space limit (common practice: the documents are a few
        // kilobytes; a count taken at its word would need gigabytes).
        let out = std::process::Command::new("sh")
            .arg("-c")
            .arg("ulimit -v 1048576 && exec \"$0\" \"$@\"")
            .arg(common::bin())
            .args(["solve", "bad.json", "--json", "out.json"])
            .current_dir(d.path())
            .stdin(std::process::Stdio::null())
            .output()
            .unwrap();
        let took = start.elapsed();
        let err = assert_input_error(d.path(), &out, needle, &["bad.json"]);
        // Tiny documents: a second is over a hundred times the usual run (common
        // practice for a bound that only catches runaway work).
        assert!(took < Duration::from_secs(1), "{what}: {took:?}");
        assert!(!err.contains("panicked"), "{what}: {err}");
    }
}
