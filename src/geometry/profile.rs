//! The exact inside meridian of a head, as a chain of segments.
//!
//! The chain runs from the vessel axis (the crown, x = 0) down to the tangent
//! line (x = D/2, z = 0) and then along the straight flange (z < 0). Every
//! segment is parametrised by a local t in [0, 1]; the profile as a whole by
//! s in [0, n], where n is the number of segments and s = i + t is the point
//! at t on segment i. Successive segments share their end points, so s is
//! continuous along the whole meridian.

use super::numeric::brent_root;
use super::{finite, invalid, length, GeometryError, HeadShape, HeadSpec};
use serde::Serialize;
use std::f64::consts::FRAC_PI_2;
use std::sync::OnceLock;

/// What part of the head a segment is.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub enum SegmentRole {
    /// The spherical crown of a torispherical head.
    Crown,
    /// The toroidal knuckle of a torispherical head.
    Knuckle,
    /// The sphere of a hemispherical head.
    Sphere,
    /// The quarter ellipse of an ellipsoidal head.
    Ellipse,
    /// The straight generator of a conical head.
    Cone,
    /// A sharp corner (apex or cone-to-flange junction), held as an arc of
    /// zero radius so that the outer surface rounds it exactly.
    Corner,
    /// The cylindrical straight flange below the tangent line.
    Flange,
}

/// One piece of the meridian. Angles θ are measured from the +z axis towards
/// +x, so a point on an arc is (cx + ρ·sin θ, cz + ρ·cos θ) and its outward
/// normal is (sin θ, cos θ).
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub enum Segment {
    /// A circular arc, θ from `theta0` to `theta1` (rad, increasing).
    Arc {
        /// Centre (x, z), mm.
        center: (f64, f64),
        /// Radius ρ, mm (0 for a sharp corner).
        radius: f64,
        /// Start angle, rad.
        theta0: f64,
        /// End angle, rad.
        theta1: f64,
        /// Which part of the head this arc is.
        role: SegmentRole,
    },
    /// The quarter ellipse x = a·sin ψ, z = b·cos ψ for ψ in [0, π/2].
    Ellipse {
        /// Radial semi-axis a = D/2, mm.
        a: f64,
        /// Axial semi-axis b = h, mm.
        b: f64,
    },
    /// A straight line from `start` to `end`.
    Line {
        /// Start point (x, z), mm.
        start: (f64, f64),
        /// End point (x, z), mm.
        end: (f64, f64),
        /// Which part of the head this line is.
        role: SegmentRole,
    },
}

/// The point of a profile nearest to a given point.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Nearest {
    /// Signed distance, mm: positive outside the inner surface (away from the
    /// vessel interior), negative inside.
    pub distance: f64,
    /// Profile parameter s of the nearest point.
    pub s: f64,
    /// Radius of the nearest point, mm.
    pub x: f64,
    /// Height of the nearest point above the tangent line, mm.
    pub z: f64,
    /// Meridian angle at the nearest point: angle of the outward normal from
    /// the axis, rad (0 at the crown, π/2 on the flange).
    pub angle: f64,
}

impl Segment {
    /// Which part of the head this segment is.
    pub fn role(&self) -> SegmentRole {
        match self {
            Segment::Arc { role, .. } | Segment::Line { role, .. } => *role,
            Segment::Ellipse { .. } => SegmentRole::Ellipse,
        }
    }

    /// The point at local parameter t in [0, 1], mm.
    pub fn point(&self, t: f64) -> (f64, f64) {
        match *self {
            Segment::Arc { center, radius, theta0, theta1, .. } => {
                let th = theta0 + t * (theta1 - theta0);
                (center.0 + radius * th.sin(), center.1 + radius * th.cos())
            }
            Segment::Ellipse { a, b } => {
                let psi = t * FRAC_PI_2;
                (a * psi.sin(), b * psi.cos())
            }
            Segment::Line { start, end, .. } => (start.0 + t * (end.0 - start.0), start.1 + t * (end.1 - start.1)),
        }
    }

    /// The unit outward normal at local parameter t.
    pub fn normal(&self, t: f64) -> (f64, f64) {
        match *self {
            Segment::Arc { theta0, theta1, .. } => {
                let th = theta0 + t * (theta1 - theta0);
                (th.sin(), th.cos())
            }
            Segment::Ellipse { a, b } => {
                let psi = t * FRAC_PI_2;
                let (nx, nz) = (b * psi.sin(), a * psi.cos());
                let w = nx.hypot(nz);
                (nx / w, nz / w)
            }
            Segment::Line { start, end, .. } => {
                // The tangent (dx, dz) turned clockwise gives the outward side
                // because the chain runs from the axis towards the flange.
                let (dx, dz) = (end.0 - start.0, end.1 - start.1);
                let w = dx.hypot(dz);
                (-dz / w, dx / w)
            }
        }
    }

