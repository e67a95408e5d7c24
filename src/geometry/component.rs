//! Geometry of a design component: the bridge from [`crate::model::Component`]
//! (SI base units) to the head geometry of this module (mm), used by the
//! rules (forming-tolerance checks), the results JSON and the package sheets.

use super::{deviation, reference_profile, ug81_limits, Deviation, Reference};
use super::{properties, Properties};
use super::{GeometryError, HeadShape, HeadSpec, Profile};
use crate::model::{Component, ComponentKind, Diameter, TorisphereShape};
use serde::Serialize;

/// The geometry of one formed head or cone.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ComponentGeometry {
    /// The head as built from the component (mm, kg/m³).
    pub spec: HeadSpec,
    /// Depth, volume, area, blank and mass with the method of each.
    pub properties: Properties,
    /// Thickness the geometry was taken at, mm, and why.
    pub thickness_basis: String,
    /// Deviation from a reference ellipse, for torispherical heads.
    pub shape_deviation: Option<ShapeDeviation>,
}

/// The deviation of a torispherical head from a true ellipse.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ShapeDeviation {
    /// Which ellipse, in words.
    pub reference: String,
    /// Which ellipse.
    pub reference_kind: Reference,
    /// The deviation found.
    pub deviation: Deviation,
    /// UG-81 limits for this D: (outside, inside), mm.
    pub limits: (f64, f64),
    /// Whether the deviation is judged against UG-81 as a check (the
    /// 2:1-equivalent shape claims to stand in for the 2:1 ellipse); for
    /// other shapes it is information only.
    pub judged: bool,
}

/// The head spec of a component at thickness `thickness_mm`, or `None` for
/// components that are not heads or cones.
pub fn head_spec(c: &Component, thickness_mm: f64, density: f64) -> Option<HeadSpec> {
    let inside = match c.diameter {
        Diameter::Inside(d) => d.value * 1e3,
        Diameter::Outside(d) => d.value * 1e3 - 2.0 * thickness_mm,
    };
    let shape = match &c.kind {
        ComponentKind::EllipsoidalHead { aspect_ratio } => HeadShape::Ellipsoidal { aspect_ratio: *aspect_ratio },
        ComponentKind::TorisphericalHead { crown_radius, knuckle_radius, .. } => HeadShape::Torispherical {
            crown_radius: crown_radius.value * 1e3,
            knuckle_radius: knuckle_radius.value * 1e3,
        },
        ComponentKind::HemisphericalHead => HeadShape::Hemispherical,
        ComponentKind::ConicalSection { small_diameter, half_apex_angle } => {
            let small = match c.diameter {
                Diameter::Inside(_) => small_diameter.value * 1e3,
                Diameter::Outside(_) => small_diameter.value * 1e3 - 2.0 * thickness_mm,
            };
            HeadShape::Conical { small_diameter: small, half_apex_angle: half_apex_angle.value }
        }
        ComponentKind::Cylinder | ComponentKind::Sphere => return None,
    };
    Some(HeadSpec {
        shape,
        inside_diameter: inside,
        straight_flange: c.straight_flange.value * 1e3,
        thickness: thickness_mm,
        density,
    })
}

/// Geometry of a component at thickness `thickness_mm` (nominal, or the
/// minimum when no nominal is given), `None` for shells.
pub fn for_component(
    c: &Component,
    thickness_mm: f64,
    density: f64,
    basis: &str,
) -> Result<Option<ComponentGeometry>, GeometryError> {
    let Some(spec) = head_spec(c, thickness_mm, density) else { return Ok(None) };
    let profile = spec.profile()?;
    let properties = properties(&spec, &profile)?;
    let shape_deviation = match &c.kind {
        ComponentKind::TorisphericalHead { shape, .. } => {
            let two_to_one = *shape == Some(TorisphereShape::TwoToOneEquivalent);
            let kind = if two_to_one { Reference::TwoToOne } else { Reference::SameDepth };
            let reference = reference_profile(&profile, kind)?;
            Some(ShapeDeviation {
                reference: if two_to_one {
                    "true 2:1 ellipse of the same inside diameter".into()
                } else {
                    "true ellipse of the same inside diameter and depth".into()
                },
                reference_kind: kind,
                deviation: deviation(&profile, &reference),
                limits: ug81_limits(spec.inside_diameter),
                judged: two_to_one,
            })
        }
        _ => None,
    };
    Ok(Some(ComponentGeometry { spec, properties, thickness_basis: basis.to_string(), shape_deviation }))
}

impl ComponentGeometry {
    /// The inside profile of the head.
    pub fn profile(&self) -> Result<Profile, GeometryError> {
        self.spec.profile()
    }

    /// The reference ellipse profile, when a deviation was computed.
    pub fn reference(&self) -> Option<Profile> {
        let dev = self.shape_deviation.as_ref()?;
        let p = self.profile().ok()?;
        reference_profile(&p, dev.reference_kind).ok()
    }
}
