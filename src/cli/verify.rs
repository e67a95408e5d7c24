//! `knuckle verify DIR [--case CASE]`: re-hash every file of every package
//! in DIR against its manifest; with `--case`, recompile in memory and
//! confirm the digest and the results.

use super::{EXIT_INPUT, EXIT_NOT_ACCEPTABLE, EXIT_OK};
use crate::package::manifest::{check_files, find_manifests, FileState, Manifest};
use crate::package::{self, Options};
use std::path::{Path, PathBuf};

/// Arguments of `verify`.
#[derive(clap::Args, Debug)]
pub struct VerifyArgs {
    /// The package folder.
    pub dir: PathBuf,
    /// The case file: recompile it and confirm the digest and results match.
    #[arg(long)]
    pub case: Option<PathBuf>,
    /// Template folder the package was compiled with, if not the built-in one.
    #[arg(long)]
    pub templates: Option<PathBuf>,
    /// The previous revision the package's "changes since" section was made from.
    #[arg(long)]
    pub previous: Option<PathBuf>,
    /// Public keys (`.pub` files) whose signatures count as approval.
    #[arg(long, num_args = 1..)]
    pub trust: Vec<PathBuf>,
    /// Fail unless every role named in the case's sign-off has a valid signature by a trusted key.
    #[arg(long)]
    pub require_signoff: bool,
}

/// The verification of one manifest, in plain words.
pub struct Report {
    /// Lines of the report.
    pub lines: Vec<String>,
    /// Everything holds.
    pub ok: bool,
}

/// Verifies one manifest's files.
pub fn verify_manifest(dir: &Path, manifest_path: &Path) -> Result<(Manifest, Report), String> {
    let text = std::fs::read_to_string(manifest_path)
        .map_err(|e| format!("cannot read `{}`: {e}", manifest_path.display()))?;
    let m = Manifest::from_json(&text).map_err(|e| format!("{}: {e}", manifest_path.display()))?;
    let mut lines = vec![format!(
        "Package {} revision {} (digest {}), status {}",
        m.document.number, m.document.revision, m.digest, m.status
    )];
    let mut ok = true;
    for (f, state) in check_files(dir, &m) {
        let words = match state {
            FileState::Intact => "intact",
            FileState::Changed => {
                ok = false;
                "CHANGED since it was compiled"
            }
            FileState::Missing => {
                ok = false;
                "MISSING"
            }
        };
        lines.push(format!("  {:<48} {words}", f.name));
    }
    Ok((m, Report { lines, ok }))
}

/// Runs `verify`.
pub fn run(a: &VerifyArgs) -> i32 {
    let manifests = match find_manifests(&a.dir) {
        Ok(m) => m,
        Err(e) => {
            eprintln!("error: cannot read the package folder `{}`: {e}", a.dir.display());
            return EXIT_INPUT;
        }
    };
    if manifests.is_empty() {
        eprintln!("error: no package manifest (*.manifest.json) in `{}`", a.dir.display());
        return EXIT_NOT_ACCEPTABLE;
    }
    let recompiled = match &a.case {
        None => None,
        Some(case) => {
            let source = match super::read_case(case) {
                Ok(s) => s,
                Err(code) => return code,
            };
            let ev = match crate::pipeline::evaluate_with(
                &case.display().to_string(),
                &source,
                &crate::pipeline::FsLoader::beside(case),
            ) {
                Ok(ev) => ev,
                Err(e) => {
                    eprint!("{}", e.render());
                    return EXIT_INPUT;
                }
            };
            let templates = match super::load_templates(a.templates.as_deref()) {
                Ok(t) => t,
                Err(code) => return code,
            };
            let opts = Options { formats: package::Formats { md: true, pdf: false, json: true }, ..Options::default() };
            let additions = match super::compile::additions(&ev, a.previous.as_deref()) {
                Ok(x) => x,
                Err(e) => {
                    eprint!("{e}");
                    return EXIT_INPUT;
                }
            };
            match package::compile(&ev, &templates, &additions, &opts) {
                Ok(p) => Some(p),
                Err(e) => {
                    eprintln!("error: {e}");
                    return EXIT_INPUT;
                }
            }
        }
    };
    let trusted = match super::load_trusted(&a.trust) {
        Ok(t) => t,
        Err(code) => return code,
    };
    let mut all_ok = true;
    let mut matched_case = recompiled.is_none();
    for mp in &manifests {
        match verify_manifest(&a.dir, mp) {
            Err(e) => {
                println!("{e}");
                all_ok = false;
            }
            Ok((m, report)) => {
                for l in &report.lines {
                    println!("{l}");
                }
                all_ok &= report.ok;
                if let Some(p) = &recompiled {
                    if mp.file_name().is_some_and(|n| n.to_string_lossy() == p.manifest_name()) {
                        matched_case = true;
                        let same_digest = p.digest == m.digest;
                        println!(
                            "  recompiled from the case file: digest {}",
                            if same_digest {
                                "matches"
                            } else {
                                "DIFFERS (the case, the templates or the tool version changed)"
                            }
                        );
                        for (name, bytes) in &p.files {
                            if let Some(entry) = m.files.iter().find(|f| &f.name == name) {
                                let same = crate::package::manifest::sha256_hex(bytes) == entry.sha256;
                                println!("  recompiled {name:<37} {}", if same { "matches" } else { "DIFFERS" });
                                all_ok &= same;
                            }
                        }
                        all_ok &= same_digest;
                    }
                }
                println!(
                    "  verdict: {}",
                    if report.ok {
                        "every file is as compiled"
                    } else {
                        "the package has been altered or is incomplete"
                    }
                );
                let signoff = crate::signing::signoff_report(&a.dir, &m, &trusted);
                for line in crate::signing::format_signoff_text(&signoff).lines() {
                    println!("  {line}");
                }
                // A listed signature that does not hold is a failure; missing
                // roles and untrusted keys fail only when sign-off is required.
                let invalid = signoff.signatures.iter().any(|s| s.state != crate::signing::SignatureState::Valid);
                all_ok &= !invalid;
                if a.require_signoff {
                    all_ok &= signoff.complete();
                }
            }
        }
    }
    if !matched_case {
        println!("the case file's package is not in this folder");
        all_ok = false;
    }
    println!("{}", if all_ok { "VERIFIED" } else { "NOT VERIFIED" });
    if all_ok {
        EXIT_OK
    } else {
        EXIT_NOT_ACCEPTABLE
    }
}
