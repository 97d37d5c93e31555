//! The 3-D picture: orbital isosurfaces (triangle meshes) around a ball-and-stick
//! molecule, drawn on the CPU for report figures.
//!
//! * `view`: where the camera looks from (`ViewSpec`, `View` → `Orientation`);
//!   `auto`: the automatic principal-axis view.
//! * `molecule`: balls and sticks for a `Molecule`.
//! * `camera`: projection and the framing shared by several panels.
//! * `draw`: the renderer — depth buffer, 3× supersampling, back-to-front
//!   translucency — over `raster` (triangles), `impostor` (exact balls and sticks),
//!   `shade` (Blinn–Phong in linear light), `band` (per-band buffers, box filter)
//!   and `project` (screen plane ↔ samples).
//!
//! Everything is in bohr; nothing here reads or writes files.

mod auto;
mod band;
mod camera;
mod draw;
mod impostor;
mod molecule;
mod project;
mod raster;
mod shade;
mod vec3;
mod view;

#[cfg(test)]
mod tests;

pub use auto::DEFAULT_TURN_DEG;
pub use camera::{Camera, MARGIN, PERSPECTIVE_DISTANCE, frame, frame_all};
pub use draw::{MAX_PIXELS, MAX_SIDE, SUPERSAMPLE, check_size, render};
pub use molecule::{BALL_FRACTION, BOND_TOLERANCE, STICK_RADIUS_ANGSTROM, ball_and_stick};
pub use view::{Orientation, View, ViewSpec};

use crate::surface::Mesh;

/// A mesh with its colour (sRGB) and opacity (0 … 1; 1 is opaque, NaN counts as 1).
/// Both faces of a translucent mesh are drawn, so where a closed surface is seen
/// through front and back the light passing is (1 − opacity)², as through a glass
/// shell.
#[derive(Debug, Clone, Copy)]
pub struct Painted<'a> {
    pub mesh: &'a Mesh,
    pub rgb: [u8; 3],
    pub opacity: f64,
}

/// An atom's sphere (bohr, sRGB).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Ball {
    pub centre: [f64; 3],
    pub radius: f64,
    pub rgb: [u8; 3],
}

/// A bond's cylinder from `a` to `b` (bohr); the half at `a` has colour `rgb_a`.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Stick {
    pub a: [f64; 3],
    pub b: [f64; 3],
    pub radius: f64,
    pub rgb_a: [u8; 3],
    pub rgb_b: [u8; 3],
}

/// What one picture shows.
#[derive(Debug, Clone, Default)]
pub struct Scene<'a> {
    pub surfaces: Vec<Painted<'a>>,
    pub balls: Vec<Ball>,
    pub sticks: Vec<Stick>,
}
