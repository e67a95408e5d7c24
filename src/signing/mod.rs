//! Signed sign-off: Ed25519 signatures by role over a package's manifest.
//!
//! A signature binds a canonical statement (see [`statement_text`]): the
//! document number and revision, the role, the signer's name, the date,
//! the package digest and every entry of the manifest's `files` list. The
//! signature file (`signatures/<stem>.<role>.json`, format
//! `knuckle-signature/1`) holds the statement's fields, the signer's public
//! key and the signature; the manifest lists it under `signatures`, which
//! the digest and the `files` list do not cover, so signing changes neither.
//!
//! Architecture invariant: a signature is verified against a statement
//! rebuilt from the manifest being checked, never only against the copy of
//! the statement inside the signature file, so a signature moved to another
//! package or kept after the package changed does not verify.

pub mod keys;

pub use keys::{PublicKey, SecretKey};

use crate::package::manifest::{
    check_files, find_manifests, hex, safe_join, sha256_hex, FileState, Manifest, SignatureEntry,
};
use ed25519_dalek::{Signature, Signer};
use serde::{Deserialize, Serialize};
use std::path::{Path, PathBuf};

/// Format id of signature files.
pub const SIGNATURE_FORMAT: &str = "knuckle-signature/1";
/// First line of every signed statement.
pub const STATEMENT_HEADER: &str = "knuckle-signed-statement/1";
/// Folder of the signature files inside a package.
pub const SIGNATURE_DIR: &str = "signatures";

/// A sign-off role.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Serialize, clap::ValueEnum)]
#[serde(rename_all = "kebab-case")]
pub enum Role {
    /// The engineer who prepared the calculation.
    Prepared,
    /// The checker.
    Checked,
    /// The approver.
    Approved,
}

impl Role {
    /// Every role in sign-off order.
    pub const ALL: [Role; 3] = [Role::Prepared, Role::Checked, Role::Approved];

    /// The role's name as written in files.
    pub fn as_str(self) -> &'static str {
        match self {
            Role::Prepared => "prepared",
            Role::Checked => "checked",
            Role::Approved => "approved",
        }
    }

    /// The role named `s`, if any.
    pub fn parse(s: &str) -> Option<Role> {
        Role::ALL.into_iter().find(|r| r.as_str() == s)
    }
}

/// What a signature file holds.
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct SignatureFile {
    /// Always [`SIGNATURE_FORMAT`].
    pub format: String,
    /// Document number signed.
    pub document: String,
    /// Revision signed.
    pub revision: String,
    /// Role signed for.
    pub role: String,
    /// The signer's name (from the key file).
    pub signer: String,
    /// Date of signing, `YYYY-MM-DD`.
    pub date: String,
    /// Package digest signed.
    pub digest: String,
    /// Hex Ed25519 public key of the signer.
    pub public_key: String,
    /// Short fingerprint of that key.
    pub fingerprint: String,
    /// Hex Ed25519 signature of the canonical statement.
    pub signature: String,
}

/// The canonical statement that is signed. Every value is written as a JSON
/// string literal, so no name or file name can inject a line of its own;
/// the file list is the manifest's, in the manifest's order.
pub fn statement_text(manifest: &Manifest, role: &str, signer: &str, date: &str) -> String {
    let q = |s: &str| serde_json::to_string(s).unwrap_or_default();
    let mut out = String::new();
    out.push_str(STATEMENT_HEADER);
    out.push('\n');
    out.push_str(&format!("document: {}\n", q(&manifest.document.number)));
    out.push_str(&format!("revision: {}\n", q(&manifest.document.revision)));
    out.push_str(&format!("role: {}\n", q(role)));
    out.push_str(&format!("signer: {}\n", q(signer)));
    out.push_str(&format!("date: {}\n", q(date)));
    out.push_str(&format!("digest: {}\n", q(&manifest.digest)));
    for f in &manifest.files {
        out.push_str(&format!("file: {} {} {}\n", q(&f.sha256), f.bytes, q(&f.name)));
    }
    out
}

/// Checks a `YYYY-MM-DD` date (real month and day, leap years included);
/// the one definition is the case file's.
pub fn valid_date(s: &str) -> bool {
    crate::model::valid_iso_date(s)
}

