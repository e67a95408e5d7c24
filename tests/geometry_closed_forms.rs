//! Head properties checked against closed forms from a mathematics handbook
//! (spheroid, sphere, spherical cap and shell, torus zone by Pappus, cone,
//! cylinder) and the facts of the trade about common heads.

use knuckle::geometry::{integrate, properties, HeadShape, HeadSpec, NamedTorisphere, Profile, Properties};
use std::f64::consts::{FRAC_PI_2, PI};

fn spec(shape: HeadShape, d: f64, sf: f64, t: f64) -> HeadSpec {
    HeadSpec { shape, inside_diameter: d, straight_flange: sf, thickness: t, density: 7850.0 }
}

fn props(s: &HeadSpec) -> Properties {
    properties(s, &s.profile().expect("valid spec")).expect("valid spec")
}

fn rel(a: f64, b: f64) -> f64 {
    ((a - b) / b).abs()
}

#[test]
fn oblate_spheroid_area_closed_form_matches_numerical_integration() {
    // Half oblate spheroid, handbook closed form
    // A = π·a² + π·b²/(2e)·ln((1+e)/(1−e)), e = √(1 − b²/a²), against our own
    // Gauss-Kronrod integration of 2π∫x·|dE/dψ|dψ along the meridian.
    for (d, k) in [(1000.0f64, 1.2f64), (1000.0, 2.0), (3000.0, 3.0)] {
        let (a, b) = (0.5 * d, 0.5 * d / k);
        let e: f64 = (1.0 - (b / a) * (b / a)).sqrt();
        let closed = PI * a * a + PI * b * b / (2.0 * e) * ((1.0 + e) / (1.0 - e)).ln();
        let numeric = 2.0
            * PI
            * integrate(
                |psi: f64| a * psi.sin() * (a * a * psi.cos().powi(2) + b * b * psi.sin().powi(2)).sqrt(),
                0.0,
                FRAC_PI_2,
            );
        assert!(rel(numeric, closed) < 1e-10, "D {d} D/2h {k}: {numeric} vs {closed}");
        let p = props(&spec(HeadShape::Ellipsoidal { aspect_ratio: k }, d, 0.0, 0.0));
        assert!(rel(p.inside_area.value, closed) < 1e-12);
    }
}

#[test]
fn hemisphere_area_volume_and_shell_are_the_sphere_formulas() {
    // Handbook: half sphere area 2πR², volume 2πR³/3, shell between R and
    // R + t: 2π((R+t)³ − R³)/3; cylinder flange: π((R+t)² − R²)·sf.
    let (d, t, sf) = (1800.0, 12.0, 40.0);
    let r = 0.5 * d;
    let p = props(&spec(HeadShape::Hemispherical, d, sf, t));
    assert!(rel(p.inside_area.value, 2.0 * PI * r * r) < 1e-14);
    assert!(rel(p.volume.value, 2.0 * PI * r.powi(3) / 3.0) < 1e-14);
    assert!(rel(p.volume_with_flange.value, 2.0 * PI * r.powi(3) / 3.0 + PI * r * r * sf) < 1e-14);
    assert!(rel(p.inside_area_with_flange.value, 2.0 * PI * r * r + 2.0 * PI * r * sf) < 1e-14);
    let shell = 2.0 * PI * ((r + t).powi(3) - r.powi(3)) / 3.0 + PI * ((r + t).powi(2) - r * r) * sf;
    assert!(rel(p.metal_volume.value, shell) < 1e-13);
    // Mass: ρ·V with mm³ → m³.
    assert!(rel(p.mass.value, 7850.0 * shell * 1e-9) < 1e-13);
    // Blank by equal area of the mid surface: A_m = 2π(R+t/2)² + 2π(R+t/2)·sf.
    let rm = r + 0.5 * t;
    let am = 2.0 * PI * rm * rm + 2.0 * PI * rm * sf;
    assert!(rel(p.blank_diameter.value, (4.0 * am / PI).sqrt()) < 1e-13);
}

