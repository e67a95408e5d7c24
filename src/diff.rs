//! Revision comparison: what changed between two revisions of a case, in
//! the inputs, in every step's result, in the checks and in the vessel
//! summary.
//!
//! Both sides are first reduced to a [`Snapshot`], either from an evaluated
//! case ([`Snapshot::from_evaluated`]) or from a package's results file
//! ([`Snapshot::from_results`]); the [`Diff`] is computed between two
//! snapshots of the same kind and rendered as terminal text
//! ([`diff_text`]) or as a Markdown section ([`diff_markdown`]) that a
//! package can embed. Values are shown in the new revision's unit system.
//!
//! Architecture invariant: the comparison is deterministic; items keep the
//! order of the case (inputs, components, steps), and status flips of
//! checks come before changed margins.

use crate::model::{ComponentKind, Diameter};
use crate::pipeline::Evaluated;
use crate::rules::ComponentResult;
use crate::units::{format_number, Kind, Quantity, UnitSystem};
use serde_json::Value as Json;

/// An input's value.
#[derive(Debug, Clone, PartialEq)]
pub enum Value {
    /// A quantity with its kind.
    Quantity(Quantity),
    /// A plain number.
    Number(f64),
    /// Words (a material name, a component type).
    Text(String),
}

/// One recorded step.
#[derive(Debug, Clone, PartialEq)]
pub struct StepSnap {
    /// Matching key within the component: symbol, clause and occurrence.
    pub key: String,
    /// Symbol.
    pub symbol: String,
    /// Description.
    pub description: String,
    /// Clause.
    pub clause: String,
    /// Result.
    pub value: Quantity,
}

/// One recorded check.
#[derive(Debug, Clone, PartialEq)]
pub struct CheckSnap {
    /// What is checked.
    pub name: String,
    /// Clause.
    pub clause: String,
    /// Whether it passes.
    pub pass: bool,
    /// Spare capacity.
    pub margin: Option<Quantity>,
}

/// The steps and checks of one component, or of the vessel.
#[derive(Debug, Clone, PartialEq)]
pub struct PartSnap {
    /// Component id, or `vessel`.
    pub id: String,
    /// Computed steps (inputs excluded, they are compared as inputs).
    pub steps: Vec<StepSnap>,
    /// Checks.
    pub checks: Vec<CheckSnap>,
}

/// What is compared of one revision.
#[derive(Debug, Clone, PartialEq)]
pub struct Snapshot {
    /// Document number.
    pub number: String,
    /// Revision.
    pub revision: String,
    /// Report unit system.
    pub units: UnitSystem,
    /// Inputs by key, in case order.
    pub inputs: Vec<(String, Value)>,
    /// Components then the vessel.
    pub parts: Vec<PartSnap>,
    /// Vessel summary lines by name, in a fixed order.
    pub summary: Vec<(String, Value)>,
}

fn keyed_steps<'a>(steps: impl Iterator<Item = (String, String, String, Quantity)> + 'a) -> Vec<StepSnap> {
    let mut seen: Vec<(String, usize)> = Vec::new();
    steps
        .map(|(symbol, description, clause, value)| {
            let base = format!("{symbol} [{clause}]");
            let n = match seen.iter_mut().find(|(k, _)| *k == base) {
                Some((_, n)) => {
                    *n += 1;
                    *n
                }
                None => {
                    seen.push((base.clone(), 1));
                    1
                }
            };
            StepSnap { key: format!("{base} #{n}"), symbol, description, clause, value }
        })
        .collect()
}

fn part_from_result(c: &ComponentResult) -> PartSnap {
    part_from(&c.id, &c.steps, &c.checks)
}

fn part_from(id: &str, steps: &[crate::calc::Step], checks: &[crate::calc::Check]) -> PartSnap {
    PartSnap {
        id: id.to_string(),
        steps: keyed_steps(
            steps
                .iter()
                .filter(|s| s.clause != "input")
                .map(|s| (s.symbol.clone(), s.description.clone(), s.clause.clone(), s.quantity)),
        ),
        checks: checks
            .iter()
            .map(|k| CheckSnap { name: k.name.clone(), clause: k.clause.clone(), pass: k.pass, margin: k.margin })
            .collect(),
    }
}

fn status_word(ok: bool) -> Value {
    Value::Text(if ok { "acceptable" } else { "not acceptable" }.into())
}

