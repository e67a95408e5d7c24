//! Turning laid-out pages into printpdf operations, with the running header
//! and footer that need the final page count.

use std::collections::{BTreeMap, BTreeSet};
use std::fmt::Write;

use printpdf::ParsedFont;

use super::fonts::{metrics, printable, Face, FaceMetrics, UsedChars};
use super::layout::{Geometry, Item, MM};
use super::PdfOptions;

/// Size of the running header and footer text, pt.
const RUNNING_SIZE: f32 = 7.8;
/// Grey of the running header and footer text and rules.
const RUNNING_GREY: f32 = 0.25;

/// Shortens `text` with an ellipsis until it is at most `width` points wide.
fn fit(faces: &[FaceMetrics], face: Face, size: f32, text: &str, width: f32) -> String {
    let m = metrics(faces, face);
    if m.width(text, size) <= width {
        return text.to_string();
    }
    let ellipsis = "…";
    let mut out = String::new();
    let mut w = m.width(ellipsis, size);
    for ch in text.chars() {
        let cw = m.advance_em(ch) * size;
        if w + cw > width {
            break;
        }
        out.push(ch);
        w += cw;
    }
    out.truncate(out.trim_end().len());
    out.push_str(ellipsis);
    out
}

/// The running header and footer of page `number` of `count`.
fn running(faces: &[FaceMetrics], geo: &Geometry, options: &PdfOptions, number: usize, count: usize) -> Vec<Item> {
    let face = Face::Regular;
    let size = RUNNING_SIZE;
    let m = metrics(faces, face);
    let mut items = Vec::new();
    let width = geo.text_width();
    let mut pair = |left: &str, right: &str, baseline: f32, rule: f32| {
        let right = printable(faces, face, right);
        let right = fit(faces, face, size, &right, width * 0.45);
        let right_w = m.width(&right, size);
        let left = printable(faces, face, left);
        let left = fit(faces, face, size, &left, width - right_w - 12.0);
        for (x, text) in [(geo.left, left), (geo.right - right_w, right)] {
            if !text.trim().is_empty() {
                items.push(Item::Text { x, y: baseline, face, size, text });
            }
        }
        items.push(Item::rule((geo.left, rule), (geo.right, rule), 0.4, RUNNING_GREY));
    };
    pair(&options.header_left, &options.header_right, 13.0 * MM, 15.0 * MM);
    let footer_rule = geo.height - 15.0 * MM;
    pair(&options.footer_left, &format!("Page {number} of {count}"), geo.height - 11.0 * MM, footer_rule);
    items
}

/// Graphics state already set in the content stream, to avoid repeating it.
#[derive(Default)]
struct State {
    font: Option<(Face, f32)>,
    in_text: bool,
    fill: Option<f32>,
    stroke: Option<f32>,
    width: Option<f32>,
    dash: Option<Option<(f32, f32)>>,
}

/// The glyph numbers of one font subset for the characters a document draws.
pub struct GlyphMap {
    ascii: [u16; 128],
    other: BTreeMap<char, u16>,
}

impl Default for GlyphMap {
    fn default() -> Self {
        GlyphMap { ascii: [0; 128], other: BTreeMap::new() }
    }
}

impl GlyphMap {
    /// The map of `chars` in `font`; a character the font lacks maps to glyph 0
    /// (`.notdef`), as a PDF writer must show it.
    pub fn new(font: &ParsedFont, chars: &BTreeSet<char>) -> GlyphMap {
        let mut map = GlyphMap::default();
        for &c in chars {
            let gid = font.lookup_glyph_index(c as u32).unwrap_or(0);
            if (c as u32) < 128 {
                map.ascii[c as usize] = gid;
            } else {
                map.other.insert(c, gid);
            }
        }
        map
    }

    fn gid(&self, c: char) -> u16 {
        if (c as u32) < 128 {
            self.ascii[c as usize]
        } else {
            self.other.get(&c).copied().unwrap_or(0)
        }
    }
}

/// A content stream being written. The operators and the number format are
/// those of ISO 32000-1, 8 and 9: operands separated by single spaces before
/// the operator, one operation per line, reals in their shortest exact decimal
/// form, and text as hexadecimal two-byte glyph codes (Identity-H encoding).
/// Writing the bytes directly instead of building an operation list for a
/// generic writer avoids an allocation per operand.
struct Content {
    out: String,
}

/// Appends a PDF number rounded to 0.001 (a thousandth of a point is far
/// below anything visible), without trailing zeros.
fn push_real(out: &mut String, v: f32) {
    crate::render::push_thousandths(out, v as f64, true);
}

impl Content {
    fn op(&mut self, operator: &str) {
        if !self.out.is_empty() {
            self.out.push('\n');
        }
        self.out.push_str(operator);
    }

    /// Starts an operation whose operands follow; finish it with `end`.
    fn begin(&mut self) {
        if !self.out.is_empty() {
            self.out.push('\n');
        }
    }

    fn real(&mut self, v: f32) {
        push_real(&mut self.out, v);
        self.out.push(' ');
    }

    fn end(&mut self, operator: &str) {
        self.out.push_str(operator);
    }

    fn reals(&mut self, values: &[f32], operator: &str) {
        self.begin();
        for &v in values {
            self.real(v);
        }
        self.end(operator);
    }
}

const HEX: &[u8; 16] = b"0123456789ABCDEF";

