//! The archive: issued revisions stored for good, with a tamper-evident
//! register.
//!
//! An archive folder holds `objects/` (every stored file under its SHA-256,
//! see [`objects`]) and `register.sqlite` (one row per issued revision, a
//! hash chain, see [`register`]).
//!
//! Architecture invariants:
//! - An issued revision is never replaced: issuing the same document and
//!   revision again is a no-op when every file is the same and refused
//!   otherwise.
//! - Objects are written, atomically, before the row that names them is
//!   committed, and the row, the supersede mark and the chain head commit
//!   in one transaction; so a killed `issue` leaves the register as it was
//!   (perhaps with unreferenced objects, which are harmless) or with the
//!   whole revision.
//! - Writers take the database's write lock first (`BEGIN IMMEDIATE`) and
//!   wait for each other with a busy timeout, so two `issue` calls at once
//!   both succeed, one after the other, and the chain stays a single line.
//! - The issue time is the only clock reading in Knuckle; it comes through
//!   the [`Clock`] trait so tests and `--at` can fix it.

pub mod objects;
pub mod register;

use crate::package::manifest::{check_files, sha256_hex, FileState, Manifest};
use crate::signing::{select_manifest, verify_signatures, SignatureState};
use objects::{ObjectState, ObjectStore};
use register::{Record, SignatureRecord, Status, StoredFile, GENESIS};
use rusqlite::{Connection, TransactionBehavior};
use serde::Serialize;
use std::path::{Path, PathBuf};
use std::time::Duration;

/// File name of the register inside an archive.
pub const REGISTER_FILE: &str = "register.sqlite";

/// How long a writer waits for another one to finish.
pub const BUSY_TIMEOUT: Duration = Duration::from_secs(60);

/// Test hook: when this environment variable names a point of `issue`
/// (`after-first-object`, `after-objects`, `before-commit`,
/// `after-commit`), the process aborts there at once, as if killed. Only
/// the crash tests set it.
pub const ABORT_ENV: &str = "KNUCKLE_TEST_ABORT_AT";
/// Test hook: `POINT:MILLISECONDS` makes `issue` wait at that point, so the
/// concurrency tests can hold the write lock while another process comes.
pub const PAUSE_ENV: &str = "KNUCKLE_TEST_PAUSE_AT";

fn test_hook(point: &str) {
    if std::env::var(ABORT_ENV).is_ok_and(|v| v == point) {
        eprintln!("test hook: aborting at {point}");
        std::process::abort();
    }
    if let Ok(v) = std::env::var(PAUSE_ENV) {
        if let Some((p, ms)) = v.split_once(':') {
            if p == point {
                if let Ok(ms) = ms.parse::<u64>() {
                    std::thread::sleep(Duration::from_millis(ms));
                }
            }
        }
    }
}

/// A source of the current time, as UTC `YYYY-MM-DDTHH:MM:SSZ`.
pub trait Clock {
    /// The time now.
    fn now(&self) -> String;
}

/// The operating system's clock.
#[derive(Debug, Clone, Copy, Default)]
pub struct SystemClock;

impl Clock for SystemClock {
    fn now(&self) -> String {
        let secs =
            std::time::SystemTime::now().duration_since(std::time::UNIX_EPOCH).map(|d| d.as_secs() as i64).unwrap_or(0);
        format_utc(secs)
    }
}

/// A clock stopped at one time (for `--at` and for tests).
#[derive(Debug, Clone)]
pub struct FixedClock(pub String);

impl Clock for FixedClock {
    fn now(&self) -> String {
        self.0.clone()
    }
}

