//! The cube reader against things outside it: what our writer writes (round trips
//! to the printed precision), hand-written files in every accepted variant, broken
//! files (an error naming the line, never a panic), the analytic enclosed-fraction
//! radius of the hydrogen 1s density, and exact properties of trilinear interpolation.

use std::io::{Cursor, Write};

use lobecast::grid::GridBox;
use lobecast::io::cube::stats::{Measure, summarize};
use lobecast::io::cube::{CubeAtom, CubeHeader, CubeReader, Volume, write_streaming};

const BOHR_IN_ANGSTROM: f64 = 0.529_177_210_903; // CODATA 2018 (Tiesinga et al. 2021)

fn read(bytes: &[u8]) -> lobecast::Result<Volume> {
    Volume::from_reader(CubeReader::new(
        Cursor::new(bytes.to_vec()),
        Some(bytes.len() as u64),
        "test.cube",
    )?)
}

fn error_of(text: &str) -> String {
    match read(text.as_bytes()) {
        Ok(_) => panic!("accepted a broken file:\n{text}"),
        Err(e) => {
            assert_eq!(e.kind, lobecast::error::Kind::Input);
            e.message
        }
    }
}

/// A smooth test function with both signs and several decades of magnitude.
fn test_value(p: [f64; 3], field: usize) -> f64 {
    let r2 = p[0] * p[0] + p[1] * p[1] + p[2] * p[2];
    (p[2] + 0.3 * field as f64) * (-0.7 * r2).exp() + 1e-9 * (field as f64 + 1.0)
}

fn header(grid: GridBox, fields: Option<Vec<usize>>) -> CubeHeader {
    CubeHeader {
        title: "round trip: two atoms".into(),
        comment: "second line, kept as written".into(),
        atoms: vec![
            CubeAtom {
                atomic_number: 8,
                charge: 8.0,
                position: [0.1, -0.2, 0.3],
            },
            CubeAtom {
                atomic_number: 1,
                charge: 1.0,
                position: [1.25, 0.5, -0.75],
            },
        ],
        grid,
        orbital_numbers: fields,
    }
}

/// Writes with our writer, reads back, returns the largest relative value deviation.
fn round_trip(h: &CubeHeader) -> f64 {
    let nf = h.field_count();
    let mut bytes = Vec::new();
    write_streaming(
        h,
        |pts, out| {
            for (p, vals) in pts
                .points(&mut Vec::new())
                .iter()
                .zip(out.chunks_exact_mut(nf))
            {
                for (f, v) in vals.iter_mut().enumerate() {
                    *v = test_value(*p, f);
                }
            }
        },
        &mut bytes,
        &|_| {},
    )
    .unwrap();
    let vol = read(&bytes).unwrap();
    let got = &vol.info.header;
    assert_eq!(got.title, h.title);
    assert_eq!(got.comment, h.comment);
    assert_eq!(got.orbital_numbers, h.orbital_numbers);
    assert_eq!(got.grid.counts, h.grid.counts);
    assert_eq!(vol.fields(), nf);
    // The header prints six decimals: half a unit of the sixth decimal.
    for d in 0..3 {
        assert!((got.grid.origin[d] - h.grid.origin[d]).abs() <= 5e-7);
        for a in 0..3 {
            assert!((got.grid.axes[a][d] - h.grid.axes[a][d]).abs() <= 5e-7);
        }
    }
    for (x, y) in got.atoms.iter().zip(&h.atoms) {
        assert_eq!(x.atomic_number, y.atomic_number);
        for d in 0..3 {
            assert!((x.position[d] - y.position[d]).abs() <= 5e-7);
        }
    }
    let [nx, ny, nz] = h.grid.counts;
    let mut worst: f64 = 0.0;
    for i in 0..nx {
        for j in 0..ny {
            for k in 0..nz {
                for f in 0..nf {
                    let want = test_value(h.grid.point(i, j, k), f);
                    let dev = (vol.at(f, i, j, k) - want).abs() / want.abs();
                    worst = worst.max(dev);
                }
            }
        }
    }
    worst
}

