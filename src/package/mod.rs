//! The calculation package: document data, the calculation, the digest
//! (hash stamp) and the manifest of files.

pub mod manifest;