impl Snapshot {
    /// The snapshot of an evaluated case: inputs from the validated design.
    pub fn from_evaluated(ev: &Evaluated) -> Snapshot {
        let d = &ev.design;
        let q = Value::Quantity;
        let mut inputs: Vec<(String, Value)> = vec![
            ("rule set".into(), Value::Text(d.document.rules.clone())),
            ("code edition".into(), Value::Text(d.document.edition.clone())),
            ("report units".into(), Value::Text(d.units.name().into())),
            ("design pressure".into(), q(d.conditions.pressure)),
            ("design temperature".into(), q(d.conditions.temperature)),
            ("corrosion allowance".into(), q(d.conditions.corrosion_allowance)),
            ("liquid density".into(), d.conditions.liquid_density.map(q).unwrap_or_else(|| Value::Text("none".into()))),
        ];
        for (key, m) in &d.materials {
            let k = |s: &str| format!("material {key}: {s}");
            inputs.push((k("name"), Value::Text(m.name.clone())));
            inputs.push((k("allowable stress"), q(m.allowable_stress)));
            inputs.push((k("test allowable stress"), q(m.test_allowable_stress)));
            inputs.push((k("density"), q(m.density)));
        }
        for c in &d.components {
            let k = |s: &str| format!("{}: {s}", c.id);
            inputs.push((k("type"), Value::Text(c.kind.type_name().into())));
            inputs.push((k("material"), Value::Text(c.material.clone())));
            match c.diameter {
                Diameter::Inside(v) => inputs.push((k("inside diameter"), q(v))),
                Diameter::Outside(v) => inputs.push((k("outside diameter"), q(v))),
            }
            let opt = |v: Option<Quantity>| v.map(q).unwrap_or_else(|| Value::Text("not given".into()));
            inputs.push((k("nominal thickness"), opt(c.nominal_thickness)));
            inputs.push((k("joint efficiency"), Value::Number(c.joint_efficiency)));
            if matches!(c.kind, ComponentKind::Cylinder) {
                inputs.push((k("circumferential joint efficiency"), Value::Number(c.circumferential_joint_efficiency)));
            }
            inputs.push((k("liquid head"), q(c.liquid_head)));
            if let Some(l) = c.length {
                inputs.push((k("length"), q(l)));
            }
            inputs.push((k("corrosion allowance"), q(c.corrosion_allowance)));
            if c.kind.is_formed_head() {
                inputs.push((k("thinning allowance"), q(c.thinning_allowance)));
                inputs.push((k("straight flange"), q(c.straight_flange)));
            }
            match &c.kind {
                ComponentKind::EllipsoidalHead { aspect_ratio } => {
                    inputs.push((k("aspect ratio D/2h"), Value::Number(*aspect_ratio)));
                }
                ComponentKind::TorisphericalHead { crown_radius, knuckle_radius, shape } => {
                    inputs.push((k("shape"), Value::Text(shape.map(|s| s.name()).unwrap_or("radii given").into())));
                    inputs.push((k("crown radius"), q(*crown_radius)));
                    inputs.push((k("knuckle radius"), q(*knuckle_radius)));
                }
                ComponentKind::ConicalSection { small_diameter, half_apex_angle } => {
                    inputs.push((k("small-end diameter"), q(*small_diameter)));
                    inputs.push((k("half-apex angle"), q(*half_apex_angle)));
                }
                _ => {}
            }
        }
        let calc = &ev.calculation;
        let mut parts: Vec<PartSnap> = calc.components.iter().map(part_from_result).collect();
        parts.push(part_from("vessel", &calc.vessel.steps, &calc.vessel.checks));
        let v = &calc.vessel;
        let summary = vec![
            ("vessel MAWP at the top".into(), q(v.mawp)),
            ("governing component".into(), Value::Text(v.governing_component.clone())),
            ("hydrostatic test pressure".into(), q(v.hydrotest_pressure)),
            ("pneumatic test pressure".into(), q(v.pneumatic_test_pressure)),
            ("status".into(), status_word(calc.acceptable())),
        ];
        Snapshot {
            number: d.document.number.clone(),
            revision: d.document.revision.clone(),
            units: d.units,
            inputs,
            parts,
            summary,
        }
    }

