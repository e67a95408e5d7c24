//! Key files: an Ed25519 key pair with its holder's name.
//!
//! Two small JSON formats of our own:
//!
//! - the secret key file (`knuckle-secret-key/1`): holder's name, public
//!   key, fingerprint and secret key, all hex; written with owner-only
//!   permissions at creation and never printed;
//! - the public key file (`knuckle-public-key/1`, `KEYFILE.pub`): the same
//!   without the secret, for trust lists.
//!
//! The fingerprint is the first 16 hex digits of the SHA-256 of the 32
//! public-key bytes: short enough to read aloud over the telephone, long
//! enough that two keys in one office never share it by chance.

use crate::package::manifest::{hex, sha256_hex};
use ed25519_dalek::{SigningKey, VerifyingKey};
use serde::{Deserialize, Serialize};
use std::io::Write;
use std::path::Path;
use zeroize::Zeroize;

/// Format id of secret key files.
pub const SECRET_KEY_FORMAT: &str = "knuckle-secret-key/1";
/// Format id of public key files.
pub const PUBLIC_KEY_FORMAT: &str = "knuckle-public-key/1";

/// A public key with its holder's name: what a trust list holds.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct PublicKey {
    /// The holder's name as written at key generation.
    pub name: String,
    /// The Ed25519 verifying key.
    pub key: VerifyingKey,
}

impl PublicKey {
    /// The short fingerprint of this key.
    pub fn fingerprint(&self) -> String {
        fingerprint(&self.key)
    }

    /// Reads a public key file, or the public half of a secret key file.
    pub fn load(path: &Path) -> Result<PublicKey, String> {
        let text =
            std::fs::read_to_string(path).map_err(|e| format!("cannot read key file `{}`: {e}", path.display()))?;
        PublicKey::from_json(&text).map_err(|e| format!("key file `{}`: {e}", path.display()))
    }

    /// Parses public key text (either format; only public fields are read).
    pub fn from_json(text: &str) -> Result<PublicKey, String> {
        let f: PublicKeyFile = serde_json::from_str(text).map_err(|e| format!("not a key file: {e}"))?;
        if f.format != PUBLIC_KEY_FORMAT && f.format != SECRET_KEY_FORMAT {
            return Err(format!("unknown key format `{}` (expected `{PUBLIC_KEY_FORMAT}`)", f.format));
        }
        let key = verifying_key_from_hex(&f.public_key)?;
        if fingerprint(&key) != f.fingerprint {
            return Err("the fingerprint does not belong to the public key".into());
        }
        Ok(PublicKey { name: f.name, key })
    }

    /// The public key file text.
    pub fn to_json(&self) -> String {
        let f = PublicKeyFile {
            format: PUBLIC_KEY_FORMAT.into(),
            name: self.name.clone(),
            public_key: hex(self.key.as_bytes()),
            fingerprint: self.fingerprint(),
        };
        let mut s = serde_json::to_string_pretty(&f).unwrap_or_default();
        s.push('\n');
        s
    }
}

/// A secret key with its holder's name. The secret is wiped from memory
/// when this value is dropped (the `zeroize` feature of ed25519-dalek).
pub struct SecretKey {
    /// The holder's name.
    pub name: String,
    /// The Ed25519 signing key.
    pub key: SigningKey,
}

impl std::fmt::Debug for SecretKey {
    // The secret must never reach a log or a panic message.
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(f, "SecretKey {{ name: {:?}, fingerprint: {} }}", self.name, fingerprint(&self.key.verifying_key()))
    }
}

/// The public key file mirror (also reads the public part of a secret file).
#[derive(Serialize, Deserialize)]
struct PublicKeyFile {
    format: String,
    name: String,
    public_key: String,
    fingerprint: String,
}

/// The secret key file mirror.
#[derive(Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
struct SecretKeyFile {
    format: String,
    name: String,
    public_key: String,
    fingerprint: String,
    secret_key: String,
}

impl Drop for SecretKeyFile {
    fn drop(&mut self) {
        self.secret_key.zeroize();
    }
}

impl SecretKey {
    /// A new key pair from the operating system's random source.
    pub fn generate(name: &str) -> Result<SecretKey, String> {
        let name = name.trim();
        if name.is_empty() {
            return Err("the key holder's name is empty; give it with --name".into());
        }
        if name.chars().any(char::is_control) {
            return Err("the key holder's name contains control characters".into());
        }
        let mut seed = [0u8; 32];
        getrandom::fill(&mut seed).map_err(|e| format!("the operating system gave no random bytes: {e}"))?;
        let key = SigningKey::from_bytes(&seed);
        seed.zeroize();
        Ok(SecretKey { name: name.to_string(), key })
    }

    /// The public half.
    pub fn public(&self) -> PublicKey {
        PublicKey { name: self.name.clone(), key: self.key.verifying_key() }
    }

