//! Nuclei on a map: a disc with the element symbol, sized from the map's own
//! pixels per ångström so that small panel maps are not covered by their atoms.

use super::canvas::{Canvas, Colour, HAlign, VAlign};
use super::slice::Nucleus;
use super::text;
use crate::chem::units::bohr_to_angstrom;
use crate::grid::plane::PixelGrid;

/// Disc radius of a nucleus near the plane, in Å of the map (a quarter of the
/// shortest X–H bond, so neighbouring discs stay apart), bounded in pixels below
/// (the symbol stays legible) and above (large maps do not get huge discs).
pub const RADIUS_ANGSTROM: f64 = 0.25;
pub const MIN_RADIUS_PX: f32 = 5.0;
pub const MAX_RADIUS_PX: f32 = 12.0;
/// Symbols smaller than this (px) are left out; the disc alone marks the nucleus.
const MIN_SYMBOL_PX: f32 = 8.0;

/// The radius (px) of a near nucleus on `grid`; far ones get three quarters of it.
pub fn radius(grid: &PixelGrid) -> f32 {
    let px_per_angstrom = grid.nx as f64 / bohr_to_angstrom(grid.window.width());
    ((RADIUS_ANGSTROM * px_per_angstrom) as f32).clamp(MIN_RADIUS_PX, MAX_RADIUS_PX)
}

pub fn draw(
    c: &mut Canvas,
    grid: &PixelGrid,
    nuclei: &[Nucleus],
    (mx, my): (f32, f32),
    numbers: bool,
) {
    let r_near = radius(grid);
    // Far atoms first, so near ones are drawn over them.
    let mut order: Vec<&Nucleus> = nuclei.iter().collect();
    order.sort_by_key(|n| n.near);
    for n in order {
        let (px, py) = grid.to_pixel(n.u, n.v);
        if px < 0.0 || py < 0.0 || px > grid.nx as f64 - 1.0 || py > grid.ny as f64 - 1.0 {
            continue;
        }
        let (x, y) = (mx + px as f32 + 0.5, my + py as f32 + 0.5);
        let (r, ink, fill, lw) = if n.near {
            (r_near, Colour::INK, Colour::WHITE, 1.6)
        } else {
            (
                0.75 * r_near,
                Colour::GREY,
                Colour::WHITE.with_alpha(150),
                1.0,
            )
        };
        let size = 1.35 * r;
        c.circle(x, y, r, fill, ink, lw);
        if size >= MIN_SYMBOL_PX {
            c.text(&n.symbol, size, x, y, (HAlign::Centre, VAlign::Middle), ink);
        }
        if numbers {
            let t = n.number.to_string();
            let small = (0.8 * size).max(10.0);
            let (tx, ty) = (x + 0.8 * r, y - 0.8 * r);
            let e = text::measure(&t, small);
            c.fill_rect(
                tx - 1.0,
                ty - e.ascent,
                e.width + 2.0,
                e.height(),
                Colour::WHITE.with_alpha(200),
            );
            c.text(&t, small, tx, ty, (HAlign::Left, VAlign::Baseline), ink);
        }
    }
}
