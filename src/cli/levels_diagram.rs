//! What `lobecast levels` shows: the diagram's window, columns, links and notes, and
//! the CSV of every level and weight, from the solved orbitals and fragments.

use super::levels::{DEGENERATE_EV, LevelsArgs, Request};
use lobecast::chem::units::{HARTREE_IN_EV, hartree_to_ev};
use lobecast::error::{Error, Result};
use lobecast::plot::levels::{Column, Diagram, Level, Link};
use lobecast::render::text::formula_markup;
use lobecast::solve::OrbitalSet;
use lobecast::solve::fragments::Fragment;

/// Levels below this (hartree) are core levels, left out of the default window
/// (common practice: valence levels of H–Ar lie above about −2 hartree).
const CORE_LEVEL: f64 = -3.0;

/// Every (molecular orbital, fragment orbital) pair with its weight; energies in
/// the shortest form that reads back to the same number.
pub(super) fn csv_text(set: &OrbitalSet, frags: &[Fragment], w: &[Vec<Vec<f64>>]) -> String {
    let mut t = String::from(
        "orbital,energy_ev,energy_hartree,occupation,fragment,fragment_orbital,fragment_energy_ev,fragment_energy_hartree,weight\n",
    );
    for (i, o) in set.orbitals.iter().enumerate() {
        let head = format!(
            "{},{:e},{:e},{}",
            i + 1,
            hartree_to_ev(o.energy),
            o.energy,
            o.occupation
        );
        if frags.is_empty() {
            t += &format!("{head},,,,,\n");
        }
        for (f, frag) in frags.iter().enumerate() {
            for (a, fo) in frag.set.orbitals.iter().enumerate() {
                t += &format!(
                    "{head},{},{},{:e},{:e},{:e}\n",
                    f + 1,
                    a + 1,
                    hartree_to_ev(fo.energy),
                    fo.energy,
                    w[i][f][a]
                );
            }
        }
    }
    t
}

/// An energy of the diagram's unit as a footnote shows it, with a true minus sign.
fn signed(x: f64, ev: bool) -> String {
    let digits = if ev { 2 } else { 4 };
    format!("{x:.digits$}").replace('-', "−")
}

/// "1-3, 5": atom numbers (from 1) in short form.
fn atom_list(atoms: &[usize]) -> String {
    let mut parts: Vec<String> = Vec::new();
    let mut i = 0;
    while i < atoms.len() {
        let mut j = i;
        while j + 1 < atoms.len() && atoms[j + 1] == atoms[j] + 1 {
            j += 1;
        }
        parts.push(if j > i {
            format!("{}–{}", atoms[i] + 1, atoms[j] + 1)
        } else {
            format!("{}", atoms[i] + 1)
        });
        i = j + 1;
    }
    parts.join(", ")
}

fn levels_of(set: &OrbitalSet, to_unit: &dyn Fn(f64) -> f64) -> Vec<Level> {
    let orbitals = set.orbitals.iter().enumerate();
    orbitals
        .map(|(i, o)| Level {
            energy: to_unit(o.energy),
            number: i + 1,
            occupation: o.occupation,
        })
        .collect()
}

