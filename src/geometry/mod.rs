//! Exact geometry of formed heads.
//!
//! A head is described by a [`HeadSpec`] (shape, inside diameter, straight
//! flange, nominal thickness, density). From it we build the exact inside
//! meridian [`Profile`] (elliptic arc, crown and knuckle arcs with their exact
//! tangent point, sphere arc, cone line, straight flange), compute its
//! [`Properties`] (depth, volume, area, blank diameter, metal volume, mass),
//! measure its [`Deviation`] from a reference shape against the UG-81 band,
//! draw it ([`profile_drawing`], [`deviation_plot`]) and compare the usual head
//! shapes for one diameter ([`head_study`]).
//!
//! Units throughout: lengths in mm, areas in mm², volumes in mm³, density in
//! kg/m³, mass in kg, angles in radians. The meridian is drawn in the (x, z)
//! plane: x is the radius from the vessel axis, z the height above the tangent
//! line (positive towards the crown, negative along the straight flange).

mod deviation;
mod figure;
mod numeric;
mod profile;
mod properties;
mod study;

pub use deviation::{
    deviation, deviation_curve, point_deviations, reference_profile, ug81_limits, Deviation, PointDeviation, Reference,
};
pub use figure::{deviation_plot, profile_drawing, DrawingLabels, PlotData, PlotPoint};
pub use numeric::{brent_root, golden_max, integrate, QUADRATURE_TOLERANCE};
pub use profile::{Nearest, Profile, Segment, SegmentRole};
pub use properties::{properties, Computed, Properties};
pub use study::{head_study, study_table_markdown, study_table_text, StudyInput, StudyReport, StudyRow};

use serde::{Deserialize, Serialize};
use std::fmt;

/// What is wrong with a geometric input. Every message names the offending
/// quantity and its value so that a user can correct the case file.
#[derive(Debug, Clone, PartialEq)]
pub enum GeometryError {
    /// An input value is out of its allowed range or not a finite number.
    Invalid {
        /// The quantity that was wrong, e.g. "knuckle radius".
        what: &'static str,
        /// A sentence explaining the problem and the allowed range.
        detail: String,
    },
    /// A measured point lies outside the region covered by the head profile.
    PointOutOfRange {
        /// Zero-based index of the point in the list given.
        index: usize,
        /// Radius of the point, mm.
        x: f64,
        /// Height of the point above the tangent line, mm.
        z: f64,
        /// A sentence explaining why the point cannot be evaluated.
        detail: String,
    },
}

impl fmt::Display for GeometryError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            GeometryError::Invalid { what, detail } => write!(f, "invalid {what}: {detail}"),
            GeometryError::PointOutOfRange { index, x, z, detail } => {
                write!(f, "measured point {} (x = {x} mm, z = {z} mm) cannot be evaluated: {detail}", index + 1)
            }
        }
    }
}

impl std::error::Error for GeometryError {}

/// Shorthand for building an [`GeometryError::Invalid`].
pub(crate) fn invalid(what: &'static str, detail: impl Into<String>) -> GeometryError {
    GeometryError::Invalid { what, detail: detail.into() }
}

/// The largest length accepted anywhere, mm (1 km). Larger values are
/// certainly input errors, and rejecting them keeps every volume finite.
pub const MAX_LENGTH: f64 = 1e6;

/// Checks that a length is finite and at most [`MAX_LENGTH`].
pub(crate) fn length(what: &'static str, value: f64) -> Result<f64, GeometryError> {
    let v = finite(what, value)?;
    if v.abs() > MAX_LENGTH {
        return Err(invalid(what, format!("{v} mm is larger than the {MAX_LENGTH} mm accepted")));
    }
    Ok(v)
}

/// Checks that a value is a finite number, naming it in the error otherwise.
pub(crate) fn finite(what: &'static str, value: f64) -> Result<f64, GeometryError> {
    if value.is_finite() {
        Ok(value)
    } else {
        Err(invalid(what, format!("{value} is not a finite number")))
    }
}