/// Appends the operations for one item.
fn paint_item(item: &Item, geo: &Geometry, header_grey: bool, st: &mut State, c: &mut Content, glyphs: &[GlyphMap]) {
    let text_grey = if header_grey { RUNNING_GREY } else { 0.0 };
    match item {
        Item::Text { x, y, face, size, text } => {
            if !st.in_text {
                c.op("BT");
                st.in_text = true;
            }
            if st.fill != Some(text_grey) {
                c.reals(&[text_grey.clamp(0.0, 1.0)], "g");
                st.fill = Some(text_grey);
            }
            if st.font != Some((*face, *size)) {
                c.begin();
                c.out.push('/');
                c.out.push_str(face.resource_name());
                c.out.push(' ');
                c.real(*size);
                c.end("Tf");
                st.font = Some((*face, *size));
            }
            c.reals(&[1.0, 0.0, 0.0, 1.0, *x, geo.height - *y], "Tm");
            c.begin();
            c.out.push('<');
            let map = &glyphs[face.index()];
            for ch in text.chars() {
                for b in map.gid(ch).to_be_bytes() {
                    c.out.push(char::from(HEX[usize::from(b >> 4)]));
                    c.out.push(char::from(HEX[usize::from(b & 15)]));
                }
            }
            c.out.push_str("> ");
            c.end("Tj");
        }
        Item::Stroke { points, closed, width, grey: g, dash } => {
            end_text(st, c);
            if st.stroke != Some(*g) {
                c.reals(&[g.clamp(0.0, 1.0)], "G");
                st.stroke = Some(*g);
            }
            if st.width != Some(*width) {
                c.reals(&[*width], "w");
                st.width = Some(*width);
            }
            if st.dash != Some(*dash) {
                c.begin();
                match dash {
                    Some((a, b)) => {
                        let _ = write!(c.out, "[{a} {b}] ");
                    }
                    None => c.out.push_str("[] "),
                }
                c.real(0.0);
                c.end("d");
                st.dash = Some(*dash);
            }
            let Some(first) = points.first() else { return };
            c.reals(&[first.0, geo.height - first.1], "m");
            for p in &points[1..] {
                c.reals(&[p.0, geo.height - p.1], "l");
            }
            if *closed {
                c.op("h");
            }
            c.op("S");
        }
        Item::Fill { x, y, w, h, grey: g } => {
            if *h <= 0.0 || *w <= 0.0 {
                return;
            }
            end_text(st, c);
            if st.fill != Some(*g) {
                c.reals(&[g.clamp(0.0, 1.0)], "g");
                st.fill = Some(*g);
            }
            c.reals(&[*x, geo.height - *y - *h, *w, *h], "re");
            c.op("f");
        }
    }
}

fn end_text(st: &mut State, c: &mut Content) {
    if st.in_text {
        c.op("ET");
        st.in_text = false;
    }
}

/// The running header and footer of every page, and the characters each face
/// must provide for them and for the pages' own items, recorded in drawing order.
pub fn prepare(
    faces: &[FaceMetrics],
    pages: &[Vec<Item>],
    geo: &Geometry,
    options: &PdfOptions,
) -> (Vec<Vec<Item>>, UsedChars) {
    let mut used = UsedChars::default();
    let count = pages.len();
    let running = pages
        .iter()
        .enumerate()
        .map(|(i, items)| {
            let head = running(faces, geo, options, i + 1, count);
            for item in head.iter().chain(items) {
                if let Item::Text { face, text, .. } = item {
                    used.add(*face, text);
                }
            }
            head
        })
        .collect();
    (running, used)
}

/// The content stream of every page, header and footer first, with text coded
/// as the glyph numbers of the subsets in `glyphs` (indexed by [`Face::index`]).
pub fn paint(pages: &[Vec<Item>], running: &[Vec<Item>], geo: &Geometry, glyphs: &[GlyphMap]) -> Vec<Vec<u8>> {
    pages
        .iter()
        .zip(running)
        .map(|(items, head)| {
            let mut c = Content { out: String::new() };
            let mut st = State::default();
            for item in head {
                paint_item(item, geo, true, &mut st, &mut c, glyphs);
            }
            for item in items {
                paint_item(item, geo, false, &mut st, &mut c, glyphs);
            }
            end_text(&mut st, &mut c);
            c.out.into_bytes()
        })
        .collect()
}

#[cfg(test)]
mod tests {

    #[test]
    fn numbers_are_written_to_a_thousandth_without_trailing_zeros() {
        let show = |v: f32| {
            let mut s = String::new();
            super::push_real(&mut s, v);
            s
        };
        assert_eq!(show(0.0), "0");
        assert_eq!(show(-0.0001), "0");
        assert_eq!(show(12.5), "12.5");
        assert_eq!(show(-3.25), "-3.25");
        assert_eq!(show(595.2756), "595.276");
        assert_eq!(show(1.0), "1");
        assert_eq!(show(f32::NAN), "0");
    }
    use super::*;
    use crate::render::pdf::fonts::faces;

    #[test]
    fn long_running_text_is_shortened_to_fit() {
        let faces = faces().expect("faces");
        let long = "Calculation package for the vessel ".repeat(10);
        let short = fit(faces, Face::Regular, 8.0, &long, 100.0);
        assert!(short.ends_with('…'));
        assert!(metrics(faces, Face::Regular).width(&short, 8.0) <= 100.0);
        assert_eq!(fit(faces, Face::Regular, 8.0, "Rev B", 100.0), "Rev B");
    }
}
