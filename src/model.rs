//! The validated design model: typed, unit-converted, every rule of input
//! checked. No string with a unit survives past this module.
//!
//! Architecture invariant: [`Design::from_case`] either returns a design that
//! every rule set can evaluate without meeting an invalid value, or returns
//! all input errors it found, each pointing at its key in the file.

mod construction;

pub use construction::Libraries;

use crate::case::{CaseFile, RawComponent, Scalar, Value};
use crate::diag::{Diagnostic, InputErrors};
use crate::joints::Joint;
use crate::materials::{Bracket, LibraryMaterial, ProductForm};
use crate::stock::PipeSize;
use crate::units::{parse_quantity, Kind, Quantity, QuantityError, UnitSystem};
use serde::Serialize;
use std::collections::BTreeMap;
use std::ops::Range;
use toml::Spanned;

/// The rule sets this build knows.
pub const RULE_SETS: &[&str] = &["asme-viii-1"];

/// Carbon steel density used when a material gives none, kg/m³ (common practice, no source).
pub const DEFAULT_STEEL_DENSITY: f64 = 7850.0;

/// Test temperature used when `[design] test_temperature` is not given, °C:
/// shop hydrostatic tests are usually run near room temperature, and 20 °C
/// (68 °F) lies inside the first row ("-20 to 100 °F", "-30 to 40 °C") of
/// the usual stress tables (common practice, no source). The same value is
/// used whatever the report units, so SI and US cases give the same results.
pub const DEFAULT_TEST_TEMPERATURE: f64 = 20.0;

/// A validated design: the input of every rule set.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Design {
    /// Document identity.
    pub document: Document,
    /// Sign-off names.
    pub sign_off: SignOff,
    /// Design conditions.
    pub conditions: Conditions,
    /// Materials by key.
    pub materials: BTreeMap<String, Material>,
    /// Components in vessel order.
    pub components: Vec<Component>,
    /// Report unit system.
    pub units: UnitSystem,
    /// The plate thicknesses a nominal thickness is selected from.
    pub stock: PlateStock,
}

/// The list plate (and forging) thicknesses are selected from.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct PlateStock {
    /// Thicknesses, thinnest first.
    pub thicknesses: Vec<Quantity>,
    /// Where the list comes from, in words.
    pub source: String,
}

/// Document identity and history.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Document {
    /// Document number.
    pub number: String,
    /// Title.
    pub title: String,
    /// Project.
    pub project: String,
    /// Revision.
    pub revision: String,
    /// ISO date.
    pub date: String,
    /// Rule set id.
    pub rules: String,
    /// Code edition asserted by the user.
    pub edition: String,
    /// Earlier revisions.
    pub history: Vec<Revision>,
}

/// One row of the revision history.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Revision {
    /// Revision.
    pub revision: String,
    /// ISO date.
    pub date: String,
    /// What changed.
    pub note: String,
}

/// Names of the sign-off roles (empty when not given).
#[derive(Debug, Clone, PartialEq, Default, Serialize)]
pub struct SignOff {
    /// Preparer.
    pub prepared_by: String,
    /// Checker.
    pub checked_by: String,
    /// Approver.
    pub approved_by: String,
}

/// Design conditions of the vessel.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Conditions {
    /// Internal design pressure at the top of the vessel.
    pub pressure: Quantity,
    /// Design temperature.
    pub temperature: Quantity,
    /// Default corrosion allowance.
    pub corrosion_allowance: Quantity,
    /// Liquid density for static head, when given.
    pub liquid_density: Option<Quantity>,
    /// Test temperature (given, or [`DEFAULT_TEST_TEMPERATURE`]).
    pub test_temperature: Quantity,
    /// The vessel's service, for the minimum thickness of UG-16(b).
    pub service: Service,
    /// Which of the code's paired SI and US values apply, when stated; never
    /// taken from the report units, so that results do not depend on them.
    pub code_values: Option<UnitSystem>,
}

/// The service of the vessel as far as the rules distinguish it.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Service {
    /// Not stated in the case file.
    NotStated,
    /// Compressed air.
    CompressedAir,
    /// Steam.
    Steam,
    /// Water.
    Water,
    /// Any other service.
    Other,
}

impl Service {
    /// Every service with its case-file name.
    pub const ALL: [(&'static str, Service); 4] = [
        ("compressed-air", Service::CompressedAir),
        ("steam", Service::Steam),
        ("water", Service::Water),
        ("other", Service::Other),
    ];

    /// The case-file name, or `not stated`.
    pub fn name(self) -> &'static str {
        Self::ALL.iter().find(|(_, s)| *s == self).map(|(n, _)| *n).unwrap_or("not stated")
    }

    /// Whether UG-16(b)(4) (compressed air, steam and water service) applies.
    pub fn is_air_steam_or_water(self) -> bool {
        matches!(self, Service::CompressedAir | Service::Steam | Service::Water)
    }
}

/// A material with its allowable stresses.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Material {
    /// Key in the case file.
    pub key: String,
    /// Specification and grade.
    pub name: String,
    /// Allowable stress S at design temperature.
    pub allowable_stress: Quantity,
    /// Allowable stress at test temperature.
    pub test_allowable_stress: Quantity,
    /// Metal density.
    pub density: Quantity,
    /// Product form: plate unless stated, or as the library gives it.
    pub product_form: ProductForm,
    /// Part of Subsection C (`UCS`, `UHA`, ...), when stated.
    pub part: Option<String>,
    /// The library look-ups, when the material is taken from a library.
    pub library: Option<LibraryLookup>,
}

/// A material taken from a library, with the table rows that bracket the
/// design and test temperatures. The rules record the interpolation as steps.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct LibraryLookup {
    /// The library file as shown in messages.
    pub file: String,
    /// The library's caution, carried into every output that uses it.
    pub caution: Option<String>,
    /// The library entry.
    pub material: LibraryMaterial,
    /// The rows bracketing the design temperature.
    pub design: Bracket,
    /// The rows bracketing the test temperature.
    pub test: Bracket,
}

/// A stated mill under-tolerance.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
#[serde(tag = "basis", content = "value", rename_all = "kebab-case")]
pub enum Undertolerance {
    /// A fixed amount.
    Length(Quantity),
    /// A fraction of the nominal thickness (0.125 for 12.5 %).
    Fraction(f64),
}

