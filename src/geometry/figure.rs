//! Engineering figures of a head: the section drawing with its main
//! dimensions and the deviation plot for as-built inspection.
//!
//! Both build a [`Drawing`] (mm on paper, y downwards) that every renderer
//! draws alike. Curves are sampled finely enough that the polyline differs
//! from the true curve by far less than a line width.

use super::deviation::{Deviation, PointDeviation};
use super::profile::{Profile, Segment, SegmentRole};
use super::{HeadShape, HeadSpec};
use crate::drawing::{Anchor, Drawing, Shape, Stroke};

/// Width of every figure on paper, mm.
const WIDTH: f64 = 160.0;
/// Text sizes, points.
const DIM_TEXT: f64 = 7.0;
const LEGEND_TEXT: f64 = 7.5;
const TITLE_TEXT: f64 = 9.0;
const MARK_TEXT: f64 = 6.0;
/// Line widths, mm.
const THICK: f64 = 0.35;
const THIN: f64 = 0.18;

/// The words printed on a figure. Every label is data, so a report can use
/// its own wording without touching the drawing code.
#[derive(Debug, Clone, PartialEq)]
pub struct DrawingLabels {
    /// Title printed at the top left, e.g. the head's name.
    pub title: String,
    /// Name of the reference shape for the legend, e.g. "true 2:1 ellipse".
    pub reference_name: String,
    /// Caption under the figure; when empty a caption is composed.
    pub caption: String,
    /// Symbol of the inside diameter.
    pub diameter: String,
    /// Symbol of the inside depth.
    pub depth: String,
    /// Symbol of the crown radius.
    pub crown_radius: String,
    /// Symbol of the knuckle radius.
    pub knuckle_radius: String,
    /// Symbol of the straight flange length.
    pub straight_flange: String,
}

impl Default for DrawingLabels {
    fn default() -> Self {
        DrawingLabels {
            title: "Head section".into(),
            reference_name: "reference shape".into(),
            caption: String::new(),
            diameter: "D".into(),
            depth: "h".into(),
            crown_radius: "L".into(),
            knuckle_radius: "r".into(),
            straight_flange: "sf".into(),
        }
    }
}

/// One point of a deviation plot.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct PlotPoint {
    /// Meridian angle, rad (0 at the crown, π/2 at the tangent line).
    pub angle: f64,
    /// Deviation, mm, positive outside.
    pub deviation: f64,
}

/// What a deviation plot shows: a computed curve, measured points, or both.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct PlotData {
    /// A continuous deviation curve (drawn as a line), in order of angle.
    pub curve: Vec<PlotPoint>,
    /// Measured points (drawn as crosses).
    pub points: Vec<PlotPoint>,
}

impl PlotData {
    /// Plot data from measured point deviations.
    pub fn from_points(points: &[PointDeviation]) -> PlotData {
        PlotData {
            curve: Vec::new(),
            points: points.iter().map(|p| PlotPoint { angle: p.angle, deviation: p.deviation }).collect(),
        }
    }

    /// Plot data from a curve of (angle rad, radius mm, deviation mm), as
    /// returned by [`super::deviation_curve`].
    pub fn from_curve(curve: &[(f64, f64, f64)]) -> PlotData {
        PlotData {
            curve: curve.iter().map(|&(angle, _, deviation)| PlotPoint { angle, deviation }).collect(),
            points: Vec::new(),
        }
    }
}

fn line(points: Vec<(f64, f64)>, stroke: Stroke) -> Shape {
    Shape::Polyline { points, stroke, closed: false }
}

fn text(at: (f64, f64), size: f64, s: impl Into<String>, anchor: Anchor) -> Shape {
    Shape::Text { at, size, text: s.into(), anchor }
}

/// A dimension value for a drawing: whole millimetres when the value is
/// whole to 0.05 mm, else one decimal.
fn dim(v: f64) -> String {
    if (v - v.round()).abs() < 0.05 {
        format!("{:.0}", v.round())
    } else {
        format!("{v:.1}")
    }
}

