//! The case file as written: a serde mirror of the TOML, unknown keys
//! rejected, spans kept so that every later error can point at its key.
//!
//! Nothing here interprets a value; [`crate::model`] turns a [`CaseFile`]
//! into a validated [`crate::model::Design`].

use crate::diag::{Diagnostic, InputErrors};
use serde::{Deserialize, Serialize};
use std::collections::BTreeMap;
use toml::Spanned;

/// A scalar as written: text (`"1.0 MPa"`), an integer or a float. Kept
/// loose here so that a number given without its unit gets a helpful message
/// from the model stage rather than a bare type error.
#[derive(Debug, Clone, PartialEq, Deserialize, Serialize)]
#[serde(untagged)]
pub enum Scalar {
    /// A quoted string.
    Text(String),
    /// An integer.
    Int(i64),
    /// A float.
    Float(f64),
}

impl Scalar {
    /// The value as written, for echoes.
    pub fn as_written(&self) -> String {
        match self {
            Scalar::Text(s) => s.clone(),
            Scalar::Int(i) => i.to_string(),
            Scalar::Float(f) => f.to_string(),
        }
    }
}

/// A scalar with its place in the file.
pub type Value = Spanned<Scalar>;

/// The whole case file.
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct CaseFile {
    /// `[document]`: identity of the calculation document.
    pub document: Spanned<RawDocument>,
    /// `[sign_off]`: names of the roles.
    #[serde(default)]
    pub sign_off: Option<RawSignOff>,
    /// `[design]`: design conditions.
    pub design: Spanned<RawDesign>,
    /// `[materials.<key>]`.
    #[serde(default)]
    pub materials: BTreeMap<String, Spanned<RawMaterial>>,
    /// `[[component]]`, in vessel order.
    #[serde(default)]
    pub component: Vec<Spanned<RawComponent>>,
    /// `[stock]`: commercial thickness lists replacing the defaults.
    #[serde(default)]
    pub stock: Option<Spanned<RawStock>>,
}

/// `[stock]`.
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawStock {
    /// Plate thicknesses to select from, replacing the default list.
    pub plate_thicknesses: Option<Spanned<Vec<Value>>>,
}

/// `[document]`.
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawDocument {
    /// Document number (required).
    pub number: Option<Spanned<String>>,
    /// Title.
    pub title: Option<Spanned<String>>,
    /// Project.
    pub project: Option<Spanned<String>>,
    /// Revision (required).
    pub revision: Option<Spanned<String>>,
    /// Date, ISO `YYYY-MM-DD` (required).
    pub date: Option<Spanned<toml::Value>>,
    /// Rule set id.
    pub rules: Option<Spanned<String>>,
    /// Code edition the user asserts.
    pub edition: Option<Spanned<toml::Value>>,
    /// Report units: `SI` or `US`.
    pub units: Option<Spanned<String>>,
    /// Revision rows.
    #[serde(default)]
    pub history: Vec<Spanned<RawRevision>>,
}

/// `[[document.history]]`.
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawRevision {
    /// Revision letter or number.
    pub revision: Spanned<String>,
    /// Date, ISO.
    pub date: Spanned<toml::Value>,
    /// What changed.
    #[serde(default)]
    pub note: Option<Spanned<String>>,
}

/// `[sign_off]`.
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawSignOff {
    /// Name of the preparer.
    pub prepared_by: Option<Spanned<String>>,
    /// Name of the checker.
    pub checked_by: Option<Spanned<String>>,
    /// Name of the approver.
    pub approved_by: Option<Spanned<String>>,
}

/// `[design]`.
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawDesign {
    /// Design pressure at the top of the vessel.
    pub internal_pressure: Option<Value>,
    /// Design temperature.
    pub temperature: Option<Value>,
    /// Default corrosion allowance.
    pub corrosion_allowance: Option<Value>,
    /// Liquid density for static head.
    pub liquid_density: Option<Value>,
    /// Test temperature (for allowable stresses looked up in a library).
    pub test_temperature: Option<Value>,
    /// Service of the vessel (`compressed-air`, `steam`, `water`, `other`),
    /// for the minimum thickness of UG-16(b).
    pub service: Option<Spanned<String>>,
    /// Which of the code's paired values apply (`SI` or `US`), for example
    /// 1.5 mm or 1/16 in in UG-16(b); independent of the report units.
    pub code_values: Option<Spanned<String>>,
}

