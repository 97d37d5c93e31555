//! The line-chart module: data → pixel mapping, the twin axis, gaps at NaN, and tick
//! labels that never overlap, checked on the drawn pixels where possible.

use lobecast::plot::chart::{Axis, Chart, Drawn, Series, Twin, draw};
use lobecast::render::Colour;
use lobecast::render::axes::overlap;

const RED: Colour = Colour::rgb(255, 0, 0);
const BLUE: Colour = Colour::rgb(0, 0, 255);

/// 1 hartree in eV (CODATA 2018: 27.211386245988 eV), typed here independently of
/// the library's constant.
const HARTREE_EV: f64 = 27.211_386_245_988;

fn chart<'a>(width: u32, x: (f64, f64), y: (f64, f64), series: Vec<Series<'a>>) -> Chart<'a> {
    Chart {
        title: "test chart".into(),
        width,
        background: Colour::WHITE,
        x: Axis {
            name: "x / unit".into(),
            lo: x.0,
            hi: x.1,
        },
        y: Axis {
            name: "y / unit".into(),
            lo: y.0,
            hi: y.1,
        },
        twin: None,
        series,
        verticals: Vec::new(),
        points: Vec::new(),
        notes: vec!["a footnote".into()],
        legend: false,
        legend_headroom: false,
    }
}

/// Dots only (no line between points), of radius 4 px.
fn dots<'a>(xs: &'a [f64], ys: &'a [f64], colour: Colour) -> Series<'a> {
    Series {
        marker: Some(4.0),
        width: 0.0,
        ..Series::line(None, xs, ys, colour)
    }
}

fn is(c: Colour, want: Colour) -> bool {
    c.r.abs_diff(want.r) < 40 && c.g.abs_diff(want.g) < 40 && c.b.abs_diff(want.b) < 40
}

/// Centre (in pixel coordinates, pixel i spanning [i, i+1)) of the pixels of one colour.
fn centroid(d: &Drawn, want: Colour) -> (f32, f32) {
    let (mut sx, mut sy, mut n) = (0.0, 0.0, 0.0);
    for y in 0..d.canvas.height() {
        for x in 0..d.canvas.width() {
            if is(d.canvas.pixel(x, y), want) {
                sx += x as f32 + 0.5;
                sy += y as f32 + 0.5;
                n += 1.0;
            }
        }
    }
    assert!(n > 10.0, "the dot is drawn ({n} pixels)");
    (sx / n, sy / n)
}

#[test]
fn a_known_point_lands_within_one_pixel() {
    // (2.5, 0.5) in x ∈ [0, 10], y ∈ [−1, 1] is a quarter of the way from the frame's
    // left edge and a quarter of the way down from its top (linear axes).
    let (xs, ys) = ([2.5], [0.5]);
    let d = draw(&chart(
        800,
        (0.0, 10.0),
        (-1.0, 1.0),
        vec![dots(&xs, &ys, RED)],
    ));
    let f = d.frame;
    // The frame line is drawn where the frame says, just outside the plot area.
    let mid = (f.top + f.height / 2.0) as u32;
    assert!(is(d.canvas.pixel(f.left as u32 - 1, mid), Colour::INK));
    let want = (f.left + 0.25 * f.width, f.top + 0.25 * f.height);
    let got = centroid(&d, RED);
    assert!((got.0 - want.0).abs() <= 1.0, "x {got:?} against {want:?}");
    assert!((got.1 - want.1).abs() <= 1.0, "y {got:?} against {want:?}");
}

