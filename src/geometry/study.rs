//! The head study: the usual head shapes for one inside diameter side by
//! side, with their geometry, required thickness, mass and deviation from the
//! 2:1 ellipse.
//!
//! Required thicknesses follow ASME BPVC Section VIII Division 1 for internal
//! pressure in the corroded condition (inside dimensions grown by the
//! corrosion allowance): Appendix 1-4(c) for the ellipsoidal head, 1-4(d) for
//! torispherical heads and UG-32(f) (the UG-27(d) sphere formula) for the
//! hemispherical head. Geometry (depth, volume, area, blank, deviation) is of
//! the new, uncorroded head as ordered.

use super::deviation::{deviation, reference_profile, Reference};
use super::properties::properties;
use super::{finite, invalid, GeometryError, HeadShape, HeadSpec, NamedTorisphere};
use serde::Serialize;
use std::fmt::Write;

/// What the study needs to know.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct StudyInput {
    /// Inside diameter D of the shell, mm.
    pub diameter: f64,
    /// Internal design pressure P, MPa; with `stress` and `efficiency` it
    /// enables the required-thickness column.
    pub pressure: Option<f64>,
    /// Allowable stress S at design temperature, MPa.
    pub stress: Option<f64>,
    /// Joint efficiency E (0 < E ≤ 1).
    pub efficiency: Option<f64>,
    /// Corrosion allowance, mm.
    pub corrosion_allowance: f64,
    /// Density of the plate, kg/m³.
    pub density: f64,
    /// Nominal thickness used for every head, mm; when `None` each head gets
    /// its required thickness plus the corrosion allowance (if the pressure
    /// is given) or no thickness at all.
    pub thickness: Option<f64>,
    /// Straight flange length of every head, mm (counted in the blank and mass).
    pub straight_flange: f64,
}

impl StudyInput {
    /// A geometry-only study of inside diameter D (mm): no pressure, no
    /// corrosion allowance, carbon-steel density 7850 kg/m³ (common practice,
    /// no source), no straight flange.
    pub fn new(diameter: f64) -> StudyInput {
        StudyInput {
            diameter,
            pressure: None,
            stress: None,
            efficiency: None,
            corrosion_allowance: 0.0,
            density: 7850.0,
            thickness: None,
            straight_flange: 0.0,
        }
    }
}

/// One head of the study. Units: mm for lengths, m³ for volume, m² for area,
/// kg for mass (converted from the library's mm units in the row).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct StudyRow {
    /// Shape key, e.g. `2:1-ellipsoidal`, `80-10`, `hemispherical`.
    pub shape: String,
    /// Inside crown radius L, mm (torispherical heads only).
    pub crown_radius: Option<f64>,
    /// Inside knuckle radius r, mm (torispherical heads only).
    pub knuckle_radius: Option<f64>,
    /// Inside depth from the tangent line, mm.
    pub inside_depth: f64,
    /// Inside volume of the head (tangent line to crown), m³.
    pub volume: f64,
    /// Inside surface area of the head (without straight flange), m².
    pub inside_area: f64,
    /// Blank diameter by the mean-surface equal-area method, mm (for the
    /// inside surface when no thickness is known).
    pub blank_diameter: f64,
    /// Required thickness for internal pressure, corroded, without corrosion allowance, mm.
    pub required_thickness: Option<f64>,
    /// Nominal thickness used for blank and mass, mm.
    pub thickness: Option<f64>,
    /// Mass of the head with its straight flange, kg.
    pub mass: Option<f64>,
    /// Largest deviation (outside or inside) from the 2:1 ellipse of the same D, mm.
    pub deviation_from_2to1: f64,
    /// Largest deviation outside the 2:1 ellipse, mm.
    pub deviation_outside: f64,
    /// Largest deviation inside the 2:1 ellipse, mm.
    pub deviation_inside: f64,
}

