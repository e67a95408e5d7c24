//! Turning laid-out pages into printpdf operations, with the running header
//! and footer that need the final page count.

use printpdf::{
    Color, FontId, Greyscale, Line, LineDashPattern, LinePoint, Op, PaintMode, PdfFontHandle, Point, Pt, Rect,
    TextItem, TextMatrix,
};

use super::fonts::{metrics, printable, Face, FaceMetrics, UsedChars};
use super::layout::{Geometry, Item, MM};
use super::PdfOptions;

/// Size of the running header and footer text, pt.
const RUNNING_SIZE: f32 = 7.8;
/// Grey of the running header and footer text and rules.
const RUNNING_GREY: f32 = 0.25;

fn grey(level: f32) -> Color {
    Color::Greyscale(Greyscale::new(level.clamp(0.0, 1.0), None))
}

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

fn point(geo: &Geometry, (x, y): (f32, f32)) -> LinePoint {
    LinePoint { p: Point { x: Pt(x), y: Pt(geo.height - y) }, bezier: false }
}

/// Appends the operations for one item, recording the characters used.
fn paint_item(item: &Item, geo: &Geometry, header_grey: bool, st: &mut State, ops: &mut Vec<Op>, used: &mut UsedChars) {
    let text_grey = if header_grey { RUNNING_GREY } else { 0.0 };
    match item {
        Item::Text { x, y, face, size, text } => {
            if !st.in_text {
                ops.push(Op::StartTextSection);
                st.in_text = true;
            }
            if st.fill != Some(text_grey) {
                ops.push(Op::SetFillColor { col: grey(text_grey) });
                st.fill = Some(text_grey);
            }
            if st.font != Some((*face, *size)) {
                ops.push(Op::SetFont {
                    font: PdfFontHandle::External(FontId(face.resource_name().to_string())),
                    size: Pt(*size),
                });
                st.font = Some((*face, *size));
            }
            ops.push(Op::SetTextMatrix { matrix: TextMatrix::Translate(Pt(*x), Pt(geo.height - *y)) });
            ops.push(Op::ShowText { items: vec![TextItem::Text(text.clone())] });
            used.add(*face, text);
        }
        Item::Stroke { points, closed, width, grey: g, dash } => {
            end_text(st, ops);
            if st.stroke != Some(*g) {
                ops.push(Op::SetOutlineColor { col: grey(*g) });
                st.stroke = Some(*g);
            }
            if st.width != Some(*width) {
                ops.push(Op::SetOutlineThickness { pt: Pt(*width) });
                st.width = Some(*width);
            }
            if st.dash != Some(*dash) {
                let pattern = match dash {
                    Some((a, b)) => LineDashPattern::new(0.0, &[*a, *b]),
                    None => LineDashPattern::solid(),
                };
                ops.push(Op::SetLineDashPattern { dash: pattern });
                st.dash = Some(*dash);
            }
            ops.push(Op::DrawLine {
                line: Line { points: points.iter().map(|p| point(geo, *p)).collect(), is_closed: *closed },
            });
        }
        Item::Fill { x, y, w, h, grey: g } => {
            if *h <= 0.0 || *w <= 0.0 {
                return;
            }
            end_text(st, ops);
            if st.fill != Some(*g) {
                ops.push(Op::SetFillColor { col: grey(*g) });
                st.fill = Some(*g);
            }
            ops.push(Op::DrawRectangle {
                rectangle: Rect {
                    x: Pt(*x),
                    y: Pt(geo.height - *y - *h),
                    width: Pt(*w),
                    height: Pt(*h),
                    mode: Some(PaintMode::Fill),
                    winding_order: None,
                },
            });
        }
    }
}

fn end_text(st: &mut State, ops: &mut Vec<Op>) {
    if st.in_text {
        ops.push(Op::EndTextSection);
        st.in_text = false;
    }
}

/// The operations of every page, header and footer included, and the
/// characters each face must provide.
pub fn paint(
    faces: &[FaceMetrics],
    pages: &[Vec<Item>],
    geo: &Geometry,
    options: &PdfOptions,
) -> (Vec<Vec<Op>>, UsedChars) {
    let mut used = UsedChars::default();
    let count = pages.len();
    let out = pages
        .iter()
        .enumerate()
        .map(|(i, items)| {
            let mut ops = Vec::new();
            let mut st = State::default();
            for item in &running(faces, geo, options, i + 1, count) {
                paint_item(item, geo, true, &mut st, &mut ops, &mut used);
            }
            for item in items {
                paint_item(item, geo, false, &mut st, &mut ops, &mut used);
            }
            end_text(&mut st, &mut ops);
            ops
        })
        .collect();
    (out, used)
}

#[cfg(test)]
mod tests {
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