/// A dash-dot centre line from a to b, built from short solid pieces so that
/// every renderer shows the same pattern (long dash 6 mm, gap 1 mm, dot
/// 0.6 mm, gap 1 mm).
fn dash_dot(a: (f64, f64), b: (f64, f64), width: f64) -> Vec<Shape> {
    let len = (b.0 - a.0).hypot(b.1 - a.1);
    let (ux, uy) = if len > 0.0 { ((b.0 - a.0) / len, (b.1 - a.1) / len) } else { (0.0, 0.0) };
    let pattern = [(6.0, 1.0), (0.6, 1.0)];
    let mut out = Vec::new();
    let mut pos = 0.0;
    let mut k = 0;
    while pos < len {
        let (on, off) = pattern[k % 2];
        let end = (pos + on).min(len);
        out.push(line(vec![(a.0 + ux * pos, a.1 + uy * pos), (a.0 + ux * end, a.1 + uy * end)], Stroke::solid(width)));
        pos = end + off;
        k += 1;
    }
    out
}

/// An open arrowhead with its tip at `tip`, pointing along (dx, dy).
fn arrow(tip: (f64, f64), dir: (f64, f64)) -> Shape {
    let len = dir.0.hypot(dir.1);
    let (ux, uy) = if len > 0.0 { (dir.0 / len, dir.1 / len) } else { (1.0, 0.0) };
    let (l, w) = (2.2, 0.7);
    let back = (tip.0 - ux * l, tip.1 - uy * l);
    line(vec![(back.0 - uy * w, back.1 + ux * w), tip, (back.0 + uy * w, back.1 - ux * w)], Stroke::solid(THIN))
}

/// Samples a profile segment at `n` + 1 points offset by `off` along the
/// outward normal, in model mm.
fn sample_segment(seg: &Segment, off: f64, n: usize) -> Vec<(f64, f64)> {
    (0..=n)
        .map(|i| {
            let t = i as f64 / n as f64;
            let p = seg.point(t);
            let nn = seg.normal(t);
            (p.0 + off * nn.0, p.1 + off * nn.1)
        })
        .collect()
}

/// The whole meridian (one half), offset by `off`, in model mm.
fn sample_profile(profile: &Profile, off: f64) -> Vec<(f64, f64)> {
    let mut pts = Vec::new();
    for seg in profile.segments() {
        let zero_corner = matches!(seg, Segment::Arc { radius, .. } if *radius == 0.0) && off == 0.0;
        let n = if zero_corner { 1 } else { 160 };
        let s = sample_segment(seg, off, n);
        let skip = usize::from(!pts.is_empty());
        pts.extend(s.into_iter().skip(skip));
    }
    pts
}

/// Both halves of a meridian as polylines: one line from the left flange end
/// over the crown to the right flange end, or two separate lines when the
/// meridian does not reach the axis (an open cone).
fn both_halves(half: &[(f64, f64)]) -> Vec<Vec<(f64, f64)>> {
    let mirrored: Vec<(f64, f64)> = half.iter().rev().map(|&(x, z)| (-x, z)).collect();
    if half.first().is_some_and(|p| p.0 == 0.0) {
        let mut pts = mirrored;
        pts.extend(half.iter().skip(1).copied());
        vec![pts]
    } else {
        vec![mirrored, half.to_vec()]
    }
}

/// What a legend line shows beside its words.
enum Key {
    /// A short sample of a line style.
    Line(Stroke),
    /// A numbered circle marking a point on the figure.
    Marker(usize),
}

/// Page mapping of model (x, z) mm to paper (X, Y) mm.
#[derive(Clone, Copy)]
struct Frame {
    cx: f64,
    y_tl: f64,
    scale: f64,
}

impl Frame {
    fn at(&self, p: (f64, f64)) -> (f64, f64) {
        (self.cx + p.0 * self.scale, self.y_tl - p.1 * self.scale)
    }
    fn all(&self, pts: &[(f64, f64)]) -> Vec<(f64, f64)> {
        pts.iter().map(|&p| self.at(p)).collect()
    }
}

/// A "nice" drawing scale 1:n with n from the series 1, 1.5, 2, 2.5, 3, 4, 5,
/// 6, 8 × 10^k, the first that fits.
fn nice_scale(fit: f64) -> f64 {
    let n_min = 1.0 / fit;
    let mut decade = 10f64.powf(n_min.log10().floor());
    loop {
        for m in [1.0, 1.5, 2.0, 2.5, 3.0, 4.0, 5.0, 6.0, 8.0] {
            if m * decade >= n_min * (1.0 - 1e-12) {
                return 1.0 / (m * decade);
            }
        }
        decade *= 10.0;
    }
}

