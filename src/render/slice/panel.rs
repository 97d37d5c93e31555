//! One map panel of a slice figure: its pixels (with no-data points hatched),
//! contours, nuclei, heading and colour bar, and the bar shared by all panels.

use super::*;

/// What every panel is drawn against, so that drawing one takes few arguments.
pub(super) struct PanelContext<'a> {
    pub(super) fig: &'a Figure,
    pub(super) style: &'a Style,
    pub(super) frame: &'a Frame,
    pub(super) grid: &'a PixelGrid,
    /// The common mapping when the maps share one colour bar.
    pub(super) shared: Option<Mapping>,
}

/// What drawing one panel placed, for `Rendered` and the shared bar.
pub(super) struct Drawn {
    pub(super) map: Placed,
    pub(super) bar: Option<Placed>,
    pub(super) labels: Vec<LabelBox>,
    pub(super) levels: Vec<f64>,
}

/// Draws panel `i`: its map, contours, nuclei, axes, heading and own colour bar.
pub(super) fn draw_panel(
    c: &mut Canvas,
    ctx: &PanelContext,
    i: usize,
    vals: &[f64],
    blank: bool,
) -> Drawn {
    let PanelContext {
        fig,
        style,
        frame,
        grid,
        shared,
    } = *ctx;
    let s = &frame.s;
    let panel = &fig.panels[i];
    let (nx, ny) = (grid.nx, grid.ny);
    let (col, row) = (i % frame.lay.cols, i / frame.lay.cols);
    let mx = (frame.cell_x(col) + s.left).round();
    let my = (frame.top + row as f32 * frame.row_h + frame.head).round();
    let scale = scale_for(style, panel);
    let mapping = shared.unwrap_or_else(|| super::mapping_of(style, panel, vals));
    let zero = scale.at(mapping.t(0.0));
    paint_map(c, vals, (mx, my), nx, |v| {
        if blank { zero } else { scale.at(mapping.t(v)) }
    });
    let levels = if blank {
        Vec::new()
    } else {
        levels_for(&style.contours, &mapping, panel.signed)
    };
    if !blank {
        let values = Grid {
            values: vals,
            nx,
            ny,
        };
        draw_contours(c, &values, (mx, my), &levels, style);
    }
    if style.nuclei {
        nuclei::draw(c, grid, &fig.nuclei, (mx, my), style.numbers);
    }
    if blank {
        c.text(
            "zero on this plane",
            s.heading,
            mx + nx as f32 / 2.0,
            my + 0.12 * ny as f32,
            (HAlign::Centre, VAlign::Middle),
            Colour::INK,
        );
    }
    let labels = axes::draw(
        c,
        &Axes {
            x: mx,
            y: my,
            width: nx as f32,
            height: ny as f32,
            window: fig.window,
            u_label: &fig.plane.u_label,
            v_label: &fig.plane.v_label,
            font: s.font,
        },
    );
    if fig.panels.len() > 1 {
        draw_heading(c, frame, &panel.heading, (mx + nx as f32 / 2.0, my));
    }
    let map = Placed {
        x: mx as u32,
        y: my as u32,
        width: nx as u32,
        height: ny as u32,
        mapping,
    };
    let bar = (frame.lay.own_bars && !blank).then(|| {
        let bx = mx + nx as f32 + BAR_GAP;
        draw_bar(c, (bx, my, ny as f32), &scale, mapping, panel, &levels, s)
    });
    Drawn {
        map,
        bar,
        labels,
        levels,
    }
}

/// Puts a map's pixels, `colour` giving each value's colour and missing values hatched.
pub(super) fn paint_map(
    c: &mut Canvas,
    vals: &[f64],
    (mx, my): (f32, f32),
    nx: usize,
    colour: impl Fn(f64) -> Colour,
) {
    let pixels: Vec<[u8; 3]> = vals
        .iter()
        .enumerate()
        .map(|(k, v)| {
            let col = if v.is_nan() {
                hatch(k % nx, k / nx)
            } else {
                colour(*v)
            };
            [col.r, col.g, col.b]
        })
        .collect();
    c.put_pixels(mx as u32, my as u32, nx as u32, &pixels);
}

