//! Markdown to PDF, laid out by Knuckle itself.
//!
//! The PDF is produced from the same Markdown as the Markdown package, so the
//! two can never say different things. No external program is involved: the
//! Markdown is parsed with pulldown-cmark, laid out here with the metrics of
//! the embedded DejaVu faces, and written with printpdf; lopdf then fixes the
//! parts of the file that must not vary between runs.
//!
//! Stages, one file each:
//!
//! | stage | file |
//! |---|---|
//! | Markdown to blocks | `blocks.rs` |
//! | faces, metrics, subsets | `fonts.rs` |
//! | line breaking | `text.rs` |
//! | flowing blocks onto pages | `layout.rs`, `table.rs`, `figure.rs` |
//! | pages to PDF operations, header and footer | `paint.rs` |
//! | document, metadata, file identity | this file |
//!
//! Invariant: the output depends only on the arguments. No clock, no random
//! identifiers, no hash-map order: calling twice gives the same bytes.

mod blocks;
mod figure;
mod fonts;
mod layout;
mod paint;
mod table;
mod text;

use std::collections::BTreeMap;
use std::fmt;

use lopdf::{Object, StringFormat};
use printpdf::{FontId, Mm, Op, PdfDocument, PdfFont, PdfFontHandle, PdfPage, PdfSaveOptions, Pt, TextItem};
use sha2::{Digest, Sha256};

use crate::drawing::Drawing;
use fonts::Face;
use layout::{Geometry, Layouter};

/// Paper size of the printed package.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Paper {
    /// ISO A4, 210 mm x 297 mm.
    A4,
    /// US Letter, 215.9 mm x 279.4 mm.
    Letter,
}

impl Paper {
    /// Width and height in millimetres.
    pub fn size_mm(self) -> (f32, f32) {
        match self {
            Paper::A4 => (210.0, 297.0),
            Paper::Letter => (215.9, 279.4),
        }
    }
}

/// The document information written into the PDF.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct PdfMetadata {
    /// Document title.
    pub title: String,
    /// Author (the engineer of record or the organisation).
    pub author: String,
    /// Subject line.
    pub subject: String,
    /// Keywords, written comma-separated.
    pub keywords: Vec<String>,
    /// Date of the document as ISO `YYYY-MM-DD`; used as creation and
    /// modification date (at 00:00:00 UTC). The clock is never read.
    pub date: String,
}

/// Everything besides the Markdown and the figures that goes into the PDF.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct PdfOptions {
    /// Paper size.
    pub paper: Paper,
    /// Left part of the running header, e.g. document number and title.
    pub header_left: String,
    /// Right part of the running header, e.g. "Revision B".
    pub header_right: String,
    /// Left part of the running footer, e.g. "Digest 1a2b3c4d5e6f"; the right
    /// part is always "Page N of M".
    pub footer_left: String,
    /// Document information.
    pub metadata: PdfMetadata,
    /// Identity of the package (its digest, in hex); the file identifier in
    /// the PDF trailer is derived from it, so that it is stable.
    pub document_id: String,
}

/// Why a PDF could not be produced.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum PdfError {
    /// The Markdown shows a figure (`![caption](name)`) that was not supplied.
    UnknownFigure {
        /// The name used in the Markdown.
        name: String,
    },
    /// A supplied figure cannot be drawn.
    InvalidFigure {
        /// The figure's name.
        name: String,
        /// What is wrong with it.
        reason: String,
    },
    /// An embedded font could not be read or subset.
    Font {
        /// The face concerned.
        face: String,
        /// What went wrong.
        message: String,
    },
    /// The metadata date is not a valid `YYYY-MM-DD` date.
    InvalidDate {
        /// The date as given.
        date: String,
    },
    /// The finished document could not be written out.
    Write {
        /// What went wrong.
        message: String,
    },
}

impl fmt::Display for PdfError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            PdfError::UnknownFigure { name } => {
                write!(f, "the document shows figure `{name}`, but no figure of that name was supplied")
            }
            PdfError::InvalidFigure { name, reason } => {
                write!(f, "figure `{name}` cannot be drawn: {reason}")
            }
            PdfError::Font { face, message } => write!(f, "font {face}: {message}"),
            PdfError::InvalidDate { date } => {
                write!(f, "document date `{date}` is not a valid calendar date of the form YYYY-MM-DD")
            }
            PdfError::Write { message } => write!(f, "cannot write the PDF: {message}"),
        }
    }
}

impl std::error::Error for PdfError {}

/// Parses an ISO `YYYY-MM-DD` date into a PDF date string at 00:00:00 UTC.
fn pdf_date(date: &str) -> Result<String, PdfError> {
    // One calendar check for the whole crate: the case file's.
    if !crate::model::valid_iso_date(date) {
        return Err(PdfError::InvalidDate { date: date.to_string() });
    }
    let digits: String = date.chars().filter(char::is_ascii_digit).collect();
    Ok(format!("D:{digits}000000+00'00'"))
}

