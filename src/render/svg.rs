//! Writes a [`Drawing`] as an SVG 1.1 document.
//!
//! The output is deterministic: numbers are written with a fixed three
//! decimals (a micrometre on paper), negative zero is written as zero, and
//! shapes appear in drawing order. The page size is given in millimetres and
//! the view box in the same millimetres, so one user unit is one millimetre.

use crate::drawing::{Anchor, Drawing, Shape, Stroke};
use std::fmt::Write;

/// Millimetres per typographic point (1 pt = 1/72 in = 25.4/72 mm).
const MM_PER_PT: f64 = 25.4 / 72.0;

/// Formats a coordinate or length with three decimals, never as "-0.000".
fn num(v: f64) -> String {
    let mut s = String::with_capacity(12);
    push_num(&mut s, v);
    s
}

/// Appends `v` with three decimals.
fn push_num(out: &mut String, v: f64) {
    super::push_thousandths(out, v, false);
}

/// Escapes the five XML special characters so any label is safe as text or
/// in an attribute.
pub fn escape(text: &str) -> String {
    let mut out = String::with_capacity(text.len());
    for c in text.chars() {
        match c {
            '&' => out.push_str("&amp;"),
            '<' => out.push_str("&lt;"),
            '>' => out.push_str("&gt;"),
            '"' => out.push_str("&quot;"),
            '\'' => out.push_str("&apos;"),
            // Control characters other than tab and newline are not allowed
            // in XML 1.0 at all; they are dropped rather than escaped.
            c if (c as u32) < 0x20 && c != '\t' && c != '\n' => {}
            c => out.push(c),
        }
    }
    out
}

/// The stroke attributes of a line style.
fn stroke_attrs(stroke: &Stroke) -> String {
    let g = (stroke.grey.clamp(0.0, 1.0) * 255.0).round() as u8;
    let mut s = format!(
        "fill=\"none\" stroke=\"#{g:02x}{g:02x}{g:02x}\" stroke-width=\"{}\" stroke-linecap=\"round\" stroke-linejoin=\"round\"",
        num(stroke.width)
    );
    if let Some((dash, gap)) = stroke.dash {
        let _ = write!(s, " stroke-dasharray=\"{} {}\"", num(dash), num(gap));
    }
    s
}

/// Renders a drawing as a standalone SVG 1.1 document. The caption is kept
/// as the document's `<title>` (it is printed under the figure by the report,
/// not inside it).
pub fn to_svg(drawing: &Drawing) -> String {
    let mut out = String::new();
    out.push_str("<?xml version=\"1.0\" encoding=\"UTF-8\" standalone=\"no\"?>\n");
    let _ = writeln!(
        out,
        "<svg xmlns=\"http://www.w3.org/2000/svg\" version=\"1.1\" width=\"{w}mm\" height=\"{h}mm\" viewBox=\"0 0 {w} {h}\">",
        w = num(drawing.width),
        h = num(drawing.height)
    );
    let _ = writeln!(out, "<title>{}</title>", escape(&drawing.caption));
    out.push_str("<g font-family=\"Helvetica, Arial, sans-serif\" fill=\"#000000\">\n");
    for shape in &drawing.shapes {
        match shape {
            Shape::Polyline { points, stroke, closed } => {
                if points.is_empty() {
                    continue;
                }
                let tag = if *closed { "polygon" } else { "polyline" };
                let _ = write!(out, "<{tag} points=\"");
                for (k, (x, y)) in points.iter().enumerate() {
                    if k > 0 {
                        out.push(' ');
                    }
                    push_num(&mut out, *x);
                    out.push(',');
                    push_num(&mut out, *y);
                }
                let _ = writeln!(out, "\" {}/>", stroke_attrs(stroke));
            }
            Shape::Text { at, size, text, anchor } => {
                let anchor = match anchor {
                    Anchor::Start => "start",
                    Anchor::Middle => "middle",
                    Anchor::End => "end",
                };
                let _ = writeln!(
                    out,
                    "<text x=\"{}\" y=\"{}\" font-size=\"{}\" text-anchor=\"{anchor}\">{}</text>",
                    num(at.0),
                    num(at.1),
                    num(size * MM_PER_PT),
                    escape(text)
                );
            }
        }
    }
    out.push_str("</g>\n</svg>\n");
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    fn sample() -> Drawing {
        Drawing {
            width: 160.0,
            height: 80.5,
            caption: "Head <A> & \"B\"".into(),
            shapes: vec![
                Shape::Polyline {
                    points: vec![(0.0, 0.0), (10.0, -0.0), (10.12345, 5.0)],
                    stroke: Stroke::dashed(0.25, 2.0, 1.0).grey(0.5),
                    closed: false,
                },
                Shape::Polyline {
                    points: vec![(1.0, 1.0), (2.0, 1.0), (2.0, 2.0)],
                    stroke: Stroke::solid(0.35),
                    closed: true,
                },
                Shape::Text { at: (80.0, 70.0), size: 9.0, text: "D < 2 & L > r".into(), anchor: Anchor::Middle },
            ],
        }
    }

    #[test]
    fn page_is_sized_in_millimetres_with_a_matching_view_box() {
        let svg = to_svg(&sample());
        assert!(svg.starts_with("<?xml version=\"1.0\""));
        assert!(svg.contains("width=\"160.000mm\" height=\"80.500mm\" viewBox=\"0 0 160.000 80.500\""));
        assert!(svg.contains("version=\"1.1\""));
        assert!(svg.trim_end().ends_with("</svg>"));
    }

    #[test]
    fn numbers_match_float_formatting() {
        // The integer writer must agree with `format!("{:.3}")` away from exact ties.
        for v in [0.0, -0.0, -0.0004, 1.0, -1.23449, 123.4567, 0.9996, -0.9996, 1e6 + 0.123, 159.99951] {
            let want = format!("{v:.3}");
            let want = if want == "-0.000" { "0.000".to_string() } else { want };
            assert_eq!(num(v), want, "{v}");
        }
        assert_eq!(num(f64::NAN), "0.000");
    }

    #[test]
    fn numbers_have_fixed_decimals_and_no_negative_zero() {
        let svg = to_svg(&sample());
        assert!(svg.contains("points=\"0.000,0.000 10.000,0.000 10.123,5.000\""));
        assert!(!svg.contains("-0.000"));
    }

    #[test]
    fn strokes_dashes_and_grey_are_written() {
        let svg = to_svg(&sample());
        assert!(svg.contains("stroke=\"#808080\" stroke-width=\"0.250\""));
        assert!(svg.contains("stroke-dasharray=\"2.000 1.000\""));
        assert!(svg.contains("<polygon points=\"1.000,1.000 2.000,1.000 2.000,2.000\""));
    }

    #[test]
    fn text_is_escaped_and_sized_from_points() {
        let svg = to_svg(&sample());
        assert!(svg.contains(">D &lt; 2 &amp; L &gt; r</text>"));
        assert!(svg.contains("<title>Head &lt;A&gt; &amp; &quot;B&quot;</title>"));
        // 9 pt = 3.175 mm.
        assert!(svg.contains("font-size=\"3.175\" text-anchor=\"middle\""));
        assert!(!svg.contains("<A>"));
        assert_eq!(escape("a'b\u{1}c"), "a&apos;bc");
    }

    #[test]
    fn output_is_deterministic() {
        assert_eq!(to_svg(&sample()), to_svg(&sample()));
    }
}