/// The shape of a formed head's inside surface.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub enum HeadShape {
    /// A half ellipsoid of revolution.
    Ellipsoidal {
        /// D/2h, the ratio of the inside diameter to twice the inside depth
        /// (dimensionless, 1.0 to 3.0; 2.0 is the common "2:1" head).
        aspect_ratio: f64,
    },
    /// A spherical crown joined tangentially to a toroidal knuckle.
    Torispherical {
        /// Inside crown (dish) radius L, mm.
        crown_radius: f64,
        /// Inside knuckle radius r, mm.
        knuckle_radius: f64,
    },
    /// A half sphere of inside radius D/2.
    Hemispherical,
    /// A cone, open at its small end (a reducer to a nozzle or a smaller
    /// shell) or closed at an apex when the small diameter is zero. The
    /// junction with the straight flange is a sharp corner (no knuckle).
    Conical {
        /// Inside diameter of the small end, mm (0 for a full cone).
        small_diameter: f64,
        /// Half apex angle α between the cone generator and the axis, rad.
        half_apex_angle: f64,
    },
}

/// A formed head: shape, main dimensions and material data.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
pub struct HeadSpec {
    /// The shape of the inside surface.
    pub shape: HeadShape,
    /// Inside diameter D at the tangent line, mm.
    pub inside_diameter: f64,
    /// Length of the cylindrical straight flange below the tangent line, mm.
    pub straight_flange: f64,
    /// Nominal wall thickness t, mm; used for the outer surface, blank and mass.
    pub thickness: f64,
    /// Density of the plate material, kg/m³.
    pub density: f64,
}

/// The torispherical shapes that are ordered by name rather than by their radii.
///
/// The proportions are common practice, given from memory (no source): they
/// are the ones head manufacturers list in their catalogues. Where a shape is
/// defined on the outside diameter Do, Do is the outside diameter of the
/// straight flange, Do = D + 2·t.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Serialize, Deserialize)]
pub enum NamedTorisphere {
    /// Key `2:1-equivalent`: L = 0.9·D, r = 0.17·D on the inside diameter, the
    /// torisphere traditionally used in place of a 2:1 ellipsoidal head.
    TwoToOneEquivalent,
    /// Key `6%-knuckle`: L = Do, r = 0.06·Do, the flanged and dished head with
    /// the smallest knuckle that UG-32 admits.
    SixPercentKnuckle,
    /// Key `80-10`: L = 0.8·Do, r = 0.1·Do.
    EightyTen,
    /// Key `din-28011`: L = Do, r = 0.1·Do (the German standard dished head).
    Din28011,
    /// Key `din-28013`: L = 0.8·Do, r = 0.154·Do (the German standard
    /// semi-ellipsoidal head, deeper than DIN 28011).
    Din28013,
}

impl NamedTorisphere {
    /// Every named shape, in a fixed order.
    pub const ALL: [NamedTorisphere; 5] = [
        NamedTorisphere::TwoToOneEquivalent,
        NamedTorisphere::SixPercentKnuckle,
        NamedTorisphere::EightyTen,
        NamedTorisphere::Din28011,
        NamedTorisphere::Din28013,
    ];

    /// The key used in case files and reports, e.g. `80-10`.
    pub fn key(self) -> &'static str {
        match self {
            NamedTorisphere::TwoToOneEquivalent => "2:1-equivalent",
            NamedTorisphere::SixPercentKnuckle => "6%-knuckle",
            NamedTorisphere::EightyTen => "80-10",
            NamedTorisphere::Din28011 => "din-28011",
            NamedTorisphere::Din28013 => "din-28013",
        }
    }

    /// Looks a named shape up by its key; `None` when the key is unknown.
    pub fn from_key(key: &str) -> Option<NamedTorisphere> {
        NamedTorisphere::ALL.into_iter().find(|n| n.key() == key)
    }

    /// The crown and knuckle radii (L, r), mm, for an inside diameter D (mm)
    /// and a nominal thickness t (mm) that fixes Do = D + 2·t.
    pub fn radii(self, inside_diameter: f64, thickness: f64) -> (f64, f64) {
        let d = inside_diameter;
        let d_o = inside_diameter + 2.0 * thickness;
        match self {
            NamedTorisphere::TwoToOneEquivalent => (0.9 * d, 0.17 * d),
            NamedTorisphere::SixPercentKnuckle => (d_o, 0.06 * d_o),
            NamedTorisphere::EightyTen => (0.8 * d_o, 0.1 * d_o),
            NamedTorisphere::Din28011 => (d_o, 0.1 * d_o),
            NamedTorisphere::Din28013 => (0.8 * d_o, 0.154 * d_o),
        }
    }

    /// The head shape for an inside diameter D (mm) and nominal thickness t (mm).
    pub fn shape(self, inside_diameter: f64, thickness: f64) -> HeadShape {
        let (crown_radius, knuckle_radius) = self.radii(inside_diameter, thickness);
        HeadShape::Torispherical { crown_radius, knuckle_radius }
    }
}