/// Finds the manifest to work on in a package directory. With several
/// manifests, `document` chooses one: either the file stem
/// (`<number>_rev<revision>`) or a document number held by exactly one.
pub fn select_manifest(dir: &Path, document: Option<&str>) -> Result<(PathBuf, Manifest), String> {
    let paths = find_manifests(dir).map_err(|e| format!("cannot read package directory `{}`: {e}", dir.display()))?;
    if paths.is_empty() {
        return Err(format!("`{}` holds no package manifest (`*.manifest.json`)", dir.display()));
    }
    let mut loaded = Vec::new();
    for p in paths {
        let text = std::fs::read_to_string(&p).map_err(|e| format!("cannot read `{}`: {e}", p.display()))?;
        let m = Manifest::from_json(&text).map_err(|e| format!("`{}`: {e}", p.display()))?;
        loaded.push((p, m));
    }
    let names = |l: &[(PathBuf, Manifest)]| l.iter().map(|(_, m)| m.stem()).collect::<Vec<_>>().join(", ");
    match document {
        None if loaded.len() == 1 => Ok(loaded.remove(0)),
        None => {
            Err(format!("`{}` holds several packages ({}); choose one with --document", dir.display(), names(&loaded)))
        }
        Some(want) => {
            let all = names(&loaded);
            let mut hits: Vec<_> =
                loaded.into_iter().filter(|(_, m)| m.stem() == want || m.document.number == want).collect();
            match hits.len() {
                1 => Ok(hits.remove(0)),
                0 => Err(format!("no package `{want}` in `{}` (it holds {all})", dir.display())),
                _ => Err(format!(
                    "several revisions of `{want}` in `{}` ({}); give the full name `<number>_rev<revision>`",
                    dir.display(),
                    names(&hits)
                )),
            }
        }
    }
}

/// Why signing was refused.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum SignError {
    /// The package's files do not match its manifest (names the files).
    PackageChanged(Vec<String>),
    /// The role is signed already and `replace` was not asked for.
    AlreadySigned {
        /// The role.
        role: Role,
        /// Who signed it.
        signer: String,
    },
    /// Anything else: bad date, unwritable file.
    Other(String),
}

impl std::fmt::Display for SignError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            SignError::PackageChanged(files) => write!(
                f,
                "the package does not match its manifest ({}); a changed package cannot be signed",
                files.join(", ")
            ),
            SignError::AlreadySigned { role, signer } => write!(
                f,
                "the `{}` role is signed already (by {signer}); give --replace to sign it again",
                role.as_str()
            ),
            SignError::Other(m) => f.write_str(m),
        }
    }
}

/// Signs the package whose manifest is at `manifest_path` for `role`,
/// writing the signature file and the updated manifest. Returns the
/// signature file's name relative to the package directory.
pub fn sign_package(
    manifest_path: &Path,
    role: Role,
    key: &SecretKey,
    date: &str,
    replace: bool,
) -> Result<String, SignError> {
    let dir = manifest_path.parent().filter(|p| !p.as_os_str().is_empty()).unwrap_or(Path::new("."));
    let text = std::fs::read_to_string(manifest_path)
        .map_err(|e| SignError::Other(format!("cannot read `{}`: {e}", manifest_path.display())))?;
    let mut manifest =
        Manifest::from_json(&text).map_err(|e| SignError::Other(format!("`{}`: {e}", manifest_path.display())))?;
    if !valid_date(date) {
        return Err(SignError::Other(format!("`{date}` is not a date of the form YYYY-MM-DD")));
    }
    let changed: Vec<String> = check_files(dir, &manifest)
        .into_iter()
        .filter(|(_, s)| *s != FileState::Intact)
        .map(|(f, s)| format!("{} {}", f.name, state_word(&s)))
        .collect();
    if !changed.is_empty() {
        return Err(SignError::PackageChanged(changed));
    }
    if let Some(existing) = manifest.signatures.iter().find(|s| s.role == role.as_str()) {
        if !replace {
            let signer = safe_join(dir, &existing.file)
                .and_then(|p| std::fs::read_to_string(p).ok())
                .and_then(|t| serde_json::from_str::<SignatureFile>(&t).ok())
                .map(|s| s.signer)
                .unwrap_or_else(|| "an unreadable signature".into());
            return Err(SignError::AlreadySigned { role, signer });
        }
    }
    let statement = statement_text(&manifest, role.as_str(), &key.name, date);
    let signature = key.key.sign(statement.as_bytes());
    let public = key.public();
    let file = SignatureFile {
        format: SIGNATURE_FORMAT.into(),
        document: manifest.document.number.clone(),
        revision: manifest.document.revision.clone(),
        role: role.as_str().into(),
        signer: key.name.clone(),
        date: date.into(),
        digest: manifest.digest.clone(),
        public_key: hex(public.key.as_bytes()),
        fingerprint: public.fingerprint(),
        signature: hex(&signature.to_bytes()),
    };
    let mut body = serde_json::to_string_pretty(&file)
        .map_err(|e| SignError::Other(format!("cannot write the signature: {e}")))?;
    body.push('\n');
    let rel = format!("{SIGNATURE_DIR}/{}.{}.json", manifest.stem(), role.as_str());
    let path = safe_join(dir, &rel)
        .ok_or_else(|| SignError::Other(format!("the document number makes an unsafe file name `{rel}`")))?;
    let io = |e: std::io::Error, p: &Path| SignError::Other(format!("cannot write `{}`: {e}", p.display()));
    std::fs::create_dir_all(dir.join(SIGNATURE_DIR)).map_err(|e| io(e, &dir.join(SIGNATURE_DIR)))?;
    // The signature file first, the manifest second: an interruption in
    // between leaves the old manifest, which still verifies on its own.
    crate::fsio::write_atomic(&path, body.as_bytes()).map_err(|e| io(e, &path))?;
    manifest.signatures.retain(|s| s.role != role.as_str());
    manifest.signatures.push(SignatureEntry {
        role: role.as_str().into(),
        file: rel.clone(),
        sha256: sha256_hex(body.as_bytes()),
    });
    manifest.signatures.sort_by_key(|s| Role::parse(&s.role).map(|r| r as u8).unwrap_or(u8::MAX));
    crate::fsio::write_atomic(manifest_path, manifest.to_json().as_bytes()).map_err(|e| io(e, manifest_path))?;
    Ok(rel)
}

