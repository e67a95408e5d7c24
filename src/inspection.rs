//! As-built inspection of a formed head: measured points on the inner
//! surface against the specified profile, judged by the UG-81 tolerance.
//!
//! Pure: [`parse_points`] reads CSV text, [`inspect`] builds the record,
//! [`record_files`] renders it (Markdown, PDF, JSON, SVG plot, manifest).
//! The CLI reads and writes the files.

use crate::diag::{Diagnostic, InputErrors};
use crate::geometry::{deviation_plot, point_deviations, ug81_limits, DrawingLabels, PlotData, PointDeviation};
use crate::package::manifest::{DocumentId, Manifest};
use crate::pipeline::Evaluated;
use crate::render::context::md;
use crate::render::pdf::{markdown_to_pdf, Paper, PdfMetadata, PdfOptions};
use crate::units::{parse_quantity, Kind};
use serde::Serialize;
use sha2::{Digest, Sha256};
use std::collections::BTreeMap;

/// One measured point as read (mm), with its CSV line number.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct MeasuredPoint {
    /// Line in the CSV file (1-based).
    pub line: usize,
    /// Radius from the axis, mm.
    pub radius: f64,
    /// Height above the tangent line, mm.
    pub height: f64,
}

/// Reads measured points. The header names the columns `radius [unit]` and
/// `height [unit]` (any length unit, any order; other columns are ignored).
pub fn parse_points(file: &str, text: &str) -> Result<Vec<MeasuredPoint>, InputErrors> {
    let err = |line: usize, msg: String, expected: &str| {
        // Byte offset of the line's start, counted on the raw text so that
        // "\r\n" line ends are measured as they are.
        let offset = if line <= 1 {
            0
        } else {
            text.match_indices('\n').nth(line - 2).map(|(i, _)| i + 1).unwrap_or(text.len())
        };
        let len = text.lines().nth(line - 1).map(str::len).unwrap_or(0);
        InputErrors::one(
            file,
            text,
            Diagnostic::new("", Some(offset..offset + len.max(1)), msg).expected(expected.to_string()),
        )
    };
    let mut lines = text.lines().enumerate().filter(|(_, l)| !l.trim().is_empty() && !l.trim_start().starts_with('#'));
    let Some((hline, header)) = lines.next() else {
        return Err(InputErrors::one(
            file,
            text,
            Diagnostic::new("", None, "the points file is empty")
                .expected("a header `radius [mm],height [mm]` and at least 3 points"),
        ));
    };
    let cols: Vec<&str> = header.split(',').map(str::trim).collect();
    let find = |name: &str| -> Result<(usize, f64), InputErrors> {
        let Some(i) = cols.iter().position(|c| c.to_ascii_lowercase().starts_with(name)) else {
            return Err(err(
                hline + 1,
                format!("the header has no `{name}` column"),
                "a header such as `radius [mm],height [mm]`",
            ));
        };
        let unit = cols[i].split_once('[').and_then(|(_, r)| r.split_once(']')).map(|(u, _)| u.trim().to_string());
        let Some(unit) = unit else {
            return Err(err(
                hline + 1,
                format!("the `{name}` column does not state its unit"),
                "a unit in brackets, e.g. `radius [mm]`",
            ));
        };
        let scale = parse_quantity(&format!("1 {unit}"), Kind::Length)
            .map_err(|e| {
                err(
                    hline + 1,
                    format!("the `{name}` column's unit `{unit}`: {e}"),
                    "a length unit: mm, cm, m, in or ft",
                )
            })?
            .value
            * 1e3;
        Ok((i, scale))
    };
    let (ri, rs) = find("radius")?;
    let (hi, hs) = find("height")?;
    let mut points = Vec::new();
    for (n, l) in lines {
        let cells: Vec<&str> = l.split(',').map(str::trim).collect();
        let get = |i: usize, what: &str| -> Result<f64, InputErrors> {
            let cell = cells.get(i).copied().unwrap_or("");
            match cell.parse::<f64>() {
                Ok(v) if v.is_finite() => Ok(v),
                _ => Err(err(n + 1, format!("the {what} `{cell}` is not a number"), "a finite decimal number")),
            }
        };
        points.push(MeasuredPoint { line: n + 1, radius: get(ri, "radius")? * rs, height: get(hi, "height")? * hs });
    }
    if points.len() < 3 {
        return Err(InputErrors::one(
            file,
            text,
            Diagnostic::new("", None, format!("only {} measured point(s)", points.len())).expected("at least 3 points"),
        ));
    }
    Ok(points)
}

