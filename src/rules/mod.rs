//! Rule sets: pure functions from a [`Design`] to a [`Calculation`].
//!
//! Architecture invariant: rules know nothing of templates, files, PDF or
//! the clock. A second design code is a new module beside
//! [`asme_viii_1`] implementing [`RuleSet`] and one line in [`rule_set`].

pub mod asme_viii_1;

use crate::calc::{CalcError, Check, Formula, Step};
use crate::model::Design;
use crate::units::Quantity;
use serde::Serialize;

/// A design code's rules for the loads Knuckle evaluates.
pub trait RuleSet: Sync {
    /// Id used in case files (`asme-viii-1`).
    fn id(&self) -> &'static str;
    /// Full title for reports.
    fn title(&self) -> &'static str;
    /// The code editions this rule set implements; a case asserting any
    /// other edition is refused as an input error.
    fn editions(&self) -> &'static [&'static str];
    /// Every formula this rule set uses (for tests and documentation).
    fn formulas(&self) -> &'static [&'static Formula];
    /// Evaluates every component and the vessel.
    fn evaluate(&self, design: &Design) -> Result<Calculation, CalcError>;
}

/// The rule set with this id.
pub fn rule_set(id: &str) -> Option<&'static dyn RuleSet> {
    match id {
        "asme-viii-1" => Some(&asme_viii_1::AsmeViii1),
        _ => None,
    }
}

/// The results of a rule set for one design.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Calculation {
    /// Rule set id.
    pub rule_set: String,
    /// Rule set title.
    pub rule_set_title: String,
    /// Edition the user asserted.
    pub edition: String,
    /// Which edition the clause references follow, in words.
    pub clause_note: String,
    /// Per-component results in vessel order.
    pub components: Vec<ComponentResult>,
    /// Vessel-level results.
    pub vessel: VesselResult,
}

impl Calculation {
    /// True when every check of every component and of the vessel passes.
    pub fn acceptable(&self) -> bool {
        self.vessel.acceptable && self.components.iter().all(|c| c.acceptable)
    }

    /// Every failed check, with the component it belongs to.
    pub fn failed_checks(&self) -> Vec<(&str, &Check)> {
        let mut out = Vec::new();
        for c in &self.components {
            for k in c.checks.iter().filter(|k| !k.pass) {
                out.push((c.id.as_str(), k));
            }
        }
        for k in self.vessel.checks.iter().filter(|k| !k.pass) {
            out.push(("vessel", k));
        }
        out
    }
}

/// Results for one pressure part.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ComponentResult {
    /// Component id.
    pub id: String,
    /// Type name as in the case file.
    pub type_name: String,
    /// Short description of the geometry ("2:1 ellipsoidal, D/2h = 2").
    pub description: String,
    /// Every step in order.
    pub steps: Vec<Step>,
    /// Every check in order.
    pub checks: Vec<Check>,
    /// Pressure thickness in the corroded condition.
    pub required_thickness: Option<Quantity>,
    /// Required thickness with floor, corrosion and thinning allowances.
    pub minimum_thickness: Option<Quantity>,
    /// Nominal thickness, when given.
    pub nominal_thickness: Option<Quantity>,
    /// Design pressure at the component (design pressure plus static head).
    pub design_pressure: Quantity,
    /// Static head at the component's lowest point.
    pub static_head: Quantity,
    /// MAWP at the component, hot and corroded.
    pub mawp: Option<Quantity>,
    /// MAWP referred to the vessel top.
    pub mawp_top: Option<Quantity>,
    /// Maximum allowable pressure, new and cold.
    pub map: Option<Quantity>,
    /// Limits of what was evaluated, in words (always shown in the cautions).
    pub limits: Vec<String>,
    /// All checks pass.
    pub acceptable: bool,
    /// The commercial thickness selected when no nominal thickness was given.
    pub selected_thickness: Option<Quantity>,
    /// Empty mass at the nominal (or selected) thickness, when known.
    pub mass: Option<Quantity>,
    /// Inside volume, when known.
    pub volume: Option<Quantity>,
    /// What to order for this component.
    pub order: Option<OrderItem>,
    /// Geometry of formed heads and cones (depth, volume, area, blank, mass,
    /// deviation from a reference ellipse).
    pub geometry: Option<crate::geometry::component::ComponentGeometry>,
}

/// One line of the plate and pipe order list.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct OrderItem {
    /// Component id.
    pub component: String,
    /// Material name (specification and grade).
    pub material: String,
    /// Product form (`plate`, `pipe`, `forging`).
    pub product_form: String,
    /// Nominal (ordered) thickness.
    pub thickness: Quantity,
    /// How it is ordered (`12 mm plate`, `NPS 8 Sch 40`).
    pub ordered_as: String,
    /// Blank width (for a rolled cylinder: its length), when known.
    pub blank_width: Option<Quantity>,
    /// Blank length (for a rolled cylinder: the developed length on the mean
    /// diameter; for pipe: the length to cut), when known.
    pub blank_length: Option<Quantity>,
    /// Diameter of the flat blank of a formed head (mean-surface equal-area method), when known.
    pub blank_diameter: Option<Quantity>,
}

/// Vessel-level results.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct VesselResult {
    /// Steps (governing MAWP, test pressures).
    pub steps: Vec<Step>,
    /// Checks.
    pub checks: Vec<Check>,
    /// Vessel MAWP at the top.
    pub mawp: Quantity,
    /// Id of the component that governs the MAWP.
    pub governing_component: String,
    /// Lowest ratio of test-temperature to design-temperature allowable stress.
    pub stress_ratio: f64,
    /// Hydrostatic test pressure at the top.
    pub hydrotest_pressure: Quantity,
    /// Pneumatic test pressure at the top.
    pub pneumatic_test_pressure: Quantity,
    /// All vessel checks pass.
    pub acceptable: bool,
    /// Empty mass of the components whose mass is known.
    pub empty_mass: Option<Quantity>,
    /// Inside volume of the components whose volume is known.
    pub volume: Option<Quantity>,
    /// Mass of the liquid filling that volume, when a liquid density is given.
    pub liquid_mass: Option<Quantity>,
    /// Components left out of the mass and volume totals (not known in this build).
    pub totals_exclude: Vec<String>,
    /// The plate and pipe order list, in vessel order.
    pub order_list: Vec<OrderItem>,
}