fn state_word(s: &FileState) -> &'static str {
    match s {
        FileState::Intact => "intact",
        FileState::Changed => "changed",
        FileState::Missing => "missing",
    }
}

/// The outcome of checking one signature.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
#[serde(tag = "state", content = "detail", rename_all = "kebab-case")]
pub enum SignatureState {
    /// The signature is good for this manifest.
    Valid,
    /// The signature file is missing or unreadable.
    Unreadable(String),
    /// The signature file differs from the hash the manifest lists for it.
    FileChanged,
    /// The statement names another document, revision, role, digest or
    /// file list than this manifest: moved from another package, or the
    /// package changed after signing.
    OtherPackage(String),
    /// The cryptographic check failed.
    BadSignature,
}

/// The report on one signature listed in a manifest.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct SignatureReport {
    /// Role as listed in the manifest.
    pub role: String,
    /// Signature file (relative to the package).
    pub file: String,
    /// Signer's name as signed (empty when unreadable).
    pub signer: String,
    /// Date as signed.
    pub date: String,
    /// Fingerprint of the signing key.
    pub fingerprint: String,
    /// The signature itself.
    pub state: SignatureState,
    /// The signing key is in the trust list given.
    pub trusted: bool,
    /// Name under which the trust list holds the key, when trusted.
    pub trusted_as: Option<String>,
    /// Every package file still matches the manifest the signature binds.
    pub package_intact: bool,
}

impl SignatureReport {
    /// True when this signature is evidence of sign-off: cryptographically
    /// valid for this package, by a trusted key, and the files unchanged.
    pub fn approves(&self) -> bool {
        self.state == SignatureState::Valid && self.trusted && self.package_intact
    }
}

/// Checks every signature the manifest lists, for the package in `dir`.
pub fn verify_signatures(dir: &Path, manifest: &Manifest, trusted: &[PublicKey]) -> Vec<SignatureReport> {
    let package_intact = check_files(dir, manifest).iter().all(|(_, s)| *s == FileState::Intact);
    manifest.signatures.iter().map(|entry| verify_one(dir, manifest, entry, trusted, package_intact)).collect()
}

