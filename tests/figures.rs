//! Figure checks: pixel symmetry, the nodal-plane colour, colour-bar ends, the
//! marching-squares contour of a 1s function against its analytic radius, profile
//! CSV against direct evaluation, reference images, and bad input on the CLI.

mod common;

use std::path::{Path, PathBuf};
use std::process::Command;

use lobecast::field::{Field, FieldSampler};
use lobecast::grid::plane::{PixelGrid, PlaneSpec, Window};
use lobecast::render::contour::{Grid, trace};
use lobecast::render::slice::{Contours, Figure, Panel, Rendered, Style, render};
use lobecast::render::{Colour, Scale};
use lobecast::solve::OrbitalSet;

use common::{H2, bin, solve_model};

fn panel(signed: bool) -> Panel {
    Panel {
        heading: "test".into(),
        quantity: "f".into(),
        family: "f".into(),
        unit: "bohr^{−3/2}".into(),
        signed,
        largest: None,
    }
}

/// Renders fields of `set` on the xz plane in a window centred on the origin.
fn draw(set: &OrbitalSet, fields: &[&str], window: Window, style: &Style) -> Rendered {
    let fields: Vec<Field> = common::fields(fields);
    let sampler = FieldSampler::new(set, &fields).unwrap();
    let plane = PlaneSpec::parse("xz", lobecast::chem::LengthUnit::Bohr)
        .unwrap()
        .resolve(&set.molecule, None)
        .unwrap();
    let figure = Figure {
        title: "test".into(),
        footnotes: vec!["note".into()],
        plane,
        window,
        nuclei: Vec::new(),
        gap_note: String::new(),
        panels: fields.iter().map(|f| panel(f.is_signed())).collect(),
    };
    let nf = fields.len();
    render(&figure, style, |g: &PixelGrid| {
        let all = g.sample(nf, |p, v| sampler.evaluate(p, v));
        (0..nf)
            .map(|k| all.iter().skip(k).step_by(nf).copied().collect())
            .collect()
    })
    .unwrap()
}

fn plain() -> Style {
    Style {
        contours: Contours::Auto(0),
        nuclei: false,
        ..Style::default()
    }
}

fn max_channel_diff(a: Colour, b: Colour) -> u8 {
    [a.r.abs_diff(b.r), a.g.abs_diff(b.g), a.b.abs_diff(b.b)]
        .into_iter()
        .max()
        .unwrap()
}

/// Largest colour difference between each map pixel and its mirror image.
fn mirror_error(r: &Rendered, vertical: bool) -> u8 {
    let m = &r.maps[0];
    let mut worst = 0;
    for y in 0..m.height {
        for x in 0..m.width {
            let (mx, my) = if vertical {
                (x, m.height - 1 - y)
            } else {
                (m.width - 1 - x, y)
            };
            let a = r.canvas.pixel(m.x + x, m.y + y);
            let b = r.canvas.pixel(m.x + mx, m.y + my);
            worst = worst.max(max_channel_diff(a, b));
        }
    }
    worst
}

#[test]
fn symmetric_orbital_gives_a_mirror_symmetric_slice() {
    // The bonding orbital of a homonuclear diatomic is symmetric under z → −z and
    // x → −x (symmetry of the molecule, common practice): its slice must be too,
    // to within one colour step (one unit in any 8-bit channel).
    let set = solve_model(H2);
    let window = Window::centred([0.0, 0.0], 8.0, 9.0);
    let r = draw(&set, &["orbital:1"], window, &plain());
    assert!(mirror_error(&r, true) <= 1, "z mirror");
    assert!(mirror_error(&r, false) <= 1, "x mirror");
    // The antibonding orbital changes sign under z → −z, so the same check fails.
    let r2 = draw(&set, &["orbital:2"], window, &plain());
    assert!(mirror_error(&r2, true) > 50, "the check can fail");
}