/// Seconds since 1970 as `YYYY-MM-DDTHH:MM:SSZ`, by the days-to-civil-date
/// conversion of the proleptic Gregorian calendar (from memory).
pub fn format_utc(secs: i64) -> String {
    let days = secs.div_euclid(86_400);
    let rem = secs.rem_euclid(86_400);
    let z = days + 719_468;
    let era = z.div_euclid(146_097);
    let doe = z.rem_euclid(146_097);
    let yoe = (doe - doe / 1460 + doe / 36_524 - doe / 146_096) / 365;
    let doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
    let mp = (5 * doy + 2) / 153;
    let d = doy - (153 * mp + 2) / 5 + 1;
    let m = if mp < 10 { mp + 3 } else { mp - 9 };
    let y = yoe + era * 400 + i64::from(m <= 2);
    format!("{y:04}-{m:02}-{d:02}T{:02}:{:02}:{:02}Z", rem / 3600, rem % 3600 / 60, rem % 60)
}

/// Checks a `YYYY-MM-DDTHH:MM:SSZ` time stamp.
pub fn valid_timestamp(s: &str) -> bool {
    let b = s.as_bytes();
    if b.len() != 20 || b[10] != b'T' || b[13] != b':' || b[16] != b':' || b[19] != b'Z' {
        return false;
    }
    let two = |i: usize| -> Option<u32> {
        let p = &s[i..i + 2];
        p.bytes().all(|c| c.is_ascii_digit()).then(|| p.parse().ok()).flatten()
    };
    crate::signing::valid_date(&s[..10])
        && matches!(two(11), Some(h) if h < 24)
        && matches!(two(14), Some(m) if m < 60)
        && matches!(two(17), Some(x) if x < 60)
}

/// Why an operation on the archive failed.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum ArchiveError {
    /// The package does not verify against its manifest, or a signature in
    /// it is invalid: nothing was stored.
    PackageInvalid(String),
    /// This document and revision were issued before with other content.
    Conflict {
        /// Document number.
        document: String,
        /// Revision.
        revision: String,
        /// Files that differ from the issued ones.
        differing: Vec<String>,
    },
    /// A wrong argument or unreadable input.
    Input(String),
    /// The archive could not be read or written.
    Storage(String),
}

impl std::fmt::Display for ArchiveError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            ArchiveError::PackageInvalid(m) => write!(f, "{m}; nothing was issued"),
            ArchiveError::Conflict {
                document,
                revision,
                differing,
            } => write!(
                f,
                "{document} revision {revision} is issued already with other content ({}); an issued revision is never replaced: issue a new revision",
                differing.join(", ")
            ),
            ArchiveError::Input(m) | ArchiveError::Storage(m) => f.write_str(m),
        }
    }
}

fn storage(e: impl std::fmt::Display) -> ArchiveError {
    ArchiveError::Storage(format!("archive register: {e}"))
}

/// What `issue` did.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum IssueOutcome {
    /// Recorded a new revision.
    Issued(Record),
    /// The same revision with the same files was issued before.
    AlreadyIssued(Record),
}

/// An opened archive folder.
#[derive(Debug)]
pub struct Archive {
    root: PathBuf,
    objects: ObjectStore,
    conn: Connection,
}

impl Archive {
    /// Opens an existing archive.
    pub fn open(root: &Path) -> Result<Archive, ArchiveError> {
        let db = root.join(REGISTER_FILE);
        if !db.is_file() {
            return Err(ArchiveError::Input(format!("`{}` is not an archive (no {REGISTER_FILE})", root.display())));
        }
        Archive::connect(root)
    }

    /// Opens an archive, creating the folder and the register when missing.
    pub fn open_or_create(root: &Path) -> Result<Archive, ArchiveError> {
        std::fs::create_dir_all(root.join(objects::OBJECTS_DIR))
            .map_err(|e| ArchiveError::Storage(format!("cannot create archive `{}`: {e}", root.display())))?;
        let mut a = Archive::connect(root)?;
        let tx = a.conn.transaction_with_behavior(TransactionBehavior::Immediate).map_err(storage)?;
        register::create_schema(&tx).map_err(storage)?;
        tx.commit().map_err(storage)?;
        Ok(a)
    }