/// The study as written to JSON: the diameter and the rows.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct StudyReport {
    /// Inside diameter, mm.
    pub diameter_mm: f64,
    /// Corrosion allowance, mm.
    pub corrosion_allowance_mm: f64,
    /// Design pressure, MPa, when given.
    pub pressure_mpa: Option<f64>,
    /// Remarks on the basis of the numbers (one sentence each).
    pub notes: Vec<String>,
    /// The heads, shallowest first.
    pub rows: Vec<StudyRow>,
}

impl StudyReport {
    /// Runs the study and wraps it with its inputs and notes.
    pub fn new(input: &StudyInput) -> Result<StudyReport, GeometryError> {
        let rows = head_study(input)?;
        let mut notes = vec![
            "Geometry is of the new head; required thicknesses use the corroded inside dimensions.".to_string(),
            "Named torispheres on the outside diameter use Do = D + 2·t with the nominal thickness t.".to_string(),
        ];
        if input.thickness.is_none() && input.pressure.is_none() {
            notes.push(
                "No thickness is known: Do is taken equal to D, blanks are for the inside surface and masses are not given."
                    .to_string(),
            );
        }
        Ok(StudyReport {
            diameter_mm: input.diameter,
            corrosion_allowance_mm: input.corrosion_allowance,
            pressure_mpa: input.pressure,
            notes,
            rows,
        })
    }
}

/// Design data for the required-thickness formulas.
#[derive(Clone, Copy)]
struct Design {
    p: f64,
    s: f64,
    e: f64,
    ca: f64,
}

impl Design {
    /// The common denominator 2SE − 0.2P, MPa.
    fn denominator(&self) -> f64 {
        2.0 * self.s * self.e - 0.2 * self.p
    }
}

/// Candidate shapes of the study.
#[derive(Clone, Copy)]
enum Candidate {
    Ellipse2to1,
    Named(NamedTorisphere),
    Hemisphere,
}

impl Candidate {
    fn key(self) -> &'static str {
        match self {
            Candidate::Ellipse2to1 => "2:1-ellipsoidal",
            Candidate::Named(n) => n.key(),
            Candidate::Hemisphere => "hemispherical",
        }
    }

    fn shape(self, d: f64, t: f64) -> HeadShape {
        match self {
            Candidate::Ellipse2to1 => HeadShape::Ellipsoidal { aspect_ratio: 2.0 },
            Candidate::Named(n) => n.shape(d, t),
            Candidate::Hemisphere => HeadShape::Hemispherical,
        }
    }

    /// Required thickness, mm, for the head of new inside dimensions `shape`
    /// at inside diameter d, in the corroded condition.
    fn required(self, shape: HeadShape, d: f64, design: &Design) -> f64 {
        let ca = design.ca;
        let den = design.denominator();
        match shape {
            HeadShape::Ellipsoidal { aspect_ratio } => {
                // Appendix 1-4(c): t = P·D·K/(2SE − 0.2P), K = (2 + (D/2h)²)/6.
                let dc = d + 2.0 * ca;
                let hc = 0.5 * d / aspect_ratio + ca;
                let k = (2.0 + (dc / (2.0 * hc)).powi(2)) / 6.0;
                design.p * dc * k / den
            }
            HeadShape::Torispherical { crown_radius, knuckle_radius } => {
                // Appendix 1-4(d): t = P·L·M/(2SE − 0.2P), M = (3 + √(L/r))/4.
                let (l, r) = (crown_radius + ca, knuckle_radius + ca);
                let m = (3.0 + (l / r).sqrt()) / 4.0;
                design.p * l * m / den
            }
            HeadShape::Hemispherical | HeadShape::Conical { .. } => {
                // UG-32(f) with UG-27(d): t = P·R/(2SE − 0.2P).
                design.p * (0.5 * d + ca) / den
            }
        }
    }
}

