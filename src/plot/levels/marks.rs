//! The marks of a level diagram: degenerate groups and their bars, label spreading,
//! boxed labels, electron arrows and the HOMO–LUMO gap arrow.

use super::{Column, Diagram, HILITE, Level, Placed};
use crate::plot::frame::line_height;
use crate::plot::size::*;
use crate::render::canvas::{Canvas, Colour, HAlign, VAlign};
use crate::render::text;

/// Groups a column's levels by degeneracy and places each group's bar span.
pub(super) fn place(
    col: &Column,
    cx: f32,
    bar_w: f32,
    tol: f64,
    y_px: &dyn Fn(f64) -> f32,
) -> Vec<Placed> {
    let mut out: Vec<Placed> = Vec::new();
    for l in &col.levels {
        match out.last_mut() {
            Some(g) if l.energy - g.members[0].energy < tol => g.members.push(l.clone()),
            _ => out.push(Placed {
                y: y_px(l.energy),
                left: 0.0,
                right: 0.0,
                members: vec![l.clone()],
            }),
        }
    }
    for g in &mut out {
        // A degenerate pair gets room for both sets of arrows side by side.
        let width = bar_w * (1.0 + 0.35 * (g.members.len() as f32 - 1.0)).min(1.8);
        g.left = cx - width / 2.0;
        g.right = cx + width / 2.0;
    }
    out
}

/// Moves label positions apart to at least `gap` px with as little shift as
/// possible: overlapping labels form clusters, each centred on its members' mean
/// (common practice for callout labels), kept within [top, bottom].
pub(super) fn spread(ys: &mut [f32], gap: f32, top: f32, bottom: f32) {
    let mut order: Vec<usize> = (0..ys.len()).collect();
    order.sort_by(|&a, &b| ys[a].total_cmp(&ys[b]));
    // Clusters of consecutive labels (by y): (first index in `order`, count, centre).
    let mut clusters: Vec<(usize, usize, f32)> = Vec::new();
    for (k, &i) in order.iter().enumerate() {
        clusters.push((k, 1, ys[i]));
        while clusters.len() > 1 {
            let (b0, bn, bc) = clusters[clusters.len() - 1];
            let (a0, an, ac) = clusters[clusters.len() - 2];
            let a_end = ac + 0.5 * (an as f32 - 1.0) * gap;
            let b_start = bc - 0.5 * (bn as f32 - 1.0) * gap;
            if b_start - a_end >= gap {
                break;
            }
            let sum: f32 = order[a0..b0 + bn].iter().map(|&i| ys[i]).sum();
            clusters.truncate(clusters.len() - 2);
            clusters.push((a0, an + bn, sum / (an + bn) as f32));
        }
    }
    let mut placed = vec![0.0; ys.len()];
    for (first, n, centre) in clusters {
        let half = 0.5 * (n as f32 - 1.0) * gap;
        let centre = centre.clamp(top + half, (bottom - half).max(top + half));
        for j in 0..n {
            placed[order[first + j]] = centre - half + j as f32 * gap;
        }
    }
    ys.copy_from_slice(&placed);
}

/// Text on a white box, so it stays readable over link lines.
pub(super) fn boxed(c: &mut Canvas, s: &str, x: f32, y: f32, h: HAlign) {
    let e = text::measure(s, FONT);
    let left = match h {
        HAlign::Right => x - e.width,
        HAlign::Centre => x - e.width / 2.0,
        HAlign::Left => x,
    };
    let bh = e.height();
    c.fill_rect(
        left - 2.0,
        y - bh / 2.0 - 1.0,
        e.width + 4.0,
        bh + 2.0,
        Colour::WHITE,
    );
    c.text(s, FONT, x, y, (h, VAlign::Middle), Colour::INK);
}

/// Whole electrons for each member of a degenerate set: the set's total occupation
/// rounded to whole electrons, then one up arrow per level before any pairs (Hund's
/// rule). So the equal fractional occupations of a spherically averaged open shell
/// (O 2p⁴ as 4/3 in each p) are drawn as the four electrons they add up to.
pub(super) fn hund_filling(members: &[Level]) -> Vec<f64> {
    let g = members.len();
    let total: f64 = members.iter().map(|l| l.occupation.clamp(0.0, 2.0)).sum();
    let n = (total.round() as usize).min(2 * g);
    (0..g)
        .map(|k| f64::from(u8::from(k < n)) + f64::from(u8::from(k + g < n)))
        .collect()
}

