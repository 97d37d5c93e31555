//! Slice figures: one map per field on a common plane, each with contours, nuclei,
//! axes and a colour bar (or one shared bar), a title and a footnote. The layout is
//! computed first so that the field is evaluated exactly at the map's own pixels.

use crate::error::{Error, Result};
use crate::grid::plane::{PixelGrid, Plane, Window};

use super::axes::{self, Axes, LabelBox};
use super::canvas::{Canvas, Colour, HAlign, VAlign};
use super::colorbar::{self, Bar};
use super::contour::{self, Grid};
use super::nuclei;
use super::scale::{Kind, Mapping, Scale, mapping_for};
use super::text;

mod panel;
pub use panel::levels_for;
use panel::{PanelContext, draw_panel, draw_shared_bar};

/// One field to draw.
#[derive(Debug, Clone)]
pub struct Panel {
    /// Heading over the map when there are several (markup).
    pub heading: String,
    /// The quantity's symbol for the colour bar, e.g. "ψ_{1}" (markup).
    pub quantity: String,
    /// The symbol without the orbital number, e.g. "ψ", for a shared bar.
    pub family: String,
    pub unit: String,
    pub signed: bool,
    /// The field's largest |value| anywhere, when known: a map at or below
    /// `ZERO_RATIO` of it is drawn blank (the plane is a node of the field).
    pub largest: Option<f64>,
}

/// A nucleus as the figure shows it.
#[derive(Debug, Clone)]
pub struct Nucleus {
    pub symbol: String,
    /// 1-based, shown with `numbers`.
    pub number: usize,
    /// Position in the plane (bohr) and distance from it (bohr).
    pub u: f64,
    pub v: f64,
    pub distance: f64,
    /// Close enough to the plane to be drawn emphasised.
    pub near: bool,
}

#[derive(Debug, Clone)]
pub struct Figure {
    pub title: String,
    pub footnotes: Vec<String>,
    pub plane: Plane,
    pub window: Window,
    pub nuclei: Vec<Nucleus>,
    pub panels: Vec<Panel>,
    /// Footnote added when some samples have no value (NaN): they are hatched.
    pub gap_note: String,
}

#[derive(Debug, Clone, PartialEq)]
pub enum Contours {
    /// This many levels per sign, evenly spaced; 0 for none.
    Auto(usize),
    Levels(Vec<f64>),
}

#[derive(Debug, Clone)]
pub struct Style {
    /// Width of the whole figure in pixels, widened when maps would get narrower
    /// than `MIN_MAP`; text and margins keep their pixel sizes.
    pub width: u32,
    pub background: Colour,
    /// `None`: the default for each field's sign.
    pub scale: Option<Scale>,
    /// Logarithmic mapping over this many decades (non-negative fields only).
    pub log_decades: Option<f64>,
    /// The end of the colour scale (±limit for signed fields) instead of each
    /// map's largest |value|; values beyond take the end colours.
    pub limit: Option<f64>,
    pub contours: Contours,
    pub zero_contour: bool,
    pub nuclei: bool,
    pub numbers: bool,
    pub shared_scale: bool,
    /// Maps per row; 0 picks one (`columns_for`).
    pub columns: usize,
}

impl Default for Style {
    fn default() -> Self {
        Style {
            width: 1000,
            background: Colour::WHITE,
            scale: None,
            log_decades: None,
            limit: None,
            contours: Contours::Auto(4),
            zero_contour: false,
            nuclei: true,
            numbers: false,
            shared_scale: false,
            columns: 0,
        }
    }
}

/// Where things went, for callers and tests.
#[derive(Debug, Clone)]
pub struct Placed {
    pub x: u32,
    pub y: u32,
    pub width: u32,
    pub height: u32,
    pub mapping: Mapping,
}

pub struct Rendered {
    pub canvas: Canvas,
    pub grid: PixelGrid,
    pub maps: Vec<Placed>,
    pub bars: Vec<Placed>,
    /// The sampled values of each panel, row-major (row 0 at the top); NaN where the
    /// source has no value.
    pub values: Vec<Vec<f64>>,
    /// The largest finite |value| of each map (0 when it has none).
    pub peaks: Vec<f64>,
    /// Panels drawn blank because their field is zero on the plane.
    pub blank: Vec<bool>,
    /// The tick-label boxes of each map's axes, for layout checks.
    pub labels: Vec<Vec<LabelBox>>,
}

/// A map whose largest |value| is at most this fraction of the field's largest |value|
/// in space is zero on the plane up to rounding (double precision leaves about
/// 1e-16 of the terms summed; 1e-12 is far above that and far below any real lobe).
pub const ZERO_RATIO: f64 = 1e-12;

