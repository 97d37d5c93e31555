//! Reader for the common plain-text XYZ layout: atom count, a comment line, then one
//! `symbol x y z` line per atom in ångström. Extra columns and tabs are tolerated;
//! only the first frame of a multi-frame file is read.

use super::elements::by_symbol;
use super::molecule::Atom;
use super::units::LengthUnit;
use crate::error::{Error, Result};

/// What an XYZ file holds: the atoms (positions in bohr), the comment line, and
/// whether more frames followed the first.
#[derive(Debug, Clone)]
pub struct XyzFrame {
    pub atoms: Vec<Atom>,
    pub comment: String,
    pub more_frames: bool,
}

/// Parses XYZ text; `name` is used in error messages. Coordinates are read in
/// `unit` (ångström for a standard file).
pub fn parse_xyz(text: &str, name: &str, unit: LengthUnit) -> Result<XyzFrame> {
    let err = |line: usize, msg: String| Error::input(format!("{name} line {line}: {msg}"));
    let mut lines = text.lines();
    let first = lines
        .next()
        .ok_or_else(|| err(1, "the file is empty".into()))?;
    let count: usize = first.trim().parse().map_err(|_| {
        err(
            1,
            format!("expected the atom count, found {:?}", first.trim()),
        )
    })?;
    if count == 0 {
        return Err(err(1, "the atom count is zero".into()));
    }
    let comment = lines
        .next()
        .ok_or_else(|| err(2, "missing the comment line".into()))?;
    let mut atoms = Vec::with_capacity(count.min(100_000));
    for i in 0..count {
        let n = i + 3;
        let line = lines.next().ok_or_else(|| {
            err(
                n,
                format!("the header promises {count} atoms but the file ends after {i}"),
            )
        })?;
        let mut tok = line.split_whitespace();
        let symbol = tok
            .next()
            .ok_or_else(|| err(n, "blank line where an atom was expected".into()))?;
        let element = by_symbol(symbol)
            .ok_or_else(|| err(n, format!("unknown element symbol {symbol:?}")))?;
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
    let more_frames = lines.any(|l| !l.trim().is_empty());
    Ok(XyzFrame {
        atoms,
        comment: comment.trim().to_string(),
        more_frames,
    })
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
}
