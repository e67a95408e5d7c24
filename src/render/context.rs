//! The template context: every value of the package as display text in the
//! report's unit system. This module formats; it computes no engineering value.
//!
//! The context is the public contract of custom templates; its fields are
//! listed in DEVELOPERS.md.

use crate::calc::{Check, Step};
use crate::model::Design;
use crate::pipeline::Evaluated;
use crate::rules::ComponentResult;
use crate::units::{Kind, Quantity, UnitSystem};
use serde_json::{json, Value};

/// Per-component additions from other stages (geometry rows, figures).
#[derive(Debug, Clone, Default, PartialEq)]
pub struct SheetExtras {
    /// Geometry rows: name, value text, method text.
    pub geometry: Vec<(String, String, String)>,
    /// Figures: file name and caption.
    pub figures: Vec<(String, String)>,
}

/// Escapes text for a Markdown table cell or paragraph. Text between
/// backticks is kept as code (only `|` is escaped there, as GFM tables need).
pub fn md(text: &str) -> String {
    let mut out = String::with_capacity(text.len());
    let mut in_code = false;
    for ch in text.chars() {
        match ch {
            '`' => {
                in_code = !in_code;
                out.push(ch);
            }
            '\n' | '\r' => out.push(' '),
            '|' => out.push_str("\\|"),
            '*' | '_' | '[' | ']' | '<' | '>' | '#' | '\\' if !in_code => {
                out.push('\\');
                out.push(ch);
            }
            _ => out.push(ch),
        }
    }
    // An unpaired backtick would swallow the rest of the cell: escape them all.
    if in_code {
        return text.replace('\n', " ").chars().fold(String::new(), |mut acc, ch| {
            if "|*_`[]<>#\\".contains(ch) {
                acc.push('\\');
            }
            acc.push(ch);
            acc
        });
    }
    out
}

/// Keeps a number and its unit on one line in tables.
fn nbsp(s: &str) -> String {
    s.replace(' ', "\u{a0}")
}

fn opt_up(u: UnitSystem, q: Option<Quantity>) -> String {
    q.map(|q| bare(&u.display_up(q))).unwrap_or_else(|| "n/a".into())
}
fn opt_down(u: UnitSystem, q: Option<Quantity>) -> String {
    q.map(|q| bare(&u.display_down(q))).unwrap_or_else(|| "n/a".into())
}
/// The number without its unit (for columns whose header names the unit).
fn bare(s: &str) -> String {
    s.split(' ').next().unwrap_or("").to_string()
}

fn status_words(ok: bool) -> &'static str {
    if ok {
        "ACCEPTABLE"
    } else {
        "NOT ACCEPTABLE"
    }
}

fn step_row(u: UnitSystem, n: usize, s: &Step) -> Value {
    let work = if s.formula.is_empty() {
        "input".to_string()
    } else {
        // "t = P·R/(…) = 1 MPa · 903 mm/(…)": formula, then the same with values.
        let rhs = s.substituted.split_once(" = ").map(|(_, r)| r).unwrap_or(&s.substituted);
        format!("{} = {}", s.formula, rhs)
    };
    json!({
        "n": n,
        "symbol": md(&s.symbol),
        "quantity": md(&format!("{}: {}", s.symbol, s.description)),
        "clause": md(&s.clause),
        "formula": md(&s.formula),
        "substituted": md(&s.substituted),
        "work": md(&work),
        "result": nbsp(&md(&u.display(s.quantity))),
    })
}

fn check_row(u: UnitSystem, k: &Check) -> Value {
    let show = |q: Option<Quantity>| q.map(|q| nbsp(&u.display(q))).unwrap_or_else(|| "–".into());
    let required = match k.required {
        Some(q) => format!("{}\u{a0}{}", k.relation, nbsp(&u.display(q))),
        None => k.relation.clone(),
    };
    json!({
        "name": md(&k.name),
        "clause": md(&k.clause),
        "required": md(&required),
        "provided": md(&show(k.provided)),
        "margin": md(&show(k.margin)),
        "result": if k.pass { "pass" } else if k.applicability { "**LIMIT NOT MET**" } else { "**FAIL**" },
        "note": md(&k.note),
        "pass": k.pass,
    })
}