    /// The snapshot of a results file (`knuckle-results/1`, the `.json` of
    /// a package). Its inputs are the design conditions and the input steps
    /// each component recorded.
    pub fn from_results(v: &Json) -> Result<Snapshot, String> {
        if v["format"] != crate::results::FORMAT {
            return Err(format!("not a results file of format `{}`", crate::results::FORMAT));
        }
        let text = |x: &Json| x.as_str().unwrap_or("").to_string();
        let units = if v["report_units"] == "US" { UnitSystem::Us } else { UnitSystem::Si };
        let fixed = |x: &Json, kind: Kind| -> Value {
            match x.as_f64() {
                Some(n) => Value::Quantity(from_json_unit(n, kind)),
                None => Value::Text("none".into()),
            }
        };
        let design = &v["design"];
        let mut inputs = vec![
            ("rule set".into(), Value::Text(text(&v["rules"]["id"]))),
            ("code edition".into(), Value::Text(text(&v["rules"]["edition"]))),
            ("report units".into(), Value::Text(units.name().into())),
            ("design pressure".into(), fixed(&design["pressure"], Kind::Pressure)),
            ("design temperature".into(), fixed(&design["temperature"], Kind::Temperature)),
            ("corrosion allowance".into(), fixed(&design["corrosion_allowance"], Kind::Length)),
            ("liquid density".into(), fixed(&design["liquid_density"], Kind::Density)),
        ];
        let mut parts = Vec::new();
        let empty = Vec::new();
        let comps = v["components"].as_array().unwrap_or(&empty);
        let read_steps = |x: &Json| -> Vec<(String, String, String, Quantity, bool)> {
            x.as_array()
                .unwrap_or(&empty)
                .iter()
                .filter_map(|s| {
                    let kind = kind_from_name(s["kind"].as_str()?)?;
                    Some((
                        text(&s["symbol"]),
                        text(&s["description"]),
                        text(&s["clause"]),
                        from_json_unit(s["value"].as_f64()?, kind),
                        s["clause"] == "input",
                    ))
                })
                .collect()
        };
        let read_checks = |x: &Json| -> Vec<CheckSnap> {
            x.as_array()
                .unwrap_or(&empty)
                .iter()
                .map(|k| {
                    let kind = k["unit"].as_str().and_then(kind_from_unit).unwrap_or(Kind::Dimensionless);
                    CheckSnap {
                        name: text(&k["name"]),
                        clause: text(&k["clause"]),
                        pass: k["pass"].as_bool().unwrap_or(false),
                        margin: k["margin"].as_f64().map(|m| from_json_unit(m, kind)),
                    }
                })
                .collect()
        };
        for c in comps {
            let id = text(&c["id"]);
            inputs.push((format!("{id}: type"), Value::Text(text(&c["type"]))));
            let steps = read_steps(&c["steps"]);
            let mut seen: Vec<String> = Vec::new();
            for (sym, desc, _, q, _) in steps.iter().filter(|s| s.4) {
                // The same input (corrosion allowance, stress) is recorded
                // again for the new-and-cold case; its first value stands.
                let key = format!("{id}: {desc} ({sym})");
                if !seen.contains(&key) {
                    seen.push(key.clone());
                    inputs.push((key, Value::Quantity(*q)));
                }
            }
            parts.push(PartSnap {
                id: id.clone(),
                steps: keyed_steps(steps.into_iter().filter(|s| !s.4).map(|(a, b, c, d, _)| (a, b, c, d))),
                checks: read_checks(&c["checks"]),
            });
        }
        let ves = &v["vessel"];
        parts.push(PartSnap {
            id: "vessel".into(),
            steps: keyed_steps(
                read_steps(&ves["steps"]).into_iter().filter(|s| !s.4).map(|(a, b, c, d, _)| (a, b, c, d)),
            ),
            checks: read_checks(&ves["checks"]),
        });
        let summary = vec![
            ("vessel MAWP at the top".into(), fixed(&ves["mawp"], Kind::Pressure)),
            ("governing component".into(), Value::Text(text(&ves["governing_component"]))),
            ("hydrostatic test pressure".into(), fixed(&ves["hydrotest_pressure"], Kind::Pressure)),
            ("pneumatic test pressure".into(), fixed(&ves["pneumatic_test_pressure"], Kind::Pressure)),
            ("status".into(), status_word(v["status"] == "acceptable")),
        ];
        Ok(Snapshot {
            number: text(&v["document"]["number"]),
            revision: text(&v["document"]["revision"]),
            units,
            inputs,
            parts,
            summary,
        })
    }
}