/// A panel's heading centred at `hx` above the map's top `my`, shrunk to fit its cell.
pub(super) fn draw_heading(c: &mut Canvas, frame: &Frame, heading: &str, (hx, my): (f32, f32)) {
    let s = &frame.s;
    let room = (frame.lay.cell_extra - s.left + frame.lay.map_w).max(frame.lay.map_w);
    c.text(
        heading,
        fit_size(heading, s.heading, room),
        hx,
        my - 0.45 * s.heading,
        (HAlign::Centre, VAlign::Bottom),
        Colour::INK,
    );
}

/// The one colour bar of a shared scale, right of the last column and spanning all rows.
pub(super) fn draw_shared_bar(
    c: &mut Canvas,
    ctx: &PanelContext,
    mapping: Mapping,
    levels: &[f64],
) -> Placed {
    let PanelContext {
        fig,
        style,
        frame,
        grid,
        ..
    } = *ctx;
    let s = &frame.s;
    let last_col = frame.lay.cols.min(fig.panels.len()) - 1;
    let bx = frame.cell_x(last_col) + s.left + frame.lay.map_w.floor() + BAR_GAP;
    let by = (frame.top + frame.head).round();
    let bh = (frame.lay.rows - 1) as f32 * frame.row_h + grid.ny as f32;
    let panel = &fig.panels[0];
    let same = fig.panels.iter().all(|p| p.family == panel.family);
    let quantity = Panel {
        quantity: if same {
            panel.family.clone()
        } else {
            "value".into()
        },
        ..panel.clone()
    };
    draw_bar(
        c,
        (bx, by, bh),
        &scale_for(style, panel),
        mapping,
        &quantity,
        levels,
        s,
    )
}

/// Where a map has no value: light grey with darker diagonal stripes every 8 px, a
/// texture no colour scale contains.
pub(super) fn hatch(x: usize, y: usize) -> Colour {
    if (x + y) % 8 < 2 {
        Colour::rgb(160, 160, 160)
    } else {
        Colour::rgb(228, 228, 228)
    }
}

pub(super) fn draw_bar(
    c: &mut Canvas,
    (x, y, h): (f32, f32, f32),
    scale: &Scale,
    mapping: Mapping,
    panel: &Panel,
    levels: &[f64],
    s: &Sizes,
) -> Placed {
    let width = BAR_WIDTH;
    colorbar::draw(
        c,
        &Bar {
            x,
            y,
            width,
            height: h,
            scale,
            mapping,
            quantity: &panel.quantity,
            unit: &panel.unit,
            levels,
            font: s.font,
            k: 1.0,
        },
    );
    Placed {
        x: x.round() as u32,
        y: y.round() as u32,
        width: width as u32,
        height: h.round() as u32,
        mapping,
    }
}

/// The contour levels to draw: explicit ones as given, automatic ones spread over the
/// colour range, with zero added only on request.
pub fn levels_for(contours: &Contours, mapping: &Mapping, signed: bool) -> Vec<f64> {
    match contours {
        Contours::Levels(l) => l.clone(),
        Contours::Auto(0) => Vec::new(),
        Contours::Auto(n) => match *mapping {
            Mapping::Log { max, decades } => contour::log_levels(max, *n, decades),
            m => contour::auto_levels(m.max(), *n, signed),
        },
    }
}

/// Contour lines of `grid` at `levels`, the map's top-left corner at (mx, my).
pub(super) fn draw_contours(
    c: &mut Canvas,
    grid: &Grid,
    (mx, my): (f32, f32),
    levels: &[f64],
    style: &Style,
) {
    let lw = 1.3;
    let dash = [6.0, 4.0];
    let mut all: Vec<(f64, bool)> = levels.iter().map(|l| (*l, false)).collect();
    if style.zero_contour {
        all.push((0.0, true));
    }
    for (level, zero) in all {
        for line in contour::trace(grid, level) {
            let pts: Vec<(f32, f32)> = line
                .iter()
                .map(|(x, y)| (mx + *x as f32 + 0.5, my + *y as f32 + 0.5))
                .collect();
            // A pale halo under each line keeps it visible on dark and light colours.
            let halo = Colour::WHITE.with_alpha(110);
            c.stroke(
                &pts,
                lw * 2.6,
                halo,
                if level < 0.0 && !zero {
                    Some(&dash)
                } else {
                    None
                },
            );
            if zero {
                c.stroke(&pts, lw * 1.4, Colour::BLACK, None);
            } else if level < 0.0 {
                c.stroke(&pts, lw, Colour::INK.with_alpha(220), Some(&dash));
            } else {
                c.stroke(&pts, lw, Colour::INK.with_alpha(220), None);
            }
        }
    }
}
