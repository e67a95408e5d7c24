//! Shape deviation of a head from its specified shape, against UG-81.
//!
//! UG-81(a) limits the deviation of the inner surface of a formed head from
//! the specified shape to 1¼ % of D outside and ⅝ % of D inside. A
//! torispherical head is judged here against a true ellipse of the same
//! inside diameter, either with the same depth or as the 2:1 ellipse.

use super::numeric::golden_max;
use super::{finite, GeometryError, Profile};
use serde::Serialize;

/// Which true ellipse a head is compared with.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub enum Reference {
    /// A true ellipse with the same inside diameter and the same inside
    /// depth as the head.
    SameDepth,
    /// The 2:1 ellipse (depth D/4) of the same inside diameter.
    TwoToOne,
}

/// The largest deviations of one profile from another, measured along the
/// normal of the reference from each point of the actual profile.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Deviation {
    /// Largest distance of the actual inner surface outside the reference
    /// (away from the vessel interior), mm, ≥ 0 (0 when it is nowhere outside).
    pub max_outside: f64,
    /// Largest distance of the actual inner surface inside the reference, mm, ≥ 0.
    pub max_inside: f64,
    /// Radius of the actual point where `max_outside` occurs, mm.
    pub at_radius_outside: f64,
    /// Radius of the actual point where `max_inside` occurs, mm.
    pub at_radius_inside: f64,
    /// Height above the tangent line of the point of `max_outside`, mm.
    pub at_height_outside: f64,
    /// Height above the tangent line of the point of `max_inside`, mm.
    pub at_height_inside: f64,
    /// Meridian angle (outward normal of the actual profile from the axis)
    /// at the point of `max_outside`, rad.
    pub at_angle_outside: f64,
    /// Meridian angle at the point of `max_inside`, rad.
    pub at_angle_inside: f64,
}

/// The deviation of one measured point from a profile.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct PointDeviation {
    /// Radius of the measured point, mm.
    pub x: f64,
    /// Height of the measured point above the tangent line, mm.
    pub z: f64,
    /// Signed normal distance to the profile, mm: positive outside.
    pub deviation: f64,
    /// Radius of the nearest point of the profile, mm.
    pub nearest_x: f64,
    /// Height of the nearest point of the profile, mm.
    pub nearest_z: f64,
    /// Meridian angle at the nearest point, rad.
    pub angle: f64,
}

/// The UG-81 limits for inside diameter D (mm): (outside, inside) =
/// (1.25 % of D, 0.625 % of D), mm.
pub fn ug81_limits(inside_diameter: f64) -> (f64, f64) {
    (0.0125 * inside_diameter, 0.00625 * inside_diameter)
}

/// The reference ellipse for a head profile: same inside diameter and
/// straight flange, depth as chosen.
pub fn reference_profile(actual: &Profile, reference: Reference) -> Result<Profile, GeometryError> {
    let d = actual.inside_diameter();
    let h = match reference {
        Reference::SameDepth => actual.depth(),
        Reference::TwoToOne => 0.25 * d,
    };
    Profile::ellipse(d, h, actual.straight_flange())
}

/// Samples per segment used to bracket the extremes before refinement.
const SAMPLES_PER_SEGMENT: usize = 400;

/// The largest outside and inside deviations of `actual` from `reference`.
///
/// The signed distance from the actual profile to the reference is sampled
/// at 400 points per segment; around the three largest local maxima of each
/// sign it is refined by golden-section search to 1e-10 in the profile
/// parameter, which fixes the extreme distance to far better than 0.001 mm.
pub fn deviation(actual: &Profile, reference: &Profile) -> Deviation {
    let end = actual.parameter_end();
    let n = SAMPLES_PER_SEGMENT * actual.segments().len();
    let f = |s: f64| {
        let (x, z) = actual.point(s);
        reference.signed_distance(x, z)
    };
    let samples: Vec<f64> = (0..=n).map(|i| f(end * i as f64 / n as f64)).collect();
    let step = end / n as f64;
    let (s_out, v_out) = refine_extreme(&samples, step, end, &f);
    let (s_in, v_in) = refine_extreme(&samples.iter().map(|v| -v).collect::<Vec<_>>(), step, end, &|s| -f(s));
    let p_out = actual.point(s_out);
    let p_in = actual.point(s_in);
    Deviation {
        max_outside: if v_out > 0.0 { v_out } else { 0.0 },
        max_inside: if v_in > 0.0 { v_in } else { 0.0 },
        at_radius_outside: p_out.0,
        at_radius_inside: p_in.0,
        at_height_outside: p_out.1,
        at_height_inside: p_in.1,
        at_angle_outside: actual.angle(s_out),
        at_angle_inside: actual.angle(s_in),
    }
}