impl HeadSpec {
    /// Checks every field and the shape's own proportions, returning the
    /// first problem found as a clear error. A spec that passes can be turned
    /// into a [`Profile`] without failure.
    pub fn validate(&self) -> Result<(), GeometryError> {
        let d = length("inside diameter", self.inside_diameter)?;
        if d <= 0.0 {
            return Err(invalid("inside diameter", format!("{d} mm must be positive")));
        }
        let sf = length("straight flange", self.straight_flange)?;
        if sf < 0.0 {
            return Err(invalid("straight flange", format!("{sf} mm must not be negative")));
        }
        let t = length("thickness", self.thickness)?;
        if t < 0.0 {
            return Err(invalid("thickness", format!("{t} mm must not be negative")));
        }
        let rho = finite("density", self.density)?;
        if rho < 0.0 {
            return Err(invalid("density", format!("{rho} kg/m³ must not be negative")));
        }
        match self.shape {
            HeadShape::Ellipsoidal { aspect_ratio } => {
                let k = finite("aspect ratio", aspect_ratio)?;
                if !(1.0..=3.0).contains(&k) {
                    return Err(invalid(
                        "aspect ratio",
                        format!("D/2h = {k} is outside 1.0 to 3.0 (Appendix 1-4(c) range)"),
                    ));
                }
            }
            HeadShape::Torispherical { crown_radius, knuckle_radius } => {
                let l = length("crown radius", crown_radius)?;
                let r = length("knuckle radius", knuckle_radius)?;
                if r <= 0.0 {
                    return Err(invalid("knuckle radius", format!("r = {r} mm must be positive")));
                }
                if r >= 0.5 * d {
                    return Err(invalid(
                        "knuckle radius",
                        format!("r = {r} mm must be smaller than D/2 = {} mm", 0.5 * d),
                    ));
                }
                if l <= r {
                    return Err(invalid(
                        "crown radius",
                        format!("L = {l} mm must be larger than the knuckle radius r = {r} mm"),
                    ));
                }
                if l <= 0.5 * d {
                    return Err(invalid(
                        "crown radius",
                        format!(
                            "L = {l} mm must be larger than D/2 = {} mm: a smaller crown \
                             cannot meet the knuckle tangentially",
                            0.5 * d
                        ),
                    ));
                }
            }
            HeadShape::Hemispherical => {}
            HeadShape::Conical { small_diameter, half_apex_angle } => {
                let ds = finite("cone small diameter", small_diameter)?;
                let a = finite("cone half apex angle", half_apex_angle)?;
                if ds < 0.0 || ds >= d {
                    return Err(invalid(
                        "cone small diameter",
                        format!("{ds} mm must be at least 0 and smaller than D = {d} mm"),
                    ));
                }
                if a <= 0.0 || a >= std::f64::consts::FRAC_PI_2 {
                    return Err(invalid(
                        "cone half apex angle",
                        format!("{a} rad must lie strictly between 0 and π/2"),
                    ));
                }
                let depth = 0.5 * (d - ds) / a.tan();
                if depth > MAX_LENGTH {
                    return Err(invalid(
                        "cone half apex angle",
                        format!("{a} rad makes the cone {depth} mm deep, more than the {MAX_LENGTH} mm accepted"),
                    ));
                }
            }
        }
        Ok(())
    }

    /// The exact inside meridian profile of this head.
    pub fn profile(&self) -> Result<Profile, GeometryError> {
        Profile::from_spec(self)
    }
}
pub mod component;
