//! Flowing blocks onto pages.
//!
//! The layouter walks the block tree once, top to bottom, and appends drawing
//! items to the current page; when the next piece does not fit it starts a new
//! page. Coordinates are points from the top left of the page (y downwards),
//! the natural direction for flowing text; the painter flips them for PDF.
//! Running headers and footers are not laid out here: the page count is only
//! known once the flow is finished, so the painter adds them afterwards.

use std::cell::RefCell;
use std::collections::BTreeMap;
use std::rc::Rc;

use super::blocks::{Block, Span};
use super::fonts::{metrics, printable, Face, FaceMetrics};
use super::table::Measured;
use super::text::{wrap, wrap_code, BaseStyle, TextLine};
use super::{Paper, PdfError};
use crate::drawing::Drawing;

/// Points per millimetre.
pub const MM: f32 = 72.0 / 25.4;

/// Body text size, pt.
pub const BODY_SIZE: f32 = 9.5;
/// Line height as a multiple of the text size.
pub const LEADING: f32 = 1.32;
/// Text size in code blocks, pt.
const CODE_SIZE: f32 = 8.3;
/// Indent of each list level, pt.
const LIST_INDENT: f32 = 15.0;
/// Indent of a block quote's content, pt.
const QUOTE_INDENT: f32 = 12.0;

/// Where the baseline sits in a line box, as a fraction of the line height.
/// DejaVu's ascender is 0.93 em and its descender 0.24 em; at 1.32 em leading
/// this fraction leaves room for both.
pub const BASELINE: f32 = 0.77;

/// The page and the area that body text may occupy, pt.
#[derive(Debug, Clone, Copy)]
pub struct Geometry {
    /// Page height.
    pub height: f32,
    /// Left edge of the text area.
    pub left: f32,
    /// Right edge of the text area.
    pub right: f32,
    /// Top of the body (below the running header).
    pub top: f32,
    /// Bottom of the body (above the running footer).
    pub bottom: f32,
}

impl Geometry {
    /// The page layout for a paper size: 20 mm side margins, 22 mm at the top
    /// and 20 mm at the bottom, which leave room for the running header and
    /// footer and for binding.
    pub fn for_paper(paper: Paper) -> Geometry {
        let (w, h) = match paper {
            Paper::A4 => (210.0, 297.0),
            Paper::Letter => (215.9, 279.4),
        };
        Geometry { height: h * MM, left: 20.0 * MM, right: (w - 20.0) * MM, top: 23.0 * MM, bottom: (h - 20.0) * MM }
    }

    /// Width of the text area.
    pub fn text_width(&self) -> f32 {
        self.right - self.left
    }
}

/// One thing to draw on a page. Coordinates in pt from the top left.
#[derive(Debug, Clone, PartialEq)]
pub enum Item {
    /// Text whose baseline starts at (x, y).
    Text {
        /// Left end of the baseline.
        x: f32,
        /// Baseline.
        y: f32,
        /// Face.
        face: Face,
        /// Size, pt.
        size: f32,
        /// The text, reduced to characters the face can show.
        text: String,
    },
    /// A stroked polyline.
    Stroke {
        /// Vertices.
        points: Vec<(f32, f32)>,
        /// Join the last point to the first.
        closed: bool,
        /// Line width, pt.
        width: f32,
        /// Grey level, 0 black.
        grey: f32,
        /// Dash and gap, pt.
        dash: Option<(f32, f32)>,
    },
    /// A filled rectangle with its top left corner at (x, y).
    Fill {
        /// Left edge.
        x: f32,
        /// Top edge.
        y: f32,
        /// Width.
        w: f32,
        /// Height.
        h: f32,
        /// Grey level, 0 black.
        grey: f32,
    },
}

impl Item {
    /// A solid horizontal or vertical rule.
    pub fn rule(from: (f32, f32), to: (f32, f32), width: f32, grey: f32) -> Item {
        Item::Stroke { points: vec![from, to], closed: false, width, grey, dash: None }
    }
}

/// A decoration that runs alongside content and must be continued on the next
/// page when the content is: the bar of a quote, the shading of a code block.
#[derive(Debug, Clone, Copy)]
enum Frame {
    Bar { x: f32, start: f32 },
    Shade { x: f32, w: f32, start: f32, item: usize },
}

/// A list marker waiting for the first line of its item.
#[derive(Debug, Clone)]
struct Marker {
    text: String,
    right: f32,
}