    /// The nearest point of this segment to p: (local t, squared distance).
    fn nearest(&self, p: (f64, f64)) -> (f64, f64) {
        match *self {
            Segment::Arc { center, radius, theta0, theta1, .. } => {
                let (vx, vz) = (p.0 - center.0, p.1 - center.1);
                let span = theta1 - theta0;
                let mut best = self.candidate(p, 0.0);
                let end = self.candidate(p, 1.0);
                if end.1 < best.1 {
                    best = end;
                }
                if span > 0.0 && (vx != 0.0 || vz != 0.0) {
                    let th = vx.atan2(vz);
                    if th > theta0 && th < theta1 {
                        let d = vx.hypot(vz) - radius;
                        best = ((th - theta0) / span, d * d);
                    }
                }
                best
            }
            Segment::Line { start, end, .. } => {
                let (dx, dz) = (end.0 - start.0, end.1 - start.1);
                let len2 = dx * dx + dz * dz;
                let t = if len2 > 0.0 {
                    (((p.0 - start.0) * dx + (p.1 - start.1) * dz) / len2).clamp(0.0, 1.0)
                } else {
                    0.0
                };
                self.candidate(p, t)
            }
            Segment::Ellipse { a, b } => nearest_on_ellipse(a, b, p),
        }
    }

    fn candidate(&self, p: (f64, f64), t: f64) -> (f64, f64) {
        let q = self.point(t);
        (t, (p.0 - q.0).powi(2) + (p.1 - q.1).powi(2))
    }
}

/// Panels of the quarter ellipse searched for the nearest point.
const PANELS: usize = 128;

/// (sin ψ, cos ψ) at the panel ends ψ = (π/2)·i/128, computed once per
/// process: the nearest-point search is run for every sample of a shape
/// deviation, and the sines and cosines of the panel ends dominated its cost.
fn panel_ends() -> &'static [(f64, f64); PANELS + 1] {
    static TABLE: OnceLock<[(f64, f64); PANELS + 1]> = OnceLock::new();
    TABLE.get_or_init(|| {
        let mut t = [(0.0, 0.0); PANELS + 1];
        for (i, slot) in t.iter_mut().enumerate() {
            let psi = FRAC_PI_2 * i as f64 / PANELS as f64;
            *slot = psi.sin_cos();
        }
        t
    })
}

/// Nearest point of the quarter ellipse (a sin ψ, b cos ψ) to p. The squared
/// distance g(ψ) can have two local minima for points near the axis inside a
/// flat ellipse, so the quarter is sampled in 128 panels and every panel in
/// which g' changes sign from − to + is solved by Brent's method to 1e-15 rad.
fn nearest_on_ellipse(a: f64, b: f64, p: (f64, f64)) -> (f64, f64) {
    let g = |psi: f64| (p.0 - a * psi.sin()).powi(2) + (p.1 - b * psi.cos()).powi(2);
    // g'(ψ)/2 = −(p − E)·E'.
    let dg = |psi: f64| {
        let (s, c) = psi.sin_cos();
        -((p.0 - a * s) * a * c - (p.1 - b * c) * b * s)
    };
    // g' at a panel end from the tabulated sine and cosine: the same numbers
    // as `dg(hi)` (the same angle, the same sin_cos), without the trigonometry.
    let dg_at = |(s, c): (f64, f64)| -((p.0 - a * s) * a * c - (p.1 - b * c) * b * s);
    let table = panel_ends();
    let mut best = (0.0, g(0.0));
    let gend = g(FRAC_PI_2);
    if gend < best.1 {
        best = (FRAC_PI_2, gend);
    }
    let mut prev = dg_at(table[0]);
    for (i, &end) in table.iter().enumerate().skip(1) {
        let lo = FRAC_PI_2 * (i - 1) as f64 / PANELS as f64;
        let hi = FRAC_PI_2 * i as f64 / PANELS as f64;
        let cur = dg_at(end);
        if prev < 0.0 && cur >= 0.0 {
            let psi = brent_root(dg, lo, hi, 1e-15);
            let v = g(psi);
            if v < best.1 {
                best = (psi, v);
            }
        }
        prev = cur;
    }
    (best.0 / FRAC_PI_2, best.1)
}