/// The SI value of a number given in the results file's fixed unit.
fn from_json_unit(v: f64, kind: Kind) -> Quantity {
    // Every fixed unit is a pure factor of the SI base (no offsets: °C is
    // kept as °C), so dividing by the image of 1 inverts it.
    let factor = (kind.json_unit().1)(1.0);
    Quantity::new(v / factor, kind)
}

fn kind_from_name(s: &str) -> Option<Kind> {
    Some(match s {
        "dimensionless" => Kind::Dimensionless,
        "angle" => Kind::Angle,
        "length" => Kind::Length,
        "area" => Kind::Area,
        "volume" => Kind::Volume,
        "pressure" => Kind::Pressure,
        "stress" => Kind::Stress,
        "density" => Kind::Density,
        "acceleration" => Kind::Acceleration,
        "mass" => Kind::Mass,
        "temperature" => Kind::Temperature,
        _ => return None,
    })
}

fn kind_from_unit(u: &str) -> Option<Kind> {
    Some(match u {
        "mm" => Kind::Length,
        "MPa" => Kind::Pressure,
        "deg" => Kind::Angle,
        "1" => Kind::Dimensionless,
        "degC" => Kind::Temperature,
        "kg/m3" => Kind::Density,
        _ => return None,
    })
}

/// A changed input.
#[derive(Debug, Clone, PartialEq)]
pub struct InputChange {
    /// What the input is.
    pub key: String,
    /// Old value (`None`: added).
    pub old: Option<Value>,
    /// New value (`None`: removed).
    pub new: Option<Value>,
}

/// A changed step result.
#[derive(Debug, Clone, PartialEq)]
pub struct StepChange {
    /// Component id or `vessel`.
    pub part: String,
    /// Symbol.
    pub symbol: String,
    /// Description (from the new revision when it has the step).
    pub description: String,
    /// Clause.
    pub clause: String,
    /// Old result.
    pub old: Option<Quantity>,
    /// New result.
    pub new: Option<Quantity>,
}

impl StepChange {
    /// `(new − old)/|old|`, when both exist and old is not zero.
    pub fn relative(&self) -> Option<f64> {
        relative(self.old?.value, self.new?.value)
    }
}

/// A changed check.
#[derive(Debug, Clone, PartialEq)]
pub struct CheckChange {
    /// Component id or `vessel`.
    pub part: String,
    /// What is checked.
    pub name: String,
    /// Clause.
    pub clause: String,
    /// Old pass/fail (`None`: new check).
    pub old_pass: Option<bool>,
    /// New pass/fail (`None`: check dropped).
    pub new_pass: Option<bool>,
    /// Old margin.
    pub old_margin: Option<Quantity>,
    /// New margin.
    pub new_margin: Option<Quantity>,
}

impl CheckChange {
    /// True when the check went from pass to fail or back.
    pub fn flipped(&self) -> bool {
        matches!((self.old_pass, self.new_pass), (Some(a), Some(b)) if a != b)
    }
}

/// A changed line of the vessel summary.
#[derive(Debug, Clone, PartialEq)]
pub struct SummaryChange {
    /// What it is.
    pub item: String,
    /// Old value.
    pub old: Value,
    /// New value.
    pub new: Value,
}

/// Everything that changed between two revisions.
#[derive(Debug, Clone, PartialEq)]
pub struct Diff {
    /// Document number (new revision's).
    pub number: String,
    /// Old document number, when it differs.
    pub old_number: Option<String>,
    /// Old revision.
    pub old_revision: String,
    /// New revision.
    pub new_revision: String,
    /// Unit system for display (the new revision's).
    pub units: UnitSystem,
    /// Changed, added and removed inputs, in case order.
    pub inputs: Vec<InputChange>,
    /// Components only in the old revision.
    pub removed_parts: Vec<String>,
    /// Components only in the new revision.
    pub added_parts: Vec<String>,
    /// Changed step results, in order, for components in both.
    pub steps: Vec<StepChange>,
    /// Changed checks: status flips first, then the rest, each in order.
    pub checks: Vec<CheckChange>,
    /// Changed vessel summary lines.
    pub summary: Vec<SummaryChange>,
}

impl Diff {
    /// True when nothing at all changed.
    pub fn is_empty(&self) -> bool {
        self.inputs.is_empty()
            && self.removed_parts.is_empty()
            && self.added_parts.is_empty()
            && self.steps.is_empty()
            && self.checks.is_empty()
            && self.summary.is_empty()
    }
}

