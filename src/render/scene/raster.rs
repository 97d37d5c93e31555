//! Triangles into one horizontal band of samples: coverage, depth and the
//! interpolated normal.
//!
//! Vertices are snapped to 1/16 of a sample and edge functions evaluated in
//! integers (J. Pineda, "A parallel algorithm for polygon rasterization",
//! SIGGRAPH 1988), so a sample on an edge shared by two triangles is drawn by
//! exactly one of them (a tie rule in the spirit of the top-left rule): no cracks
//! in opaque surfaces, no doubly blended seams in translucent ones. Attributes are
//! interpolated per sample; in perspective with 1/z weights (perspective-correct).

use super::band::{Area, Band, unit_f32};
use super::shade::Lights;

/// Sub-sample precision of vertex positions.
const SUB: i64 = 16;
/// Snapped coordinates beyond this are refused, which keeps edge products in i64.
const LIMIT: f64 = (1u64 << 28) as f64;

/// A mesh vertex on the screen: sample coordinates (x right, y down), eye depth and
/// eye-space normal.
#[derive(Debug, Clone, Copy, Default)]
pub struct ScreenVertex {
    pub x: f64,
    pub y: f64,
    pub z: f32,
    pub n: [f32; 3],
}

/// A triangle ready to draw.
pub struct Setup {
    p: [[i64; 2]; 3],
    v: [ScreenVertex; 3],
    inv_area: f32,
    /// The viewer sees the side the normals point away from: flip them.
    flip: bool,
}

impl Setup {
    /// `None` for a triangle of no area, out of range, or behind the eye.
    pub fn new(v: [ScreenVertex; 3]) -> Option<Setup> {
        let mut p = [[0i64; 2]; 3];
        for (k, s) in v.iter().enumerate() {
            if !(s.x.abs() < LIMIT && s.y.abs() < LIMIT && s.z > 0.0) {
                return None;
            }
            p[k] = [
                (s.x * SUB as f64).round() as i64,
                (s.y * SUB as f64).round() as i64,
            ];
        }
        let area = edge(p[0], p[1], p[2]);
        if area == 0 {
            return None;
        }
        // Counter-clockwise seen from the normals' side is clockwise in y-down
        // sample coordinates, so a positive area means a back face.
        let (p, v, flip) = if area > 0 {
            (p, v, true)
        } else {
            ([p[0], p[2], p[1]], [v[0], v[2], v[1]], false)
        };
        Some(Setup {
            p,
            v,
            inv_area: 1.0 / area.abs() as f32,
            flip,
        })
    }

    /// Rows (sample) the triangle may touch, inclusive.
    pub fn rows(&self) -> (i64, i64) {
        let lo = self.p.iter().map(|q| q[1]).min().unwrap_or(0);
        let hi = self.p.iter().map(|q| q[1]).max().unwrap_or(0);
        (
            (lo - SUB / 2 + SUB - 1).div_euclid(SUB),
            (hi - SUB / 2).div_euclid(SUB),
        )
    }

    pub fn centroid_depth(&self) -> f32 {
        (self.v[0].z + self.v[1].z + self.v[2].z) / 3.0
    }