/// The flow state.
pub struct Layouter<'a> {
    /// Parsed faces.
    pub faces: &'a [FaceMetrics],
    /// Figures by name.
    pub figures: &'a BTreeMap<String, Drawing>,
    /// Page geometry.
    pub geo: Geometry,
    /// Laid-out pages.
    pub pages: Vec<Vec<Item>>,
    /// Top of the free space on the current page.
    pub y: f32,
    frames: Vec<Frame>,
    marker: Option<Marker>,
    list_depth: usize,
    /// Tables measured so far, by the table's address and the width in bits.
    pub(super) measured: RefCell<BTreeMap<(usize, u32), Rc<Measured>>>,
}

/// Space before a block, pt, when it follows another block.
fn gap_before(block: &Block) -> f32 {
    match block {
        Block::Heading { level: 1, .. } => 16.0,
        Block::Heading { level: 2, .. } => 13.0,
        Block::Heading { level: 3, .. } => 10.0,
        Block::Heading { .. } => 8.0,
        Block::Table(_) | Block::Figure { .. } => 8.0,
        Block::PageBreak => 0.0,
        _ => 5.5,
    }
}

/// Space after a block, pt, when another follows.
fn gap_after(block: &Block) -> f32 {
    match block {
        Block::Table(_) | Block::Figure { .. } => 8.0,
        _ => 0.0,
    }
}

/// Size of a heading level, pt.
fn heading_size(level: u8) -> f32 {
    match level {
        1 => 15.0,
        2 => 12.5,
        3 => 11.0,
        _ => 10.0,
    }
}