/// The section drawing of a head: inner and outer surface of both halves
/// with the straight flange, the reference profile dashed, the centre line,
/// the tangent line, the dimensions D, h (and L, r or the shape's own), the
/// deviation from the reference exaggerated on the right half, and a legend.
/// The figure is 160 mm wide; its height follows from the head's proportions.
pub fn profile_drawing(
    spec: &HeadSpec,
    profile: &Profile,
    reference: Option<&Profile>,
    deviation: Option<&Deviation>,
    labels: &DrawingLabels,
) -> Drawing {
    let big_r = 0.5 * profile.inside_diameter();
    let t = spec.thickness.max(0.0);
    let sf = profile.straight_flange();
    let inner = sample_profile(profile, 0.0);
    let outer = sample_profile(profile, t);
    let top = outer.iter().chain(inner.iter()).map(|p| p.1).fold(profile.depth(), f64::max);
    let half_width = big_r + t;

    let (left, right) = (24.0, 30.0);
    let scale = nice_scale((WIDTH - left - right) / (2.0 * half_width));
    let cx = left + half_width * scale;
    let y_tl = 16.0 + top * scale;
    let fr = Frame { cx, y_tl, scale };
    let y_bottom = fr.at((0.0, -sf)).1;

    let mut shapes = Vec::new();
    let mut legend: Vec<(Key, String)> = Vec::new();

    // Title and scale.
    shapes.push(text((left - 16.0, 7.0), TITLE_TEXT, labels.title.clone(), Anchor::Start));
    shapes.push(text((WIDTH - 4.0, 7.0), DIM_TEXT, format!("scale 1:{}", dim(1.0 / scale)), Anchor::End));

    // Centre line and tangent line.
    shapes.extend(dash_dot((cx, 11.0), (cx, y_bottom + 4.0), THIN));
    let x_dim_h = fr.at((half_width, 0.0)).0 + 9.0;
    let x_sf = fr.at((-half_width, 0.0)).0 - 5.0;
    shapes.push(line(
        vec![(if sf > 0.0 { x_sf - 1.5 } else { fr.at((-half_width, 0.0)).0 }, y_tl), (x_dim_h + 1.5, y_tl)],
        Stroke::dashed(THIN, 3.0, 1.5).grey(0.35),
    ));
    shapes.push(text((x_dim_h + 1.5, y_tl + 3.2), DIM_TEXT, "tangent line", Anchor::Start));

    // The reference, dashed, under the head's own lines.
    if let Some(reference) = reference {
        let r = sample_profile(reference, 0.0);
        for half in both_halves(&r) {
            shapes.push(line(fr.all(&half), Stroke::dashed(0.25, 2.0, 1.2).grey(0.3)));
        }
        legend.push((
            Key::Line(Stroke::dashed(0.25, 2.0, 1.2).grey(0.3)),
            format!("reference: {}", labels.reference_name),
        ));
    }

    // The head wall: inner and outer surfaces and the cut ends.
    for half in both_halves(&inner) {
        shapes.push(line(fr.all(&half), Stroke::solid(THICK)));
    }
    if t > 0.0 {
        for half in both_halves(&outer) {
            shapes.push(line(fr.all(&half), Stroke::solid(THICK)));
        }
        if let (Some(&i_end), Some(&o_end)) = (inner.last(), outer.last()) {
            for sign in [-1.0, 1.0] {
                shapes.push(line(
                    vec![fr.at((sign * i_end.0, i_end.1)), fr.at((sign * o_end.0, o_end.1))],
                    Stroke::solid(THICK),
                ));
            }
        }
        if let (Some(&i0), Some(&o0)) = (inner.first(), outer.first()) {
            if i0.0 > 0.0 {
                // An open cone: the wall is cut at the small end.
                for sign in [-1.0, 1.0] {
                    shapes
                        .push(line(vec![fr.at((sign * i0.0, i0.1)), fr.at((sign * o0.0, o0.1))], Stroke::solid(THICK)));
                }
            }
        }
    }
    legend.push((Key::Line(Stroke::solid(THICK)), format!("head wall, t = {} mm", dim(t))));

    // The deviation from the reference, exaggerated, on the right half. A
    // deviation already visible at the drawing scale is not exaggerated, and
    // the head itself then shows it.
    if let Some(reference) = reference {
        let curve: Vec<(f64, f64, f64, f64)> = inner
            .iter()
            .map(|&(x, z)| {
                let n = reference.nearest(x, z);
                (n.x, n.z, x - n.x, z - n.z)
            })
            .collect();
        let max_dev = curve.iter().map(|c| c.2.hypot(c.3)).fold(0.0, f64::max);
        let factor = if max_dev * scale > 1e-4 { exaggeration(max_dev * scale) } else { 1.0 };
        if factor > 1.0 {
            let pts: Vec<(f64, f64)> =
                curve.iter().map(|&(qx, qz, dx, dz)| fr.at((qx + factor * dx, qz + factor * dz))).collect();
            shapes.push(line(pts, Stroke::solid(0.25).grey(0.5)));
            legend.push((
                Key::Line(Stroke::solid(0.25).grey(0.5)),
                format!("deviation from the reference, shown ×{} (right half)", dim(factor)),
            ));
        }
        if let Some(dev) = deviation {
            let marks = [
                (dev.max_outside, dev.at_radius_outside, dev.at_height_outside, "outside"),
                (dev.max_inside, dev.at_radius_inside, dev.at_height_inside, "inside"),
            ];
            let mut number = 0;
            for &(value, x, z, side) in &marks {
                // Below a twentieth of a millimetre there is nothing to mark.
                if value < 0.05 {
                    continue;
                }
                number += 1;
                let n = reference.nearest(x, z);
                let p = fr.at((n.x + factor * (x - n.x), n.z + factor * (z - n.z)));
                shapes.push(circle(p, 0.9));
                shapes.push(text((p.0 + 1.2, p.1 - 1.2), MARK_TEXT, number.to_string(), Anchor::Start));
                legend.push((
                    Key::Marker(number),
                    format!("largest deviation {side} the reference: {value:.1} mm at radius {} mm", dim(x)),
                ));
            }
        }
    }

    // Dimension D, below the flange end, between the inner surfaces.
    let y_d = y_bottom + 8.0;
    let (xl, xr) = (fr.at((-big_r, 0.0)).0, fr.at((big_r, 0.0)).0);
    for x in [xl, xr] {
        shapes.push(line(vec![(x, y_bottom + 1.0), (x, y_d + 1.5)], Stroke::solid(THIN)));
    }
    shapes.push(line(vec![(xl, y_d), (xr, y_d)], Stroke::solid(THIN)));
    shapes.push(arrow((xl, y_d), (-1.0, 0.0)));
    shapes.push(arrow((xr, y_d), (1.0, 0.0)));
    shapes.push(text(
        (cx + 8.0, y_d - 1.0),
        DIM_TEXT,
        format!("{} = {}", labels.diameter, dim(2.0 * big_r)),
        Anchor::Start,
    ));

    // Dimension h, right of the head, from the tangent line to the inner crown.
    let y_crown = fr.at((0.0, profile.depth())).1;
    shapes.push(line(vec![(cx, y_crown), (x_dim_h + 1.5, y_crown)], Stroke::solid(THIN).grey(0.35)));
    shapes.extend(vertical_dimension(x_dim_h, y_crown, y_tl));
    shapes.push(text(
        (x_dim_h + 1.5, 0.5 * (y_crown + y_tl) + 1.0),
        DIM_TEXT,
        format!("{} = {}", labels.depth, dim(profile.depth())),
        Anchor::Start,
    ));

    // Straight flange, left of the head.
    if sf > 0.0 {
        shapes.push(line(vec![fr.at((-half_width, -sf)), (x_sf - 1.5, y_bottom)], Stroke::solid(THIN)));
        shapes.extend(vertical_dimension(x_sf, y_tl, y_bottom));
        shapes.push(text(
            (x_sf - 1.5, 0.5 * (y_tl + y_bottom) + 1.0),
            DIM_TEXT,
            format!("{} = {}", labels.straight_flange, dim(sf)),
            Anchor::End,
        ));
    }

    // The shape's own dimensions, as radius leaders on the left half.
    shapes.extend(shape_dimensions(spec, profile, &fr, labels));

    // Legend under the D dimension.
    let mut y = y_d + 9.0;
    for (key, label) in &legend {
        match key {
            Key::Line(stroke) => {
                shapes.push(line(vec![(left - 16.0, y - 1.0), (left - 4.0, y - 1.0)], *stroke));
            }
            Key::Marker(n) => {
                shapes.push(circle((left - 10.0, y - 1.0), 0.9));
                shapes.push(text((left - 8.8, y - 2.2), MARK_TEXT, n.to_string(), Anchor::Start));
            }
        }
        shapes.push(text((left - 1.0, y), LEGEND_TEXT, label.clone(), Anchor::Start));
        y += 4.6;
    }
    let height = (y + 2.0).ceil();

    let caption = if labels.caption.is_empty() {
        let mut c = format!("{}: section through the head at scale 1:{}", labels.title, dim(1.0 / scale));
        if reference.is_some() {
            c.push_str(&format!("; {} dashed", labels.reference_name));
        }
        if let Some((_, l)) = legend.iter().find(|(_, l)| l.starts_with("deviation")) {
            c.push_str(&format!("; {l} on the right half"));
        }
        c.push('.');
        c
    } else {
        labels.caption.clone()
    };
    Drawing { width: WIDTH, height, caption, shapes }
}

