//! Whole-canvas pixel work: shrinking a supersampled canvas, and the raster as an
//! image for encoding.

use tiny_skia::{Pixmap, PremultipliedColorU8};

use super::super::record::Op;
use super::Canvas;

impl Canvas {
    /// The canvas shrunk by an integer `factor`, each pixel the mean of a block:
    /// drawing large and shrinking smooths what was placed on whole pixels.
    pub fn downsample(&self, factor: u32) -> Canvas {
        let f = factor.max(1);
        let (w, h) = (self.width() / f, self.height() / f);
        let mut out = Pixmap::new(w.max(1), h.max(1)).expect("non-zero canvas");
        let src = self.pixmap.pixels();
        let sw = self.width() as usize;
        let n = f * f;
        for y in 0..h as usize {
            for x in 0..w as usize {
                let mut acc = [0u32; 4];
                for dy in 0..f as usize {
                    for dx in 0..f as usize {
                        let p = src[(y * f as usize + dy) * sw + x * f as usize + dx];
                        acc[0] += p.red() as u32;
                        acc[1] += p.green() as u32;
                        acc[2] += p.blue() as u32;
                        acc[3] += p.alpha() as u32;
                    }
                }
                let m = |v: u32| ((v + n / 2) / n) as u8;
                let a = m(acc[3]);
                out.pixels_mut()[y * w as usize + x] = PremultipliedColorU8::from_rgba(
                    m(acc[0]).min(a),
                    m(acc[1]).min(a),
                    m(acc[2]).min(a),
                    a,
                )
                .expect("valid premultiplied colour");
            }
        }
        let mut c = Canvas {
            pixmap: out,
            ops: Vec::new(),
            dirty: None,
        };
        // What was drawn large is, shrunk, pixels only.
        let image = c.to_image();
        c.ops.push(Op::Image { x: 0, y: 0, image });
        c
    }

    /// The pixels as a straight-alpha raster (tiny-skia keeps them premultiplied).
    pub fn to_image(&self) -> image::RgbaImage {
        let (w, h) = (self.pixmap.width(), self.pixmap.height());
        let mut raw = Vec::with_capacity(w as usize * h as usize * 4);
        for p in self.pixmap.pixels() {
            let c = p.demultiply();
            raw.extend_from_slice(&[c.red(), c.green(), c.blue(), c.alpha()]);
        }
        image::RgbaImage::from_raw(w, h, raw).expect("the raster has w·h pixels")
    }
}
