//! The picture and the mesh file of `lobecast surface`, built in memory so that
//! nothing is written until both are ready.

use std::time::Instant;

use super::slice::Background;
use super::surface::{Request, SurfaceArgs};
use lobecast::error::{Error, Result};
use lobecast::grid::GridBox;
use lobecast::io::mesh::{MeshDocument, Part, encode};
use lobecast::io::png::PngMeta;
use lobecast::render::picture::{Furniture, compose, layout};
use lobecast::render::scene::{Orientation, Painted, Scene, ball_and_stick, frame_all, render};
use lobecast::render::text::formula_markup;
use lobecast::render::{Colour, Scale};
use lobecast::source::Source;
use lobecast::source::surfaces::{FieldSurfaces, Isovalue, spacing};
use lobecast::surface::{Phase, shapes};

/// Where along the default diverging scale the phase colours are taken: near its
/// ends, where the slice maps show strong lobes (the very ends are too dark to show
/// shading).
const PHASE_AT: f64 = 0.12;

/// The smallest panel (px) whose caption stays legible beside its neighbours.
const MIN_PANEL: (u32, u32) = (150, 100);

/// The encoded outputs and the time spent drawing.
pub struct Drawn {
    pub png: Option<Vec<u8>>,
    pub mesh: Option<Vec<u8>>,
    pub seconds: f64,
}

/// sRGB colour of a phase: the positive end (orange) or the negative end (purple)
/// of the slice figures' default scale.
pub fn phase_rgb(phase: Phase) -> [u8; 3] {
    let scale = Scale::default_for(true);
    let c = match phase {
        Phase::Positive => scale.at(1.0 - PHASE_AT),
        Phase::Negative => scale.at(PHASE_AT),
    };
    [c.r, c.g, c.b]
}

/// One scene per field: its surfaces in the phase colours at `opacity`, with the
/// ball-and-stick molecule.
pub fn scenes<'a>(
    found: &'a [FieldSurfaces],
    molecule: &lobecast::chem::Molecule,
    opacity: f64,
) -> Vec<Scene<'a>> {
    let (balls, sticks) = ball_and_stick(molecule);
    found
        .iter()
        .map(|f| Scene {
            surfaces: f
                .surfaces
                .iter()
                .map(|s| Painted {
                    mesh: &s.mesh,
                    rgb: phase_rgb(s.phase),
                    opacity,
                })
                .collect(),
            balls: balls.clone(),
            sticks: sticks.clone(),
        })
        .collect()
}

pub fn draw(
    args: &SurfaceArgs,
    request: &Request,
    source: &Source,
    found: &[FieldSurfaces],
    orientation: &Orientation,
    grid: &GridBox,
    meta: PngMeta,
) -> Result<Drawn> {
    let started = Instant::now();
    let png = match &args.png {
        Some(_) => Some(picture(
            args,
            request,
            source,
            found,
            orientation,
            grid,
            meta,
        )?),
        None => None,
    };
    let mesh = match request.mesh {
        Some(format) => Some(mesh_file(args, source, found, format)?),
        None => None,
    };
    Ok(Drawn {
        png,
        mesh,
        seconds: started.elapsed().as_secs_f64(),
    })
}

