//! View specifications and the orientations they give.

use super::super::auto;
use super::super::vec3::{cross, dot, norm, sub};
use super::super::{DEFAULT_TURN_DEG, Orientation, View, ViewSpec};
use crate::chem::Molecule;

fn mol(atoms: &[(&str, [f64; 3])]) -> Molecule {
    Molecule::from_symbols(atoms, 0).unwrap()
}

/// Water, bent, in a general position (not in a coordinate plane).
fn water() -> Molecule {
    mol(&[
        ("O", [0.1, 0.2, 0.3]),
        ("H", [1.5, 0.9, 0.1]),
        ("H", [-1.2, 1.1, 0.8]),
    ])
}

fn view(spec: ViewSpec) -> View {
    View {
        spec,
        turn_deg: [0.0, 0.0],
        perspective: false,
    }
}

fn close(a: [f64; 3], b: [f64; 3], tol: f64) -> bool {
    norm(sub(a, b)) < tol
}

/// Unit axes, mutually perpendicular, and right × up = −forward (common practice:
/// a right-handed screen frame with the viewer looking along forward).
fn assert_frame(o: &Orientation, what: &str) {
    for v in [o.forward, o.up, o.right] {
        assert!((norm(v) - 1.0).abs() < 1e-12, "{what}: not unit {v:?}");
    }
    assert!(dot(o.forward, o.up).abs() < 1e-12, "{what}");
    assert!(dot(o.forward, o.right).abs() < 1e-12, "{what}");
    assert!(dot(o.up, o.right).abs() < 1e-12, "{what}");
    let f = cross(o.right, o.up);
    assert!(
        close(f, o.forward.map(|x| -x), 1e-12),
        "{what}: left-handed {o:?}"
    );
}

#[test]
fn view_specs_parse() {
    let axis = |axis, positive| ViewSpec::Axis { axis, positive };
    let good = [
        ("+x", axis(0, true)),
        ("-x", axis(0, false)),
        ("+y", axis(1, true)),
        ("-Y", axis(1, false)),
        (" +z ", axis(2, true)),
        ("-z", axis(2, false)),
        ("auto", ViewSpec::Auto),
        ("atoms:1,2", ViewSpec::Atoms(1, 2)),
        ("atoms:12, 3", ViewSpec::Atoms(12, 3)),
        ("normal:1,2,3", ViewSpec::Normal(1, 2, 3)),
    ];
    for (s, want) in good {
        assert_eq!(s.parse::<ViewSpec>().unwrap(), want, "{s}");
    }
    let bad = [
        "",
        "x",
        "+w",
        "++x",
        "top",
        "atoms:1",
        "atoms:1,2,3",
        "atoms:0,2",
        "atoms:1,1",
        "atoms:a,b",
        "atoms:-1,2",
        "normal:1,2",
        "normal:1,2,2",
        "normal:1,2,3,4",
        "bonds:1,2",
    ];
    for s in bad {
        let e = s.parse::<ViewSpec>().unwrap_err();
        assert_eq!(e.kind, crate::error::Kind::Input, "{s}");
        let text = format!("{} {}", e.message, e.hint.unwrap_or_default());
        assert!(
            text.contains("atoms:I,J") && text.contains("normal:I,J,K"),
            "{s}: {text}"
        );
    }
}

#[test]
fn axis_views_look_from_their_side_with_z_up() {
    let m = water();
    // From +x: looking along −x, +z up, so a +z lobe is above its nucleus; +y right.
    let o = view("+x".parse().unwrap()).orientation(&m).unwrap();
    assert!(close(o.forward, [-1.0, 0.0, 0.0], 1e-12) && close(o.up, [0.0, 0.0, 1.0], 1e-12));
    assert!(close(o.right, [0.0, 1.0, 0.0], 1e-12));
    // From +z: the textbook xy plane, x right and y up.
    let o = view("+z".parse().unwrap()).orientation(&m).unwrap();
    assert!(close(o.forward, [0.0, 0.0, -1.0], 1e-12) && close(o.up, [0.0, 1.0, 0.0], 1e-12));
    assert!(close(o.right, [1.0, 0.0, 0.0], 1e-12));
    let o = view("-z".parse().unwrap()).orientation(&m).unwrap();
    assert!(close(o.up, [0.0, 1.0, 0.0], 1e-12));
    let o = view("-y".parse().unwrap()).orientation(&m).unwrap();
    assert!(close(o.forward, [0.0, 1.0, 0.0], 1e-12) && close(o.up, [0.0, 0.0, 1.0], 1e-12));
}