/// The inspection record of one head.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct InspectionRecord {
    /// Component id.
    pub component: String,
    /// Component description.
    pub description: String,
    /// Inside diameter D, mm.
    pub inside_diameter: f64,
    /// The points with their deviations (positive outside).
    pub points: Vec<(MeasuredPoint, PointDeviation)>,
    /// Largest deviation outside, mm (0 when none is outside).
    pub max_outside: f64,
    /// Largest deviation inside, mm (0 when none is inside).
    pub max_inside: f64,
    /// UG-81 limits (outside, inside), mm.
    pub limits: (f64, f64),
    /// Both limits met.
    pub pass: bool,
    /// Digest over the design, the component and the points.
    pub digest: String,
}

/// Builds the record for component `id` of an evaluated case.
pub fn inspect(
    ev: &Evaluated,
    id: &str,
    file: &str,
    csv: &str,
    points: &[MeasuredPoint],
) -> Result<InspectionRecord, String> {
    let c = ev.calculation.components.iter().find(|c| c.id == id).ok_or_else(|| {
        let ids: Vec<&str> = ev.calculation.components.iter().map(|c| c.id.as_str()).collect();
        format!("no component `{id}` in the case; components: {}", ids.join(", "))
    })?;
    let g = c.geometry.as_ref().ok_or_else(|| format!("component `{id}` is a {}, not a formed head", c.type_name))?;
    let profile = g.profile().map_err(|e| e.to_string())?;
    let xy: Vec<(f64, f64)> = points.iter().map(|p| (p.radius, p.height)).collect();
    let devs = point_deviations(&profile, &xy).map_err(|e| {
        // Name the CSV line of the offending point.
        let line = match &e {
            crate::geometry::GeometryError::PointOutOfRange { index, .. } => points.get(*index).map(|p| p.line),
            _ => None,
        };
        match line {
            Some(l) => format!("{file}:{l}: {e}"),
            None => format!("{file}: {e}"),
        }
    })?;
    let max_outside = devs.iter().map(|d| d.deviation).fold(0.0, f64::max);
    let max_inside = devs.iter().map(|d| -d.deviation).fold(0.0, f64::max);
    let limits = ug81_limits(g.spec.inside_diameter);
    let pass = max_outside <= limits.0 && max_inside <= limits.1;
    let mut h = Sha256::new();
    h.update(crate::results::TOOL_VERSION.as_bytes());
    h.update(serde_json::to_vec(&ev.design).unwrap_or_default());
    h.update(id.as_bytes());
    h.update(csv.as_bytes());
    h.update(INSPECTION_TEMPLATE.as_bytes());
    Ok(InspectionRecord {
        component: id.to_string(),
        description: c.description.clone(),
        inside_diameter: g.spec.inside_diameter,
        points: points.iter().copied().zip(devs).collect(),
        max_outside,
        max_inside,
        limits,
        pass,
        digest: crate::package::manifest::hex(&h.finalize()),
    })
}

/// The inspection record template.
pub const INSPECTION_TEMPLATE: &str = include_str!("../report-templates/inspection.md.tera");

fn f3(v: f64) -> String {
    format!("{v:.3}")
}

/// Files of a record: (name, bytes), in writing order.
pub type Files = Vec<(String, Vec<u8>)>;