fn verify_one(
    dir: &Path,
    manifest: &Manifest,
    entry: &SignatureEntry,
    trusted: &[PublicKey],
    package_intact: bool,
) -> SignatureReport {
    let mut report = SignatureReport {
        role: entry.role.clone(),
        file: entry.file.clone(),
        signer: String::new(),
        date: String::new(),
        fingerprint: String::new(),
        state: SignatureState::Valid,
        trusted: false,
        trusted_as: None,
        package_intact,
    };
    let bytes = match safe_join(dir, &entry.file).map(std::fs::read) {
        None => {
            report.state = SignatureState::Unreadable("the file name leaves the package".into());
            return report;
        }
        Some(Err(e)) => {
            report.state = SignatureState::Unreadable(format!("cannot read it: {e}"));
            return report;
        }
        Some(Ok(b)) => b,
    };
    let file: SignatureFile = match std::str::from_utf8(&bytes)
        .map_err(|e| e.to_string())
        .and_then(|t| serde_json::from_str(t).map_err(|e| e.to_string()))
    {
        Ok(f) => f,
        Err(e) => {
            report.state = SignatureState::Unreadable(format!("not a signature file: {e}"));
            return report;
        }
    };
    report.signer = file.signer.clone();
    report.date = file.date.clone();
    let key = keys::verifying_key_from_hex(&file.public_key);
    report.fingerprint = match &key {
        Ok(k) => keys::fingerprint(k),
        Err(_) => file.fingerprint.clone(),
    };
    if let Ok(k) = &key {
        if let Some(t) = trusted.iter().find(|t| t.key == *k) {
            report.trusted = true;
            report.trusted_as = Some(t.name.clone());
        }
    }
    report.state = (|| {
        if file.format != SIGNATURE_FORMAT {
            return SignatureState::Unreadable(format!("unknown format `{}`", file.format));
        }
        if sha256_hex(&bytes) != entry.sha256 {
            return SignatureState::FileChanged;
        }
        let mut mismatch = Vec::new();
        if file.document != manifest.document.number {
            mismatch.push(format!("document {}", file.document));
        }
        if file.revision != manifest.document.revision {
            mismatch.push(format!("revision {}", file.revision));
        }
        if file.role != entry.role {
            mismatch.push(format!("role {}", file.role));
        }
        if file.digest != manifest.digest {
            mismatch.push(format!("digest {}", short(&file.digest)));
        }
        if !mismatch.is_empty() {
            return SignatureState::OtherPackage(format!("signed for {}", mismatch.join(", ")));
        }
        let Ok(k) = key else {
            return SignatureState::Unreadable("the public key is not a valid Ed25519 key".into());
        };
        let Some(sig) = keys::decode_hex(&file.signature)
            .and_then(|b| <[u8; 64]>::try_from(b.as_slice()).ok())
            .map(|b| Signature::from_bytes(&b))
        else {
            return SignatureState::BadSignature;
        };
        // Rebuilt from this manifest: the file list is bound even though the
        // signature file does not repeat it.
        let statement = statement_text(manifest, &entry.role, &file.signer, &file.date);
        match k.verify_strict(statement.as_bytes(), &sig) {
            Ok(()) => SignatureState::Valid,
            Err(_) => SignatureState::BadSignature,
        }
    })();
    report
}

fn short(h: &str) -> &str {
    h.get(..16).unwrap_or(h)
}

/// Roles expected to sign the package, in sign-off order. The package's
/// results file (`<stem>.json`) may carry a `sign_off` table with the
/// names (`prepared_by`, `checked_by`, `approved_by`); a role with an empty
/// name is then not expected. Without one, all three roles are expected.
pub fn expected_roles(dir: &Path, manifest: &Manifest) -> Vec<(Role, Option<String>)> {
    let sign_off = safe_join(dir, &format!("{}.json", manifest.stem()))
        .and_then(|p| std::fs::read_to_string(p).ok())
        .and_then(|t| serde_json::from_str::<serde_json::Value>(&t).ok())
        .and_then(|v| v.get("sign_off").cloned())
        .filter(|v| v.is_object());
    Role::ALL
        .into_iter()
        .filter_map(|r| match &sign_off {
            None => Some((r, None)),
            Some(so) => {
                let name = so.get(format!("{}_by", r.as_str())).and_then(|n| n.as_str()).map(str::trim).unwrap_or("");
                (!name.is_empty()).then(|| (r, Some(name.to_string())))
            }
        })
        .collect()
}

/// Everything an inspector needs about a package's sign-off.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct SignOffReport {
    /// Document number.
    pub document: String,
    /// Revision.
    pub revision: String,
    /// Package digest.
    pub digest: String,
    /// Every package file matches the manifest.
    pub package_intact: bool,
    /// One report per listed signature.
    pub signatures: Vec<SignatureReport>,
    /// Expected roles with no valid signature.
    pub missing_roles: Vec<Role>,
}