/// What the figure shows: the window, the columns cut to it, links and notes.
pub(super) fn diagram(
    args: &LevelsArgs,
    req: &Request,
    set: &OrbitalSet,
    frags: &[Fragment],
    w: &[Vec<Vec<f64>>],
) -> Result<Diagram> {
    let to_unit = |e: f64| if req.ev { hartree_to_ev(e) } else { e };
    let unit = if req.ev { "eV" } else { "hartree" };
    let mol = levels_of(set, &to_unit);
    let sides: Vec<Vec<Level>> = frags.iter().map(|f| levels_of(&f.set, &to_unit)).collect();
    let homo = set.orbitals.iter().rposition(|o| o.occupation > 1e-12);
    let lumo = homo.map_or(0, |h| h + 1);
    let links: Vec<Link> = w
        .iter()
        .enumerate()
        .flat_map(|(i, per)| {
            per.iter().enumerate().flat_map(move |(f, ws)| {
                ws.iter()
                    .enumerate()
                    .filter(|(_, x)| **x > args.threshold)
                    .map(move |(a, x)| Link {
                        side: f,
                        molecular: i + 1,
                        level: a + 1,
                        weight: *x,
                    })
            })
        })
        .collect();
    let window = req.window.unwrap_or_else(|| {
        let mut first = homo.map_or(0, |h| h.saturating_sub(req.around));
        // Core levels (below CORE_LEVEL) stay out of the default window: in an
        // all-electron set they would squeeze the valence levels into a sliver.
        while first < homo.unwrap_or(0) && mol[first].energy < to_unit(CORE_LEVEL) {
            first += 1;
        }
        let last = lumo.saturating_add(req.around).min(mol.len() - 1);
        let (mut lo, mut hi) = (mol[first].energy, mol[last].energy);
        for l in links
            .iter()
            .filter(|l| (first + 1..=last + 1).contains(&l.molecular))
        {
            let e = sides[l.side][l.level - 1].energy;
            (lo, hi) = (lo.min(e), hi.max(e));
        }
        let pad = if hi > lo {
            0.06 * (hi - lo)
        } else {
            to_unit(0.05)
        };
        (lo - pad, hi + pad)
    });
    let inside = |l: &&Level| l.energy >= window.0 && l.energy <= window.1;
    let cut = |ls: &[Level]| ls.iter().filter(inside).cloned().collect::<Vec<_>>();
    let middle = cut(&mol);
    if middle.is_empty() {
        return Err(Error::input(format!(
            "no orbital level lies in --window {} to {} {unit}: the levels run from {} to {}",
            signed(window.0, req.ev),
            signed(window.1, req.ev),
            signed(mol[0].energy, req.ev),
            signed(mol[mol.len() - 1].energy, req.ev)
        )));
    }
    let side_cols: Vec<Vec<Level>> = sides.iter().map(|s| cut(s)).collect();
    let left_out = mol.len() - middle.len();
    let frag_out: usize = sides
        .iter()
        .zip(&side_cols)
        .map(|(a, b)| a.len() - b.len())
        .sum();

    let formula = set.molecule.formula_with_charge();
    let mut notes = vec![format!("Method: {}.", set.method)];
    notes.extend(
        set.caveats
            .iter()
            .filter_map(|c| c.figure_note())
            .map(str::to_string),
    );
    notes.push(format!(
        "Levels within {DEGENERATE_EV:.0e} eV{} are degenerate and drawn side by side; arrows are electrons (a degenerate set's electrons as whole arrows, singles before pairs).",
        if req.ev { String::new() } else { format!(" ({:.1e} hartree)", DEGENERATE_EV / HARTREE_IN_EV) }
    ));
    if !frags.is_empty() {
        notes.push(format!(
            "Fragments solved alone, neutral, same method and basis. A line joins a molecular level to a fragment level whose weight (squared overlap projection, normalised over all fragment orbitals) exceeds {}; heavier lines, larger weights.",
            args.threshold
        ));
    }
    if left_out + frag_out > 0 {
        notes.push(format!(
            "Outside the window {} to {} {unit}, not drawn: {left_out} molecular and {frag_out} fragment level(s).",
            signed(window.0, req.ev),
            signed(window.1, req.ev)
        ));
    }
    let mut columns: Vec<Column> = frags
        .iter()
        .zip(side_cols)
        .map(|(f, levels)| Column {
            caption: vec![
                formula_markup(&f.set.molecule.formula()),
                format!("atoms {}", atom_list(&f.atoms)),
            ],
            levels,
        })
        .collect();
    let middle = Column {
        caption: vec![formula_markup(&formula), String::from("molecule")],
        levels: middle,
    };
    if columns.len() > 2 {
        columns.clear();
    }
    Ok(Diagram {
        title: args
            .title
            .clone()
            .unwrap_or_else(|| format!("{} orbital levels", formula_markup(&formula))),
        axis: format!("orbital energy ({unit})"),
        unit: unit.to_string(),
        window,
        middle,
        sides: columns,
        links,
        homo: homo.map(|h| h + 1),
        lumo: (lumo < mol.len()).then_some(lumo + 1),
        degeneracy: to_unit(DEGENERATE_EV / HARTREE_IN_EV),
        footnotes: notes,
        width: req.size,
        thumbnails: Vec::new(),
    })
}