#[test]
fn every_orientation_is_orthonormal_and_right_handed() {
    let m = water();
    let specs = [
        "+x",
        "-x",
        "+y",
        "-y",
        "+z",
        "-z",
        "auto",
        "atoms:1,2",
        "atoms:3,1",
        "normal:1,2,3",
        "normal:3,2,1",
    ];
    for s in specs {
        for turn in [[0.0, 0.0], [30.0, 0.0], [0.0, -45.0], [123.0, 271.0]] {
            for perspective in [false, true] {
                let v = View {
                    spec: s.parse().unwrap(),
                    turn_deg: turn,
                    perspective,
                };
                assert_frame(&v.orientation(&m).unwrap(), &format!("{s} {turn:?}"));
            }
        }
    }
}

#[test]
fn atoms_view_looks_down_the_bond_and_normal_view_onto_the_plane() {
    let m = water();
    let (o1, h2, h3) = (
        m.atoms[0].position,
        m.atoms[1].position,
        m.atoms[2].position,
    );
    let o = view(ViewSpec::Atoms(1, 2)).orientation(&m).unwrap();
    let bond = sub(h2, o1);
    assert!(
        close(o.forward, bond.map(|x| x / norm(bond)), 1e-12),
        "from atom 1 towards atom 2"
    );
    let o = view(ViewSpec::Normal(1, 2, 3)).orientation(&m).unwrap();
    assert!(dot(o.forward, sub(h2, o1)).abs() < 1e-12);
    assert!(dot(o.forward, sub(h3, o1)).abs() < 1e-12);
    // Seen from the side (J − I) × (K − I) points to, so the camera looks against it.
    assert!(dot(o.forward, cross(sub(h2, o1), sub(h3, o1))) < 0.0);
    // A turn changes an explicit view; no turn leaves it exact.
    let turned = View {
        turn_deg: [10.0, 0.0],
        ..view(ViewSpec::Atoms(1, 2))
    };
    let t = turned.orientation(&m).unwrap();
    assert!((dot(t.forward, bond) / norm(bond) - 10f64.to_radians().cos()).abs() < 1e-12);
}

#[test]
fn degenerate_views_are_errors() {
    let m = water();
    let line = mol(&[
        ("C", [0.0, 0.0, 0.0]),
        ("O", [0.0, 0.0, 2.2]),
        ("O", [0.0, 0.0, -2.2]),
    ]);
    let cases: Vec<(Molecule, View, &str)> = vec![
        (m.clone(), view(ViewSpec::Atoms(1, 4)), "no atom 4"),
        (m.clone(), view(ViewSpec::Atoms(0, 1)), "no atom 0"),
        (m.clone(), view(ViewSpec::Normal(1, 2, 9)), "no atom 9"),
        (m.clone(), view(ViewSpec::Atoms(2, 2)), "at one place"),
        (line, view(ViewSpec::Normal(1, 2, 3)), "on a line"),
        (
            m.clone(),
            view(ViewSpec::Axis {
                axis: 3,
                positive: true,
            }),
            "axis 3",
        ),
        (
            m.clone(),
            View {
                turn_deg: [f64::NAN, 0.0],
                ..view(ViewSpec::Auto)
            },
            "not a finite",
        ),
        (
            m,
            View {
                turn_deg: [0.0, f64::INFINITY],
                ..view(ViewSpec::Atoms(1, 2))
            },
            "not a finite",
        ),
    ];
    for (molecule, v, want) in cases {
        let e = v.orientation(&molecule).unwrap_err();
        assert!(e.message.contains(want), "{want}: {}", e.message);
    }
}