impl Undertolerance {
    /// The amount for a nominal thickness `t` (SI value).
    pub fn amount(&self, t: f64) -> f64 {
        match self {
            Undertolerance::Length(q) => q.value,
            Undertolerance::Fraction(f) => f * t,
        }
    }
}

/// How the component's diameter was given.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
#[serde(tag = "basis", content = "value", rename_all = "kebab-case")]
pub enum Diameter {
    /// Inside diameter.
    Inside(Quantity),
    /// Outside diameter.
    Outside(Quantity),
}

impl Diameter {
    /// The diameter value.
    pub fn value(&self) -> Quantity {
        match self {
            Diameter::Inside(q) | Diameter::Outside(q) => *q,
        }
    }
}

/// The named torispherical shapes (radii as fractions of a reference diameter).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum TorisphereShape {
    /// L = 0.9 D, r = 0.17 D on the inside diameter: the usual stand-in for a 2:1 ellipse.
    TwoToOneEquivalent,
    /// L = Do, r = 0.06 Do (UG-32 6 % knuckle head).
    SixPercentKnuckle,
    /// L = 0.8 Do, r = 0.1 Do.
    EightyTen,
    /// L = Do, r = 0.1 Do.
    Din28011,
    /// L = 0.8 Do, r = 0.154 Do.
    Din28013,
}

impl TorisphereShape {
    /// Every named shape with its case-file name.
    pub const ALL: [(&'static str, TorisphereShape); 5] = [
        ("2:1-equivalent", TorisphereShape::TwoToOneEquivalent),
        ("6%-knuckle", TorisphereShape::SixPercentKnuckle),
        ("80-10", TorisphereShape::EightyTen),
        ("din-28011", TorisphereShape::Din28011),
        ("din-28013", TorisphereShape::Din28013),
    ];

    /// The case-file name.
    pub fn name(self) -> &'static str {
        Self::ALL.iter().find(|(_, s)| *s == self).map(|(n, _)| *n).unwrap_or("")
    }

    /// Crown and knuckle radius as fractions of the reference diameter, and
    /// whether that reference is the outside diameter of the skirt.
    pub fn ratios(self) -> (f64, f64, bool) {
        match self {
            TorisphereShape::TwoToOneEquivalent => (0.9, 0.17, false),
            TorisphereShape::SixPercentKnuckle => (1.0, 0.06, true),
            TorisphereShape::EightyTen => (0.8, 0.1, true),
            TorisphereShape::Din28011 => (1.0, 0.1, true),
            TorisphereShape::Din28013 => (0.8, 0.154, true),
        }
    }
}

/// What the component is, with its type-specific geometry.
#[derive(Debug, Clone, PartialEq, Serialize)]
#[serde(tag = "type", rename_all = "kebab-case")]
pub enum ComponentKind {
    /// Cylindrical shell.
    Cylinder,
    /// Spherical shell.
    Sphere,
    /// Hemispherical head.
    HemisphericalHead,
    /// Ellipsoidal head with ratio D/2h.
    EllipsoidalHead {
        /// D/2h.
        aspect_ratio: f64,
    },
    /// Torispherical head with inside crown and knuckle radii (new, uncorroded).
    TorisphericalHead {
        /// Inside crown radius L.
        crown_radius: Quantity,
        /// Inside knuckle radius r.
        knuckle_radius: Quantity,
        /// The named shape, if one was given.
        shape: Option<TorisphereShape>,
    },
    /// Conical section.
    ConicalSection {
        /// Diameter at the small end, on the same basis as the large end.
        small_diameter: Quantity,
        /// Half-apex angle.
        half_apex_angle: Quantity,
    },
}

impl ComponentKind {
    /// The case-file type name.
    pub fn type_name(&self) -> &'static str {
        match self {
            ComponentKind::Cylinder => "cylinder",
            ComponentKind::Sphere => "sphere",
            ComponentKind::HemisphericalHead => "hemispherical-head",
            ComponentKind::EllipsoidalHead { .. } => "ellipsoidal-head",
            ComponentKind::TorisphericalHead { .. } => "torispherical-head",
            ComponentKind::ConicalSection { .. } => "conical-section",
        }
    }
    /// Whether the component is a formed head (thinning and straight flange apply).
    pub fn is_formed_head(&self) -> bool {
        matches!(
            self,
            ComponentKind::HemisphericalHead
                | ComponentKind::EllipsoidalHead { .. }
                | ComponentKind::TorisphericalHead { .. }
        )
    }
}

/// Component type names accepted in case files.
pub const COMPONENT_TYPES: &[&str] =
    &["cylinder", "sphere", "ellipsoidal-head", "torispherical-head", "hemispherical-head", "conical-section"];

/// One input as written and as converted, for the component's inputs table.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct InputEcho {
    /// The case-file key.
    pub key: String,
    /// The value as written.
    pub given: String,
    /// The converted value.
    pub value: Quantity,
}

/// A validated pressure part.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Component {
    /// Unique id.
    pub id: String,
    /// Type and type-specific geometry.
    pub kind: ComponentKind,
    /// Material key.
    pub material: String,
    /// Diameter and its basis.
    pub diameter: Diameter,
    /// Nominal thickness, when given.
    pub nominal_thickness: Option<Quantity>,
    /// Joint efficiency E (given, or looked up from `joint`).
    pub joint_efficiency: f64,
    /// The joint description E was looked up from, when given that way.
    pub joint: Option<Joint>,
    /// Product form of the material.
    pub product_form: ProductForm,
    /// Stated mill under-tolerance, when given.
    pub mill_undertolerance: Option<Undertolerance>,
    /// The pipe size of a cylinder made from pipe, when its outside diameter matches one.
    pub pipe_size: Option<PipeSize>,
    /// Joint efficiency of circumferential joints (cylinders).
    pub circumferential_joint_efficiency: f64,
    /// Static liquid head at the lowest point (zero when none).
    pub liquid_head: Quantity,
    /// Length (cylinders, cones), when given.
    pub length: Option<Quantity>,
    /// Corrosion allowance.
    pub corrosion_allowance: Quantity,
    /// Thinning allowance for forming (formed heads).
    pub thinning_allowance: Quantity,
    /// Straight flange (formed heads).
    pub straight_flange: Quantity,
    /// Inputs as written and converted.
    pub inputs: Vec<InputEcho>,
}

