//! Streaming cube writer: header first, then slabs formatted in parallel into
//! fixed-width slots (every value is 13 bytes, every line six values) and written in
//! order by the calling thread while the next slabs are evaluated, so memory stays
//! bounded for any grid.

use std::io::Write;

use super::format::{NotFinite, e13_bits, pow10, push_e13};
use crate::error::{Error, Result};
use crate::grid::{GridBox, Slab, stream_slots};

/// Values on one line, as is usual for the layout.
pub const PER_LINE: usize = 6;
/// Width of one formatted value.
pub const WIDTH: usize = 13;

#[derive(Debug, Clone, PartialEq)]
pub struct CubeAtom {
    pub atomic_number: u32,
    pub charge: f64,
    /// Position in bohr.
    pub position: [f64; 3],
}

#[derive(Debug, Clone, PartialEq)]
pub struct CubeHeader {
    pub title: String,
    pub comment: String,
    pub atoms: Vec<CubeAtom>,
    pub grid: GridBox,
    /// `Some` writes the multi-orbital variant (negative atom count and an index line
    /// listing one number per stored field); `None` a single field.
    pub orbital_numbers: Option<Vec<usize>>,
}

impl CubeHeader {
    pub fn field_count(&self) -> usize {
        self.orbital_numbers.as_ref().map_or(1, Vec::len)
    }

    /// Refuses, before anything is written, a header whose numbers would not keep
    /// the fixed layout: each length is written `%12.6f`, which leaves a separating
    /// space only below 1000 bohr in magnitude for negative values (10 000 for
    /// positive ones); a larger origin, step or position would run into its
    /// neighbour and no reader could split the line.
    pub fn check_fits(&self) -> Result<()> {
        let g = &self.grid;
        let mut numbers: Vec<(String, f64)> = Vec::new();
        for (d, x) in ["x", "y", "z"].iter().zip(g.origin) {
            numbers.push((format!("the origin's {d}"), x));
        }
        for (i, a) in g.axes.iter().enumerate() {
            for (d, x) in ["x", "y", "z"].iter().zip(a) {
                numbers.push((format!("step vector {} ({d})", i + 1), *x));
            }
        }
        for (i, a) in self.atoms.iter().enumerate() {
            for (d, x) in ["x", "y", "z"].iter().zip(a.position) {
                numbers.push((format!("atom {}'s {d}", i + 1), x));
            }
        }
        for (what, x) in numbers {
            let text = format!("{x:12.6}");
            if !x.is_finite() || !text.starts_with(' ') {
                return Err(Error::input(format!(
                    "{what} is {x:.6e} bohr, which the cube layout (12 columns, 6 decimals) cannot hold: lengths must lie between -999.999999 and 9999.999999 bohr"
                ))
                .with_hint("move the molecule near the origin, or use a smaller --padding or --spacing"));
            }
        }
        Ok(())
    }

    /// The header text. Lengths in bohr, hence positive voxel counts.
    pub fn text(&self) -> String {
        let one_line = |s: &str| s.replace(['\r', '\n'], " ");
        let mut t = format!("{}\n{}\n", one_line(&self.title), one_line(&self.comment));
        let n = self.atoms.len() as i64;
        let o = self.grid.origin;
        let count = if self.orbital_numbers.is_some() {
            -n
        } else {
            n
        };
        t += &format!("{count:5}{:12.6}{:12.6}{:12.6}", o[0], o[1], o[2]);
        // Several fields: also the optional value-count column, which readers such as
        // ASE use to know how many values each point holds.
        if self.orbital_numbers.is_some() {
            t += &format!("{:5}", self.field_count());
        }
        t += "\n";
        for (c, a) in self.grid.counts.iter().zip(&self.grid.axes) {
            t += &format!("{c:5}{:12.6}{:12.6}{:12.6}\n", a[0], a[1], a[2]);
        }
        for a in &self.atoms {
            let p = a.position;
            t += &format!(
                "{:5}{:12.6}{:12.6}{:12.6}{:12.6}\n",
                a.atomic_number, a.charge, p[0], p[1], p[2]
            );
        }
        if let Some(nums) = &self.orbital_numbers {
            t += &format!("{:5}", nums.len());
            // " {k:4}" is "{k:5}" below 10 000 and still separated above it.
            for k in nums {
                t += &format!(" {k:4}");
            }
            t += "\n";
        }
        t
    }

    /// Values in one innermost row (all k, every field).
    fn row_len(&self) -> usize {
        self.grid.counts[2] * self.field_count()
    }

    /// Bytes of one formatted row: 13 per value and a new line per line of six.
    fn row_bytes(&self) -> u64 {
        let row = self.row_len() as u64;
        row * WIDTH as u64 + row.div_ceil(PER_LINE as u64)
    }

    /// Exact size of the file this header and its values make, in bytes.
    pub fn predicted_bytes(&self) -> u64 {
        let rows = (self.grid.counts[0] * self.grid.counts[1]) as u64;
        self.text().len() as u64 + rows * self.row_bytes()
    }
}

/// Formats one slab's values: rows of `row_len` values, six per line, a new line
/// after each row. A value that is not finite is refused: its position in `values`
/// and the value are returned, and the buffer is incomplete.
pub fn format_slab(
    values: &[f64],
    row_len: usize,
    buf: &mut Vec<u8>,
) -> std::result::Result<(), (usize, f64)> {
    let mut at = 0;
    for row in values.chunks(row_len) {
        for line in row.chunks(PER_LINE) {
            for &v in line {
                push_e13(buf, v).map_err(|NotFinite(v)| (at, v))?;
                at += 1;
            }
            buf.push(b'\n');
        }
    }
    Ok(())
}

