//! The cube volumetric format. It has no formal specification; the de-facto standard
//! layout, which every reader we know of accepts, is: two comment lines; the atom
//! count (negative when an orbital-index line follows the atoms) and the origin; three
//! axis lines (point count, negative for ångström, and step vector); one line per
//! atom (Z, charge, x y z); the optional orbital-index line; then the values, x
//! slowest and z fastest, six `%13.5E` numbers to a line. What we accept beyond that
//! and what we write exactly is in `reader.rs`, `writer.rs` and the README.

pub mod arith;
pub mod format;
mod header;
pub mod number;
pub mod reader;
pub mod sink;
pub mod stats;
pub mod volume;
pub mod writer;

pub use header::header_for;
pub use reader::{CubeInfo, CubeReader};
pub use volume::Volume;
pub use writer::{CubeAtom, CubeHeader, write_streaming};

/// The pipelined writer against a sequential reference built from the plain
/// formatter, byte for byte, and its behaviour when writing fails.
#[cfg(test)]
mod pipeline_tests {
    use std::io::{Read, Write};
    use std::sync::atomic::{AtomicUsize, Ordering};

    use super::writer::{CubeHeader, format_slab, write_streaming};
    use crate::error::Kind;
    use crate::grid::{GridBox, Slab};

    fn header(fields: usize, skewed: bool, nx: usize) -> CubeHeader {
        let axes = if skewed {
            [[0.3, 0.05, 0.0], [0.1, 0.25, 0.0], [0.02, -0.04, 0.2]]
        } else {
            [[0.3, 0.0, 0.0], [0.0, 0.25, 0.0], [0.0, 0.0, 0.2]]
        };
        CubeHeader {
            title: "t".into(),
            comment: "c".into(),
            atoms: Vec::new(),
            grid: GridBox {
                origin: [-1.5, -1.0, -0.7],
                axes,
                counts: [nx, 7, 5],
            },
            orbital_numbers: (fields > 1).then(|| (1..=fields).collect()),
        }
    }

    /// Values of every sign and many magnitudes (and exact zeros) from the points.
    fn eval(fields: usize) -> impl Fn(&Slab, &mut [f64]) + Sync {
        move |slab, out| {
            for (p, v) in slab
                .points(&mut Vec::new())
                .iter()
                .zip(out.chunks_mut(fields))
            {
                for (f, x) in v.iter_mut().enumerate() {
                    let s = (p[0] * 3.1 + p[1] * 1.7 - p[2] * (f as f64 + 0.5)).sin();
                    *x = if s.abs() < 0.05 {
                        0.0
                    } else {
                        s * 10f64.powf(8.0 * p[2] - 2.0)
                    };
                }
            }
        }
    }

    /// The reference: header, then each slab's points, values and `format_slab`
    /// (push_e13, the formatter checked against the standard library) in order.
    fn reference(h: &CubeHeader, fields: usize) -> Vec<u8> {
        let mut bytes = h.text().into_bytes();
        let mut points = Vec::new();
        for i in 0..h.grid.counts[0] {
            h.grid.slab_points(i, &mut points);
            let mut values = vec![0.0; points.len() * fields];
            eval(fields)(&Slab::new(&points, None), &mut values);
            format_slab(&values, h.grid.counts[2] * fields, &mut bytes).unwrap();
        }
        bytes
    }

    #[test]
    fn the_pipeline_writes_the_sequential_bytes() {
        for fields in [1, 2, 5] {
            for skewed in [false, true] {
                let h = header(fields, skewed, 23);
                let mut got = Vec::new();
                let last = AtomicUsize::new(0);
                write_streaming(&h, eval(fields), &mut got, &|d| {
                    last.store(d, Ordering::SeqCst)
                })
                .unwrap();
                let want = reference(&h, fields);
                assert!(
                    got == want,
                    "{fields} field(s), skewed {skewed}: bytes differ"
                );
                assert_eq!(got.len() as u64, h.predicted_bytes());
                assert_eq!(
                    last.load(Ordering::SeqCst),
                    23,
                    "progress reaches every slab"
                );
                // The same text through the parallel gzip sink, several members.
                let mut file = Vec::new();
                let mut sink = super::sink::CubeSink::new(&mut file, "x.cube.gz".as_ref());
                write_streaming(&h, eval(fields), &mut sink, &|_| {}).unwrap();
                sink.finish().unwrap();
                let mut back = Vec::new();
                flate2::read::MultiGzDecoder::new(&file[..])
                    .read_to_end(&mut back)
                    .unwrap();
                assert!(
                    back == want,
                    "{fields} field(s), skewed {skewed}: gzip differs"
                );
            }
        }
    }