#[test]
fn nodal_plane_has_the_scale_zero_colour() {
    // ψ₂ = (φ_A − φ_B)/√(2(1 − S)) vanishes on the plane z = 0 between two identical
    // nuclei (symmetry, common practice); a symmetric diverging scale puts zero at
    // its midpoint, so those pixels must have exactly the colour at t = ½.
    let set = solve_model(H2);
    // An odd number of rows puts the middle row's pixel centres on z = 0.
    let mut found = false;
    for width in 1000..1010 {
        let style = Style { width, ..plain() };
        let r = draw(
            &set,
            &["orbital:2"],
            Window::centred([0.0, 0.0], 8.0, 8.0),
            &style,
        );
        let m = &r.maps[0];
        if m.height % 2 == 0 {
            continue;
        }
        let mid = m.height / 2;
        assert!(r.grid.coords(0, mid as usize).1.abs() < 1e-12);
        let zero = Scale::default_for(true).at(0.5);
        for x in 0..m.width {
            assert_eq!(r.canvas.pixel(m.x + x, m.y + mid), zero, "pixel {x}");
        }
        // Off the plane the colour differs: the check can fail.
        assert_ne!(r.canvas.pixel(m.x + m.width / 2, m.y + mid - 20), zero);
        found = true;
        break;
    }
    assert!(found, "some width gives an odd row count");
}

#[test]
fn colour_bar_ends_are_plus_and_minus_the_largest_magnitude() {
    // A symmetric diverging scale runs from −max|f| to +max|f| (common practice);
    // max|f| is recomputed here by direct evaluation at the same pixel centres.
    let set = solve_model(H2);
    let r = draw(
        &set,
        &["orbital:2"],
        Window::centred([0.0, 0.0], 8.0, 9.0),
        &Style::default(),
    );
    let sampler = FieldSampler::new(&set, &[Field::parse("orbital:2").unwrap()]).unwrap();
    let mut max: f64 = 0.0;
    let mut points = Vec::new();
    for row in 0..r.grid.ny {
        r.grid.row_points(row, &mut points);
        let mut v = vec![0.0; points.len()];
        sampler.evaluate(&points, &mut v);
        max = v.iter().fold(max, |m, x| m.max(x.abs()));
    }
    let bar = &r.bars[0];
    assert_eq!(bar.mapping.range(), (-max, max));
    let scale = Scale::default_for(true);
    let mid = bar.x + bar.width / 2;
    assert_eq!(r.canvas.pixel(mid, bar.y), scale.at(1.0), "top row is +max");
    assert_eq!(
        r.canvas.pixel(mid, bar.y + bar.height - 1),
        scale.at(0.0),
        "bottom row is −max"
    );
}

#[test]
fn contour_of_a_1s_function_is_a_circle_of_the_analytic_radius() {
    // φ(r) = sqrt(ζ³/π) e^(−ζr), so φ = c on the sphere r = −ln(c / sqrt(ζ³/π)) / ζ
    // (analytic form of the normalised 1s Slater function).
    let zeta: f64 = 1.3;
    let model = format!(
        "[molecule]\nunits = \"bohr\"\natoms = [{{ element = \"H\", position = [0, 0, 0] }}]\n\
         [basis]\nset = \"slater-1s\"\nzeta = {{ H = {zeta} }}\n"
    );
    let set = solve_model(&model);
    let r = draw(
        &set,
        &["orbital:1"],
        Window::centred([0.0, 0.0], 8.0, 8.0),
        &plain(),
    );
    let g = &r.grid;
    let (du, dv) = (
        g.window.width() / g.nx as f64,
        g.window.height() / g.ny as f64,
    );
    let peak = (zeta.powi(3) / std::f64::consts::PI).sqrt();
    let mut worst: f64 = 0.0;
    for frac in [0.5, 0.1, 0.02] {
        let c = frac * peak;
        let analytic = -(c / peak).ln() / zeta;
        let lines = trace(
            &Grid {
                values: &r.values[0],
                nx: g.nx,
                ny: g.ny,
            },
            c,
        );
        assert_eq!(lines.len(), 1, "one closed line at c = {c}");
        assert_eq!(lines[0].first(), lines[0].last());
        for (x, y) in &lines[0] {
            let (u, v) = (g.window.u0 + (x + 0.5) * du, g.window.v1 - (y + 0.5) * dv);
            let radius = (u * u + v * v).sqrt();
            worst = worst.max((radius / analytic - 1.0).abs());
            assert!(
                (radius / analytic - 1.0).abs() < 0.01,
                "c = {c}: radius {radius} against {analytic}"
            );
        }
    }
    println!("largest relative radius error: {worst:.2e}");
}