/// The error for a value that cannot be written, at grid point `point` (in cube
/// order) and stored field `field` (from 0).
pub fn not_finite_error(grid: &GridBox, point: usize, field: usize, v: f64) -> Error {
    let [_, ny, nz] = grid.counts;
    let (i, j, k) = (point / (ny * nz), point / nz % ny, point % nz);
    Error::input(format!(
        "the value at grid point ({}, {}, {}) of field {} is {v}, which a cube file cannot \
         hold; nothing was written",
        i + 1,
        j + 1,
        k + 1,
        field + 1
    ))
}

/// Formats one slab's values into `out`, which must hold exactly their formatted
/// bytes: the same bytes as [`format_slab`], written into fixed 13-byte slots.
pub fn format_slab_into(
    values: &[f64],
    row_len: usize,
    out: &mut [u8],
) -> std::result::Result<(), (usize, f64)> {
    let pow = pow10();
    let mut p = 0;
    let mut at = 0;
    for row in values.chunks(row_len) {
        for line in row.chunks(PER_LINE) {
            for &v in line {
                let text = e13_bits(v, pow).map_err(|NotFinite(v)| (at, v))?;
                // One 16-byte store where the slot has room; its last three bytes
                // are overwritten by what follows.
                match out.get_mut(p..p + 16) {
                    Some(wide) => wide.copy_from_slice(&text.to_le_bytes()),
                    None => out[p..p + WIDTH].copy_from_slice(&text.to_le_bytes()[..WIDTH]),
                }
                p += WIDTH;
                at += 1;
            }
            out[p] = b'\n';
            p += 1;
        }
    }
    debug_assert_eq!(p, out.len(), "the slot holds exactly the slab's bytes");
    Ok(())
}

/// Writes header and values. `eval` fills interleaved values (points × fields);
/// `progress` is told after every slab. A value that is not finite stops the writing
/// with an input error before its slab is written (the caller's temporary file is
/// then discarded). Slabs reach `out` in batches of several, in order; a gzip
/// [`super::sink::CubeSink`] compresses them in parallel.
pub fn write_streaming<W, E>(
    header: &CubeHeader,
    eval: E,
    out: &mut W,
    progress: &dyn Fn(usize),
) -> Result<()>
where
    W: Write,
    E: Fn(&Slab, &mut [f64]) + Sync,
{
    let io = |e: std::io::Error| Error::io("writing the cube file", e);
    out.write_all(header.text().as_bytes()).map_err(io)?;
    let row_len = header.row_len();
    let fields = header.field_count();
    let [_, ny, nz] = header.grid.counts;
    let slab_bytes = usize::try_from(header.row_bytes())
        .ok()
        .and_then(|r| r.checked_mul(ny))
        .ok_or_else(|| Error::input("one slab of the grid is too large to hold in memory"))?;
    stream_slots(
        &header.grid,
        fields,
        slab_bytes,
        eval,
        |i, values, slot| {
            format_slab_into(values, row_len, slot).map_err(|(at, v)| {
                not_finite_error(&header.grid, i * ny * nz + at / fields, at % fields, v)
            })
        },
        |slabs, bytes| {
            out.write_all(bytes).map_err(io)?;
            slabs.for_each(|i| progress(i + 1));
            Ok(())
        },
    )?;
    out.flush().map_err(io)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::error::Kind;

    /// The slot formatter (16-byte stores, the last value of a slab stored in 13)
    /// writes the same bytes as `push_e13` appending one value at a time, for rows
    /// of several lengths and values of every exponent, sign, zero and the extremes.
    #[test]
    fn slots_hold_the_appended_bytes() {
        let mut seed = 0x2545_f491_4f6c_dd1du64;
        let mut values: Vec<f64> = vec![0.0, -0.0, 1e-320, -7.3e-122, 9.999996e99, -f64::MAX];
        while values.len() < 5000 {
            seed ^= seed << 13;
            seed ^= seed >> 7;
            seed ^= seed << 17;
            values.push(f64::from_bits(
                seed & !(0x7ff << 52) | ((seed >> 3) % 0x7ff) << 52,
            ));
        }
        for row_len in [1, 5, 6, 7, 13, 100] {
            let n = values.len() / row_len * row_len;
            let mut appended = Vec::new();
            format_slab(&values[..n], row_len, &mut appended).unwrap();
            let mut slot = vec![0u8; appended.len()];
            format_slab_into(&values[..n], row_len, &mut slot).unwrap();
            assert_eq!(slot, appended, "row length {row_len}");
        }
    }

    /// A writer that fails like a full disk.
    struct Full;
    impl Write for Full {
        fn write(&mut self, _: &[u8]) -> std::io::Result<usize> {
            Err(std::io::Error::new(
                std::io::ErrorKind::StorageFull,
                "no space left on device",
            ))
        }
        fn flush(&mut self) -> std::io::Result<()> {
            Ok(())
        }
    }

    /// A failed write is the environment's fault (exit 1), with the OS reason kept
    /// as the source, not the user's (exit 2).
    #[test]
    fn a_failed_write_is_an_environment_error_with_its_source() {
        let header = CubeHeader {
            title: "t".into(),
            comment: "c".into(),
            atoms: Vec::new(),
            grid: GridBox {
                origin: [0.0; 3],
                axes: [[0.5, 0.0, 0.0], [0.0, 0.5, 0.0], [0.0, 0.0, 0.5]],
                counts: [2, 2, 2],
            },
            orbital_numbers: None,
        };
        let e = write_streaming(&header, |_, v| v.fill(1.0), &mut Full, &|_| {}).unwrap_err();
        assert_eq!(e.kind, Kind::Environment);
        assert_eq!(e.kind.exit_status(), 1);
        assert!(std::error::Error::source(&e).is_some());
    }
}