/// %13.5E keeps six significant digits: rounding moves a value by at most half a
/// unit of the last digit, 5e-6 of it (common practice: decimal rounding).
#[test]
fn round_trip_to_printed_precision() {
    let ortho = GridBox {
        origin: [-2.0, -1.5, -2.5],
        axes: [[0.2, 0.0, 0.0], [0.0, 0.25, 0.0], [0.0, 0.0, 0.3]],
        counts: [21, 13, 17],
    };
    let skew = GridBox {
        origin: [-1.9, -1.7, -2.1],
        axes: [[0.21, 0.02, 0.0], [0.05, 0.23, 0.01], [-0.03, 0.04, 0.27]],
        counts: [17, 19, 11],
    };
    for (grid, fields) in [
        (ortho.clone(), None),
        (skew.clone(), None),
        (ortho, Some(vec![3, 4, 7])),
        (skew, Some(vec![1, 2])),
    ] {
        let multi = fields.is_some();
        let worst = round_trip(&header(grid, fields));
        eprintln!("round trip (multi-field {multi}): worst relative deviation {worst:.3e}");
        assert!(worst <= 5.000_001e-6, "{worst}");
    }
}

/// A hand-written file in the ångström variant (negative counts), with the value-count
/// column, a wrapped orbital-index line, Fortran `D` and lower-case exponents, CRLF
/// line endings and an irregular number of values per line.
#[test]
fn accepted_variants() {
    let text = "first comment  \r\n  second comment\r\n\
        \x20  -1   -1.0   0.0   0.5   2\r\n\
        \x20  -2   0.5   0.0   0.0\r\n\
        \x20  -1   0.0   0.5   0.0\r\n\
        \x20  -3   0.0   0.0   0.25\r\n\
        \x20   6   6.0   1.0   2.0   3.0\r\n\
        \x20   2\r\n  5\r\n 6\r\n\
        1.0D+00 -2.5d-01 3e-3\r\n4.0E+00\r\n5 6 7.5 -8\r\n9.0 1.0e1\r\n1.1E+01 1.2E+01\r\n";
    let v = read(text.as_bytes()).unwrap();
    let h = &v.info.header;
    assert_eq!(h.title, "first comment  ");
    assert_eq!(h.comment, "  second comment");
    assert!(v.info.angstrom);
    assert_eq!(v.fields(), 2);
    assert_eq!(h.orbital_numbers, Some(vec![5, 6]));
    assert_eq!(h.grid.counts, [2, 1, 3]);
    let b = 1.0 / BOHR_IN_ANGSTROM;
    assert!((h.grid.origin[0] + b).abs() < 1e-12 && (h.grid.origin[2] - 0.5 * b).abs() < 1e-12);
    assert!((h.grid.axes[2][2] - 0.25 * b).abs() < 1e-12);
    assert!((h.atoms[0].position[1] - 2.0 * b).abs() < 1e-12);
    assert_eq!(h.atoms[0].atomic_number, 6);
    let want = [
        1.0, -0.25, 3e-3, 4.0, 5.0, 6.0, 7.5, -8.0, 9.0, 10.0, 11.0, 12.0,
    ];
    assert_eq!(v.values, want);
    // Point (1, 0, 2), field 2, is the last value.
    assert_eq!(v.at(1, 1, 0, 2), 12.0);
    assert_eq!(v.at(0, 0, 0, 1), 3e-3);

    // The same bytes gzip-compressed read the same.
    let mut gz = flate2::write::GzEncoder::new(Vec::new(), flate2::Compression::default());
    gz.write_all(text.as_bytes()).unwrap();
    let gz = gz.finish().unwrap();
    let w = read(&gz).unwrap();
    assert!(w.info.gzip);
    assert_eq!(w.values, v.values);
    assert_eq!(w.info.header, v.info.header);
}

/// The common single-field form with the optional value-count column set to 1, and
/// all values on one line.
#[test]
fn single_field_with_value_count_and_one_long_line() {
    let text = "a\nb\n 1 0 0 0 1\n 2 1 0 0\n 2 0 1 0\n 2 0 0 1\n 1 1.0 0 0 0\n1 2 3 4 5 6 7 8\n";
    let v = read(text.as_bytes()).unwrap();
    assert_eq!(v.fields(), 1);
    assert_eq!(v.values, [1.0, 2.0, 3.0, 4.0, 5.0, 6.0, 7.0, 8.0]);
    assert!((v.integral(0) - 36.0).abs() < 1e-12);
}

const GOOD: &str = "t\nc\n    1    0.0    0.0    0.0\n    2    0.5    0.0    0.0\n\
    \x20   2    0.0    0.5    0.0\n    2    0.0    0.0    0.5\n    1    1.0    0.0    0.0    0.0\n\
    1.0 2.0\n3.0 4.0\n5.0 6.0\n7.0 8.0\n";

