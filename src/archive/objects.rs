//! The content-addressed object store of an archive: every stored file is
//! kept once under `objects/<first two hex digits>/<sha256>`, whatever its
//! name in the package, so the same figure issued in three revisions takes
//! the room of one and a stored file can be checked by its name alone.

use crate::package::manifest::sha256_hex;
use std::path::{Path, PathBuf};

/// Folder of the objects inside an archive.
pub const OBJECTS_DIR: &str = "objects";

/// What a stored object looks like when re-hashed.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum ObjectState {
    /// Present with the bytes its name promises.
    Intact,
    /// Present but its bytes hash to something else.
    Changed,
    /// Not there.
    Missing,
}

/// The object store under an archive folder.
#[derive(Debug, Clone)]
pub struct ObjectStore {
    root: PathBuf,
}

impl ObjectStore {
    /// The store inside `archive`.
    pub fn new(archive: &Path) -> ObjectStore {
        ObjectStore { root: archive.join(OBJECTS_DIR) }
    }

    /// Where the object with this hash lives, or `None` when the hash is
    /// not 64 lower-case hex digits (a hostile manifest or register row
    /// must not steer a path).
    pub fn path_of(&self, sha256: &str) -> Option<PathBuf> {
        let ok = sha256.len() == 64 && sha256.bytes().all(|c| c.is_ascii_digit() || (b'a'..=b'f').contains(&c));
        ok.then(|| self.root.join(&sha256[..2]).join(sha256))
    }

    /// Stores `bytes` under their hash and returns it. An intact object is
    /// left alone; a damaged one is replaced. The write is atomic, so a
    /// killed process leaves either no object or a whole one.
    pub fn put(&self, bytes: &[u8]) -> std::io::Result<String> {
        let sha = sha256_hex(bytes);
        let path = self.path_of(&sha).ok_or_else(|| std::io::Error::other("bad object hash"))?;
        if self.check(&sha, bytes.len() as u64) == ObjectState::Intact {
            return Ok(sha);
        }
        if let Some(dir) = path.parent() {
            std::fs::create_dir_all(dir)?;
        }
        crate::fsio::write_atomic(&path, bytes)?;
        Ok(sha)
    }

    /// Re-hashes one object against its name and expected size.
    pub fn check(&self, sha256: &str, bytes: u64) -> ObjectState {
        match self.path_of(sha256).map(std::fs::read) {
            None => ObjectState::Missing,
            Some(Err(_)) => ObjectState::Missing,
            Some(Ok(b)) if b.len() as u64 == bytes && sha256_hex(&b) == sha256 => ObjectState::Intact,
            Some(Ok(_)) => ObjectState::Changed,
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn stores_once_and_detects_damage() {
        let dir = std::env::temp_dir().join(format!("knuckle-objects-{}", std::process::id()));
        let _ = std::fs::remove_dir_all(&dir);
        let store = ObjectStore::new(&dir);
        let sha = store.put(b"abc").unwrap();
        // FIPS 180-2, Appendix B.1: SHA-256("abc").
        assert_eq!(sha, "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
        assert_eq!(store.check(&sha, 3), ObjectState::Intact);
        let path = store.path_of(&sha).unwrap();
        std::fs::write(&path, b"abd").unwrap();
        assert_eq!(store.check(&sha, 3), ObjectState::Changed);
        store.put(b"abc").unwrap();
        assert_eq!(store.check(&sha, 3), ObjectState::Intact);
        assert!(store.path_of("../../etc/passwd").is_none());
        std::fs::remove_dir_all(&dir).unwrap();
    }
}
