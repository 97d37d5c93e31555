//! Balls and sticks drawn exactly: each sample's eye ray is intersected with the
//! sphere or the capped cylinder, giving the exact depth and normal there, so they
//! are round and smooth at any size and meet the meshes correctly in depth.

use super::band::Band;
use super::project::Projector;
use super::shade::linear;
use super::vec3::{V3, add, dot, norm, scale, sub};
use super::{Ball, Stick};

/// A ball or a stick in eye space, with the samples it may cover.
pub enum Impostor {
    Ball {
        c: V3,
        r: f64,
        albedo: [f32; 3],
        boxed: [usize; 4],
    },
    Stick {
        a: V3,
        /// Unit axis from a to b.
        u: V3,
        len: f64,
        r: f64,
        albedo: [[f32; 3]; 2],
        boxed: [usize; 4],
    },
}

fn valid(r: f64, points: &[V3]) -> bool {
    r.is_finite() && r > 0.0 && points.iter().flatten().all(|x| x.is_finite())
}

impl Impostor {
    pub fn ball(b: &Ball, p: &Projector) -> Option<Impostor> {
        if !valid(b.radius, &[b.centre]) {
            return None;
        }
        let c = p.camera.eye(b.centre);
        Some(Impostor::Ball {
            c,
            r: b.radius,
            albedo: linear(b.rgb),
            boxed: p.sphere_box(c, b.radius)?,
        })
    }

    pub fn stick(s: &Stick, p: &Projector) -> Option<Impostor> {
        if !valid(s.radius, &[s.a, s.b]) {
            return None;
        }
        let (a, b) = (p.camera.eye(s.a), p.camera.eye(s.b));
        let len = norm(sub(b, a));
        if len.is_nan() || len <= 0.0 {
            return None;
        }
        let (ba, bb) = (p.sphere_box(a, s.radius), p.sphere_box(b, s.radius));
        let boxed = match (ba, bb) {
            (Some(x), Some(y)) => [
                x[0].min(y[0]),
                x[1].max(y[1]),
                x[2].min(y[2]),
                x[3].max(y[3]),
            ],
            _ => return None,
        };
        Some(Impostor::Stick {
            a,
            u: scale(sub(b, a), 1.0 / len),
            len,
            r: s.radius,
            albedo: [linear(s.rgb_a), linear(s.rgb_b)],
            boxed,
        })
    }

    fn boxed(&self) -> [usize; 4] {
        match self {
            Impostor::Ball { boxed, .. } | Impostor::Stick { boxed, .. } => *boxed,
        }
    }

    /// Depth, unit normal and albedo where the ray (o, d) first meets the object.
    fn hit(&self, o: V3, d: V3) -> Option<(f64, V3, [f32; 3])> {
        match self {
            Impostor::Ball { c, r, albedo, .. } => {
                let oc = sub(o, *c);
                let (a, b, k) = (dot(d, d), dot(d, oc), dot(oc, oc) - r * r);
                let disc = b * b - a * k;
                if disc < 0.0 {
                    return None;
                }
                let t = (-b - disc.sqrt()) / a;
                let n = scale(sub(add(o, scale(d, t)), *c), 1.0 / r);
                (t > 0.0).then_some((t, n, *albedo))
            }
            Impostor::Stick {
                a: base,
                u,
                len,
                r,
                albedo,
                ..
            } => cylinder(o, d, *base, *u, *len, *r)
                .map(|(t, n, s)| (t, n, albedo[usize::from(s > 0.5 * len)])),
        }
    }

    /// Writes the object into the band's opaque buffers where it is nearest.
    pub fn draw(&self, band: &mut Band, p: &Projector) {
        let [c0, c1, r0, r1] = self.boxed();
        let r0 = r0.max(band.y0);
        let r1 = r1.min(band.y0 + band.rows - 1);
        for row in r0..=r1 {
            let base = (row - band.y0) * band.width;
            for col in c0..=c1 {
                let (o, d) = p.ray(col, row);
                if let Some((t, n, albedo)) = self.hit(o, d) {
                    let i = base + col;
                    let z = t as f32;
                    if z < band.depth[i] {
                        band.depth[i] = z;
                        band.normal[i] = [n[0] as f32, n[1] as f32, n[2] as f32];
                        band.albedo[i] = albedo;
                    }
                }
            }
        }
    }
}

/// First hit of the ray (o, d) on the cylinder of radius `r` from `a` along unit
/// `u` for `len`, closed by flat caps: depth, outward normal, and the distance of
/// the hit along the axis.
fn cylinder(o: V3, d: V3, a: V3, u: V3, len: f64, r: f64) -> Option<(f64, V3, f64)> {
    let oa = sub(o, a);
    let (du, ou) = (dot(d, u), dot(oa, u));
    let dp = sub(d, scale(u, du));
    let op = sub(oa, scale(u, ou));
    let mut best: Option<(f64, V3, f64)> = None;
    let mut consider = |t: f64, n: V3, s: f64| {
        if t > 0.0 && best.is_none_or(|b| t < b.0) {
            best = Some((t, n, s));
        }
    };
    let (qa, qb, qc) = (dot(dp, dp), dot(dp, op), dot(op, op) - r * r);
    let disc = qb * qb - qa * qc;
    if qa > 0.0 && disc >= 0.0 {
        let t = (-qb - disc.sqrt()) / qa;
        let s = ou + t * du;
        if (0.0..=len).contains(&s) {
            consider(t, scale(add(op, scale(dp, t)), 1.0 / r), s);
        }
    }
    if du != 0.0 {
        for (s, sign) in [(0.0, -1.0), (len, 1.0)] {
            let t = (s - ou) / du;
            let radial = add(op, scale(dp, t));
            if dot(radial, radial) <= r * r {
                consider(t, scale(u, sign), s);
            }
        }
    }
    best
}