/// Collects diagnostics while reading values.
struct Reader {
    errors: Vec<Diagnostic>,
}

fn span_of<T>(s: &Spanned<T>) -> Option<Range<usize>> {
    Some(s.span())
}

/// The edition as written when the rule set implements it; otherwise an
/// error naming the editions it does implement.
fn known_edition(edition: String, v: &Spanned<toml::Value>, rules: &str, editions: &[&str], r: &mut Reader) -> String {
    if !editions.is_empty() && !editions.contains(&edition.trim()) {
        r.err(
            Diagnostic::new(
                "document.edition",
                span_of(v),
                format!("edition `{edition}` is not implemented by the rule set `{rules}`"),
            )
            .expected(format!("one of: {}", editions.join(", ")))
            .hint("Knuckle computes with the rules of the editions it lists; use one of them or another tool"),
        );
    }
    edition.trim().to_string()
}

impl Reader {
    fn err(&mut self, d: Diagnostic) {
        self.errors.push(d);
    }

    fn quantity(&mut self, key: &str, v: &Value, kind: Kind) -> Option<Quantity> {
        let span = span_of(v);
        match v.get_ref() {
            Scalar::Text(t) => match parse_quantity(t, kind) {
                Ok(q) => Some(q),
                Err(e) => {
                    let (message, hint) = match &e {
                        QuantityError::WrongKind { unit } => {
                            (format!("`{key}` must be {}, but `{unit}` measures something else", kind.describe()), None)
                        }
                        QuantityError::NoUnit => (
                            format!("`{key}` has no unit"),
                            Some(format!("write the unit after the number, e.g. \"{}\"", example(kind))),
                        ),
                        QuantityError::UnknownUnit(u) => (format!("`{key}`: unknown unit `{u}`"), None),
                        QuantityError::NoNumber => (
                            format!("`{key}` does not start with a number"),
                            Some(format!("write e.g. \"{}\"", example(kind))),
                        ),
                        QuantityError::NotFinite => (format!("`{key}` is not a finite number"), None),
                    };
                    let mut d = Diagnostic::new(key, span, message).expected(kind.describe());
                    if let Some(h) = hint {
                        d = d.hint(h);
                    }
                    self.err(d);
                    None
                }
            },
            Scalar::Int(_) | Scalar::Float(_) if kind == Kind::Dimensionless => self.number(key, v),
            Scalar::Int(_) | Scalar::Float(_) => {
                self.err(
                    Diagnostic::new(key, span, format!("`{key}` is a bare number; a unit is required"))
                        .expected(format!("{} as a quoted string", kind.describe()))
                        .hint(format!("write it as \"{}\"", example(kind))),
                );
                None
            }
        }
    }

    fn number(&mut self, key: &str, v: &Value) -> Option<Quantity> {
        let x = match v.get_ref() {
            Scalar::Int(i) => *i as f64,
            Scalar::Float(f) => *f,
            Scalar::Text(t) => match t.trim().parse::<f64>() {
                Ok(x) => x,
                Err(_) => {
                    self.err(
                        Diagnostic::new(key, span_of(v), format!("`{key}` must be a plain number"))
                            .expected("a number such as 0.85"),
                    );
                    return None;
                }
            },
        };
        if !x.is_finite() {
            self.err(
                Diagnostic::new(key, span_of(v), format!("`{key}` is not a finite number")).expected("a finite number"),
            );
            return None;
        }
        Some(Quantity::new(x, Kind::Dimensionless))
    }

    /// A quantity that must be strictly positive.
    fn positive(&mut self, key: &str, v: &Value, kind: Kind) -> Option<Quantity> {
        let q = self.quantity(key, v, kind)?;
        if q.value <= 0.0 {
            self.err(
                Diagnostic::new(key, span_of(v), format!("`{key}` must be greater than zero"))
                    .expected(format!("{} greater than zero", kind.describe())),
            );
            return None;
        }
        Some(q)
    }

    /// A quantity that must be zero or more.
    fn non_negative(&mut self, key: &str, v: &Value, kind: Kind) -> Option<Quantity> {
        let q = self.quantity(key, v, kind)?;
        if q.value < 0.0 {
            self.err(
                Diagnostic::new(key, span_of(v), format!("`{key}` must not be negative"))
                    .expected(format!("{} of zero or more", kind.describe())),
            );
            return None;
        }
        Some(q)
    }

    fn required<'a, T>(
        &mut self,
        key: &str,
        v: &'a Option<T>,
        table_span: Option<Range<usize>>,
        what: &str,
    ) -> Option<&'a T> {
        if v.is_none() {
            self.err(
                Diagnostic::new(key, table_span, format!("missing required key `{key}`")).expected(what.to_string()),
            );
        }
        v.as_ref()
    }
}

fn example(kind: Kind) -> &'static str {
    match kind {
        Kind::Pressure | Kind::Stress => "1.0 MPa",
        Kind::Length => "12 mm",
        Kind::Temperature => "150 degC",
        Kind::Density => "1000 kg/m3",
        Kind::Angle => "20 deg",
        _ => "1.0",
    }
}

fn iso_date(key: &str, v: &Spanned<toml::Value>, r: &mut Reader) -> Option<String> {
    let text = match v.get_ref() {
        toml::Value::String(s) => s.clone(),
        toml::Value::Datetime(d) => d.to_string(),
        _ => {
            r.err(
                Diagnostic::new(key, span_of(v), format!("`{key}` must be a date")).expected("an ISO date YYYY-MM-DD"),
            );
            return None;
        }
    };
    if valid_iso_date(&text) {
        Some(text)
    } else {
        r.err(
            Diagnostic::new(key, span_of(v), format!("`{key}` is not a valid calendar date: `{text}`"))
                .expected("an ISO date YYYY-MM-DD, e.g. 2026-11-20"),
        );
        None
    }
}

/// True for a real calendar date written `YYYY-MM-DD`.
pub fn valid_iso_date(s: &str) -> bool {
    let b = s.as_bytes();
    // Digits everywhere but the two dashes: `parse` alone would take "+1".
    let shape = b.len() == 10
        && b.iter().enumerate().all(|(i, c)| if i == 4 || i == 7 { *c == b'-' } else { c.is_ascii_digit() });
    if !shape {
        return false;
    }
    let num = |r: Range<usize>| s.get(r).and_then(|t| t.parse::<u32>().ok());
    let (Some(y), Some(m), Some(d)) = (num(0..4), num(5..7), num(8..10)) else {
        return false;
    };
    let leap = (y % 4 == 0 && y % 100 != 0) || y % 400 == 0;
    let days = match m {
        1 | 3 | 5 | 7 | 8 | 10 | 12 => 31,
        4 | 6 | 9 | 11 => 30,
        2 if leap => 29,
        2 => 28,
        _ => return false,
    };
    (1..=days).contains(&d)
}