/// A PDF text string: literal when plain ASCII, else UTF-16BE with a byte
/// order mark (ISO 32000-1, 7.9.2.2), so that any title survives.
fn text_string(s: &str) -> Object {
    if s.bytes().all(|b| (0x20..0x7f).contains(&b)) {
        Object::String(s.as_bytes().to_vec(), StringFormat::Literal)
    } else {
        let mut bytes = vec![0xFE, 0xFF];
        for unit in s.encode_utf16() {
            bytes.extend_from_slice(&unit.to_be_bytes());
        }
        Object::String(bytes, StringFormat::Hexadecimal)
    }
}

/// Replaces printpdf's document information and trailer identifier by ours:
/// only the fields we mean (no empty PDF/X version entry, which would make
/// readers take the file for PDF/X), dates from the document, and an `/ID`
/// derived from the package digest instead of a per-call counter.
fn finish_document(doc: &mut lopdf::Document, options: &PdfOptions) -> Result<(), PdfError> {
    let date = pdf_date(&options.metadata.date)?;
    let meta = &options.metadata;
    let mut info = lopdf::Dictionary::new();
    info.set("Title", text_string(&meta.title));
    info.set("Author", text_string(&meta.author));
    info.set("Subject", text_string(&meta.subject));
    info.set("Keywords", text_string(&meta.keywords.join(", ")));
    info.set("Creator", text_string("Knuckle"));
    info.set("Producer", text_string(concat!("Knuckle ", env!("CARGO_PKG_VERSION"))));
    info.set("CreationDate", text_string(&date));
    info.set("ModDate", text_string(&date));
    match doc.trailer.get(b"Info").and_then(Object::as_reference) {
        Ok(id) => {
            doc.objects.insert(id, Object::Dictionary(info));
        }
        Err(_) => {
            let id = doc.add_object(Object::Dictionary(info));
            doc.trailer.set("Info", Object::Reference(id));
        }
    }

    let digest = Sha256::digest(format!("knuckle-pdf-id:{}", options.document_id).as_bytes());
    let id = digest[..16].to_vec();
    doc.trailer.set(
        "ID",
        Object::Array(vec![
            Object::String(id.clone(), StringFormat::Hexadecimal),
            Object::String(id, StringFormat::Hexadecimal),
        ]),
    );
    Ok(())
}

/// Deflates every stream that is not compressed yet. lopdf's own `compress`
/// uses the slowest, best level, which took longer than the whole layout; the
/// fastest level makes the file about a quarter larger (still well under
/// 100 KB for ten pages) and deflates in a fraction of the time.
fn compress_streams(doc: &mut lopdf::Document) -> Result<(), PdfError> {
    use flate2::write::ZlibEncoder;
    use flate2::Compression;
    use std::io::Write;

    for object in doc.objects.values_mut() {
        let Object::Stream(stream) = object else {
            continue;
        };
        if !stream.allows_compression || stream.dict.get(b"Filter").is_ok() {
            continue;
        }
        let deflate = |content: &[u8]| {
            let mut encoder = ZlibEncoder::new(Vec::new(), Compression::fast());
            encoder
                .write_all(content)
                .and_then(|()| encoder.finish())
                .map_err(|e| PdfError::Write { message: format!("cannot compress a stream: {e}") })
        };
        // Font programs (the streams with a /Length1) repeat from package to
        // package, since the subsets do; their deflated form is kept.
        let deflated = if stream.dict.has(b"Length1") {
            deflate_font_program(&stream.content, deflate)?
        } else {
            deflate(&stream.content)?
        };
        if deflated.len() < stream.content.len() {
            stream.dict.set("Filter", "FlateDecode");
            stream.set_content(deflated);
        }
    }
    Ok(())
}

/// The deflated form of a font program, from the few most recent ones kept
/// per process or by `deflate`. Deflating is deterministic, so a kept result
/// is the same bytes that deflating again would give.
fn deflate_font_program(
    program: &[u8],
    deflate: impl Fn(&[u8]) -> Result<Vec<u8>, PdfError>,
) -> Result<Vec<u8>, PdfError> {
    type Kept = Vec<(Vec<u8>, Vec<u8>)>;
    static KEPT: std::sync::Mutex<Kept> = std::sync::Mutex::new(Vec::new());
    const KEEP: usize = 16;
    // A poisoned lock only means another thread panicked while holding it;
    // the list itself is always whole, so it is used as it is.
    let found = {
        let kept = KEPT.lock().unwrap_or_else(|e| e.into_inner());
        kept.iter().find(|(p, _)| p.as_slice() == program).map(|(_, d)| d.clone())
    };
    if let Some(deflated) = found {
        return Ok(deflated);
    }
    let deflated = deflate(program)?;
    let mut kept = KEPT.lock().unwrap_or_else(|e| e.into_inner());
    if kept.len() >= KEEP {
        kept.remove(0);
    }
    kept.push((program.to_vec(), deflated.clone()));
    Ok(deflated)
}