#[test]
fn ellipse_of_aspect_one_offsets_like_a_sphere() {
    // An ellipsoidal head with D/2h = 1 is a hemisphere, so its numerically
    // integrated metal volume and mid-surface area must equal the sphere
    // shell formulas (handbook) to the quadrature tolerance.
    let (d, t) = (1500.0, 20.0);
    let r = 0.5 * d;
    let p = props(&spec(HeadShape::Ellipsoidal { aspect_ratio: 1.0 }, d, 0.0, t));
    let shell = 2.0 * PI * ((r + t).powi(3) - r.powi(3)) / 3.0;
    assert!(rel(p.metal_volume.value, shell) < 1e-9, "{} vs {shell}", p.metal_volume.value);
    assert!(rel(p.mean_area.value, 2.0 * PI * (r + 0.5 * t).powi(2)) < 1e-9);
}

#[test]
fn torisphere_is_a_spherical_cap_plus_a_torus_zone() {
    // Handbook: spherical cap of radius L and height a1 has area 2π·L·a1 and
    // volume π·a1²(3L − a1)/3. The knuckle zone by Pappus: area =
    // 2π·r·[(R − r)(π/2 − α) + r·cos α]. The cap's base at height a2 = r·cos α
    // above the tangent line sits on the knuckle region of volume
    // π∫x²dz from 0 to a2 with x = (R − r) + √(r² − z²).
    let (d, l, r): (f64, f64, f64) = (2000.0, 1800.0, 300.0);
    let big_r = 0.5 * d;
    let alpha = ((big_r - r) / (l - r)).asin();
    let a1 = l * (1.0 - alpha.cos());
    let a2 = r * alpha.cos();
    let cap_area = 2.0 * PI * l * a1;
    let zone_area = 2.0 * PI * r * ((big_r - r) * (FRAC_PI_2 - alpha) + r * alpha.cos());
    let cap_volume = PI * a1 * a1 * (3.0 * l - a1) / 3.0;
    let knuckle_volume = PI * integrate(|z| ((big_r - r) + (r * r - z * z).sqrt()).powi(2), 0.0, a2);
    let p = props(&spec(HeadShape::Torispherical { crown_radius: l, knuckle_radius: r }, d, 0.0, 0.0));
    assert!(rel(p.inside_depth.value, a1 + a2) < 1e-14);
    assert!(rel(p.inside_area.value, cap_area + zone_area) < 1e-13);
    assert!(rel(p.volume.value, cap_volume + knuckle_volume) < 1e-10);
}

#[test]
fn cone_frustum_area_and_volume() {
    // Handbook frustum: V = π·h(R² + R·Rs + Rs²)/3, lateral A = π(R + Rs)·s.
    let (d, ds, alpha) = (1600.0, 400.0, 30f64.to_radians());
    let (big_r, rs) = (0.5 * d, 0.5 * ds);
    let h = (big_r - rs) / alpha.tan();
    let slant = (big_r - rs).hypot(h);
    let s = spec(HeadShape::Conical { small_diameter: ds, half_apex_angle: alpha }, d, 0.0, 0.0);
    let p = props(&s);
    assert!(rel(p.inside_depth.value, h) < 1e-14);
    assert!(rel(p.volume.value, PI * h * (big_r * big_r + big_r * rs + rs * rs) / 3.0) < 1e-13);
    assert!(rel(p.inside_area.value, PI * (big_r + rs) * slant) < 1e-13);
}