/// Maximum of a sampled function: the three largest local maxima of the
/// samples are refined by golden-section search in their neighbourhood.
fn refine_extreme(samples: &[f64], step: f64, end: f64, f: &dyn Fn(f64) -> f64) -> (f64, f64) {
    let last = samples.len() - 1;
    let mut peaks: Vec<usize> = (0..=last)
        .filter(|&i| {
            let left = if i > 0 { samples[i - 1] } else { f64::NEG_INFINITY };
            let right = if i < last { samples[i + 1] } else { f64::NEG_INFINITY };
            samples[i] >= left && samples[i] >= right
        })
        .collect();
    peaks.sort_by(|&a, &b| samples[b].total_cmp(&samples[a]).then(a.cmp(&b)));
    let mut best = (0.0, f64::NEG_INFINITY);
    for &i in peaks.iter().take(3) {
        let lo = (i as f64 - 1.0) * step;
        let hi = (i as f64 + 1.0) * step;
        let cand = golden_max(f, lo.max(0.0), hi.min(end), 1e-10);
        if cand.1 > best.1 {
            best = cand;
        }
    }
    best
}

/// The signed distance to `reference` along the actual profile at `n` + 1
/// evenly spaced parameters, as (meridian angle of the actual profile, rad;
/// radius, mm; deviation, mm) — the curve for a deviation plot.
pub fn deviation_curve(actual: &Profile, reference: &Profile, n: usize) -> Vec<(f64, f64, f64)> {
    let n = n.max(1);
    let end = actual.parameter_end();
    (0..=n)
        .map(|i| {
            let s = end * i as f64 / n as f64;
            let (x, z) = actual.point(s);
            (actual.angle(s), x, reference.signed_distance(x, z))
        })
        .collect()
}

/// Deviations of measured inner-surface points (x, z) (mm) from a profile.
///
/// A point is rejected with a clear error when it is not a finite number,
/// has a negative radius, lies radially beyond D/2 plus the UG-81 outside
/// allowance, lies below the end of the straight flange (it is then on the
/// shell, not the head), or lies higher than the crown plus that allowance.
pub fn point_deviations(profile: &Profile, points: &[(f64, f64)]) -> Result<Vec<PointDeviation>, GeometryError> {
    let d = profile.inside_diameter();
    let (allow, _) = ug81_limits(d);
    let out_of_range =
        |index: usize, x: f64, z: f64, detail: String| GeometryError::PointOutOfRange { index, x, z, detail };
    points
        .iter()
        .enumerate()
        .map(|(i, &(x, z))| {
            if finite("x", x).is_err() || finite("z", z).is_err() {
                return Err(out_of_range(i, x, z, "the coordinates must be finite numbers".into()));
            }
            if x < 0.0 {
                return Err(out_of_range(
                    i,
                    x,
                    z,
                    "the radius must not be negative; give points on one half of the meridian".into(),
                ));
            }
            if x > 0.5 * d + allow {
                return Err(out_of_range(
                    i,
                    x,
                    z,
                    format!(
                        "the radius is beyond D/2 + 1.25 % of D = {:.3} mm, outside any head of this diameter",
                        0.5 * d + allow
                    ),
                ));
            }
            if z < -profile.straight_flange() {
                return Err(out_of_range(
                    i,
                    x,
                    z,
                    format!(
                        "the point is below the end of the straight flange (z = −{} mm), on the shell",
                        profile.straight_flange()
                    ),
                ));
            }
            if z > profile.depth() + allow {
                return Err(out_of_range(
                    i,
                    x,
                    z,
                    format!("the point is above the crown plus 1.25 % of D (z = {:.3} mm)", profile.depth() + allow),
                ));
            }
            let near = profile.nearest(x, z);
            Ok(PointDeviation {
                x,
                z,
                deviation: near.distance,
                nearest_x: near.x,
                nearest_z: near.z,
                angle: near.angle,
            })
        })
        .collect()
}
