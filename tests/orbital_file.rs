//! The orbital file: what lobecast writes it reads back to identical numbers, and
//! malformed files are refused with one error that names the field at fault.

mod common;

use lobecast::field::{Field, FieldSampler};
use lobecast::io::orbitals::{parse, to_json};

/// H2⁺ with the 1s exponent set to 1.2.
fn h2() -> String {
    format!("{}zeta = {{ H = 1.2 }}\n", common::H2)
}

const GAUSSIAN: &str = r#"{
  "format": "lobecast-orbitals", "version": 1, "length_unit": "bohr", "energy_unit": "hartree",
  "atoms": [{"element": "H", "atomic_number": 1, "position": [0.0, 0.0, -1.0]},
            {"element": "He", "atomic_number": 2, "position": [0.0, 0.0, 1.0]}],
  "basis": [
    {"atom": 0, "type": "slater", "n": 1, "l": 0, "m": 0, "zeta": 1.0},
    {"atom": 1, "type": "gaussian", "powers": [0, 0, 1], "primitives": [[5.0, 0.3], [1.2, 0.8]]},
    {"atom": 1, "type": "gaussian", "l": 2, "m": -2, "primitives": [[0.8, 1.0]]}
  ],
  "orbitals": [{"energy": -1.1, "occupation": 1.0, "coefficients": [0.5, 0.1, 0.2]},
               {"energy": -1.5, "occupation": 0.0, "coefficients": [0.1, 0.5, 0.0]}]
}"#;

fn values(set: &lobecast::solve::OrbitalSet, fields: &[&str], pts: &[[f64; 3]]) -> Vec<f64> {
    let fields: Vec<Field> = common::fields(fields);
    let s = FieldSampler::new(set, &fields).unwrap();
    let mut v = vec![0.0; pts.len() * fields.len()];
    s.evaluate(pts, &mut v);
    v
}

#[test]
fn round_trip_keeps_every_number() {
    let set = common::solve_model(&h2());
    let text = to_json(&set);
    let back = parse(&text, "o.json").unwrap();
    // Version 2 energies are eigenvalues: the one-electron solver's total energies
    // come back less the nuclear repulsion, everything else bit for bit.
    let enn = set.molecule.nuclear_repulsion();
    for (b, s) in back.orbitals.iter().zip(&set.orbitals) {
        assert_eq!(
            (&b.coefficients, b.occupation),
            (&s.coefficients, s.occupation)
        );
        assert!(
            (b.energy - (s.energy - enn)).abs() < 1e-14,
            "{} {}",
            b.energy,
            s.energy
        );
    }
    assert_eq!(back.orbitals.len(), set.orbitals.len());
    assert_eq!(back.spin.total_energy, Some(set.orbitals[0].energy));
    assert_eq!(back.molecule.atoms, set.molecule.atoms);
    assert_eq!(back.molecule.charge, 1);
    let pts = [[0.1, 0.2, 0.3], [1.0, -2.0, 0.5], [0.0, 0.0, 0.0]];
    let f = ["orbital:1", "orbital:2", "orbital-deformation:1"];
    assert_eq!(values(&back, &f, &pts), values(&set, &f, &pts));
    assert_eq!(to_json(&back), text, "writing again gives the same text");
}

#[test]
fn mixed_basis_is_read_sorted_and_grouped() {
    let set = parse(GAUSSIAN, "g.json").unwrap();
    assert_eq!(set.basis.len(), 3);
    assert_eq!(
        set.orbitals[0].energy, -1.5,
        "orbitals are renumbered by energy"
    );
    assert!(set.notes.iter().any(|n| n.contains("renumbered")));
    // A mixed Slater/Gaussian basis has no overlap matrix here, so Mulliken-based
    // fields are refused while plain orbital fields work.
    let f = Field::parse("orbital-deformation:1").unwrap();
    assert!(FieldSampler::new(&set, &[f]).is_err());
    assert_eq!(values(&set, &["orbital:1"], &[[0.0, 0.0, 1.0]]).len(), 1);
}

#[test]
fn malformed_files_name_the_field() {
    let cases: Vec<(String, &str)> = vec![
        (
            GAUSSIAN.replace("[0.5, 0.1, 0.2]", "[0.5, 0.1]"),
            "orbitals[0].coefficients",
        ),
        (
            GAUSSIAN.replace("[[0.8, 1.0]]", "[[-0.8, 1.0]]"),
            "basis[2].primitives[0]",
        ),
        (
            GAUSSIAN.replace("\"type\": \"slater\"", "\"type\": \"bessel\""),
            "bessel",
        ),
        (GAUSSIAN.replace("-1.1", "NaN"), "line"),
        (
            GAUSSIAN.replace(
                "\"atom\": 1, \"type\": \"gaussian\", \"l\"",
                "\"atom\": 7, \"type\": \"gaussian\", \"l\"",
            ),
            "basis[2].atom",
        ),
        (
            GAUSSIAN.replace("\"version\": 1", "\"version\": 3"),
            "version",
        ),
        (
            GAUSSIAN.replace("\"version\": 1,", "\"version\": 1, \"multiplicity\": 2,"),
            "multiplicity",
        ),
        (
            GAUSSIAN
                .replace("\"version\": 1", "\"version\": 2")
                .replace("\"orbitals\":", "\"orbitals_alpha\":"),
            "orbitals_beta",
        ),
        (
            GAUSSIAN.replace("\"atomic_number\": 2", "\"atomic_number\": 3"),
            "atoms[1].atomic_number",
        ),
        (
            GAUSSIAN.replace("\"l\": 2, \"m\": -2", "\"l\": 2, \"m\": -3"),
            "basis[2]",
        ),
        (
            GAUSSIAN.replace("\"occupation\": 1.0", "\"occupation\": 3.0"),
            "orbitals[0].occupation",
        ),
        (
            GAUSSIAN.replace("\"energy_unit\"", "\"energy_units\""),
            "energy_units",
        ),
    ];
    for (text, needle) in cases {
        let e = parse(&text, "bad.json").expect_err(needle);
        // A malformed file is the user's to fix: exit status 2.
        assert_eq!(e.kind, lobecast::error::Kind::Input, "{}", e.message);
        assert!(
            e.message.contains(needle) && e.message.starts_with("bad.json"),
            "{needle}: {}",
            e.message
        );
        assert!(!e.message.contains('\n'), "one line: {}", e.message);
    }
}