fn picture(
    args: &SurfaceArgs,
    request: &Request,
    source: &Source,
    found: &[FieldSurfaces],
    orientation: &Orientation,
    grid: &GridBox,
    mut meta: PngMeta,
) -> Result<Vec<u8>> {
    let scenes = scenes(found, source.molecule(), args.opacity);
    let furniture = furniture(args, request, source, found, grid);
    let (w, h) = request.size;
    let l = layout(w, h, found.len(), &furniture);
    if l.panel.0 < MIN_PANEL.0 || l.panel.1 < MIN_PANEL.1 {
        return Err(Error::input(format!(
            "--size {w}{} leaves {} panel(s) of {}×{} px, below the {}×{} px their captions need",
            h.map(|h| format!(",{h}")).unwrap_or_default(),
            found.len(),
            l.panel.0,
            l.panel.1,
            MIN_PANEL.0,
            MIN_PANEL.1
        ))
        .with_hint("use a larger --size, or fewer --panels"));
    }
    let camera = frame_all(
        &scenes,
        orientation,
        request.view.perspective,
        l.panel.0 as f64 / l.panel.1 as f64,
    );
    let background = match args.background {
        Background::White => Some([255, 255, 255]),
        Background::Transparent => None,
    };
    let panels: Vec<_> = scenes
        .iter()
        .map(|s| render(s, &camera, l.panel.0, l.panel.1, background))
        .collect();
    let canvas = compose(&l, &panels, &furniture);
    if meta.title.is_none() && !furniture.title.is_empty() {
        meta.title = Some(lobecast::render::text::plain(&furniture.title));
    }
    canvas.encode(super::common::figure_format(args.png.as_deref())?, &meta)
}

fn furniture(
    args: &SurfaceArgs,
    request: &Request,
    source: &Source,
    found: &[FieldSurfaces],
    grid: &GridBox,
) -> Furniture {
    let formula = formula_markup(&source.molecule().formula_with_charge());
    let title = args.title.clone().unwrap_or_else(|| {
        if found.len() == 1 {
            format!("{formula}: {}", found[0].info.heading)
        } else {
            let names: Vec<&str> = found.iter().map(|f| f.info.quantity.as_str()).collect();
            format!("{formula}: isosurfaces of {}", names.join(", "))
        }
    });
    let captions = found
        .iter()
        .map(|f| {
            let sign = if f.info.signed { "±" } else { "" };
            let head = if found.len() == 1 {
                f.info.quantity.clone()
            } else {
                f.info.short.clone()
            };
            format!(
                "{head}{}; isovalue {sign}{} {}",
                frontier(source, &f.field),
                number(f.level),
                f.info.unit
            )
        })
        .collect();
    let signed = found.iter().any(|f| f.info.signed);
    // The symbol of the key: the fields' own when they share one, else a plain f.
    let family = if found.iter().all(|f| f.info.family == found[0].info.family) {
        found[0].info.family.as_str()
    } else {
        "f"
    };
    // Swatches as a translucent surface shows over white.
    let swatch = |p: Phase| {
        phase_rgb(p).map(|c| (args.opacity * c as f64 + (1.0 - args.opacity) * 255.0).round() as u8)
    };
    let key = if signed {
        vec![
            (swatch(Phase::Positive), format!("{family} > 0")),
            (swatch(Phase::Negative), format!("{family} < 0")),
        ]
    } else {
        vec![(
            swatch(Phase::Positive),
            format!("{family} = isovalue (larger inside)"),
        )]
    };
    let how = match request.isovalue {
        Isovalue::Enclosing(fr) => format!(
            "Isovalues chosen so that the surfaces enclose {:.0} % of ∫f² dV (signed fields) or ∫|f| dV (densities).",
            100.0 * fr
        ),
        Isovalue::Fixed(_) => {
            let parts: Vec<String> = found
                .iter()
                .map(|f| format!("{:.1} % of {}", 100.0 * f.enclosed, f.measure_text()))
                .collect();
            format!("The surfaces enclose {}.", parts.join("; "))
        }
    };
    let grid_note = if source.has_box() {
        format!(
            "Surfaces from the cube file's own grid ({:.3} bohr spacing), trilinear between points.",
            spacing(grid)
        )
    } else {
        format!(
            "Grid spacing {:.3} bohr; vertices placed on the exact field and normals from its gradient.",
            spacing(grid)
        )
    };
    let mut footnotes = vec![format!("{how} {grid_note}")];
    if let Some(method) = source.method() {
        footnotes.push(format!("Orbitals: {method}."));
    }
    footnotes.extend(source.caveat_footnotes());
    Furniture {
        title,
        captions,
        key,
        footnotes,
        background: match args.background {
            Background::White => Colour::WHITE,
            Background::Transparent => Colour::TRANSPARENT,
        },
    }
}

