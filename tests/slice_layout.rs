//! Slice figures under three hard cases: a field that is zero on the plane (rounding
//! noise must not be drawn as lobes), a cube source whose box the plane or line
//! leaves (no data, not zero), and many panels (maps keep a readable size and tick
//! labels never overlap).

mod common;

use std::path::{Path, PathBuf};

use lobecast::grid::plane::{PixelGrid, PlaneSpec, Window};
use lobecast::render::axes::overlap;
use lobecast::render::slice::{Contours, Figure, MIN_MAP, Panel, Rendered, Style, render};
use lobecast::render::{Colour, Scale, ticks};

use common::{assert_refused, example, run_here};

fn panel(largest: Option<f64>) -> Panel {
    Panel {
        heading: "test".into(),
        quantity: "f".into(),
        family: "f".into(),
        unit: "bohr^{−3/2}".into(),
        signed: true,
        largest,
    }
}

/// Renders `n` panels of synthetic values `f(panel, u, v)` (bohr) on the xy plane.
fn synthetic(
    n: usize,
    window: Window,
    largest: Option<f64>,
    style: &Style,
    f: impl Fn(usize, f64, f64) -> f64,
) -> Rendered {
    // The plane is resolved against a single atom at the origin.
    let atoms = vec![lobecast::chem::Atom {
        element: lobecast::chem::elements::by_number(1).unwrap(),
        position: [0.0; 3],
    }];
    let mol = lobecast::chem::Molecule::new(atoms, 0).unwrap();
    let plane = PlaneSpec::parse("xy", lobecast::chem::LengthUnit::Bohr)
        .unwrap()
        .resolve(&mol, None)
        .unwrap();
    let fig = Figure {
        title: "test".into(),
        footnotes: vec!["note".into()],
        plane,
        window,
        nuclei: Vec::new(),
        panels: (0..n).map(|_| panel(largest)).collect(),
        gap_note: "hatched: no data".into(),
    };
    render(&fig, style, |g: &PixelGrid| {
        (0..n)
            .map(|k| {
                (0..g.ny)
                    .flat_map(|row| (0..g.nx).map(move |col| (col, row)))
                    .map(|(col, row)| {
                        let (u, v) = g.coords(col, row);
                        f(k, u, v)
                    })
                    .collect()
            })
            .collect()
    })
    .unwrap()
}

// ---- item: a field that is zero on the plane ----

#[test]
fn single_map_of_a_field_zero_on_the_plane_is_refused() {
    // The reported case: the antibonding σ* orbital of H₂⁺ is odd under z → −z, so it
    // vanishes on the xy plane (symmetry, common practice); it used to be drawn as
    // ±1.1e-16 noise with contours.
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path().join("a.png");
    let h2 = example("h2-cation.toml");
    let o = run_here(&[
        "slice",
        h2.to_str().unwrap(),
        "--field",
        "orbital:2",
        "--plane",
        "xy",
        "--png",
        out.to_str().unwrap(),
    ]);
    assert_refused(&o, &["orbital:2", "zero on the plane xy"]);
    assert!(String::from_utf8_lossy(&o.stderr).contains("hint: the orbital has a node"));
    assert!(!out.exists());
    // The bonding orbital is not zero there: the same command draws it.
    let ok = run_here(&[
        "slice",
        h2.to_str().unwrap(),
        "--field",
        "orbital:1",
        "--plane",
        "xy",
        "--png",
        out.to_str().unwrap(),
    ]);
    assert!(
        ok.status.success(),
        "{}",
        String::from_utf8_lossy(&ok.stderr)
    );
}

#[test]
fn panels_draw_a_field_zero_on_the_plane_blank() {
    // Ethylene's π HOMO is antisymmetric through the molecular plane (common
    // practice), so on xy it is rounding noise; its σ neighbour homo-1 is not.
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path().join("e.png");
    let o = run_here(&[
        "slice",
        example("ethylene.xyz").to_str().unwrap(),
        "--method",
        "extended-huckel",
        "--panels",
        "orbital:homo,orbital:homo-1",
        "--plane",
        "xy",
        "--png",
        out.to_str().unwrap(),
    ]);
    let text = String::from_utf8_lossy(&o.stdout);
    assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
    let lines: Vec<&str> = text
        .lines()
        .filter(|l| l.starts_with("  orbital"))
        .collect();
    assert_eq!(lines.len(), 2, "{text}");
    assert!(
        lines[0].contains("zero on this plane, drawn blank"),
        "{text}"
    );
    assert!(lines[1].contains("colour range"), "{text}");
    assert!(out.exists());
}