fn text_or_empty(v: &Option<Spanned<String>>) -> String {
    v.as_ref().map(|s| s.get_ref().trim().to_string()).unwrap_or_default()
}

impl Design {
    /// Parses and validates case-file text. `file` is the name used in messages.
    pub fn from_source(file: &str, source: &str) -> Result<Design, InputErrors> {
        let case = crate::case::parse_case(file, source)?;
        Design::from_case(&case).map_err(|errors| InputErrors {
            file: file.to_string(),
            source: source.to_string(),
            errors,
        })
    }

    /// Validates a parsed case file that names no library, returning every
    /// problem found.
    pub fn from_case(case: &CaseFile) -> Result<Design, Vec<Diagnostic>> {
        Design::from_case_with_libraries(case, &Libraries::new())
    }

    /// Validates a parsed case file with the libraries it names (parsed by
    /// the caller, keyed by the path as written), returning every problem found.
    pub fn from_case_with_libraries(case: &CaseFile, libraries: &Libraries) -> Result<Design, Vec<Diagnostic>> {
        let mut r = Reader { errors: Vec::new() };
        let doc = case.document.get_ref();
        let doc_span = span_of(&case.document);

        let number = r
            .required(
                "document.number",
                &doc.number,
                doc_span.clone(),
                "the document number, e.g. \"DEMO-V310-CALC-001\"",
            )
            .map(|s| s.get_ref().trim().to_string());
        if let (Some(n), Some(s)) = (&number, &doc.number) {
            if n.is_empty() || n.contains(['/', '\\']) || n.starts_with('.') {
                r.err(
                    Diagnostic::new(
                        "document.number",
                        span_of(s),
                        "`document.number` must be a non-empty name usable in file names",
                    )
                    .expected("letters, digits, `-`, `_` or `.`, without `/` or `\\`"),
                );
            }
        }
        let revision = r
            .required("document.revision", &doc.revision, doc_span.clone(), "the revision, e.g. \"B\"")
            .map(|s| s.get_ref().trim().to_string());
        if let (Some(n), Some(s)) = (&revision, &doc.revision) {
            if n.is_empty() || n.contains(['/', '\\']) {
                r.err(Diagnostic::new(
                    "document.revision",
                    span_of(s),
                    "`document.revision` must be a non-empty name usable in file names",
                ));
            }
        }
        let date = r
            .required("document.date", &doc.date, doc_span.clone(), "an ISO date YYYY-MM-DD")
            .cloned()
            .and_then(|d| iso_date("document.date", &d, &mut r));
        let rules = doc.rules.as_ref().map(|s| s.get_ref().clone()).unwrap_or_else(|| "asme-viii-1".to_string());
        if let Some(s) = &doc.rules {
            if !RULE_SETS.contains(&s.get_ref().as_str()) {
                r.err(
                    Diagnostic::new("document.rules", span_of(s), format!("unknown rule set `{}`", s.get_ref()))
                        .expected(format!("one of: {}", RULE_SETS.join(", "))),
                );
            }
        }
        let editions = crate::rules::rule_set(&rules).map(|set| set.editions()).unwrap_or(&[]);
        let edition = match &doc.edition {
            None => editions.last().map(|e| e.to_string()).unwrap_or_default(),
            Some(v) => match v.get_ref() {
                toml::Value::String(s) => known_edition(s.clone(), v, &rules, editions, &mut r),
                toml::Value::Integer(i) => known_edition(i.to_string(), v, &rules, editions, &mut r),
                _ => {
                    r.err(
                        Diagnostic::new(
                            "document.edition",
                            span_of(v),
                            "`document.edition` must be a year or an edition name",
                        )
                        .expected("e.g. \"2023\""),
                    );
                    String::new()
                }
            },
        };
        let units = match &doc.units {
            None => UnitSystem::Si,
            Some(s) => match s.get_ref().as_str() {
                "SI" | "si" => UnitSystem::Si,
                "US" | "us" => UnitSystem::Us,
                other => {
                    r.err(
                        Diagnostic::new("document.units", span_of(s), format!("unknown unit system `{other}`"))
                            .expected("\"SI\" (mm, MPa, degC, kg) or \"US\" (in, psi, degF, lb)"),
                    );
                    UnitSystem::Si
                }
            },
        };
        let mut history = Vec::new();
        for (i, h) in doc.history.iter().enumerate() {
            let h = h.get_ref();
            let key = format!("document.history[{i}].date");
            if let Some(d) = iso_date(&key, &h.date, &mut r) {
                history.push(Revision {
                    revision: h.revision.get_ref().clone(),
                    date: d,
                    note: text_or_empty(&h.note),
                });
            }
        }
        let sign_off = case
            .sign_off
            .as_ref()
            .map(|s| SignOff {
                prepared_by: text_or_empty(&s.prepared_by),
                checked_by: text_or_empty(&s.checked_by),
                approved_by: text_or_empty(&s.approved_by),
            })
            .unwrap_or_default();

        // Design conditions.
        let d = case.design.get_ref();
        let d_span = span_of(&case.design);
        let pressure = r
            .required(
                "design.internal_pressure",
                &d.internal_pressure,
                d_span.clone(),
                "the design pressure, e.g. \"1.0 MPa\"",
            )
            .and_then(|v| r.positive("design.internal_pressure", v, Kind::Pressure));
        let temperature = r
            .required("design.temperature", &d.temperature, d_span.clone(), "the design temperature, e.g. \"150 degC\"")
            .and_then(|v| r.quantity("design.temperature", v, Kind::Temperature));
        if let (Some(t), Some(v)) = (temperature, &d.temperature) {
            if t.value < -273.15 {
                r.err(Diagnostic::new("design.temperature", span_of(v), "`design.temperature` is below absolute zero"));
            }
        }
        let corrosion = match &d.corrosion_allowance {
            Some(v) => r.non_negative("design.corrosion_allowance", v, Kind::Length),
            None => Some(Quantity::mm(0.0)),
        };
        let liquid_density =
            d.liquid_density.as_ref().and_then(|v| r.positive("design.liquid_density", v, Kind::Density));
        let test_temperature = match &d.test_temperature {
            Some(v) => r.quantity("design.test_temperature", v, Kind::Temperature).map(|q| construction::Temperature {
                value: q,
                key: "design.test_temperature",
                span: span_of(v),
                written: v.get_ref().as_written(),
            }),
            None => Some(construction::Temperature {
                value: Quantity::new(DEFAULT_TEST_TEMPERATURE, Kind::Temperature),
                key: "design.test_temperature",
                span: None,
                written: "20 degC".to_string(),
            }),
        };
        let service = match &d.service {
            None => Service::NotStated,
            Some(s) => match Service::ALL.iter().find(|(n, _)| *n == s.get_ref().as_str()) {
                Some((_, service)) => *service,
                None => {
                    let names: Vec<&str> = Service::ALL.iter().map(|(n, _)| *n).collect();
                    r.err(
                        Diagnostic::new("design.service", span_of(s), format!("unknown service `{}`", s.get_ref()))
                            .expected(format!("one of: {}", names.join(", "))),
                    );
                    Service::NotStated
                }
            },
        };
        let code_values = match &d.code_values {
            None => None,
            Some(s) => {
                match s.get_ref().as_str() {
                    "SI" | "si" => Some(UnitSystem::Si),
                    "US" | "us" => Some(UnitSystem::Us),
                    other => {
                        r.err(
                        Diagnostic::new("design.code_values", span_of(s), format!("unknown code values `{other}`"))
                            .expected("\"SI\" or \"US\"")
                            .hint("the unit system of construction, whose values of the code apply (1.5 mm or 1/16 in)"),
                    );
                        None
                    }
                }
            }
        };
        let design_temperature = match (temperature, &d.temperature) {
            (Some(q), Some(v)) => Some(construction::Temperature {
                value: q,
                key: "design.temperature",
                span: span_of(v),
                written: v.get_ref().as_written(),
            }),
            _ => None,
        };

        // Materials.
        let mut materials = BTreeMap::new();
        for (key, m) in &case.materials {
            let Some(test_t) = &test_temperature else {
                break;
            };
            if let Some(mat) =
                construction::read_material(&mut r, key, m, libraries, design_temperature.as_ref(), test_t)
            {
                materials.insert(key.clone(), mat);
            }
        }
        let stock = construction::read_stock(&mut r, case, code_values);

        // Components.
        if case.component.is_empty() {
            r.err(
                Diagnostic::new("component", None, "the case has no components")
                    .expected("at least one [[component]] table")
                    .hint("`knuckle new` writes a starter file with a shell and two heads"),
            );
        }
        let mut components = Vec::new();
        let mut seen: BTreeMap<String, ()> = BTreeMap::new();
        for (i, c) in case.component.iter().enumerate() {
            let span = span_of(c);
            if let Some(comp) = read_component(
                &mut r,
                i,
                c.get_ref(),
                span,
                &case.materials,
                &materials,
                corrosion,
                liquid_density.is_some(),
            ) {
                if seen.insert(comp.id.clone(), ()).is_some() {
                    let s = c.get_ref().id.as_ref().map(span_of).unwrap_or(None);
                    r.err(
                        Diagnostic::new(
                            format!("component[{i}].id"),
                            s,
                            format!("duplicate component id `{}`", comp.id),
                        )
                        .hint("every component needs its own id"),
                    );
                } else {
                    components.push(comp);
                }
            }
        }

        if !r.errors.is_empty() {
            r.errors.sort_by_key(|d| d.span.as_ref().map(|s| s.start).unwrap_or(usize::MAX));
            return Err(r.errors);
        }
        // Every Option below is Some when no error was recorded.
        let (
            Some(number),
            Some(revision),
            Some(date),
            Some(pressure),
            Some(temperature),
            Some(corrosion),
            Some(test_temperature),
        ) = (number, revision, date, pressure, temperature, corrosion, test_temperature)
        else {
            return Err(vec![Diagnostic::new("", None, "incomplete case file")]);
        };
        Ok(Design {
            document: Document {
                number,
                title: text_or_empty(&doc.title),
                project: text_or_empty(&doc.project),
                revision,
                date,
                rules,
                edition,
                history,
            },
            sign_off,
            conditions: Conditions {
                pressure,
                temperature,
                corrosion_allowance: corrosion,
                liquid_density,
                test_temperature: test_temperature.value,
                service,
                code_values,
            },
            materials,
            components,
            units,
            stock,
        })
    }

