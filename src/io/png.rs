//! PNG files (W3C Portable Network Graphics, 2nd edition, ISO/IEC 15948:2004):
//! 8-bit straight-alpha RGBA, not interlaced, with
//! - `pHYs`: the resolution in pixels per metre, so a report's layout program
//!   places the figure at its intended physical size;
//! - `tEXt`: `Software` (program and version) and `Title` where a figure has one,
//!   Latin-1 keywords from the specification's list of predefined keywords;
//! - `iTXt` (UTF-8): `Comment` holding the command line that made the figure, so a
//!   figure in a report can be remade from the file alone.
//!
//! Every PNG lobecast writes is encoded here, through the `png` crate, from an
//! `image::RgbaImage` raster.

use image::RgbaImage;

use crate::error::{Error, Result};

/// Dots per inch recorded in `pHYs`: 300 is what journals commonly ask of raster
/// figures (common practice).
pub const DEFAULT_DPI: f64 = 300.0;
/// Accepted `--dpi` range: below 10 or above 10 000 is a typo, not a resolution.
pub const DPI_RANGE: (f64, f64) = (10.0, 10_000.0);

/// What a figure file says about itself besides its pixels.
#[derive(Debug, Clone)]
pub struct PngMeta {
    pub dpi: f64,
    pub title: Option<String>,
    /// The command line that made the figure.
    pub command: Option<String>,
}

impl Default for PngMeta {
    fn default() -> Self {
        PngMeta {
            dpi: DEFAULT_DPI,
            title: None,
            command: None,
        }
    }
}

/// The `Software` text written into every figure.
pub fn software() -> String {
    format!("lobecast {}", env!("CARGO_PKG_VERSION"))
}

/// Encodes `img` as a PNG file in memory.
pub fn encode(img: &RgbaImage, meta: &PngMeta) -> Result<Vec<u8>> {
    let fail = |e: png::EncodingError| Error::internal(format!("PNG encoding failed: {e}"));
    let mut out = Vec::new();
    {
        let mut enc = png::Encoder::new(&mut out, img.width(), img.height());
        enc.set_color(png::ColorType::Rgba);
        enc.set_depth(png::BitDepth::Eight);
        enc.set_compression(png::Compression::Balanced);
        let per_metre = (meta.dpi / 0.0254).round().clamp(1.0, u32::MAX as f64) as u32;
        enc.set_pixel_dims(Some(png::PixelDimensions {
            xppu: per_metre,
            yppu: per_metre,
            unit: png::Unit::Meter,
        }));
        enc.add_text_chunk("Software".into(), software())
            .map_err(fail)?;
        if let Some(t) = &meta.title {
            // tEXt is Latin-1: keep what fits, so the chunk stays valid.
            let latin1: String = t.chars().filter(|c| (*c as u32) < 256).collect();
            enc.add_text_chunk("Title".into(), latin1).map_err(fail)?;
        }
        if let Some(c) = &meta.command {
            enc.add_itxt_chunk("Comment".into(), c.clone())
                .map_err(fail)?;
        }
        let mut w = enc.write_header().map_err(fail)?;
        w.write_image_data(img.as_raw()).map_err(fail)?;
        w.finish().map_err(fail)?;
    }
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Round trip through the `png` crate's decoder: pixels, resolution and text.
    #[test]
    fn pixels_resolution_and_software_read_back() {
        let mut img = RgbaImage::new(3, 2);
        img.put_pixel(1, 1, image::Rgba([10, 200, 30, 128]));
        let meta = PngMeta {
            dpi: 150.0,
            title: Some("ψ₊ at R = 2 bohr".into()),
            command: Some("lobecast surface ψ.toml --field orbital:1".into()),
        };
        let bytes = encode(&img, &meta).unwrap();
        let dec = png::Decoder::new(std::io::Cursor::new(bytes));
        let mut r = dec.read_info().unwrap();
        let mut buf = vec![0; r.output_buffer_size().unwrap()];
        let frame = r.next_frame(&mut buf).unwrap();
        assert_eq!((frame.width, frame.height), (3, 2));
        assert_eq!(&buf[(3 + 1) * 4..(3 + 1) * 4 + 4], &[10, 200, 30, 128]);
        let info = r.info();
        let dims = info.pixel_dims.unwrap();
        // 150 dpi = 5905.5 px/m, rounded (PNG spec: pixels per unit, unit metre).
        assert_eq!((dims.xppu, dims.unit), (5906, png::Unit::Meter));
        let texts: Vec<_> = info
            .uncompressed_latin1_text
            .iter()
            .map(|t| (t.keyword.as_str(), t.text.as_str()))
            .collect();
        assert!(texts.contains(&("Software", software().as_str())));
        assert!(
            texts
                .iter()
                .any(|(k, v)| *k == "Title" && v.contains("at R = 2 bohr"))
        );
        let comment = info
            .utf8_text
            .iter()
            .find(|t| t.keyword == "Comment")
            .unwrap();
        assert_eq!(
            comment.get_text().unwrap(),
            "lobecast surface ψ.toml --field orbital:1"
        );
    }
}
