//! `lobecast levels` and fragment weights: the two-centre ion's textbook picture,
//! the symmetry of ethylene's π levels, weights summing to one, the CSV energies
//! equal to `solve`'s and the figure's resolution.

mod common;

use common::{example, ok};
use lobecast::io::model::{LoadOptions, load, load_with};
use lobecast::solve::fragments::{Fragment, solve_fragments, weights};
use lobecast::solve::{MethodKind, OrbitalSet, orbitals_for};

const MEMORY: u64 = 1 << 30;

fn ion() -> (OrbitalSet, Vec<Fragment>, Vec<Vec<Vec<f64>>>) {
    let model = load(&example("h2-cation.toml")).unwrap();
    let set = orbitals_for(&model.molecule, &model.method).unwrap();
    let frags = solve_fragments(&set, &model.method, &[vec![0], vec![1]], MEMORY).unwrap();
    let w = weights(&set, &frags).unwrap();
    (set, frags, w)
}

/// Ethylene (examples/ethylene.xyz: C1 at −x with H5, H6; C2 at +x with H3, H4),
/// extended Hückel, split into its two CH₂ groups.
fn ethylene() -> (OrbitalSet, Vec<Fragment>, Vec<Vec<Vec<f64>>>) {
    let options = LoadOptions {
        method: Some(MethodKind::ExtendedHuckel),
        ..Default::default()
    };
    let model = load_with(&example("ethylene.xyz"), &options).unwrap();
    let set = orbitals_for(&model.molecule, &model.method).unwrap();
    let groups = [vec![0, 4, 5], vec![1, 2, 3]];
    let frags = solve_fragments(&set, &model.method, &groups, MEMORY).unwrap();
    let w = weights(&set, &frags).unwrap();
    (set, frags, w)
}

/// H₂⁺ (R = 2 bohr, 1s Slater ζ = 1) from two H atoms.
#[test]
fn the_ion_is_the_textbook_picture() {
    let (set, frags, w) = ion();
    // Hydrogen-like atom in a 1s Slater function: E = ζ²/2 − Zζ = −0.5 hartree for
    // ζ = Z = 1 (textbook, e.g. Levine, Quantum Chemistry, Sec. 13.5).
    for f in &frags {
        assert_eq!(f.set.orbitals.len(), 1);
        assert!((f.set.orbitals[0].energy + 0.5).abs() < 1e-12);
    }
    // Closed forms E± = E_1s + (J ± K)/(1 ± S) (Levine, Sec. 13.5, as quoted in
    // src/integrals/two_centre.rs), built here from the library's S, J and K.
    let t = lobecast::integrals::two_centre::two_centre_1s(1.0, 1.0, 2.0);
    let bonding = t.e_atom + (t.coulomb + t.exchange) / (1.0 + t.s);
    let antibonding = t.e_atom + (t.coulomb - t.exchange) / (1.0 - t.s);
    assert!((set.orbitals[0].energy - bonding).abs() < 1e-10);
    assert!((set.orbitals[1].energy - antibonding).abs() < 1e-10);
    assert!(set.orbitals[0].energy < -0.5 && set.orbitals[1].energy > -0.5);
    // Mirror symmetry of the two equal centres: each level is joined to both atoms
    // with weight exactly ½.
    for wi in &w {
        for f in wi {
            assert!((f[0] - 0.5).abs() < 1e-12, "{wi:?}");
        }
    }
}

/// The π (HOMO) and π* (LUMO) levels are odd under the molecular plane (z = 0), so
/// by symmetry only fragment orbitals odd under it (the CH₂ p_z orbitals) can enter.
#[test]
fn ethylene_pi_levels_join_only_the_fragments_pz() {
    let (set, frags, w) = ethylene();
    let homo = set
        .orbitals
        .iter()
        .rposition(|o| o.occupation > 0.0)
        .unwrap();
    assert_eq!(homo, 5, "6 occupied valence orbitals (12 electrons)");
    for (f, frag) in frags.iter().enumerate() {
        let labels = frag.set.basis.function_labels();
        let is_pz: Vec<bool> = frag
            .set
            .orbitals
            .iter()
            .map(|o| {
                let off: f64 = o
                    .coefficients
                    .iter()
                    .zip(&labels)
                    .filter(|(_, l)| !l.1.contains("pz"))
                    .map(|(c, _)| c.abs())
                    .sum();
                off < 1e-10
            })
            .collect();
        assert_eq!(
            is_pz.iter().filter(|p| **p).count(),
            1,
            "one p_z orbital per CH₂"
        );
        for i in [homo, homo + 1] {
            for (a, &pz) in is_pz.iter().enumerate() {
                if pz {
                    // Equal centres by the C2 symmetry exchanging the groups: ½ each.
                    assert!((w[i][f][a] - 0.5).abs() < 1e-9, "{}", w[i][f][a]);
                } else {
                    assert!(w[i][f][a] < 1e-12, "orbital {} frag {f} {a}", i + 1);
                }
            }
        }
    }
}

/// Σ_a w_ia = 1 for every molecular orbital, by construction of the normalisation;
/// the fragments' bases together are the molecular basis here.
#[test]
fn weights_of_each_level_sum_to_one() {
    for (set, frags, w) in [ion(), ethylene()] {
        let total: usize = frags.iter().map(|f| f.map.len()).sum();
        assert_eq!(total, set.basis.len());
        for wi in &w {
            let s: f64 = wi.iter().flatten().sum();
            assert!((s - 1.0).abs() < 1e-12, "{s}");
        }
    }
}