/// The exact inside meridian of a head (see the module documentation for the
/// parametrisation).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Profile {
    segments: Vec<Segment>,
    /// Number of leading segments that form the head proper (the rest is the
    /// straight flange).
    head_segments: usize,
    /// Inside radius at the tangent line D/2, mm.
    radius: f64,
    /// Inside depth h from the tangent line to the crown, mm.
    depth: f64,
    /// Straight flange length, mm.
    straight_flange: f64,
}

impl Profile {
    /// Builds the exact inside profile of a validated head spec.
    pub fn from_spec(spec: &HeadSpec) -> Result<Profile, GeometryError> {
        spec.validate()?;
        let big_r = 0.5 * spec.inside_diameter;
        let mut segs = Vec::new();
        let depth;
        match spec.shape {
            HeadShape::Ellipsoidal { aspect_ratio } => {
                depth = big_r / aspect_ratio;
                segs.push(Segment::Ellipse { a: big_r, b: depth });
            }
            HeadShape::Torispherical { crown_radius: l, knuckle_radius: r } => {
                // The crown centre (0, zc) and knuckle centre (R − r, 0) are
                // L − r apart, which fixes the tangent angle α exactly.
                let sin_a = (big_r - r) / (l - r);
                let alpha = sin_a.asin();
                let zc = -(l - r) * alpha.cos();
                depth = zc + l;
                segs.push(Segment::Arc {
                    center: (0.0, zc),
                    radius: l,
                    theta0: 0.0,
                    theta1: alpha,
                    role: SegmentRole::Crown,
                });
                segs.push(Segment::Arc {
                    center: (big_r - r, 0.0),
                    radius: r,
                    theta0: alpha,
                    theta1: FRAC_PI_2,
                    role: SegmentRole::Knuckle,
                });
            }
            HeadShape::Hemispherical => {
                depth = big_r;
                segs.push(Segment::Arc {
                    center: (0.0, 0.0),
                    radius: big_r,
                    theta0: 0.0,
                    theta1: FRAC_PI_2,
                    role: SegmentRole::Sphere,
                });
            }
            HeadShape::Conical { small_diameter, half_apex_angle: alpha } => {
                let rs = 0.5 * small_diameter;
                depth = (big_r - rs) / alpha.tan();
                let normal_angle = FRAC_PI_2 - alpha;
                if rs == 0.0 {
                    segs.push(Segment::Arc {
                        center: (0.0, depth),
                        radius: 0.0,
                        theta0: 0.0,
                        theta1: normal_angle,
                        role: SegmentRole::Corner,
                    });
                }
                segs.push(Segment::Line { start: (rs, depth), end: (big_r, 0.0), role: SegmentRole::Cone });
                segs.push(Segment::Arc {
                    center: (big_r, 0.0),
                    radius: 0.0,
                    theta0: normal_angle,
                    theta1: FRAC_PI_2,
                    role: SegmentRole::Corner,
                });
            }
        }
        Ok(Profile::assemble(segs, big_r, depth, spec.straight_flange))
    }

    /// A true ellipse of inside diameter D (mm) and inside depth h (mm) with a
    /// straight flange (mm), for use as a reference shape. Unlike an
    /// ellipsoidal [`HeadSpec`] any positive depth is accepted, since a
    /// reference need not be a head that the code rules cover.
    pub fn ellipse(inside_diameter: f64, depth: f64, straight_flange: f64) -> Result<Profile, GeometryError> {
        let d = length("reference diameter", inside_diameter)?;
        let h = length("reference depth", depth)?;
        let sf = length("straight flange", straight_flange)?;
        if d <= 0.0 || h <= 0.0 || sf < 0.0 {
            return Err(invalid(
                "reference ellipse",
                format!("D = {d} mm and h = {h} mm must be positive, flange {sf} mm not negative"),
            ));
        }
        let segs = vec![Segment::Ellipse { a: 0.5 * d, b: h }];
        Ok(Profile::assemble(segs, 0.5 * d, h, sf))
    }

    fn assemble(mut segs: Vec<Segment>, radius: f64, depth: f64, flange: f64) -> Profile {
        let head_segments = segs.len();
        if flange > 0.0 {
            segs.push(Segment::Line { start: (radius, 0.0), end: (radius, -flange), role: SegmentRole::Flange });
        }
        Profile { segments: segs, head_segments, radius, depth, straight_flange: flange }
    }

    /// All segments, from the crown to the end of the straight flange.
    pub fn segments(&self) -> &[Segment] {
        &self.segments
    }

    /// The segments of the head proper, without the straight flange.
    pub fn head_segments(&self) -> &[Segment] {
        &self.segments[..self.head_segments]
    }

