//! The register: one SQLite table of issued revisions, each row a record in
//! a hash chain.
//!
//! A record's hash is the SHA-256 of its canonical text
//! ([`Record::canonical_text`]), which includes the previous record's hash,
//! so editing, removing or reordering any row breaks every later link.
//! The status columns (`status`, `superseded_by`) change when a later
//! revision is issued and so are not hashed; they are derived facts that
//! `register verify` recomputes from the chain and compares.

use rusqlite::{params, Connection, OptionalExtension, Row};
use serde::{Deserialize, Serialize};

/// Format id written into the register's metadata.
pub const REGISTER_FORMAT: &str = "knuckle-register/1";
/// First line of a record's canonical text.
pub const RECORD_HEADER: &str = "knuckle-register-record/1";
/// The "previous hash" of the first record.
pub const GENESIS: &str = "0000000000000000000000000000000000000000000000000000000000000000";

/// One stored file of an issued revision.
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
pub struct StoredFile {
    /// Name inside the package.
    pub name: String,
    /// SHA-256, which is also the object's name in the store.
    pub sha256: String,
    /// Size in bytes.
    pub bytes: u64,
}

/// A signature as recorded at issue.
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
pub struct SignatureRecord {
    /// Role.
    pub role: String,
    /// Signer's name as signed.
    pub signer: String,
    /// Date as signed.
    pub date: String,
    /// Key fingerprint.
    pub fingerprint: String,
}

/// Whether a revision is the one in force.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Status {
    /// The latest issued revision of its document.
    Current,
    /// A later revision has been issued.
    Superseded,
}

impl Status {
    /// The word stored and shown.
    pub fn as_str(self) -> &'static str {
        match self {
            Status::Current => "current",
            Status::Superseded => "superseded",
        }
    }
}

/// One issued revision.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
pub struct Record {
    /// Position in the chain, from 1.
    pub seq: i64,
    /// Document number.
    pub document: String,
    /// Revision.
    pub revision: String,
    /// Document date.
    pub date: String,
    /// Title.
    pub title: String,
    /// Package digest.
    pub digest: String,
    /// The design's status in the manifest (`acceptable`, `not-acceptable`).
    pub design_status: String,
    /// Name of the manifest among the stored files.
    pub manifest: String,
    /// Every stored file, sorted by name.
    pub files: Vec<StoredFile>,
    /// Signatures present at issue, in role order.
    pub signatures: Vec<SignatureRecord>,
    /// Who issued it.
    pub issued_by: String,
    /// When (UTC, `YYYY-MM-DDTHH:MM:SSZ`).
    pub issued_at: String,
    /// The revision this one superseded, if any.
    pub supersedes: Option<String>,
    /// Hash of the previous record ([`GENESIS`] for the first).
    pub prev_hash: String,
    /// Hash of this record's canonical text.
    pub record_hash: String,
    /// Current or superseded (not hashed, see the module notes).
    pub status: Status,
    /// The revision that superseded this one.
    pub superseded_by: Option<String>,
}

impl Record {
    /// The canonical text that is hashed: one field a line, strings as JSON
    /// literals so no value can forge a line.
    pub fn canonical_text(&self) -> String {
        let q = |s: &str| serde_json::to_string(s).unwrap_or_default();
        let mut out = format!("{RECORD_HEADER}\n");
        out.push_str(&format!("seq: {}\n", self.seq));
        out.push_str(&format!("document: {}\n", q(&self.document)));
        out.push_str(&format!("revision: {}\n", q(&self.revision)));
        out.push_str(&format!("date: {}\n", q(&self.date)));
        out.push_str(&format!("title: {}\n", q(&self.title)));
        out.push_str(&format!("digest: {}\n", q(&self.digest)));
        out.push_str(&format!("design-status: {}\n", q(&self.design_status)));
        out.push_str(&format!("manifest: {}\n", q(&self.manifest)));
        for f in &self.files {
            out.push_str(&format!("file: {} {} {}\n", q(&f.sha256), f.bytes, q(&f.name)));
        }
        for s in &self.signatures {
            out.push_str(&format!("signature: {} {} {} {}\n", q(&s.role), q(&s.signer), q(&s.date), q(&s.fingerprint)));
        }
        out.push_str(&format!("issued-by: {}\n", q(&self.issued_by)));
        out.push_str(&format!("issued-at: {}\n", q(&self.issued_at)));
        out.push_str(&format!("supersedes: {}\n", q(self.supersedes.as_deref().unwrap_or(""))));
        out.push_str(&format!("prev: {}\n", q(&self.prev_hash)));
        out
    }

    /// The hash of [`canonical_text`](Self::canonical_text).
    pub fn compute_hash(&self) -> String {
        crate::package::manifest::sha256_hex(self.canonical_text().as_bytes())
    }
}

/// Creates the tables when missing. Runs inside the caller's transaction.
pub fn create_schema(conn: &Connection) -> rusqlite::Result<()> {
    conn.execute_batch(
        "CREATE TABLE IF NOT EXISTS register_meta (
             key TEXT PRIMARY KEY,
             value TEXT NOT NULL
         );
         CREATE TABLE IF NOT EXISTS issued (
             seq INTEGER PRIMARY KEY,
             document TEXT NOT NULL,
             revision TEXT NOT NULL,
             date TEXT NOT NULL,
             title TEXT NOT NULL,
             digest TEXT NOT NULL,
             design_status TEXT NOT NULL,
             manifest TEXT NOT NULL,
             files TEXT NOT NULL,
             signatures TEXT NOT NULL,
             issued_by TEXT NOT NULL,
             issued_at TEXT NOT NULL,
             supersedes TEXT,
             prev_hash TEXT NOT NULL,
             record_hash TEXT NOT NULL,
             status TEXT NOT NULL,
             superseded_by TEXT,
             UNIQUE (document, revision)
         );",
    )?;
    conn.execute("INSERT OR IGNORE INTO register_meta (key, value) VALUES ('format', ?1)", params![REGISTER_FORMAT])?;
    Ok(())
}

