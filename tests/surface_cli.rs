//! `lobecast surface` as a user runs it: pictures that read back with their
//! metadata, phase colours on the right side, meshes whose measures match the
//! report, and the isovalue rule shared with `inspect`.

mod common;

use std::path::Path;

use common::{example, ok, write_file};

/// A 2p_z Gaussian on one centre, as an orbital file (the field is z·e^(−αr²)
/// times a positive constant: positive above the nucleus, common practice).
const P_Z: &str = r#"{"format": "lobecast-orbitals", "version": 1, "length_unit": "bohr", "energy_unit": "hartree",
 "atoms": [{"element": "C", "atomic_number": 6, "position": [0.0, 0.0, 0.0]}],
 "basis": [{"atom": 0, "type": "gaussian", "powers": [0, 0, 1], "primitives": [[0.5, 1.0]]}],
 "orbitals": [{"energy": -0.4, "occupation": 1.0, "coefficients": [1.0]}]}"#;

/// Decodes a PNG: pixels (RGBA), width, height, pHYs pixels per metre, and the
/// iTXt `Comment`.
fn decode(path: &Path) -> (Vec<u8>, u32, u32, u32, String) {
    let dec = png::Decoder::new(std::io::BufReader::new(std::fs::File::open(path).unwrap()));
    let mut r = dec.read_info().unwrap();
    let mut buf = vec![0; r.output_buffer_size().unwrap()];
    let frame = r.next_frame(&mut buf).unwrap();
    let info = r.info();
    let ppm = info.pixel_dims.unwrap().xppu;
    let comment = info
        .utf8_text
        .iter()
        .find(|t| t.keyword == "Comment")
        .map(|t| t.get_text().unwrap())
        .unwrap_or_default();
    (buf, frame.width, frame.height, ppm, comment)
}

/// Pixels close to an sRGB colour (shading varies the brightness, so the test takes
/// the colour's hue direction: its dominant-channel ordering must hold and the pixel
/// must not be grey).
fn is_orange(p: &[u8]) -> bool {
    p[0] > 150 && p[0] as i32 - p[2] as i32 > 80 && p[1] > p[2]
}
fn is_purple(p: &[u8]) -> bool {
    p[2] as i32 - p[1] as i32 > 25 && p[0] as i32 - p[1] as i32 > 5
}

/// The +z lobe of a 2p_z orbital is drawn in the positive colour above the nucleus
/// when looking along +x (screen up = +z); the −z lobe in the negative colour below.
#[test]
fn pz_lobes_have_their_phase_colour_and_place() {
    let dir = tempfile::tempdir().unwrap();
    write_file(dir.path(), "pz.json", P_Z);
    let report = ok(
        dir.path(),
        &[
            "surface",
            "pz.json",
            "--field",
            "orbital:1",
            "--view",
            "+x",
            "--title",
            "p",
            "--png",
            "pz.png",
        ],
    );
    assert!(report.contains("closed"), "{report}");
    let (px, w, h, ppm, comment) = decode(&dir.path().join("pz.png"));
    // 300 dpi = 11811 px/m (PNG spec: pixels per metre); the command line is kept.
    assert_eq!(ppm, 11811);
    assert!(
        comment.contains("surface pz.json --field orbital:1"),
        "{comment}"
    );
    let (mut orange_rows, mut purple_rows) = (Vec::new(), Vec::new());
    for y in 0..h {
        for x in 0..w {
            let i = ((y * w + x) * 4) as usize;
            if is_orange(&px[i..i + 4]) {
                orange_rows.push(y);
            } else if is_purple(&px[i..i + 4]) {
                purple_rows.push(y);
            }
        }
    }
    assert!(
        orange_rows.len() > 1000 && purple_rows.len() > 1000,
        "{} {}",
        orange_rows.len(),
        purple_rows.len()
    );
    let mean = |v: &[u32]| v.iter().map(|&y| y as f64).sum::<f64>() / v.len() as f64;
    assert!(
        mean(&orange_rows) + 50.0 < mean(&purple_rows),
        "positive lobe above the negative one"
    );
}

/// The report's area equals the mesh file's; the default isovalue is the one
/// `inspect` gives for the same cube file (the same definition, same histogram).
#[test]
fn enclosed_fraction_level_matches_inspect() {
    let dir = tempfile::tempdir().unwrap();
    let model = example("h2-cation.toml");
    let model = model.to_str().unwrap();
    ok(
        dir.path(),
        &[
            "volume",
            model,
            "--field",
            "orbital:2",
            "--spacing",
            "0.25",
            "--units",
            "bohr",
            "--out",
            "a.cube",
        ],
    );
    let inspected = ok(dir.path(), &["inspect", "a.cube", "--json"]);
    let json: serde_json::Value = serde_json::from_str(&inspected).unwrap();
    let theirs = json["fields"][0]["isovalue"].as_f64().unwrap();
    let report = ok(
        dir.path(),
        &[
            "surface", "a.cube", "--field", "stored:1", "--mesh", "a.obj",
        ],
    );
    let ours: f64 = report
        .split("isovalue ±")
        .nth(1)
        .and_then(|s| s.split(',').next())
        .unwrap()
        .parse()
        .unwrap();
    // The report prints five significant digits.
    assert!(
        (ours - theirs).abs() <= 1e-4 * theirs,
        "surface {ours} vs inspect {theirs}"
    );
    assert!(report.contains("enclosing 90.0 %"), "{report}");
    let obj = std::fs::read_to_string(dir.path().join("a.obj")).unwrap();
    assert!(
        obj.lines()
            .any(|l| l.starts_with("# ") && l.contains("bohr")),
        "the OBJ states its unit"
    );
    assert_eq!(
        report.matches(", closed").count(),
        2,
        "two closed lobes: {report}"
    );
}

/// Panels: one picture, one camera, three captions; the mesh file holds every
/// surface; a transparent background leaves the corners clear.
#[test]
fn panels_and_transparent_background() {
    let dir = tempfile::tempdir().unwrap();
    let water = example("water.xyz");
    let report = ok(
        dir.path(),
        &[
            "surface",
            water.to_str().unwrap(),
            "--method",
            "extended-huckel",
            "--panels",
            "orbital:homo-1,orbital:homo,orbital:lumo",
            "--spacing",
            "0.3",
            "--units",
            "bohr",
            "--size",
            "900,400",
            "--background",
            "transparent",
            "--png",
            "w.png",
            "--mesh",
            "w.ply",
        ],
    );
    let (px, w, h, _, _) = decode(&dir.path().join("w.png"));
    assert_eq!((w, h), (900, 400));
    assert_eq!(px[3], 0, "top-left corner transparent");
    assert!(report.matches("triangles").count() >= 5, "{report}");
    let ply = std::fs::read(dir.path().join("w.ply")).unwrap();
    assert!(ply.starts_with(b"ply\n"));
}