/// The exaggeration factor for a deviation that measures `paper` mm at the
/// drawing scale: the largest of 1, 2, 5 × 10^k that draws it at most 7 mm.
fn exaggeration(paper: f64) -> f64 {
    let mut best = 1.0;
    for k in 0..6 {
        for m in [1.0, 2.0, 5.0] {
            let f = m * 10f64.powi(k);
            if f * paper <= 7.0 {
                best = f;
            }
        }
    }
    best
}

/// A vertical dimension line between paper heights y_top < y_low at x, with
/// arrows inside the span, or outside pointing in when the span is too short
/// for two arrowheads.
fn vertical_dimension(x: f64, y_top: f64, y_low: f64) -> Vec<Shape> {
    if y_low - y_top >= 6.0 {
        vec![
            line(vec![(x, y_top), (x, y_low)], Stroke::solid(THIN)),
            arrow((x, y_top), (0.0, -1.0)),
            arrow((x, y_low), (0.0, 1.0)),
        ]
    } else {
        vec![
            line(vec![(x, y_top - 4.0), (x, y_low + 4.0)], Stroke::solid(THIN)),
            arrow((x, y_top), (0.0, 1.0)),
            arrow((x, y_low), (0.0, -1.0)),
        ]
    }
}

/// A small circle (a closed 24-gon) of radius r mm around p.
fn circle(p: (f64, f64), r: f64) -> Shape {
    let pts = (0..24)
        .map(|i| {
            let a = std::f64::consts::TAU * i as f64 / 24.0;
            (p.0 + r * a.cos(), p.1 + r * a.sin())
        })
        .collect();
    Shape::Polyline { points: pts, stroke: Stroke::solid(THIN), closed: true }
}