fn relative(old: f64, new: f64) -> Option<f64> {
    (old != 0.0 && old.is_finite() && new.is_finite()).then(|| (new - old) / old.abs())
}

/// Equal within floating-point noise (values that went through JSON text
/// may differ in the last bit).
fn same_number(a: f64, b: f64) -> bool {
    a == b || (a - b).abs() <= 1e-12 * a.abs().max(b.abs())
}

fn same_quantity(a: Option<Quantity>, b: Option<Quantity>) -> bool {
    match (a, b) {
        (None, None) => true,
        (Some(a), Some(b)) => a.kind == b.kind && same_number(a.value, b.value),
        _ => false,
    }
}

fn same_value(a: &Value, b: &Value) -> bool {
    match (a, b) {
        (Value::Quantity(x), Value::Quantity(y)) => same_quantity(Some(*x), Some(*y)),
        (Value::Number(x), Value::Number(y)) => same_number(*x, *y),
        (Value::Text(x), Value::Text(y)) => x == y,
        _ => false,
    }
}

/// Compares two evaluated cases.
pub fn diff_cases(old: &Evaluated, new: &Evaluated) -> Diff {
    diff_snapshots(&Snapshot::from_evaluated(old), &Snapshot::from_evaluated(new))
}

/// Compares two snapshots (take both from the same kind of source, so that
/// their inputs are named alike).
pub fn diff_snapshots(old: &Snapshot, new: &Snapshot) -> Diff {
    let mut inputs = Vec::new();
    for (k, nv) in &new.inputs {
        match old.inputs.iter().find(|(ok, _)| ok == k) {
            Some((_, ov)) if same_value(ov, nv) => {}
            Some((_, ov)) => inputs.push(InputChange { key: k.clone(), old: Some(ov.clone()), new: Some(nv.clone()) }),
            None => inputs.push(InputChange { key: k.clone(), old: None, new: Some(nv.clone()) }),
        }
    }
    for (k, ov) in &old.inputs {
        if !new.inputs.iter().any(|(nk, _)| nk == k) {
            inputs.push(InputChange { key: k.clone(), old: Some(ov.clone()), new: None });
        }
    }
    let removed_parts =
        old.parts.iter().filter(|p| !new.parts.iter().any(|n| n.id == p.id)).map(|p| p.id.clone()).collect();
    let added_parts =
        new.parts.iter().filter(|p| !old.parts.iter().any(|o| o.id == p.id)).map(|p| p.id.clone()).collect();
    let mut steps = Vec::new();
    let mut flips = Vec::new();
    let mut other_checks = Vec::new();
    for np in &new.parts {
        let Some(op) = old.parts.iter().find(|o| o.id == np.id) else {
            continue;
        };
        for ns in &np.steps {
            let os = op.steps.iter().find(|o| o.key == ns.key);
            if !same_quantity(os.map(|o| o.value), Some(ns.value)) {
                steps.push(StepChange {
                    part: np.id.clone(),
                    symbol: ns.symbol.clone(),
                    description: ns.description.clone(),
                    clause: ns.clause.clone(),
                    old: os.map(|o| o.value),
                    new: Some(ns.value),
                });
            }
        }
        for os in op.steps.iter().filter(|o| !np.steps.iter().any(|n| n.key == o.key)) {
            steps.push(StepChange {
                part: np.id.clone(),
                symbol: os.symbol.clone(),
                description: os.description.clone(),
                clause: os.clause.clone(),
                old: Some(os.value),
                new: None,
            });
        }
        for nc in &np.checks {
            let oc = op.checks.iter().find(|o| o.name == nc.name);
            let change = CheckChange {
                part: np.id.clone(),
                name: nc.name.clone(),
                clause: nc.clause.clone(),
                old_pass: oc.map(|o| o.pass),
                new_pass: Some(nc.pass),
                old_margin: oc.and_then(|o| o.margin),
                new_margin: nc.margin,
            };
            if change.flipped() {
                flips.push(change);
            } else if oc.is_none() || !same_quantity(change.old_margin, change.new_margin) {
                other_checks.push(change);
            }
        }
        for oc in op.checks.iter().filter(|o| !np.checks.iter().any(|n| n.name == o.name)) {
            other_checks.push(CheckChange {
                part: np.id.clone(),
                name: oc.name.clone(),
                clause: oc.clause.clone(),
                old_pass: Some(oc.pass),
                new_pass: None,
                old_margin: oc.margin,
                new_margin: None,
            });
        }
    }
    flips.extend(other_checks);
    let summary = new
        .summary
        .iter()
        .filter_map(|(k, nv)| {
            let (_, ov) = old.summary.iter().find(|(ok, _)| ok == k)?;
            (!same_value(ov, nv)).then(|| SummaryChange { item: k.clone(), old: ov.clone(), new: nv.clone() })
        })
        .collect();
    Diff {
        number: new.number.clone(),
        old_number: (old.number != new.number).then(|| old.number.clone()),
        old_revision: old.revision.clone(),
        new_revision: new.revision.clone(),
        units: new.units,
        inputs,
        removed_parts,
        added_parts,
        steps,
        checks: flips,
        summary,
    }
}

