//! Where cube text goes: a plain buffered file, or gzip when the destination's name
//! ends in `.gz`. Kept apart so every writer of cube files gets compression alike.
//!
//! Gzip output is compressed in parallel: the text is cut into fixed-size chunks and
//! each chunk becomes an independent gzip member (RFC 1952 §2.2 allows any number of
//! members, and readers decompress them as one stream: Python's `gzip`, zlib's
//! `gunzip`, and our own reader with `MultiGzDecoder`). Members are written in order.

use std::io::{BufWriter, Write};
use std::path::Path;

use flate2::write::GzEncoder;
use rayon::prelude::*;

use crate::error::{Error, Result};

/// Uncompressed bytes per gzip member: large enough that the per-member cost (an
/// 18-byte frame and a fresh 32 KiB deflate window) is negligible, small enough that
/// a few slabs make work for every thread.
pub const MEMBER_BYTES: usize = 1 << 20;

/// A destination for cube text; call `finish` to complete the gzip stream.
pub enum CubeSink<'a> {
    Plain(BufWriter<&'a mut dyn Write>),
    Gzip(ParallelGz<BufWriter<&'a mut dyn Write>>),
}

/// True for names that ask for gzip compression.
pub fn wants_gzip(path: &Path) -> bool {
    path.extension()
        .is_some_and(|e| e.eq_ignore_ascii_case("gz"))
}

impl<'a> CubeSink<'a> {
    /// Gzip at level 1: cube text still shrinks about threefold, and higher levels
    /// cost several times the time of formatting the numbers.
    pub fn new(file: &'a mut dyn Write, dest: &Path) -> Self {
        let w = BufWriter::with_capacity(1 << 20, file);
        if wants_gzip(dest) {
            CubeSink::Gzip(ParallelGz::new(w, flate2::Compression::fast()))
        } else {
            CubeSink::Plain(w)
        }
    }

    /// Flushes everything, writing the last gzip member.
    pub fn finish(self) -> Result<()> {
        let io = |e: std::io::Error| Error::io("writing the cube file", e);
        match self {
            CubeSink::Plain(mut w) => w.flush().map_err(io),
            CubeSink::Gzip(g) => g.finish().map_err(io)?.flush().map_err(io),
        }
    }
}

impl Write for CubeSink<'_> {
    fn write(&mut self, buf: &[u8]) -> std::io::Result<usize> {
        match self {
            CubeSink::Plain(w) => w.write(buf),
            CubeSink::Gzip(w) => w.write(buf),
        }
    }

    fn write_all(&mut self, buf: &[u8]) -> std::io::Result<()> {
        match self {
            CubeSink::Plain(w) => w.write_all(buf),
            CubeSink::Gzip(w) => w.write_all(buf),
        }
    }

    fn flush(&mut self) -> std::io::Result<()> {
        match self {
            CubeSink::Plain(w) => w.flush(),
            CubeSink::Gzip(w) => w.flush(),
        }
    }
}

/// A gzip writer that compresses fixed-size chunks as independent members on rayon's
/// pool. It holds at most `group` chunks plus one incoming write before compressing,
/// so memory is bounded by the writes it is given. `flush` only flushes whole
/// members already written (a partial chunk stays until more text or `finish`).
pub struct ParallelGz<W: Write> {
    out: W,
    level: flate2::Compression,
    pending: Vec<u8>,
    /// Chunks gathered before compressing them together.
    group: usize,
    members: u64,
}

impl<W: Write> ParallelGz<W> {
    pub fn new(out: W, level: flate2::Compression) -> Self {
        ParallelGz {
            out,
            level,
            pending: Vec::new(),
            group: (2 * rayon::current_num_threads()).max(2),
            members: 0,
        }
    }

    /// Members written so far.
    pub fn members(&self) -> u64 {
        self.members
    }

    /// Compresses the whole chunks in `pending` (and the partial last one when `all`)
    /// in parallel and writes the members in order.
    fn compress(&mut self, all: bool) -> std::io::Result<()> {
        let whole = self.pending.len() / MEMBER_BYTES * MEMBER_BYTES;
        let end = if all { self.pending.len() } else { whole };
        if end == 0 {
            return Ok(());
        }
        let level = self.level;
        let members: Vec<std::io::Result<Vec<u8>>> = self.pending[..end]
            .par_chunks(MEMBER_BYTES)
            .map(|chunk| {
                let mut gz = GzEncoder::new(Vec::with_capacity(chunk.len() / 2), level);
                gz.write_all(chunk)?;
                gz.finish()
            })
            .collect();
        for m in members {
            self.out.write_all(&m?)?;
            self.members += 1;
        }
        self.pending.drain(..end);
        Ok(())
    }

    /// Compresses what is left (an empty input still gets one empty member, so the
    /// file is valid gzip) and returns the inner writer.
    pub fn finish(mut self) -> std::io::Result<W> {
        self.compress(true)?;
        if self.members == 0 {
            let gz = GzEncoder::new(Vec::new(), self.level);
            self.out.write_all(&gz.finish()?)?;
            self.members = 1;
        }
        Ok(self.out)
    }
}

impl<W: Write> Write for ParallelGz<W> {
    fn write(&mut self, buf: &[u8]) -> std::io::Result<usize> {
        self.pending.extend_from_slice(buf);
        if self.pending.len() >= self.group * MEMBER_BYTES {
            self.compress(false)?;
        }
        Ok(buf.len())
    }

    fn flush(&mut self) -> std::io::Result<()> {
        self.out.flush()
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use std::io::Read;

    /// Several members, and the multi-member decoder (flate2's, which follows RFC
    /// 1952's member concatenation) gives back exactly the input.
    #[test]
    fn members_concatenate_to_the_input() {
        let text: Vec<u8> = (0..3 * MEMBER_BYTES + 12345)
            .map(|i| b"0123456789 E+-\n"[(i * 7 + i / 13) % 15])
            .collect();
        let mut gz = ParallelGz::new(Vec::new(), flate2::Compression::fast());
        for piece in text.chunks(700_001) {
            gz.write_all(piece).unwrap();
        }
        let file = gz.finish().unwrap();
        let mut back = Vec::new();
        flate2::read::MultiGzDecoder::new(&file[..])
            .read_to_end(&mut back)
            .unwrap();
        assert!(back == text, "decompressed bytes differ from the input");
        // A single-member decoder stops after the first member: there are several.
        let mut first = Vec::new();
        flate2::read::GzDecoder::new(&file[..])
            .read_to_end(&mut first)
            .unwrap();
        assert_eq!(first.len(), MEMBER_BYTES);
    }

    #[test]
    fn empty_input_is_one_empty_member() {
        let file = ParallelGz::new(Vec::new(), flate2::Compression::fast())
            .finish()
            .unwrap();
        let mut back = Vec::new();
        flate2::read::MultiGzDecoder::new(&file[..])
            .read_to_end(&mut back)
            .unwrap();
        assert!(back.is_empty() && file.starts_with(&[0x1f, 0x8b]));
    }
}