    fn connect(root: &Path) -> Result<Archive, ArchiveError> {
        let conn = Connection::open(root.join(REGISTER_FILE)).map_err(storage)?;
        conn.busy_timeout(BUSY_TIMEOUT).map_err(storage)?;
        // Full sync: a committed revision survives a power cut, not only a kill.
        conn.execute_batch("PRAGMA synchronous = FULL;").map_err(storage)?;
        Ok(Archive { root: root.to_path_buf(), objects: ObjectStore::new(root), conn })
    }

    /// The archive folder.
    pub fn root(&self) -> &Path {
        &self.root
    }

    /// Issues the package in `dir` (choosing among several manifests by
    /// `document`), recording who issued it and when.
    pub fn issue(
        &mut self,
        dir: &Path,
        document: Option<&str>,
        issued_by: &str,
        clock: &dyn Clock,
    ) -> Result<IssueOutcome, ArchiveError> {
        let package = PreparedPackage::read(dir, document)?;
        self.issue_prepared(&package, issued_by, clock)
    }

    /// Issues a package already read and checked.
    pub fn issue_prepared(
        &mut self,
        prepared: &PreparedPackage,
        issued_by: &str,
        clock: &dyn Clock,
    ) -> Result<IssueOutcome, ArchiveError> {
        let issued_by = check_issuer(issued_by)?;
        let manifest = &prepared.manifest;
        let package = &prepared.collected;
        // A quick look before writing anything, so that a refused issue
        // leaves not even an unreferenced object behind.
        if let Some(done) = self.already(manifest, &package.files)? {
            return Ok(IssueOutcome::AlreadyIssued(done));
        }
        for (n, (_, bytes)) in package.contents.iter().enumerate() {
            self.objects.put(bytes).map_err(|e| ArchiveError::Storage(format!("cannot store a file: {e}")))?;
            if n == 0 {
                test_hook("after-first-object");
            }
        }
        test_hook("after-objects");

        let tx = self.conn.transaction_with_behavior(TransactionBehavior::Immediate).map_err(storage)?;
        test_hook("after-lock");
        // Again under the write lock: another process may have issued the
        // same revision meanwhile.
        if let Some(r) = register::find(&tx, &manifest.document.number, &manifest.document.revision).map_err(storage)? {
            return compare_existing(r, &package.files);
        }
        let previous = register::current(&tx, &manifest.document.number).map_err(storage)?;
        let last = register::last(&tx).map_err(storage)?;
        let mut record = Record {
            seq: last.as_ref().map(|r| r.seq + 1).unwrap_or(1),
            document: manifest.document.number.clone(),
            revision: manifest.document.revision.clone(),
            date: manifest.document.date.clone(),
            title: manifest.document.title.clone(),
            digest: manifest.digest.clone(),
            design_status: manifest.status.clone(),
            manifest: package.manifest_name.clone(),
            files: package.files.clone(),
            signatures: package.signatures.clone(),
            issued_by: issued_by.to_string(),
            issued_at: clock.now(),
            supersedes: previous.as_ref().map(|p| p.revision.clone()),
            prev_hash: last.as_ref().map(|r| r.record_hash.clone()).unwrap_or_else(|| GENESIS.to_string()),
            record_hash: String::new(),
            status: Status::Current,
            superseded_by: None,
        };
        record.record_hash = record.compute_hash();
        register::insert(&tx, &record).map_err(storage)?;
        if let Some(p) = &previous {
            register::mark_superseded(&tx, p.seq, &record.revision).map_err(storage)?;
        }
        register::set_meta(&tx, "head", &record.record_hash).map_err(storage)?;
        register::set_meta(&tx, "records", &record.seq.to_string()).map_err(storage)?;
        test_hook("before-commit");
        tx.commit().map_err(storage)?;
        test_hook("after-commit");
        Ok(IssueOutcome::Issued(record))
    }

