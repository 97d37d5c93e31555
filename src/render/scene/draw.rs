//! `render`: a scene through a camera into an RGBA picture.
//!
//! Steps: every mesh vertex is projected once; triangles are set up and sorted
//! into horizontal bands of the 3×-supersampled picture (translucent ones first
//! ordered back to front by the eye depth of their centroids — per triangle, not
//! per pixel, common practice: exact for non-intersecting layers, and it keeps the
//! cost linear); then each band, in parallel, draws opaque triangles and the
//! ball-and-stick impostors into a depth buffer, shades them, blends the
//! translucent triangles over (depth-tested against the opaque depth, not
//! writing it, both faces drawn), and is box-filtered 3 × 3 into output pixels.

use image::RgbaImage;
use rayon::prelude::*;

use super::Scene;
use super::band::Band;
use super::camera::Camera;
use super::impostor::Impostor;
use super::project::Projector;
use super::raster::{ScreenVertex, Setup};
use super::shade::{Lights, linear};
use crate::error::{Error, Result};

/// Supersampling factor per axis (9 samples per pixel).
pub const SUPERSAMPLE: usize = 3;
/// Output rows per band.
const BAND_ROWS: usize = 16;
/// Largest picture side in pixels accepted by `check_size`.
pub const MAX_SIDE: u32 = 16_384;
/// Largest picture in pixels accepted by `check_size` (a 4-byte RGBA output of at
/// most 256 MB; the supersampled buffers are per band and small).
pub const MAX_PIXELS: u64 = 64 << 20;

/// Refuses picture sizes `render` should not be asked for: zero, a side above
/// `MAX_SIDE`, or more than `MAX_PIXELS` pixels. Callers taking sizes from users
/// check here first.
pub fn check_size(width: u32, height: u32) -> Result<()> {
    let pixels = u64::from(width) * u64::from(height);
    if width == 0 || height == 0 || width > MAX_SIDE || height > MAX_SIDE || pixels > MAX_PIXELS {
        return Err(Error::input(format!(
            "a 3-D picture of {width} × {height} pixels is outside 1 … {MAX_SIDE} pixels a side \
             and {MAX_PIXELS} pixels in all"
        )));
    }
    Ok(())
}

/// Draws `scene` as seen by `camera` into a `width` × `height` picture on
/// `background` (`None`: transparent, alpha 0 where nothing is drawn). The scale
/// follows the image height; a picture wider than the camera's aspect shows more at
/// the sides. Sizes should be checked with `check_size` first.
pub fn render(
    scene: &Scene,
    camera: &Camera,
    width: u32,
    height: u32,
    background: Option<[u8; 3]>,
) -> RgbaImage {
    render_lit(scene, camera, width, height, background, &Lights::default())
}

/// A triangle's place: surface and triangle index.
type TriRef = (u32, u32);

/// `render` with a chosen light set.
pub(crate) fn render_lit(
    scene: &Scene,
    camera: &Camera,
    width: u32,
    height: u32,
    background: Option<[u8; 3]>,
    lights: &Lights,
) -> RgbaImage {
    let (w, h) = (width as usize, height as usize);
    if w == 0 || h == 0 {
        return RgbaImage::new(width, height);
    }
    let ss = SUPERSAMPLE;
    let (ws, hs) = (w * ss, h * ss);
    let proj = Projector::new(camera, ws, hs);
    let band_rows = BAND_ROWS * ss;
    let bands = h.div_ceil(BAND_ROWS);

    let vertices: Vec<Vec<ScreenVertex>> = (scene.surfaces.iter())
        .map(|s| {
            let m = s.mesh;
            (0..m.positions.len())
                .into_par_iter()
                .map(|i| {
                    let n = m.normals.get(i).copied().unwrap_or([0.0; 3]);
                    proj.vertex(m.positions[i], n)
                })
                .collect()
        })
        .collect();
    let setup = |(s, t): TriRef| -> Option<Setup> {
        let tri = scene.surfaces[s as usize].mesh.triangles.get(t as usize)?;
        let v = &vertices[s as usize];
        let get = |k: u32| v.get(k as usize).copied();
        Setup::new([get(tri[0])?, get(tri[1])?, get(tri[2])?])
    };
    let opacity = |s: &super::Painted| {
        if s.opacity.is_nan() {
            1.0
        } else {
            s.opacity.clamp(0.0, 1.0)
        }
    };

    let mut opaque_bins: Vec<Vec<TriRef>> = vec![Vec::new(); bands];
    let mut clear_list: Vec<(f32, TriRef)> = Vec::new();
    for (s, surface) in scene.surfaces.iter().enumerate() {
        let a = opacity(surface);
        if a <= 0.0 {
            continue;
        }
        for t in 0..surface.mesh.triangles.len() {
            let r = (s as u32, t as u32);
            let Some(tri) = setup(r) else { continue };
            if a >= 1.0 {
                bin(&mut opaque_bins, tri.rows(), band_rows, r);
            } else {
                clear_list.push((tri.centroid_depth(), r));
            }
        }
    }
    clear_list.par_sort_unstable_by(|a, b| b.0.total_cmp(&a.0));
    let mut clear_bins: Vec<Vec<TriRef>> = vec![Vec::new(); bands];
    for &(_, r) in &clear_list {
        if let Some(tri) = setup(r) {
            bin(&mut clear_bins, tri.rows(), band_rows, r);
        }
    }

    let impostors: Vec<Impostor> = (scene.balls.iter().filter_map(|b| Impostor::ball(b, &proj)))
        .chain(
            scene
                .sticks
                .iter()
                .filter_map(|s| Impostor::stick(s, &proj)),
        )
        .collect();
    let albedo: Vec<[f32; 3]> = scene.surfaces.iter().map(|s| linear(s.rgb)).collect();
    let alpha: Vec<f32> = scene.surfaces.iter().map(|s| opacity(s) as f32).collect();
    let bg = match background {
        Some(rgb) => {
            let l = linear(rgb);
            [l[0], l[1], l[2], 1.0]
        }
        None => [0.0; 4],
    };
    let perspective = camera.perspective;

    let mut out = vec![0u8; w * h * 4];
    out.par_chunks_mut(w * 4 * BAND_ROWS)
        .enumerate()
        .for_each_init(Band::default, |band, (b, pixels)| {
            let rows = pixels.len() / (w * 4) * ss;
            band.reset(ws, b * band_rows, rows);
            for &r in &opaque_bins[b] {
                if let Some(tri) = setup(r) {
                    tri.draw_opaque(band, albedo[r.0 as usize], perspective);
                }
            }
            for imp in &impostors {
                imp.draw(band, &proj);
            }
            band.shade(lights, bg);
            for &r in &clear_bins[b] {
                if let Some(tri) = setup(r) {
                    let s = r.0 as usize;
                    tri.draw_blended(band, albedo[s], alpha[s], lights, perspective);
                }
            }
            band.downsample(ss, pixels);
        });
    RgbaImage::from_raw(width, height, out).unwrap_or_else(|| RgbaImage::new(width, height))
}

/// Adds `r` to every band its sample rows touch.
fn bin(bins: &mut [Vec<TriRef>], rows: (i64, i64), band_rows: usize, r: TriRef) {
    let last = bins.len() as i64 - 1;
    let lo = rows.0.div_euclid(band_rows as i64).max(0);
    let hi = rows.1.div_euclid(band_rows as i64).min(last);
    for b in lo..=hi {
        bins[b as usize].push(r);
    }
}