/// The automatic view looks along the axis of least spread, with the longest
/// spread across the screen; ties go to x, then y, then z.
#[test]
fn auto_view_follows_the_principal_axes() {
    // Planar molecule in the xy plane, longest along y: seen face-on from +z (the
    // side that the turn tips up), y across.
    let planar = mol(&[
        ("C", [0.0, -2.0, 0.0]),
        ("C", [0.0, 2.0, 0.0]),
        ("H", [1.5, 0.0, 0.0]),
    ]);
    let o = auto::orientation(&planar);
    assert!(close(o.forward, [0.0, 0.0, -1.0], 1e-9), "{o:?}");
    assert!(
        close(o.right, [0.0, 1.0, 0.0], 1e-9) && close(o.up, [-1.0, 0.0, 0.0], 1e-9),
        "{o:?}"
    );
    // Linear along z: x and y tie for least spread, so along x with z across, from
    // −x so that up leans to +y rather than −y.
    let linear = mol(&[
        ("O", [0.0, 0.0, -2.2]),
        ("C", [0.0, 0.0, 0.0]),
        ("O", [0.0, 0.0, 2.2]),
    ]);
    let o = auto::orientation(&linear);
    assert!(close(o.forward, [1.0, 0.0, 0.0], 1e-9) && close(o.right, [0.0, 0.0, 1.0], 1e-9));
    assert!(close(o.up, [0.0, 1.0, 0.0], 1e-9));
    // Linear along x: seen from −y, x across and +z up (a +z lobe stays above).
    let along_x = mol(&[("H", [-0.7, 0.0, 0.0]), ("H", [0.7, 0.0, 0.0])]);
    let o = auto::orientation(&along_x);
    assert!(
        close(o.forward, [0.0, 1.0, 0.0], 1e-9) && close(o.up, [0.0, 0.0, 1.0], 1e-9),
        "{o:?}"
    );
    // With the default turn [a, b] (about the screen horizontal, then vertical) the
    // linear molecule's axis leans b out of the screen plane (the horizontal turn
    // leaves it alone), and the planar one's normal is off the view by
    // acos(cos a cos b) (two rotations about perpendicular axes, spherical
    // trigonometry), with the +z side tipped up (z projects upwards on the screen).
    let [a, b] = DEFAULT_TURN_DEG.map(f64::to_radians);
    let auto = view(ViewSpec::Auto);
    let o = auto.orientation(&linear).unwrap();
    assert!((o.forward[2].abs() - b.sin().abs()).abs() < 1e-12, "{o:?}");
    let o = auto.orientation(&planar).unwrap();
    assert!(
        (o.forward[2].abs() - a.cos() * b.cos()).abs() < 1e-12,
        "{o:?}"
    );
    assert!((o.up[2] - a.sin().abs()).abs() < 1e-12, "{o:?}");
    // A single atom is seen like the +x view.
    let o = auto::orientation(&mol(&[("Ne", [1.0, 2.0, 3.0])]));
    assert!(close(o.forward, [-1.0, 0.0, 0.0], 1e-12) && close(o.up, [0.0, 0.0, 1.0], 1e-12));
    // Regular tetrahedron (all spreads equal): also from +x, z up.
    let t = mol(&[
        ("C", [0.0; 3]),
        ("H", [1.2, 1.2, 1.2]),
        ("H", [-1.2, -1.2, 1.2]),
        ("H", [-1.2, 1.2, -1.2]),
        ("H", [1.2, -1.2, -1.2]),
    ]);
    let o = auto::orientation(&t);
    assert!(
        close(o.forward, [-1.0, 0.0, 0.0], 1e-9) && close(o.up, [0.0, 0.0, 1.0], 1e-9),
        "{o:?}"
    );
}