/// " (HOMO)" or " (LUMO)" when the field is one of the frontier orbitals.
fn frontier(source: &Source, field: &lobecast::field::Field) -> &'static str {
    let Source::Orbitals { set, .. } = source else {
        return "";
    };
    if !matches!(field, lobecast::field::Field::Orbital(_)) {
        return "";
    }
    let Ok(n) = field.orbital_number(set) else {
        return "";
    };
    let homo = set
        .orbitals
        .iter()
        .rposition(|o| o.occupation > 0.0)
        .map(|i| i + 1);
    let lumo = set
        .orbitals
        .iter()
        .position(|o| o.occupation == 0.0)
        .map(|i| i + 1);
    if Some(n) == homo {
        " (HOMO)"
    } else if Some(n) == lumo {
        " (LUMO)"
    } else {
        ""
    }
}

/// A level as typed in a caption: four significant digits.
fn number(x: f64) -> String {
    if (1e-3..1e4).contains(&x.abs()) {
        let digits = (3 - x.abs().log10().floor() as i32).max(0) as usize;
        format!("{x:.digits$}")
    } else {
        format!("{x:.3e}")
    }
}

/// Every surface as one part (named by field and phase), and the molecule when asked.
fn mesh_file(
    args: &SurfaceArgs,
    source: &Source,
    found: &[FieldSurfaces],
    format: lobecast::io::mesh::MeshFormat,
) -> Result<Vec<u8>> {
    let mut surfaces = Vec::new();
    for f in found {
        for s in &f.surfaces {
            let phase = match s.phase {
                Phase::Positive => "positive",
                Phase::Negative => "negative",
            };
            surfaces.push(Part {
                name: format!("{} {phase} at {:+.4e}", f.field, s.level),
                mesh: &s.mesh,
                rgb: phase_rgb(s.phase),
                opacity: args.opacity,
            });
        }
    }
    let shapes = if args.mesh_molecule {
        molecule_meshes(source)
    } else {
        Vec::new()
    };
    let molecule = shapes
        .iter()
        .map(|(name, mesh, rgb)| Part {
            name: name.clone(),
            mesh,
            rgb: *rgb,
            opacity: 1.0,
        })
        .collect();
    let description = found
        .iter()
        .map(|f| {
            format!(
                "{} at ±{:.4e} {}",
                f.info.plain,
                f.level,
                f.info.unit.replace(['{', '}'], "")
            )
        })
        .collect::<Vec<_>>()
        .join("; ");
    encode(
        format,
        &MeshDocument {
            surfaces,
            molecule,
            description,
        },
    )
}

/// Ball-and-stick shapes as meshes, with the picture's sizes and colours.
fn molecule_meshes(source: &Source) -> Vec<(String, lobecast::surface::Mesh, [u8; 3])> {
    let (balls, sticks) = ball_and_stick(source.molecule());
    let mut out = Vec::new();
    for (i, (b, atom)) in balls.iter().zip(&source.molecule().atoms).enumerate() {
        out.push((
            format!("atom {} {}", i + 1, atom.element.symbol),
            shapes::sphere(b.centre, b.radius, 3),
            b.rgb,
        ));
    }
    for (i, s) in sticks.iter().enumerate() {
        let mid = std::array::from_fn(|d| 0.5 * (s.a[d] + s.b[d]));
        out.push((
            format!("bond {} half 1", i + 1),
            shapes::cylinder(s.a, mid, s.radius, 24),
            s.rgb_a,
        ));
        out.push((
            format!("bond {} half 2", i + 1),
            shapes::cylinder(mid, s.b, s.radius, 24),
            s.rgb_b,
        ));
    }
    out
}
