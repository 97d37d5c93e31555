//! `levels --thumbnails`: small 3-D pictures of chosen orbitals for the diagram,
//! made with the same sampling, extraction and rasteriser as `lobecast surface`.

use super::surface_figure::scenes;
use lobecast::error::{Error, Result};
use lobecast::field::Field;
use lobecast::grid::{GridBox, Resolution};
use lobecast::plot::levels::Thumbnail;
use lobecast::render::scene::{View, ViewSpec, frame_all, render};
use lobecast::solve::OrbitalSet;
use lobecast::source::Source;
use lobecast::source::surfaces::{Isovalue, Timings, surfaces_of};

/// At most this many pictures: each needs its own room beside the levels.
pub const MAX_THUMBNAILS: usize = 6;
/// Side of one picture (px): large enough to show two lobes and the molecule at the
/// diagram's text size.
pub const THUMB_PX: u32 = 150;
/// Grid points along the box's longest edge: the vertices are placed on the exact
/// orbital, so a coarse grid only smooths the outline slightly at this size, and
/// the work stays bounded for any molecule (about 64³ points per picture).
const THUMB_POINTS: usize = 64;
/// Space around the molecule (bohr), as in `surface`.
const PADDING_BOHR: f64 = 5.0;
/// The fraction of ∫ψ² dV each surface encloses, as `surface` chooses by default.
pub const ENCLOSE: f64 = 0.90;

/// Reads `homo-1,homo,lumo` (or orbital numbers) into orbital fields, refusing
/// empty, repeated or too many entries before anything is solved.
pub fn parse(text: &str) -> Result<Vec<Field>> {
    let items: Vec<&str> = text.split(',').map(str::trim).collect();
    if items.iter().any(|s| s.is_empty()) || items.len() > MAX_THUMBNAILS {
        return Err(Error::input(format!(
            "--thumbnails takes 1 to {MAX_THUMBNAILS} orbitals split by commas, got {text:?}"
        ))
        .with_hint("e.g. --thumbnails homo-1,homo,lumo or --thumbnails 5,6"));
    }
    items
        .iter()
        .map(|s| Field::parse(&format!("orbital:{s}")).map_err(|e| e.context("--thumbnails")))
        .collect()
}

/// The orbitals' numbers (from 1), in the order asked, refusing repeats.
pub fn numbers(fields: &[Field], set: &OrbitalSet) -> Result<Vec<usize>> {
    let mut out: Vec<usize> = Vec::new();
    for f in fields {
        let n = f
            .orbital_number(set)
            .map_err(|e| e.context("--thumbnails"))?;
        if out.contains(&n) {
            return Err(Error::input(format!(
                "--thumbnails names orbital {n} twice"
            )));
        }
        out.push(n);
    }
    Ok(out)
}

/// One picture per orbital, all seen by one camera (same scale and direction) in
/// the automatic view of `surface`.
pub fn pictures(
    set: &OrbitalSet,
    fields: &[Field],
    numbers: &[usize],
    memory: u64,
) -> Result<Vec<Thumbnail>> {
    let source = Source::Orbitals {
        set: set.clone(),
        inputs: Vec::new(),
    };
    let molecule = source.molecule();
    let grid = GridBox::around(molecule, PADDING_BOHR, Resolution::Points(THUMB_POINTS))?;
    let found = surfaces_of(
        &source,
        fields,
        &grid,
        Isovalue::Enclosing(ENCLOSE),
        memory,
        &mut Timings::default(),
    )?;
    let view = View {
        spec: ViewSpec::Auto,
        turn_deg: [0.0, 0.0],
        perspective: false,
    };
    let orientation = view.orientation(molecule)?;
    let scenes = scenes(&found, molecule, 1.0);
    let camera = frame_all(&scenes, &orientation, false, 1.0);
    Ok(scenes
        .iter()
        .zip(numbers)
        .zip(&found)
        .map(|((scene, &number), f)| Thumbnail {
            number,
            image: render(scene, &camera, THUMB_PX, THUMB_PX, Some([255, 255, 255])),
            isovalue: f.level,
        })
        .collect())
}