fn show_value(u: UnitSystem, v: &Value) -> String {
    match v {
        Value::Quantity(q) => u.display(*q),
        Value::Number(n) => format_number(*n, 6),
        Value::Text(t) => t.clone(),
    }
}

fn show_opt(u: UnitSystem, v: Option<&Value>) -> String {
    v.map(|v| show_value(u, v)).unwrap_or_else(|| "(absent)".into())
}

fn show_q(u: UnitSystem, q: Option<Quantity>) -> String {
    q.map(|q| u.display(q)).unwrap_or_else(|| "(absent)".into())
}

fn show_rel(r: Option<f64>) -> String {
    match r {
        Some(r) => {
            let pct = r * 100.0;
            let sign = if pct > 0.0 { "+" } else { "" };
            format!("{sign}{} %", format_number(pct, 3))
        }
        None => "n/a".into(),
    }
}

fn show_pass(p: Option<bool>) -> &'static str {
    match p {
        Some(true) => "pass",
        Some(false) => "FAIL",
        None => "(absent)",
    }
}

fn summary_rel(c: &SummaryChange) -> Option<f64> {
    match (&c.old, &c.new) {
        (Value::Quantity(a), Value::Quantity(b)) => relative(a.value, b.value),
        _ => None,
    }
}

fn heading(d: &Diff) -> String {
    match &d.old_number {
        Some(o) => format!("{o} revision {} -> {} revision {}", d.old_revision, d.number, d.new_revision),
        None => format!("{} revision {} -> revision {}", d.number, d.old_revision, d.new_revision),
    }
}

/// The comparison as terminal text.
pub fn diff_text(d: &Diff) -> String {
    let u = d.units;
    let mut out = format!("changes: {}\n", heading(d));
    if d.is_empty() {
        out.push_str("\nno changes in inputs, results or checks\n");
        return out;
    }
    if !d.inputs.is_empty() || !d.added_parts.is_empty() || !d.removed_parts.is_empty() {
        out.push_str(&format!("\ninputs ({} changed)\n", d.inputs.len()));
        for p in &d.added_parts {
            out.push_str(&format!("  component {p}: added\n"));
        }
        for p in &d.removed_parts {
            out.push_str(&format!("  component {p}: removed\n"));
        }
        for c in &d.inputs {
            out.push_str(&format!("  {}: {} -> {}\n", c.key, show_opt(u, c.old.as_ref()), show_opt(u, c.new.as_ref())));
        }
    }
    if !d.checks.is_empty() {
        out.push_str("\nchecks (status changes first)\n");
        for c in &d.checks {
            out.push_str(&format!(
                "  {}: {} ({}): {} -> {}, margin {} -> {}\n",
                c.part,
                c.name,
                c.clause,
                show_pass(c.old_pass),
                show_pass(c.new_pass),
                show_q(u, c.old_margin),
                show_q(u, c.new_margin)
            ));
        }
    }
    if !d.steps.is_empty() {
        out.push_str(&format!("\nresults ({} steps changed)\n", d.steps.len()));
        for s in &d.steps {
            out.push_str(&format!(
                "  {}: {} ({}, {}): {} -> {} ({})\n",
                s.part,
                s.symbol,
                s.description,
                s.clause,
                show_q(u, s.old),
                show_q(u, s.new),
                show_rel(s.relative())
            ));
        }
    }
    if !d.summary.is_empty() {
        out.push_str("\nvessel summary\n");
        for c in &d.summary {
            let rel = summary_rel(c).map(|r| format!(" ({})", show_rel(Some(r)))).unwrap_or_default();
            out.push_str(&format!("  {}: {} -> {}{rel}\n", c.item, show_value(u, &c.old), show_value(u, &c.new)));
        }
    }
    out
}