/// A radius leader: arrow on the arc at angle θ of the arc with centre c and
/// radius ρ (model mm), drawn on the left half towards the centre for at most
/// `max_len` mm of paper, with the label at its inner end.
fn radius_leader(fr: &Frame, c: (f64, f64), rho: f64, theta: f64, max_len: f64, label: String) -> Vec<Shape> {
    let on_arc = (-(c.0 + rho * theta.sin()), c.1 + rho * theta.cos());
    let tip = fr.at(on_arc);
    // Direction from the arc point towards the centre, on paper (mirrored x).
    let dir = (theta.sin(), theta.cos());
    let mut len = (rho * fr.scale).min(max_len);
    // Keep the label above the tangent line, clear of the D dimension.
    let room = fr.y_tl - 5.0 - tip.1;
    if dir.1 > 0.0 && room > 0.0 {
        len = len.min(room / dir.1);
    }
    let inner = (tip.0 + dir.0 * len, tip.1 + dir.1 * len);
    vec![
        line(vec![inner, tip], Stroke::solid(THIN)),
        arrow(tip, (-dir.0, -dir.1)),
        text((inner.0 + dir.0 * 1.0, inner.1 + dir.1 * 1.0 + 2.6), DIM_TEXT, label, Anchor::Middle),
    ]
}

