//! The calculation package: document data, the calculation, the digest
//! (hash stamp), the rendered files and their manifest.
//!
//! [`compile`] is pure: it returns the files as bytes; the CLI writes them
//! (manifest last, so a package without its manifest is visibly incomplete).

pub mod digest;
pub mod heads;
pub mod manifest;

use crate::drawing::Drawing;
use crate::pipeline::Evaluated;
use crate::render::context::{self, SheetExtras};
use crate::render::pdf::{self, Paper, PdfMetadata, PdfOptions};
use crate::render::templates::{TemplateError, TemplateSet};
use manifest::{package_stem, DocumentId, Manifest};
use std::collections::BTreeMap;
use std::fmt;

/// Which files to produce.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Formats {
    /// The Markdown package.
    pub md: bool,
    /// The PDF package.
    pub pdf: bool,
    /// The results JSON.
    pub json: bool,
}

impl Default for Formats {
    fn default() -> Self {
        Formats { md: true, pdf: true, json: true }
    }
}

/// Options of a compile.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Options {
    /// Files to produce.
    pub formats: Formats,
    /// Paper of the PDF.
    pub paper: Paper,
}

impl Default for Options {
    fn default() -> Self {
        Options { formats: Formats::default(), paper: Paper::A4 }
    }
}

/// Additions to a package from stages beside the rules (head geometry and
/// drawings): per component, sheet rows, JSON fields and figures.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct Additions {
    /// Rows and figure references per component id.
    pub sheets: BTreeMap<String, SheetExtras>,
    /// Extra JSON fields per component id (covered by the digest).
    pub json: BTreeMap<String, serde_json::Map<String, serde_json::Value>>,
    /// Figures by file name.
    pub figures: BTreeMap<String, Drawing>,
    /// SVG text of each figure, by file name.
    pub svg: BTreeMap<String, String>,
    /// A "changes since the previous revision" section (Markdown), when asked for.
    pub changes: Option<String>,
    /// Signatures to show in the sign-off table: (role, signer, date, fingerprint).
    pub signatures: Vec<(String, String, String, String)>,
}

impl Additions {
    /// The head sheets (geometry rows, figures, SVG) of an evaluated case.
    pub fn for_case(ev: &Evaluated) -> Additions {
        let d = &ev.design.document;
        heads::additions(ev, &package_stem(&d.number, &d.revision))
    }
}

/// The digest a package of `ev` with these templates and additions carries
/// (the same value [`compile`] stamps, without rendering anything).
pub fn package_digest(ev: &Evaluated, templates: &TemplateSet, additions: &Additions) -> String {
    digest::digest(ev, templates, &additions.json, additions.changes.as_deref())
}

/// A compiled package, ready to write.
#[derive(Debug, Clone, PartialEq)]
pub struct Package {
    /// File-name stem `<number>_rev<revision>`.
    pub stem: String,
    /// The package digest (hex SHA-256).
    pub digest: String,
    /// The rendered Markdown.
    pub markdown: String,
    /// The files (name, bytes) in writing order, the manifest excluded.
    pub files: Vec<(String, Vec<u8>)>,
    /// The manifest over `files`.
    pub manifest: Manifest,
    /// Whether the design is acceptable.
    pub acceptable: bool,
}

impl Package {
    /// The manifest's file name.
    pub fn manifest_name(&self) -> String {
        format!("{}{}", self.stem, manifest::MANIFEST_SUFFIX)
    }
}

/// Why a package could not be compiled.
#[derive(Debug, Clone, PartialEq)]
pub enum PackageError {
    /// A template failed to parse or render.
    Template(TemplateError),
    /// A custom template set dropped the cautions.
    CautionsMissing {
        /// The first caution that is missing.
        missing: String,
    },
    /// The PDF could not be laid out.
    Pdf(String),
}