    /// Inside diameter D at the tangent line, mm.
    pub fn inside_diameter(&self) -> f64 {
        2.0 * self.radius
    }

    /// Inside depth h from the tangent line to the crown, mm.
    pub fn depth(&self) -> f64 {
        self.depth
    }

    /// Length of the straight flange, mm.
    pub fn straight_flange(&self) -> f64 {
        self.straight_flange
    }

    /// The end of the parameter range, s_max = number of segments.
    pub fn parameter_end(&self) -> f64 {
        self.segments.len() as f64
    }

    /// The parameter at the tangent line (end of the head proper).
    pub fn tangent_line_parameter(&self) -> f64 {
        self.head_segments as f64
    }

    fn locate(&self, s: f64) -> (usize, f64) {
        let n = self.segments.len();
        let s = if s.is_nan() { 0.0 } else { s.clamp(0.0, n as f64) };
        let i = (s.floor() as usize).min(n - 1);
        (i, s - i as f64)
    }

    /// The point (x, z) at parameter s (clamped to [0, s_max]), mm.
    pub fn point(&self, s: f64) -> (f64, f64) {
        let (i, t) = self.locate(s);
        self.segments[i].point(t)
    }

    /// The unit outward normal at parameter s.
    pub fn normal(&self, s: f64) -> (f64, f64) {
        let (i, t) = self.locate(s);
        self.segments[i].normal(t)
    }

    /// The meridian angle at parameter s: angle of the outward normal from
    /// the axis, rad (0 at the crown, π/2 at and below the tangent line).
    pub fn angle(&self, s: f64) -> f64 {
        let (nx, nz) = self.normal(s);
        nx.atan2(nz)
    }

    /// The tangent point between crown and knuckle (x, z), mm, for a
    /// torispherical profile; `None` for other shapes.
    pub fn crown_knuckle_tangent_point(&self) -> Option<(f64, f64)> {
        self.segments.iter().find(|s| s.role() == SegmentRole::Knuckle).map(|s| s.point(0.0))
    }

    /// Height z of the inner surface above the tangent line at radius x, mm.
    /// Errors when x is outside the radii that the head covers (negative,
    /// beyond D/2, or inside the opening of an open cone).
    pub fn height_at(&self, x: f64) -> Result<f64, GeometryError> {
        let x = finite("radius", x)?;
        if x < 0.0 || x > self.radius {
            return Err(invalid(
                "radius",
                format!("x = {x} mm is outside the head, which spans 0 to {} mm", self.radius),
            ));
        }
        for seg in self.head_segments() {
            let (x0, x1) = (seg.point(0.0).0, seg.point(1.0).0);
            if x < x0 || x > x1 || x1 <= x0 {
                continue;
            }
            return Ok(match *seg {
                Segment::Arc { center, radius, .. } => {
                    center.1 + (radius * radius - (x - center.0).powi(2)).max(0.0).sqrt()
                }
                Segment::Ellipse { a, b } => b * (1.0 - (x / a).powi(2)).max(0.0).sqrt(),
                Segment::Line { start, end, .. } => start.1 + (x - start.0) / (end.0 - start.0) * (end.1 - start.1),
            });
        }
        Err(invalid("radius", format!("x = {x} mm lies in the opening at the small end of the cone")))
    }

    /// The nearest point of the profile to (x, z) and the signed distance to
    /// it (positive outside the inner surface). Exact for arcs and lines;
    /// solved by Brent's method on the ellipse, accurate to about 1e-9 mm.
    pub fn nearest(&self, x: f64, z: f64) -> Nearest {
        let p = (x, z);
        let mut best = (0usize, 0.0, f64::INFINITY);
        for (i, seg) in self.segments.iter().enumerate() {
            let (t, d2) = seg.nearest(p);
            if d2 < best.2 {
                best = (i, t, d2);
            }
        }
        let (i, t, d2) = best;
        let seg = &self.segments[i];
        let q = seg.point(t);
        let n = seg.normal(t);
        let side = (p.0 - q.0) * n.0 + (p.1 - q.1) * n.1;
        let dist = d2.sqrt();
        Nearest {
            distance: if side < 0.0 { -dist } else { dist },
            s: i as f64 + t,
            x: q.0,
            z: q.1,
            angle: n.0.atan2(n.1),
        }
    }

    /// Signed distance from (x, z) to the profile, mm (positive outside).
    pub fn signed_distance(&self, x: f64, z: f64) -> f64 {
        self.nearest(x, z).distance
    }
}