/// Maps are never narrower than this (px): the figure grows instead.
pub const MIN_MAP: f32 = 300.0;

/// Sizes in pixels, fixed whatever the figure's width: a wider figure gets larger
/// maps, not larger letters.
struct Sizes {
    title: f32,
    heading: f32,
    font: f32,
    foot: f32,
    margin: f32,
    left: f32,
    bottom: f32,
    bar: f32,
    gap: f32,
}

impl Sizes {
    fn new() -> Self {
        let font = 17.0;
        // Room left of a map for tick labels and the axis name; the bar's room holds
        // the gap, the bar, ticks, labels like "−0.3183" and the turned unit line.
        let label = text::measure("−00.00", font).width;
        let bar_labels = text::measure("−0.0000", font).width;
        Sizes {
            title: 24.0,
            heading: 19.0,
            font,
            foot: 14.0,
            margin: 18.0,
            left: label + 15.0 + 1.5 * 1.1 * font,
            bottom: 20.0 + 1.35 * font + 1.4 * 1.1 * font,
            bar: BAR_GAP + BAR_WIDTH + 8.0 + bar_labels + 0.6 * font + 1.4 * 1.1 * font,
            gap: 28.0,
        }
    }
}

const BAR_GAP: f32 = 22.0;
const BAR_WIDTH: f32 = 22.0;

fn check(fig: &Figure, style: &Style) -> Result<()> {
    if fig.panels.is_empty() {
        return Err(Error::input("nothing to draw: no field given"));
    }
    if !(200..=10_000).contains(&style.width) {
        return Err(Error::input(format!(
            "--size must be between 200 and 10000 pixels, got {}",
            style.width
        )));
    }
    if !(fig.window.width() > 0.0 && fig.window.height() > 0.0) {
        return Err(Error::input(
            "the window must have a positive width and height",
        ));
    }
    if let Some(s) = &style.scale {
        for p in &fig.panels {
            if p.signed && s.kind == Kind::Sequential {
                return Err(Error::input(format!(
                    "{} is a sequential scale, but the field takes both signs",
                    s.name
                ))
                .with_hint("signed fields need a diverging scale, e.g. PURPLE_ORANGE"));
            }
        }
    }
    if style.shared_scale {
        let first = &fig.panels[0];
        if fig
            .panels
            .iter()
            .any(|p| p.unit != first.unit || p.signed != first.signed)
        {
            return Err(Error::input(
                "--shared-scale needs fields of one kind and unit (all orbitals, or all densities)",
            )
            .with_hint("draw orbitals and densities in separate figures, or drop --shared-scale"));
        }
    }
    Ok(())
}

/// Maps per row: all in one row up to three, else a near-square grid (⌈√n⌉ columns).
pub fn columns_for(n: usize, asked: usize) -> usize {
    match asked {
        0 if n <= 3 => n,
        0 => (n as f64).sqrt().ceil() as usize,
        c => c.min(n),
    }
}

/// Where the maps go, known before any value is sampled, so that a caller can
/// estimate the cost of a figure first.
#[derive(Debug, Clone)]
pub struct Layout {
    pub grid: PixelGrid,
    cols: usize,
    rows: usize,
    width: f32,
    map_w: f32,
    cell_extra: f32,
    own_bars: bool,
}

impl Layout {
    /// Width of the figure in pixels.
    pub fn width(&self) -> u32 {
        self.width as u32
    }

    /// Rows of maps.
    pub fn rows(&self) -> usize {
        self.rows
    }

    /// An upper estimate of the figure's height in pixels: the rows of maps with
    /// their headings and axes, plus room for a title and footnotes of a few lines
    /// each (`TEXT_ALLOWANCE`).
    pub fn height_estimate(&self) -> u32 {
        let s = Sizes::new();
        let row_h = 1.6 * s.heading + self.grid.ny as f32 + s.bottom;
        (self.rows as f32 * row_h + 2.0 * s.margin + TEXT_ALLOWANCE).ceil() as u32
    }
}

/// Pixels allowed for the title and footnotes in `Layout::height_estimate`.
const TEXT_ALLOWANCE: f32 = 600.0;

