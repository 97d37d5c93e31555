//! Strict streaming cube reader. The header is parsed line by line; the values are
//! then pulled in chunks by a byte-level tokenizer, so memory stays at one buffer
//! however large the file or however long its lines. Every error names the line.
//!
//! Accepted variants: both comment lines kept verbatim; an optional value-count
//! column after the origin; a negative atom count followed, after the atoms, by the
//! orbital-index line `N i1 … iN` (which may wrap over several lines); negative voxel
//! counts meaning lengths in ångström (converted to bohr, CODATA 2018); non-orthogonal
//! axes; any number of values per line; exponents written `E`, `e`, `D` or `d`; CRLF
//! line endings; gzip compression (recognised by its magic bytes, not the name).

use std::fs::File;
use std::io::{BufRead, BufReader, Read};
use std::path::Path;

use super::number::{MAX_TOKEN, is_space, parse_finite, parse_int};
use super::writer::{CubeAtom, CubeHeader};
use crate::chem::units::BOHR_IN_ANGSTROM;
use crate::error::{Error, Result};
use crate::grid::GridBox;

/// Longest header line accepted; real headers are a few hundred bytes.
const MAX_LINE: usize = 1 << 16;
/// Deflate cannot expand data by more than about 1032:1, which bounds what a gzip
/// file of a given size can hold.
const GZIP_MAX_RATIO: u64 = 1032;
/// Stored fields accepted on the orbital-index line.
const MAX_FIELDS: usize = 100_000;

/// What a cube header says, with lengths already in bohr.
#[derive(Debug, Clone, PartialEq)]
pub struct CubeInfo {
    pub header: CubeHeader,
    /// Values stored per point (1, the orbital-index count, or the value-count column).
    pub fields: usize,
    /// The file gave lengths in ångström (negative voxel counts).
    pub angstrom: bool,
    pub gzip: bool,
}

impl CubeInfo {
    pub fn point_count(&self) -> usize {
        self.header.grid.point_count()
    }

    pub fn value_count(&self) -> usize {
        self.point_count() * self.fields
    }
}

/// An open cube file: the parsed header, then the values on demand.
pub struct CubeReader {
    src: Box<dyn BufRead>,
    name: String,
    line: usize,
    tok: Vec<u8>,
    tok_line: usize,
    remaining: usize,
    info: CubeInfo,
}

impl std::fmt::Debug for CubeReader {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.debug_struct("CubeReader")
            .field("name", &self.name)
            .field("line", &self.line)
            .field("info", &self.info)
            .finish()
    }
}

impl CubeReader {
    /// Opens a cube file (plain or gzip) and parses its header.
    pub fn open(path: &Path) -> Result<Self> {
        let file = File::open(path).map_err(|e| Error::reading(path.display(), e))?;
        let len = file.metadata().map(|m| m.len()).ok();
        Self::new(file, len, &path.display().to_string())
    }

