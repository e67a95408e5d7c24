//! Figures: a [`Drawing`] placed as PDF vectors with its caption below.
//!
//! A figure keeps its drawn size unless it is wider than the text column or
//! taller than a page, in which case it is scaled down as a whole (line
//! widths, dashes and label sizes with it, so it looks the same, only
//! smaller). It is never split across pages.

use super::fonts::{metrics, Face};
use super::layout::{Item, Layouter, LEADING, MM};
use super::text::{wrap, BaseStyle};
use super::PdfError;
use crate::drawing::{Anchor, Drawing, Shape};

/// Caption text size, pt.
const CAPTION_SIZE: f32 = 8.5;
/// Space between the drawing and its caption, pt.
const CAPTION_GAP: f32 = 5.0;
/// Smallest label size after scaling, pt; smaller text cannot be read on paper.
const MIN_LABEL: f32 = 5.0;
/// Thinnest stroke after scaling, pt.
const MIN_STROKE: f32 = 0.2;

fn caption_style() -> BaseStyle {
    BaseStyle { size: CAPTION_SIZE, bold: false, italic: true }
}

/// The caption to print: the Markdown alternative text, or the drawing's own.
fn caption_text<'d>(alt: &'d str, drawing: &'d Drawing) -> &'d str {
    if alt.trim().is_empty() {
        drawing.caption.as_str()
    } else {
        alt
    }
}

/// Checks that a drawing can be placed: a positive finite size and finite
/// coordinates everywhere. A figure comes from the program, not the user, so
/// a bad one is reported rather than drawn half.
fn validate(name: &str, d: &Drawing) -> Result<(), PdfError> {
    let bad = |reason: String| PdfError::InvalidFigure { name: name.to_string(), reason };
    if !(d.width.is_finite() && d.height.is_finite() && d.width > 0.0 && d.height > 0.0) {
        return Err(bad(format!("its size {} mm x {} mm is not positive and finite", d.width, d.height)));
    }
    for (i, shape) in d.shapes.iter().enumerate() {
        let finite = match shape {
            Shape::Polyline { points, stroke, .. } => {
                points.iter().all(|(x, y)| x.is_finite() && y.is_finite())
                    && stroke.width.is_finite()
                    && stroke.grey.is_finite()
                    && stroke.dash.is_none_or(|(a, b)| a.is_finite() && b.is_finite())
            }
            Shape::Text { at, size, .. } => at.0.is_finite() && at.1.is_finite() && size.is_finite(),
        };
        if !finite {
            return Err(bad(format!("shape {} has a value that is not finite", i + 1)));
        }
    }
    Ok(())
}

impl Layouter<'_> {
    /// Scale factor and caption lines of a figure placed in `width` points.
    fn figure_fit(&self, d: &Drawing, caption: &str, width: f32) -> (f32, usize) {
        let span = super::blocks::Span { text: caption.to_string(), bold: false, italic: false, code: false };
        let lines = if caption.trim().is_empty() { 0 } else { wrap(self.faces, &[span], caption_style(), width).len() };
        let caption_h = lines as f32 * CAPTION_SIZE * LEADING + CAPTION_GAP;
        let w = d.width as f32 * MM;
        let h = d.height as f32 * MM;
        let scale = 1.0f32.min(width / w).min((self.body_height() - caption_h - 2.0).max(10.0) / h);
        (scale, lines)
    }

    /// Height a figure will take (0 for an unknown one, which fails later).
    pub fn figure_height(&self, name: &str, alt: &str, width: f32) -> f32 {
        let Some(d) = self.figures.get(name) else {
            return 0.0;
        };
        if validate(name, d).is_err() {
            return 0.0;
        }
        let caption = caption_text(alt, d);
        let (scale, lines) = self.figure_fit(d, caption, width);
        d.height as f32 * MM * scale + CAPTION_GAP + lines as f32 * CAPTION_SIZE * LEADING
    }

    /// Places the figure `name` centred in the column from `x`, `width` wide.
    pub fn figure(&mut self, name: &str, alt: &str, x: f32, width: f32) -> Result<(), PdfError> {
        let figures = self.figures;
        let d = figures.get(name).ok_or_else(|| PdfError::UnknownFigure { name: name.to_string() })?;
        validate(name, d)?;
        let caption = caption_text(alt, d).to_string();
        let total = self.figure_height(name, alt, width);
        self.ensure(total);
        let (s, _) = self.figure_fit(d, &caption, width);
        let k = MM * s;
        let w = d.width as f32 * k;
        let h = d.height as f32 * k;
        let left = x + (width - w) / 2.0;
        let top = self.y;
        self.take_marker(top + 10.0);
        let map = |(px, py): (f64, f64)| (left + px as f32 * k, top + py as f32 * k);
        for shape in &d.shapes {
            match shape {
                Shape::Polyline { points, stroke, closed } => {
                    if points.len() < 2 {
                        continue;
                    }
                    let dash = stroke.dash.and_then(|(a, b)| {
                        let (a, b) = (a as f32 * k, b as f32 * k);
                        (a > 0.0 && b > 0.0).then_some((a, b))
                    });
                    self.push(Item::Stroke {
                        points: points.iter().copied().map(map).collect(),
                        closed: *closed,
                        width: (stroke.width as f32 * k).max(MIN_STROKE),
                        grey: (stroke.grey as f32).clamp(0.0, 1.0),
                        dash,
                    });
                }
                Shape::Text { at, size, text, anchor } => {
                    let size = (*size as f32 * s).max(MIN_LABEL);
                    let text = super::fonts::printable(self.faces, Face::Regular, text);
                    let tw = metrics(self.faces, Face::Regular).width(&text, size);
                    let (ax, ay) = map(*at);
                    let tx = match anchor {
                        Anchor::Start => ax,
                        Anchor::Middle => ax - tw / 2.0,
                        Anchor::End => ax - tw,
                    };
                    self.text_at(tx, ay, Face::Regular, size, &text);
                }
            }
        }
        self.y = top + h + CAPTION_GAP;
        if !caption.trim().is_empty() {
            let span = super::blocks::Span { text: caption, bold: false, italic: false, code: false };
            let lh = CAPTION_SIZE * LEADING;
            for line in wrap(self.faces, &[span], caption_style(), width) {
                let baseline = self.y + lh * super::layout::BASELINE;
                self.draw_line(&line, x + (width - line.width) / 2.0, baseline);
                self.y += lh;
            }
        }
        Ok(())
    }
}