    /// The material of a component (validated to exist).
    pub fn material(&self, c: &Component) -> Option<&Material> {
        self.materials.get(&c.material)
    }
}

/// Which optional keys each component type accepts.
fn allowed_keys(kind: &str) -> &'static [&'static str] {
    match kind {
        "cylinder" => &["length", "circumferential_joint_efficiency"],
        "sphere" => &[],
        "hemispherical-head" => &["straight_flange", "thinning_allowance"],
        "ellipsoidal-head" => &["aspect_ratio", "straight_flange", "thinning_allowance"],
        "torispherical-head" => &["crown_radius", "knuckle_radius", "shape", "straight_flange", "thinning_allowance"],
        "conical-section" => &["small_inside_diameter", "small_outside_diameter", "half_apex_angle", "length"],
        _ => &[],
    }
}

fn type_specific_keys(c: &RawComponent) -> Vec<(&'static str, Option<Range<usize>>)> {
    let mut v = Vec::new();
    let mut add = |k: &'static str, s: Option<Range<usize>>| {
        if s.is_some() {
            v.push((k, s))
        }
    };
    add("length", c.length.as_ref().map(|x| x.span()));
    add("circumferential_joint_efficiency", c.circumferential_joint_efficiency.as_ref().map(|x| x.span()));
    add("straight_flange", c.straight_flange.as_ref().map(|x| x.span()));
    add("thinning_allowance", c.thinning_allowance.as_ref().map(|x| x.span()));
    add("aspect_ratio", c.aspect_ratio.as_ref().map(|x| x.span()));
    add("crown_radius", c.crown_radius.as_ref().map(|x| x.span()));
    add("knuckle_radius", c.knuckle_radius.as_ref().map(|x| x.span()));
    add("shape", c.shape.as_ref().map(|x| x.span()));
    add("small_inside_diameter", c.small_inside_diameter.as_ref().map(|x| x.span()));
    add("small_outside_diameter", c.small_outside_diameter.as_ref().map(|x| x.span()));
    add("half_apex_angle", c.half_apex_angle.as_ref().map(|x| x.span()));
    v
}

