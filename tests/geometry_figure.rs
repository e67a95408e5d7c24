//! The head section drawing and the deviation plot.

use knuckle::drawing::Shape;
use knuckle::geometry::{
    deviation, deviation_curve, deviation_plot, point_deviations, profile_drawing, reference_profile, ug81_limits,
    DrawingLabels, HeadSpec, NamedTorisphere, PlotData, Reference,
};
use knuckle::render::svg::to_svg;

fn texts(shapes: &[Shape]) -> Vec<String> {
    shapes
        .iter()
        .filter_map(|s| match s {
            Shape::Text { text, .. } => Some(text.clone()),
            _ => None,
        })
        .collect()
}

fn spec() -> HeadSpec {
    HeadSpec {
        shape: NamedTorisphere::TwoToOneEquivalent.shape(2500.0, 16.0),
        inside_diameter: 2500.0,
        straight_flange: 50.0,
        thickness: 16.0,
        density: 7850.0,
    }
}

#[test]
fn section_drawing_shows_dimensions_reference_and_exaggeration() {
    let s = spec();
    let p = s.profile().unwrap();
    let r = reference_profile(&p, Reference::TwoToOne).unwrap();
    let dev = deviation(&p, &r);
    let labels =
        DrawingLabels { title: "Bottom head".into(), reference_name: "true 2:1 ellipse".into(), ..Default::default() };
    let d = profile_drawing(&s, &p, Some(&r), Some(&dev), &labels);
    assert_eq!(d.width, 160.0);
    let t = texts(&d.shapes);
    for needle in ["D = 2500", "h = 622.1", "L = 2250", "r = 425", "sf = 50", "tangent line", "scale 1:25"] {
        assert!(t.iter().any(|x| x == needle), "{needle} missing from {t:?}");
    }
    assert!(t.iter().any(|x| x.contains("shown ×5")), "{t:?}");
    assert!(t.iter().any(|x| x.contains("20.3 mm")), "{t:?}");
    assert!(d.caption.contains("×5"), "{}", d.caption);
    // Everything lies on the page.
    for shape in &d.shapes {
        let pts: Vec<(f64, f64)> = match shape {
            Shape::Polyline { points, .. } => points.clone(),
            Shape::Text { at, .. } => vec![*at],
        };
        for (x, y) in pts {
            assert!((0.0..=d.width).contains(&x) && (0.0..=d.height).contains(&y), "({x}, {y}) off the page");
        }
    }
    // The reference is dashed.
    assert!(d.shapes.iter().any(|s| matches!(s, Shape::Polyline { stroke, .. } if stroke.dash.is_some())));
    // Same input, same bytes.
    assert_eq!(to_svg(&d), to_svg(&profile_drawing(&s, &p, Some(&r), Some(&dev), &labels)));
}

#[test]
fn deviation_plot_shows_the_ug81_band_and_counts_points_outside_it() {
    let s = spec();
    let p = s.profile().unwrap();
    let r = reference_profile(&p, Reference::TwoToOne).unwrap();
    let mut data = PlotData::from_curve(&deviation_curve(&p, &r, 300));
    // Two measured points: one 5 mm outside, one 20 mm inside the head's own
    // profile; the latter breaks the 15.625 mm inside limit.
    let pts: Vec<(f64, f64)> = [(0.4, 5.0), (1.5, -20.0)]
        .iter()
        .map(|&(s_, off)| {
            let q = p.point(s_);
            let n = p.normal(s_);
            (q.0 + off * n.0, q.1 + off * n.1)
        })
        .collect();
    data.points = PlotData::from_points(&point_deviations(&p, &pts).unwrap()).points;
    let labels =
        DrawingLabels { title: "As-built".into(), reference_name: "true 2:1 ellipse".into(), ..Default::default() };
    let d = deviation_plot(&data, ug81_limits(2500.0), &labels);
    let t = texts(&d.shapes);
    assert!(t.iter().any(|x| x == "UG-81 outside limit +31.25 mm"), "{t:?}");
    assert!(t.iter().any(|x| x == "UG-81 inside limit −15.625 mm"), "{t:?}");
    assert!(t.iter().any(|x| x == "90") && t.iter().any(|x| x == "0"));
    assert!(d.caption.contains("1 of 2 measured points outside"), "{}", d.caption);
}