/// Up and down arrows for the electrons of one level (a pair, or one up arrow;
/// fractional occupations rounded to the nearest half-pair).
pub(super) fn electrons(c: &mut Canvas, x: f32, y: f32, occ: f64, length: f32) {
    let n = (occ.clamp(0.0, 2.0)).round() as usize;
    let xs: &[(f32, bool)] = match n {
        2 => &[(-4.0, true), (4.0, false)],
        1 => &[(0.0, true)],
        _ => &[],
    };
    for &(dx, up) in xs {
        let x = x + dx;
        let (tail, tip) = if up {
            (y + length / 2.0, y - length / 2.0)
        } else {
            (y - length / 2.0, y + length / 2.0)
        };
        let head = (0.32 * length).min(4.5);
        let back = if up { tip + head } else { tip - head };
        c.stroke(&[(x, tail), (x, tip)], 1.6, Colour::INK, None);
        c.stroke(
            &[(x - 3.0, back), (x, tip), (x + 3.0, back)],
            1.6,
            Colour::INK,
            None,
        );
    }
}

/// A double arrow from the HOMO to the LUMO bar, left of the middle column, with
/// the gap written beside it.
pub(super) fn gap_arrow(c: &mut Canvas, d: &Diagram, middle: &[Placed], y_px: &dyn Fn(f64) -> f32) {
    let (Some(h), Some(l)) = (d.homo, d.lumo) else {
        return;
    };
    let get = |n: usize| {
        middle
            .iter()
            .find(|g| g.members.iter().any(|m| m.number == n))
    };
    let (Some(gh), Some(gl)) = (get(h), get(l)) else {
        return;
    };
    let eh = gh
        .members
        .iter()
        .find(|m| m.number == h)
        .map_or(0.0, |m| m.energy);
    let el = gl
        .members
        .iter()
        .find(|m| m.number == l)
        .map_or(0.0, |m| m.energy);
    // No molecular level lies between HOMO and LUMO, so the arrow and its text
    // sit inside the middle column, clear of the link lines; a gap too small for
    // the text puts it beside the column instead.
    let (ya, yb) = (y_px(eh), y_px(el));
    let inside = ya - yb > 2.0 * line_height(FONT);
    let x = gh.left.max(gl.left) + if inside { 14.0 } else { -12.0 };
    c.stroke(&[(x, ya), (x, yb)], 1.4, HILITE, None);
    for (tip, s) in [(yb, 1.0), (ya, -1.0)] {
        c.stroke(
            &[(x - 3.5, tip + s * 6.0), (x, tip), (x + 3.5, tip + s * 6.0)],
            1.4,
            HILITE,
            None,
        );
    }
    let gap = format!("gap {:.2} {}", el - eh, d.unit);
    let gap = if d.unit == "eV" {
        gap
    } else {
        format!("gap {:.4} {}", el - eh, d.unit)
    };
    let (tx, at) = if inside {
        (x + 6.0, HAlign::Left)
    } else {
        (x - 5.0, HAlign::Right)
    };
    boxed(c, &gap, tx, (ya + yb) / 2.0, at);
}

#[cfg(test)]
mod tests {
    use super::{Level, hund_filling};

    fn set(occ: &[f64]) -> Vec<Level> {
        let level = |(i, &occupation): (usize, &f64)| Level {
            energy: -1.0,
            number: i + 1,
            occupation,
        };
        occ.iter().enumerate().map(level).collect()
    }

    /// Hund's rule (common practice): singles first, then pairs, the total kept.
    #[test]
    fn degenerate_sets_fill_singles_before_pairs() {
        let third = 4.0 / 3.0;
        assert_eq!(hund_filling(&set(&[third; 3])), [2.0, 1.0, 1.0]);
        assert_eq!(hund_filling(&set(&[1.0; 3])), [1.0, 1.0, 1.0]);
        assert_eq!(hund_filling(&set(&[2.0, 2.0])), [2.0, 2.0]);
        assert_eq!(hund_filling(&set(&[0.5, 0.5])), [1.0, 0.0]);
        assert_eq!(hund_filling(&set(&[0.0])), [0.0]);
    }
}
