//! A plotters drawing backend on our canvas: plotters lays out the charts (ranges,
//! ticks, meshes, legends); the canvas draws them anti-aliased, with text in the
//! embedded font and the same `^{…}` / `_{…}` markup as the slice figures.

use plotters_backend::text_anchor::{HPos, VPos};
use plotters_backend::{
    BackendColor, BackendCoord, BackendStyle, BackendTextStyle, DrawingBackend, DrawingErrorKind,
    FontTransform,
};

use crate::render::canvas::{Canvas, Colour, HAlign, VAlign};
use crate::render::text;

/// Scale plotters' font sizes (its "px") to ours so text reads at the size asked for.
const FONT_SCALE: f32 = 1.0;

pub struct CanvasBackend<'a> {
    pub canvas: &'a mut Canvas,
}

#[derive(Debug)]
pub struct Never;

impl std::fmt::Display for Never {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str("canvas drawing cannot fail")
    }
}

impl std::error::Error for Never {}

fn colour(c: BackendColor) -> Colour {
    Colour {
        r: c.rgb.0,
        g: c.rgb.1,
        b: c.rgb.2,
        a: (c.alpha.clamp(0.0, 1.0) * 255.0).round() as u8,
    }
}

fn pt(p: BackendCoord) -> (f32, f32) {
    (p.0 as f32, p.1 as f32)
}

type Res = Result<(), DrawingErrorKind<Never>>;

impl DrawingBackend for CanvasBackend<'_> {
    type ErrorType = Never;

    fn get_size(&self) -> (u32, u32) {
        (self.canvas.width(), self.canvas.height())
    }

    fn ensure_prepared(&mut self) -> Res {
        Ok(())
    }

    fn present(&mut self) -> Res {
        Ok(())
    }

    fn draw_pixel(&mut self, p: BackendCoord, c: BackendColor) -> Res {
        self.canvas.blend(p.0, p.1, colour(c), 1.0);
        Ok(())
    }

    fn draw_line<S: BackendStyle>(&mut self, from: BackendCoord, to: BackendCoord, s: &S) -> Res {
        // Integer coordinates sit on pixel corners; half a pixel puts 1-px lines on
        // pixel centres so they stay crisp.
        let o = if s.stroke_width() % 2 == 1 { 0.5 } else { 0.0 };
        let (a, b) = (pt(from), pt(to));
        self.canvas.stroke(
            &[(a.0 + o, a.1 + o), (b.0 + o, b.1 + o)],
            s.stroke_width().max(1) as f32,
            colour(s.color()),
            None,
        );
        Ok(())
    }

    fn draw_rect<S: BackendStyle>(
        &mut self,
        ul: BackendCoord,
        br: BackendCoord,
        s: &S,
        fill: bool,
    ) -> Res {
        let (x0, y0) = pt(ul);
        let (x1, y1) = pt(br);
        if fill {
            self.canvas
                .fill_rect(x0, y0, x1 - x0 + 1.0, y1 - y0 + 1.0, colour(s.color()));
        } else {
            let w = s.stroke_width().max(1) as f32;
            self.canvas
                .stroke_rect(x0 + 0.5, y0 + 0.5, x1 - x0, y1 - y0, w, colour(s.color()));
        }
        Ok(())
    }

    fn draw_path<S: BackendStyle, I: IntoIterator<Item = BackendCoord>>(
        &mut self,
        path: I,
        s: &S,
    ) -> Res {
        let pts: Vec<(f32, f32)> = path.into_iter().map(pt).collect();
        self.canvas.stroke(
            &pts,
            s.stroke_width().max(1) as f32,
            colour(s.color()),
            None,
        );
        Ok(())
    }

    fn draw_circle<S: BackendStyle>(&mut self, c: BackendCoord, r: u32, s: &S, fill: bool) -> Res {
        let col = colour(s.color());
        let (x, y) = pt(c);
        if fill {
            self.canvas.circle(x, y, r as f32, col, col, 0.0);
        } else {
            let w = s.stroke_width().max(1) as f32;
            self.canvas
                .circle(x, y, r as f32, Colour::TRANSPARENT, col, w);
        }
        Ok(())
    }

    fn draw_text<T: BackendTextStyle>(&mut self, t: &str, style: &T, pos: BackendCoord) -> Res {
        let size = style.size() as f32 * FONT_SCALE;
        let a = style.anchor();
        let h = match a.h_pos {
            HPos::Left => HAlign::Left,
            HPos::Center => HAlign::Centre,
            HPos::Right => HAlign::Right,
        };
        let v = match a.v_pos {
            VPos::Top => VAlign::Top,
            VPos::Center => VAlign::Middle,
            VPos::Bottom => VAlign::Bottom,
        };
        let (x, y) = pt(pos);
        let c = colour(style.color());
        match style.transform() {
            FontTransform::Rotate270 => self.canvas.text_up(t, size, x, y, (h, v), c),
            FontTransform::Rotate90 => self.canvas.text_down(t, size, x, y, (h, v), c),
            _ => self.canvas.text(t, size, x, y, (h, v), c),
        }
        Ok(())
    }

    fn estimate_text_size<T: BackendTextStyle>(
        &self,
        t: &str,
        style: &T,
    ) -> Result<(u32, u32), DrawingErrorKind<Never>> {
        let e = text::measure(t, style.size() as f32 * FONT_SCALE);
        Ok((e.width.ceil() as u32, e.height().ceil() as u32))
    }
}