fn cell(s: &str) -> String {
    s.replace('|', "\\|").replace('\n', " ")
}

/// The comparison as a Markdown section, "Changes since revision X", for
/// the package of the new revision.
pub fn diff_markdown(d: &Diff) -> String {
    let u = d.units;
    let old = &d.old_revision;
    let new = &d.new_revision;
    let mut out = format!("## Changes since revision {old}\n\n");
    if let Some(o) = &d.old_number {
        out.push_str(&format!("Compared with document {} revision {old}.\n\n", cell(o)));
    }
    if d.is_empty() {
        out.push_str("No input, result or check changed.\n");
        return out;
    }
    if !d.inputs.is_empty() || !d.added_parts.is_empty() || !d.removed_parts.is_empty() {
        out.push_str(&format!(
            "### Inputs\n\n| input | revision {} | revision {} |\n|---|---|---|\n",
            cell(old),
            cell(new)
        ));
        for p in &d.added_parts {
            out.push_str(&format!("| component {} | (absent) | added |\n", cell(p)));
        }
        for p in &d.removed_parts {
            out.push_str(&format!("| component {} | present | (removed) |\n", cell(p)));
        }
        for c in &d.inputs {
            out.push_str(&format!(
                "| {} | {} | {} |\n",
                cell(&c.key),
                cell(&show_opt(u, c.old.as_ref())),
                cell(&show_opt(u, c.new.as_ref()))
            ));
        }
        out.push('\n');
    }
    if !d.checks.is_empty() {
        out.push_str(&format!(
            "### Checks\n\nChanges of status are listed first.\n\n| part | check | clause | revision {0} | revision {1} | margin {0} | margin {1} |\n|---|---|---|---|---|---|---|\n",
            cell(old),
            cell(new)
        ));
        for c in &d.checks {
            let flip = |p: Option<bool>| {
                if c.flipped() {
                    format!("**{}**", show_pass(p))
                } else {
                    show_pass(p).to_string()
                }
            };
            out.push_str(&format!(
                "| {} | {} | {} | {} | {} | {} | {} |\n",
                cell(&c.part),
                cell(&c.name),
                cell(&c.clause),
                flip(c.old_pass),
                flip(c.new_pass),
                cell(&show_q(u, c.old_margin)),
                cell(&show_q(u, c.new_margin))
            ));
        }
        out.push('\n');
    }
    if !d.steps.is_empty() {
        out.push_str(&format!(
            "### Results\n\n| part | step | clause | revision {} | revision {} | change |\n|---|---|---|---|---|---|\n",
            cell(old),
            cell(new)
        ));
        for s in &d.steps {
            out.push_str(&format!(
                "| {} | {} ({}) | {} | {} | {} | {} |\n",
                cell(&s.part),
                cell(&s.symbol),
                cell(&s.description),
                cell(&s.clause),
                cell(&show_q(u, s.old)),
                cell(&show_q(u, s.new)),
                show_rel(s.relative())
            ));
        }
        out.push('\n');
    }
    if !d.summary.is_empty() {
        out.push_str(&format!(
            "### Vessel summary\n\n| item | revision {} | revision {} | change |\n|---|---|---|---|\n",
            cell(old),
            cell(new)
        ));
        for c in &d.summary {
            let rel = summary_rel(c).map(|r| show_rel(Some(r))).unwrap_or_default();
            out.push_str(&format!(
                "| {} | {} | {} | {rel} |\n",
                cell(&c.item),
                cell(&show_value(u, &c.old)),
                cell(&show_value(u, &c.new))
            ));
        }
        out.push('\n');
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn relative_change_and_noise() {
        assert_eq!(relative(2.0, 3.0), Some(0.5));
        assert_eq!(relative(0.0, 3.0), None);
        assert_eq!(show_rel(Some(-0.125)), "-12.5 %");
        assert!(same_number(0.1 + 0.2, 0.3));
        assert!(!same_number(1.0, 1.000001));
    }

    #[test]
    fn json_units_invert() {
        let q = from_json_unit(12.0, Kind::Length);
        assert!((q.value - 0.012).abs() < 1e-15);
        let p = from_json_unit(1.5, Kind::Pressure);
        assert!((p.value - 1.5e6).abs() < 1e-6);
    }
}
