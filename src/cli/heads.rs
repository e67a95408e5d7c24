//! `knuckle heads --diameter D [...]`: the head study for one diameter.

use super::{EXIT_INPUT, EXIT_OK};
use crate::geometry::{study_table_markdown, study_table_text, StudyInput, StudyReport};
use crate::units::{parse_quantity, Kind};
use std::path::PathBuf;

/// Arguments of `heads`.
#[derive(clap::Args, Debug)]
pub struct HeadsArgs {
    /// Inside diameter of the shell, with unit (e.g. "2500 mm").
    #[arg(long)]
    pub diameter: String,
    /// Design pressure, with unit; with --stress and --efficiency adds required thicknesses.
    #[arg(long)]
    pub pressure: Option<String>,
    /// Allowable stress at design temperature, with unit.
    #[arg(long)]
    pub stress: Option<String>,
    /// Joint efficiency, 0 < E ≤ 1.
    #[arg(long)]
    pub efficiency: Option<f64>,
    /// Corrosion allowance, with unit.
    #[arg(long, default_value = "0 mm")]
    pub corrosion_allowance: String,
    /// Plate density, with unit.
    #[arg(long, default_value = "7850 kg/m3")]
    pub density: String,
    /// Nominal thickness of every head, with unit (default: required + corrosion allowance).
    #[arg(long)]
    pub thickness: Option<String>,
    /// Straight flange of every head, with unit.
    #[arg(long, default_value = "0 mm")]
    pub straight_flange: String,
    /// Print JSON instead of the table.
    #[arg(long, conflicts_with = "md")]
    pub json: bool,
    /// Write the table as Markdown to this file.
    #[arg(long)]
    pub md: Option<PathBuf>,
}

fn quantity(flag: &str, text: &str, kind: Kind, scale: f64) -> Result<f64, String> {
    let q =
        parse_quantity(text, kind).map_err(|e| format!("--{flag} \"{text}\": {e}; expected {}", kind.describe()))?;
    if q.value < 0.0 {
        return Err(format!("--{flag} must not be negative"));
    }
    Ok(q.value * scale)
}

fn input(a: &HeadsArgs) -> Result<StudyInput, String> {
    let mut i = StudyInput::new(quantity("diameter", &a.diameter, Kind::Length, 1e3)?);
    if i.diameter <= 0.0 {
        return Err("--diameter must be greater than zero".into());
    }
    i.pressure = a.pressure.as_deref().map(|p| quantity("pressure", p, Kind::Pressure, 1e-6)).transpose()?;
    i.stress = a.stress.as_deref().map(|s| quantity("stress", s, Kind::Stress, 1e-6)).transpose()?;
    if let Some(e) = a.efficiency {
        if !(e > 0.0 && e <= 1.0) {
            return Err(format!("--efficiency {e} is outside (0, 1]"));
        }
    }
    i.efficiency = a.efficiency;
    let partial = [i.pressure.is_some(), i.stress.is_some(), i.efficiency.is_some()];
    if partial.iter().any(|x| *x) && !partial.iter().all(|x| *x) {
        return Err("--pressure, --stress and --efficiency go together (all three or none)".into());
    }
    i.corrosion_allowance = quantity("corrosion-allowance", &a.corrosion_allowance, Kind::Length, 1e3)?;
    i.density = quantity("density", &a.density, Kind::Density, 1.0)?;
    i.thickness = a.thickness.as_deref().map(|t| quantity("thickness", t, Kind::Length, 1e3)).transpose()?;
    i.straight_flange = quantity("straight-flange", &a.straight_flange, Kind::Length, 1e3)?;
    Ok(i)
}

/// Runs `heads`.
pub fn run(a: &HeadsArgs) -> i32 {
    let report = match input(a).and_then(|i| StudyReport::new(&i).map_err(|e| e.to_string())) {
        Ok(r) => r,
        Err(e) => {
            eprintln!("error: {e}");
            return EXIT_INPUT;
        }
    };
    let caution = "This study supports, never replaces, a qualified engineer; verify against the code edition in force and local regulations.";
    if a.json {
        match serde_json::to_string_pretty(&report) {
            Ok(s) => println!("{s}"),
            Err(e) => {
                eprintln!("error: {e}");
                return EXIT_INPUT;
            }
        }
        return EXIT_OK;
    }
    if let Some(path) = &a.md {
        let mut text = study_table_markdown(&report.rows);
        for n in &report.notes {
            text.push_str(&format!("\n- {n}"));
        }
        text.push_str(&format!("\n\n{caution}\n"));
        if let Err(e) = crate::fsio::write_atomic(path, text.as_bytes()) {
            eprintln!("error: cannot write `{}`: {e}", path.display());
            return EXIT_INPUT;
        }
        println!("wrote {}", path.display());
        return EXIT_OK;
    }
    println!("Head study for inside diameter {} mm", crate::units::format_number(report.diameter_mm, 6));
    print!("{}", study_table_text(&report.rows));
    for n in &report.notes {
        println!("note: {n}");
    }
    println!("{caution}");
    EXIT_OK
}
