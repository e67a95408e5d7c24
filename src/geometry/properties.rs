//! Depth, volume, area, blank diameter, metal volume and mass of a head.
//!
//! Every quantity is computed segment by segment along the exact profile.
//! Arcs and lines have closed forms (disc integration and Pappus' theorems);
//! the ellipse has closed forms for its own area and volume, and its offset
//! surfaces (mid-thickness and metal) are integrated by adaptive
//! Gauss-Kronrod quadrature to a relative tolerance of 1e-10.

use super::numeric::integrate;
use super::profile::Segment;
use super::{GeometryError, HeadShape, HeadSpec, Profile};
use serde::Serialize;
use std::f64::consts::{FRAC_PI_2, PI};

/// A computed value with a short statement of how it was computed, for the
/// report to print beside the number.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Computed {
    /// The value, in the unit stated on the field that holds it.
    pub value: f64,
    /// Formula or method, e.g. "V = π·D³/(12·(D/2h))".
    pub method: String,
}

fn computed(value: f64, method: impl Into<String>) -> Computed {
    Computed { value, method: method.into() }
}

/// Geometric and mass properties of a head.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Properties {
    /// Inside depth h from the tangent line to the crown, mm.
    pub inside_depth: Computed,
    /// Inside depth including the straight flange, h + sf, mm.
    pub depth_with_flange: Computed,
    /// Inside volume of the head below the tangent line excluded, mm³.
    pub volume: Computed,
    /// Inside volume including the straight flange, mm³.
    pub volume_with_flange: Computed,
    /// Inside surface area of the head proper, mm².
    pub inside_area: Computed,
    /// Inside surface area including the straight flange, mm².
    pub inside_area_with_flange: Computed,
    /// Area of the mid-thickness surface including the straight flange, mm².
    pub mean_area: Computed,
    /// Diameter of the flat circular blank by the mean-surface equal-area method, mm.
    pub blank_diameter: Computed,
    /// Volume of metal between the inner surface and the surface offset
    /// outward by t along the normal, head and straight flange, mm³.
    pub metal_volume: Computed,
    /// Mass of the head including its straight flange, kg.
    pub mass: Computed,
}

/// π∫x²(−dz) along a segment: the volume between the segment's surface of
/// revolution and the plane through its lower end, mm³.
fn volume_under(seg: &Segment) -> f64 {
    match *seg {
        Segment::Arc { center, radius: rho, theta0, theta1, .. } => {
            // x = cx + ρ sin θ, −dz = ρ sin θ dθ; expand (cx + ρ sin θ)² sin θ
            // and integrate term by term.
            let cx = center.0;
            let f = |th: f64| {
                -cx * cx * th.cos()
                    + 2.0 * cx * rho * (0.5 * th - 0.25 * (2.0 * th).sin())
                    + rho * rho * (-th.cos() + th.cos().powi(3) / 3.0)
            };
            PI * rho * (f(theta1) - f(theta0))
        }
        Segment::Ellipse { a, b } => 2.0 / 3.0 * PI * a * a * b,
        Segment::Line { start, end, .. } => {
            PI * (start.1 - end.1) * (start.0 * start.0 + start.0 * end.0 + end.0 * end.0) / 3.0
        }
    }
}

/// Area of the surface of revolution of the segment offset outward by d, mm².
fn offset_area(seg: &Segment, d: f64) -> f64 {
    match *seg {
        Segment::Arc { center, radius, theta0, theta1, .. } => {
            // Pappus: A = 2π ∫ x ds with ds = (ρ + d) dθ.
            let rr = radius + d;
            2.0 * PI * rr * (center.0 * (theta1 - theta0) + rr * (theta0.cos() - theta1.cos()))
        }
        Segment::Line { start, end, .. } => {
            let n = seg.normal(0.0);
            let len = (end.0 - start.0).hypot(end.1 - start.1);
            PI * (start.0 + end.0 + 2.0 * d * n.0) * len
        }
        Segment::Ellipse { a, b } => {
            if d == 0.0 {
                return half_spheroid_area(a, b);
            }
            2.0 * PI
                * integrate(
                    |psi| {
                        let (x, nx, kappa, w) = ellipse_terms(a, b, psi);
                        (x + d * nx) * (1.0 + d * kappa) * w
                    },
                    0.0,
                    FRAC_PI_2,
                )
        }
    }
}

/// ∫₀ᵗ offset_area(d) dd: the metal between the segment's surface and its
/// offset by t, mm³ (exact, since every head surface is convex outward).
fn offset_volume(seg: &Segment, t: f64) -> f64 {
    match *seg {
        Segment::Arc { center, radius, theta0, theta1, .. } => {
            let (r0, r1) = (radius, radius + t);
            2.0 * PI
                * (center.0 * (theta1 - theta0) * (r1 * r1 - r0 * r0) / 2.0
                    + (theta0.cos() - theta1.cos()) * (r1.powi(3) - r0.powi(3)) / 3.0)
        }
        Segment::Line { start, end, .. } => {
            let n = seg.normal(0.0);
            let len = (end.0 - start.0).hypot(end.1 - start.1);
            PI * len * ((start.0 + end.0) * t + n.0 * t * t)
        }
        Segment::Ellipse { a, b } => {
            // (x + d·nx)(1 + d·κ)·w integrated over d from 0 to t.
            2.0 * PI
                * integrate(
                    |psi| {
                        let (x, nx, kappa, w) = ellipse_terms(a, b, psi);
                        w * (x * t + (x * kappa + nx) * t * t / 2.0 + nx * kappa * t.powi(3) / 3.0)
                    },
                    0.0,
                    FRAC_PI_2,
                )
        }
    }
}