#[allow(clippy::too_many_arguments)]
fn read_component(
    r: &mut Reader,
    i: usize,
    c: &RawComponent,
    span: Option<Range<usize>>,
    materials: &BTreeMap<String, Spanned<crate::case::RawMaterial>>,
    validated: &BTreeMap<String, Material>,
    default_ca: Option<Quantity>,
    have_density: bool,
) -> Option<Component> {
    let k = |f: &str| format!("component[{i}].{f}");
    let before = r.errors.len();
    let mut inputs = Vec::new();
    let mut echo = |key: &str, v: &Value, q: Quantity| {
        inputs.push(InputEcho { key: key.to_string(), given: v.get_ref().as_written(), value: q })
    };

    let id = r
        .required(&k("id"), &c.id, span.clone(), "a unique id such as \"shell\"")
        .map(|s| s.get_ref().trim().to_string());
    if let (Some(idv), Some(s)) = (&id, &c.id) {
        let ok = !idv.is_empty() && idv.chars().all(|ch| ch.is_alphanumeric() || "-_.".contains(ch));
        if !ok {
            r.err(
                Diagnostic::new(k("id"), Some(s.span()), format!("component id `{idv}` is not usable"))
                    .expected("letters, digits, `-`, `_` or `.`"),
            );
        }
    }
    let kind_name = r
        .required(&k("type"), &c.kind, span.clone(), &format!("one of: {}", COMPONENT_TYPES.join(", ")))
        .map(|s| s.get_ref().clone());
    if let (Some(t), Some(s)) = (&kind_name, &c.kind) {
        if !COMPONENT_TYPES.contains(&t.as_str()) {
            r.err(
                Diagnostic::new(k("type"), Some(s.span()), format!("unknown component type `{t}`"))
                    .expected(format!("one of: {}", COMPONENT_TYPES.join(", "))),
            );
            return None;
        }
    }
    let kind_name = kind_name?;
    for (key, s) in type_specific_keys(c) {
        if !allowed_keys(&kind_name).contains(&key) {
            r.err(
                Diagnostic::new(k(key), s, format!("`{key}` does not apply to a {kind_name}"))
                    .hint("remove the key, or check the component's `type`"),
            );
        }
    }

    let material = r
        .required(&k("material"), &c.material, span.clone(), "a key of a [materials.<key>] table")
        .map(|s| s.get_ref().clone());
    if let (Some(m), Some(s)) = (&material, &c.material) {
        if !materials.contains_key(m) {
            let known: Vec<&str> = materials.keys().map(String::as_str).collect();
            r.err(Diagnostic::new(k("material"), Some(s.span()), format!("unknown material `{m}`")).expected(
                if known.is_empty() {
                    "a [materials.<key>] table".to_string()
                } else {
                    format!("one of: {}", known.join(", "))
                },
            ));
        }
    }

    let diameter = match (&c.inside_diameter, &c.outside_diameter) {
        (Some(v), None) => r.positive(&k("inside_diameter"), v, Kind::Length).map(|q| {
            echo("inside_diameter", v, q);
            Diameter::Inside(q)
        }),
        (None, Some(v)) => r.positive(&k("outside_diameter"), v, Kind::Length).map(|q| {
            echo("outside_diameter", v, q);
            Diameter::Outside(q)
        }),
        (Some(_), Some(v)) => {
            r.err(
                Diagnostic::new(
                    k("outside_diameter"),
                    Some(v.span()),
                    "both `inside_diameter` and `outside_diameter` are given",
                )
                .expected("exactly one of the two")
                .hint("remove one; the other is derived from the thickness"),
            );
            None
        }
        (None, None) => {
            r.err(
                Diagnostic::new(
                    k("inside_diameter"),
                    span.clone(),
                    "neither `inside_diameter` nor `outside_diameter` is given",
                )
                .expected("exactly one of the two"),
            );
            None
        }
    };

    let nominal = c.nominal_thickness.as_ref().and_then(|v| {
        let q = r.positive(&k("nominal_thickness"), v, Kind::Length);
        if let Some(q) = q {
            echo("nominal_thickness", v, q);
        }
        q
    });
    if let (Some(Diameter::Outside(d)), Some(t), Some(v)) = (diameter, nominal, c.nominal_thickness.as_ref()) {
        // A wall as thick as the outside radius leaves no inside: the
        // formulas would give numbers for a vessel that cannot exist.
        if 2.0 * t.value >= d.value {
            r.err(
                Diagnostic::new(
                    k("nominal_thickness"),
                    Some(v.span()),
                    "the nominal thickness is too large: it reaches the outside radius, so there is no inside",
                )
                .expected("a nominal thickness smaller than half of `outside_diameter`")
                .hint("check `nominal_thickness` and `outside_diameter` (and their units)"),
            );
        }
    }
    let ca = match &c.corrosion_allowance {
        Some(v) => {
            r.non_negative(&k("corrosion_allowance"), v, Kind::Length).inspect(|q| echo("corrosion_allowance", v, *q))
        }
        None => default_ca,
    };
    let thinning = match &c.thinning_allowance {
        Some(v) => {
            r.non_negative(&k("thinning_allowance"), v, Kind::Length).inspect(|q| echo("thinning_allowance", v, *q))
        }
        None => Some(Quantity::mm(0.0)),
    };
    if let (Some(t), Some(ca), Some(th)) = (nominal, ca, thinning) {
        if ca.value + th.value >= t.value {
            let s = c.corrosion_allowance.as_ref().map(|v| v.span()).or(c.nominal_thickness.as_ref().map(|v| v.span()));
            r.err(
                Diagnostic::new(
                    k("corrosion_allowance"),
                    s,
                    "the corrosion allowance (plus thinning allowance) is at or above the nominal thickness",
                )
                .expected("a corrosion allowance smaller than the nominal thickness")
                .hint("check `nominal_thickness` and `corrosion_allowance`"),
            );
        }
    }

    let efficiency = |r: &mut Reader, key: &str, v: &Value| -> Option<f64> {
        let q = r.number(key, v)?;
        if q.value <= 0.0 || q.value > 1.0 {
            r.err(
                Diagnostic::new(key, Some(v.span()), format!("joint efficiency {} is outside (0, 1]", q.value))
                    .expected("a number greater than 0 and at most 1, e.g. 0.85")
                    .hint("UW-12 gives 1.00, 0.85 or 0.70 for a type 1 butt joint"),
            );
            return None;
        }
        Some(q.value)
    };
    let (e, joint) = match construction::read_joint(r, i, c, span.clone()) {
        Some(construction::JointInput::Given(v)) => (
            efficiency(r, &k("joint_efficiency"), v)
                .inspect(|e| echo("joint_efficiency", v, Quantity::new(*e, Kind::Dimensionless))),
            None,
        ),
        Some(construction::JointInput::Described(j, e)) => (Some(e), Some(j)),
        None => (None, None),
    };
    let e_circ = match &c.circumferential_joint_efficiency {
        Some(v) => efficiency(r, &k("circumferential_joint_efficiency"), v)
            .inspect(|e| echo("circumferential_joint_efficiency", v, Quantity::new(*e, Kind::Dimensionless))),
        None => e,
    };
    let head = match &c.liquid_head {
        Some(v) => {
            let q = r.non_negative(&k("liquid_head"), v, Kind::Length);
            if let Some(q) = q {
                echo("liquid_head", v, q);
                if q.value > 0.0 && !have_density {
                    r.err(
                        Diagnostic::new(
                            k("liquid_head"),
                            Some(v.span()),
                            "a liquid head is given but `design.liquid_density` is not",
                        )
                        .hint("add `liquid_density = \"1000 kg/m3\"` under [design]"),
                    );
                }
            }
            q
        }
        None => Some(Quantity::mm(0.0)),
    };
    let length =
        c.length.as_ref().and_then(|v| r.positive(&k("length"), v, Kind::Length).inspect(|q| echo("length", v, *q)));
    let flange = match &c.straight_flange {
        Some(v) => r.non_negative(&k("straight_flange"), v, Kind::Length).inspect(|q| echo("straight_flange", v, *q)),
        None => Some(Quantity::mm(0.0)),
    };

    let product_form = construction::product_form_of(material.as_ref(), validated);
    let undertolerance = construction::read_undertolerance(r, i, c, product_form);
    let pipe_size =
        construction::read_pipe_size(r, i, c, span.clone(), product_form, &kind_name, diameter, nominal.is_some());

    let kind = match kind_name.as_str() {
        "cylinder" => Some(ComponentKind::Cylinder),
        "sphere" => Some(ComponentKind::Sphere),
        "hemispherical-head" => Some(ComponentKind::HemisphericalHead),
        "ellipsoidal-head" => match &c.aspect_ratio {
            None => Some(ComponentKind::EllipsoidalHead { aspect_ratio: 2.0 }),
            Some(v) => r.number(&k("aspect_ratio"), v).and_then(|q| {
                echo("aspect_ratio", v, q);
                if (1.0..=3.0).contains(&q.value) {
                    Some(ComponentKind::EllipsoidalHead { aspect_ratio: q.value })
                } else {
                    r.err(
                        Diagnostic::new(
                            k("aspect_ratio"),
                            Some(v.span()),
                            format!("aspect ratio D/2h = {} is outside 1.0 to 3.0", q.value),
                        )
                        .expected("a ratio D/2h from 1.0 (hemisphere) to 3.0 (Appendix 1, 1-4 (c))"),
                    );
                    None
                }
            }),
        },
        "torispherical-head" => torisphere(r, i, c, span.clone(), diameter, nominal, &mut echo),
        "conical-section" => cone(r, i, c, span.clone(), diameter, length, &mut echo),
        _ => None,
    };

    if r.errors.len() > before {
        return None;
    }
    Some(Component {
        id: id?,
        kind: kind?,
        material: material?,
        diameter: diameter?,
        nominal_thickness: nominal,
        joint_efficiency: e?,
        joint,
        product_form,
        mill_undertolerance: undertolerance?,
        pipe_size: pipe_size?,
        circumferential_joint_efficiency: e_circ?,
        liquid_head: head?,
        length,
        corrosion_allowance: ca?,
        thinning_allowance: thinning?,
        straight_flange: flange?,
        inputs,
    })
}