/// Lays the figure out: columns, rows, the figure's width and the pixel grid of
/// each map. The figure is `style.width` wide, or wider when that would leave maps
/// under `MIN_MAP` pixels.
pub fn layout(fig: &Figure, style: &Style) -> Result<Layout> {
    check(fig, style)?;
    let s = Sizes::new();
    let n = fig.panels.len();
    let cols = columns_for(n, style.columns);
    let rows = n.div_ceil(cols);
    let own_bars = !style.shared_scale;
    let cell_extra = s.left + if own_bars { s.bar } else { 0.0 };
    let shared = if own_bars { 0.0 } else { s.bar };
    let fixed = 2.0 * s.margin + shared + cols as f32 * cell_extra + (cols as f32 - 1.0) * s.gap;
    let width = (style.width as f32).max((fixed + cols as f32 * MIN_MAP).ceil());
    let map_w = (width - fixed) / cols as f32;
    let nx = map_w.floor() as usize;
    let ny = ((nx as f64) * fig.window.height() / fig.window.width())
        .round()
        .max(2.0) as usize;
    if ny > 4 * nx.max(250) {
        return Err(Error::input("the window is too tall for its width")
            .with_hint("give --extent W,H with a less extreme ratio"));
    }
    Ok(Layout {
        grid: PixelGrid {
            plane: fig.plane.clone(),
            window: fig.window,
            nx,
            ny,
        },
        cols,
        rows,
        width,
        map_w,
        cell_extra,
        own_bars,
    })
}

/// Lays the figure out (`layout`), asks `sample` for the values of every panel at
/// the map's pixel centres (one `Vec` per panel, row-major), and draws it.
pub fn render(
    fig: &Figure,
    style: &Style,
    sample: impl FnOnce(&PixelGrid) -> Vec<Vec<f64>>,
) -> Result<Rendered> {
    let layout = layout(fig, style)?;
    let values = sample(&layout.grid);
    assert_eq!(
        values.len(),
        fig.panels.len(),
        "one set of values per panel"
    );
    let survey = survey(fig, &values);
    let frame = Frame::new(fig, &layout, &survey);
    let mut c = Canvas::new(frame.lay.width as u32, frame.height, style.background);
    let ctx = PanelContext {
        fig,
        style,
        frame: &frame,
        grid: &layout.grid,
        shared: shared_mapping(fig, style, &values, &survey.blank),
    };

    let mut maps = Vec::new();
    let mut bars = Vec::new();
    let mut labels = Vec::new();
    let mut levels_seen = Vec::new();
    for (i, vals) in values.iter().enumerate() {
        let drawn = draw_panel(&mut c, &ctx, i, vals, survey.blank[i]);
        maps.push(drawn.map);
        labels.push(drawn.labels);
        if let Some(bar) = drawn.bar {
            bars.push(bar);
        } else if !survey.blank[i] {
            levels_seen = drawn.levels;
        }
    }
    if let Some(mapping) = ctx.shared {
        bars.push(draw_shared_bar(&mut c, &ctx, mapping, &levels_seen));
    }
    draw_title_and_footnotes(&mut c, &frame);

    let Survey { peaks, blank, .. } = survey;
    Ok(Rendered {
        canvas: c,
        grid: layout.grid,
        maps,
        bars,
        values,
        peaks,
        blank,
        labels,
    })
}

/// What the sampled values say before anything is drawn, since blank maps and
/// missing samples change the footnotes and hence the figure's height.
struct Survey {
    /// The largest finite |value| of each map.
    peaks: Vec<f64>,
    /// Maps whose field is zero on the plane up to rounding.
    blank: Vec<bool>,
    /// Some sample has no value (NaN).
    gaps: bool,
}

/// Finds each map's peak, which maps are blank and whether any sample is missing.
fn survey(fig: &Figure, values: &[Vec<f64>]) -> Survey {
    let peaks: Vec<f64> = values
        .iter()
        .map(|v| {
            v.iter()
                .filter(|x| x.is_finite())
                .fold(0.0f64, |m, x| m.max(x.abs()))
        })
        .collect();
    let blank: Vec<bool> = fig
        .panels
        .iter()
        .zip(&peaks)
        .map(|(p, peak)| p.largest.is_some_and(|l| *peak <= ZERO_RATIO * l))
        .collect();
    let gaps = values.iter().flatten().any(|v| v.is_nan());
    Survey { peaks, blank, gaps }
}

/// The figure's full geometry, the layout plus the title and footnote lines, so
/// that every drawing step places things from one source.
struct Frame {
    s: Sizes,
    /// Columns, rows, widths and bars, as laid out before sampling.
    lay: Layout,
    /// Room for the headings over the maps (none for a single map).
    head: f32,
    /// Top of the first row of maps (its headings included).
    top: f32,
    row_h: f32,
    height: u32,
    title_lines: Vec<String>,
    foot_lines: Vec<String>,
}