fn example() -> PathBuf {
    common::example("h2-cation.toml")
}

#[test]
fn profile_csv_reproduces_direct_evaluation_exactly() {
    // Values are written in Rust's shortest round-trip form (std documents that
    // parsing it back gives the same f64), so they must equal a fresh evaluation
    // at the written points bit for bit.
    let dir = tempfile::tempdir().unwrap();
    let csv = dir.path().join("p.csv");
    let out = Command::new(bin())
        .args([
            "profile",
            example().to_str().unwrap(),
            "--field",
            "orbital:2",
        ])
        .args([
            "--field",
            "orbital-deformation:1",
            "--from",
            "atom:1",
            "--to",
            "atom:2",
        ])
        .args([
            "--extend",
            "2ang",
            "--points",
            "57",
            "--csv",
            csv.to_str().unwrap(),
        ])
        .output()
        .unwrap();
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let text = std::fs::read_to_string(&csv).unwrap();
    let rows: Vec<Vec<f64>> = text
        .lines()
        .filter(|l| !l.starts_with('#') && !l.starts_with("s_bohr"))
        .map(|l| l.split(',').map(|v| v.parse().unwrap()).collect())
        .collect();
    assert_eq!(rows.len(), 57);
    let m = lobecast::io::model::load(&example()).unwrap();
    let set = m.solve().unwrap();
    let fields = [
        Field::parse("orbital:2").unwrap(),
        Field::parse("orbital-deformation:1").unwrap(),
    ];
    let sampler = FieldSampler::new(&set, &fields).unwrap();
    let points: Vec<[f64; 3]> = rows.iter().map(|r| [r[1], r[2], r[3]]).collect();
    let mut v = vec![0.0; points.len() * 2];
    sampler.evaluate(&points, &mut v);
    for (i, r) in rows.iter().enumerate() {
        assert_eq!(r[4].to_bits(), v[2 * i].to_bits(), "row {i}");
        assert_eq!(r[5].to_bits(), v[2 * i + 1].to_bits(), "row {i}");
    }
    // The line runs from atom 1 (z = −1) to atom 2, extended by 2 Å.
    let ext = 2.0 / lobecast::chem::units::BOHR_IN_ANGSTROM;
    assert!((rows[0][0] + ext).abs() < 1e-12 && (rows[0][3] + 1.0 + ext).abs() < 1e-12);
}

/// Width, height and straight-alpha RGBA bytes of a PNG, through the `png` decoder.
fn decode_rgba(bytes: &[u8]) -> (u32, u32, Vec<u8>) {
    let mut dec = png::Decoder::new(std::io::Cursor::new(bytes));
    dec.set_transformations(png::Transformations::EXPAND);
    let mut r = dec.read_info().unwrap();
    let mut buf = vec![0; r.output_buffer_size().unwrap()];
    let f = r.next_frame(&mut buf).unwrap();
    assert_eq!(f.color_type, png::ColorType::Rgba, "figures are RGBA");
    buf.truncate(f.buffer_size());
    (f.width, f.height, buf)
}

/// Compares `png` with `tests/reference/NAME`: at most 0.5 % of pixels may differ by
/// more than 16 in a channel (text anti-aliasing may differ between library
/// versions). On mismatch the new image is written beside it as NAME.new.png.
fn compare_reference(name: &str, png: &[u8]) -> Result<(), String> {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/reference");
    let path = dir.join(name);
    let new_path = dir.join(name.replace(".png", ".new.png"));
    let fresh = decode_rgba(png);
    let verdict = match std::fs::read(&path) {
        Err(_) => Err("no reference image yet".to_string()),
        Ok(bytes) => {
            let old = decode_rgba(&bytes);
            if (old.0, old.1) != (fresh.0, fresh.1) {
                Err(format!(
                    "size {}×{} against {}×{}",
                    fresh.0, fresh.1, old.0, old.1
                ))
            } else {
                let bad = old
                    .2
                    .chunks_exact(4)
                    .zip(fresh.2.chunks_exact(4))
                    .filter(|(a, b)| a.iter().zip(b.iter()).any(|(x, y)| x.abs_diff(*y) > 16))
                    .count();
                let frac = bad as f64 / (old.0 * old.1) as f64;
                if frac <= 0.005 {
                    Ok(())
                } else {
                    Err(format!("{:.2} % of pixels differ", 100.0 * frac))
                }
            }
        }
    };
    if let Err(why) = verdict {
        std::fs::write(&new_path, png).unwrap();
        return Err(format!(
            "{name}: {why}; the new image is {}",
            new_path.display()
        ));
    }
    let _ = std::fs::remove_file(&new_path);
    Ok(())
}