    fn already(&self, manifest: &Manifest, files: &[StoredFile]) -> Result<Option<Record>, ArchiveError> {
        match register::find(&self.conn, &manifest.document.number, &manifest.document.revision).map_err(storage)? {
            None => Ok(None),
            Some(r) => match compare_existing(r, files)? {
                IssueOutcome::AlreadyIssued(r) | IssueOutcome::Issued(r) => Ok(Some(r)),
            },
        }
    }

    /// Every record in issue order.
    pub fn records(&self) -> Result<Vec<Record>, ArchiveError> {
        register::all(&self.conn).map_err(storage)
    }

    /// The current revision of every document, sorted by document number.
    pub fn list(&self) -> Result<Vec<Record>, ArchiveError> {
        let mut out: Vec<Record> = self.records()?.into_iter().filter(|r| r.status == Status::Current).collect();
        out.sort_by(|a, b| a.document.cmp(&b.document));
        Ok(out)
    }

    /// Every issued revision of one document, in issue order.
    pub fn history(&self, document: &str) -> Result<Vec<Record>, ArchiveError> {
        register::of_document(&self.conn, document).map_err(storage)
    }

    /// One revision of a document; the current one when `revision` is `None`.
    pub fn show(&self, document: &str, revision: Option<&str>) -> Result<Record, ArchiveError> {
        let found = match revision {
            Some(rev) => register::find(&self.conn, document, rev).map_err(storage)?,
            None => register::current(&self.conn, document).map_err(storage)?,
        };
        found.ok_or_else(|| {
            ArchiveError::Input(match revision {
                Some(rev) => format!("{document} revision {rev} is not in the register"),
                None => format!("document {document} is not in the register"),
            })
        })
    }

    /// Re-hashes every stored file and walks the chain.
    pub fn verify(&self) -> Result<VerifyReport, ArchiveError> {
        let records = self.records()?;
        let words = register::status_words(&self.conn).map_err(storage)?;
        let mut problems = Vec::new();
        let mut prev = GENESIS.to_string();
        let mut files_checked = 0usize;
        for (i, r) in records.iter().enumerate() {
            let name = format!("record {} ({} revision {})", r.seq, r.document, r.revision);
            if r.seq != i as i64 + 1 {
                problems.push(format!("{name}: expected record {} here; a record was removed", i + 1));
            }
            if r.prev_hash != prev {
                problems.push(format!("{name}: broken link, it does not carry the hash of the record before it"));
            }
            if r.compute_hash() != r.record_hash {
                problems
                    .push(format!("{name}: the row was edited after issue (its hash no longer matches its content)"));
            }
            prev = r.record_hash.clone();
            for f in &r.files {
                files_checked += 1;
                match self.objects.check(&f.sha256, f.bytes) {
                    ObjectState::Intact => {}
                    ObjectState::Changed => {
                        problems.push(format!("{name}: stored file {} was changed (object {})", f.name, f.sha256))
                    }
                    ObjectState::Missing => {
                        problems.push(format!("{name}: stored file {} is missing (object {})", f.name, f.sha256))
                    }
                }
            }
            if let Some(m) = self.stored_manifest(r) {
                if m.digest != r.digest || m.document.number != r.document || m.document.revision != r.revision {
                    problems.push(format!("{name}: the stored manifest names another document, revision or digest"));
                }
            }
        }
        problems.extend(status_problems(&records, &words));
        let head = register::meta(&self.conn, "head").map_err(storage)?;
        let count = register::meta(&self.conn, "records").map_err(storage)?;
        let last_hash = records.last().map(|r| r.record_hash.clone());
        let head_ok = match &last_hash {
            None => head.is_none(),
            Some(h) => head.as_deref() == Some(h.as_str()) && count == Some(records.len().to_string()),
        };
        if !head_ok {
            problems.push(
                "the register's head does not match its last record: records were removed from the end, or the head was edited"
                    .into(),
            );
        }
        Ok(VerifyReport {
            records: records.len(),
            files_checked,
            head: last_hash.unwrap_or_else(|| GENESIS.to_string()),
            problems,
        })
    }