fn component(design: &Design, u: UnitSystem, n: usize, c: &ComponentResult, extras: Option<&SheetExtras>) -> Value {
    let comp = design.components.iter().find(|x| x.id == c.id);
    let material = comp.and_then(|x| design.material(x)).map(|m| m.name.clone()).unwrap_or_default();
    let inputs: Vec<Value> = comp
        .map(|x| {
            x.inputs
                .iter()
                .map(|i| json!({ "key": md(&i.key), "given": md(&i.given), "used": nbsp(&md(&u.display(i.value))) }))
                .collect()
        })
        .unwrap_or_default();
    let extras = extras.cloned().unwrap_or_default();
    json!({
        "number": n,
        "id": md(&c.id),
        "type": md(&c.type_name),
        "description": md(&c.description),
        "material": md(&material),
        "status_words": status_words(c.acceptable),
        "inputs": inputs,
        "steps": c.steps.iter().enumerate().map(|(i, s)| step_row(u, i + 1, s)).collect::<Vec<_>>(),
        "checks": c.checks.iter().map(|k| check_row(u, k)).collect::<Vec<_>>(),
        "limits": c.limits.iter().map(|l| md(l)).collect::<Vec<_>>(),
        "geometry": extras.geometry.iter().map(|(a, b, m)| json!({"name": md(a), "value": md(b), "method": md(m)})).collect::<Vec<_>>(),
        "figures": extras.figures.iter().map(|(f, cap)| json!({"file": f, "caption": md(cap)})).collect::<Vec<_>>(),
    })
}

/// The normalised input echo: every input in report units.
fn echo(design: &Design) -> Vec<Value> {
    let u = design.units;
    let mut rows = Vec::new();
    let mut push = |k: String, v: String| rows.push(json!({ "key": md(&k), "value": md(&v) }));
    let d = &design.document;
    push("document.number".into(), d.number.clone());
    push("document.revision".into(), d.revision.clone());
    push("document.date".into(), d.date.clone());
    push("document.rules".into(), d.rules.clone());
    push("document.edition".into(), d.edition.clone());
    push("document.units".into(), u.name().into());
    let c = &design.conditions;
    push("design.internal_pressure".into(), u.display(c.pressure));
    push("design.temperature".into(), u.display(c.temperature));
    push("design.corrosion_allowance".into(), u.display(c.corrosion_allowance));
    if let Some(rho) = c.liquid_density {
        push("design.liquid_density".into(), u.display(rho));
    }
    for (k, m) in &design.materials {
        push(format!("materials.{k}.name"), m.name.clone());
        push(format!("materials.{k}.allowable_stress"), u.display(m.allowable_stress));
        push(format!("materials.{k}.test_allowable_stress"), u.display(m.test_allowable_stress));
        push(format!("materials.{k}.density"), u.display(m.density));
    }
    for (i, comp) in design.components.iter().enumerate() {
        let p = format!("component[{i}]");
        push(format!("{p}.id"), comp.id.clone());
        push(format!("{p}.type"), comp.kind.type_name().into());
        push(format!("{p}.material"), comp.material.clone());
        for e in &comp.inputs {
            push(format!("{p}.{}", e.key), u.display(e.value));
        }
        if comp.corrosion_allowance != c.corrosion_allowance {
            push(format!("{p}.corrosion_allowance (used)"), u.display(comp.corrosion_allowance));
        }
    }
    rows
}

