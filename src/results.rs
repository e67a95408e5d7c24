//! The results as JSON (`knuckle-results/1`): the contract shared by
//! `check --json` and the `.json` file of a compiled package.
//!
//! Every number is in the fixed unit named in the top-level `units` table,
//! whatever the report's unit system; texts (formulas, substitutions) are in
//! the report's unit system, as printed.

use crate::calc::{Check, Step};
use crate::cautions;
use crate::model::Design;
use crate::rules::{Calculation, ComponentResult, OrderItem};
use crate::units::{Kind, Quantity};
use serde_json::{json, Map, Value};

/// Results format id.
pub const FORMAT: &str = "knuckle-results/1";

/// Tool name used in every output.
pub const TOOL_NAME: &str = "knuckle";
/// Tool version used in every output.
pub const TOOL_VERSION: &str = env!("CARGO_PKG_VERSION");

/// A number in its JSON unit, or null.
pub fn num(q: Option<Quantity>) -> Value {
    match q {
        Some(q) => {
            let (_, conv) = q.kind.json_unit();
            let v = conv(q.value);
            if v.is_finite() {
                json!(v)
            } else {
                Value::Null
            }
        }
        None => Value::Null,
    }
}

fn step_json(s: &Step) -> Value {
    json!({
        "symbol": s.symbol,
        "description": s.description,
        "clause": s.clause,
        "formula_id": s.formula_id,
        "formula": s.formula,
        "substituted": s.substituted,
        "value": num(Some(s.quantity)),
        "unit": s.quantity.kind.json_unit().0,
        "kind": s.quantity.kind,
    })
}

fn check_json(c: &Check) -> Value {
    let unit = c.required.or(c.provided).map(|q| q.kind.json_unit().0);
    json!({
        "name": c.name,
        "clause": c.clause,
        "relation": c.relation,
        "required": num(c.required),
        "provided": num(c.provided),
        "margin": num(c.margin),
        "unit": unit,
        "pass": c.pass,
        "applicability": c.applicability,
        "note": c.note,
    })
}

fn order_json(o: &OrderItem) -> Value {
    json!({
        "component": o.component,
        "material": o.material,
        "product_form": o.product_form,
        "thickness": num(Some(o.thickness)),
        "ordered_as": o.ordered_as,
        "blank_width": num(o.blank_width),
        "blank_length": num(o.blank_length),
        "blank_diameter": num(o.blank_diameter),
    })
}

fn materials_json(design: &Design) -> Value {
    let list: Vec<Value> = design
        .materials
        .values()
        .map(|m| {
            let library = m.library.as_ref().map(|l| {
                json!({
                    "file": l.file,
                    "entry": l.material.key,
                    "caution": l.caution,
                    "table_source": l.material.table.source,
                    "table_range": l.material.table.range_text(),
                })
            });
            json!({
                "key": m.key,
                "name": m.name,
                "product_form": m.product_form.name(),
                "allowable_stress": num(Some(m.allowable_stress)),
                "test_allowable_stress": num(Some(m.test_allowable_stress)),
                "density": num(Some(m.density)),
                "library": library,
            })
        })
        .collect();
    Value::Array(list)
}

fn status(ok: bool) -> &'static str {
    if ok {
        "acceptable"
    } else {
        "not-acceptable"
    }
}