#[test]
fn full_cone_shell_rounds_its_apex_and_corner() {
    // The metal volume is V = ∫₀ᵗ A(δ)dδ, where A(δ) is the area of the
    // inner surface offset δ along the normal (for a full cone: the shifted
    // cone, a sphere cap at the apex and a torus wedge at the corner). By
    // Steiner's formula A(δ) is a polynomial of degree 2 in δ, so Simpson's
    // rule over A(0), A(t/2), A(t) gives V exactly. A(δ) is taken as the
    // mid-surface area of a head of thickness 2δ, a separate code path from
    // the metal volume.
    let (d, alpha, t) = (1200.0, 40f64.to_radians(), 30.0);
    let shape = HeadShape::Conical { small_diameter: 0.0, half_apex_angle: alpha };
    let area = |delta: f64| props(&spec(shape, d, 0.0, 2.0 * delta)).mean_area.value;
    let simpson = t / 6.0 * (area(0.0) + 4.0 * area(0.5 * t) + area(t));
    let p = props(&spec(shape, d, 0.0, t));
    assert!(rel(p.metal_volume.value, simpson) < 1e-12, "{} vs {simpson}", p.metal_volume.value);
    // And the inner surface alone is the handbook cone, π·R·√(R² + h²).
    let h = 0.5 * d / alpha.tan();
    assert!(rel(p.inside_area.value, PI * 0.5 * d * (0.5 * d).hypot(h)) < 1e-13);
}

#[test]
fn ellipse_metal_volume_agrees_with_simpson_over_offset_areas() {
    // Same Steiner check for the numerically integrated ellipse offsets:
    // A(δ) is quadratic in δ for a surface of revolution (Steiner's formula),
    // so Simpson's rule over A(0), A(t/2), A(t) is exact.
    let (d, t) = (2400.0, 25.0);
    let shape = HeadShape::Ellipsoidal { aspect_ratio: 2.0 };
    let area = |delta: f64| props(&spec(shape, d, 50.0, 2.0 * delta)).mean_area.value;
    let simpson = t / 6.0 * (area(0.0) + 4.0 * area(0.5 * t) + area(t));
    let p = props(&spec(shape, d, 50.0, t));
    assert!(rel(p.metal_volume.value, simpson) < 1e-9, "{} vs {simpson}", p.metal_volume.value);
}

#[test]
fn common_heads_have_their_known_depths() {
    // Common practice, no source: a 2:1 ellipsoidal head is D/4 deep.
    let p = props(&spec(HeadShape::Ellipsoidal { aspect_ratio: 2.0 }, 2500.0, 0.0, 0.0));
    assert!((p.inside_depth.value - 625.0).abs() < 1e-9);
    // Common practice, no source: the 2:1-equivalent torisphere (0.9D,
    // 0.17D) is about 0.249·D deep; fluids 1.3.1
    // fluids.geometry.a_torispherical(D=2500, f=0.9, k=0.17)/2500 =
    // 0.24884717615601176.
    let s = spec(NamedTorisphere::TwoToOneEquivalent.shape(2500.0, 0.0), 2500.0, 0.0, 0.0);
    let p = props(&s);
    assert!((p.inside_depth.value / 2500.0 - 0.24884717615601176).abs() < 1e-12);
    // Volume of the 2:1 ellipsoidal head, handbook half spheroid: π·D³/24.
    let p = props(&spec(HeadShape::Ellipsoidal { aspect_ratio: 2.0 }, 2000.0, 0.0, 0.0));
    assert!(rel(p.volume.value, PI * 2000f64.powi(3) / 24.0) < 1e-14);
}

#[test]
fn named_torispheres_use_the_outside_diameter_where_defined() {
    // Proportions from memory (common practice, no source): 6 %-knuckle
    // L = Do, r = 0.06·Do; 80-10 L = 0.8·Do, r = 0.1·Do; DIN 28011 L = Do,
    // r = 0.1·Do; DIN 28013 L = 0.8·Do, r = 0.154·Do; 2:1-equivalent on the
    // inside D: L = 0.9·D, r = 0.17·D.
    let (d, t) = (2000.0, 10.0);
    let d_o = 2020.0;
    let cases = [
        (NamedTorisphere::SixPercentKnuckle, d_o, 0.06 * d_o),
        (NamedTorisphere::EightyTen, 0.8 * d_o, 0.1 * d_o),
        (NamedTorisphere::Din28011, d_o, 0.1 * d_o),
        (NamedTorisphere::Din28013, 0.8 * d_o, 0.154 * d_o),
        (NamedTorisphere::TwoToOneEquivalent, 0.9 * d, 0.17 * d),
    ];
    for (named, l, r) in cases {
        assert_eq!(named.radii(d, t), (l, r), "{}", named.key());
        assert_eq!(NamedTorisphere::from_key(named.key()), Some(named));
    }
    assert_eq!(NamedTorisphere::from_key("90-15"), None);
}