fn torisphere(
    r: &mut Reader,
    i: usize,
    c: &RawComponent,
    span: Option<Range<usize>>,
    diameter: Option<Diameter>,
    nominal: Option<Quantity>,
    echo: &mut dyn FnMut(&str, &Value, Quantity),
) -> Option<ComponentKind> {
    let k = |f: &str| format!("component[{i}].{f}");
    let diameter = diameter?;
    // The skirt outside diameter, when it is known without a thickness design.
    let (inside, outside) = match diameter {
        Diameter::Inside(d) => (Some(d.value), nominal.map(|t| d.value + 2.0 * t.value)),
        Diameter::Outside(d) => (nominal.map(|t| d.value - 2.0 * t.value), Some(d.value)),
    };
    let (crown, knuckle, shape) = match (&c.shape, &c.crown_radius, &c.knuckle_radius) {
        (Some(s), None, None) => {
            let Some((_, shape)) = TorisphereShape::ALL.iter().find(|(n, _)| n == s.get_ref()) else {
                let names: Vec<&str> = TorisphereShape::ALL.iter().map(|(n, _)| *n).collect();
                r.err(
                    Diagnostic::new(
                        k("shape"),
                        Some(s.span()),
                        format!("unknown torispherical shape `{}`", s.get_ref()),
                    )
                    .expected(format!("one of: {}", names.join(", ")))
                    .hint("or give `crown_radius` and `knuckle_radius`"),
                );
                return None;
            };
            let (fl, fr, on_outside) = shape.ratios();
            let base = if on_outside { outside } else { inside };
            let Some(base) = base else {
                r.err(
                    Diagnostic::new(
                        k("shape"),
                        Some(s.span()),
                        format!(
                            "the `{}` shape is defined on the {} diameter, which needs `nominal_thickness` here",
                            s.get_ref(),
                            if on_outside { "outside" } else { "inside" }
                        ),
                    )
                    .hint("give `nominal_thickness`, or give the diameter on that basis"),
                );
                return None;
            };
            (Quantity::new(fl * base, Kind::Length), Quantity::new(fr * base, Kind::Length), Some(*shape))
        }
        (None, Some(l), Some(kr)) => {
            let l_q = r.positive(&k("crown_radius"), l, Kind::Length);
            let r_q = r.positive(&k("knuckle_radius"), kr, Kind::Length);
            let (l_q, r_q) = (l_q?, r_q?);
            echo("crown_radius", l, l_q);
            echo("knuckle_radius", kr, r_q);
            if r_q.value >= l_q.value {
                r.err(
                    Diagnostic::new(
                        k("knuckle_radius"),
                        Some(kr.span()),
                        "the knuckle radius is not smaller than the crown radius",
                    )
                    .expected("knuckle_radius < crown_radius"),
                );
                return None;
            }
            if let Some(od) = outside {
                if l_q.value > od * (1.0 + 1e-9) {
                    r.err(
                        Diagnostic::new(
                            k("crown_radius"),
                            Some(l.span()),
                            "the crown radius is larger than the skirt outside diameter",
                        )
                        .expected("crown_radius ≤ outside diameter of the skirt (UG-32)"),
                    );
                    return None;
                }
            }
            let d_in = inside.unwrap_or(diameter.value().value);
            if 2.0 * r_q.value >= d_in {
                r.err(
                    Diagnostic::new(
                        k("knuckle_radius"),
                        Some(kr.span()),
                        "the knuckle radius is too large for the diameter",
                    )
                    .expected("knuckle_radius < D/2"),
                );
                return None;
            }
            // A torisphere closes only when the crown arc reaches the axis: L − r ≥ D/2 − r.
            if l_q.value < d_in / 2.0 {
                r.err(
                    Diagnostic::new(
                        k("crown_radius"),
                        Some(l.span()),
                        "the crown radius is smaller than half the diameter; no torisphere has this shape",
                    )
                    .expected("crown_radius ≥ D/2"),
                );
                return None;
            }
            (l_q, r_q, None)
        }
        (None, None, None) => {
            r.err(
                Diagnostic::new(
                    k("shape"),
                    span,
                    "a torispherical head needs `shape` or both `crown_radius` and `knuckle_radius`",
                )
                .hint("e.g. shape = \"2:1-equivalent\""),
            );
            return None;
        }
        (Some(s), _, _) => {
            r.err(Diagnostic::new(
                k("shape"),
                Some(s.span()),
                "give either `shape` or `crown_radius` with `knuckle_radius`, not both",
            ));
            return None;
        }
        (None, l, kr) => {
            let s = l.as_ref().map(|v| v.span()).or(kr.as_ref().map(|v| v.span()));
            r.err(Diagnostic::new(
                k(if l.is_none() { "crown_radius" } else { "knuckle_radius" }),
                s,
                "`crown_radius` and `knuckle_radius` must be given together",
            ));
            return None;
        }
    };
    Some(ComponentKind::TorisphericalHead { crown_radius: crown, knuckle_radius: knuckle, shape })
}

