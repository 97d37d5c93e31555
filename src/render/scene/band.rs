//! One horizontal band of supersamples: the opaque depth, normal and colour
//! buffers, the shaded (premultiplied, linear) colours, and the box filter that
//! turns its samples into output pixels.
//!
//! Bands are drawn independently (in parallel) and are small enough to stay in
//! cache, so a big picture never holds a full-size supersampled buffer.

use super::shade::{Lights, encode};

/// Which samples a band holds: all columns of rows `y0 .. y0 + rows`.
#[derive(Debug, Clone, Copy)]
pub struct Area {
    pub width: usize,
    pub y0: usize,
    pub rows: usize,
}

/// Per-sample buffers of one band, reused from band to band by each thread.
#[derive(Default)]
pub struct Band {
    pub width: usize,
    pub y0: usize,
    pub rows: usize,
    /// Eye depth of the nearest opaque thing (infinity: nothing).
    pub depth: Vec<f32>,
    /// Its normal in eye space (not normalised), facing the viewer.
    pub normal: Vec<[f32; 3]>,
    /// Its linear albedo.
    pub albedo: Vec<[f32; 3]>,
    /// Premultiplied linear RGBA after shading and blending.
    pub colour: Vec<[f32; 4]>,
}

impl Band {
    pub fn area(&self) -> Area {
        Area {
            width: self.width,
            y0: self.y0,
            rows: self.rows,
        }
    }

    /// Clears the band for sample rows `y0 .. y0 + rows` of a picture `width` wide.
    pub fn reset(&mut self, width: usize, y0: usize, rows: usize) {
        let n = width * rows;
        (self.width, self.y0, self.rows) = (width, y0, rows);
        self.depth.clear();
        self.depth.resize(n, f32::INFINITY);
        self.normal.clear();
        self.normal.resize(n, [0.0; 3]);
        self.albedo.clear();
        self.albedo.resize(n, [0.0; 3]);
        self.colour.clear();
    }

    /// Shades the opaque samples; the rest get `background` (premultiplied).
    pub fn shade(&mut self, lights: &Lights, background: [f32; 4]) {
        let (depth, normal, albedo) = (&self.depth, &self.normal, &self.albedo);
        self.colour.extend((0..depth.len()).map(|i| {
            if depth[i].is_finite() {
                let c = lights.shade(unit_f32(normal[i]), albedo[i]);
                [c[0], c[1], c[2], 1.0]
            } else {
                background
            }
        }));
    }

    /// Averages `ss` × `ss` blocks into straight-alpha sRGB pixels of `out` (whole
    /// output rows, `ss` times narrower than the band).
    pub fn downsample(&self, ss: usize, out: &mut [u8]) {
        let w_out = self.width / ss;
        let norm = 1.0 / (ss * ss) as f32;
        for (oy, row) in out.chunks_exact_mut(w_out * 4).enumerate() {
            for (ox, px) in row.chunks_exact_mut(4).enumerate() {
                let mut sum = [0.0f32; 4];
                for sy in 0..ss {
                    let start = (oy * ss + sy) * self.width + ox * ss;
                    for c in &self.colour[start..start + ss] {
                        for k in 0..4 {
                            sum[k] += c[k];
                        }
                    }
                }
                let a = sum[3] * norm;
                if a <= 0.0 {
                    px.copy_from_slice(&[0, 0, 0, 0]);
                    continue;
                }
                // Un-premultiply so that partly covered edge pixels keep their
                // colour and only lose opacity (no dark fringe on transparency).
                let inv = 1.0 / sum[3];
                px[0] = encode(sum[0] * inv);
                px[1] = encode(sum[1] * inv);
                px[2] = encode(sum[2] * inv);
                px[3] = (a.min(1.0) * 255.0).round() as u8;
            }
        }
    }
}

/// `v` scaled to unit length (or the view direction −z when it has none).
#[inline]
pub fn unit_f32(v: [f32; 3]) -> [f32; 3] {
    let n2 = v[0] * v[0] + v[1] * v[1] + v[2] * v[2];
    if n2 > 0.0 && n2.is_finite() {
        let s = 1.0 / n2.sqrt();
        [v[0] * s, v[1] * s, v[2] * s]
    } else {
        [0.0, 0.0, -1.0]
    }
}