impl Frame {
    /// Completes `layout` with the title, footnotes and the figure's height.
    fn new(fig: &Figure, layout: &Layout, survey: &Survey) -> Frame {
        let s = Sizes::new();
        let width = layout.width;
        let title_lines = fit_title(&fig.title, s.title, width - 2.0 * s.margin);
        let head = if fig.panels.len() > 1 {
            1.6 * s.heading
        } else {
            0.0
        };
        let top = s.margin + title_lines.len() as f32 * 1.3 * s.title + 10.0;
        let row_h = head + layout.grid.ny as f32 + s.bottom;
        let foot_lines = footnote_lines(fig, survey, &s, width);
        let foot_h = foot_lines.len() as f32 * 1.35 * s.foot;
        let height = (top + layout.rows as f32 * row_h + foot_h + s.margin).ceil() as u32;
        Frame {
            s,
            lay: layout.clone(),
            head,
            top,
            row_h,
            height,
            title_lines,
            foot_lines,
        }
    }

    /// Left edge of the cell (axis room, map and bar) in column `col`.
    fn cell_x(&self, col: usize) -> f32 {
        self.s.margin + col as f32 * (self.lay.cell_extra + self.lay.map_w + self.s.gap)
    }
}

/// The footnotes, with the notes on blank maps and missing samples, wrapped to the
/// figure's width: needed before drawing because they set the height.
fn footnote_lines(fig: &Figure, survey: &Survey, s: &Sizes, width: f32) -> Vec<String> {
    let mut notes = fig.footnotes.clone();
    if survey.blank.iter().any(|b| *b) {
        notes.push(format!(
            "Blank panels: the field is zero on this plane up to rounding (largest |value| on the map at most {ZERO_RATIO:e} of its largest |value| in space); they show the zero colour without contours or colour bar."
        ));
    }
    if survey.gaps {
        notes.push(fig.gap_note.clone());
    }
    notes
        .iter()
        .flat_map(|f| text::wrap(f, s.foot, width - 2.0 * s.margin))
        .collect()
}

/// The colour scale of a panel: the one asked for, or the default for its sign.
fn scale_for(style: &Style, p: &Panel) -> Scale {
    style.scale.unwrap_or_else(|| Scale::default_for(p.signed))
}

/// The logarithmic span of a panel, which only non-negative fields may have.
fn log_for(style: &Style, p: &Panel) -> Option<f64> {
    if p.signed { None } else { style.log_decades }
}

/// One mapping over all non-blank maps when they share a scale, so that equal
/// colours mean equal values across panels.
fn shared_mapping(
    fig: &Figure,
    style: &Style,
    values: &[Vec<f64>],
    blank: &[bool],
) -> Option<Mapping> {
    style.shared_scale.then(|| {
        let all: Vec<f64> = values
            .iter()
            .zip(blank)
            .filter(|(_, b)| !**b)
            .flat_map(|(v, _)| v.iter().copied())
            .collect();
        mapping_of(style, &fig.panels[0], &all)
    })
}

/// The panel's mapping: over its values, or ending at the style's limit.
pub(super) fn mapping_of(style: &Style, panel: &Panel, values: &[f64]) -> Mapping {
    match style.limit {
        Some(l) => mapping_for(&[l], panel.signed, log_for(style, panel)),
        None => mapping_for(values, panel.signed, log_for(style, panel)),
    }
}

/// The title centred at the top and the footnotes under the last row of maps.
fn draw_title_and_footnotes(c: &mut Canvas, frame: &Frame) {
    let s = &frame.s;
    for (j, line) in frame.title_lines.iter().enumerate() {
        let y = s.margin + j as f32 * 1.3 * s.title;
        c.text(
            line,
            s.title,
            frame.lay.width / 2.0,
            y,
            (HAlign::Centre, VAlign::Top),
            Colour::INK,
        );
    }
    let mut fy = frame.top + frame.lay.rows as f32 * frame.row_h;
    for f in &frame.foot_lines {
        c.text(
            f,
            s.foot,
            s.margin,
            fy,
            (HAlign::Left, VAlign::Top),
            Colour::GREY,
        );
        fy += 1.35 * s.foot;
    }
}

/// The largest size up to `size` at which `text` fits `width`.
fn fit_size(text: &str, size: f32, width: f32) -> f32 {
    let w = text::measure(text, size).width;
    if w <= width { size } else { size * width / w }
}

/// Splits a title into lines that fit `width`, at " · " or spaces.
fn fit_title(title: &str, size: f32, width: f32) -> Vec<String> {
    let mut lines = Vec::new();
    let mut line = String::new();
    for part in title.split(" · ") {
        let candidate = if line.is_empty() {
            part.to_string()
        } else {
            format!("{line} · {part}")
        };
        if text::measure(&candidate, size).width <= width || line.is_empty() {
            line = candidate;
        } else {
            lines.push(std::mem::take(&mut line));
            line = part.to_string();
        }
    }
    if !line.is_empty() {
        lines.push(line);
    }
    lines
}
