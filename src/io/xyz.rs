//! Reader for the common plain-text XYZ layout (no formal specification exists; this
//! is the layout molecular tools have shared for decades): atom count, a comment line, then one
//! `symbol x y z` line per atom in ångström. Extra columns and tabs are tolerated;
//! only the first frame of a multi-frame file is used, but every frame is read
//! strictly: after a frame's atoms the next non-blank line must be the count line of
//! another frame, so a count that is too small is an error naming the line, never a
//! silently shorter molecule. Counts above `MAX_ATOMS` are refused before allocating,
//! and atoms of the first frame closer than 0.1 Å are refused with the pair named.

use crate::chem::elements::{by_symbol, unknown_symbol};
use crate::chem::molecule::{Atom, check_separations};
use crate::chem::units::LengthUnit;
use crate::error::{Error, Result};

/// What an XYZ file holds: the atoms (positions in bohr), the comment line, and
/// whether more frames followed the first.
#[derive(Debug, Clone)]
pub struct XyzFrame {
    pub atoms: Vec<Atom>,
    pub comment: String,
    pub more_frames: bool,
}

/// The most atoms one frame may hold (documented in the README): far beyond any
/// molecule whose orbitals this tool can build, small enough to bound memory.
pub const MAX_ATOMS: usize = 100_000;

/// Parses XYZ text; `name` is used in error messages. Coordinates are read in
/// `unit` (ångström for a standard file).
pub fn parse_xyz(text: &str, name: &str, unit: LengthUnit) -> Result<XyzFrame> {
    let err = |line: usize, msg: String| Error::input(format!("{name} line {line}: {msg}"));
    let mut lines = text.lines().enumerate().map(|(i, l)| (i + 1, l));
    let (first, comment, atoms) =
        read_frame(&mut lines, 1, name, unit)?.ok_or_else(|| err(1, "the file is empty".into()))?;
    check_separations(&atoms, |i| format!(", line {}", first + 2 + i))
        .map_err(|e| Error::input(format!("{name}: {}", e.message)))?;
    let mut more_frames = false;
    while read_frame(&mut lines, 2, name, unit)?.is_some() {
        more_frames = true;
    }
    Ok(XyzFrame {
        atoms,
        comment,
        more_frames,
    })
}

