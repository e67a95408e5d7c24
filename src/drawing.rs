//! A small vector drawing model shared by every output format.
//!
//! Head profiles, deviation plots and any later figure are built once as a
//! [`Drawing`]; `render::svg` writes it as an SVG file and `render::pdf` draws
//! the same shapes as PDF vectors, so the two can never show different lines.
//!
//! Coordinates are millimetres on the printed page, origin at the top left,
//! x to the right and y downwards (the SVG convention). Renderers that use
//! another convention (PDF has y upwards) convert at their edge.

use serde::Serialize;

/// A complete figure: its size on paper, a caption and its shapes in drawing order.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Drawing {
    /// Width of the figure on paper, mm.
    pub width: f64,
    /// Height of the figure on paper, mm.
    pub height: f64,
    /// One line of text shown under the figure (may be empty).
    pub caption: String,
    /// Shapes, painted in order.
    pub shapes: Vec<Shape>,
}

/// Line style of a stroked shape.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Stroke {
    /// Line width, mm.
    pub width: f64,
    /// Grey level 0.0 (black) to 1.0 (white); figures are monochrome by design
    /// so that they survive photocopying and archive scanning.
    pub grey: f64,
    /// Dash pattern: `None` for a solid line, `Some((dash, gap))` in mm.
    pub dash: Option<(f64, f64)>,
}

impl Stroke {
    /// A solid black line of the given width (mm).
    pub fn solid(width: f64) -> Stroke {
        Stroke { width, grey: 0.0, dash: None }
    }
    /// A dashed line of the given width, dash and gap (mm).
    pub fn dashed(width: f64, dash: f64, gap: f64) -> Stroke {
        Stroke { width, grey: 0.0, dash: Some((dash, gap)) }
    }
    /// The same stroke in a grey level (0 black, 1 white).
    pub fn grey(mut self, grey: f64) -> Stroke {
        self.grey = grey;
        self
    }
}

/// Horizontal anchoring of a text label relative to its point.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub enum Anchor {
    /// The point is the left end of the text.
    Start,
    /// The point is the middle of the text.
    Middle,
    /// The point is the right end of the text.
    End,
}

/// One element of a drawing.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub enum Shape {
    /// An open or closed polyline through the points (mm). Curves are
    /// represented as finely sampled polylines so every renderer draws them alike.
    Polyline {
        /// Vertices in drawing coordinates, mm.
        points: Vec<(f64, f64)>,
        /// Line style.
        stroke: Stroke,
        /// Join the last point back to the first.
        closed: bool,
    },
    /// A text label whose baseline starts, centres or ends at `at`.
    Text {
        /// Anchor point, mm.
        at: (f64, f64),
        /// Text size, points.
        size: f64,
        /// The label.
        text: String,
        /// Horizontal anchoring.
        anchor: Anchor,
    },
}