fn check_input(input: &StudyInput) -> Result<Option<Design>, GeometryError> {
    let d = finite("diameter", input.diameter)?;
    if d <= 0.0 {
        return Err(invalid("diameter", format!("{d} mm must be positive")));
    }
    let ca = finite("corrosion allowance", input.corrosion_allowance)?;
    if ca < 0.0 {
        return Err(invalid("corrosion allowance", format!("{ca} mm must not be negative")));
    }
    let rho = finite("density", input.density)?;
    if rho < 0.0 {
        return Err(invalid("density", format!("{rho} kg/m³ must not be negative")));
    }
    let sf = finite("straight flange", input.straight_flange)?;
    if sf < 0.0 {
        return Err(invalid("straight flange", format!("{sf} mm must not be negative")));
    }
    if let Some(t) = input.thickness {
        let t = finite("thickness", t)?;
        if t <= ca {
            return Err(invalid("thickness", format!("{t} mm must be larger than the corrosion allowance {ca} mm")));
        }
    }
    match (input.pressure, input.stress, input.efficiency) {
        (None, None, None) => Ok(None),
        (Some(p), Some(s), Some(e)) => {
            let p = finite("pressure", p)?;
            let s = finite("allowable stress", s)?;
            let e = finite("joint efficiency", e)?;
            if p <= 0.0 {
                return Err(invalid("pressure", format!("{p} MPa must be positive (internal pressure)")));
            }
            if s <= 0.0 {
                return Err(invalid("allowable stress", format!("{s} MPa must be positive")));
            }
            if e <= 0.0 || e > 1.0 {
                return Err(invalid("joint efficiency", format!("{e} must lie in (0, 1]")));
            }
            let design = Design { p, s, e, ca };
            if design.denominator() <= 0.0 {
                return Err(invalid(
                    "pressure",
                    format!(
                        "2SE − 0.2P = {} MPa is not positive; the pressure is too high for the stress",
                        design.denominator()
                    ),
                ));
            }
            Ok(Some(design))
        }
        _ => Err(invalid("design data", "pressure, allowable stress and joint efficiency must be given together")),
    }
}

/// Compares the 2:1 ellipsoidal, 2:1-equivalent, 6 %-knuckle, 80-10,
/// DIN 28011, DIN 28013 and hemispherical heads for one inside diameter.
/// Rows are sorted by inside depth, shallowest first.
pub fn head_study(input: &StudyInput) -> Result<Vec<StudyRow>, GeometryError> {
    let design = check_input(input)?;
    let d = input.diameter;
    let candidates = [
        Candidate::Ellipse2to1,
        Candidate::Named(NamedTorisphere::TwoToOneEquivalent),
        Candidate::Named(NamedTorisphere::SixPercentKnuckle),
        Candidate::Named(NamedTorisphere::EightyTen),
        Candidate::Named(NamedTorisphere::Din28011),
        Candidate::Named(NamedTorisphere::Din28013),
        Candidate::Hemisphere,
    ];
    let mut rows = Vec::new();
    for cand in candidates {
        // Fix the nominal thickness. Shapes defined on Do depend on it, and
        // it depends on their radii: iterate t → radii → required t + CA,
        // which contracts quickly because t is a small fraction of Do.
        let (required, nominal) = match (input.thickness, design) {
            (Some(t), Some(des)) => (Some(cand.required(cand.shape(d, t), d, &des)), Some(t)),
            (Some(t), None) => (None, Some(t)),
            (None, Some(des)) => {
                let mut t = des.ca;
                let mut req = 0.0;
                for _ in 0..100 {
                    req = cand.required(cand.shape(d, t), d, &des);
                    let next = req + des.ca;
                    let done = (next - t).abs() <= 1e-12 * next.max(1.0);
                    t = next;
                    if done {
                        break;
                    }
                }
                (Some(req), Some(t))
            }
            (None, None) => (None, None),
        };
        let t = nominal.unwrap_or(0.0);
        let shape = cand.shape(d, t);
        let spec = HeadSpec {
            shape,
            inside_diameter: d,
            straight_flange: input.straight_flange,
            thickness: t,
            density: input.density,
        };
        let profile = spec.profile()?;
        let props = properties(&spec, &profile)?;
        let reference = reference_profile(&profile, Reference::TwoToOne)?;
        let dev = deviation(&profile, &reference);
        let (crown_radius, knuckle_radius) = match shape {
            HeadShape::Torispherical { crown_radius, knuckle_radius } => (Some(crown_radius), Some(knuckle_radius)),
            _ => (None, None),
        };
        rows.push(StudyRow {
            shape: cand.key().to_string(),
            crown_radius,
            knuckle_radius,
            inside_depth: props.inside_depth.value,
            volume: props.volume.value * 1e-9,
            inside_area: props.inside_area.value * 1e-6,
            blank_diameter: props.blank_diameter.value,
            required_thickness: required,
            thickness: nominal,
            mass: nominal.map(|_| props.mass.value),
            deviation_from_2to1: dev.max_outside.max(dev.max_inside),
            deviation_outside: dev.max_outside,
            deviation_inside: dev.max_inside,
        });
    }
    rows.sort_by(|a, b| a.inside_depth.total_cmp(&b.inside_depth).then_with(|| a.shape.cmp(&b.shape)));
    Ok(rows)
}