/// Reads one frame: the line number of its count line, its comment and atoms; `None`
/// at the end of the text. Blank lines before a frame are skipped.
fn read_frame<'a>(
    lines: &mut impl Iterator<Item = (usize, &'a str)>,
    frame: usize,
    name: &str,
    unit: LengthUnit,
) -> Result<Option<(usize, String, Vec<Atom>)>> {
    let err = |line: usize, msg: String| Error::input(format!("{name} line {line}: {msg}"));
    let Some((n0, first)) = lines.find(|(_, l)| !l.trim().is_empty()) else {
        return Ok(None);
    };
    let count: usize = first.trim().parse().map_err(|_| {
        if frame == 1 {
            err(
                n0,
                format!("expected the atom count, found {:?}", first.trim()),
            )
        } else {
            err(
                n0,
                format!(
                    "expected the atom count of a new frame after the previous frame's atoms, found {:?} (does the count line above say too few atoms?)",
                    first.trim()
                ),
            )
        }
    })?;
    if count == 0 {
        return Err(err(n0, "the atom count is zero".into()));
    }
    if count > MAX_ATOMS {
        return Err(err(
            n0,
            format!("{count} atoms is over the limit of {MAX_ATOMS} atoms per frame"),
        ));
    }
    let (_, comment) = lines
        .next()
        .ok_or_else(|| err(n0 + 1, "missing the comment line".into()))?;
    let mut atoms = Vec::with_capacity(count);
    for i in 0..count {
        let (n, line) = lines.next().ok_or_else(|| {
            err(
                n0 + 2 + i,
                format!("the count line {n0} promises {count} atoms but the file ends after {i}"),
            )
        })?;
        let mut tok = line.split_whitespace();
        let symbol = tok
            .next()
            .ok_or_else(|| err(n, "blank line where an atom was expected".into()))?;
        let element = by_symbol(symbol).ok_or_else(|| err(n, unknown_symbol(symbol)))?;
        let mut position = [0.0; 3];
        for (d, p) in position.iter_mut().enumerate() {
            let t = tok
                .next()
                .ok_or_else(|| err(n, format!("missing the {} coordinate", ["x", "y", "z"][d])))?;
            let v: f64 = t
                .parse()
                .map_err(|_| err(n, format!("cannot read {t:?} as a number")))?;
            if !v.is_finite() {
                return Err(err(n, format!("coordinate {t:?} is not a finite number")));
            }
            *p = unit.to_bohr(v);
        }
        atoms.push(Atom { element, position });
    }
    Ok(Some((n0, comment.trim().to_string(), atoms)))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn reads_atoms_in_angstrom_and_names_bad_lines() {
        let f = parse_xyz(
            "2\nwater-free test\nH 0 0 0\nh\t0 0 0.74 extra\n",
            "t.xyz",
            LengthUnit::Angstrom,
        )
        .unwrap();
        assert_eq!(f.atoms.len(), 2);
        // 0.74 Å in bohr with the CODATA 2018 Bohr radius.
        assert!((f.atoms[1].position[2] - 0.74 / 0.529_177_210_903).abs() < 1e-12);
        assert!(!f.more_frames);
        let e = parse_xyz("2\n\nH 0 0 0\nQq 0 0 1\n", "t.xyz", LengthUnit::Angstrom).unwrap_err();
        assert!(
            e.message.contains("line 4") && e.message.contains("Qq"),
            "{}",
            e.message
        );
        let e = parse_xyz("3\n\nH 0 0 0\n", "t.xyz", LengthUnit::Angstrom).unwrap_err();
        assert!(e.message.contains("promises 3 atoms"), "{}", e.message);
        let e = parse_xyz("1\n\nH 0 nan 0\n", "t.xyz", LengthUnit::Angstrom).unwrap_err();
        assert!(e.message.contains("line 3"), "{}", e.message);
    }

    /// The reported case: water whose count line says 2 is not read as OH.
    #[test]
    fn a_short_count_is_an_error_naming_the_line() {
        let water = "2\nwater\nO 0 0 0\nH 0.757 0.586 0\nH -0.757 0.586 0\n";
        let e = parse_xyz(water, "w.xyz", LengthUnit::Angstrom).unwrap_err();
        assert!(
            e.message.contains("w.xyz line 5") && e.message.contains("atom count"),
            "{}",
            e.message
        );
        // Two proper frames (and trailing blank lines) are fine: the first is used.
        let two = "1\na\nH 0 0 0\n1\nb\nH 0 0 1\n\n\n";
        let f = parse_xyz(two, "t.xyz", LengthUnit::Angstrom).unwrap();
        assert!(f.more_frames && f.atoms.len() == 1 && f.comment == "a");
        // A broken second frame is named too.
        let e = parse_xyz(
            "1\na\nH 0 0 0\n2\nb\nH 0 0 1\n",
            "t.xyz",
            LengthUnit::Angstrom,
        )
        .unwrap_err();
        assert!(
            e.message.contains("line 7") && e.message.contains("promises 2"),
            "{}",
            e.message
        );
    }

    #[test]
    fn huge_counts_and_close_atoms_are_refused() {
        let e = parse_xyz("100001\n\nH 0 0 0\n", "t.xyz", LengthUnit::Angstrom).unwrap_err();
        assert!(e.message.contains("limit of 100000"), "{}", e.message);
        let e = parse_xyz("18446744073709551616\n\n", "t.xyz", LengthUnit::Angstrom).unwrap_err();
        assert!(e.message.contains("line 1"), "{}", e.message);
        // 0.05 Å apart: under the 0.1 Å limit (common practice).
        let e = parse_xyz(
            "3\n\nO 0 0 0\nH 0 0 1\nH 0 0 1.05\n",
            "t.xyz",
            LengthUnit::Angstrom,
        )
        .unwrap_err();
        assert!(
            e.message
                .contains("atoms 2 (H, line 4) and 3 (H, line 5) are 0.0500 Å apart"),
            "{}",
            e.message
        );
        // Elements beyond argon and a dummy centre are accepted.
        let f = parse_xyz(
            "3\n\nFe 0 0 0\nTi 0 0 2\nX 0 0 0\n",
            "t.xyz",
            LengthUnit::Angstrom,
        )
        .unwrap();
        assert_eq!(f.atoms[0].element.atomic_number, 26);
        assert_eq!(f.atoms[2].element.atomic_number, 0);
    }
}