fn cone(
    r: &mut Reader,
    i: usize,
    c: &RawComponent,
    span: Option<Range<usize>>,
    diameter: Option<Diameter>,
    length: Option<Quantity>,
    echo: &mut dyn FnMut(&str, &Value, Quantity),
) -> Option<ComponentKind> {
    let k = |f: &str| format!("component[{i}].{f}");
    let diameter = diameter?;
    let (small_key, small, wrong) = match diameter {
        Diameter::Inside(_) => ("small_inside_diameter", &c.small_inside_diameter, &c.small_outside_diameter),
        Diameter::Outside(_) => ("small_outside_diameter", &c.small_outside_diameter, &c.small_inside_diameter),
    };
    if let Some(w) = wrong {
        r.err(
            Diagnostic::new(
                k("small_diameter"),
                Some(w.span()),
                "the small-end diameter must be on the same basis (inside or outside) as the large end",
            )
            .expected(format!("`{small_key}`")),
        );
        return None;
    }
    let Some(sv) = small else {
        r.err(
            Diagnostic::new(k(small_key), span, format!("a conical section needs `{small_key}`"))
                .expected("the diameter at the small end"),
        );
        return None;
    };
    let small_q = r.positive(&k(small_key), sv, Kind::Length)?;
    echo(small_key, sv, small_q);
    let large = diameter.value();
    if small_q.value >= large.value {
        r.err(
            Diagnostic::new(
                k(small_key),
                Some(sv.span()),
                "the small-end diameter is not smaller than the large-end diameter",
            )
            .expected("a small end smaller than `inside_diameter` / `outside_diameter` (the large end)"),
        );
        return None;
    }
    let angle = match (&c.half_apex_angle, length) {
        (Some(v), None) => {
            let a = r.quantity(&k("half_apex_angle"), v, Kind::Angle)?;
            if a.value <= 0.0 || a.value >= std::f64::consts::FRAC_PI_2 {
                r.err(
                    Diagnostic::new(
                        k("half_apex_angle"),
                        Some(v.span()),
                        "the half-apex angle must lie between 0° and 90°",
                    )
                    .expected("an angle such as \"20 deg\""),
                );
                return None;
            }
            echo("half_apex_angle", v, a);
            a
        }
        (None, Some(l)) => Quantity::new(((large.value - small_q.value) / (2.0 * l.value)).atan(), Kind::Angle),
        (Some(v), Some(_)) => {
            r.err(Diagnostic::new(
                k("half_apex_angle"),
                Some(v.span()),
                "give either `half_apex_angle` or `length` for a cone, not both",
            ));
            return None;
        }
        (None, None) => {
            r.err(
                Diagnostic::new(k("half_apex_angle"), span, "a conical section needs `half_apex_angle` or `length`")
                    .hint("e.g. half_apex_angle = \"20 deg\""),
            );
            return None;
        }
    };
    Some(ComponentKind::ConicalSection { small_diameter: small_q, half_apex_angle: angle })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn dates() {
        assert!(valid_iso_date("2024-02-29"));
        assert!(!valid_iso_date("2023-02-29"));
        assert!(!valid_iso_date("2023-13-01"));
        assert!(!valid_iso_date("2023-1-01"));
        assert!(!valid_iso_date("+023-01-01"));
        // Regression: a sign in the month or day passed the number parser.
        assert!(!valid_iso_date("2026-+1-01"));
        assert!(!valid_iso_date("2026-01-+1"));
    }
}
