//! `knuckle compile CASE... --out DIR`: compile packages in parallel.

use super::{EXIT_INPUT, EXIT_NOT_ACCEPTABLE, EXIT_OK};
use crate::package::{self, Additions, Formats, Options};
use crate::render::pdf::Paper;
use crate::render::templates::TemplateSet;
use rayon::prelude::*;
use std::io::IsTerminal;
use std::path::{Path, PathBuf};

/// Arguments of `compile`.
#[derive(clap::Args, Debug)]
pub struct CompileArgs {
    /// Case files to compile.
    #[arg(required = true)]
    pub cases: Vec<PathBuf>,
    /// Output folder (created if missing).
    #[arg(long, short = 'o')]
    pub out: PathBuf,
    /// Formats to write, comma-separated: md, pdf, json.
    #[arg(long, default_value = "md,pdf,json")]
    pub format: String,
    /// Paper of the PDF: a4 or letter.
    #[arg(long, default_value = "a4")]
    pub paper: String,
    /// Folder of templates overriding the built-in ones by file name.
    #[arg(long)]
    pub templates: Option<PathBuf>,
}

/// The outcome of one case.
enum Outcome {
    Written { stem: String, acceptable: bool, digest: String },
    InputError(String),
}

/// Parses `--format`.
pub fn parse_formats(s: &str) -> Result<Formats, String> {
    let mut f = Formats { md: false, pdf: false, json: false };
    for part in s.split(',').map(str::trim).filter(|p| !p.is_empty()) {
        match part {
            "md" => f.md = true,
            "pdf" => f.pdf = true,
            "json" => f.json = true,
            other => return Err(format!("unknown format `{other}`; expected a comma-separated list of md, pdf, json")),
        }
    }
    if !(f.md || f.pdf || f.json) {
        return Err("no format chosen; expected a comma-separated list of md, pdf, json".into());
    }
    Ok(f)
}

/// Parses `--paper`.
pub fn parse_paper(s: &str) -> Result<Paper, String> {
    match s.to_ascii_lowercase().as_str() {
        "a4" => Ok(Paper::A4),
        "letter" => Ok(Paper::Letter),
        other => Err(format!("unknown paper `{other}`; expected a4 or letter")),
    }
}

/// Compiles one case into `out`; returns what happened.
fn compile_one(case: &Path, out: &Path, templates: &TemplateSet, options: &Options) -> Outcome {
    let file = case.display().to_string();
    let source = match std::fs::read_to_string(case) {
        Ok(s) => s,
        Err(e) => return Outcome::InputError(format!("error: cannot read case file `{file}`: {e}\n")),
    };
    let ev = match crate::pipeline::evaluate_with(&file, &source, &crate::pipeline::FsLoader::beside(case)) {
        Ok(ev) => ev,
        Err(e) => return Outcome::InputError(e.render()),
    };
    let additions = additions_for(&ev);
    let pkg = match package::compile(&ev, templates, &additions, options) {
        Ok(p) => p,
        Err(e) => return Outcome::InputError(format!("error: {file}: {e}\n")),
    };
    match write_package(out, &pkg) {
        Ok(()) => Outcome::Written { stem: pkg.stem, acceptable: pkg.acceptable, digest: pkg.digest },
        Err(e) => {
            Outcome::InputError(format!("error: {file}: cannot write the package into `{}`: {e}\n", out.display()))
        }
    }
}

/// Geometry rows, figures and JSON additions for the package.
pub fn additions_for(ev: &crate::pipeline::Evaluated) -> Additions {
    let d = &ev.design.document;
    crate::package::heads::additions(ev, &crate::package::manifest::package_stem(&d.number, &d.revision))
}

/// Writes every file atomically, the manifest last: a folder whose manifest
/// is missing or older than its files is visibly incomplete.
pub fn write_package(out: &Path, pkg: &package::Package) -> std::io::Result<()> {
    for (name, bytes) in &pkg.files {
        let path = out.join(name);
        if let Some(parent) = path.parent() {
            std::fs::create_dir_all(parent)?;
        }
        crate::fsio::write_atomic(&path, bytes)?;
    }
    crate::fsio::write_atomic(&out.join(pkg.manifest_name()), pkg.manifest.to_json().as_bytes())
}

/// Runs `compile`.
pub fn run(a: &CompileArgs) -> i32 {
    let formats = match parse_formats(&a.format) {
        Ok(f) => f,
        Err(e) => {
            eprintln!("error: --format: {e}");
            return EXIT_INPUT;
        }
    };
    let paper = match parse_paper(&a.paper) {
        Ok(p) => p,
        Err(e) => {
            eprintln!("error: --paper: {e}");
            return EXIT_INPUT;
        }
    };
    let templates = match &a.templates {
        Some(dir) => match TemplateSet::with_overrides(dir) {
            Ok(t) => t,
            Err(e) => {
                eprintln!("error: {e}");
                return EXIT_INPUT;
            }
        },
        None => TemplateSet::default(),
    };
    if let Err(e) = std::fs::create_dir_all(&a.out) {
        eprintln!("error: cannot create the output folder `{}`: {e}", a.out.display());
        return EXIT_INPUT;
    }
    let options = Options { formats, paper };
    let bar = (a.cases.len() >= 8 && std::io::stderr().is_terminal()).then(|| {
        let b = indicatif::ProgressBar::new(a.cases.len() as u64);
        if let Ok(style) = indicatif::ProgressStyle::with_template("{bar:40} {pos}/{len} cases") {
            b.set_style(style);
        }
        b
    });
    let outcomes: Vec<Outcome> = a
        .cases
        .par_iter()
        .map(|c| {
            let o = compile_one(c, &a.out, &templates, &options);
            if let Some(b) = &bar {
                b.inc(1);
            }
            o
        })
        .collect();
    if let Some(b) = bar {
        b.finish_and_clear();
    }
    let mut code = EXIT_OK;
    for (case, o) in a.cases.iter().zip(outcomes) {
        match o {
            Outcome::Written { stem, acceptable, digest } => {
                let status = if acceptable { "acceptable" } else { "NOT ACCEPTABLE" };
                println!("{}: {status}, wrote {}/{stem}.* (digest {})", case.display(), a.out.display(), &digest[..12]);
                if !acceptable && code == EXIT_OK {
                    code = EXIT_NOT_ACCEPTABLE;
                }
            }
            Outcome::InputError(msg) => {
                eprint!("{msg}");
                println!("{}: input error, nothing written", case.display());
                code = EXIT_INPUT;
            }
        }
    }
    code
}
