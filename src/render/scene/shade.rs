//! Lighting: Blinn–Phong (J. F. Blinn, "Models of light reflection for computer
//! synthesized pictures", SIGGRAPH 1977) with a key light from the upper left
//! front, a weaker fill from the lower right front, an ambient term and a modest
//! white highlight. Light, blending and anti-aliasing are computed in linear light
//! and encoded to sRGB at the end (IEC 61966-2-1 transfer curve), so translucent
//! layers and edges mix as light does rather than darkening.
//!
//! Directions are in eye space (x right, y up, z away from the viewer); the viewer
//! is taken at infinity along −z for the highlight (common practice; the difference
//! under the gentle perspective of `camera` is invisible).

use std::sync::LazyLock;

/// One directional light: unit direction towards the light, its strength, and
/// whether it makes a highlight.
#[derive(Debug, Clone, Copy)]
pub struct Light {
    pub towards: [f32; 3],
    pub strength: f32,
    pub highlight: bool,
}

/// A light set.
#[derive(Debug, Clone)]
pub struct Lights {
    pub lights: Vec<Light>,
    pub ambient: f32,
    /// Strength of the white highlight relative to its light.
    pub specular: f32,
    /// Blinn–Phong exponent.
    pub shininess: i32,
}

fn normalised(v: [f32; 3]) -> [f32; 3] {
    let n = (v[0] * v[0] + v[1] * v[1] + v[2] * v[2]).sqrt();
    [v[0] / n, v[1] / n, v[2] / n]
}

impl Default for Lights {
    /// Key (0.72) from upper left front, fill (0.25) from lower right front,
    /// ambient 0.22, one highlight (from the key, 0.3, exponent 40; a second from
    /// the fill looked like a second light source on smooth lobes): our own
    /// choice, in the range common for scientific figures.
    fn default() -> Self {
        Lights {
            lights: vec![
                Light {
                    towards: normalised([-0.55, 0.65, -1.0]),
                    strength: 0.72,
                    highlight: true,
                },
                Light {
                    towards: normalised([0.7, -0.35, -1.0]),
                    strength: 0.25,
                    highlight: false,
                },
            ],
            ambient: 0.22,
            specular: 0.3,
            shininess: 40,
        }
    }
}

impl Lights {
    /// Linear-light colour of a surface point with unit normal `n` (facing the
    /// viewer) and linear albedo `albedo`.
    #[inline]
    pub fn shade(&self, n: [f32; 3], albedo: [f32; 3]) -> [f32; 3] {
        let mut diffuse = self.ambient;
        let mut spec = 0.0f32;
        for l in &self.lights {
            let d = n[0] * l.towards[0] + n[1] * l.towards[1] + n[2] * l.towards[2];
            if d > 0.0 {
                diffuse += l.strength * d;
                if !l.highlight {
                    continue;
                }
                // Half vector between the light and the viewer (0, 0, −1).
                let h = normalised([l.towards[0], l.towards[1], l.towards[2] - 1.0]);
                let c = n[0] * h[0] + n[1] * h[1] + n[2] * h[2];
                if c > 0.0 {
                    spec += l.strength * c.powi(self.shininess);
                }
            }
        }
        let diffuse = diffuse.min(1.0);
        let s = self.specular * spec;
        [
            albedo[0] * diffuse + s,
            albedo[1] * diffuse + s,
            albedo[2] * diffuse + s,
        ]
    }
}

/// sRGB byte → linear light, by table.
static TO_LINEAR: LazyLock<[f32; 256]> = LazyLock::new(|| {
    std::array::from_fn(|i| {
        let c = i as f64 / 255.0;
        let l = if c <= 0.04045 {
            c / 12.92
        } else {
            ((c + 0.055) / 1.055).powf(2.4)
        };
        l as f32
    })
});

/// Entries of the linear → sRGB table: fine enough that neighbouring entries never
/// differ by more than one byte step.
const ENCODE_STEPS: usize = 8192;

static TO_SRGB: LazyLock<Vec<u8>> = LazyLock::new(|| {
    (0..=ENCODE_STEPS)
        .map(|i| {
            let l = i as f64 / ENCODE_STEPS as f64;
            let c = if l <= 0.003_130_8 {
                12.92 * l
            } else {
                1.055 * l.powf(1.0 / 2.4) - 0.055
            };
            (c * 255.0).round().clamp(0.0, 255.0) as u8
        })
        .collect()
});

pub fn linear(rgb: [u8; 3]) -> [f32; 3] {
    let t = &*TO_LINEAR;
    [t[rgb[0] as usize], t[rgb[1] as usize], t[rgb[2] as usize]]
}

/// Linear light (clamped to [0, 1]) → sRGB byte.
#[inline]
pub fn encode(l: f32) -> u8 {
    let i = (l.clamp(0.0, 1.0) * ENCODE_STEPS as f32 + 0.5) as usize;
    TO_SRGB[i.min(ENCODE_STEPS)]
}