impl fmt::Display for PackageError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            PackageError::Template(e) => write!(f, "{e}"),
            PackageError::CautionsMissing { missing } => write!(
                f,
                "the rendered package lacks the cautions section (missing: \"{missing}\"); a custom template may \
                 restyle the cautions but not drop them: keep `{{% include \"cautions.md.tera\" %}}` or print every \
                 entry of `cautions.standing` and `cautions.specific`"
            ),
            PackageError::Pdf(e) => write!(f, "PDF layout failed: {e}"),
        }
    }
}

impl std::error::Error for PackageError {}

/// Compiles an evaluated case into package files.
pub fn compile(
    ev: &Evaluated,
    templates: &TemplateSet,
    additions: &Additions,
    options: &Options,
) -> Result<Package, PackageError> {
    let design = &ev.design;
    let d = &design.document;
    let stem = package_stem(&d.number, &d.revision);
    let digest = package_digest(ev, templates, additions);
    let mut ctx = context::build(ev, &digest, &additions.sheets);
    context::add_changes_and_signatures(&mut ctx, additions.changes.as_deref(), &additions.signatures);
    let markdown = templates.render(&ctx).map_err(PackageError::Template)?;
    ensure_cautions(ev, &markdown)?;

    let mut files: Vec<(String, Vec<u8>)> = Vec::new();
    for (name, svg) in &additions.svg {
        files.push((name.clone(), svg.as_bytes().to_vec()));
    }
    // The PDF (the slow part) is laid out while the JSON is written.
    let pdf_job = || -> Result<Option<Vec<u8>>, PackageError> {
        if !options.formats.pdf {
            return Ok(None);
        }
        let opts = PdfOptions {
            paper: options.paper,
            header_left: format!("{}  {}", d.number, d.title),
            header_right: format!("Revision {}", d.revision),
            footer_left: format!("Digest {}", &digest[..12]),
            metadata: PdfMetadata {
                title: if d.title.is_empty() { d.number.clone() } else { format!("{} ({})", d.title, d.number) },
                author: design.sign_off.prepared_by.clone(),
                subject: format!(
                    "Calculation package {} revision {}: {}",
                    d.number, d.revision, ev.calculation.rule_set_title
                ),
                keywords: vec![
                    d.number.clone(),
                    format!("revision {}", d.revision),
                    ev.calculation.rule_set.clone(),
                    format!("digest {digest}"),
                ],
                date: d.date.clone(),
            },
            document_id: digest.clone(),
        };
        pdf::markdown_to_pdf(&markdown, &additions.figures, &opts)
            .map(Some)
            .map_err(|e| PackageError::Pdf(e.to_string()))
    };
    let json_job = || {
        options.formats.json.then(|| {
            let v = crate::results::results_json(design, &ev.calculation, &additions.json);
            let mut text = serde_json::to_string_pretty(&v).unwrap_or_default();
            text.push('\n');
            text.into_bytes()
        })
    };
    let (pdf_bytes, json_bytes) = rayon::join(pdf_job, json_job);
    if let Some(bytes) = json_bytes {
        files.push((format!("{stem}.json"), bytes));
    }
    if options.formats.md {
        files.push((format!("{stem}.md"), markdown.as_bytes().to_vec()));
    }
    if let Some(bytes) = pdf_bytes? {
        files.push((format!("{stem}.pdf"), bytes));
    }

    let document = DocumentId {
        number: d.number.clone(),
        revision: d.revision.clone(),
        date: d.date.clone(),
        title: d.title.clone(),
    };
    let acceptable = ev.calculation.acceptable();
    let manifest =
        Manifest::over_files(document, &ev.calculation.rule_set, &ev.calculation.edition, &digest, acceptable, &files);
    Ok(Package { stem, digest, markdown, files, manifest, acceptable: ev.calculation.acceptable() })
}

/// Refuses a package whose Markdown lacks any caution.
fn ensure_cautions(ev: &Evaluated, markdown: &str) -> Result<(), PackageError> {
    let flat = markdown.replace('\n', " ");
    for c in crate::cautions::all(&ev.design, &ev.calculation) {
        let wanted = context::md(&c);
        if !flat.contains(&wanted) {
            return Err(PackageError::CautionsMissing { missing: c });
        }
    }
    Ok(())
}