/// For the quarter ellipse at ψ: radius x, normal x-component, curvature κ
/// (1/mm) and speed w = |dE/dψ| (mm).
fn ellipse_terms(a: f64, b: f64, psi: f64) -> (f64, f64, f64, f64) {
    let (s, c) = psi.sin_cos();
    let w = (a * a * c * c + b * b * s * s).sqrt();
    (a * s, b * s / w, a * b / w.powi(3), w)
}

/// Half the surface area of a spheroid with equatorial semi-axis a and polar
/// semi-axis b (mathematics handbook closed forms), mm².
pub(crate) fn half_spheroid_area(a: f64, b: f64) -> f64 {
    if (a - b).abs() <= 1e-12 * a {
        2.0 * PI * a * a
    } else if b < a {
        let e = (1.0 - (b / a).powi(2)).sqrt();
        PI * a * a + PI * b * b / (2.0 * e) * ((1.0 + e) / (1.0 - e)).ln()
    } else {
        let e = (1.0 - (a / b).powi(2)).sqrt();
        PI * a * a + PI * a * b * e.asin() / e
    }
}

/// Computes the properties of a head from its spec and its exact profile.
/// The profile must be the one built from this spec (use [`HeadSpec::profile`]).
pub fn properties(spec: &HeadSpec, profile: &Profile) -> Result<Properties, GeometryError> {
    spec.validate()?;
    let sf = spec.straight_flange;
    let t = spec.thickness;
    let head = profile.head_segments();
    let all = profile.segments();
    let h = profile.depth();

    let (depth_m, vol_m, area_m) = match spec.shape {
        HeadShape::Ellipsoidal { .. } => (
            "h = D/(2·(D/2h))",
            "V = π·D³/(12·(D/2h)) (half spheroid)",
            "A = π·a² + π·b²/(2e)·ln((1+e)/(1−e)), a = D/2, b = h, e = √(1 − b²/a²) (half oblate spheroid; 2π·a² when a = b)",
        ),
        HeadShape::Torispherical { .. } => (
            "h = L − (L − r)·cos α, sin α = (D/2 − r)/(L − r)",
            "V = π∫x²dz in closed form over the crown cap and the knuckle zone",
            "Pappus: crown cap 2π·L·L(1 − cos α) + knuckle zone 2π·r·[(D/2 − r)(π/2 − α) + r·cos α]",
        ),
        HeadShape::Hemispherical => ("h = D/2", "V = π·D³/12", "A = π·D²/2"),
        HeadShape::Conical { .. } => (
            "h = (D − Ds)/(2·tan α)",
            "V = π·h·(R² + R·Rs + Rs²)/3 (frustum; the small-end opening is not closed)",
            "A = π·(R + Rs)·√((R − Rs)² + h²) (frustum lateral surface)",
        ),
    };
    let volume: f64 = head.iter().map(volume_under).sum();
    let volume_f: f64 = all.iter().map(volume_under).sum();
    let area: f64 = head.iter().map(|s| offset_area(s, 0.0)).sum();
    let area_f: f64 = all.iter().map(|s| offset_area(s, 0.0)).sum();
    let mean_area: f64 = all.iter().map(|s| offset_area(s, 0.5 * t)).sum();
    let blank = (4.0 * mean_area / PI).sqrt();
    let metal: f64 = all.iter().map(|s| offset_volume(s, t)).sum();
    let mass = spec.density * metal * 1e-9;

    let numeric_note = if matches!(spec.shape, HeadShape::Ellipsoidal { .. }) {
        "; the offset ellipse is integrated by adaptive Gauss-Kronrod 7-15 to 1e-10 relative"
    } else {
        "; closed forms for every arc and line (Pappus)"
    };
    Ok(Properties {
        inside_depth: computed(h, depth_m),
        depth_with_flange: computed(h + sf, "h + sf"),
        volume: computed(volume, vol_m),
        volume_with_flange: computed(volume_f, format!("{vol_m}, plus π·D²·sf/4 for the straight flange")),
        inside_area: computed(area, area_m),
        inside_area_with_flange: computed(area_f, format!("{area_m}, plus π·D·sf for the straight flange")),
        mean_area: computed(
            mean_area,
            format!("area of the surface offset t/2 outward along the normal, straight flange included{numeric_note}"),
        ),
        blank_diameter: computed(
            blank,
            // No number in the words: the report shows t in its own units on the sheet.
            "mean-surface equal-area method: D_blank = √(4·A_m/π), A_m = area of the mid-thickness surface \
             (inner surface offset t/2 outward) including the straight flange; no allowance for trimming or \
             thinning"
                .to_string(),
        ),
        metal_volume: computed(
            metal,
            format!(
                "V_m = ∫₀ᵗ A(δ)dδ, A(δ) = area of the inner surface offset δ outward along the normal, \
                 straight flange included{numeric_note}"
            ),
        ),
        mass: computed(mass, "m = ρ·V_m, ρ the density of the material".to_string()),
    })
}
