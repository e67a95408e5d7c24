//! `knuckle keygen --name NAME --out KEYFILE`: a new signing key.

use super::{EXIT_INPUT, EXIT_OK};
use crate::signing::{keys::public_path, SecretKey};
use std::path::PathBuf;

/// Arguments of `keygen`.
#[derive(clap::Args, Debug)]
pub struct Args {
    /// The key holder's name, as it will appear on every signature.
    #[arg(long)]
    pub name: String,
    /// Where to write the secret key file (must not exist); the public key
    /// goes beside it as `KEYFILE.pub`.
    #[arg(long)]
    pub out: PathBuf,
}

/// Runs `keygen`. The secret is never printed.
pub fn run(a: &Args) -> i32 {
    let key = match SecretKey::generate(&a.name) {
        Ok(k) => k,
        Err(e) => {
            eprintln!("error: {e}");
            return EXIT_INPUT;
        }
    };
    if let Err(e) = key.save(&a.out) {
        eprintln!("error: {e}");
        return EXIT_INPUT;
    }
    let public = key.public();
    println!(
        "key for {} written to {} (owner-only), public key to {}\nfingerprint {}",
        public.name,
        a.out.display(),
        public_path(&a.out).display(),
        public.fingerprint()
    );
    EXIT_OK
}
