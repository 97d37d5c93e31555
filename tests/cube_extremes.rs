//! Values at the ends of the double range (issue 10, items 1 and 17): every finite
//! double our formatter writes reads back through our reader in the fixed 13-column
//! layout, within the layout's rounding; `combine` of density tails writes a file that
//! reads back; the Fortran three-digit exponent form is read.

mod common;

use std::fs;
use std::io::Cursor;
use std::path::Path;

use lobecast::grid::GridBox;
use lobecast::io::cube::format::push_e13;
use lobecast::io::cube::writer::{PER_LINE, format_slab};
use lobecast::io::cube::{CubeHeader, CubeReader, Volume};
use proptest::prelude::*;

use common::ok;

/// The rounding of `%13.5E`: half a unit in the fifth decimal of a mantissa in
/// [1, 10), so at most 5e-6 relative (the C standard's definition of the E
/// conversion); the 1e-12 margin covers the double nearest to the decimal.
const REL_5: f64 = 5e-6 * (1.0 + 1e-12);
/// Four decimals for magnitudes of 1e100 and more (the writer's documented choice).
const REL_4: f64 = 5e-5 * (1.0 + 1e-12);

/// A single-field cube of `values` on a 1×1×n grid, written by our header and slab
/// formatter, exactly as `volume` and `combine` write them.
fn cube_text(values: &[f64]) -> String {
    let header = CubeHeader {
        title: "extremes".into(),
        comment: "property test".into(),
        atoms: Vec::new(),
        grid: GridBox {
            origin: [0.0; 3],
            axes: [[1.0, 0.0, 0.0], [0.0, 1.0, 0.0], [0.0, 0.0, 1.0]],
            counts: [1, 1, values.len()],
        },
        orbital_numbers: None,
    };
    let mut buf = header.text().into_bytes();
    format_slab(values, values.len(), &mut buf).expect("finite values are written");
    String::from_utf8(buf).unwrap()
}

fn read_back(text: &str) -> Vec<f64> {
    let r = CubeReader::new(Cursor::new(text.as_bytes().to_vec()), None, "prop.cube")
        .expect("the header reads");
    Volume::from_reader(r)
        .expect("the values read")
        .field_values(0)
        .collect()
}

/// The layout: each value line holds 13-column fields that begin with a space.
fn assert_layout(text: &str, n: usize) {
    let lines: Vec<&str> = text.lines().skip(6).collect();
    assert_eq!(lines.len(), n.div_ceil(PER_LINE));
    for l in lines {
        assert_eq!(l.len() % 13, 0, "{l:?}");
        for f in l.as_bytes().chunks(13) {
            assert_eq!(f[0], b' ', "{l:?}");
        }
    }
}

fn assert_reads_back(v: f64, r: f64) {
    let a = v.abs();
    if a < 9.999995e-100 {
        assert_eq!(r, 0.0, "{v:e} is below 1e-99 and is written as zero");
    } else if a < 1e-99 {
        // Rounds to 1.00000E-99 or to zero, either is within the rule.
        assert!(
            r == 0.0 || (r - v).abs() <= REL_5 * a,
            "{v:e} read as {r:e}"
        );
    } else {
        // Above 1.79765E+308 the writer rounds toward zero (rounding to nearest
        // would exceed the largest double): up to one unit in the fourth decimal.
        let tol = if a >= 1.79765e308 {
            2.0 * REL_4
        } else if a >= 9.999995e99 {
            REL_4
        } else {
            REL_5
        };
        assert!((r - v).abs() <= tol * a, "{v:e} read as {r:e}");
        assert_eq!(r.is_sign_negative(), v.is_sign_negative(), "{v:e}");
    }
}

/// Finite doubles of every class: any bit pattern (normal, subnormal, zero, both
/// signs), decimal magnitudes spread over the whole exponent range, and the edges of
/// the written range.
fn finite() -> impl Strategy<Value = f64> {
    use prop::num::f64 as c;
    prop_oneof![
        3 => c::POSITIVE | c::NEGATIVE | c::NORMAL | c::SUBNORMAL | c::ZERO,
        3 => (1.0f64..10.0, -330i32..=308, any::<bool>()).prop_map(|(m, e, neg)| {
            let v = m * 10f64.powi(e);
            let v = if v.is_finite() { v } else { f64::MAX };
            if neg { -v } else { v }
        }),
        1 => prop::sample::select(vec![
            9.999995e-100, -9.999994e-100, 1e-99, -1e-99, 1.000005e-99, 9.999994e99,
            -9.999996e99, 1e100, f64::MAX, -f64::MAX, f64::MIN_POSITIVE, -5e-324,
            -7.27096e-122, -9.87842e-117, -9.34575e-112,
        ]),
    ]
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 2000, ..ProptestConfig::default() })]

    /// Any finite double written by our formatter reads back through our reader.
    #[test]
    fn any_finite_value_reads_back(values in prop::collection::vec(finite(), 1..40)) {
        let text = cube_text(&values);
        assert_layout(&text, values.len());
        let back = read_back(&text);
        prop_assert_eq!(back.len(), values.len());
        for (&v, &r) in values.iter().zip(&back) {
            assert_reads_back(v, r);
        }
    }
}