/// Each broken file gives an input error naming the line where it breaks (the
/// expected line numbers are counted by hand from the texts).
#[test]
fn broken_files_name_the_line() {
    assert!(read(GOOD.as_bytes()).is_ok());
    let multi = GOOD.replacen("    1    0.0", "   -1    0.0", 1);
    let cases: Vec<(String, &str, &str)> = vec![
        (
            GOOD.replace("7.0 8.0\n", "7.0\n"),
            "line 11",
            "ends after 7 of the 8",
        ),
        (
            GOOD.replace("7.0 8.0\n", "7.0 8.0 9.0\n"),
            "line 11",
            "more values",
        ),
        (
            GOOD.replace("3.0 4.0", "3.0 x4"),
            "line 9",
            "'x4' is not a number",
        ),
        (
            GOOD.replace("3.0 4.0", "3.0 NaN"),
            "line 9",
            "not a finite number",
        ),
        (
            GOOD.replace("5.0 6.0", "5.0 -Infinity"),
            "line 10",
            "not a finite number",
        ),
        (GOOD.replace("5.0 6.0", "5.0 1e400"), "line 10", "too large"),
        (
            GOOD.replace("    2    0.0    0.5", "    0    0.0    0.5"),
            "line 5",
            "zero",
        ),
        (
            GOOD.replace("    2    0.0    0.5", "   -2    0.0    0.5"),
            "line 5",
            "mix signs",
        ),
        (
            GOOD.replace("    1    0.0    0.0    0.0\n", "    1    0.0    0.0\n"),
            "line 3",
            "atom count",
        ),
        (
            GOOD.replace("    1    1.0    0.0    0.0    0.0\n", ""),
            "line 7",
            "atom",
        ),
        (
            GOOD.replacen("    1    0.0", "    3    0.0", 1),
            "line 8",
            "atom",
        ),
        (
            GOOD.replace("    2    0.0    0.0    0.5", "    2    0.0    0.0    0.0"),
            "line 6",
            "no volume",
        ),
        (multi.clone(), "line 8", "bad orbital-index line"),
        (
            multi.replace("0.0\n1.0 2.0", "0.0\n 2 1\n1.0 2.0"),
            "line 9",
            "bad orbital-index line",
        ),
        (
            multi.replace("0.0\n1.0 2.0", "0.0\n 1 1 1.0 2.0"),
            "line 8",
            "more entries",
        ),
        (
            multi.replace("0.0\n1.0 2.0", "0.0\n 0\n1.0 2.0"),
            "line 8",
            "bad orbital-index line",
        ),
        (
            "t\nc\n    1    0.0    0.0    0.0\n".to_string(),
            "line 4",
            "ends",
        ),
        (String::new(), "line 1", "ends"),
        (
            GOOD.replace("    1    1.0    0.0", "    1.5  1.0    0.0"),
            "line 7",
            "whole number",
        ),
    ];
    for (text, line, what) in cases {
        let msg = error_of(&text);
        assert!(
            msg.contains(line) && msg.contains(what),
            "expected {line} and {what:?} in: {msg}\n---\n{text}"
        );
    }
}

/// A header that claims 10^12 points in a file of under 1 kB is refused at once,
/// before anything is allocated for the values.
#[test]
fn absurd_counts_are_refused_before_allocating() {
    let text = GOOD
        .replace("    2    0.5    0.0    0.0", "10000    0.5    0.0    0.0")
        .replace("    2    0.0    0.5    0.0", "10000    0.0    0.5    0.0")
        .replace("    2    0.0    0.0    0.5", "10000    0.0    0.0    0.5");
    assert!(text.len() < 1000);
    let msg = error_of(&text);
    assert!(msg.contains("1000000000000 values"), "{msg}");
    assert!(msg.contains("line 6"), "{msg}");
    // Without a known size the reader still refuses products beyond memory.
    let huge = GOOD
        .replace("    2    0.5    0.0    0.0", "2000000000 0.5 0.0 0.0")
        .replace("    2    0.0    0.5    0.0", "2000000000 0.0 0.5 0.0");
    let e = CubeReader::new(Cursor::new(huge.into_bytes()), None, "x").unwrap_err();
    assert_eq!(e.kind, lobecast::error::Kind::Input);
    assert!(e.message.contains("values"), "{}", e.message);
}

/// P(3, x), the regularised lower incomplete gamma function, from its power series
/// γ(s, x) = x^s e^(−x) Σ_k x^k / (s (s+1) … (s+k)) (Abramowitz & Stegun 6.5.29).
fn p3(x: f64) -> f64 {
    let s = 3.0;
    let (mut term, mut sum) = (1.0 / s, 1.0 / s);
    for k in 1..200 {
        term *= x / (s + k as f64);
        sum += term;
    }
    x.powf(s) * (-x).exp() * sum / 2.0 // Γ(3) = 2
}