    fn stored_manifest(&self, r: &Record) -> Option<Manifest> {
        let f = r.files.iter().find(|f| f.name == r.manifest)?;
        let bytes = std::fs::read(self.objects.path_of(&f.sha256)?).ok()?;
        Manifest::from_json(std::str::from_utf8(&bytes).ok()?).ok()
    }
}

/// The result of `register verify`.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct VerifyReport {
    /// Records walked.
    pub records: usize,
    /// Stored files re-hashed.
    pub files_checked: usize,
    /// Hash of the last record: write it down elsewhere to detect a
    /// rewritten register later.
    pub head: String,
    /// Every problem found, in words; empty when the archive is intact.
    pub problems: Vec<String>,
}

impl VerifyReport {
    /// True when nothing was found wrong.
    pub fn intact(&self) -> bool {
        self.problems.is_empty()
    }
}

/// Checks the status columns against the chain: the last revision of each
/// document is current, each earlier one superseded by the next, and each
/// record names the revision it superseded.
fn status_problems(records: &[Record], words: &[(i64, String)]) -> Vec<String> {
    let mut out = Vec::new();
    let mut docs: Vec<&str> = records.iter().map(|r| r.document.as_str()).collect();
    docs.sort();
    docs.dedup();
    for doc in docs {
        let revs: Vec<&Record> = records.iter().filter(|r| r.document == doc).collect();
        for (i, r) in revs.iter().enumerate() {
            let next = revs.get(i + 1).map(|n| n.revision.as_str());
            let word = words.iter().find(|(s, _)| *s == r.seq).map(|(_, w)| w.as_str()).unwrap_or("");
            let expected = if next.is_some() { "superseded" } else { "current" };
            if word != expected || r.superseded_by.as_deref() != next {
                out.push(format!(
                    "record {} ({doc} revision {}): marked `{word}`{}, but the chain says {expected}{}",
                    r.seq,
                    r.revision,
                    r.superseded_by.as_deref().map(|b| format!(" by {b}")).unwrap_or_default(),
                    next.map(|n| format!(" by {n}")).unwrap_or_default()
                ));
            }
            let before = i.checked_sub(1).map(|j| revs[j].revision.as_str());
            if r.supersedes.as_deref() != before {
                out.push(format!(
                    "record {} ({doc} revision {}): names the wrong superseded revision",
                    r.seq, r.revision
                ));
            }
        }
    }
    out
}

fn compare_existing(r: Record, files: &[StoredFile]) -> Result<IssueOutcome, ArchiveError> {
    if r.files == files {
        return Ok(IssueOutcome::AlreadyIssued(r));
    }
    let mut differing: Vec<String> = files
        .iter()
        .filter(|f| !r.files.contains(f))
        .map(|f| f.name.clone())
        .chain(
            r.files
                .iter()
                .filter(|f| !files.iter().any(|g| g.name == f.name))
                .map(|f| format!("{} (no longer present)", f.name)),
        )
        .collect();
    differing.sort();
    differing.dedup();
    Err(ArchiveError::Conflict { document: r.document, revision: r.revision, differing })
}

/// Checks the issuer's name.
pub fn check_issuer(issued_by: &str) -> Result<&str, ArchiveError> {
    let issued_by = issued_by.trim();
    if issued_by.is_empty() || issued_by.chars().any(char::is_control) {
        return Err(ArchiveError::Input("say who issues the revision with --by NAME".into()));
    }
    Ok(issued_by)
}

/// A package read from its folder and checked, ready to issue: its files
/// match the manifest and every signature in it is valid.
#[derive(Debug, Clone)]
pub struct PreparedPackage {
    manifest: Manifest,
    collected: Collected,
}