    /// Reads a secret key file, checking that its parts belong together.
    pub fn load(path: &Path) -> Result<SecretKey, String> {
        let mut text =
            std::fs::read_to_string(path).map_err(|e| format!("cannot read key file `{}`: {e}", path.display()))?;
        let parsed = serde_json::from_str::<SecretKeyFile>(&text);
        text.zeroize();
        let f = parsed.map_err(|_| {
            // serde's message may quote the file, and so the secret: say less.
            format!("`{}` is not a secret key file (a `.pub` file cannot sign)", path.display())
        })?;
        if f.format != SECRET_KEY_FORMAT {
            return Err(format!(
                "`{}`: unknown key format `{}` (expected `{SECRET_KEY_FORMAT}`)",
                path.display(),
                f.format
            ));
        }
        let mut bytes = decode_hex(&f.secret_key)
            .filter(|b| b.len() == 32)
            .ok_or_else(|| format!("`{}`: the secret key is not 64 hex digits", path.display()))?;
        let mut seed = [0u8; 32];
        seed.copy_from_slice(&bytes);
        bytes.zeroize();
        let key = SigningKey::from_bytes(&seed);
        seed.zeroize();
        if hex(key.verifying_key().as_bytes()) != f.public_key {
            return Err(format!("`{}`: the public key does not belong to the secret key", path.display()));
        }
        if fingerprint(&key.verifying_key()) != f.fingerprint {
            return Err(format!("`{}`: the fingerprint does not belong to the key", path.display()));
        }
        Ok(SecretKey { name: f.name.clone(), key })
    }

    /// Writes the secret key file (owner-only permissions from the moment
    /// it exists) and `<path>.pub`. Refuses to replace an existing file,
    /// since overwriting a key loses the ability to sign as it.
    pub fn save(&self, path: &Path) -> Result<(), String> {
        let pub_path = public_path(path);
        for p in [path, pub_path.as_path()] {
            if p.exists() {
                return Err(format!(
                    "`{}` already exists; choose another name (an existing key is never replaced)",
                    p.display()
                ));
            }
        }
        let public = self.public();
        let file = SecretKeyFile {
            format: SECRET_KEY_FORMAT.into(),
            name: self.name.clone(),
            public_key: hex(public.key.as_bytes()),
            fingerprint: public.fingerprint(),
            secret_key: hex(self.key.as_bytes()),
        };
        let mut text = serde_json::to_string_pretty(&file).unwrap_or_default();
        text.push('\n');
        drop(file);
        let written = write_private_new(path, text.as_bytes());
        text.zeroize();
        written.map_err(|e| format!("cannot write key file `{}`: {e}", path.display()))?;
        crate::fsio::write_atomic(&pub_path, public.to_json().as_bytes())
            .map_err(|e| format!("cannot write `{}`: {e}", pub_path.display()))
    }
}

/// `KEYFILE.pub` beside `KEYFILE`.
pub fn public_path(path: &Path) -> std::path::PathBuf {
    let mut s = path.as_os_str().to_owned();
    s.push(".pub");
    s.into()
}

/// Writes a new file that only its owner may read, through a temporary file
/// created with those permissions, so the secret is never readable by
/// others, not even for a moment, and never half-written under its name.
fn write_private_new(path: &Path, bytes: &[u8]) -> std::io::Result<()> {
    let dir = path.parent().filter(|p| !p.as_os_str().is_empty()).unwrap_or(Path::new("."));
    let name = path.file_name().map(|n| n.to_string_lossy().into_owned()).unwrap_or_else(|| "key".into());
    let tmp = dir.join(format!(".{name}.{}.tmp", std::process::id()));
    let mut options = std::fs::OpenOptions::new();
    options.write(true).create_new(true);
    #[cfg(unix)]
    {
        use std::os::unix::fs::OpenOptionsExt;
        options.mode(0o600);
    }
    let result = (|| {
        let mut f = options.open(&tmp)?;
        f.write_all(bytes)?;
        f.sync_all()?;
        // A hard link fails if the name exists, unlike a rename, so a key
        // created meanwhile by another process is never replaced.
        std::fs::hard_link(&tmp, path)?;
        std::fs::remove_file(&tmp)
    })();
    if result.is_err() {
        let _ = std::fs::remove_file(&tmp);
    }
    result
}

/// The short fingerprint of a verifying key.
pub fn fingerprint(key: &VerifyingKey) -> String {
    sha256_hex(key.as_bytes())[..16].to_string()
}

/// A verifying key from 64 hex digits.
pub fn verifying_key_from_hex(text: &str) -> Result<VerifyingKey, String> {
    let bytes = decode_hex(text).filter(|b| b.len() == 32).ok_or("the public key is not 64 hex digits")?;
    let mut arr = [0u8; 32];
    arr.copy_from_slice(&bytes);
    VerifyingKey::from_bytes(&arr).map_err(|_| "the public key is not a valid Ed25519 key".into())
}

/// Decodes lower- or upper-case hex; `None` for odd length or a non-hex digit.
pub fn decode_hex(text: &str) -> Option<Vec<u8>> {
    let b = text.as_bytes();
    if !b.len().is_multiple_of(2) {
        return None;
    }
    let digit = |c: u8| -> Option<u8> {
        match c {
            b'0'..=b'9' => Some(c - b'0'),
            b'a'..=b'f' => Some(c - b'a' + 10),
            b'A'..=b'F' => Some(c - b'A' + 10),
            _ => None,
        }
    };
    b.chunks(2).map(|p| Some(digit(p[0])? << 4 | digit(p[1])?)).collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn hex_round_trip_and_rejects() {
        assert_eq!(decode_hex("00ff10"), Some(vec![0, 255, 16]));
        assert_eq!(decode_hex("0"), None);
        assert_eq!(decode_hex("zz"), None);
    }

    #[test]
    fn public_key_text_round_trips() {
        let k = SecretKey::generate("A. Engineer").unwrap();
        let p = k.public();
        let back = PublicKey::from_json(&p.to_json()).unwrap();
        assert_eq!(back, p);
        assert_eq!(back.fingerprint().len(), 16);
    }

    #[test]
    fn refuses_empty_name() {
        assert!(SecretKey::generate("  ").is_err());
    }
}
