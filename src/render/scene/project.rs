//! From the camera's screen plane to supersample coordinates (x right, y down, the
//! sample (i, j) centred at (i + ½, j + ½)) and back to eye rays.

use super::camera::Camera;
use super::raster::ScreenVertex;
use super::vec3::V3;

pub struct Projector {
    pub camera: Camera,
    /// Picture size in samples.
    pub width: f64,
    pub height: f64,
    /// Samples per screen-plane bohr.
    pub scale: f64,
}

impl Projector {
    pub fn new(camera: &Camera, width: usize, height: usize) -> Projector {
        let hh = if camera.half_height.is_finite() && camera.half_height > 0.0 {
            camera.half_height
        } else {
            1.0
        };
        Projector {
            camera: *camera,
            width: width as f64,
            height: height as f64,
            scale: height as f64 / (2.0 * hh),
        }
    }

    /// Sample coordinates of a screen-plane point.
    pub fn sample(&self, s: [f64; 2]) -> [f64; 2] {
        let o = self.camera.offset;
        [
            0.5 * self.width + (s[0] - o[0]) * self.scale,
            0.5 * self.height - (s[1] - o[1]) * self.scale,
        ]
    }

    /// A mesh vertex on the screen; depth 0 (refused by the rasteriser) when the
    /// point is not in front of the eye.
    pub fn vertex(&self, p: V3, n: V3) -> ScreenVertex {
        let e = self.camera.eye(p);
        let nn = self.camera.eye_dir(n);
        if e[2].is_nan() || e[2] <= 0.0 {
            return ScreenVertex::default();
        }
        let [x, y] = self.sample(self.camera.screen(e));
        ScreenVertex {
            x,
            y,
            z: e[2] as f32,
            n: [nn[0] as f32, nn[1] as f32, nn[2] as f32],
        }
    }

    /// The eye ray through the centre of sample (col, row): origin and direction,
    /// with the direction's z = 1, so the ray parameter of a hit is its depth.
    pub fn ray(&self, col: usize, row: usize) -> (V3, V3) {
        let o = self.camera.offset;
        let x = (col as f64 + 0.5 - 0.5 * self.width) / self.scale + o[0];
        let y = (0.5 * self.height - row as f64 - 0.5) / self.scale + o[1];
        if self.camera.perspective {
            let d = self.camera.distance;
            ([0.0; 3], [x / d, y / d, 1.0])
        } else {
            ([x, y, 0.0], [0.0, 0.0, 1.0])
        }
    }

    /// Sample columns and rows [c0, c1, r0, r1] (inclusive) a sphere at eye-space
    /// `e` may cover, or `None` when it is off the picture or reaches the eye.
    pub fn sphere_box(&self, e: V3, r: f64) -> Option<[usize; 4]> {
        let ext = self.camera.sphere_extent(e, r)?;
        let a = self.sample([ext[0], ext[3]]);
        let b = self.sample([ext[1], ext[2]]);
        let c0 = (a[0] - 1.0).floor().max(0.0);
        let r0 = (a[1] - 1.0).floor().max(0.0);
        let c1 = (b[0] + 1.0).ceil().min(self.width - 1.0);
        let r1 = (b[1] + 1.0).ceil().min(self.height - 1.0);
        if !(c0 <= c1 && r0 <= r1) {
            return None;
        }
        Some([c0 as usize, c1 as usize, r0 as usize, r1 as usize])
    }
}
