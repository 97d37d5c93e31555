//! File formats, one file each, each opening with its layout and its specification.

pub mod png;
