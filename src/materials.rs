//! Materials libraries: user-owned TOML files that hold, per material, the
//! specification and grade, product form, strengths, density and a table of
//! maximum allowable stress against temperature.
//!
//! This module only reads and holds library text; it never touches the file
//! system. [`crate::pipeline`] loads the files through a
//! [`crate::pipeline::SourceLoader`] and [`crate::model`] resolves a case's
//! `[materials.<key>]` against the parsed [`Library`].
//!
//! A library file looks like this (every quantity a string with its unit,
//! table rows as plain numbers in the units named beside the table):
//!
//! ```toml
//! [library]
//! title = "Plant materials"
//! caution = "values to be verified before use"
//!
//! [material.sa-516-70]
//! specification = "SA-516"
//! grade = "Grade 70"
//! product_form = "plate"
//! tensile_strength = "70 ksi"
//! yield_strength = "38 ksi"
//! density = "7850 kg/m3"
//!
//! [material.sa-516-70.allowable_stress]
//! temperature_unit = "degF"
//! stress_unit = "ksi"
//! source = "where the values were taken from"
//! rows = [[-20, 20.0], [650, 18.8], [700, 18.1]]
//! ```

use crate::calc::{CalcError, Formula};
use crate::diag::{Diagnostic, InputErrors};
use crate::expr::Env;
use crate::units::{format_number, parse_quantity, Kind, Quantity};
use serde::{Deserialize, Serialize};
use std::collections::BTreeMap;
use std::ops::Range;
use toml::Spanned;

/// Linear interpolation between the two table rows that bracket the
/// temperature: the usual practice for the stress tables of Section II,
/// Part D, which permit straight-line interpolation between tabulated
/// temperatures (from memory of the tables' notes). Defined here, beside the
/// tables, and listed with the rule set's formulas.
pub const STRESS_INTERPOLATION: Formula = Formula {
    id: "stress-interpolation",
    symbol: "S",
    clause: "UG-23(a); Section II, Part D (linear interpolation)",
    text: "S_1 + (S_2 - S_1)*(T - T_1)/(T_2 - T_1)",
    result: Kind::Stress,
};

/// The example library shipped with Knuckle (also built into the binary for
/// `knuckle materials` without `--library`).
pub const EXAMPLE_LIBRARY: &str = include_str!("../materials/example-library.toml");

/// The name the built-in example library is shown under.
pub const EXAMPLE_LIBRARY_NAME: &str = "materials/example-library.toml";

/// What a material is made as; it decides the thickness list and the mill
/// under-tolerance rule used when a thickness is selected.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum ProductForm {
    /// Plate: UG-16(c) under-tolerance, plate thickness list.
    Plate,
    /// Pipe: UG-16(d) under-tolerance, pipe schedules for cylinders.
    Pipe,
    /// Forging: machined to size, plate thickness list, no under-tolerance.
    Forging,
}

impl ProductForm {
    /// Every form with its file name.
    pub const ALL: [(&'static str, ProductForm); 3] =
        [("plate", ProductForm::Plate), ("pipe", ProductForm::Pipe), ("forging", ProductForm::Forging)];

    /// The name used in files.
    pub fn name(self) -> &'static str {
        match self {
            ProductForm::Plate => "plate",
            ProductForm::Pipe => "pipe",
            ProductForm::Forging => "forging",
        }
    }

    /// The form with this file name.
    pub fn from_name(s: &str) -> Option<ProductForm> {
        Self::ALL.iter().find(|(n, _)| *n == s).map(|(_, f)| *f)
    }

    /// The accepted names, for messages.
    pub fn names() -> String {
        Self::ALL.iter().map(|(n, _)| format!("\"{n}\"")).collect::<Vec<_>>().join(", ")
    }
}

/// One row of an allowable-stress table (SI values inside: °C and Pa).
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct StressRow {
    /// Tabulated temperature.
    pub temperature: Quantity,
    /// Maximum allowable stress at that temperature.
    pub stress: Quantity,
}

/// A table of maximum allowable stress against temperature, with the units
/// its columns were written in (kept for showing the table as written).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct StressTable {
    /// Unit of the temperature column as written (`degF`).
    pub temperature_unit: String,
    /// Unit of the stress column as written (`ksi`).
    pub stress_unit: String,
    /// Where the values come from, in words.
    pub source: String,
    /// Rows in strictly increasing temperature.
    pub rows: Vec<StressRow>,
}

