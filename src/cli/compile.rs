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
    /// The previous revision (case file, results file or package folder): adds a
    /// "changes since" section. Only with a single case.
    #[arg(long)]
    pub previous: Option<PathBuf>,
    /// A signed package folder of the same calculation: its valid signatures are
    /// shown in the sign-off table (the digest stays the same).
    #[arg(long)]
    pub signatures: Option<PathBuf>,
    /// Trusted public keys for --signatures (signatures by other keys are refused).
    #[arg(long, num_args = 1..)]
    pub trust: Vec<PathBuf>,
}

/// Extra inputs of a compile beyond the case itself.
struct Extras<'a> {
    previous: Option<&'a Path>,
    signatures: Option<&'a Path>,
    trusted: Vec<crate::signing::PublicKey>,
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
fn compile_one(case: &Path, out: &Path, templates: &TemplateSet, options: &Options, extras: &Extras) -> Outcome {
    let file = case.display().to_string();
    let source = match std::fs::read_to_string(case) {
        Ok(s) => s,
        Err(e) => return Outcome::InputError(format!("error: cannot read case file `{file}`: {e}\n")),
    };
    let ev = match crate::pipeline::evaluate_with(&file, &source, &crate::pipeline::FsLoader::beside(case)) {
        Ok(ev) => ev,
        Err(e) => return Outcome::InputError(e.render()),
    };
    let mut additions = match additions(&ev, extras.previous) {
        Ok(a) => a,
        Err(e) => return Outcome::InputError(e),
    };
    if let Some(dir) = extras.signatures {
        // The digest does not depend on signatures, so the signatures can be
        // checked against it before anything is rendered.
        let digest = package::package_digest(&ev, templates, &additions);
        let stem = crate::package::manifest::package_stem(&ev.design.document.number, &ev.design.document.revision);
        match signatures_for(dir, &stem, &digest, &extras.trusted) {
            Ok(sigs) => additions.signatures = sigs,
            Err(e) => return Outcome::InputError(format!("error: --signatures `{}`: {e}\n", dir.display())),
        }
    }
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

/// The valid, trusted signatures of the signed package `stem` in `dir`,
/// whose digest must equal `digest`.
fn signatures_for(
    dir: &Path,
    stem: &str,
    digest: &str,
    trusted: &[crate::signing::PublicKey],
) -> Result<Vec<(String, String, String, String)>, String> {
    let path = dir.join(format!("{stem}{}", crate::package::manifest::MANIFEST_SUFFIX));
    let text = std::fs::read_to_string(&path).map_err(|e| format!("cannot read `{}`: {e}", path.display()))?;
    let m = crate::package::manifest::Manifest::from_json(&text)?;
    if m.digest != digest {
        return Err(format!(
            "the signed package has digest {} but this case compiles to {}: the signatures are for another calculation",
            &m.digest[..m.digest.len().min(12)],
            &digest[..12]
        ));
    }
    let reports = crate::signing::verify_signatures(dir, &m, trusted);
    if reports.is_empty() {
        return Err("the package carries no signatures".into());
    }
    let mut out = Vec::new();
    for r in reports {
        if !r.approves() {
            return Err(format!(
                "the {} signature ({}) is not a valid signature by a trusted key on the unchanged package; give the signer's public key with --trust",
                r.role,
                if r.signer.is_empty() { "unknown signer" } else { &r.signer }
            ));
        }
        out.push((r.role, r.signer, r.date, r.fingerprint));
    }
    Ok(out)
}

/// The additions of a package of `ev`: head sheets, and with `previous` the
/// "changes since" section. Shared by `compile` and `verify --case`, so that
/// a recompile in memory sees what the compile saw. The error is a message.
pub(crate) fn additions(ev: &crate::pipeline::Evaluated, previous: Option<&Path>) -> Result<Additions, String> {
    let mut additions = Additions::for_case(ev);
    if let Some(prev) = previous {
        let md = super::diff::changes_since(prev, ev)
            .map_err(|e| format!("error: --previous `{}`: {}\n", prev.display(), e.trim_end()))?;
        additions.changes = Some(md);
    }
    Ok(additions)
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
    let templates = match super::load_templates(a.templates.as_deref()) {
        Ok(t) => t,
        Err(code) => return code,
    };
    if let Err(e) = std::fs::create_dir_all(&a.out) {
        eprintln!("error: cannot create the output folder `{}`: {e}", a.out.display());
        return EXIT_INPUT;
    }
    let options = Options { formats, paper };
    if a.previous.is_some() && a.cases.len() != 1 {
        eprintln!("error: --previous compares one revision with another; give a single case file");
        return EXIT_INPUT;
    }
    let trusted = match super::load_trusted(&a.trust) {
        Ok(t) => t,
        Err(code) => return code,
    };
    let extras = Extras { previous: a.previous.as_deref(), signatures: a.signatures.as_deref(), trusted };
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
            let o = compile_one(c, &a.out, &templates, &options, &extras);
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