fn shape_dimensions(spec: &HeadSpec, profile: &Profile, fr: &Frame, labels: &DrawingLabels) -> Vec<Shape> {
    let mut out = Vec::new();
    match spec.shape {
        HeadShape::Torispherical { crown_radius, knuckle_radius } => {
            for seg in profile.head_segments() {
                if let Segment::Arc { center, radius, theta0, theta1, role } = *seg {
                    let (label, th, max_len) = match role {
                        SegmentRole::Crown => {
                            (format!("{} = {}", labels.crown_radius, dim(crown_radius)), 0.55 * (theta0 + theta1), 22.0)
                        }
                        _ => (
                            format!("{} = {}", labels.knuckle_radius, dim(knuckle_radius)),
                            0.5 * (theta0 + theta1),
                            16.0,
                        ),
                    };
                    out.extend(radius_leader(fr, center, radius, th, max_len, label));
                }
            }
        }
        HeadShape::Hemispherical => {
            let r = 0.5 * profile.inside_diameter();
            out.extend(radius_leader(fr, (0.0, 0.0), r, 0.25 * std::f64::consts::PI, 20.0, format!("R = {}", dim(r))));
        }
        HeadShape::Ellipsoidal { aspect_ratio } => {
            let p = fr.at((0.0, 0.2 * profile.depth()));
            out.push(text((p.0 - 3.0, p.1), DIM_TEXT, format!("ellipse, D/2h = {aspect_ratio:.2}"), Anchor::End));
        }
        HeadShape::Conical { small_diameter, half_apex_angle } => {
            let p = fr.at((0.0, 0.2 * profile.depth()));
            let mut s = format!("cone, α = {:.1}°", half_apex_angle.to_degrees());
            if small_diameter > 0.0 {
                s.push_str(&format!(", Ds = {}", dim(small_diameter)));
            }
            out.push(text((p.0 - 3.0, p.1), DIM_TEXT, s, Anchor::End));
        }
    }
    out
}

/// Chooses tick spacing 1, 2 or 5 × 10^k giving at most `max_ticks` intervals over `span`.
fn tick_step(span: f64, max_ticks: f64) -> f64 {
    let raw = (span / max_ticks).max(1e-9);
    let decade = 10f64.powf(raw.log10().floor());
    for m in [1.0, 2.0, 5.0, 10.0] {
        if m * decade >= raw {
            return m * decade;
        }
    }
    10.0 * decade
}

/// Formats a tolerance limit to three decimals without trailing zeros
/// (15.625 stays 15.625, 31.250 becomes 31.25).
fn fmt_limit(v: f64) -> String {
    let s = format!("{v:.3}");
    s.trim_end_matches('0').trim_end_matches('.').to_string()
}

/// Formats a tick label with as many decimals as the step needs.
fn tick_label(v: f64, step: f64) -> String {
    let decimals = if step >= 1.0 { 0 } else { (-step.log10()).ceil() as usize };
    let s = format!("{v:.decimals$}");
    if s.starts_with('-') && s[1..].chars().all(|c| c == '0' || c == '.') {
        s[1..].to_string()
    } else {
        s.replace('-', "−")
    }
}

