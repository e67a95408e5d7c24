//! The package digest (hash stamp): SHA-256 over a canonical serialisation
//! of the tool name and version, the rule set and edition, the normalised
//! inputs, every step, check and result, and the content of the templates.
//!
//! Canonical means: JSON with struct fields in declaration order, maps
//! sorted (`BTreeMap`), floats written by serde_json's shortest round-trip
//! form. The same case and templates give the same digest on any machine.

use crate::pipeline::Evaluated;
use crate::render::templates::TemplateSet;
use serde::Serialize;
use sha2::{Digest, Sha256};
use std::collections::BTreeMap;

/// Everything the digest covers, in a fixed layout.
#[derive(Serialize)]
struct Canonical<'a> {
    format: &'static str,
    tool: (&'static str, &'static str),
    rules: &'a str,
    edition: &'a str,
    design: &'a crate::model::Design,
    calculation: &'a crate::rules::Calculation,
    extra: &'a BTreeMap<String, serde_json::Map<String, serde_json::Value>>,
    templates: BTreeMap<String, String>,
    changes: Option<&'a str>,
}

/// The canonical bytes the digest is taken over (exposed for tests and audits).
pub fn canonical_bytes(
    ev: &Evaluated,
    templates: &TemplateSet,
    extra: &BTreeMap<String, serde_json::Map<String, serde_json::Value>>,
    changes: Option<&str>,
) -> Vec<u8> {
    let c = Canonical {
        format: "knuckle-digest/1",
        tool: (crate::results::TOOL_NAME, crate::results::TOOL_VERSION),
        rules: &ev.calculation.rule_set,
        edition: &ev.calculation.edition,
        design: &ev.design,
        calculation: &ev.calculation,
        extra,
        templates: templates.hashes(),
        changes,
    };
    serde_json::to_vec(&c).unwrap_or_default()
}

/// The package digest in lower-case hex.
pub fn digest(
    ev: &Evaluated,
    templates: &TemplateSet,
    extra: &BTreeMap<String, serde_json::Map<String, serde_json::Value>>,
    changes: Option<&str>,
) -> String {
    crate::package::manifest::hex(&Sha256::digest(canonical_bytes(ev, templates, extra, changes)))
}