/// Puts the content stream of each page in place of the placeholder that
/// printpdf wrote, page by page in document order.
fn set_contents(doc: &mut lopdf::Document, contents: Vec<Vec<u8>>) -> Result<(), PdfError> {
    let missing = |what: &str| PdfError::Write { message: format!("the document printpdf built lacks {what}") };
    let pages: Vec<lopdf::ObjectId> = doc.get_pages().into_values().collect();
    if pages.len() != contents.len() {
        return Err(missing("one page per laid-out page"));
    }
    for (page, content) in pages.into_iter().zip(contents) {
        let id = doc
            .get_dictionary(page)
            .and_then(|d| d.get(b"Contents"))
            .and_then(Object::as_reference)
            .map_err(|_| missing("a content stream on every page"))?;
        match doc.objects.get_mut(&id) {
            Some(Object::Stream(stream)) => stream.set_content(content),
            _ => return Err(missing("a content stream on every page")),
        }
    }
    Ok(())
}

/// Lays out `markdown` (CommonMark with GFM tables) as a paged PDF.
///
/// Figures are written `![caption](name)` and looked up by `name` in
/// `figures`; `<!-- page-break -->` on a line of its own starts a new page.
/// Every page carries the running header and footer of `options`. The result
/// depends only on the arguments.
pub fn markdown_to_pdf(
    markdown: &str,
    figures: &BTreeMap<String, Drawing>,
    options: &PdfOptions,
) -> Result<Vec<u8>, PdfError> {
    // Checked first so that a bad date fails fast, before any layout work.
    pdf_date(&options.metadata.date)?;
    let faces = fonts::faces()?;
    let geo = Geometry::for_paper(options.paper);
    let blocks = blocks::parse(markdown);
    let mut flow = Layouter::new(faces, figures, geo);
    flow.blocks(&blocks, geo.left, geo.text_width())?;
    let pages = flow.finish();
    let (running, used) = paint::prepare(faces, &pages, &geo, options);

    let mut doc = PdfDocument::new(&options.metadata.title);
    let mut glyphs: Vec<paint::GlyphMap> = Face::ALL.iter().map(|_| paint::GlyphMap::default()).collect();
    // printpdf embeds a font only when a page shows text in it, and derives
    // the font's widths and character map from that text. The first page
    // handed to it therefore shows every character used, per face, once and
    // in order of last use, which yields exactly the tables the whole text
    // would; the real content streams, written directly by `paint`, replace
    // these placeholder operations below.
    let mut usage_ops = vec![Op::StartTextSection];
    for (face, chars) in used.iter() {
        let font = fonts::subset(faces, face, &chars)?;
        glyphs[face.index()] = paint::GlyphMap::new(&font, &chars);
        // Resource names are fixed per face: printpdf's own ids come from a
        // counter and would differ between two calls in one process.
        let id = FontId(face.resource_name().to_string());
        usage_ops.push(Op::SetFont { font: PdfFontHandle::External(id.clone()), size: Pt(10.0) });
        usage_ops.push(Op::ShowText { items: vec![TextItem::Text(used.in_order_of_last_use(face))] });
        doc.resources.fonts.map.insert(id, PdfFont::new(font));
    }
    usage_ops.push(Op::EndTextSection);
    let contents = paint::paint(&pages, &running, &geo, &glyphs);
    let (w, h) = options.paper.size_mm();
    doc.pages = (0..pages.len())
        .map(|i| PdfPage::new(Mm(w), Mm(h), if i == 0 { std::mem::take(&mut usage_ops) } else { Vec::new() }))
        .collect();

    let save = PdfSaveOptions {
        optimize: false,
        // The fonts are subset above already.
        subset_fonts: false,
        secure: true,
        image_optimization: None,
    };
    let mut warnings = Vec::new();
    let mut lo = doc.to_lopdf_document(&save, &mut warnings);
    set_contents(&mut lo, contents)?;
    finish_document(&mut lo, options)?;
    compress_streams(&mut lo)?;
    let mut out = Vec::new();
    lo.save_to(&mut out).map_err(|e| PdfError::Write { message: e.to_string() })?;
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn dates_are_checked_and_converted() {
        assert_eq!(pdf_date("2024-02-29").as_deref(), Ok("D:20240229000000+00'00'"));
        // 2023 is not a leap year (Gregorian calendar rule).
        assert!(pdf_date("2023-02-29").is_err());
        assert!(pdf_date("2024-13-01").is_err());
        assert!(pdf_date("2024-1-01").is_err());
        assert!(pdf_date("２０２４-01-01").is_err());
        assert!(pdf_date("").is_err());
    }

    #[test]
    fn text_strings_are_utf16_when_not_ascii() {
        assert_eq!(text_string("Rev B"), Object::String(b"Rev B".to_vec(), StringFormat::Literal));
        let Object::String(bytes, StringFormat::Hexadecimal) = text_string("σ") else {
            panic!("not hex");
        };
        // U+03C3 GREEK SMALL LETTER SIGMA in UTF-16BE after the byte order mark.
        assert_eq!(bytes, vec![0xFE, 0xFF, 0x03, 0xC3]);
    }

    #[test]
    fn errors_name_what_was_wrong() {
        let e = PdfError::UnknownFigure { name: "head-profile".into() };
        assert!(e.to_string().contains("head-profile"));
        let e = PdfError::InvalidDate { date: "yesterday".into() };
        assert!(e.to_string().contains("yesterday"));
    }
}