impl SignOffReport {
    /// True when every expected role carries a signature that approves.
    pub fn complete(&self) -> bool {
        self.package_intact && self.missing_roles.is_empty() && self.signatures.iter().all(|s| s.approves())
    }
}

/// The full sign-off report: signatures, and which expected roles have no
/// valid signature (an invalid signature does not fill its role).
pub fn signoff_report(dir: &Path, manifest: &Manifest, trusted: &[PublicKey]) -> SignOffReport {
    let signatures = verify_signatures(dir, manifest, trusted);
    let missing_roles = expected_roles(dir, manifest)
        .into_iter()
        .map(|(r, _)| r)
        .filter(|r| !signatures.iter().any(|s| s.role == r.as_str() && s.state == SignatureState::Valid))
        .collect();
    SignOffReport {
        document: manifest.document.number.clone(),
        revision: manifest.document.revision.clone(),
        digest: manifest.digest.clone(),
        package_intact: signatures
            .first()
            .map(|s| s.package_intact)
            .unwrap_or_else(|| check_files(dir, manifest).iter().all(|(_, s)| *s == FileState::Intact)),
        signatures,
        missing_roles,
    }
}

/// The sign-off report in plain words, one line per signature.
pub fn format_signoff_text(r: &SignOffReport) -> String {
    let mut out = format!("sign-off of {} revision {} (digest {})\n", r.document, r.revision, short(&r.digest));
    if r.signatures.is_empty() {
        out.push_str("  no signatures\n");
    }
    for s in &r.signatures {
        let what = match &s.state {
            SignatureState::Valid => "valid signature".to_string(),
            SignatureState::Unreadable(m) => {
                format!("INVALID: the signature file is unreadable ({m})")
            }
            SignatureState::FileChanged => "INVALID: the signature file was changed after signing".to_string(),
            SignatureState::OtherPackage(m) => {
                format!("INVALID: the signature belongs to another package or an earlier state of this one ({m})")
            }
            SignatureState::BadSignature => "INVALID: the signature does not match this package".to_string(),
        };
        let who = if s.signer.is_empty() {
            "unknown signer".to_string()
        } else {
            format!("{} on {}, key {}", s.signer, s.date, s.fingerprint)
        };
        let trust = match (&s.state, s.trusted, &s.trusted_as) {
            (SignatureState::Valid, true, Some(n)) => format!("; key trusted (as {n})"),
            (SignatureState::Valid, _, _) => "; key NOT in the trust list, so this is no approval".to_string(),
            _ => String::new(),
        };
        let files = if s.state == SignatureState::Valid && !s.package_intact {
            "; but the package files no longer match the manifest"
        } else {
            ""
        };
        out.push_str(&format!("  {:<9} {what}: {who}{trust}{files}\n", s.role));
    }
    if !r.missing_roles.is_empty() {
        let names: Vec<&str> = r.missing_roles.iter().map(|x| x.as_str()).collect();
        out.push_str(&format!("  missing: no valid signature for {}\n", names.join(", ")));
    }
    out.push_str(if r.complete() { "  sign-off complete\n" } else { "  sign-off NOT complete\n" });
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn dates_are_checked() {
        assert!(valid_date("2024-02-29"));
        assert!(!valid_date("2023-02-29"));
        assert!(!valid_date("2023-13-01"));
        assert!(!valid_date("2023-1-01"));
        assert!(!valid_date("2023-01-0a"));
    }

    #[test]
    fn statement_quotes_every_value() {
        let m = Manifest {
            format: crate::package::manifest::MANIFEST_FORMAT.into(),
            tool: crate::package::manifest::ToolId { name: "knuckle".into(), version: "0".into() },
            document: crate::package::manifest::DocumentId {
                number: "D-1".into(),
                revision: "A".into(),
                date: "2026-01-01".into(),
                title: "t".into(),
            },
            rules: "asme-viii-1".into(),
            edition: "2023".into(),
            digest: "ab".into(),
            status: "acceptable".into(),
            files: vec![],
            signatures: vec![],
        };
        let s = statement_text(&m, "checked", "X\ndigest: \"ff\"", "2026-01-02");
        // The injected newline stays inside one quoted value.
        assert_eq!(s.lines().filter(|l| l.starts_with("digest:")).count(), 1);
        assert!(s.contains("signer: \"X\\ndigest: \\\"ff\\\"\""));
    }
}