impl<'a> Layouter<'a> {
    /// A layouter with one empty page.
    pub fn new(faces: &'a [FaceMetrics], figures: &'a BTreeMap<String, Drawing>, geo: Geometry) -> Layouter<'a> {
        Layouter {
            faces,
            figures,
            geo,
            pages: vec![Vec::new()],
            y: geo.top,
            frames: Vec::new(),
            marker: None,
            list_depth: 0,
            measured: RefCell::new(BTreeMap::new()),
        }
    }

    /// Appends an item to the current page.
    pub fn push(&mut self, item: Item) {
        if let Some(page) = self.pages.last_mut() {
            page.push(item);
        }
    }

    /// Whether nothing has been placed on the current page yet.
    pub fn at_top(&self) -> bool {
        self.y <= self.geo.top + 0.01
    }

    /// Whether `h` more points fit on the current page.
    pub fn fits(&self, h: f32) -> bool {
        self.y + h <= self.geo.bottom + 0.01
    }

    /// Height of the body area of a page.
    pub fn body_height(&self) -> f32 {
        self.geo.bottom - self.geo.top
    }

    /// Adds vertical space, except at the top of a page where it would only
    /// push the first line down.
    pub fn space(&mut self, h: f32) {
        if !self.at_top() {
            self.y += h;
        }
    }

    /// Ends the current page and starts the next, carrying quote bars and
    /// code shading over.
    pub fn page_break(&mut self) {
        let end = self.y;
        let frames = std::mem::take(&mut self.frames);
        for f in &frames {
            self.close_frame(*f, end);
        }
        self.pages.push(Vec::new());
        self.y = self.geo.top;
        for f in frames {
            self.open_frame(f);
        }
    }

    /// Starts a new page unless `h` points still fit (or the page is empty, in
    /// which case moving on would not help).
    pub fn ensure(&mut self, h: f32) {
        if !self.fits(h) && !self.at_top() {
            self.page_break();
        }
    }

    fn open_frame(&mut self, f: Frame) {
        let start = self.y;
        let f = match f {
            Frame::Bar { x, .. } => Frame::Bar { x, start },
            Frame::Shade { x, w, .. } => {
                let item = self.pages.last().map_or(0, Vec::len);
                // A placeholder, sized when the frame closes; it is pushed now so
                // that it is painted under the text it shades.
                self.push(Item::Fill { x, y: start, w, h: 0.0, grey: 0.95 });
                Frame::Shade { x, w, start, item }
            }
        };
        self.frames.push(f);
    }

    fn close_frame(&mut self, f: Frame, end: f32) {
        match f {
            Frame::Bar { x, start } => {
                if end > start {
                    self.push(Item::rule((x, start), (x, end), 1.2, 0.55));
                }
            }
            Frame::Shade { start, item, .. } => {
                if let Some(Item::Fill { h, .. }) = self.pages.last_mut().and_then(|p| p.get_mut(item)) {
                    *h = (end - start).max(0.0);
                }
            }
        }
    }

    fn pop_frame(&mut self) {
        if let Some(f) = self.frames.pop() {
            let end = self.y;
            self.close_frame(f, end);
        }
    }

    /// Draws the pending list marker, if any, on the baseline given.
    pub fn take_marker(&mut self, baseline: f32) {
        if let Some(m) = self.marker.take() {
            let w = metrics(self.faces, Face::Regular).width(&m.text, BODY_SIZE);
            self.push(Item::Text { x: m.right - w, y: baseline, face: Face::Regular, size: BODY_SIZE, text: m.text });
        }
    }

    /// Draws one laid-out line with its left end at `x` and its line box top at `top`.
    pub fn draw_line(&mut self, line: &TextLine, x: f32, baseline: f32) {
        for f in &line.frags {
            if f.text.trim().is_empty() {
                continue;
            }
            self.push(Item::Text {
                x: x + f.dx,
                y: baseline,
                face: f.face,
                size: f.size,
                text: f.text.trim_end().to_string(),
            });
        }
    }

    /// Places lines of text one after another, breaking pages between lines.
    /// A paragraph of several lines never leaves its first line alone at the
    /// bottom of a page.
    fn place_lines(&mut self, lines: &[TextLine], x: f32, size: f32) {
        let lh = size * LEADING;
        if lines.len() >= 2 {
            self.ensure(2.0 * lh);
        }
        for line in lines {
            self.ensure(lh);
            let baseline = self.y + lh * BASELINE;
            self.take_marker(baseline);
            self.draw_line(line, x, baseline);
            self.y += lh;
        }
    }

    /// Lays out a sequence of blocks in the column from `x`, `width` wide.
    pub fn blocks(&mut self, blocks: &[Block], x: f32, width: f32) -> Result<(), PdfError> {
        for (i, block) in blocks.iter().enumerate() {
            if i > 0 {
                let prev = &blocks[i - 1];
                let gap = if matches!(prev, Block::Heading { .. }) {
                    // Text sits close under its heading; a sub-heading right
                    // under a heading keeps some of its own space.
                    match block {
                        Block::Heading { .. } => 0.6 * gap_before(block),
                        _ => 4.0,
                    }
                } else {
                    gap_after(prev).max(gap_before(block))
                };
                self.space(gap);
            }
            self.block(block, &blocks[i + 1..], x, width)?;
        }
        Ok(())
    }

    fn block(&mut self, block: &Block, rest: &[Block], x: f32, width: f32) -> Result<(), PdfError> {
        match block {
            Block::Heading { level, text } => self.heading(*level, text, rest, x, width)?,
            Block::Paragraph(spans) => {
                let lines = wrap(self.faces, spans, body_style(), width);
                self.place_lines(&lines, x, BODY_SIZE);
            }
            Block::List { start, tight, items } => self.list(*start, *tight, items, x, width)?,
            Block::Quote(inner) => {
                self.open_frame(Frame::Bar { x: x + 3.0, start: 0.0 });
                let r = self.blocks(inner, x + QUOTE_INDENT, width - QUOTE_INDENT);
                self.pop_frame();
                r?;
            }
            Block::Code(code) => self.code(code, x, width),
            Block::Rule => {
                self.ensure(8.0);
                let y = self.y + 4.0;
                self.take_marker(y + 3.0);
                self.push(Item::rule((x, y), (x + width, y), 0.5, 0.35));
                self.y += 8.0;
            }
            Block::Table(table) => self.table(table, x, width),
            Block::Figure { name, caption } => self.figure(name, caption, x, width)?,
            Block::PageBreak => {
                self.marker = None;
                if !self.at_top() {
                    self.page_break();
                }
            }
        }
        Ok(())
    }

    /// Height that must fit below a heading together with it, so that a
    /// heading never ends a page: the first two lines of a paragraph, a table's
    /// head and first row, a whole figure.
    fn keep_height(&self, rest: &[Block], width: f32, depth: usize) -> f32 {
        let lh = BODY_SIZE * LEADING;
        let Some(next) = rest.first() else {
            return 0.0;
        };
        let gap = 4.0;
        match next {
            Block::Paragraph(spans) => {
                let n = wrap(self.faces, spans, body_style(), width).len().min(2);
                gap + n as f32 * lh
            }
            Block::Heading { level, text } if depth < 3 => {
                let size = heading_size(*level);
                let n = wrap(self.faces, text, heading_style(*level), width).len();
                gap + n as f32 * size * LEADING + self.keep_height(&rest[1..], width, depth + 1)
            }
            Block::Table(t) => gap + self.table_keep_height(t, width),
            Block::Figure { name, caption } => gap + self.figure_height(name, caption, width),
            Block::PageBreak | Block::Rule => 0.0,
            _ => gap + 2.0 * lh,
        }
    }

    fn heading(&mut self, level: u8, text: &[Span], rest: &[Block], x: f32, width: f32) -> Result<(), PdfError> {
        let size = heading_size(level);
        let lines = wrap(self.faces, text, heading_style(level), width);
        let lh = size * LEADING;
        let rule = if level == 1 { 4.0 } else { 0.0 };
        let own = lines.len() as f32 * lh + rule;
        let keep = self.keep_height(rest, width, 0).min(self.body_height() - own);
        self.ensure(own + keep.max(0.0));
        for line in &lines {
            self.ensure(lh);
            let baseline = self.y + lh * BASELINE;
            self.take_marker(baseline);
            self.draw_line(line, x, baseline);
            self.y += lh;
        }
        if level == 1 {
            let y = self.y + 1.0;
            self.push(Item::rule((x, y), (x + width, y), 0.6, 0.0));
            self.y += rule;
        }
        Ok(())
    }

    fn list(
        &mut self,
        start: Option<u64>,
        tight: bool,
        items: &[Vec<Block>],
        x: f32,
        width: f32,
    ) -> Result<(), PdfError> {
        let bullets = ["•", "–", "◦"];
        let depth = self.list_depth;
        self.list_depth += 1;
        let mut result = Ok(());
        for (i, item) in items.iter().enumerate() {
            if i > 0 {
                self.space(if tight { 2.0 } else { 5.0 });
            }
            let text = match start {
                Some(n) => format!("{}.", n.saturating_add(i as u64)),
                None => bullets[depth % bullets.len()].to_string(),
            };
            self.marker = Some(Marker { text, right: x + LIST_INDENT - 4.5 });
            result = self.blocks(item, x + LIST_INDENT, width - LIST_INDENT);
            if result.is_err() {
                break;
            }
            if self.marker.is_some() {
                // An empty item still shows its marker on a line of its own.
                let lh = BODY_SIZE * LEADING;
                self.ensure(lh);
                let baseline = self.y + lh * BASELINE;
                self.take_marker(baseline);
                self.y += lh;
            }
        }
        self.marker = None;
        self.list_depth -= 1;
        result
    }

    fn code(&mut self, code: &str, x: f32, width: f32) {
        let pad = 4.0;
        let lh = CODE_SIZE * 1.25;
        let lines = wrap_code(self.faces, code, CODE_SIZE, width - 2.0 * pad);
        // Like a paragraph, a code block never leaves one line alone at the
        // bottom of a page.
        self.ensure(lines.len().min(2) as f32 * lh + pad);
        self.open_frame(Frame::Shade { x, w: width, start: 0.0, item: 0 });
        self.y += pad / 2.0;
        for line in &lines {
            if !self.fits(lh + pad / 2.0) {
                self.page_break();
                self.y += pad / 2.0;
            }
            let baseline = self.y + lh * BASELINE;
            self.take_marker(baseline);
            if !line.trim().is_empty() {
                self.push(Item::Text {
                    x: x + pad,
                    y: baseline,
                    face: Face::Mono,
                    size: CODE_SIZE,
                    text: line.clone(),
                });
            }
            self.y += lh;
        }
        self.y += pad / 2.0;
        self.pop_frame();
    }

    /// Places text reduced to what `face` can show, on one line, starting at
    /// `x` on `baseline`. Used for captions and figure labels.
    pub fn text_at(&mut self, x: f32, baseline: f32, face: Face, size: f32, text: &str) {
        let text = printable(self.faces, face, text);
        if !text.trim().is_empty() {
            self.push(Item::Text { x, y: baseline, face, size, text });
        }
    }

    /// Finishes the flow and returns the pages.
    pub fn finish(mut self) -> Vec<Vec<Item>> {
        while !self.frames.is_empty() {
            self.pop_frame();
        }
        // A trailing page break leaves an empty last page; drop it.
        if self.pages.len() > 1 && self.pages.last().is_some_and(Vec::is_empty) {
            self.pages.pop();
        }
        self.pages
    }
}

/// The style of running text.
pub fn body_style() -> BaseStyle {
    BaseStyle { size: BODY_SIZE, bold: false, italic: false }
}

/// The style of a heading level.
fn heading_style(level: u8) -> BaseStyle {
    BaseStyle { size: heading_size(level), bold: true, italic: level >= 4 }
}
