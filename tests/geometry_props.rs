//! Property tests of the head geometry.

use knuckle::geometry::{properties, HeadShape, HeadSpec, NamedTorisphere, Profile};
use proptest::prelude::*;

fn spec(shape: HeadShape, d: f64) -> HeadSpec {
    HeadSpec { shape, inside_diameter: d, straight_flange: 30.0, thickness: 10.0, density: 7850.0 }
}

fn shapes(d: f64, k: f64, f: f64, kn: f64) -> Vec<HeadShape> {
    vec![
        HeadShape::Ellipsoidal { aspect_ratio: k },
        HeadShape::Torispherical { crown_radius: f * d, knuckle_radius: kn * d },
        HeadShape::Hemispherical,
        HeadShape::Conical { small_diameter: 0.2 * d, half_apex_angle: 0.6 },
        NamedTorisphere::Din28013.shape(d, 10.0),
    ]
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(64))]

    #[test]
    fn depth_volume_and_area_grow_with_diameter(
        d in 200.0f64..5000.0, grow in 1.01f64..2.0, k in 1.0f64..3.0,
        f in 0.6f64..1.5, kn in 0.03f64..0.3,
    ) {
        let (small, large) = (shapes(d, k, f, kn), shapes(d * grow, k, f, kn));
        for (a, b) in small.into_iter().zip(large) {
            let sa = spec(a, d);
            let sb = spec(b, d * grow);
            let pa = properties(&sa, &sa.profile().unwrap()).unwrap();
            let pb = properties(&sb, &sb.profile().unwrap()).unwrap();
            prop_assert!(pb.inside_depth.value > pa.inside_depth.value);
            prop_assert!(pb.volume.value > pa.volume.value);
            prop_assert!(pb.inside_area.value > pa.inside_area.value);
            prop_assert!(pb.blank_diameter.value > pa.blank_diameter.value);
        }
    }

    #[test]
    fn profile_points_are_on_their_own_profile(
        d in 200.0f64..5000.0, k in 1.0f64..3.0, f in 0.6f64..1.5, kn in 0.03f64..0.3, s in 0.0f64..1.0,
    ) {
        for shape in shapes(d, k, f, kn) {
            let p = spec(shape, d).profile().unwrap();
            let (x, z) = p.point(s * p.parameter_end());
            prop_assert!(p.signed_distance(x, z).abs() < 1e-8 * d, "{shape:?} at s {s}");
        }
    }

    #[test]
    fn offset_points_are_at_their_offset(
        d in 500.0f64..5000.0, k in 1.0f64..3.0, s in 0.0f64..1.0, off in -0.01f64..0.01,
    ) {
        // Offsets below 1 % of D stay inside every radius of curvature of an
        // ellipse with D/2h ≤ 3 (the smallest, b²/a = D/18 at the equator).
        let p = Profile::ellipse(d, 0.5 * d / k, 0.0).unwrap();
        let s = s * p.parameter_end();
        let (x, z) = p.point(s);
        let n = p.normal(s);
        let o = off * d;
        let dist = p.signed_distance(x + o * n.0, z + o * n.1);
        prop_assert!((dist - o).abs() < 1e-7, "{dist} vs {o}");
    }

    #[test]
    fn arbitrary_numbers_never_panic(
        d in prop::num::f64::ANY, a in prop::num::f64::ANY, b in prop::num::f64::ANY,
        t in prop::num::f64::ANY,
    ) {
        for shape in [
            HeadShape::Ellipsoidal { aspect_ratio: a },
            HeadShape::Torispherical { crown_radius: a, knuckle_radius: b },
            HeadShape::Conical { small_diameter: a, half_apex_angle: b },
        ] {
            let s = HeadSpec { shape, inside_diameter: d, straight_flange: t, thickness: t, density: 7850.0 };
            if let Ok(p) = s.profile() {
                let props = properties(&s, &p).unwrap();
                prop_assert!(props.volume.value.is_finite());
            }
        }
    }
}
