//! The basis entries of an orbital file: one per function, merged into shells.

use super::BasisEntry;
use crate::basis::{Angular, GaussianShell, Shell, SlaterShell};
use crate::chem::Atom;

/// Builds shells from per-function entries, merging consecutive functions that share
/// centre, kind, l and radial part, so grid evaluation can work shell by shell.
pub(super) fn basis_shells(
    entries: &[BasisEntry],
    atoms: &[Atom],
    length: f64,
) -> std::result::Result<Vec<Shell>, (String, String)> {
    let mut shells: Vec<Shell> = Vec::new();
    for (i, e) in entries.iter().enumerate() {
        let field = |f: &str| format!("basis[{i}].{f}");
        let atom_of = |a: usize| {
            atoms.get(a).ok_or_else(|| {
                (
                    field("atom"),
                    format!(
                        "no atom {a}: the file lists {} atoms (numbered from 0)",
                        atoms.len()
                    ),
                )
            })
        };
        match e {
            BasisEntry::Slater {
                atom,
                n,
                l,
                m,
                zeta,
            } => {
                let c = atom_of(*atom)?.position;
                let zeta = zeta / length;
                if let Some(Shell::Slater(s)) = shells.last_mut() {
                    if s.atom == *atom
                        && s.n == *n
                        && s.l == *l
                        && s.zeta == zeta
                        && !s.ms.contains(m)
                    {
                        let mut ms = s.ms.clone();
                        ms.push(*m);
                        *s = SlaterShell::new(*atom, c, *n, *l, zeta, ms)
                            .map_err(|e| (format!("basis[{i}]"), e.message))?;
                        continue;
                    }
                }
                let s = SlaterShell::new(*atom, c, *n, *l, zeta, vec![*m])
                    .map_err(|e| (format!("basis[{i}]"), e.message))?;
                shells.push(Shell::Slater(s));
            }
            BasisEntry::Gaussian {
                atom,
                powers,
                l,
                m,
                primitives,
            } => {
                let c = atom_of(*atom)?.position;
                let (lv, ang) = match (powers, l, m) {
                    (Some(p), None, None) => (p.iter().sum::<u32>(), Angular::Cartesian(*p)),
                    (None, Some(l), Some(m)) => (*l, Angular::Pure(*m)),
                    _ => {
                        return Err((
                            format!("basis[{i}]"),
                            "a gaussian needs either \"powers\" or both \"l\" and \"m\"".into(),
                        ));
                    }
                };
                let prims: Vec<(f64, f64)> = primitives
                    .iter()
                    .map(|p| (p[0] / (length * length), p[1]))
                    .collect();
                if let Some((k, p)) = prims
                    .iter()
                    .enumerate()
                    .find(|(_, p)| !(p.0.is_finite() && p.0 > 0.0))
                {
                    return Err((
                        format!("basis[{i}].primitives[{k}]"),
                        format!("exponent must be positive, found {}", p.0),
                    ));
                }
                if let Some(Shell::Gaussian(g)) = shells.last_mut() {
                    let same_kind = matches!(
                        (g.functions[0], ang),
                        (Angular::Cartesian(_), Angular::Cartesian(_))
                            | (Angular::Pure(_), Angular::Pure(_))
                    );
                    if g.atom == *atom
                        && g.l == lv
                        && g.primitives == prims
                        && same_kind
                        && !g.functions.contains(&ang)
                    {
                        let mut fs = g.functions.clone();
                        fs.push(ang);
                        *g = GaussianShell::new(*atom, c, lv, prims, fs)
                            .map_err(|e| (format!("basis[{i}]"), e.message))?;
                        continue;
                    }
                }
                let g = GaussianShell::new(*atom, c, lv, prims, vec![ang])
                    .map_err(|e| (format!("basis[{i}]"), e.message))?;
                shells.push(Shell::Gaussian(g));
            }
        }
    }
    if shells.is_empty() {
        return Err(("basis".into(), "the file lists no basis functions".into()));
    }
    Ok(shells)
}