const COLUMNS: &str = "seq, document, revision, date, title, digest, design_status, manifest, \
     files, signatures, issued_by, issued_at, supersedes, prev_hash, record_hash, status, superseded_by";

fn from_row(row: &Row<'_>) -> rusqlite::Result<Record> {
    let json_err = |i: usize, e: serde_json::Error| {
        rusqlite::Error::FromSqlConversionFailure(i, rusqlite::types::Type::Text, Box::new(e))
    };
    let files: String = row.get(8)?;
    let signatures: String = row.get(9)?;
    let status: String = row.get(15)?;
    Ok(Record {
        seq: row.get(0)?,
        document: row.get(1)?,
        revision: row.get(2)?,
        date: row.get(3)?,
        title: row.get(4)?,
        digest: row.get(5)?,
        design_status: row.get(6)?,
        manifest: row.get(7)?,
        files: serde_json::from_str(&files).map_err(|e| json_err(8, e))?,
        signatures: serde_json::from_str(&signatures).map_err(|e| json_err(9, e))?,
        issued_by: row.get(10)?,
        issued_at: row.get(11)?,
        supersedes: row.get(12)?,
        prev_hash: row.get(13)?,
        record_hash: row.get(14)?,
        // An unknown word reads as superseded; verify reports the mismatch.
        status: if status == "current" { Status::Current } else { Status::Superseded },
        superseded_by: row.get(16)?,
    })
}

/// The raw status words, for verify to compare against the derived ones.
pub fn status_words(conn: &Connection) -> rusqlite::Result<Vec<(i64, String)>> {
    let mut st = conn.prepare("SELECT seq, status FROM issued ORDER BY seq")?;
    let rows = st.query_map([], |r| Ok((r.get(0)?, r.get(1)?)))?;
    rows.collect()
}

/// Every record in chain order.
pub fn all(conn: &Connection) -> rusqlite::Result<Vec<Record>> {
    let mut st = conn.prepare(&format!("SELECT {COLUMNS} FROM issued ORDER BY seq"))?;
    let rows = st.query_map([], from_row)?;
    rows.collect()
}

/// The records of one document in chain order.
pub fn of_document(conn: &Connection, document: &str) -> rusqlite::Result<Vec<Record>> {
    let mut st = conn.prepare(&format!("SELECT {COLUMNS} FROM issued WHERE document = ?1 ORDER BY seq"))?;
    let rows = st.query_map(params![document], from_row)?;
    rows.collect()
}

/// The record of one revision.
pub fn find(conn: &Connection, document: &str, revision: &str) -> rusqlite::Result<Option<Record>> {
    conn.query_row(
        &format!("SELECT {COLUMNS} FROM issued WHERE document = ?1 AND revision = ?2"),
        params![document, revision],
        from_row,
    )
    .optional()
}

/// The last record of the chain.
pub fn last(conn: &Connection) -> rusqlite::Result<Option<Record>> {
    conn.query_row(&format!("SELECT {COLUMNS} FROM issued ORDER BY seq DESC LIMIT 1"), [], from_row).optional()
}

/// The current revision of a document.
pub fn current(conn: &Connection, document: &str) -> rusqlite::Result<Option<Record>> {
    conn.query_row(
        &format!("SELECT {COLUMNS} FROM issued WHERE document = ?1 AND status = 'current' ORDER BY seq DESC LIMIT 1"),
        params![document],
        from_row,
    )
    .optional()
}

/// Inserts a record (its hash already computed).
pub fn insert(conn: &Connection, r: &Record) -> rusqlite::Result<()> {
    let files = serde_json::to_string(&r.files).unwrap_or_default();
    let signatures = serde_json::to_string(&r.signatures).unwrap_or_default();
    conn.execute(
        &format!(
            "INSERT INTO issued ({COLUMNS}) VALUES (?1, ?2, ?3, ?4, ?5, ?6, ?7, ?8, ?9, ?10, ?11, ?12, ?13, ?14, ?15, ?16, ?17)"
        ),
        params![
            r.seq,
            r.document,
            r.revision,
            r.date,
            r.title,
            r.digest,
            r.design_status,
            r.manifest,
            files,
            signatures,
            r.issued_by,
            r.issued_at,
            r.supersedes,
            r.prev_hash,
            r.record_hash,
            r.status.as_str(),
            r.superseded_by,
        ],
    )?;
    Ok(())
}

/// Marks a revision superseded by `by`.
pub fn mark_superseded(conn: &Connection, seq: i64, by: &str) -> rusqlite::Result<()> {
    conn.execute("UPDATE issued SET status = 'superseded', superseded_by = ?1 WHERE seq = ?2", params![by, seq])?;
    Ok(())
}

/// A metadata value.
pub fn meta(conn: &Connection, key: &str) -> rusqlite::Result<Option<String>> {
    conn.query_row("SELECT value FROM register_meta WHERE key = ?1", params![key], |r| r.get(0)).optional()
}

/// Sets a metadata value.
pub fn set_meta(conn: &Connection, key: &str, value: &str) -> rusqlite::Result<()> {
    conn.execute(
        "INSERT INTO register_meta (key, value) VALUES (?1, ?2)
         ON CONFLICT(key) DO UPDATE SET value = excluded.value",
        params![key, value],
    )?;
    Ok(())
}
