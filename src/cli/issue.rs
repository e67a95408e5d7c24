//! `knuckle issue PACKAGE_DIR --archive ARCHIVE`: records an issued revision.

use super::{EXIT_INPUT, EXIT_NOT_ACCEPTABLE, EXIT_OK};
use crate::archive::{
    check_issuer, valid_timestamp, Archive, ArchiveError, Clock, FixedClock, IssueOutcome, PreparedPackage, SystemClock,
};
use std::path::PathBuf;

/// Arguments of `issue`.
#[derive(clap::Args, Debug)]
pub struct Args {
    /// The package directory.
    pub package: PathBuf,
    /// The archive folder (created when missing).
    #[arg(long)]
    pub archive: PathBuf,
    /// Who issues the revision (default: the login name).
    #[arg(long)]
    pub by: Option<String>,
    /// The issue time, `YYYY-MM-DDTHH:MM:SSZ` (default: the clock now).
    #[arg(long)]
    pub at: Option<String>,
    /// Which package, when the directory holds several: the document number
    /// or the file stem `<number>_rev<revision>`.
    #[arg(long)]
    pub document: Option<String>,
}

/// Runs `issue`: 0 issued (or already issued identically), 1 the package
/// does not verify, 2 refused or a usage error.
pub fn run(a: &Args) -> i32 {
    let clock: Box<dyn Clock> = match &a.at {
        Some(t) if !valid_timestamp(t) => {
            eprintln!("error: `{t}` is not a time of the form YYYY-MM-DDTHH:MM:SSZ (UTC)");
            return EXIT_INPUT;
        }
        Some(t) => Box::new(FixedClock(t.clone())),
        None => Box::new(SystemClock),
    };
    let by =
        a.by.clone()
            .or_else(|| std::env::var("USER").ok())
            .or_else(|| std::env::var("LOGNAME").ok())
            .unwrap_or_default();
    // Everything is checked before the archive is created or touched.
    let result =
        check_issuer(&by).and_then(|_| PreparedPackage::read(&a.package, a.document.as_deref())).and_then(|package| {
            Archive::open_or_create(&a.archive)
                .and_then(|mut archive| archive.issue_prepared(&package, &by, clock.as_ref()))
        });
    match result {
        Ok(IssueOutcome::Issued(r)) => {
            println!(
                "issued {} revision {} (digest {}) as record {} by {} at {}",
                r.document,
                r.revision,
                &r.digest.get(..16).unwrap_or(&r.digest),
                r.seq,
                r.issued_by,
                r.issued_at
            );
            if let Some(s) = &r.supersedes {
                println!("revision {s} is now superseded");
            }
            if r.design_status != "acceptable" {
                println!("note: the package is marked {}", r.design_status);
            }
            EXIT_OK
        }
        Ok(IssueOutcome::AlreadyIssued(r)) => {
            println!(
                "{} revision {} is issued already with the same files (record {}); nothing changed",
                r.document, r.revision, r.seq
            );
            EXIT_OK
        }
        Err(e @ ArchiveError::PackageInvalid(_)) => {
            eprintln!("error: {e}");
            EXIT_NOT_ACCEPTABLE
        }
        Err(e) => {
            eprintln!("error: {e}");
            EXIT_INPUT
        }
    }
}