/// Builds the whole template context.
pub fn build(ev: &Evaluated, digest: &str, extras: &std::collections::BTreeMap<String, SheetExtras>) -> Value {
    let design = &ev.design;
    let calc = &ev.calculation;
    let u = design.units;
    let d = &design.document;
    let so = &design.sign_off;
    let sign_off = [("Prepared", &so.prepared_by), ("Checked", &so.checked_by), ("Approved", &so.approved_by)]
        .iter()
        .map(|(role, name)| json!({ "role": role, "name": md(name), "date": "", "signature": "" }))
        .collect::<Vec<_>>();
    let mut history: Vec<Value> = d
        .history
        .iter()
        .map(|h| json!({ "revision": md(&h.revision), "date": md(&h.date), "note": md(&h.note) }))
        .collect();
    if !d.history.iter().any(|h| h.revision == d.revision) {
        history.push(json!({ "revision": md(&d.revision), "date": md(&d.date), "note": "This revision" }));
    }
    let summary: Vec<Value> = calc
        .components
        .iter()
        .map(|c| {
            json!({
                "id": md(&c.id),
                "type": md(&c.type_name),
                "required": opt_up(u, c.required_thickness),
                "minimum": opt_up(u, c.minimum_thickness),
                "nominal": match (c.nominal_thickness, c.selected_thickness) {
                    (Some(t), _) => opt_up(u, Some(t)),
                    (None, Some(t)) => format!("{} (selected)", opt_up(u, Some(t))),
                    (None, None) => "not given".into(),
                },
                "mass": c.mass.map(|m| nbsp(&u.display(m))).unwrap_or_else(|| "–".into()),
                "mawp": opt_down(u, c.mawp),
                "status": if c.acceptable { "acceptable" } else { "**NOT ACCEPTABLE**" },
            })
        })
        .collect();
    let v = &calc.vessel;
    let cautions_all = crate::cautions::all(design, calc);
    let standing: Vec<String> = crate::cautions::STANDING.iter().map(|s| md(s)).collect();
    let specific: Vec<String> = cautions_all.iter().skip(crate::cautions::STANDING.len()).map(|s| md(s)).collect();
    let failed: Vec<String> = calc
        .failed_checks()
        .iter()
        .map(|(id, k)| md(&format!("{id}: {} ({}): {}", k.name, k.clause, k.note)))
        .collect();
    json!({
        "doc": {
            "number": md(&d.number),
            "title": md(&d.title),
            "project": md(&d.project),
            "revision": md(&d.revision),
            "date": md(&d.date),
            "rules_title": md(&calc.rule_set_title),
            "edition": md(&calc.edition),
            "units": u.name(),
            "units_words": match u { UnitSystem::Si => "SI (mm, MPa, °C, kg)", UnitSystem::Us => "US customary (in, psi, °F, lb)" },
            "digest": digest,
            "digest_short": &digest[..digest.len().min(12)],
            "status_words": status_words(calc.acceptable()),
            "tool": format!("{} {}", crate::results::TOOL_NAME, crate::results::TOOL_VERSION),
            "clause_note": md(&calc.clause_note),
        },
        "units": { "length": u.unit(Kind::Length).0, "pressure": u.unit(Kind::Pressure).0 },
        "design": {
            "pressure": u.display(design.conditions.pressure),
            "temperature": u.display(design.conditions.temperature),
            "corrosion_allowance": u.display(design.conditions.corrosion_allowance),
            "liquid_density": design.conditions.liquid_density.map(|q| u.display(q)),
        },
        "sign_off": sign_off,
        "history": history,
        "summary": summary,
        "vessel": {
            "mawp": u.display_down(v.mawp),
            "governing": if v.governing_component.is_empty() { "none".to_string() } else { md(&v.governing_component) },
            "stress_ratio": crate::units::format_number(v.stress_ratio, 4),
            "hydrotest": u.display_up(v.hydrotest_pressure),
            "pneumatic": u.display_up(v.pneumatic_test_pressure),
            "steps": v.steps.iter().enumerate().map(|(i, s)| step_row(u, i + 1, s)).collect::<Vec<_>>(),
            "checks": v.checks.iter().map(|k| check_row(u, k)).collect::<Vec<_>>(),
        },
        "failed": failed,
        "quantities": {
            "empty_mass": v.empty_mass.map(|q| u.display(q)),
            "volume": v.volume.map(|q| u.display(q)),
            "liquid_mass": v.liquid_mass.map(|q| u.display(q)),
            "excluded": v.totals_exclude.iter().map(|x| md(x)).collect::<Vec<_>>(),
        },
        "order": v.order_list.iter().map(|o| {
            let blank = match (o.blank_width, o.blank_length, o.blank_diameter) {
                (Some(w), Some(l), _) => format!("{} × {}", u.display(w), u.display(l)),
                (None, Some(l), _) => format!("length {}", u.display(l)),
                (_, _, Some(d)) => format!("Ø {}", u.display_up(d)),
                _ => "–".to_string(),
            };
            json!({
                "component": md(&o.component),
                "material": md(&o.material),
                "form": md(&o.product_form),
                "ordered_as": md(&o.ordered_as),
                "thickness": nbsp(&u.display(o.thickness)),
                "blank": nbsp(&md(&blank)),
            })
        }).collect::<Vec<_>>(),
        "components": calc.components.iter().enumerate().map(|(i, c)| component(design, u, i + 1, c, extras.get(&c.id))).collect::<Vec<_>>(),
        "cautions": { "standing": standing, "specific": specific },
        "echo": echo(design),
    })
}

/// Adds the optional "changes since" section and the signatures shown in
/// the sign-off table. Neither is an engineering value; the signatures are
/// not part of the digest (a signed copy keeps the digest it was signed under).
pub fn add_changes_and_signatures(
    ctx: &mut Value,
    changes: Option<&str>,
    signatures: &[(String, String, String, String)],
) {
    ctx["changes"] = json!(changes.unwrap_or(""));
    ctx["signed"] = json!(!signatures.is_empty());
    if let Some(rows) = ctx["sign_off"].as_array_mut() {
        for row in rows.iter_mut() {
            let role = row["role"].as_str().unwrap_or("").to_ascii_lowercase();
            if let Some((_, signer, date, fp)) = signatures.iter().find(|(r, ..)| *r == role) {
                row["name"] = json!(md(signer));
                row["date"] = json!(md(date));
                row["signature"] = json!(md(&format!("Ed25519, key {fp}")));
            }
        }
    }
}

#[cfg(test)]
mod tests {
    use super::md;

    #[test]
    fn escapes_markdown_specials() {
        assert_eq!(md("a|b *c* _d_"), "a\\|b \\*c\\* \\_d\\_");
        assert_eq!(md("line\nbreak"), "line break");
        // Backticks are kept so that `names` render as code.
        assert_eq!(md("table `a_b[0]`"), "table `a_b[0]`");
        assert_eq!(md("odd ` tick"), "odd \\` tick");
    }
}