#[test]
fn twin_axis_shows_the_same_energy_in_ev() {
    // −0.55 hartree on the left axis and −0.55 × 27.211386245988 eV on the right axis
    // must be drawn at the same height.
    let (x1, h) = ([2.0], [-0.55]);
    let (x2, ev) = ([6.0], [-0.55 * HARTREE_EV]);
    let mut c = chart(
        900,
        (0.0, 8.0),
        (-0.7, 0.0),
        vec![
            dots(&x1, &h, RED),
            Series {
                on_twin: true,
                ..dots(&x2, &ev, BLUE)
            },
        ],
    );
    c.twin = Some(Twin::unit("E / eV", lobecast::chem::units::HARTREE_IN_EV));
    let d = draw(&c);
    let (a, b) = (centroid(&d, RED), centroid(&d, BLUE));
    assert!((a.1 - b.1).abs() <= 1.0, "hartree at {a:?}, eV at {b:?}");
    let f = d.frame;
    for v in [-15.0, -10.0, -5.0, 0.0] {
        let left = f.y_px(v / HARTREE_EV);
        assert!((f.twin_px(v) - left).abs() < 0.01, "{v} eV");
    }
    // With a wrong factor (27.0 eV per hartree) the dots part by more than a pixel:
    // the check can fail.
    let wrong = [-0.55 * 27.0];
    c.series[1] = Series {
        on_twin: true,
        ..dots(&x2, &wrong, BLUE)
    };
    let d = draw(&c);
    assert!((centroid(&d, RED).1 - centroid(&d, BLUE).1).abs() > 1.0);
}

/// Whether any pixel of row `y` between columns `a` and `b` is red.
fn red_between(d: &Drawn, y: f32, a: f32, b: f32) -> bool {
    let row = y as u32;
    (a.ceil() as u32..b.floor() as u32)
        .any(|x| (row - 2..=row + 2).any(|r| is(d.canvas.pixel(x, r), RED)))
}

#[test]
fn nan_breaks_the_line() {
    let xs: Vec<f64> = (0..=10).map(f64::from).collect();
    let mut ys = vec![0.0; 11];
    let whole = draw(&chart(
        600,
        (0.0, 10.0),
        (-1.0, 1.0),
        vec![Series::line(None, &xs, &ys, RED)],
    ));
    ys[5] = f64::NAN;
    let gap = draw(&chart(
        600,
        (0.0, 10.0),
        (-1.0, 1.0),
        vec![Series::line(None, &xs, &ys, RED)],
    ));
    let f = gap.frame;
    let (y, a, b) = (f.y_px(0.0), f.x_px(4.0) + 2.0, f.x_px(6.0) - 2.0);
    assert!(!red_between(&gap, y, a, b), "no paint between 4 and 6");
    // The neighbouring segments are drawn, and without the NaN so is the gap.
    assert!(red_between(&gap, y, f.x_px(3.0), f.x_px(4.0)));
    assert!(red_between(&gap, y, f.x_px(6.0), f.x_px(7.0)));
    assert!(red_between(&whole, y, a, b), "the check can fail");
}

#[test]
fn tick_labels_never_overlap() {
    // Awkward ranges (long labels, tiny and huge magnitudes), small and large widths,
    // with and without a twin axis.
    let ranges = [
        ((0.0, 1.0), (-0.00031, 0.00047)),
        ((-123456.0, 98765.0), (1.0e5, 3.3e5)),
        ((0.6, 8.0), (-0.6373, 0.0217)),
        ((-2.03, 3.06), (-0.61, 1.72)),
        ((1.0, 1.001), (-1e-7, 1e-7)),
    ];
    for width in [200, 320, 520, 1000, 2600] {
        for (x, y) in ranges {
            for twin in [false, true] {
                let mut c = chart(width, x, y, Vec::new());
                if twin {
                    c.twin = Some(Twin::unit("E / eV", HARTREE_EV));
                }
                let d = draw(&c);
                let (w, h) = (d.canvas.width() as f32, d.canvas.height() as f32);
                let b = &d.tick_boxes;
                assert!(b.len() >= 4, "{width} {x:?} {y:?}: {} labels", b.len());
                for (i, p) in b.iter().enumerate() {
                    let inside = p[0] >= 0.0 && p[1] >= 0.0 && p[0] + p[2] <= w && p[1] + p[3] <= h;
                    assert!(inside, "{width} {x:?} {y:?}: {p:?} outside {w}×{h}");
                    for q in &b[i + 1..] {
                        assert!(!overlap(p, q), "{width} {x:?} {y:?}: {p:?} and {q:?}");
                    }
                }
            }
        }
    }
    // The overlap test itself can fail.
    assert!(overlap(&[0.0, 0.0, 10.0, 10.0], &[9.0, 9.0, 5.0, 5.0]));
}