/// The two rows that bracket a temperature (the same row twice when the
/// temperature is tabulated).
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Bracket {
    /// The temperature looked up.
    pub temperature: Quantity,
    /// The row at or below the temperature.
    pub lower: StressRow,
    /// The row at or above the temperature.
    pub upper: StressRow,
}

impl Bracket {
    /// True when the temperature is a tabulated one and no interpolation is needed.
    pub fn exact(&self) -> bool {
        self.lower.temperature.value == self.upper.temperature.value
    }

    /// The allowable stress at the temperature, from [`STRESS_INTERPOLATION`]
    /// (the tabulated value itself when the temperature is tabulated).
    pub fn stress(&self) -> Result<Quantity, CalcError> {
        if self.exact() {
            return Ok(self.lower.stress);
        }
        let mut env = Env::new();
        env.insert("T".into(), self.temperature);
        env.insert("T_1".into(), self.lower.temperature);
        env.insert("T_2".into(), self.upper.temperature);
        env.insert("S_1".into(), self.lower.stress);
        env.insert("S_2".into(), self.upper.stress);
        let v = STRESS_INTERPOLATION
            .expr()?
            .eval(&env)
            .map_err(|e| CalcError::Formula { id: STRESS_INTERPOLATION.id, message: e.0 })?;
        Ok(Quantity::new(v.value, Kind::Stress))
    }
}

/// Factor and offset of a unit: SI value = written × factor + offset.
fn unit_scale(unit: &str, kind: Kind) -> Option<(f64, f64)> {
    let zero = parse_quantity(&format!("0 {unit}"), kind).ok()?;
    let one = parse_quantity(&format!("1 {unit}"), kind).ok()?;
    Some((one.value - zero.value, zero.value))
}

impl StressTable {
    /// The lowest and highest tabulated temperatures.
    pub fn range(&self) -> Option<(Quantity, Quantity)> {
        Some((self.rows.first()?.temperature, self.rows.last()?.temperature))
    }

    /// The bracketing rows, or `None` when the temperature lies outside the
    /// table: Knuckle never extrapolates.
    pub fn bracket(&self, t: Quantity) -> Option<Bracket> {
        // A hair of tolerance so that 100 °F written in a case file finds the
        // 100 °F row after the round trip through °C.
        let eps = 1e-9;
        let (lo, hi) = self.range()?;
        if t.value < lo.value - eps || t.value > hi.value + eps {
            return None;
        }
        if let Some(row) = self.rows.iter().find(|r| (r.temperature.value - t.value).abs() <= eps) {
            return Some(Bracket { temperature: t, lower: *row, upper: *row });
        }
        let i = self.rows.iter().position(|r| r.temperature.value > t.value)?;
        Some(Bracket { temperature: t, lower: *self.rows.get(i.checked_sub(1)?)?, upper: self.rows[i] })
    }

    /// A temperature in the table's own unit (`650 degF`).
    pub fn show_temperature(&self, q: Quantity) -> String {
        show_in(q, &self.temperature_unit)
    }

    /// A stress in the table's own unit (`18.8 ksi`).
    pub fn show_stress(&self, q: Quantity) -> String {
        show_in(q, &self.stress_unit)
    }

    /// The range in the table's own unit (`-20 degF to 800 degF`).
    pub fn range_text(&self) -> String {
        match self.range() {
            Some((lo, hi)) => format!("{} to {}", self.show_temperature(lo), self.show_temperature(hi)),
            None => "no rows".to_string(),
        }
    }
}

/// A value converted to a unit named as in files.
fn show_in(q: Quantity, unit: &str) -> String {
    match unit_scale(unit, q.kind) {
        Some((f, o)) => format!("{} {unit}", format_number((q.value - o) / f, 6)),
        None => format!("{}", q.value),
    }
}