/// Column headings and the formatted cells of every row.
fn cells(rows: &[StudyRow]) -> (Vec<&'static str>, Vec<Vec<String>>) {
    let head = vec![
        "shape",
        "L mm",
        "r mm",
        "h mm",
        "V m³",
        "A m²",
        "blank mm",
        "t req mm",
        "t mm",
        "mass kg",
        "dev 2:1 out/in mm",
    ];
    let opt = |v: Option<f64>, dec: usize| v.map_or("-".to_string(), |v| format!("{v:.dec$}"));
    let body = rows
        .iter()
        .map(|r| {
            vec![
                r.shape.clone(),
                opt(r.crown_radius, 1),
                opt(r.knuckle_radius, 1),
                format!("{:.1}", r.inside_depth),
                format!("{:.4}", r.volume),
                format!("{:.4}", r.inside_area),
                format!("{:.0}", r.blank_diameter),
                opt(r.required_thickness, 2),
                opt(r.thickness, 2),
                opt(r.mass, 1),
                format!("+{:.1}/−{:.1}", r.deviation_outside, r.deviation_inside),
            ]
        })
        .collect();
    (head, body)
}

/// The study as an aligned plain-text table for a terminal, rows as given
/// (shallowest first from [`head_study`]); text left-aligned, numbers right-aligned.
pub fn study_table_text(rows: &[StudyRow]) -> String {
    let (head, body) = cells(rows);
    let width = |c: usize| {
        body.iter().map(|r| r[c].chars().count()).chain(std::iter::once(head[c].chars().count())).max().unwrap_or(0)
    };
    let widths: Vec<usize> = (0..head.len()).map(width).collect();
    let fmt_row = |cells: &[String]| {
        let mut line = String::new();
        for (c, cell) in cells.iter().enumerate() {
            let pad = widths[c] - cell.chars().count();
            if c > 0 {
                line.push_str("  ");
            }
            if c == 0 {
                line.push_str(cell);
                line.push_str(&" ".repeat(pad));
            } else {
                line.push_str(&" ".repeat(pad));
                line.push_str(cell);
            }
        }
        line.trim_end().to_string()
    };
    let mut out = String::new();
    let head_cells: Vec<String> = head.iter().map(|s| s.to_string()).collect();
    let _ = writeln!(out, "{}", fmt_row(&head_cells));
    let total: usize = widths.iter().sum::<usize>() + 2 * (widths.len() - 1);
    let _ = writeln!(out, "{}", "-".repeat(total));
    for r in &body {
        let _ = writeln!(out, "{}", fmt_row(r));
    }
    out
}

/// The study as a Markdown table (numbers right-aligned).
pub fn study_table_markdown(rows: &[StudyRow]) -> String {
    let (head, body) = cells(rows);
    let mut out = String::new();
    let _ = writeln!(out, "| {} |", head.join(" | "));
    let align: Vec<&str> = (0..head.len()).map(|c| if c == 0 { ":---" } else { "---:" }).collect();
    let _ = writeln!(out, "| {} |", align.join(" | "));
    for r in &body {
        let _ = writeln!(out, "| {} |", r.join(" | "));
    }
    out
}