/// The radius of the sphere holding `f` of a hydrogen 1s electron: the radial integral
/// ∫₀^R 4π r² e^(−2r)/π dr = P(3, 2R); solved by bisection.
fn radius_enclosing(f: f64) -> f64 {
    let (mut lo, mut hi) = (0.0, 20.0);
    for _ in 0..200 {
        let mid = 0.5 * (lo + hi);
        if p3(2.0 * mid) < f {
            lo = mid;
        } else {
            hi = mid;
        }
    }
    0.5 * (lo + hi)
}

/// Writes a cube of `f` on a cubic grid of spacing h over [−L, L]³ into a file.
fn write_cube(path: &std::path::Path, h: f64, l: f64, f: impl Fn([f64; 3]) -> f64 + Sync) {
    let n = (2.0 * l / h).round() as usize + 1;
    let header = CubeHeader {
        title: "analytic test field".into(),
        comment: "hydrogen 1s".into(),
        atoms: vec![CubeAtom {
            atomic_number: 1,
            charge: 1.0,
            position: [0.0; 3],
        }],
        grid: GridBox {
            origin: [-l; 3],
            axes: [[h, 0.0, 0.0], [0.0, h, 0.0], [0.0, 0.0, h]],
            counts: [n; 3],
        },
        orbital_numbers: None,
    };
    let mut w = std::io::BufWriter::new(std::fs::File::create(path).unwrap());
    write_streaming(
        &header,
        |pts, out| {
            for (p, v) in pts.points(&mut Vec::new()).iter().zip(out) {
                *v = f(*p);
            }
        },
        &mut w,
        &|_| {},
    )
    .unwrap();
    w.flush().unwrap();
}

/// The 90 % isovalue of the hydrogen 1s density e^(−2r)/π is the density at the
/// radius enclosing 90 % of the electron (P(3, 2R) = 0.9, incomplete gamma above);
/// the grid result must give that radius to 1 % (the check). The orbital
/// sign(z)·e^(−r)/√π has the same |ψ|², so with the f² measure its ± level is
/// e^(−R)/√π at the same radius: this checks the signed path.
#[test]
fn hydrogen_1s_enclosed_fraction_matches_the_analytic_radius() {
    let dir = tempfile::tempdir().unwrap();
    let (h, l) = (0.125, 8.0);
    let pi = std::f64::consts::PI;
    let dens = dir.path().join("h1s-density.cube");
    write_cube(&dens, h, l, |p| {
        let r = (p[0] * p[0] + p[1] * p[1] + p[2] * p[2]).sqrt();
        (-2.0 * r).exp() / pi
    });
    // Offset by h/2 in z so that no point lies on the nodal plane z = 0.
    let orb = dir.path().join("h1s-signed.cube");
    write_cube(&orb, h, l, |p| {
        let z = p[2] + 0.5 * h;
        let r = (p[0] * p[0] + p[1] * p[1] + z * z).sqrt();
        z.signum() * (-r).exp() / pi.sqrt()
    });
    for fraction in [0.5, 0.9, 0.99] {
        let r_exact = radius_enclosing(fraction);
        let open = || CubeReader::open(&dens);
        let (info, s) = summarize(&open, fraction, None).unwrap();
        assert_eq!(s[0].measure, Measure::Abs);
        let dv = info.header.grid.voxel_volume();
        // ∫ρ = 1 (the density is normalised; common practice for the 1s function).
        assert!(
            (s[0].stats.sum * dv - 1.0).abs() < 2e-3,
            "{}",
            s[0].stats.sum * dv
        );
        let t = s[0].isovalue.unwrap();
        let r_grid = -(pi * t).ln() / 2.0;
        let open = || CubeReader::open(&orb);
        let (_, so) = summarize(&open, fraction, None).unwrap();
        assert_eq!(so[0].measure, Measure::Square);
        let to = so[0].isovalue.unwrap();
        let r_signed = -(pi.sqrt() * to).ln();
        eprintln!(
            "fraction {fraction}: analytic R = {r_exact:.5} bohr, density grid R = {r_grid:.5} \
             ({:+.3} %), signed grid R = {r_signed:.5} ({:+.3} %)",
            100.0 * (r_grid / r_exact - 1.0),
            100.0 * (r_signed / r_exact - 1.0)
        );
        assert!((r_grid / r_exact - 1.0).abs() < 0.01);
        assert!((r_signed / r_exact - 1.0).abs() < 0.01);
    }
    // P(3, x) from the series against its closed form 1 − e^(−x)(1 + x + x²/2)
    // (integration by parts; common practice), so the reference itself is checked.
    for x in [0.5f64, 2.0, 5.3, 12.0] {
        let closed = 1.0 - (-x).exp() * (1.0 + x + x * x / 2.0);
        assert!((p3(x) - closed).abs() < 1e-12);
    }
}

