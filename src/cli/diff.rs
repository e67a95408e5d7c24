//! `knuckle diff OLD NEW [--md FILE]`: what changed between two revisions.
//! Each side is a case file, a package's results file (`.json`) or a
//! package directory holding one package.

use super::{EXIT_INPUT, EXIT_OK};
use crate::diff::{diff_markdown, diff_snapshots, diff_text, Snapshot};
use crate::pipeline::{evaluate_with, Evaluated, FsLoader};
use crate::signing::select_manifest;
use std::path::{Path, PathBuf};

/// Arguments of `diff`.
#[derive(clap::Args, Debug)]
pub struct Args {
    /// The earlier revision: case file, results file or package directory.
    pub old: PathBuf,
    /// The later revision.
    pub new: PathBuf,
    /// Also write the comparison as Markdown to this file.
    #[arg(long)]
    pub md: Option<PathBuf>,
}

/// One side of the comparison as read.
pub(crate) enum Side {
    Case(Box<Evaluated>),
    Results(serde_json::Value),
}

pub(crate) fn load(path: &Path) -> Result<Side, String> {
    let results_path = if path.is_dir() {
        let (_, m) = select_manifest(path, None)
            .map_err(|e| format!("{e}; or name the package's results file (`<number>_rev<revision>.json`) directly"))?;
        Some(path.join(format!("{}.json", m.stem())))
    } else if path.extension().is_some_and(|e| e == "json") {
        Some(path.to_path_buf())
    } else {
        None
    };
    match results_path {
        Some(p) => {
            let text =
                std::fs::read_to_string(&p).map_err(|e| format!("cannot read results file `{}`: {e}", p.display()))?;
            let v: serde_json::Value =
                serde_json::from_str(&text).map_err(|e| format!("`{}` is not JSON: {e}", p.display()))?;
            Snapshot::from_results(&v).map_err(|e| format!("`{}`: {e}", p.display()))?;
            Ok(Side::Results(v))
        }
        None => {
            let source = std::fs::read_to_string(path)
                .map_err(|e| format!("cannot read case file `{}`: {e}", path.display()))?;
            evaluate_with(&path.display().to_string(), &source, &FsLoader::beside(path))
                .map(|ev| Side::Case(Box::new(ev)))
                .map_err(|e| e.render())
        }
    }
}

/// The "changes since the previous revision" Markdown section for a package
/// of `new`, against `previous` (a case file, results file or package folder).
pub(crate) fn changes_since(previous: &Path, new: &Evaluated) -> Result<String, String> {
    let old = load(previous)?;
    let (o, n) = match &old {
        Side::Case(o) => (Snapshot::from_evaluated(o), Snapshot::from_evaluated(new)),
        Side::Results(_) => {
            let n = crate::results::results_json(&new.design, &new.calculation, &Default::default());
            (Snapshot::from_results(&as_results(&old))?, Snapshot::from_results(&n)?)
        }
    };
    Ok(diff_markdown(&diff_snapshots(&o, &n)))
}

fn as_results(side: &Side) -> serde_json::Value {
    match side {
        Side::Results(v) => v.clone(),
        Side::Case(ev) => crate::results::results_json(&ev.design, &ev.calculation, &Default::default()),
    }
}

/// Runs `diff`: 0 compared (whether or not anything changed), 2 input error.
pub fn run(a: &Args) -> i32 {
    let (old, new) = match (load(&a.old), load(&a.new)) {
        (Ok(o), Ok(n)) => (o, n),
        (Err(e), _) | (_, Err(e)) => {
            eprintln!("error: {}", e.trim_end());
            return EXIT_INPUT;
        }
    };
    // Two case files compare on their full inputs; otherwise both sides are
    // read as results files, so that their inputs are named alike.
    let snapshots = match (&old, &new) {
        (Side::Case(o), Side::Case(n)) => Ok((Snapshot::from_evaluated(o), Snapshot::from_evaluated(n))),
        _ => Snapshot::from_results(&as_results(&old))
            .and_then(|o| Snapshot::from_results(&as_results(&new)).map(|n| (o, n))),
    };
    let (o, n) = match snapshots {
        Ok(x) => x,
        Err(e) => {
            eprintln!("error: {e}");
            return EXIT_INPUT;
        }
    };
    let d = diff_snapshots(&o, &n);
    print!("{}", diff_text(&d));
    if let Some(md) = &a.md {
        if let Err(e) = crate::fsio::write_atomic(md, diff_markdown(&d).as_bytes()) {
            eprintln!("error: cannot write `{}`: {e}", md.display());
            return EXIT_INPUT;
        }
    }
    EXIT_OK
}
