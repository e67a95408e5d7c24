//! The package manifest (`<stem>.manifest.json`): which files make up a
//! package and the SHA-256 of each, the package digest and the signatures.
//!
//! The manifest is the inspector's anchor: `verify` re-hashes every listed
//! file against it, signatures bind its `files` list and the digest, and
//! the archive stores files by the hashes it lists.

use serde::{Deserialize, Serialize};
use sha2::{Digest, Sha256};
use std::path::{Path, PathBuf};

/// Manifest format id.
pub const MANIFEST_FORMAT: &str = "knuckle-manifest/1";

/// Suffix of manifest file names.
pub const MANIFEST_SUFFIX: &str = ".manifest.json";

/// Tool identity.
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
pub struct ToolId {
    /// Tool name.
    pub name: String,
    /// Tool version.
    pub version: String,
}

/// Document identity as recorded in the manifest.
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
pub struct DocumentId {
    /// Document number.
    pub number: String,
    /// Revision.
    pub revision: String,
    /// Document date (ISO).
    pub date: String,
    /// Title.
    pub title: String,
}

/// One file of the package.
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
pub struct FileEntry {
    /// Path relative to the package directory, with `/` separators.
    pub name: String,
    /// Lower-case hex SHA-256 of the file's bytes.
    pub sha256: String,
    /// Size in bytes.
    pub bytes: u64,
}

/// A signature file belonging to the package (not part of the digest).
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
pub struct SignatureEntry {
    /// Sign-off role (`prepared`, `checked`, `approved`).
    pub role: String,
    /// Path of the signature file relative to the package directory.
    pub file: String,
    /// SHA-256 of the signature file.
    pub sha256: String,
}

/// The manifest.
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Manifest {
    /// Always [`MANIFEST_FORMAT`].
    pub format: String,
    /// Tool that compiled the package.
    pub tool: ToolId,
    /// Document identity.
    pub document: DocumentId,
    /// Rule set id and edition.
    pub rules: String,
    /// Code edition asserted.
    pub edition: String,
    /// Package digest (hex SHA-256, see `package::digest`).
    pub digest: String,
    /// `acceptable` or `not-acceptable`.
    pub status: String,
    /// Files of the package, sorted by name.
    pub files: Vec<FileEntry>,
    /// Signatures, sorted by role.
    #[serde(default)]
    pub signatures: Vec<SignatureEntry>,
}

/// Lower-case hex SHA-256 of bytes.
pub fn sha256_hex(bytes: &[u8]) -> String {
    hex(&Sha256::digest(bytes))
}

/// Lower-case hex of bytes.
pub fn hex(bytes: &[u8]) -> String {
    const DIGITS: &[u8; 16] = b"0123456789abcdef";
    let mut s = String::with_capacity(bytes.len() * 2);
    for b in bytes {
        s.push(DIGITS[(b >> 4) as usize] as char);
        s.push(DIGITS[(b & 15) as usize] as char);
    }
    s
}

impl Manifest {
    /// A manifest over `files` (name, bytes), listed sorted by name, for the
    /// current tool.
    pub fn over_files(
        document: DocumentId,
        rules: &str,
        edition: &str,
        digest: &str,
        acceptable: bool,
        files: &[(String, Vec<u8>)],
    ) -> Manifest {
        let mut entries: Vec<FileEntry> = files
            .iter()
            .map(|(n, b)| FileEntry { name: n.clone(), sha256: sha256_hex(b), bytes: b.len() as u64 })
            .collect();
        entries.sort_by(|a, b| a.name.cmp(&b.name));
        Manifest {
            format: MANIFEST_FORMAT.to_string(),
            tool: ToolId { name: crate::results::TOOL_NAME.into(), version: crate::results::TOOL_VERSION.into() },
            document,
            rules: rules.to_string(),
            edition: edition.to_string(),
            digest: digest.to_string(),
            status: if acceptable { "acceptable".into() } else { "not-acceptable".into() },
            files: entries,
            signatures: Vec::new(),
        }
    }

    /// The manifest as pretty, deterministic JSON text (with final newline).
    pub fn to_json(&self) -> String {
        let mut s = serde_json::to_string_pretty(self).unwrap_or_default();
        s.push('\n');
        s
    }

    /// Parses manifest text.
    pub fn from_json(text: &str) -> Result<Manifest, String> {
        let m: Manifest = serde_json::from_str(text).map_err(|e| format!("not a valid manifest: {e}"))?;
        if m.format != MANIFEST_FORMAT {
            return Err(format!("unknown manifest format `{}` (expected `{MANIFEST_FORMAT}`)", m.format));
        }
        Ok(m)
    }

    /// File-name stem of the package (`<number>_rev<revision>`).
    pub fn stem(&self) -> String {
        package_stem(&self.document.number, &self.document.revision)
    }
}

/// The file-name stem of a package: `<number>_rev<revision>`.
pub fn package_stem(number: &str, revision: &str) -> String {
    format!("{number}_rev{revision}")
}

/// Finds the manifests in a package directory, sorted by name.
pub fn find_manifests(dir: &Path) -> std::io::Result<Vec<PathBuf>> {
    let mut out: Vec<PathBuf> = std::fs::read_dir(dir)?
        .filter_map(|e| e.ok())
        .map(|e| e.path())
        .filter(|p| p.file_name().map(|n| n.to_string_lossy().ends_with(MANIFEST_SUFFIX)).unwrap_or(false))
        .collect();
    out.sort();
    Ok(out)
}

/// What happened to one listed file.
#[derive(Debug, Clone, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum FileState {
    /// Same bytes as when compiled.
    Intact,
    /// Present but different.
    Changed,
    /// Not found.
    Missing,
}

/// Re-hashes every listed file under `dir`.
pub fn check_files(dir: &Path, m: &Manifest) -> Vec<(FileEntry, FileState)> {
    m.files
        .iter()
        .map(|f| {
            let state = match safe_join(dir, &f.name).and_then(|p| std::fs::read(p).ok()) {
                None => FileState::Missing,
                Some(bytes) if sha256_hex(&bytes) == f.sha256 && bytes.len() as u64 == f.bytes => FileState::Intact,
                Some(_) => FileState::Changed,
            };
            (f.clone(), state)
        })
        .collect()
}

/// Joins a manifest-relative name to a directory, refusing names that would
/// leave the directory (absolute paths, `..`), since a manifest may be hostile.
pub fn safe_join(dir: &Path, name: &str) -> Option<PathBuf> {
    let rel = Path::new(name);
    if name.is_empty() || rel.is_absolute() || rel.components().any(|c| !matches!(c, std::path::Component::Normal(_))) {
        return None;
    }
    Some(dir.join(rel))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn sha256_of_abc() {
        // FIPS 180-2, Appendix B.1: SHA-256("abc").
        assert_eq!(sha256_hex(b"abc"), "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
    }

    #[test]
    fn refuses_paths_leaving_the_package() {
        let d = Path::new("/tmp/pkg");
        assert!(safe_join(d, "../x").is_none());
        assert!(safe_join(d, "/etc/passwd").is_none());
        assert!(safe_join(d, "").is_none());
        assert_eq!(safe_join(d, "figures/a.svg"), Some(PathBuf::from("/tmp/pkg/figures/a.svg")));
    }
}