    /// Reads a cube from any byte source; `size` (the stored byte count, when known)
    /// bounds how many values the header may claim.
    pub fn new<R: Read + 'static>(source: R, size: Option<u64>, name: &str) -> Result<Self> {
        let mut raw = BufReader::with_capacity(1 << 18, source);
        let magic = raw
            .fill_buf()
            .map_err(|e| Error::input(format!("cannot read {name}: {e}")))?;
        let gzip = magic.starts_with(&[0x1f, 0x8b]);
        let (src, budget): (Box<dyn BufRead>, Option<u64>) = if gzip {
            let dec = flate2::bufread::MultiGzDecoder::new(raw);
            (
                Box::new(BufReader::with_capacity(1 << 18, dec)),
                size.map(|s| s.saturating_mul(GZIP_MAX_RATIO)),
            )
        } else {
            (Box::new(raw), size)
        };
        let mut r = CubeReader {
            src,
            name: name.to_string(),
            line: 1,
            tok: Vec::with_capacity(MAX_TOKEN),
            tok_line: 1,
            remaining: 0,
            info: CubeInfo {
                header: CubeHeader {
                    title: String::new(),
                    comment: String::new(),
                    atoms: Vec::new(),
                    grid: GridBox {
                        origin: [0.0; 3],
                        axes: [[0.0; 3]; 3],
                        counts: [0; 3],
                    },
                    orbital_numbers: None,
                },
                fields: 1,
                angstrom: false,
                gzip,
            },
        };
        r.read_header(budget)?;
        Ok(r)
    }

    pub fn info(&self) -> &CubeInfo {
        &self.info
    }

    pub fn name(&self) -> &str {
        &self.name
    }

    /// Values not yet read.
    pub fn remaining(&self) -> usize {
        self.remaining
    }

    fn err(&self, line: usize, msg: impl std::fmt::Display) -> Error {
        Error::input(format!("{}, line {line}: {msg}", self.name))
    }

    fn io_err(&self, e: std::io::Error) -> Error {
        let message = format!(
            "{}, line {}: cannot read further: {e}",
            self.name, self.line
        );
        Error::read_failure(message, e)
    }

    /// One header line without its line ending; `None` at the end of the file.
    fn read_line(&mut self) -> Result<Option<String>> {
        let mut bytes = Vec::new();
        let mut seen_any = false;
        loop {
            let buf = match self.src.fill_buf() {
                Ok(b) => b,
                Err(e) => return Err(self.io_err(e)),
            };
            if buf.is_empty() {
                break;
            }
            seen_any = true;
            let (take, done) = match buf.iter().position(|&b| b == b'\n') {
                Some(p) => (p + 1, true),
                None => (buf.len(), false),
            };
            bytes.extend_from_slice(&buf[..take]);
            self.src.consume(take);
            if bytes.len() > MAX_LINE {
                return Err(self.err(
                    self.line,
                    format_args!("the line is longer than {MAX_LINE} bytes"),
                ));
            }
            if done {
                break;
            }
        }
        if !seen_any {
            return Ok(None);
        }
        while matches!(bytes.last(), Some(b'\n' | b'\r')) {
            bytes.pop();
        }
        self.line += 1;
        Ok(Some(String::from_utf8_lossy(&bytes).into_owned()))
    }

    /// The next header line, which must exist.
    fn need_line(&mut self, what: &str) -> Result<(usize, String)> {
        let n = self.line;
        match self.read_line()? {
            Some(l) => Ok((n, l)),
            None => Err(self.err(n, format_args!("the file ends where {what} should be"))),
        }
    }

    fn read_header(&mut self, budget: Option<u64>) -> Result<()> {
        let (_, title) = self.need_line("the first comment line")?;
        let (_, comment) = self.need_line("the second comment line")?;
        self.info.header.title = title;
        self.info.header.comment = comment;
        let (natoms, origin, value_column) = self.read_count_line()?;
        let (counts, axes, angstrom) = self.read_axes()?;
        let scale = if angstrom {
            1.0 / BOHR_IN_ANGSTROM
        } else {
            1.0
        };
        let grid = GridBox {
            origin: origin.map(|x| x * scale),
            axes: axes.map(|a| a.map(|x| x * scale)),
            counts,
        };
        if grid.voxel_volume() == 0.0 {
            return Err(self.err(
                self.line - 1,
                "the three step vectors span no volume (zero or parallel)",
            ));
        }
        self.info.header.atoms = self.read_atoms(natoms, scale)?;
        self.info.angstrom = angstrom;

        let mut fields = value_column.unwrap_or(1);
        if natoms < 0 {
            let nums = self.read_index_line()?;
            if value_column.is_some_and(|v| v != 1 && v != nums.len()) {
                return Err(self.err(
                    3,
                    format_args!(
                        "the header says {} values per point but the orbital-index line lists {} fields",
                        fields,
                        nums.len()
                    ),
                ));
            }
            fields = nums.len();
            self.info.header.orbital_numbers = Some(nums);
        }
        self.info.fields = fields;
        self.info.header.grid = grid;
        self.remaining = self.check_claim(counts, fields, budget)?;
        // Until a value is read, "where the file ends" is the last header line.
        self.tok_line = self.line - 1;
        Ok(())
    }

    /// Line 3: the atom count (negative for the multi-field variant), the origin,
    /// and the optional number of values per point.
    fn read_count_line(&mut self) -> Result<(i64, [f64; 3], Option<usize>)> {
        let (ln, l) = self.need_line("the atom count and origin")?;
        let t: Vec<&str> = l.split_whitespace().collect();
        if !(t.len() == 4 || t.len() == 5) {
            return Err(self.err(
                ln,
                format_args!(
                    "expected the atom count, the origin x y z and optionally the number of values per point, found {} entries",
                    t.len()
                ),
            ));
        }
        let natoms = self.int(ln, t[0], "the atom count")?;
        let mut origin = [0.0; 3];
        for d in 0..3 {
            origin[d] = self.num(ln, t[d + 1])?;
        }
        let value_column = match t.get(4) {
            Some(s) => {
                let v = self.int(ln, s, "the number of values per point")?;
                if !(1..=MAX_FIELDS as i64).contains(&v) {
                    return Err(self.err(
                        ln,
                        format_args!(
                            "the number of values per point must be 1 to {MAX_FIELDS}, got {v}"
                        ),
                    ));
                }
                Some(v as usize)
            }
            None => None,
        };
        Ok((natoms, origin, value_column))
    }

    /// Lines 4–6: points and step vector per axis, in the file's unit; whether the
    /// counts were negative (lengths in ångström).
    fn read_axes(&mut self) -> Result<([usize; 3], [[f64; 3]; 3], bool)> {
        let mut counts = [0usize; 3];
        let mut axes = [[0.0; 3]; 3];
        let mut signs = [false; 3];
        for d in 0..3 {
            let (ln, l) = self.need_line("an axis line (count and step vector)")?;
            let t: Vec<&str> = l.split_whitespace().collect();
            if t.len() != 4 {
                return Err(self.err(
                    ln,
                    format_args!(
                        "expected the number of points and the step vector x y z, found {} entries",
                        t.len()
                    ),
                ));
            }
            let n = self.int(ln, t[0], "the number of points")?;
            if n == 0 {
                return Err(self.err(ln, "the number of points along an axis must not be zero"));
            }
            signs[d] = n < 0;
            counts[d] = n.unsigned_abs() as usize;
            for e in 0..3 {
                axes[d][e] = self.num(ln, t[e + 1])?;
            }
            if signs[d] != signs[0] {
                return Err(self.err(
                    ln,
                    "the point counts mix signs (negative means ångström, positive bohr)",
                ));
            }
        }
        Ok((counts, axes, signs[0]))
    }

    /// The atom lines, positions scaled to bohr.
    fn read_atoms(&mut self, natoms: i64, scale: f64) -> Result<Vec<CubeAtom>> {
        let mut atoms = Vec::new();
        for _ in 0..natoms.unsigned_abs() {
            let (ln, l) = self.need_line("an atom line")?;
            let t: Vec<&str> = l.split_whitespace().collect();
            if t.len() != 5 {
                return Err(self.err(
                    ln,
                    format_args!(
                        "expected an atom: atomic number, charge, x y z, found {} entries \
                         (fewer atom lines than the count of {} on line 3?)",
                        t.len(),
                        natoms.unsigned_abs()
                    ),
                ));
            }
            let z = self.int(ln, t[0], "the atomic number")?;
            if !(0..=200).contains(&z) {
                return Err(self.err(ln, format_args!("atomic number {z} is out of range")));
            }
            let charge = self.num(ln, t[1])?;
            let mut p = [0.0; 3];
            for d in 0..3 {
                p[d] = self.num(ln, t[d + 2])? * scale;
            }
            atoms.push(CubeAtom {
                atomic_number: z as u32,
                charge,
                position: p,
            });
        }
        Ok(atoms)
    }

    /// Refuses impossible claims before anyone allocates for them: every value needs
    /// at least one digit and one separator. Returns the number of values.
    fn check_claim(&self, counts: [usize; 3], fields: usize, budget: Option<u64>) -> Result<usize> {
        let total = counts
            .iter()
            .fold(fields as u128, |acc, &c| acc.saturating_mul(c as u128));
        let limit = budget.map_or(u64::MAX as u128, |b| (b as u128).div_ceil(2));
        if total > limit || total > usize::MAX as u128 / 16 {
            return Err(self.err(
                6,
                format_args!(
                    "the header claims {}×{}×{} points × {} field(s) = {total} values, \
                     more than the file's {} bytes can hold",
                    counts[0],
                    counts[1],
                    counts[2],
                    fields,
                    budget.map_or("?".into(), |b| b.to_string())
                ),
            ));
        }
        Ok(total as usize)
    }

    /// The orbital-index line `N i1 … iN`; it may wrap, but must end after the N-th
    /// index so that no value is mistaken for an index.
    fn read_index_line(&mut self) -> Result<Vec<usize>> {
        let start = self.line;
        let bad = |r: &Self, line, msg: String| {
            r.err(line, format_args!("bad orbital-index line: {msg}"))
        };
        if !self.next_token()? {
            return Err(bad(
                self,
                start,
                "the file ends where it should be (a negative atom count announces it)".into(),
            ));
        }
        let n = parse_int(&self.tok).filter(|&n| (1..=MAX_FIELDS as i64).contains(&n));
        let Some(n) = n else {
            let t = String::from_utf8_lossy(&self.tok).into_owned();
            return Err(bad(
                self,
                self.tok_line,
                format!("expected the number of fields (1 to {MAX_FIELDS}), found '{t}'"),
            ));
        };
        let mut nums = Vec::with_capacity(n as usize);
        for got in 0..n {
            if !self.next_token()? {
                return Err(bad(
                    self,
                    self.tok_line,
                    format!("the file ends after {got} of {n} orbital numbers"),
                ));
            }
            match parse_int(&self.tok).filter(|&i| i >= 0) {
                Some(i) => nums.push(i as usize),
                None => {
                    let t = String::from_utf8_lossy(&self.tok).into_owned();
                    return Err(bad(
                        self,
                        self.tok_line,
                        format!("'{t}' is not an orbital number ({got} of {n} read)"),
                    ));
                }
            }
        }
        if !self.rest_of_line_blank()? {
            return Err(bad(
                self,
                self.line,
                format!("more entries than the {n} orbital numbers it announces"),
            ));
        }
        Ok(nums)
    }

    fn int(&self, line: usize, s: &str, what: &str) -> Result<i64> {
        parse_int(s.as_bytes())
            .ok_or_else(|| self.err(line, format_args!("{what} '{s}' is not a whole number")))
    }

    fn num(&self, line: usize, s: &str) -> Result<f64> {
        parse_finite(s.as_bytes()).map_err(|m| self.err(line, m))
    }

    /// Reads the next whitespace-separated token into `self.tok`; false at the end.
    fn next_token(&mut self) -> Result<bool> {
        self.tok.clear();
        loop {
            let buf = match self.src.fill_buf() {
                Ok(b) => b,
                Err(e) => return Err(self.io_err(e)),
            };
            if buf.is_empty() {
                return Ok(!self.tok.is_empty());
            }
            let mut i = 0;
            if self.tok.is_empty() {
                while i < buf.len() && is_space(buf[i]) {
                    if buf[i] == b'\n' {
                        self.line += 1;
                    }
                    i += 1;
                }
                if i < buf.len() {
                    self.tok_line = self.line;
                }
            }
            let start = i;
            while i < buf.len() && !is_space(buf[i]) {
                i += 1;
            }
            let ended = i < buf.len();
            self.tok.extend_from_slice(&buf[start..i]);
            self.src.consume(i);
            if self.tok.len() > MAX_TOKEN {
                return Err(self.err(self.tok_line, "an entry is too long to be a number"));
            }
            if ended && !self.tok.is_empty() {
                return Ok(true);
            }
        }
    }

    /// Skips spaces to the end of the current line; false if anything else comes first.
    fn rest_of_line_blank(&mut self) -> Result<bool> {
        loop {
            let buf = match self.src.fill_buf() {
                Ok(b) => b,
                Err(e) => return Err(self.io_err(e)),
            };
            let Some(&b) = buf.first() else {
                return Ok(true);
            };
            match b {
                b'\n' => {
                    self.src.consume(1);
                    self.line += 1;
                    return Ok(true);
                }
                b' ' | b'\t' | b'\r' => self.src.consume(1),
                _ => return Ok(false),
            }
        }
    }

    /// Fills `out` with the next values (all fields of a point together, points in
    /// cube order) and returns how many were read: `out.len()` until the last chunk,
    /// 0 when all are read. A file that ends early or holds more values is an error.
    pub fn read_values(&mut self, out: &mut [f64]) -> Result<usize> {
        let want = out.len().min(self.remaining);
        let mut got = 0;
        while got < want {
            // Fast path: whole tokens inside the buffer are parsed in place.
            let buf = match self.src.fill_buf() {
                Ok(b) => b,
                Err(e) => return Err(self.io_err(e)),
            };
            let scan = scan_values(buf, &mut out[got..want], &mut self.line);
            self.src.consume(scan.consumed);
            got += scan.filled;
            if let Some(tl) = scan.last_line {
                self.tok_line = tl;
            }
            if let Some((line, msg)) = scan.bad {
                return Err(self.err(line, msg));
            }
            if got < want && scan.needs_slow_path {
                // A token cut by the buffer's end, or the end of the file.
                if !self.next_token()? {
                    let total = self.info.value_count();
                    return Err(self.err(
                        self.tok_line,
                        format_args!(
                            "the file ends after {} of the {total} values the header announces",
                            total - self.remaining + got
                        ),
                    ));
                }
                out[got] = parse_finite(&self.tok).map_err(|m| self.err(self.tok_line, m))?;
                got += 1;
            }
        }
        self.remaining -= want;
        if self.remaining == 0 && self.next_token()? {
            let t = String::from_utf8_lossy(&self.tok).into_owned();
            return Err(self.err(
                self.tok_line,
                format_args!(
                    "more values than the {} the header announces (found '{t}')",
                    self.info.value_count()
                ),
            ));
        }
        Ok(want)
    }
}