/// One material of a library.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct LibraryMaterial {
    /// Key in the library.
    pub key: String,
    /// Specification (`SA-516`).
    pub specification: String,
    /// Grade, type or class as written (`Grade 70`).
    pub grade: String,
    /// Product form.
    pub product_form: ProductForm,
    /// Specified minimum tensile strength.
    pub tensile_strength: Quantity,
    /// Specified minimum yield strength.
    pub yield_strength: Quantity,
    /// Density of the metal.
    pub density: Quantity,
    /// Free note (empty when none).
    pub note: String,
    /// Part of Subsection C the material belongs to (`UCS`, ...), when given.
    pub part: Option<String>,
    /// Maximum allowable stress against temperature.
    pub table: StressTable,
}

/// The parts of Subsection C of Section VIII Division 1 that a material may
/// be declared under: carbon and low-alloy steels (UCS), nonferrous (UNF),
/// high alloy (UHA), cast iron (UCI), clad and lined (UCL), ductile iron
/// (UCD), heat-treated ferritic steels (UHT) and low-temperature materials (ULT).
pub const MATERIAL_PARTS: &[&str] = &["UCS", "UNF", "UHA", "UCI", "UCL", "UCD", "UHT", "ULT"];

impl LibraryMaterial {
    /// Specification and grade as one name (`SA-516 Grade 70`).
    pub fn name(&self) -> String {
        format!("{} {}", self.specification, self.grade)
    }
}

