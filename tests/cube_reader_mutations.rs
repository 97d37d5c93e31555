//! Mutation testing of the reader: valid files in each variant, changed byte by byte
//! (replaced, inserted, deleted bytes, and cut short), must give a value or an input
//! error, never a panic, and reading must end (the reader is a single forward pass).
//! Cases per property: LOBECAST_MUTATION_CASES (default 1000); `.ci/run` runs more.

use std::io::{Cursor, Write};

use lobecast::io::cube::stats::summarize;
use lobecast::io::cube::{CubeReader, Volume};
use proptest::prelude::*;

const SINGLE: &str = "title\ncomment\n    2   -1.000000   -1.000000   -1.000000\n\
    \x20   3    1.000000    0.000000    0.000000\n    2    0.000000    1.000000    0.000000\n\
    \x20   2    0.100000    0.000000    1.000000\n    1    1.000000    0.000000    0.000000   -0.700000\n\
    \x20   1    1.000000    0.000000    0.000000    0.700000\n\
    \x20 1.00000E-01 -2.50000E-02  3.00000E+00  4.00000E-05  5.00000E+00  6.00000E+00\n\
    \x20 7.00000E+00  8.00000E+00  9.00000E+00  1.00000E+01  1.10000E+01 -1.20000E+01\n";

const MULTI_ANGSTROM: &str = "multi\r\nfield\r\n   -1    0.0    0.0    0.0    2\r\n\
    \x20  -2    0.5    0.0    0.0\r\n   -2    0.0    0.5    0.0\r\n   -1    0.0    0.0    0.5\r\n\
    \x20   8    8.0    0.0    0.0    0.0\r\n    2\r\n    4\r\n    5\r\n\
    1.0D-01 2.0d-02 3e0 4E1\r\n5 6 7 8\r\n";

fn cases() -> u32 {
    std::env::var("LOBECAST_MUTATION_CASES")
        .ok()
        .and_then(|s| s.parse().ok())
        .unwrap_or(1000)
}

fn gzip(text: &str) -> Vec<u8> {
    let mut gz = flate2::write::GzEncoder::new(Vec::new(), flate2::Compression::default());
    gz.write_all(text.as_bytes()).unwrap();
    gz.finish().unwrap()
}

#[derive(Debug, Clone)]
enum Edit {
    Replace(usize, u8),
    Insert(usize, u8),
    Delete(usize),
    Truncate(usize),
}

/// Bytes likely to matter to a cube parser, and any byte at all.
fn byte() -> impl Strategy<Value = u8> {
    prop_oneof![
        prop::sample::select(b"0123456789-+.eEdD \t\r\n#xN\x00\xff".to_vec()),
        any::<u8>(),
    ]
}

fn edit() -> impl Strategy<Value = Edit> {
    prop_oneof![
        4 => (any::<usize>(), byte()).prop_map(|(p, b)| Edit::Replace(p, b)),
        3 => (any::<usize>(), byte()).prop_map(|(p, b)| Edit::Insert(p, b)),
        3 => any::<usize>().prop_map(Edit::Delete),
        1 => any::<usize>().prop_map(Edit::Truncate),
    ]
}

fn apply(mut bytes: Vec<u8>, edits: &[Edit]) -> Vec<u8> {
    for e in edits {
        let n = bytes.len().max(1);
        match *e {
            Edit::Replace(p, b) if !bytes.is_empty() => bytes[p % n] = b,
            Edit::Insert(p, b) => bytes.insert(p % (bytes.len() + 1), b),
            Edit::Delete(p) if !bytes.is_empty() => {
                bytes.remove(p % n);
            }
            Edit::Truncate(p) => bytes.truncate(p % n),
            _ => {}
        }
    }
    bytes
}

/// Reads the bytes both ways (into a Volume, and through the two-pass statistics);
/// any result is fine, a panic fails the property. An accepted file must also be
/// consistent: as many values as its header announces.
fn exercise(bytes: Vec<u8>) {
    let len = bytes.len() as u64;
    let open = || CubeReader::new(Cursor::new(bytes.clone()), Some(len), "mutant");
    match open().and_then(Volume::from_reader) {
        Ok(v) => assert_eq!(v.values.len(), v.info.value_count()),
        Err(e) => assert!(e.message.starts_with("mutant"), "{}", e.message),
    }
    let _ = summarize(&open, 0.9, None);
}

proptest! {
    #![proptest_config(ProptestConfig { cases: cases(), failure_persistence: None, ..ProptestConfig::default() })]

    #[test]
    fn mutated_text_never_panics(which in 0usize..2, edits in prop::collection::vec(edit(), 1..8)) {
        let base = [SINGLE, MULTI_ANGSTROM][which];
        exercise(apply(base.as_bytes().to_vec(), &edits));
    }

    #[test]
    fn mutated_gzip_never_panics(which in 0usize..2, edits in prop::collection::vec(edit(), 1..4)) {
        let base = [SINGLE, MULTI_ANGSTROM][which];
        exercise(apply(gzip(base), &edits));
    }
}

/// The unmutated bases are valid, so the properties test mutations of real files.
#[test]
fn bases_are_valid() {
    for (base, count) in [(SINGLE, 12), (MULTI_ANGSTROM, 8)] {
        let n = base.len() as u64;
        let v = Volume::from_reader(
            CubeReader::new(Cursor::new(base.as_bytes().to_vec()), Some(n), "b").unwrap(),
        )
        .unwrap();
        assert_eq!(v.values.len(), count);
        let g = gzip(base);
        let gl = g.len() as u64;
        assert!(CubeReader::new(Cursor::new(g), Some(gl), "b").is_ok());
    }
}