/// The CSV carries `solve`'s energies exactly (both print the shortest form that
/// reads back to the same double), and the PNG records the requested 300 dpi.
#[test]
fn csv_energies_equal_solve_and_png_records_dpi() {
    let dir = tempfile::tempdir().unwrap();
    let xyz = example("ethylene.xyz");
    let xyz = xyz.to_str().unwrap();
    ok(
        dir.path(),
        &[
            "levels",
            xyz,
            "--method",
            "extended-huckel",
            "--fragments",
            "1,5,6:2-4",
            "--csv",
            "l.csv",
            "--png",
            "l.png",
            "--dpi",
            "300",
        ],
    );
    ok(
        dir.path(),
        &[
            "solve",
            xyz,
            "--method",
            "extended-huckel",
            "--json",
            "s.json",
        ],
    );
    let json: serde_json::Value =
        serde_json::from_str(&std::fs::read_to_string(dir.path().join("s.json")).unwrap()).unwrap();
    let solved: Vec<f64> = json["orbitals"]
        .as_array()
        .unwrap()
        .iter()
        .map(|o| o["energy"].as_f64().unwrap())
        .collect();
    let csv = std::fs::read_to_string(dir.path().join("l.csv")).unwrap();
    let mut rows = 0;
    for line in csv.lines().skip(1) {
        let f: Vec<&str> = line.split(',').collect();
        let i: usize = f[0].parse().unwrap();
        let e: f64 = f[2].parse().unwrap();
        assert_eq!(e, solved[i - 1], "orbital {i}");
        rows += 1;
    }
    // 12 molecular orbitals × (6 + 6) fragment orbitals.
    assert_eq!(rows, 12 * 12);
    let dec = png::Decoder::new(std::io::BufReader::new(
        std::fs::File::open(dir.path().join("l.png")).unwrap(),
    ));
    let r = dec.read_info().unwrap();
    // 300 dpi = 300 / 0.0254 px per metre = 11811 (PNG spec, pHYs chunk).
    assert_eq!(r.info().pixel_dims.unwrap().xppu, 11811);
}

/// An orbital file draws its levels, but has no Hamiltonian to solve a fragment
/// with: `--fragments` is refused with one error line and no file written.
#[test]
fn orbital_files_draw_levels_but_refuse_fragments() {
    let dir = tempfile::tempdir().unwrap();
    let model = example("h2-cation.toml");
    ok(
        dir.path(),
        &["solve", model.to_str().unwrap(), "--json", "o.json"],
    );
    ok(dir.path(), &["levels", "o.json", "--png", "l.png"]);
    let out = common::run(
        dir.path(),
        &["levels", "o.json", "--fragments", "1:2", "--png", "f.png"],
    );
    common::assert_input_error(dir.path(), &out, "read from a file", &["l.png", "o.json"]);
}

/// Text has fixed pixel sizes, so a diagram asked for narrower than its columns
/// need grows to the documented minimum (680 px with fragments) instead of
/// overlapping its labels.
#[test]
fn a_narrow_diagram_grows_to_fit() {
    let dir = tempfile::tempdir().unwrap();
    let model = example("h2-cation.toml");
    let m = model.to_str().unwrap();
    ok(
        dir.path(),
        &[
            "levels",
            m,
            "--fragments",
            "1:2",
            "--size",
            "300",
            "--png",
            "l.png",
        ],
    );
    let dec = png::Decoder::new(std::io::BufReader::new(
        std::fs::File::open(dir.path().join("l.png")).unwrap(),
    ));
    let r = dec.read_info().unwrap();
    assert_eq!(r.info().width, lobecast::plot::levels::MIN_WIDTH_SIDES);
}

/// `--thumbnails 1,2` on the ion: ψ₊ = φA + φB has one sign everywhere and
/// ψ₋ = φA − φB a nodal plane between the nuclei (the LCAO definition), so the
/// bonding picture (the lower one, beside its level) shows only the positive
/// colour and the antibonding one (upper) both. Colours classified by hue: the
/// positive phase is orange (red ≫ blue), the negative purple (blue ≫ green).
#[test]
fn thumbnails_show_one_phase_bonding_and_two_antibonding() {
    let dir = tempfile::tempdir().unwrap();
    let model = example("h2-cation.toml");
    let m = model.to_str().unwrap();
    ok(
        dir.path(),
        &["levels", m, "--thumbnails", "1,2", "--png", "t.png"],
    );
    let mut dec = png::Decoder::new(std::io::BufReader::new(
        std::fs::File::open(dir.path().join("t.png")).unwrap(),
    ));
    dec.set_transformations(png::Transformations::EXPAND);
    let mut reader = dec.read_info().unwrap();
    let mut buf = vec![0; reader.output_buffer_size().unwrap()];
    let frame = reader.next_frame(&mut buf).unwrap();
    let (width, height) = (frame.width, frame.height);
    let channels = frame.color_type.samples();
    // The pictures are a strip added right of the 900 px diagram.
    assert!(width > 900 + 150, "width {width}");
    let (mut upper, mut lower) = ([0usize; 2], [0usize; 2]);
    for (k, p) in buf[..frame.buffer_size()].chunks(channels).enumerate() {
        let (x, y) = (k as u32 % width, k as u32 / width);
        if x < 905 {
            continue;
        }
        let [r, g, b] = [p[0], p[1], p[2]].map(i32::from);
        let class = if r > b + 80 && r > g {
            0
        } else if b > g + 40 && b > r + 15 {
            1
        } else {
            continue;
        };
        if y < height / 2 {
            upper[class] += 1;
        } else {
            lower[class] += 1;
        }
    }
    assert!(upper[0] > 500 && upper[1] > 500, "antibonding {upper:?}");
    assert!(lower[0] > 500 && lower[1] == 0, "bonding {lower:?}");
}