/// A parsed and validated library file.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Library {
    /// The file name as shown in messages.
    pub file: String,
    /// Title (empty when none).
    pub title: String,
    /// A caution every package using this library must carry, when the library states one.
    pub caution: Option<String>,
    /// Materials by key.
    pub materials: BTreeMap<String, LibraryMaterial>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawLibrary {
    library: Option<RawLibraryInfo>,
    #[serde(default)]
    material: BTreeMap<String, Spanned<RawLibraryMaterial>>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawLibraryInfo {
    title: Option<String>,
    caution: Option<String>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawLibraryMaterial {
    specification: Option<Spanned<String>>,
    grade: Option<Spanned<String>>,
    product_form: Option<Spanned<String>>,
    tensile_strength: Option<Spanned<String>>,
    yield_strength: Option<Spanned<String>>,
    density: Option<Spanned<String>>,
    note: Option<String>,
    part: Option<Spanned<String>>,
    allowable_stress: Option<Spanned<RawStressTable>>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawStressTable {
    temperature_unit: Option<Spanned<String>>,
    stress_unit: Option<Spanned<String>>,
    source: Option<Spanned<String>>,
    #[serde(default)]
    rows: Vec<Spanned<Vec<f64>>>,
}

/// The part name in its canonical spelling, when it is one of [`MATERIAL_PARTS`].
pub fn part_name(text: &str) -> Option<String> {
    let upper = text.trim().to_ascii_uppercase();
    MATERIAL_PARTS.iter().find(|p| **p == upper).map(|p| p.to_string())
}

/// The diagnostic for a part that is not one of [`MATERIAL_PARTS`].
pub fn unknown_part(key: String, p: &Spanned<String>) -> Diagnostic {
    Diagnostic::new(key, Some(p.span()), format!("unknown material part `{}`", p.get_ref()))
        .expected(format!("one of: {}", MATERIAL_PARTS.join(", ")))
        .hint("the part of Subsection C the material is listed under, e.g. \"UCS\" for carbon and low-alloy steels")
}

fn missing(errors: &mut Vec<Diagnostic>, key: String, span: Range<usize>, what: &str) {
    errors.push(
        Diagnostic::new(key.clone(), Some(span), format!("missing required key `{key}`")).expected(what.to_string()),
    );
}

fn library_quantity(
    errors: &mut Vec<Diagnostic>,
    key: String,
    v: &Option<Spanned<String>>,
    table: Range<usize>,
    kind: Kind,
    example: &str,
) -> Option<Quantity> {
    let Some(v) = v else {
        missing(errors, key, table, &format!("{}, e.g. \"{example}\"", kind.describe()));
        return None;
    };
    match parse_quantity(v.get_ref(), kind) {
        Ok(q) if q.value > 0.0 => Some(q),
        Ok(_) => {
            errors.push(
                Diagnostic::new(key.clone(), Some(v.span()), format!("`{key}` must be greater than zero"))
                    .expected(format!("{} greater than zero", kind.describe())),
            );
            None
        }
        Err(e) => {
            errors.push(
                Diagnostic::new(key.clone(), Some(v.span()), format!("`{key}`: {e}"))
                    .expected(format!("{}, e.g. \"{example}\"", kind.describe())),
            );
            None
        }
    }
}

/// Parses and validates a library file. `file` names the file in messages;
/// every error points at its place in the library file itself.
pub fn parse_library(file: &str, source: &str) -> Result<Library, InputErrors> {
    let raw: RawLibrary = toml::from_str(source).map_err(|e| {
        let message = e.message().trim().to_string();
        let head = message
            .split_once(", expected")
            .map(|(h, _)| h.to_string())
            .unwrap_or_else(|| message.clone());
        let mut d = Diagnostic::new("", e.span(), head);
        if let Some((_, rest)) = message.split_once("expected ") {
            d = d.expected(rest.trim_end_matches('.').to_string());
        }
        if message.contains("unknown field") {
            d = d.hint("a library has [library] (title, caution) and [material.<key>] tables; see materials/example-library.toml");
        }
        InputErrors::one(file, source, d)
    })?;
    let mut errors = Vec::new();
    let mut materials = BTreeMap::new();
    if raw.material.is_empty() {
        errors.push(
            Diagnostic::new("material", None, "the library has no materials")
                .expected("at least one [material.<key>] table"),
        );
    }
    for (key, m) in &raw.material {
        let span = m.span();
        let m = m.get_ref();
        let k = |f: &str| format!("material.{key}.{f}");
        let text = |errors: &mut Vec<Diagnostic>, f: &str, v: &Option<Spanned<String>>, what: &str| match v {
            Some(s) if !s.get_ref().trim().is_empty() => Some(s.get_ref().trim().to_string()),
            Some(s) => {
                errors.push(
                    Diagnostic::new(k(f), Some(s.span()), format!("`{}` is empty", k(f))).expected(what.to_string()),
                );
                None
            }
            None => {
                missing(errors, k(f), span.clone(), what);
                None
            }
        };
        let spec = text(&mut errors, "specification", &m.specification, "the specification, e.g. \"SA-516\"");
        let grade = text(&mut errors, "grade", &m.grade, "the grade, type or class, e.g. \"Grade 70\"");
        let form = match &m.product_form {
            Some(s) => match ProductForm::from_name(s.get_ref()) {
                Some(f) => Some(f),
                None => {
                    errors.push(
                        Diagnostic::new(
                            k("product_form"),
                            Some(s.span()),
                            format!("unknown product form `{}`", s.get_ref()),
                        )
                        .expected(format!("one of: {}", ProductForm::names())),
                    );
                    None
                }
            },
            None => {
                missing(&mut errors, k("product_form"), span.clone(), &format!("one of: {}", ProductForm::names()));
                None
            }
        };
        let part = match &m.part {
            Some(p) => {
                let known = part_name(p.get_ref());
                if known.is_none() {
                    errors.push(unknown_part(k("part"), p));
                }
                known
            }
            None => None,
        };
        let tensile = library_quantity(
            &mut errors,
            k("tensile_strength"),
            &m.tensile_strength,
            span.clone(),
            Kind::Stress,
            "485 MPa",
        );
        let yield_ = library_quantity(
            &mut errors,
            k("yield_strength"),
            &m.yield_strength,
            span.clone(),
            Kind::Stress,
            "260 MPa",
        );
        let density =
            library_quantity(&mut errors, k("density"), &m.density, span.clone(), Kind::Density, "7850 kg/m3");
        let table = match &m.allowable_stress {
            Some(t) => read_table(&mut errors, key, t),
            None => {
                missing(&mut errors, k("allowable_stress"), span.clone(), "a [material.<key>.allowable_stress] table");
                None
            }
        };
        if let (
            Some(specification),
            Some(grade),
            Some(product_form),
            Some(tensile_strength),
            Some(yield_strength),
            Some(density),
            Some(table),
        ) = (spec, grade, form, tensile, yield_, density, table)
        {
            materials.insert(
                key.clone(),
                LibraryMaterial {
                    key: key.clone(),
                    specification,
                    grade,
                    product_form,
                    tensile_strength,
                    yield_strength,
                    density,
                    note: m.note.clone().unwrap_or_default(),
                    part,
                    table,
                },
            );
        }
    }
    if !errors.is_empty() {
        errors.sort_by_key(|d| d.span.as_ref().map(|s| s.start).unwrap_or(usize::MAX));
        return Err(InputErrors { file: file.to_string(), source: source.to_string(), errors });
    }
    let info = raw.library.as_ref();
    Ok(Library {
        file: file.to_string(),
        title: info.and_then(|i| i.title.clone()).unwrap_or_default(),
        caution: info.and_then(|i| i.caution.clone()).filter(|c| !c.trim().is_empty()),
        materials,
    })
}

fn read_table(errors: &mut Vec<Diagnostic>, key: &str, t: &Spanned<RawStressTable>) -> Option<StressTable> {
    let span = t.span();
    let t = t.get_ref();
    let k = |f: &str| format!("material.{key}.allowable_stress.{f}");
    let before = errors.len();
    let unit = |errors: &mut Vec<Diagnostic>, f: &str, v: &Option<Spanned<String>>, kind: Kind, example: &str| match v {
        Some(u) => match unit_scale(u.get_ref(), kind) {
            Some(scale) => Some((u.get_ref().clone(), scale)),
            None => {
                errors.push(
                    Diagnostic::new(
                        k(f),
                        Some(u.span()),
                        format!(
                            "`{}` is not a unit of {}",
                            u.get_ref(),
                            if kind == Kind::Temperature { "temperature" } else { "stress" }
                        ),
                    )
                    .expected(kind.describe().to_string())
                    .hint(format!("e.g. {f} = \"{example}\"")),
                );
                None
            }
        },
        None => {
            missing(errors, k(f), span.clone(), &format!("the unit of the column, e.g. \"{example}\""));
            None
        }
    };
    let tu = unit(errors, "temperature_unit", &t.temperature_unit, Kind::Temperature, "degF");
    let su = unit(errors, "stress_unit", &t.stress_unit, Kind::Stress, "ksi");
    let source = match &t.source {
        Some(s) if !s.get_ref().trim().is_empty() => Some(s.get_ref().trim().to_string()),
        _ => {
            let s = t.source.as_ref().map(|s| s.span()).unwrap_or(span.clone());
            errors.push(
                Diagnostic::new(k("source"), Some(s), "every allowable-stress table needs a `source` note")
                    .expected("where the values come from, e.g. \"Section II, Part D, 2023, Table 1A\""),
            );
            None
        }
    };
    if t.rows.is_empty() {
        errors.push(
            Diagnostic::new(k("rows"), Some(span.clone()), "the allowable-stress table has no rows")
                .expected("rows = [[temperature, stress], ...] with at least one row"),
        );
    }
    let mut rows = Vec::new();
    if let (Some((_, (tf, to))), Some((_, (sf, so)))) = (&tu, &su) {
        let mut previous: Option<f64> = None;
        for (i, row) in t.rows.iter().enumerate() {
            let rk = format!("material.{key}.allowable_stress.rows[{i}]");
            let [temp, stress] = row.get_ref().as_slice() else {
                errors.push(
                    Diagnostic::new(rk, Some(row.span()), format!("row {} has {} numbers", i + 1, row.get_ref().len()))
                        .expected("exactly two numbers: [temperature, stress]"),
                );
                continue;
            };
            if !temp.is_finite() || !stress.is_finite() || *stress <= 0.0 {
                errors.push(
                    Diagnostic::new(
                        rk,
                        Some(row.span()),
                        format!("row {} must hold a finite temperature and a stress greater than zero", i + 1),
                    )
                    .expected("[temperature, stress] with stress > 0"),
                );
                continue;
            }
            if let Some(p) = previous {
                if *temp <= p {
                    errors.push(
                        Diagnostic::new(
                            rk,
                            Some(row.span()),
                            format!("row {} is not above the row before it in temperature", i + 1),
                        )
                        .expected("rows in strictly increasing temperature"),
                    );
                    continue;
                }
            }
            previous = Some(*temp);
            rows.push(StressRow {
                temperature: Quantity::new(temp * tf + to, Kind::Temperature),
                stress: Quantity::new(stress * sf + so, Kind::Stress),
            });
        }
    }
    if errors.len() > before {
        return None;
    }
    Some(StressTable { temperature_unit: tu?.0, stress_unit: su?.0, source: source?, rows })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn table(unit_t: &str, unit_s: &str, rows: &[(f64, f64)]) -> StressTable {
        let (tf, to) = unit_scale(unit_t, Kind::Temperature).unwrap();
        let (sf, so) = unit_scale(unit_s, Kind::Stress).unwrap();
        StressTable {
            temperature_unit: unit_t.into(),
            stress_unit: unit_s.into(),
            source: "test".into(),
            rows: rows
                .iter()
                .map(|(t, s)| StressRow {
                    temperature: Quantity::new(t * tf + to, Kind::Temperature),
                    stress: Quantity::new(s * sf + so, Kind::Stress),
                })
                .collect(),
        }
    }

    #[test]
    fn interpolates_linearly_between_the_bracketing_rows() {
        // Hand interpolation (common practice, no source): halfway between
        // 200 °C (100 MPa) and 300 °C (80 MPa) is 90 MPa; at 250 °C + 25 °C,
        // three quarters of the way, 85 MPa.
        let t = table("degC", "MPa", &[(200.0, 100.0), (300.0, 80.0)]);
        let b = t.bracket(Quantity::new(250.0, Kind::Temperature)).unwrap();
        assert!((b.stress().unwrap().value - 90e6).abs() < 1e-3);
        let b = t.bracket(Quantity::new(275.0, Kind::Temperature)).unwrap();
        assert!((b.stress().unwrap().value - 85e6).abs() < 1e-3);
    }

    #[test]
    fn a_tabulated_temperature_needs_no_interpolation() {
        let t = table("degF", "ksi", &[(100.0, 20.0), (200.0, 18.0), (300.0, 16.0)]);
        // 200 °F is 93.333… °C exactly (conversion definition).
        let b = t.bracket(Quantity::new((200.0 - 32.0) * 5.0 / 9.0, Kind::Temperature)).unwrap();
        assert!(b.exact());
        assert!((b.stress().unwrap().value - 18.0 * 6_894_757.293_168_361).abs() < 1e-3);
    }

    #[test]
    fn never_extrapolates() {
        let t = table("degC", "MPa", &[(-30.0, 138.0), (400.0, 100.0)]);
        assert!(t.bracket(Quantity::new(-30.1, Kind::Temperature)).is_none());
        assert!(t.bracket(Quantity::new(400.1, Kind::Temperature)).is_none());
        assert!(t.bracket(Quantity::new(400.0, Kind::Temperature)).is_some());
        assert_eq!(t.range_text(), "-30 degC to 400 degC");
    }

    #[test]
    fn the_example_library_parses() {
        let lib = parse_library(EXAMPLE_LIBRARY_NAME, EXAMPLE_LIBRARY).unwrap();
        assert!(lib.materials.len() >= 6);
        assert!(lib.caution.as_deref().unwrap_or("").contains("illustrative values from memory"));
        for m in lib.materials.values() {
            assert!(m.table.source.contains("illustrative values from memory"), "{}", m.key);
        }
    }

    #[test]
    fn library_errors_name_the_library_file_and_line() {
        let src = "[material.x]\nspecification = \"SA-1\"\ngrade = \"A\"\nproduct_form = \"plate\"\ntensile_strength = \"400 MPa\"\nyield_strength = \"200 MPa\"\ndensity = \"7850 kg/m3\"\n[material.x.allowable_stress]\ntemperature_unit = \"degC\"\nstress_unit = \"MPa\"\nsource = \"s\"\nrows = [[100, 120], [50, 110]]\n";
        let e = parse_library("lib.toml", src).unwrap_err().render();
        assert!(e.contains("--> lib.toml:12:"), "{e}");
        assert!(e.contains("strictly increasing"), "{e}");
    }
}