/// `[materials.<key>]`.
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawMaterial {
    /// Specification and grade.
    pub name: Option<Spanned<String>>,
    /// Allowable stress at design temperature.
    pub allowable_stress: Option<Value>,
    /// Allowable stress at test temperature.
    pub test_allowable_stress: Option<Value>,
    /// Density of the metal, for masses.
    pub density: Option<Value>,
    /// Library file, relative to the case file.
    pub library: Option<Spanned<String>>,
    /// Material key in the library file.
    pub entry: Option<Spanned<String>>,
    /// Product form (`plate`, `pipe`, `forging`) of a material given directly.
    pub product_form: Option<Spanned<String>>,
    /// Part of Subsection C the material belongs to (`UCS`, `UHA`, ...), of a
    /// material given directly.
    pub part: Option<Spanned<String>>,
}

/// `[[component]]`: every key any component type may take; the model stage
/// rejects keys that do not apply to the given type.
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RawComponent {
    /// Unique id.
    pub id: Option<Spanned<String>>,
    /// Component type.
    #[serde(rename = "type")]
    pub kind: Option<Spanned<String>>,
    /// Material key.
    pub material: Option<Spanned<String>>,
    /// Inside diameter (large end for cones).
    pub inside_diameter: Option<Value>,
    /// Outside diameter (large end for cones).
    pub outside_diameter: Option<Value>,
    /// Nominal (ordered) thickness.
    pub nominal_thickness: Option<Value>,
    /// Joint efficiency of the joints that govern the main stress.
    pub joint_efficiency: Option<Value>,
    /// Joint efficiency of circumferential joints (cylinders, longitudinal stress).
    pub circumferential_joint_efficiency: Option<Value>,
    /// Joint type of Table UW-12 (1 to 6), instead of `joint_efficiency`.
    pub joint_type: Option<Value>,
    /// Extent of radiography: `full`, `spot` or `none`.
    pub radiography: Option<Spanned<String>>,
    /// A seamless shell or head (UW-12(d)).
    pub seamless: Option<Spanned<bool>>,
    /// Mill under-tolerance: a length, or a percentage of the nominal thickness (`"12.5 %"`).
    pub mill_undertolerance: Option<Value>,
    /// Static liquid head at the component's lowest point.
    pub liquid_head: Option<Value>,
    /// Length (cylinders, cones).
    pub length: Option<Value>,
    /// Corrosion allowance override.
    pub corrosion_allowance: Option<Value>,
    /// Ellipsoidal heads: D/2h.
    pub aspect_ratio: Option<Value>,
    /// Formed heads: straight flange length.
    pub straight_flange: Option<Value>,
    /// Formed heads: thinning allowance for forming.
    pub thinning_allowance: Option<Value>,
    /// Torispherical heads: inside crown radius.
    pub crown_radius: Option<Value>,
    /// Torispherical heads: inside knuckle radius.
    pub knuckle_radius: Option<Value>,
    /// Torispherical heads: a named shape.
    pub shape: Option<Spanned<String>>,
    /// Cones: inside diameter at the small end.
    pub small_inside_diameter: Option<Value>,
    /// Cones: outside diameter at the small end.
    pub small_outside_diameter: Option<Value>,
    /// Cones: half-apex angle.
    pub half_apex_angle: Option<Value>,
}

/// Parses case-file text. Syntax errors and unknown keys come back as
/// diagnostics pointing at the place in the file.
pub fn parse_case(file: &str, source: &str) -> Result<CaseFile, InputErrors> {
    toml::from_str::<CaseFile>(source).map_err(|e| {
        let message = e.message().to_string();
        let mut d = Diagnostic::new("", e.span(), first_sentence(&message));
        if let Some(rest) = message.split_once("expected ").map(|(_, r)| r) {
            d = d.expected(rest.trim_end_matches('.').to_string());
        }
        if message.contains("unknown field") {
            d = d.hint("check the spelling of the key against `knuckle new` or `knuckle schema`");
        } else if message.contains("missing field") {
            d = d.hint("add the missing key; `knuckle new` writes a complete starter file");
        }
        InputErrors::one(file, source, d)
    })
}

fn first_sentence(message: &str) -> String {
    let m = message.trim();
    match m.split_once(", expected") {
        Some((head, _)) => head.to_string(),
        None => m.to_string(),
    }
}