#[test]
fn crown_and_knuckle_meet_tangentially() {
    // At the tangent point the crown (centre (0, zc), radius L) and knuckle
    // (centre (R − r, 0), radius r) have the same point and the same normal.
    let s = spec(HeadShape::Torispherical { crown_radius: 2250.0, knuckle_radius: 425.0 }, 2500.0, 0.0, 0.0);
    let p = s.profile().unwrap();
    let (x, z) = p.crown_knuckle_tangent_point().unwrap();
    let end_crown = p.point(1.0 - 1e-15);
    assert!((x - end_crown.0).abs() < 1e-9 && (z - end_crown.1).abs() < 1e-9);
    let n1 = p.normal(1.0 - 1e-12);
    let n2 = p.normal(1.0 + 1e-12);
    assert!((n1.0 - n2.0).abs() < 1e-9 && (n1.1 - n2.1).abs() < 1e-9);
    // Distance from the knuckle centre to the tangent point is r.
    assert!(((x - (1250.0 - 425.0)).hypot(z) - 425.0).abs() < 1e-9);
    // Height at a radius on the crown: z = zc + √(L² − x²).
    let zc = p.depth() - 2250.0;
    let h = p.height_at(300.0).unwrap();
    assert!((h - (zc + (2250f64.powi(2) - 300f64.powi(2)).sqrt())).abs() < 1e-9);
}

#[test]
fn invalid_shapes_are_rejected_with_clear_errors() {
    let d = 2000.0;
    let bad = [
        (HeadShape::Torispherical { crown_radius: 500.0, knuckle_radius: 600.0 }, "knuckle radius"),
        (HeadShape::Torispherical { crown_radius: 300.0, knuckle_radius: 200.0 }, "crown radius"),
        (HeadShape::Torispherical { crown_radius: 900.0, knuckle_radius: 100.0 }, "crown radius"),
        (HeadShape::Torispherical { crown_radius: 1800.0, knuckle_radius: 0.0 }, "knuckle radius"),
        (HeadShape::Torispherical { crown_radius: f64::NAN, knuckle_radius: 100.0 }, "crown radius"),
        (HeadShape::Ellipsoidal { aspect_ratio: 3.5 }, "aspect ratio"),
        (HeadShape::Ellipsoidal { aspect_ratio: 0.9 }, "aspect ratio"),
        (HeadShape::Ellipsoidal { aspect_ratio: f64::INFINITY }, "aspect ratio"),
        (HeadShape::Conical { small_diameter: 2000.0, half_apex_angle: 0.5 }, "cone small diameter"),
        (HeadShape::Conical { small_diameter: 100.0, half_apex_angle: 1.6 }, "cone half apex angle"),
    ];
    for (shape, what) in bad {
        let err = spec(shape, d, 0.0, 10.0).profile().unwrap_err();
        assert!(err.to_string().contains(what), "{shape:?}: {err}");
    }
    let err = spec(HeadShape::Hemispherical, -5.0, 0.0, 10.0).profile().unwrap_err();
    assert!(err.to_string().contains("inside diameter"), "{err}");
    let err = spec(HeadShape::Hemispherical, 1000.0, -1.0, 10.0).profile().unwrap_err();
    assert!(err.to_string().contains("straight flange"), "{err}");
    assert!(Profile::ellipse(1000.0, 0.0, 0.0).is_err());
    let p = spec(HeadShape::Hemispherical, 1000.0, 0.0, 10.0).profile().unwrap();
    assert!(p.height_at(600.0).is_err());
    assert!(p.height_at(f64::NAN).is_err());
}
