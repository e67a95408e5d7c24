//! `knuckle materials [--library FILE] [KEY]`: list a library's materials,
//! or show one with its allowable-stress table. Without `--library` the
//! example library built into the binary is shown.

use super::{EXIT_INPUT, EXIT_OK};
use crate::materials::{parse_library, Library, LibraryMaterial, EXAMPLE_LIBRARY, EXAMPLE_LIBRARY_NAME};
use crate::units::UnitSystem;
use std::path::PathBuf;

/// Arguments of `materials`.
#[derive(clap::Args, Debug)]
pub struct MaterialsArgs {
    /// The library file (default: the example library built into knuckle).
    #[arg(long)]
    pub library: Option<PathBuf>,
    /// Show this material with its table instead of listing all.
    pub key: Option<String>,
}

/// Runs `materials`.
pub fn run(a: &MaterialsArgs) -> i32 {
    let (name, text) = match &a.library {
        None => (EXAMPLE_LIBRARY_NAME.to_string(), EXAMPLE_LIBRARY.to_string()),
        Some(p) => match std::fs::read_to_string(p) {
            Ok(t) => (p.display().to_string(), t),
            Err(e) => {
                eprintln!("error: cannot read library file `{}`: {e}", p.display());
                return EXIT_INPUT;
            }
        },
    };
    let lib = match parse_library(&name, &text) {
        Ok(l) => l,
        Err(e) => {
            eprint!("{}", e.render());
            return EXIT_INPUT;
        }
    };
    match &a.key {
        None => {
            print!("{}", list_text(&lib));
            EXIT_OK
        }
        Some(k) => match lib.materials.get(k) {
            Some(m) => {
                print!("{}", show_text(&lib, m));
                EXIT_OK
            }
            None => {
                let known: Vec<&str> = lib.materials.keys().map(String::as_str).collect();
                eprintln!(
                    "error: library `{}` has no material `{k}`\n  = expected: one of: {}",
                    lib.file,
                    known.join(", ")
                );
                EXIT_INPUT
            }
        },
    }
}

fn header(lib: &Library) -> String {
    let mut out = lib.file.clone();
    if !lib.title.is_empty() {
        out.push_str(&format!("  {}", lib.title));
    }
    out.push('\n');
    if let Some(c) = &lib.caution {
        out.push_str(&format!("caution: {c}\n"));
    }
    out.push('\n');
    out
}

fn table(rows: &[Vec<String>], right: &[usize]) -> String {
    let widths: Vec<usize> =
        (0..rows[0].len()).map(|i| rows.iter().map(|r| r[i].chars().count()).max().unwrap_or(0)).collect();
    let mut out = String::new();
    for (n, row) in rows.iter().enumerate() {
        let cells: Vec<String> = row
            .iter()
            .enumerate()
            .map(|(i, cell)| {
                let pad = " ".repeat(widths[i] - cell.chars().count());
                if right.contains(&i) {
                    format!("{pad}{cell}")
                } else {
                    format!("{cell}{pad}")
                }
            })
            .collect();
        out.push_str(cells.join("  ").trim_end());
        out.push('\n');
        if n == 0 {
            let rule: Vec<String> = widths.iter().map(|w| "-".repeat(*w)).collect();
            out.push_str(&rule.join("  "));
            out.push('\n');
        }
    }
    out
}

/// The list of every material of a library.
pub fn list_text(lib: &Library) -> String {
    let mut rows = vec![vec![
        "key".to_string(),
        "material".to_string(),
        "form".to_string(),
        "min. tensile".to_string(),
        "min. yield".to_string(),
        "table range".to_string(),
    ]];
    for m in lib.materials.values() {
        rows.push(vec![
            m.key.clone(),
            m.name(),
            m.product_form.name().to_string(),
            m.table.show_stress(m.tensile_strength),
            m.table.show_stress(m.yield_strength),
            m.table.range_text(),
        ]);
    }
    format!("{}{}", header(lib), table(&rows, &[3, 4]))
}

/// One material with its table, in the table's own units.
pub fn show_text(lib: &Library, m: &LibraryMaterial) -> String {
    let si = UnitSystem::Si;
    let mut out = header(lib);
    out.push_str(&format!("{}  ({})\n", m.name(), m.key));
    out.push_str(&format!("product form       {}\n", m.product_form.name()));
    out.push_str(&format!(
        "tensile strength   {} ({})\n",
        m.table.show_stress(m.tensile_strength),
        si.display(m.tensile_strength)
    ));
    out.push_str(&format!(
        "yield strength     {} ({})\n",
        m.table.show_stress(m.yield_strength),
        si.display(m.yield_strength)
    ));
    out.push_str(&format!("density            {}\n", si.display(m.density)));
    if !m.note.is_empty() {
        out.push_str(&format!("note               {}\n", m.note));
    }
    out.push_str(&format!("table source       {}\n\n", m.table.source));
    let t = &m.table;
    let mut rows =
        vec![vec![format!("temperature ({})", t.temperature_unit), format!("allowable stress ({})", t.stress_unit)]];
    for r in &t.rows {
        let strip = |s: String, unit: &str| s.strip_suffix(unit).map(|x| x.trim_end().to_string()).unwrap_or(s);
        rows.push(vec![
            strip(t.show_temperature(r.temperature), &t.temperature_unit),
            strip(t.show_stress(r.stress), &t.stress_unit),
        ]);
    }
    out.push_str(&table(&rows, &[0, 1]));
    out.push_str(&format!(
        "\nBetween rows the stress is interpolated linearly; outside {} there is no value.\n",
        t.range_text()
    ));
    out
}