#[test]
fn a_blank_panel_is_one_uniform_zero_colour() {
    let w = Window::centred([0.0, 0.0], 8.0, 8.0);
    let style = Style::default();
    // Noise at 1e-16 against a field whose largest value is 0.5: blank.
    let noise = |k: usize, u: f64, v: f64| {
        if k == 0 {
            1e-16 * (7.0 * u).sin() * (5.0 * v).cos()
        } else {
            (-(u * u + v * v)).exp() * u
        }
    };
    let r = synthetic(2, w, Some(0.5), &style, noise);
    assert_eq!(r.blank, vec![true, false]);
    let m = &r.maps[0];
    let zero = Scale::default_for(true).at(0.5);
    let mut differ = 0;
    for y in (0..m.height).step_by(7) {
        for x in (0..m.width).step_by(7) {
            let p = r.canvas.pixel(m.x + x, m.y + y);
            // Nothing but the zero colour, the centred note and no contours.
            if p != zero {
                differ += 1;
            }
        }
    }
    let total = (m.height / 7 + 1) * (m.width / 7 + 1);
    assert!(
        differ * 100 < total,
        "{differ} of {total} pixels not zero-coloured"
    );
    // The same noise with a largest |value| of 1e-15 is a real (tiny) field: drawn.
    let r2 = synthetic(1, w, Some(1e-15), &style, noise);
    assert_eq!(r2.blank, vec![false]);
}

// ---- item: cube points outside the box ----

/// A cube of H₂⁺'s bonding orbital whose box ends 1.5 Å beyond the nuclei.
fn cube(dir: &Path) -> PathBuf {
    let path = dir.join("s.cube");
    let o = run_here(&[
        "volume",
        example("h2-cation.toml").to_str().unwrap(),
        "--field",
        "orbital:1",
        "--points",
        "30",
        "--padding",
        "1.5",
        "--out",
        path.to_str().unwrap(),
    ]);
    assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
    path
}

#[test]
fn a_plane_or_line_missing_the_cube_box_is_refused() {
    // The reported cases: xy@100 drew a full map of 0..1, a line outside wrote zeros.
    let dir = tempfile::tempdir().unwrap();
    let c = cube(dir.path());
    let png = dir.path().join("c.png");
    let o = run_here(&[
        "slice",
        c.to_str().unwrap(),
        "--field",
        "stored:1",
        "--plane",
        "xy@100",
        "--png",
        png.to_str().unwrap(),
    ]);
    assert_refused(&o, &["misses the cube's box"]);
    assert!(!png.exists());
    let csv = dir.path().join("p.csv");
    let o = run_here(&[
        "profile",
        c.to_str().unwrap(),
        "--field",
        "stored:1",
        "--from",
        "10,0,-3",
        "--to",
        "10,0,3",
        "--csv",
        csv.to_str().unwrap(),
        "--png",
        png.to_str().unwrap(),
    ]);
    assert_refused(&o, &["misses the cube's box"]);
    assert!(!csv.exists() && !png.exists());
}

#[test]
fn profile_beyond_the_cube_box_leaves_cells_empty() {
    let dir = tempfile::tempdir().unwrap();
    let c = cube(dir.path());
    let csv = dir.path().join("p.csv");
    let png = dir.path().join("p.png");
    // z from −3 to 3 Å at 1 Å steps; the box ends near ±2.03 Å (0.53 + 1.5).
    let o = run_here(&[
        "profile",
        c.to_str().unwrap(),
        "--field",
        "stored:1",
        "--from",
        "0,0,-3",
        "--to",
        "0,0,3",
        "--points",
        "7",
        "--csv",
        csv.to_str().unwrap(),
        "--png",
        png.to_str().unwrap(),
    ]);
    assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
    let text = std::fs::read_to_string(&csv).unwrap();
    let rows: Vec<&str> = text
        .lines()
        .filter(|l| !l.starts_with('#') && !l.starts_with('s'))
        .collect();
    assert_eq!(rows.len(), 7);
    let last = |r: &str| r.rsplit(',').next().unwrap().to_string();
    assert_eq!(last(rows[0]), "", "outside: empty, not 0e0");
    assert_eq!(last(rows[6]), "");
    for r in &rows[1..6] {
        let v: f64 = last(r).parse().unwrap();
        assert!(
            v > 0.0,
            "inside the box the bonding orbital is positive: {r}"
        );
    }
}