/// Trilinear interpolation reproduces grid values and is exact for functions linear
/// in the fractional coordinates, also on a skewed grid (common practice: the
/// defining properties of multilinear interpolation).
#[test]
fn trilinear_interpolation_is_exact_for_linear_functions() {
    let grid = GridBox {
        origin: [0.3, -0.2, 0.1],
        axes: [[0.4, 0.1, 0.0], [0.0, 0.5, 0.05], [0.1, 0.0, 0.3]],
        counts: [4, 5, 3],
    };
    let lin = |p: [f64; 3]| 0.25 + 1.5 * p[0] - 0.75 * p[1] + 2.0 * p[2];
    let mut text = String::from("t\nc\n");
    text += &format!(
        "    0 {} {} {}\n",
        grid.origin[0], grid.origin[1], grid.origin[2]
    );
    for a in 0..3 {
        let v = grid.axes[a];
        text += &format!("{} {} {} {}\n", grid.counts[a], v[0], v[1], v[2]);
    }
    let [nx, ny, nz] = grid.counts;
    for i in 0..nx {
        for j in 0..ny {
            for k in 0..nz {
                text += &format!("{:.17e}\n", lin(grid.point(i, j, k)));
            }
        }
    }
    let v = read(text.as_bytes()).unwrap();
    // Grid points (an inner one and the far corner) give the stored values, to the
    // rounding of the fractional coordinates.
    for (i, j, k) in [(2, 3, 1), (3, 4, 2), (0, 0, 0)] {
        let got = v.value_at(0, grid.point(i, j, k)).unwrap();
        assert!((got - v.at(0, i, j, k)).abs() < 1e-12);
    }
    let mut seed = 12345u64;
    let mut next = || {
        seed = seed
            .wrapping_mul(6364136223846793005)
            .wrapping_add(1442695040888963407);
        (seed >> 11) as f64 / (1u64 << 53) as f64
    };
    for _ in 0..1000 {
        let (u, w, s) = (3.0 * next(), 4.0 * next(), 2.0 * next());
        let p: [f64; 3] = std::array::from_fn(|d| {
            grid.origin[d] + u * grid.axes[0][d] + w * grid.axes[1][d] + s * grid.axes[2][d]
        });
        let got = v.value_at(0, p).unwrap();
        assert!((got - lin(p)).abs() < 1e-12, "{got} vs {}", lin(p));
    }
    // Outside the box: no value.
    assert_eq!(v.value_at(0, [-5.0, 0.0, 0.0]), None);
    let far = grid.point(3, 4, 2);
    assert_eq!(v.value_at(0, [far[0] + 0.1, far[1], far[2]]), None);
}

/// Values split across the reader's internal buffer boundaries (256 kB) parse the
/// same as written: a file of ~60 k values with irregular widths and line breaks,
/// against the standard library's parser of the same text (common practice).
#[test]
fn values_across_buffer_boundaries() {
    let mut text = String::from("t\nc\n    0 0 0 0\n 3 0.1 0 0\n 4 0 0.1 0\n 5000 0 0 0.1\n");
    let mut want = Vec::new();
    let mut seed = 7u64;
    for n in 0..60_000 {
        seed = seed
            .wrapping_mul(6364136223846793005)
            .wrapping_add(1442695040888963407);
        let v = ((seed >> 11) as f64 / (1u64 << 53) as f64 - 0.5) * 10f64.powi((n % 40) - 20);
        let s = match n % 4 {
            0 => format!("{v:e}"),
            1 => format!("{v:.17e}"),
            2 => format!("{v:.3E}").replace('E', "D"),
            _ => format!("{v}"),
        };
        want.push(s.replace('D', "E").parse::<f64>().unwrap());
        text += &s;
        text += if n % 7 == 0 { "\r\n" } else { " " };
    }
    let v = read(text.as_bytes()).unwrap();
    assert_eq!(v.values, want);
    // A 100-character entry is refused as a whole, not cut to a shorter number:
    // replace the first value by one.
    let head: String = text.split_inclusive('\n').take(6).collect();
    let rest = &text[head.len()..];
    let first = rest.split_whitespace().next().unwrap();
    let bad = format!("{head}{}{}", "1".repeat(100), &rest[first.len()..]);
    let e = read(bad.as_bytes()).unwrap_err();
    assert_eq!(e.kind, lobecast::error::Kind::Input);
    assert!(
        e.message.contains("line 7: an entry is too long"),
        "{}",
        e.message
    );
}