impl PreparedPackage {
    /// Reads and checks the package in `dir` (choosing among several
    /// manifests by `document`). Nothing is written.
    pub fn read(dir: &Path, document: Option<&str>) -> Result<PreparedPackage, ArchiveError> {
        let (manifest_path, manifest) = select_manifest(dir, document).map_err(ArchiveError::Input)?;
        let collected = collect_package(dir, &manifest_path, &manifest)?;
        Ok(PreparedPackage { manifest, collected })
    }

    /// The package's manifest.
    pub fn manifest(&self) -> &Manifest {
        &self.manifest
    }
}

/// The files of a package ready to store.
#[derive(Debug, Clone)]
struct Collected {
    manifest_name: String,
    files: Vec<StoredFile>,
    contents: Vec<(String, Vec<u8>)>,
    signatures: Vec<SignatureRecord>,
}

/// Reads and checks every file of the package: the listed files must match
/// the manifest and every listed signature must be valid for it.
fn collect_package(dir: &Path, manifest_path: &Path, manifest: &Manifest) -> Result<Collected, ArchiveError> {
    let bad: Vec<String> = check_files(dir, manifest)
        .into_iter()
        .filter(|(_, s)| *s != FileState::Intact)
        .map(|(f, s)| format!("{} {}", f.name, if s == FileState::Missing { "missing" } else { "changed" }))
        .collect();
    if !bad.is_empty() {
        return Err(ArchiveError::PackageInvalid(format!(
            "the package does not match its manifest ({})",
            bad.join(", ")
        )));
    }
    let reports = verify_signatures(dir, manifest, &[]);
    let invalid: Vec<String> = reports
        .iter()
        .filter(|r| r.state != SignatureState::Valid)
        .map(|r| format!("{} ({})", r.role, r.file))
        .collect();
    if !invalid.is_empty() {
        return Err(ArchiveError::PackageInvalid(format!("invalid signatures: {}", invalid.join(", "))));
    }
    let manifest_name = manifest_path.file_name().map(|n| n.to_string_lossy().into_owned()).unwrap_or_default();
    let mut names: Vec<String> = manifest.files.iter().map(|f| f.name.clone()).collect();
    names.extend(manifest.signatures.iter().map(|s| s.file.clone()));
    names.push(manifest_name.clone());
    names.sort();
    names.dedup();
    let mut files = Vec::new();
    let mut contents = Vec::new();
    for name in names {
        let path = crate::package::manifest::safe_join(dir, &name)
            .ok_or_else(|| ArchiveError::PackageInvalid(format!("file name `{name}` leaves the package")))?;
        let bytes =
            std::fs::read(&path).map_err(|e| ArchiveError::Input(format!("cannot read `{}`: {e}", path.display())))?;
        files.push(StoredFile { name: name.clone(), sha256: sha256_hex(&bytes), bytes: bytes.len() as u64 });
        contents.push((name, bytes));
    }
    let signatures = reports
        .into_iter()
        .map(|r| SignatureRecord { role: r.role, signer: r.signer, date: r.date, fingerprint: r.fingerprint })
        .collect();
    Ok(Collected { manifest_name, files, contents, signatures })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn utc_formatting() {
        // 2000-01-01 is 946684800 s after the epoch (10957 days of 86400 s,
        // POSIX time); 60 days later is 2000-03-01, just past a leap day.
        assert_eq!(format_utc(951_868_800), "2000-03-01T00:00:00Z");
        assert_eq!(format_utc(0), "1970-01-01T00:00:00Z");
        assert_eq!(format_utc(1_700_000_000), "2023-11-14T22:13:20Z");
    }

    #[test]
    fn timestamps_are_checked() {
        assert!(valid_timestamp("2026-03-01T12:00:00Z"));
        assert!(!valid_timestamp("2026-03-01 12:00:00Z"));
        assert!(!valid_timestamp("2026-03-01T24:00:00Z"));
        assert!(!valid_timestamp("2026-02-30T12:00:00Z"));
    }
}
