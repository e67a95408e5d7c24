//! `knuckle sign PACKAGE_DIR --role ROLE --key KEYFILE`: signs a package's
//! manifest for one sign-off role.

use super::{EXIT_INPUT, EXIT_NOT_ACCEPTABLE, EXIT_OK};
use crate::signing::{select_manifest, sign_package, Role, SecretKey, SignError};
use std::path::PathBuf;

/// Arguments of `sign`.
#[derive(clap::Args, Debug)]
pub struct Args {
    /// The package directory.
    pub package: PathBuf,
    /// The role signed for.
    #[arg(long, value_enum)]
    pub role: Role,
    /// The signer's secret key file (from `knuckle keygen`).
    #[arg(long)]
    pub key: PathBuf,
    /// Date of signing, YYYY-MM-DD. Without it the document's own date is
    /// used, since Knuckle never reads the clock for a signed statement.
    #[arg(long)]
    pub date: Option<String>,
    /// Replace an existing signature for the role.
    #[arg(long)]
    pub replace: bool,
    /// Which package, when the directory holds several: the document number
    /// or the file stem `<number>_rev<revision>`.
    #[arg(long)]
    pub document: Option<String>,
}

/// Runs `sign`: 0 signed, 1 the package does not verify, 2 usage error.
pub fn run(a: &Args) -> i32 {
    let (path, manifest) = match select_manifest(&a.package, a.document.as_deref()) {
        Ok(x) => x,
        Err(e) => {
            eprintln!("error: {e}");
            return EXIT_INPUT;
        }
    };
    let key = match SecretKey::load(&a.key) {
        Ok(k) => k,
        Err(e) => {
            eprintln!("error: {e}");
            return EXIT_INPUT;
        }
    };
    let date = a.date.clone().unwrap_or_else(|| manifest.document.date.clone());
    match sign_package(&path, a.role, &key, &date, a.replace) {
        Ok(file) => {
            println!(
                "{} revision {}: signed as {} by {} on {date} (key {}); signature in {file}",
                manifest.document.number,
                manifest.document.revision,
                a.role.as_str(),
                key.name,
                key.public().fingerprint()
            );
            EXIT_OK
        }
        Err(e @ SignError::PackageChanged(_)) => {
            eprintln!("error: {e}");
            EXIT_NOT_ACCEPTABLE
        }
        Err(e) => {
            eprintln!("error: {e}");
            EXIT_INPUT
        }
    }
}