/// Renders the record into files (name, bytes) and their manifest.
pub fn record_files(ev: &Evaluated, rec: &InspectionRecord, paper: Paper) -> Result<(Files, Manifest), String> {
    let d = &ev.design.document;
    let stem = format!("{}_rev{}_inspection_{}", d.number, d.revision, rec.component);
    let plot_name = format!("{stem}_deviation.svg");
    let plot = deviation_plot(
        &PlotData::from_points(&rec.points.iter().map(|(_, p)| *p).collect::<Vec<_>>()),
        rec.limits,
        &DrawingLabels {
            title: format!("{}: measured deviation from the specified profile", rec.component),
            ..DrawingLabels::default()
        },
    );
    let rows: Vec<serde_json::Value> = rec
        .points
        .iter()
        .enumerate()
        .map(|(i, (m, p))| {
            let status = if p.deviation > rec.limits.0 {
                "**OUTSIDE TOLERANCE**"
            } else if -p.deviation > rec.limits.1 {
                "**INSIDE TOLERANCE EXCEEDED**"
            } else {
                "within"
            };
            serde_json::json!({
                "n": i + 1, "line": m.line, "radius": f3(m.radius), "height": f3(m.height),
                "deviation": format!("{:+.3}", p.deviation), "angle": format!("{:.2}", p.angle.to_degrees()), "status": status,
            })
        })
        .collect();
    let cautions: Vec<String> = crate::cautions::STANDING.iter().map(|s| md(s)).collect();
    let ctx = serde_json::json!({
        "doc": { "number": md(&d.number), "revision": md(&d.revision), "title": md(&d.title), "date": md(&d.date), "digest": rec.digest },
        "component": md(&rec.component), "description": md(&rec.description),
        "diameter": f3(rec.inside_diameter), "limit_outside": f3(rec.limits.0), "limit_inside": f3(rec.limits.1),
        "max_outside": f3(rec.max_outside), "max_inside": f3(rec.max_inside),
        "status": if rec.pass { "WITHIN TOLERANCE" } else { "NOT WITHIN TOLERANCE" },
        "points": rows, "plot": plot_name, "plot_caption": md(&plot.caption), "cautions": cautions,
    });
    let mut tera = tera::Tera::default();
    tera.autoescape_on(vec![]);
    tera.add_raw_template("inspection.md.tera", INSPECTION_TEMPLATE).map_err(|e| e.to_string())?;
    let ctx = tera::Context::from_value(ctx).map_err(|e| e.to_string())?;
    let markdown = tera.render("inspection.md.tera", &ctx).map_err(|e| e.to_string())?;
    let json = serde_json::json!({ "format": "knuckle-inspection/1", "tool": {"name": crate::results::TOOL_NAME, "version": crate::results::TOOL_VERSION},
        "document": {"number": d.number, "revision": d.revision}, "units": {"length": "mm", "angle": "rad"}, "record": rec });
    let mut json_text = serde_json::to_string_pretty(&json).map_err(|e| e.to_string())?;
    json_text.push('\n');
    let mut figures = BTreeMap::new();
    let svg = crate::render::svg::to_svg(&plot);
    figures.insert(plot_name.clone(), plot);
    let pdf = markdown_to_pdf(
        &markdown,
        &figures,
        &PdfOptions {
            paper,
            header_left: format!("{}  inspection record, {}", d.number, rec.component),
            header_right: format!("Revision {}", d.revision),
            footer_left: format!("Digest {}", &rec.digest[..12]),
            metadata: PdfMetadata {
                title: format!("As-built inspection of {} ({})", rec.component, d.number),
                author: ev.design.sign_off.prepared_by.clone(),
                subject: "Formed head shape against UG-81".into(),
                keywords: vec![d.number.clone(), rec.component.clone(), format!("digest {}", rec.digest)],
                date: d.date.clone(),
            },
            document_id: rec.digest.clone(),
        },
    )
    .map_err(|e| e.to_string())?;
    let files = vec![
        (plot_name, svg.into_bytes()),
        (format!("{stem}.json"), json_text.into_bytes()),
        (format!("{stem}.md"), markdown.into_bytes()),
        (format!("{stem}.pdf"), pdf),
    ];
    let document = DocumentId {
        number: d.number.clone(),
        revision: d.revision.clone(),
        date: d.date.clone(),
        title: format!("inspection record, {}", rec.component),
    };
    let manifest = Manifest::over_files(
        document,
        &ev.calculation.rule_set,
        &ev.calculation.edition,
        &rec.digest,
        rec.pass,
        &files,
    );
    Ok((files, manifest))
}
