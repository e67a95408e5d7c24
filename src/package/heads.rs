//! Head sheets: the geometry rows, JSON fields and profile drawings that a
//! package adds for every formed head and cone. Values come from the
//! calculation's recorded geometry; this module only presents them.

use super::Additions;
use crate::geometry::{profile_drawing, DrawingLabels};
use crate::pipeline::Evaluated;
use crate::render::context::SheetExtras;
use crate::units::{Kind, Quantity, UnitSystem};

fn q(v: f64, kind: Kind) -> Quantity {
    Quantity::new(v, kind)
}

/// Geometry rows and figures for every head of the package `stem`.
pub fn additions(ev: &Evaluated, stem: &str) -> Additions {
    let u: UnitSystem = ev.design.units;
    let mut add = Additions::default();
    for c in &ev.calculation.components {
        let Some(g) = &c.geometry else { continue };
        let p = &g.properties;
        let mm = |v: f64| u.display(q(v * 1e-3, Kind::Length));
        let mut rows = vec![
            ("thickness used".to_string(), mm(g.spec.thickness), g.thickness_basis.clone()),
            ("inside diameter D".to_string(), mm(g.spec.inside_diameter), "new, uncorroded".to_string()),
            ("inside depth h".to_string(), mm(p.inside_depth.value), p.inside_depth.method.clone()),
            (
                "depth with straight flange".to_string(),
                mm(p.depth_with_flange.value),
                p.depth_with_flange.method.clone(),
            ),
            ("inside volume".to_string(), u.display(q(p.volume.value * 1e-9, Kind::Volume)), p.volume.method.clone()),
            (
                "inside volume with straight flange".to_string(),
                u.display(q(p.volume_with_flange.value * 1e-9, Kind::Volume)),
                p.volume_with_flange.method.clone(),
            ),
            (
                "inside surface area".to_string(),
                u.display(q(p.inside_area.value * 1e-6, Kind::Area)),
                p.inside_area.method.clone(),
            ),
            ("blank diameter".to_string(), mm(p.blank_diameter.value), p.blank_diameter.method.clone()),
            ("mass".to_string(), u.display(q(p.mass.value, Kind::Mass)), p.mass.method.clone()),
        ];
        let mut reference = None;
        if let Some(d) = &g.shape_deviation {
            let judged = if d.judged {
                "checked against UG-81 on this sheet"
            } else {
                "for information: the head is designed as a torisphere"
            };
            rows.push((
                format!("largest deviation outside the {}", d.reference),
                mm(d.deviation.max_outside),
                format!("at radius {}; {judged}", mm(d.deviation.at_radius_outside)),
            ));
            rows.push((
                format!("largest deviation inside the {}", d.reference),
                mm(d.deviation.max_inside),
                format!(
                    "at radius {}; UG-81 allows {} outside and {} inside",
                    mm(d.deviation.at_radius_inside),
                    mm(d.limits.0),
                    mm(d.limits.1)
                ),
            ));
            reference = g.reference();
        }
        let file = format!("{stem}_{}.svg", c.id);
        if let Ok(profile) = g.profile() {
            let labels = DrawingLabels {
                title: format!("{}: {}", c.id, c.description),
                reference_name: g.shape_deviation.as_ref().map(|d| d.reference.clone()).unwrap_or_default(),
                ..DrawingLabels::default()
            };
            let dev = g.shape_deviation.as_ref().map(|d| d.deviation);
            let drawing = profile_drawing(&g.spec, &profile, reference.as_ref(), dev.as_ref(), &labels);
            let caption = format!("Figure: {}. Dimensions in mm.", drawing.caption.trim_end_matches('.'));
            add.svg.insert(file.clone(), crate::render::svg::to_svg(&drawing));
            add.figures.insert(file.clone(), drawing);
            add.sheets.insert(c.id.clone(), SheetExtras { geometry: rows, figures: vec![(file, caption)] });
        } else {
            add.sheets.insert(c.id.clone(), SheetExtras { geometry: rows, figures: vec![] });
        }
    }
    add
}