    /// Calls `f(index, barycentrics)` for every sample of `band` inside.
    #[inline]
    fn cover(&self, area: Area, mut f: impl FnMut(usize, [f32; 3])) {
        let p = self.p;
        let cols = |a: i64| a.div_euclid(SUB);
        let xs = p.iter().map(|q| q[0]);
        let (x_lo, x_hi) = (xs.clone().min().unwrap_or(0), xs.max().unwrap_or(0));
        let c0 = cols(x_lo - SUB / 2 + SUB - 1).max(0);
        let c1 = cols(x_hi - SUB / 2).min(area.width as i64 - 1);
        let (r0, r1) = self.rows();
        let r0 = r0.max(area.y0 as i64);
        let r1 = r1.min((area.y0 + area.rows) as i64 - 1);
        if c0 > c1 || r0 > r1 {
            return;
        }
        // Edge k is opposite vertex k; `own` says whether it keeps samples on it.
        let edges = [(p[1], p[2]), (p[2], p[0]), (p[0], p[1])];
        let mut start = [0i64; 3];
        let mut step_x = [0i64; 3];
        let mut step_y = [0i64; 3];
        let (sx, sy) = (c0 * SUB + SUB / 2, r0 * SUB + SUB / 2);
        for (k, (a, b)) in edges.iter().enumerate() {
            let (dx, dy) = (b[0] - a[0], b[1] - a[1]);
            // The triangle owns its edge samples where it lies below the edge (right
            // of a vertical one): of two triangles sharing an edge exactly one does,
            // and the rule is unchanged by a left–right mirror.
            let own = dx > 0 || (dx == 0 && dy < 0);
            start[k] = edge(*a, *b, [sx, sy]) - i64::from(!own);
            step_x[k] = -dy * SUB;
            step_y[k] = dx * SUB;
        }
        for r in r0..=r1 {
            let mut w = start;
            let base = (r as usize - area.y0) * area.width;
            for c in c0..=c1 {
                if (w[0] | w[1] | w[2]) >= 0 {
                    let s = self.inv_area;
                    f(
                        base + c as usize,
                        [w[0] as f32 * s, w[1] as f32 * s, w[2] as f32 * s],
                    );
                }
                for k in 0..3 {
                    w[k] += step_x[k];
                }
            }
            for k in 0..3 {
                start[k] += step_y[k];
            }
        }
    }

    /// Depth and unnormalised normal at barycentrics `b`.
    #[inline]
    fn interpolate(&self, b: [f32; 3], perspective: bool) -> (f32, [f32; 3]) {
        let v = &self.v;
        let (w, z) = if perspective {
            let w = [b[0] / v[0].z, b[1] / v[1].z, b[2] / v[2].z];
            (w, 1.0 / (w[0] + w[1] + w[2]))
        } else {
            (b, b[0] * v[0].z + b[1] * v[1].z + b[2] * v[2].z)
        };
        let s = if self.flip { -1.0 } else { 1.0 };
        let n =
            std::array::from_fn(|i| s * (w[0] * v[0].n[i] + w[1] * v[1].n[i] + w[2] * v[2].n[i]));
        (z, n)
    }

    /// Draws the triangle into the band's opaque buffers.
    pub fn draw_opaque(&self, band: &mut Band, albedo: [f32; 3], perspective: bool) {
        let area = band.area();
        let (depth, normal, colour) = (&mut band.depth, &mut band.normal, &mut band.albedo);
        self.cover(area, |i, b| {
            let (z, n) = self.interpolate(b, perspective);
            if z < depth[i] {
                depth[i] = z;
                normal[i] = n;
                colour[i] = albedo;
            }
        });
    }

    /// Blends the triangle over the band's colours where it is nearer than the
    /// opaque depth.
    pub fn draw_blended(
        &self,
        band: &mut Band,
        albedo: [f32; 3],
        alpha: f32,
        lights: &Lights,
        perspective: bool,
    ) {
        let area = band.area();
        let (depth, colour) = (&band.depth, &mut band.colour);
        self.cover(area, |i, b| {
            let (z, n) = self.interpolate(b, perspective);
            if z < depth[i] {
                let c = lights.shade(unit_f32(n), albedo);
                let d = &mut colour[i];
                let keep = 1.0 - alpha;
                *d = [
                    alpha * c[0] + keep * d[0],
                    alpha * c[1] + keep * d[1],
                    alpha * c[2] + keep * d[2],
                    alpha + keep * d[3],
                ];
            }
        });
    }
}

/// Twice the signed area of (a, b, p): positive when p is to the left of a → b in
/// y-down coordinates seen as y-up.
#[inline]
fn edge(a: [i64; 2], b: [i64; 2], p: [i64; 2]) -> i64 {
    (b[0] - a[0]) * (p[1] - a[1]) - (b[1] - a[1]) * (p[0] - a[0])
}