/// What one scan of the buffer did.
struct Scan {
    consumed: usize,
    filled: usize,
    /// Line of the last value parsed.
    last_line: Option<usize>,
    /// Stopped at a token that may continue past the buffer (or at its end).
    needs_slow_path: bool,
    bad: Option<(usize, String)>,
}

/// Parses the whitespace-separated values wholly inside `buf` into `out`, counting
/// lines; stops before a token that touches the buffer's end.
#[inline]
fn scan_values(buf: &[u8], out: &mut [f64], line: &mut usize) -> Scan {
    let mut i = 0;
    let mut filled = 0;
    let mut last_line = None;
    while filled < out.len() {
        while i < buf.len() && is_space(buf[i]) {
            *line += (buf[i] == b'\n') as usize;
            i += 1;
        }
        let start = i;
        while i < buf.len() && !is_space(buf[i]) {
            i += 1;
        }
        if i - start > MAX_TOKEN {
            return Scan {
                consumed: i,
                filled,
                last_line,
                needs_slow_path: false,
                bad: Some((*line, "an entry is too long to be a number".into())),
            };
        }
        if i == buf.len() {
            return Scan {
                consumed: start,
                filled,
                last_line,
                needs_slow_path: true,
                bad: None,
            };
        }
        match parse_finite(&buf[start..i]) {
            Ok(v) => out[filled] = v,
            Err(m) => {
                return Scan {
                    consumed: i,
                    filled,
                    last_line,
                    needs_slow_path: false,
                    bad: Some((*line, m)),
                };
            }
        }
        last_line = Some(*line);
        filled += 1;
    }
    Scan {
        consumed: i,
        filled,
        last_line,
        needs_slow_path: false,
        bad: None,
    }
}
