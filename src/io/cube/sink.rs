//! Where cube text goes: a plain buffered file, or gzip when the destination's name
//! ends in `.gz`. Kept apart so every writer of cube files gets compression alike.

use std::io::{BufWriter, Write};
use std::path::Path;

use flate2::write::GzEncoder;

use crate::error::{Error, Result};

/// A destination for cube text; call `finish` to complete the gzip stream.
pub enum CubeSink<'a> {
    Plain(BufWriter<&'a mut dyn Write>),
    Gzip(GzEncoder<BufWriter<&'a mut dyn Write>>),
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
            CubeSink::Gzip(GzEncoder::new(w, flate2::Compression::fast()))
        } else {
            CubeSink::Plain(w)
        }
    }

    /// Flushes everything, writing the gzip trailer.
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