    /// Accepts `left` bytes, then fails like a full disk.
    struct FullAfter(usize);
    impl Write for FullAfter {
        fn write(&mut self, buf: &[u8]) -> std::io::Result<usize> {
            if self.0 == 0 {
                return Err(std::io::ErrorKind::StorageFull.into());
            }
            let n = buf.len().min(self.0);
            self.0 -= n;
            Ok(n)
        }
        fn flush(&mut self) -> std::io::Result<()> {
            Ok(())
        }
    }

    /// A disk that fills up mid-way: the environment error comes back, and the
    /// producer stops within the few batches in flight instead of evaluating the box.
    #[test]
    fn a_write_failing_mid_way_stops_the_workers() {
        let h = header(1, false, 400);
        let slabs = AtomicUsize::new(0);
        let counting = |s: &Slab, v: &mut [f64]| {
            slabs.fetch_add(1, Ordering::SeqCst);
            eval(1)(s, v)
        };
        let mut out = FullAfter(h.text().len() + 5000);
        let e = write_streaming(&h, counting, &mut out, &|_| {}).unwrap_err();
        assert_eq!(e.kind, Kind::Environment);
        let batch = 2 * rayon::current_num_threads().max(1);
        let evaluated = slabs.load(Ordering::SeqCst);
        assert!(
            evaluated <= 4 * batch,
            "{evaluated} slabs evaluated after the failure"
        );
    }

    /// A value that cannot be written: the slabs before it are written, then the
    /// input error names its grid point (slab 18, point (2, 3) of that slab).
    #[test]
    fn a_non_finite_value_stops_before_its_slab() {
        let h = header(2, true, 23);
        let bad = h.grid.point(17, 2, 3);
        let with_nan = |s: &Slab, v: &mut [f64]| {
            eval(2)(s, v);
            if let Some(p) = s.points(&mut Vec::new()).iter().position(|p| *p == bad) {
                v[2 * p + 1] = f64::NAN;
            }
        };
        let mut got = Vec::new();
        let e = write_streaming(&h, with_nan, &mut got, &|_| {}).unwrap_err();
        assert_eq!(e.kind, Kind::Input);
        assert!(e.to_string().contains("(18, 3, 4) of field 2"), "{e}");
        let want = reference(&h, 2);
        let slab = (want.len() - h.text().len()) / 23;
        assert!(got.len() <= h.text().len() + 17 * slab && want.starts_with(&got));
    }

    /// A cube of several gzip members (about 3 MB of text, 1 MiB per member) reads
    /// back through our own reader as the same values as the plain file.
    #[test]
    fn our_reader_reads_multi_member_gzip() {
        let mut h = header(1, false, 60);
        h.grid.counts = [60, 60, 60];
        let mut plain = Vec::new();
        write_streaming(&h, eval(1), &mut plain, &|_| {}).unwrap();
        let mut gz = Vec::new();
        let mut sink = super::sink::CubeSink::new(&mut gz, "x.cube.gz".as_ref());
        write_streaming(&h, eval(1), &mut sink, &|_| {}).unwrap();
        sink.finish().unwrap();
        // Count members: a bufread decoder stops at its member's end.
        let (mut rest, mut members) = (&gz[..], 0);
        while !rest.is_empty() {
            let mut d = flate2::bufread::GzDecoder::new(rest);
            std::io::copy(&mut d, &mut std::io::sink()).unwrap();
            rest = d.into_inner();
            members += 1;
        }
        assert!(members >= 3, "{members} gzip member(s)");
        let values = |bytes: Vec<u8>| {
            let mut r = super::CubeReader::new(std::io::Cursor::new(bytes), None, "t").unwrap();
            let mut v = vec![0.0; 60 * 60 * 60];
            assert_eq!(r.read_values(&mut v).unwrap(), v.len());
            v
        };
        assert!(values(gz) == values(plain), "values differ");
    }
}
