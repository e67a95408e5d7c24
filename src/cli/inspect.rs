//! `knuckle inspect-head CASE --component ID --points FILE.csv --out DIR`.

use super::{read_case, EXIT_INPUT, EXIT_NOT_ACCEPTABLE, EXIT_OK};
use std::path::PathBuf;

/// Arguments of `inspect-head`.
#[derive(clap::Args, Debug)]
pub struct InspectArgs {
    /// The case file that specifies the head.
    pub case: PathBuf,
    /// Id of the head component.
    #[arg(long)]
    pub component: String,
    /// CSV of measured inner-surface points: header `radius [mm],height [mm]`.
    #[arg(long)]
    pub points: PathBuf,
    /// Output folder.
    #[arg(long, short = 'o')]
    pub out: PathBuf,
    /// Paper of the PDF: a4 or letter.
    #[arg(long, default_value = "a4")]
    pub paper: String,
}

/// Runs `inspect-head`.
pub fn run(a: &InspectArgs) -> i32 {
    let paper = match super::compile::parse_paper(&a.paper) {
        Ok(p) => p,
        Err(e) => {
            eprintln!("error: --paper: {e}");
            return EXIT_INPUT;
        }
    };
    let source = match read_case(&a.case) {
        Ok(s) => s,
        Err(code) => return code,
    };
    let ev = match crate::pipeline::evaluate_with(
        &a.case.display().to_string(),
        &source,
        &crate::pipeline::FsLoader::beside(&a.case),
    ) {
        Ok(ev) => ev,
        Err(e) => {
            eprint!("{}", e.render());
            return EXIT_INPUT;
        }
    };
    let pfile = a.points.display().to_string();
    let csv = match std::fs::read_to_string(&a.points) {
        Ok(s) => s,
        Err(e) => {
            eprintln!("error: cannot read points file `{pfile}`: {e}");
            return EXIT_INPUT;
        }
    };
    let points = match crate::inspection::parse_points(&pfile, &csv) {
        Ok(p) => p,
        Err(e) => {
            eprint!("{}", e.render());
            return EXIT_INPUT;
        }
    };
    let record = match crate::inspection::inspect(&ev, &a.component, &pfile, &csv, &points) {
        Ok(r) => r,
        Err(e) => {
            eprintln!("error: {e}");
            return EXIT_INPUT;
        }
    };
    let (files, manifest) = match crate::inspection::record_files(&ev, &record, paper) {
        Ok(x) => x,
        Err(e) => {
            eprintln!("error: cannot render the inspection record: {e}");
            return EXIT_INPUT;
        }
    };
    if let Err(e) = std::fs::create_dir_all(&a.out) {
        eprintln!("error: cannot create `{}`: {e}", a.out.display());
        return EXIT_INPUT;
    }
    for (name, bytes) in &files {
        if let Err(e) = crate::fsio::write_atomic(&a.out.join(name), bytes) {
            eprintln!("error: cannot write `{name}`: {e}");
            return EXIT_INPUT;
        }
    }
    let stem = files
        .iter()
        .find(|(n, _)| n.ends_with(".json"))
        .map(|(n, _)| n.trim_end_matches(".json").to_string())
        .unwrap_or_default();
    let mname = format!("{stem}{}", crate::package::manifest::MANIFEST_SUFFIX);
    if let Err(e) = crate::fsio::write_atomic(&a.out.join(&mname), manifest.to_json().as_bytes()) {
        eprintln!("error: cannot write `{mname}`: {e}");
        return EXIT_INPUT;
    }
    println!(
        "{}: largest deviation {:.3} mm outside (limit {:.3}), {:.3} mm inside (limit {:.3}): {}; wrote {}/{stem}.*",
        record.component,
        record.max_outside,
        record.limits.0,
        record.max_inside,
        record.limits.1,
        if record.pass { "within the UG-81 tolerance" } else { "NOT within the UG-81 tolerance" },
        a.out.display()
    );
    if record.pass {
        EXIT_OK
    } else {
        EXIT_NOT_ACCEPTABLE
    }
}
