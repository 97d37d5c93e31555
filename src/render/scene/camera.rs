//! The camera: an orientation, a projection (orthographic or perspective) and the
//! framing that fits every ball, stick and surface vertex into the picture.
//!
//! Eye space has x right, y up and z the depth along the line of sight, measured
//! from the eye, which sits `distance` in front of `centre`. A point projects onto
//! the screen plane through `centre`: unchanged in x, y for orthographic views,
//! scaled by distance / z in perspective. `offset` and `half_height` then place that
//! plane in the image. The eye distance is `PERSPECTIVE_DISTANCE` = 6 times the
//! radius of the sphere holding everything: a gentle perspective (that sphere spans
//! about 19°, a long-lens view common for figures) in which lobes of equal size at
//! the front and back of a tilted molecule differ by about a tenth, not a quarter as
//! at 3.5 radii; nothing is ever behind the eye. Orthographic views keep the distance
//! so that depths stay positive.

use super::Scene;
use super::vec3::{V3, dot, norm, sub};
use super::view::Orientation;

/// Eye distance in radii of the bounding sphere.
pub const PERSPECTIVE_DISTANCE: f64 = 6.0;
/// Empty space on each side, as a fraction of the fitted half extent.
pub const MARGIN: f64 = 0.08;
/// Half height when everything is one point (bohr), so the picture is not empty.
const MIN_HALF_HEIGHT: f64 = 0.5;

/// Orientation, projection and framing of a picture.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Camera {
    pub orientation: Orientation,
    pub perspective: bool,
    /// World point (bohr) at the middle of the framed objects.
    pub centre: [f64; 3],
    /// Eye to `centre` (bohr).
    pub distance: f64,
    /// The screen-plane point (bohr) that lands in the middle of the image.
    pub offset: [f64; 2],
    /// Half the image height in screen-plane bohr; the width follows the image.
    pub half_height: f64,
}

impl Camera {
    /// Eye-space coordinates of a world point.
    pub fn eye(&self, p: V3) -> V3 {
        let o = &self.orientation;
        let d = sub(p, self.centre);
        [
            dot(d, o.right),
            dot(d, o.up),
            dot(d, o.forward) + self.distance,
        ]
    }

    /// Eye-space direction of a world direction (normals).
    pub fn eye_dir(&self, v: V3) -> V3 {
        let o = &self.orientation;
        [dot(v, o.right), dot(v, o.up), dot(v, o.forward)]
    }

    /// Screen-plane position of an eye-space point (depth must be positive).
    pub fn screen(&self, e: V3) -> [f64; 2] {
        if self.perspective {
            let k = self.distance / e[2];
            [e[0] * k, e[1] * k]
        } else {
            [e[0], e[1]]
        }
    }

    /// Screen-plane extent [x_min, x_max, y_min, y_max] of a sphere of radius `r`
    /// at eye-space `e`: exact, from the tangent lines through the eye in
    /// perspective. `None` when the sphere reaches the eye plane.
    pub fn sphere_extent(&self, e: V3, r: f64) -> Option<[f64; 4]> {
        if !self.perspective {
            return Some([e[0] - r, e[0] + r, e[1] - r, e[1] + r]);
        }
        if e[2] <= r {
            return None;
        }
        let span = |x: f64| {
            let rho = x.hypot(e[2]);
            let (phi, alpha) = (x.atan2(e[2]), (r / rho).asin());
            (
                self.distance * (phi - alpha).tan(),
                self.distance * (phi + alpha).tan(),
            )
        };
        let ((x0, x1), (y0, y1)) = (span(e[0]), span(e[1]));
        Some([x0, x1, y0, y1])
    }
}

/// Bounding spheres (centre, radius) of everything in a scene.
fn spheres<'s>(scene: &'s Scene) -> impl Iterator<Item = (V3, f64)> + 's {
    let balls = scene.balls.iter().map(|b| (b.centre, b.radius.max(0.0)));
    let sticks =
        (scene.sticks.iter()).flat_map(|s| [(s.a, s.radius.max(0.0)), (s.b, s.radius.max(0.0))]);
    let vertices = (scene.surfaces.iter()).flat_map(|p| p.mesh.positions.iter().map(|v| (*v, 0.0)));
    balls
        .chain(sticks)
        .chain(vertices)
        .filter(|(c, r)| c.iter().all(|x| x.is_finite()) && r.is_finite())
}

/// The camera fitting `scene` with a margin, for pictures of width / height `aspect`
/// (a non-finite or non-positive aspect counts as 1).
pub fn frame(scene: &Scene, orientation: &Orientation, perspective: bool, aspect: f64) -> Camera {
    frame_all(
        std::slice::from_ref(scene),
        orientation,
        perspective,
        aspect,
    )
}

/// One camera fitting every scene, so that panels share scale and position.
pub fn frame_all(
    scenes: &[Scene],
    orientation: &Orientation,
    perspective: bool,
    aspect: f64,
) -> Camera {
    let aspect = if aspect.is_finite() && aspect > 0.0 {
        aspect
    } else {
        1.0
    };
    let all = || scenes.iter().flat_map(spheres);
    let axes = [orientation.right, orientation.up, orientation.forward];
    let mut lo = [f64::INFINITY; 3];
    let mut hi = [f64::NEG_INFINITY; 3];
    for (c, r) in all() {
        for k in 0..3 {
            let x = dot(c, axes[k]);
            lo[k] = lo[k].min(x - r);
            hi[k] = hi[k].max(x + r);
        }
    }
    let mut centre = [0.0; 3];
    if lo[0].is_finite() {
        for k in 0..3 {
            let mid = 0.5 * (lo[k] + hi[k]);
            centre = super::vec3::add(centre, super::vec3::scale(axes[k], mid));
        }
    }
    let radius = all()
        .map(|(c, r)| norm(sub(c, centre)) + r)
        .fold(0.0f64, f64::max)
        .max(MIN_HALF_HEIGHT);
    let mut camera = Camera {
        orientation: *orientation,
        perspective,
        centre,
        distance: PERSPECTIVE_DISTANCE * radius,
        offset: [0.0; 2],
        half_height: MIN_HALF_HEIGHT,
    };
    let mut ext = [
        f64::INFINITY,
        f64::NEG_INFINITY,
        f64::INFINITY,
        f64::NEG_INFINITY,
    ];
    for (c, r) in all() {
        if let Some(e) = camera.sphere_extent(camera.eye(c), r) {
            ext = [
                ext[0].min(e[0]),
                ext[1].max(e[1]),
                ext[2].min(e[2]),
                ext[3].max(e[3]),
            ];
        }
    }
    if ext[0].is_finite() {
        camera.offset = [0.5 * (ext[0] + ext[1]), 0.5 * (ext[2] + ext[3])];
        let half = (0.5 * (ext[3] - ext[2])).max(0.5 * (ext[1] - ext[0]) / aspect);
        camera.half_height = (half * (1.0 + MARGIN)).max(MIN_HALF_HEIGHT);
    }
    camera
}