/// A deviation plot for inspection: deviation (mm, positive outside) against
/// the meridian angle (0° at the crown, 90° at the tangent line), with the
/// UG-81 band `limits` = (outside, inside), mm, as dashed lines, a zero line,
/// ticks and axis labels. Measured points are crosses, a curve is a line.
pub fn deviation_plot(data: &PlotData, limits: (f64, f64), labels: &DrawingLabels) -> Drawing {
    let height = 86.0;
    let (x0, x1, y0, y1) = (24.0, WIDTH - 8.0, 12.0, height - 16.0);
    let all = data.curve.iter().chain(data.points.iter()).filter(|p| p.deviation.is_finite());
    let (mut hi, mut lo) = (limits.0.abs(), -limits.1.abs());
    for p in all {
        hi = hi.max(p.deviation);
        lo = lo.min(p.deviation);
    }
    if hi - lo <= 0.0 {
        hi = 1.0;
        lo = -1.0;
    }
    let pad = 0.12 * (hi - lo);
    let step = tick_step(hi - lo + 2.0 * pad, 8.0);
    let top = ((hi + pad) / step).ceil() * step;
    let bottom = ((lo - pad) / step).floor() * step;
    let px = |angle: f64| x0 + (angle.to_degrees().clamp(0.0, 90.0) / 90.0) * (x1 - x0);
    let py = |dev: f64| y1 - (dev - bottom) / (top - bottom) * (y1 - y0);

    let mut shapes = vec![
        text((4.0, 7.0), TITLE_TEXT, labels.title.clone(), Anchor::Start),
        Shape::Polyline {
            points: vec![(x0, y0), (x1, y0), (x1, y1), (x0, y1)],
            stroke: Stroke::solid(THIN),
            closed: true,
        },
    ];
    // Angle ticks every 15°.
    for k in 0..=6 {
        let deg = 15.0 * k as f64;
        let x = px(deg.to_radians());
        shapes.push(line(vec![(x, y1), (x, y1 + 1.5)], Stroke::solid(THIN)));
        shapes.push(line(vec![(x, y0), (x, y1)], Stroke::solid(0.1).grey(0.8)));
        shapes.push(text((x, y1 + 4.5), DIM_TEXT, format!("{deg:.0}"), Anchor::Middle));
    }
    shapes.push(text(
        (0.5 * (x0 + x1), y1 + 9.5),
        DIM_TEXT,
        "meridian angle from the axis, degrees (0 = crown, 90 = tangent line)",
        Anchor::Middle,
    ));
    // Deviation ticks.
    let n = ((top - bottom) / step).round() as i64;
    for k in 0..=n {
        let v = bottom + step * k as f64;
        let y = py(v);
        shapes.push(line(vec![(x0 - 1.5, y), (x0, y)], Stroke::solid(THIN)));
        shapes.push(line(vec![(x0, y), (x1, y)], Stroke::solid(0.1).grey(0.8)));
        shapes.push(text((x0 - 2.5, y + 1.0), DIM_TEXT, tick_label(v, step), Anchor::End));
    }
    shapes.push(text((x0, y0 - 2.0), DIM_TEXT, "deviation, mm (+ outside, − inside)", Anchor::Start));
    // Zero line and the UG-81 band.
    shapes.push(line(vec![(x0, py(0.0)), (x1, py(0.0))], Stroke::solid(THIN)));
    let band = Stroke::dashed(0.3, 3.0, 1.5);
    let (up, down) = (limits.0.abs(), -limits.1.abs());
    shapes.push(line(vec![(x0, py(up)), (x1, py(up))], band));
    shapes.push(line(vec![(x0, py(down)), (x1, py(down))], band));
    shapes.push(text(
        (x1 - 1.0, py(up) - 1.0),
        DIM_TEXT,
        format!("UG-81 outside limit +{} mm", fmt_limit(up)),
        Anchor::End,
    ));
    shapes.push(text(
        (x1 - 1.0, py(down) + 3.0),
        DIM_TEXT,
        format!("UG-81 inside limit −{} mm", fmt_limit(-down)),
        Anchor::End,
    ));
    // The data.
    if data.curve.len() > 1 {
        let pts =
            data.curve.iter().filter(|p| p.deviation.is_finite()).map(|p| (px(p.angle), py(p.deviation))).collect();
        shapes.push(line(pts, Stroke::solid(THICK)));
    }
    let mut outside_band = 0;
    for p in data.points.iter().filter(|p| p.deviation.is_finite()) {
        let (x, y) = (px(p.angle), py(p.deviation));
        let s = 1.0;
        shapes.push(line(vec![(x - s, y - s), (x + s, y + s)], Stroke::solid(0.25)));
        shapes.push(line(vec![(x - s, y + s), (x + s, y - s)], Stroke::solid(0.25)));
        if p.deviation > up || p.deviation < down {
            outside_band += 1;
            shapes.push(circle((x, y), 1.8));
        }
    }
    let caption = if labels.caption.is_empty() {
        let mut c = format!("{}: deviation from the {} along the meridian", labels.title, labels.reference_name);
        if !data.points.is_empty() {
            c.push_str(&format!(
                "; {outside_band} of {} measured points outside the UG-81 band (circled)",
                data.points.len()
            ));
        }
        c.push('.');
        c
    } else {
        labels.caption.clone()
    };
    Drawing { width: WIDTH, height, caption, shapes }
}