#[test]
fn reference_images() {
    let dir = tempfile::tempdir().unwrap();
    let cases: [(&str, Vec<&str>); 4] = [
        (
            "slice-antibonding.png",
            vec![
                "slice",
                "--field",
                "orbital:2",
                "--plane",
                "xz",
                "--size",
                "440",
                "--zero-contour",
                "--numbers",
            ],
        ),
        (
            "panels-shared.png",
            vec![
                "slice",
                "--panels",
                "orbital-density:1,orbital-density:2",
                "--shared-scale",
                "--plane",
                "xz",
                "--size",
                "520",
            ],
        ),
        (
            "profile.png",
            vec![
                "profile",
                "--field",
                "orbital:1",
                "--field",
                "orbital:2",
                "--from",
                "atom:1",
                "--to",
                "atom:2",
                "--extend",
                "1.5ang",
                "--size",
                "520",
            ],
        ),
        (
            "surface-antibonding.png",
            vec![
                "surface",
                "--field",
                "orbital:2",
                "--view",
                "+y",
                "--spacing",
                "0.3",
                "--units",
                "bohr",
                "--size",
                "420",
            ],
        ),
    ];
    let mut failures = Vec::new();
    for (name, args) in cases {
        let out_path = dir.path().join(name);
        let flag = if ["slice", "profile", "surface"].contains(&args[0]) {
            "--png"
        } else {
            unreachable!()
        };
        let out = Command::new(bin())
            .arg(args[0])
            .arg(example())
            .args(&args[1..])
            .args([flag, out_path.to_str().unwrap()])
            .output()
            .unwrap();
        assert!(
            out.status.success(),
            "{name}: {}",
            String::from_utf8_lossy(&out.stderr)
        );
        let png = std::fs::read(&out_path).unwrap();
        assert!(png.len() < 300_000, "{name} is {} bytes", png.len());
        if let Err(e) = compare_reference(name, &png) {
            failures.push(e);
        }
    }
    assert!(failures.is_empty(), "{}", failures.join("\n"));
}

#[test]
fn bad_input_gives_one_error_line_and_no_file() {
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path().join("x.png");
    let cases: [Vec<&str>; 6] = [
        vec!["slice", "--field", "orbital:1", "--plane", "xw"],
        vec!["slice", "--field", "orbital:9", "--plane", "xz"],
        vec!["slice", "--field", "orbital:1", "--plane", "atoms:1,5"],
        vec![
            "slice",
            "--field",
            "orbital:1",
            "--plane",
            "xz",
            "--scale",
            "VIRIDIS",
        ],
        vec![
            "slice",
            "--panels",
            "orbital:1,density",
            "--shared-scale",
            "--plane",
            "xz",
        ],
        vec![
            "profile",
            "--field",
            "orbital:1",
            "--from",
            "atom:1",
            "--to",
            "atom:1",
        ],
    ];
    for args in cases {
        let o = Command::new(bin())
            .arg(args[0])
            .arg(example())
            .args(&args[1..])
            .args(["--png", out.to_str().unwrap()])
            .output()
            .unwrap();
        let err = String::from_utf8_lossy(&o.stderr);
        assert_eq!(o.status.code(), Some(2), "{args:?}: {err}");
        assert_eq!(
            err.lines().filter(|l| l.starts_with("error: ")).count(),
            1,
            "{err}"
        );
        assert!(!err.contains("panicked"), "{err}");
        assert!(!out.exists(), "{args:?} left a file");
    }
    // Writing over the model itself is refused.
    let o = Command::new(bin())
        .args([
            "slice",
            example().to_str().unwrap(),
            "--field",
            "orbital:1",
            "--plane",
            "xz",
            "--png",
        ])
        .arg(example())
        .output()
        .unwrap();
    assert_eq!(o.status.code(), Some(2));
}