/// Hardening item 10: an orbital at occupation 0.7 counts 0.7 electrons, and a
/// valence-only file of Ti and Fe (one doubly occupied orbital against a nuclear
/// charge of 48) gets no invented charge in its title.
#[test]
fn fractional_occupations_and_partial_files_invent_no_charge() {
    let d = tempfile::tempdir().unwrap();
    let frac = r#"{"format": "lobecast-orbitals", "version": 1, "length_unit": "bohr", "energy_unit": "hartree",
      "atoms": [{"element": "H", "atomic_number": 1, "position": [0.0, 0.0, -1.0]},
                {"element": "H", "atomic_number": 1, "position": [0.0, 0.0, 1.0]}],
      "basis": [{"atom": 0, "type": "gaussian", "powers": [0, 0, 0], "primitives": [[1.0, 1.0]]},
                {"atom": 1, "type": "gaussian", "powers": [0, 0, 0], "primitives": [[1.0, 1.0]]}],
      "orbitals": [{"energy": -0.5, "occupation": 0.7, "coefficients": [0.6, 0.6]}]}"#;
    std::fs::write(d.path().join("frac.json"), frac).unwrap();
    let out = std::process::Command::new(common::BIN)
        .current_dir(d.path())
        .args(["solve", "frac.json"])
        .output()
        .unwrap();
    let text = String::from_utf8_lossy(&out.stdout);
    assert!(text.contains("0.7000 electron(s)"), "{text}");
    let partial = frac
        .replace(
            r#""element": "H", "atomic_number": 1, "position": [0.0, 0.0, -1.0]"#,
            r#""element": "Ti", "atomic_number": 22, "position": [0.0, 0.0, -2.0]"#,
        )
        .replace(
            r#""element": "H", "atomic_number": 1, "position": [0.0, 0.0, 1.0]"#,
            r#""element": "Fe", "atomic_number": 26, "position": [0.0, 0.0, 2.0]"#,
        )
        .replace("0.7", "2.0");
    let set = parse(&partial, "p.json").unwrap();
    assert_eq!(set.molecule.formula_with_charge(), "FeTi");
    assert!(set.notes.iter().any(|n| n.contains("no charge is shown")));
}

/// An orbital file whose orbital is off 1 (here scaled by 1.3, ⟨ψ|ψ⟩ = 1.69): the
/// reader warns, and `--renormalize` scales it so that ∫|ψ|² = 1 to 1e-3 on a
/// 0.15-bohr grid (the definition; trapezoid sums of these wide Gaussians are
/// spectrally accurate).
#[test]
fn renormalize_fixes_an_unnormalised_orbital() {
    let d = tempfile::tempdir().unwrap();
    // H atom, STO-3G 1s (exponents and coefficients: basis-set-exchange STO-3G H).
    let text = r#"{"format": "lobecast-orbitals", "version": 1, "length_unit": "bohr", "energy_unit": "hartree",
  "atoms": [{"element": "H", "atomic_number": 1, "position": [0.0, 0.0, 0.0]}],
  "basis": [{"atom": 0, "type": "gaussian", "powers": [0, 0, 0],
             "primitives": [[3.425250914, 0.1543289673], [0.6239137298, 0.5353281423], [0.168855404, 0.4446345422]]}],
  "orbitals": [{"energy": -0.47, "occupation": 1.0, "coefficients": [1.3]}]}"#;
    let path = common::write_file(d.path(), "h.json", text);
    let out = common::run(d.path(), &["solve", "h.json"]);
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(
        err.contains("warning:") && err.contains("orbitals[0] has ⟨ψ|ψ⟩ = 1.690000"),
        "{err}"
    );
    let options = lobecast::io::model::LoadOptions {
        renormalize: true,
        ..Default::default()
    };
    let model = lobecast::io::model::load_with(&path, &options).unwrap();
    let set = model.solve().unwrap();
    assert!(
        set.notes.iter().any(|n| n.contains("1 orbital(s) scaled")),
        "{:?}",
        set.notes
    );
    let s = FieldSampler::new(&set, &common::fields(&["orbital-density:1"])).unwrap();
    let (h, half) = (0.15, 50i32);
    let mut total = 0.0;
    let mut v = vec![0.0; (2 * half as usize + 1).pow(2)];
    for i in -half..=half {
        let pts: Vec<[f64; 3]> = (-half..=half)
            .flat_map(|j| (-half..=half).map(move |k| [i as f64 * h, j as f64 * h, k as f64 * h]))
            .collect();
        s.evaluate(&pts, &mut v);
        total += v.iter().sum::<f64>();
    }
    let integral = total * h * h * h;
    assert!((integral - 1.0).abs() < 1e-3, "∫|ψ|² = {integral}");
    // Solved orbitals are normalised already: the flag is refused there.
    let e =
        lobecast::io::model::load_with(&common::example("h2-cation.toml"), &options).unwrap_err();
    assert!(
        e.message
            .contains("--renormalize applies to orbitals read from a file")
    );
}