/// The reported values: `-7.27096E-122` next to its neighbours ran together.
#[test]
fn reported_tail_values_are_written_as_zero() {
    let text = cube_text(&[-9.87842e-117, -9.34575e-112, -7.27096e-122, -0.25]);
    assert!(text.ends_with("  0.00000E+00  0.00000E+00  0.00000E+00 -2.50000E-01\n"));
    assert_eq!(read_back(&text), vec![0.0, 0.0, 0.0, -0.25]);
}

#[test]
fn non_finite_values_are_refused() {
    let mut buf = Vec::new();
    assert!(format_slab(&[1.0, f64::NAN], 2, &mut buf).is_err());
    assert!(push_e13(&mut Vec::new(), f64::NEG_INFINITY).is_err());
}

/// Issue 10, item 17: values in the Fortran form, a sign in place of the exponent
/// letter, read as their `E` forms (reference: the standard parser on the `E` form).
#[test]
fn fortran_exponent_form_is_read() {
    let head = cube_text(&[0.0, 0.0, 0.0]);
    let head = head.lines().take(6).collect::<Vec<_>>().join("\n");
    let text = format!("{head}\n  3.86160-106 -1.00000+100  2.50000E-01\n");
    let back = read_back(&text);
    assert_eq!(back[0], "3.86160E-106".parse::<f64>().unwrap());
    assert_eq!(back[1], -1e100);
    assert_eq!(back[2], 0.25);
}

/// Every value line of a cube file has whole 13-column fields beginning with a space.
fn assert_file_layout(path: &Path, header_lines: usize) {
    let text = fs::read_to_string(path).unwrap();
    for l in text.lines().skip(header_lines) {
        assert!(l.len() % 13 == 0 && !l.is_empty(), "{l:?}");
        assert!(l.as_bytes().chunks(13).all(|f| f[0] == b' '), "{l:?}");
    }
}

/// The reported case: `combine --out neg.cube tight.cube#2:-1` on a file whose second
/// field is a density with tails far below 1e-99 (written here as another program, or
/// our old writer, wrote them: three-digit exponents). The output must read back, with
/// the tails as zero and everything else negated.
#[test]
fn combine_of_density_tails_reads_back() {
    let d = tempfile::tempdir().unwrap();
    let p = d.path();
    let tight = "tight\ntwo fields\n   -1    0.000000    0.000000    0.000000    2\n\
        \x20   1    1.000000    0.000000    0.000000\n\
        \x20   1    0.000000    1.000000    0.000000\n\
        \x20   4    0.000000    0.000000    1.000000\n\
        \x20   1    1.000000    0.000000    0.000000    0.000000\n    2    1    2\n\
        \x20 1.00000E-02  9.87842E-117 2.00000E-02  9.34575E-112 3.00000E-02  7.27096E-122\n\
        \x20 4.00000E-02  5.00000E-01\n";
    fs::write(p.join("tight.cube"), tight).unwrap();
    ok(p, &["combine", "--out", "neg.cube", "tight.cube#2:-1"]);
    assert_file_layout(&p.join("neg.cube"), 6 + 1);
    let v = Volume::read(&p.join("neg.cube")).unwrap();
    assert_eq!(
        v.field_values(0).collect::<Vec<_>>(),
        vec![0.0, 0.0, 0.0, -0.5]
    );
    let report = ok(p, &["inspect", "neg.cube", "--json"]);
    let j: serde_json::Value = serde_json::from_str(&report).unwrap();
    assert_eq!(j["fields"][0]["min"].as_f64(), Some(-0.5));
}

/// The same through the whole chain: a density in STO-3G on a box wide enough that
/// the density falls below 1e-99 (its most diffuse exponent, about 0.169 bohr⁻² for
/// H (Hehre, Stewart and Pople 1969; from memory), gives e^(−2·0.169·30²) ≈ 1e-132 at
/// 30 bohr), combined with weight −1, must read back and hold no value below 1e-99.
#[test]
fn combine_of_a_computed_density_reads_back() {
    let d = tempfile::tempdir().unwrap();
    let p = d.path();
    let model = common::example("h2-cation-sto3g.toml");
    fs::copy(model, p.join("sto3g.toml")).unwrap();
    ok(
        p,
        &[
            "volume",
            "sto3g.toml",
            "--field",
            "orbital:1",
            "--field",
            "density",
            "--units",
            "bohr",
            "--padding",
            "30",
            "--spacing",
            "1.5",
            "--out",
            "tight.cube",
        ],
    );
    ok(p, &["combine", "--out", "neg.cube", "tight.cube#2:-1"]);
    assert_file_layout(&p.join("neg.cube"), 6 + 2);
    let v = Volume::read(&p.join("neg.cube")).unwrap();
    let vals: Vec<f64> = v.field_values(0).collect();
    assert!(
        vals.iter()
            .all(|&x| x == 0.0 || (-1.0..=-1e-99).contains(&x))
    );
    assert!(vals.contains(&0.0), "the box reaches the tails");
    assert!(vals.iter().any(|&x| x < -1e-3), "and the molecule");
}
