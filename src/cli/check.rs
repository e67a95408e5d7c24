//! `knuckle check CASE [--json]`: evaluate and print.

use super::{read_case, EXIT_INPUT, EXIT_NOT_ACCEPTABLE, EXIT_OK};
use crate::pipeline::{evaluate_with, Evaluated, FsLoader};
use crate::units::UnitSystem;
use std::path::PathBuf;

/// Arguments of `check`.
#[derive(clap::Args, Debug)]
pub struct CheckArgs {
    /// The case file.
    pub case: PathBuf,
    /// Print the results as JSON (format knuckle-results/1).
    #[arg(long)]
    pub json: bool,
}

/// Runs `check`.
pub fn run(a: &CheckArgs) -> i32 {
    let source = match read_case(&a.case) {
        Ok(s) => s,
        Err(code) => return code,
    };
    let file = a.case.display().to_string();
    let ev = match evaluate_with(&file, &source, &FsLoader::beside(&a.case)) {
        Ok(ev) => ev,
        Err(e) => {
            eprint!("{}", e.render());
            return EXIT_INPUT;
        }
    };
    if a.json {
        let v = crate::results::results_json(&ev.design, &ev.calculation, &Default::default());
        match serde_json::to_string_pretty(&v) {
            Ok(s) => println!("{s}"),
            Err(e) => {
                eprintln!("error: cannot write JSON: {e}");
                return EXIT_INPUT;
            }
        }
    } else {
        print!("{}", summary_text(&ev));
    }
    if ev.calculation.acceptable() {
        EXIT_OK
    } else {
        EXIT_NOT_ACCEPTABLE
    }
}

fn opt(u: UnitSystem, q: Option<crate::units::Quantity>, up: bool) -> String {
    match q {
        None => "n/a".to_string(),
        Some(q) => {
            let s = if up { u.display_up(q) } else { u.display_down(q) };
            // The unit is in the column header.
            s.split(' ').next().unwrap_or("").to_string()
        }
    }
}

/// The terminal summary: one row per component, then the vessel.
pub fn summary_text(ev: &Evaluated) -> String {
    let d = &ev.design;
    let c = &ev.calculation;
    let u = d.units;
    let lu = u.unit(crate::units::Kind::Length).0;
    let pu = u.unit(crate::units::Kind::Pressure).0;
    let mut out = String::new();
    out.push_str(&format!("{} revision {}  {}\n", d.document.number, d.document.revision, d.document.title));
    out.push_str(&format!("{} (edition {}), report units {}\n\n", c.rule_set_title, c.edition, u.name()));
    let header = [
        "component".to_string(),
        "type".to_string(),
        format!("t required ({lu})"),
        format!("t minimum ({lu})"),
        format!("t nominal ({lu})"),
        format!("MAWP ({pu})"),
        "status".to_string(),
    ];
    let mut rows = vec![header.to_vec()];
    for r in &c.components {
        rows.push(vec![
            r.id.clone(),
            r.type_name.clone(),
            opt(u, r.required_thickness, true),
            opt(u, r.minimum_thickness, true),
            match (r.nominal_thickness, r.selected_thickness) {
                (Some(t), _) => opt(u, Some(t), true),
                (None, Some(t)) => format!("{} sel.", opt(u, Some(t), true)),
                (None, None) => "not given".into(),
            },
            opt(u, r.mawp, false),
            if r.acceptable { "acceptable".into() } else { "NOT ACCEPTABLE".into() },
        ]);
    }
    let widths: Vec<usize> =
        (0..rows[0].len()).map(|i| rows.iter().map(|r| r[i].chars().count()).max().unwrap_or(0)).collect();
    for (n, row) in rows.iter().enumerate() {
        let cells: Vec<String> = row
            .iter()
            .enumerate()
            .map(|(i, cell)| {
                let pad = widths[i] - cell.chars().count();
                if (2..=5).contains(&i) {
                    format!("{}{}", " ".repeat(pad), cell)
                } else {
                    format!("{}{}", cell, " ".repeat(pad))
                }
            })
            .collect();
        out.push_str(cells.join("  ").trim_end());
        out.push('\n');
        if n == 0 {
            out.push_str(&widths.iter().map(|w| "-".repeat(*w)).collect::<Vec<_>>().join("  "));
            out.push('\n');
        }
    }
    let v = &c.vessel;
    out.push('\n');
    out.push_str(&format!(
        "vessel MAWP at the top       {} (governed by {})\n",
        u.display_down(v.mawp),
        if v.governing_component.is_empty() { "no component" } else { &v.governing_component }
    ));
    out.push_str(&format!("hydrostatic test, UG-99(b)   {}\n", u.display_up(v.hydrotest_pressure)));
    out.push_str(&format!("pneumatic test, UG-100       {}\n", u.display_up(v.pneumatic_test_pressure)));
    if let Some(m) = v.empty_mass {
        out.push_str(&format!(
            "empty mass                   {}{}\n",
            u.display(m),
            if v.totals_exclude.is_empty() {
                String::new()
            } else {
                format!(" (without {})", v.totals_exclude.join(", "))
            }
        ));
    }
    if let Some(vol) = v.volume {
        out.push_str(&format!("inside volume                {}\n", u.display(vol)));
    }
    if let Some(m) = v.liquid_mass {
        out.push_str(&format!("liquid mass when full        {}\n", u.display(m)));
    }
    if !v.order_list.is_empty() {
        out.push_str("\norder list:\n");
        for o in &v.order_list {
            let blank = match (o.blank_width, o.blank_length) {
                (Some(w), Some(l)) => format!(", blank {} × {}", u.display(w), u.display(l)),
                (None, Some(l)) => format!(", length {}", u.display(l)),
                _ => o.blank_diameter.map(|d| format!(", blank Ø {}", u.display_up(d))).unwrap_or_default(),
            };
            let thickness = u.display(o.thickness);
            let what = if o.ordered_as.contains(&thickness) {
                o.ordered_as.clone()
            } else {
                format!("{} ({thickness})", o.ordered_as)
            };
            out.push_str(&format!("  {}: {}, {what}{blank}\n", o.component, o.material));
        }
    }
    let cautions = crate::cautions::data(d, c);
    if !cautions.is_empty() {
        out.push_str("\ncautions:\n");
        for k in cautions {
            out.push_str(&format!("  {k}\n"));
        }
    }
    let failed = c.failed_checks();
    if !failed.is_empty() {
        out.push_str("\nfailed checks:\n");
        for (id, k) in failed {
            out.push_str(&format!("  {id}: {} ({}): {}\n", k.name, k.clause, k.note));
        }
    }
    out.push_str(&format!("\nstatus: {}\n", if c.acceptable() { "ACCEPTABLE" } else { "NOT ACCEPTABLE" }));
    out.push_str("\nThis output supports, never replaces, a qualified engineer; verify against the code edition in force\nand local regulations; the calculation is subject to review by a licensed or authorised engineer.\n");
    out
}