fn component_json(c: &ComponentResult, extra: Option<&Map<String, Value>>) -> Value {
    let mut v = json!({
        "id": c.id,
        "type": c.type_name,
        "description": c.description,
        "required_thickness": num(c.required_thickness),
        "minimum_thickness": num(c.minimum_thickness),
        "nominal_thickness": num(c.nominal_thickness),
        "selected_thickness": num(c.selected_thickness),
        "mass": num(c.mass),
        "volume": num(c.volume),
        "order": c.order.as_ref().map(order_json),
        "design_pressure": num(Some(c.design_pressure)),
        "static_head": num(Some(c.static_head)),
        "mawp": num(c.mawp),
        "mawp_top": num(c.mawp_top),
        "map": num(c.map),
        "status": status(c.acceptable),
        "steps": c.steps.iter().map(step_json).collect::<Vec<_>>(),
        "checks": c.checks.iter().map(check_json).collect::<Vec<_>>(),
        "limits": c.limits,
    });
    if let (Some(obj), Some(g)) = (v.as_object_mut(), &c.geometry) {
        let p = &g.properties;
        obj.insert(
            "geometry".into(),
            json!({
                "inside_diameter": g.spec.inside_diameter,
                "thickness": g.spec.thickness,
                "thickness_basis": g.thickness_basis,
                "inside_depth": p.inside_depth.value,
                "depth_with_flange": p.depth_with_flange.value,
                "volume": p.volume.value * 1e-9,
                "volume_with_flange": p.volume_with_flange.value * 1e-9,
                "inside_area": p.inside_area.value * 1e-6,
                "inside_area_with_flange": p.inside_area_with_flange.value * 1e-6,
                "blank_diameter": p.blank_diameter.value,
                "mass": p.mass.value,
                "methods": {
                    "inside_depth": p.inside_depth.method,
                    "volume": p.volume.method,
                    "inside_area": p.inside_area.method,
                    "blank_diameter": p.blank_diameter.method,
                    "mass": p.mass.method,
                },
            }),
        );
        if let Some(d) = &g.shape_deviation {
            obj.insert(
                "shape_deviation".into(),
                json!({
                    "reference": d.reference,
                    "max_outside": d.deviation.max_outside,
                    "max_inside": d.deviation.max_inside,
                    "at_radius": d.deviation.at_radius_outside,
                    "at_radius_inside": d.deviation.at_radius_inside,
                    "limit_outside": d.limits.0,
                    "limit_inside": d.limits.1,
                    "judged_against_ug81": d.judged,
                }),
            );
        }
    }
    if let (Some(obj), Some(extra)) = (v.as_object_mut(), extra) {
        for (k, x) in extra {
            obj.insert(k.clone(), x.clone());
        }
    }
    v
}

/// The fixed units of every number in the JSON.
pub fn units_table() -> Value {
    let mut m = Map::new();
    for (name, kind) in [
        ("length", Kind::Length),
        ("pressure", Kind::Pressure),
        ("stress", Kind::Stress),
        ("temperature", Kind::Temperature),
        ("density", Kind::Density),
        ("mass", Kind::Mass),
        ("volume", Kind::Volume),
        ("area", Kind::Area),
        ("angle", Kind::Angle),
    ] {
        m.insert(name.to_string(), json!(kind.json_unit().0));
    }
    Value::Object(m)
}

/// The results document. `extra` adds fields per component id (geometry,
/// for example) without this module knowing what they are.
pub fn results_json(
    design: &Design,
    calc: &Calculation,
    extra: &std::collections::BTreeMap<String, Map<String, Value>>,
) -> Value {
    let v = &calc.vessel;
    json!({
        "format": FORMAT,
        "tool": { "name": TOOL_NAME, "version": TOOL_VERSION },
        "document": {
            "number": design.document.number,
            "revision": design.document.revision,
            "title": design.document.title,
            "project": design.document.project,
            "date": design.document.date,
        },
        "sign_off": {
            "prepared_by": design.sign_off.prepared_by,
            "checked_by": design.sign_off.checked_by,
            "approved_by": design.sign_off.approved_by,
        },
        "rules": { "id": calc.rule_set, "title": calc.rule_set_title, "edition": calc.edition, "clause_note": calc.clause_note },
        "units": units_table(),
        "report_units": design.units.name(),
        "design": {
            "pressure": num(Some(design.conditions.pressure)),
            "temperature": num(Some(design.conditions.temperature)),
            "corrosion_allowance": num(Some(design.conditions.corrosion_allowance)),
            "liquid_density": num(design.conditions.liquid_density),
            "test_temperature": num(Some(design.conditions.test_temperature)),
        },
        "materials": materials_json(design),
        "status": status(calc.acceptable()),
        "components": calc.components.iter().map(|c| component_json(c, extra.get(&c.id))).collect::<Vec<_>>(),
        "vessel": {
            "mawp": num(Some(v.mawp)),
            "governing_component": v.governing_component,
            "stress_ratio": v.stress_ratio,
            "hydrotest_pressure": num(Some(v.hydrotest_pressure)),
            "pneumatic_test_pressure": num(Some(v.pneumatic_test_pressure)),
            "empty_mass": num(v.empty_mass),
            "volume": num(v.volume),
            "liquid_mass": num(v.liquid_mass),
            "totals_exclude": v.totals_exclude,
            "order_list": v.order_list.iter().map(order_json).collect::<Vec<_>>(),
            "status": status(calc.acceptable()),
            "steps": v.steps.iter().map(step_json).collect::<Vec<_>>(),
            "checks": v.checks.iter().map(check_json).collect::<Vec<_>>(),
        },
        "cautions": cautions::all(design, calc),
    })
}