#[test]
fn missing_values_are_hatched_and_left_out_of_the_colour_range() {
    let w = Window::centred([0.0, 0.0], 8.0, 8.0);
    // No data for u > 0; inside, a Gaussian lobe of height 0.3 at the origin.
    let f = |_: usize, u: f64, v: f64| {
        if u > 0.0 {
            f64::NAN
        } else {
            0.3 * (-(u * u + v * v)).exp()
        }
    };
    let style = Style {
        contours: Contours::Auto(3),
        ..Style::default()
    };
    let r = synthetic(1, w, Some(0.3), &style, f);
    let m = &r.maps[0];
    let (lo, hi) = m.mapping.range();
    assert!(
        (hi - 0.3).abs() < 0.01 && (lo + hi).abs() < 1e-15,
        "{lo} {hi}"
    );
    // Right half: only the two hatch greys (r = g = b); left half: scale colours.
    let grey = |c: Colour| c.r == c.g && c.g == c.b;
    let y = m.height / 3;
    let right: Vec<Colour> = (m.width * 3 / 4..m.width - 2)
        .map(|x| r.canvas.pixel(m.x + x, m.y + y))
        .collect();
    assert!(right.iter().all(|c| grey(*c)), "{:?}", &right[..4]);
    assert!(right.iter().any(|c| c.r < 200) && right.iter().any(|c| c.r > 200));
    assert!(!grey(
        r.canvas.pixel(m.x + m.width / 2 - 3, m.y + m.height / 2)
    ));
}

// ---- item: many panels ----

#[test]
fn six_and_eight_panels_keep_readable_maps_and_separate_labels() {
    // A benzene-sized window (10 Å) at the default width, which used to fail with
    // "--size 1000 leaves no room for 6 maps".
    let a = 1.0 / lobecast::chem::units::BOHR_IN_ANGSTROM;
    let w = Window::centred([0.0, 0.0], 10.0 * a, 9.3 * a);
    for n in [6, 8] {
        let r = synthetic(n, w, None, &Style::default(), |k, u, v| {
            (-(u * u + v * v) / 4.0).exp() * (k as f64 * u).cos()
        });
        assert_eq!(r.maps.len(), n);
        for m in &r.maps {
            assert!(m.width as f32 >= MIN_MAP, "{n} panels: {} px", m.width);
            assert!(m.x + m.width <= r.canvas.width(), "clipped");
            assert!(m.y + m.height <= r.canvas.height(), "clipped");
        }
        let all: Vec<_> = r.labels.iter().flatten().collect();
        for (i, a) in all.iter().enumerate() {
            for b in &all[i + 1..] {
                assert!(!overlap(a, b), "{n} panels: labels {a:?} and {b:?} overlap");
            }
        }
        // Each map still has at least three labels per axis (so ticks were not
        // simply dropped).
        assert!(r.labels.iter().all(|l| l.len() >= 6), "{:?}", r.labels);
    }
}

#[test]
fn ticks_thin_out_on_a_short_axis() {
    // The reported overlap: a 10-Å benzene window over an ~80-px axis had ticks every
    // 2.5 Å, "−2.5", "0.0", "2.5" packed into "−2.50.02.5". Fitted ticks leave 0.8 × font between measured labels.
    let font = 17.0;
    let px = |v: f64| ((v + 5.0) / 10.0 * 80.0) as f32;
    let gap_ok = |t: &[f64], d: usize| {
        t.windows(2).all(|p| {
            let wa = lobecast::render::text::measure(&ticks::label(p[0], d), font).width;
            let wb = lobecast::render::text::measure(&ticks::label(p[1], d), font).width;
            px(p[1]) - px(p[0]) >= 0.5 * (wa + wb) + 0.8 * font
        })
    };
    let crowded = ticks::nice(-5.0, 5.0, 3);
    assert_eq!(crowded, vec![-5.0, -2.5, 0.0, 2.5, 5.0]);
    assert!(!gap_ok(&crowded, 1), "the check can fail");
    let (t, d) = ticks::fitted(-5.0, 5.0, 10, gap_ok);
    assert!(t.len() >= 2 && gap_ok(&t, d), "{t:?} ({d} decimals)");
    // On a long axis the same rule keeps many ticks.
    let (long, _) = ticks::fitted(-5.0, 5.0, 10, |_, _| true);
    assert!(long.len() >= 5, "{long:?}");
}

#[test]
fn benzene_six_panels_at_the_default_size_are_drawn() {
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path().join("x.png");
    let panels = "orbital:1,orbital:2,orbital:3,orbital:4,orbital:5,orbital:6";
    let o = run_here(&[
        "slice",
        example("benzene.xyz").to_str().unwrap(),
        "--method",
        "extended-huckel",
        "--panels",
        panels,
        "--plane",
        "xy",
        "--png",
        out.to_str().unwrap(),
    ]);
    assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
    let text = String::from_utf8_lossy(&o.stdout);
    // "6 map(s) of NX×NY samples": each map at least MIN_MAP pixels wide.
    let nx: u32 = text
        .split("map(s) of ")
        .nth(1)
        .and_then(|s| s.split('×').next())
        .and_then(|s| s.parse().ok())
        .unwrap_or_else(|| panic!("{text}"));
    assert!(nx as f32 >= MIN_MAP, "{text}");
}
