//! The embedded DejaVu faces: metrics for line breaking and subsets for embedding.
//!
//! The five TrueType files are compiled into the binary so that a package looks
//! the same on every machine and no font lookup can fail at run time. Parsing a
//! face walks its whole character map and advance table, which costs several
//! milliseconds, so each face is parsed once per process and kept in a
//! [`OnceLock`]. Every document then embeds only the glyphs it uses: a subset
//! of a few dozen glyphs is a few kilobytes, the whole face several hundred.

use std::collections::{BTreeMap, BTreeSet};
use std::sync::{Mutex, OnceLock};

use printpdf::ParsedFont;

use super::PdfError;

/// One of the type faces a document can use.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub enum Face {
    /// DejaVu Sans, the body face.
    Regular,
    /// DejaVu Sans Bold: headings, table heads, strong emphasis.
    Bold,
    /// DejaVu Sans Oblique: emphasis and captions.
    Italic,
    /// DejaVu Sans Bold Oblique: strong emphasis inside emphasis.
    BoldItalic,
    /// DejaVu Sans Mono: inline code and code blocks.
    Mono,
}

impl Face {
    /// All faces, in the order their resources are named in the PDF.
    pub const ALL: [Face; 5] = [Face::Regular, Face::Bold, Face::Italic, Face::BoldItalic, Face::Mono];

    /// The face for a combination of strong and emphasis flags.
    pub fn styled(bold: bool, italic: bool) -> Face {
        match (bold, italic) {
            (false, false) => Face::Regular,
            (true, false) => Face::Bold,
            (false, true) => Face::Italic,
            (true, true) => Face::BoldItalic,
        }
    }

    /// Position of the face in [`Face::ALL`].
    pub fn index(self) -> usize {
        match self {
            Face::Regular => 0,
            Face::Bold => 1,
            Face::Italic => 2,
            Face::BoldItalic => 3,
            Face::Mono => 4,
        }
    }

    /// The PostScript name written to the PDF font dictionary.
    fn postscript_name(self) -> &'static str {
        match self {
            Face::Regular => "DejaVuSans",
            Face::Bold => "DejaVuSans-Bold",
            Face::Italic => "DejaVuSans-Oblique",
            Face::BoldItalic => "DejaVuSans-BoldOblique",
            Face::Mono => "DejaVuSansMono",
        }
    }

    /// A fixed six-letter subset tag (ISO 32000-1, 9.6.4). It is constant rather
    /// than derived from the glyph set so that the tag never varies between runs.
    fn subset_tag(self) -> &'static str {
        match self {
            Face::Regular => "KNUCKA",
            Face::Bold => "KNUCKB",
            Face::Italic => "KNUCKC",
            Face::BoldItalic => "KNUCKD",
            Face::Mono => "KNUCKE",
        }
    }

    /// The PDF resource name used in content streams (`/F1` ... `/F5`).
    pub fn resource_name(self) -> &'static str {
        match self {
            Face::Regular => "F1",
            Face::Bold => "F2",
            Face::Italic => "F3",
            Face::BoldItalic => "F4",
            Face::Mono => "F5",
        }
    }

    /// The font program compiled into the binary.
    fn bytes(self) -> &'static [u8] {
        match self {
            Face::Regular => include_bytes!("../../../assets/fonts/DejaVuSans.ttf"),
            Face::Bold => include_bytes!("../../../assets/fonts/DejaVuSans-Bold.ttf"),
            Face::Italic => include_bytes!("../../../assets/fonts/DejaVuSans-Oblique.ttf"),
            Face::BoldItalic => include_bytes!("../../../assets/fonts/DejaVuSans-BoldOblique.ttf"),
            Face::Mono => include_bytes!("../../../assets/fonts/DejaVuSansMono.ttf"),
        }
    }
}

/// Metrics of one parsed face, in font units.
pub struct FaceMetrics {
    /// The full parsed face (character map and advance widths).
    font: ParsedFont,
    /// Advance widths of the printable ASCII range, looked up on every glyph of
    /// body text, so they are kept in a flat array instead of two tree lookups.
    ascii: [u16; 128],
    /// Whether the face has a glyph for each ASCII character, asked for every
    /// character of every string before it is measured.
    ascii_glyph: [bool; 128],
    /// Font units per em, for scaling advances to points.
    units_per_em: f32,
}

impl FaceMetrics {
    fn parse(face: Face) -> Result<FaceMetrics, String> {
        let mut warnings = Vec::new();
        let font = ParsedFont::from_bytes(face.bytes(), 0, &mut warnings)
            .ok_or_else(|| format!("the embedded face could not be parsed: {warnings:?}"))?;
        if font.units_per_em == 0 {
            return Err("the embedded face declares zero units per em".to_string());
        }
        let mut ascii = [0u16; 128];
        let mut ascii_glyph = [false; 128];
        for code in 0..128 {
            let gid = font.lookup_glyph_index(code as u32);
            ascii[code] = gid.and_then(|gid| font.get_glyph_width(gid)).unwrap_or(0);
            ascii_glyph[code] = gid.is_some_and(|gid| gid != 0);
        }
        let units_per_em = f32::from(font.units_per_em);
        Ok(FaceMetrics { font, ascii, ascii_glyph, units_per_em })
    }

    /// Whether the face has a glyph for the character.
    pub fn has_glyph(&self, ch: char) -> bool {
        if (ch as u32) < 128 {
            return self.ascii_glyph[ch as usize];
        }
        self.font.lookup_glyph_index(ch as u32).is_some_and(|gid| gid != 0)
    }

    /// Advance width of one character, in em (multiply by the size in points).
    pub fn advance_em(&self, ch: char) -> f32 {
        let units = if (ch as u32) < 128 {
            self.ascii[ch as usize]
        } else {
            self.font.lookup_glyph_index(ch as u32).and_then(|gid| self.font.get_glyph_width(gid)).unwrap_or(0)
        };
        f32::from(units) / self.units_per_em
    }

    /// Width of a string set at `size` points, in points. No kerning is applied
    /// when the text is drawn, so the plain sum of advances is exactly what is
    /// printed.
    pub fn width(&self, text: &str, size: f32) -> f32 {
        text.chars().map(|c| self.advance_em(c)).sum::<f32>() * size
    }
}

/// The parsed faces of the process, or the reason they could not be parsed.
type FaceCache = Result<Vec<FaceMetrics>, (Face, String)>;

fn cache() -> &'static FaceCache {
    static FACES: OnceLock<FaceCache> = OnceLock::new();
    FACES.get_or_init(|| {
        Face::ALL.iter().map(|&face| FaceMetrics::parse(face).map_err(|message| (face, message))).collect()
    })
}

/// The metrics of all faces, parsed on first use.
pub fn faces() -> Result<&'static [FaceMetrics], PdfError> {
    match cache() {
        Ok(faces) => Ok(faces),
        Err((face, message)) => {
            Err(PdfError::Font { face: face.postscript_name().to_string(), message: message.clone() })
        }
    }
}

/// The metrics of one face from an already loaded set.
pub fn metrics(faces: &[FaceMetrics], face: Face) -> &FaceMetrics {
    // `faces()` always returns one entry per member of `Face::ALL`, in order.
    &faces[face.index()]
}

/// Builds a font holding only the glyphs for `chars` (plus `.notdef`), ready to
/// be added to a document. Glyphs are renumbered by the subsetter; the subset's
/// own character map is what the PDF writer consults, so text drawn with the
/// returned font maps to the new numbers.
///
/// Subsetting and re-parsing take a few milliseconds per face, and a batch of
/// packages uses the same few character sets over and over, so the most
/// recent subsets are kept per process. The subset depends only on the face
/// and the characters, so a kept one is exactly what would be built again.
pub fn subset(faces: &[FaceMetrics], face: Face, chars: &BTreeSet<char>) -> Result<ParsedFont, PdfError> {
    type Kept = Vec<(Face, Vec<char>, ParsedFont)>;
    static KEPT: Mutex<Kept> = Mutex::new(Vec::new());
    const KEEP: usize = 16;
    let key: Vec<char> = chars.iter().copied().collect();
    // A poisoned lock only means another thread panicked while holding it;
    // the list itself is always whole, so it is used as it is.
    let found = {
        let kept = KEPT.lock().unwrap_or_else(|e| e.into_inner());
        kept.iter().find(|(f, c, _)| *f == face && *c == key).map(|(_, _, font)| font.clone())
    };
    if let Some(font) = found {
        return Ok(font);
    }
    let font = build_subset(faces, face, chars)?;
    let mut kept = KEPT.lock().unwrap_or_else(|e| e.into_inner());
    if kept.len() >= KEEP {
        kept.remove(0);
    }
    kept.push((face, key, font.clone()));
    Ok(font)
}

fn build_subset(faces: &[FaceMetrics], face: Face, chars: &BTreeSet<char>) -> Result<ParsedFont, PdfError> {
    use allsorts::binary::read::ReadScope;
    use allsorts::font_data::FontData;
    use allsorts::subset::{CmapTarget, SubsetProfile};

    let font_error = |message: String| PdfError::Font { face: face.postscript_name().to_string(), message };
    let full = &metrics(faces, face).font;
    // Glyph 0 must come first; the BTreeSet keeps the rest sorted and unique,
    // which makes the subset (and so the output bytes) independent of the order
    // in which characters were met.
    let glyphs: BTreeSet<u16> =
        chars.iter().filter_map(|&c| full.lookup_glyph_index(c as u32)).filter(|&gid| gid != 0).collect();
    let ids: Vec<u16> = std::iter::once(0).chain(glyphs).collect();

    let scope = ReadScope::new(face.bytes());
    let font_file = scope.read::<FontData<'_>>().map_err(|e| font_error(format!("cannot read the font file: {e}")))?;
    let provider = font_file.table_provider(0).map_err(|e| font_error(format!("cannot read the font tables: {e}")))?;
    let bytes = allsorts::subset::subset(&provider, &ids, &SubsetProfile::Pdf, CmapTarget::Unicode)
        .map_err(|e| font_error(format!("cannot subset the font: {e}")))?;

    let mut warnings = Vec::new();
    let mut font = ParsedFont::from_bytes(&bytes, 0, &mut warnings)
        .ok_or_else(|| font_error(format!("the font subset cannot be parsed: {warnings:?}")))?;
    font.font_name = Some(format!("{}+{}", face.subset_tag(), face.postscript_name()));
    Ok(font)
}

/// Replaces characters that no face can show, so that the width measured for
/// line breaking and the glyphs drawn always agree. Tabs become spaces, other
/// control characters are dropped, and anything without a glyph in `face`
/// becomes U+FFFD (or `?` if even that is missing).
pub fn printable(faces: &[FaceMetrics], face: Face, text: &str) -> String {
    let m = metrics(faces, face);
    let mut out = String::with_capacity(text.len());
    for ch in text.chars() {
        match ch {
            '\t' => out.push_str("    "),
            c if c.is_control() => {}
            // Zero-width and soft-hyphen characters have no visible glyph and
            // would only confuse the width sum.
            '\u{00AD}' | '\u{200B}' | '\u{200C}' | '\u{200D}' | '\u{FEFF}' => {}
            c if m.has_glyph(c) => out.push(c),
            _ if m.has_glyph('\u{FFFD}') => out.push('\u{FFFD}'),
            _ => out.push('?'),
        }
    }
    out
}

/// Characters used per face, collected before painting, to build the subsets.
///
/// Besides the set, the position of each character's last use is kept: a PDF
/// writer that derives a subset's character map from the text shown records,
/// for a glyph reached from two characters, the one shown last, so replaying
/// the characters in order of last use gives it the same map.
#[derive(Default)]
pub struct UsedChars {
    per_face: BTreeMap<Face, BTreeMap<char, u64>>,
    counter: u64,
}

impl UsedChars {
    /// Records the characters of a string drawn in `face`.
    pub fn add(&mut self, face: Face, text: &str) {
        let chars = self.per_face.entry(face).or_default();
        for ch in text.chars() {
            self.counter += 1;
            chars.insert(ch, self.counter);
        }
    }

    /// The faces that were used, with their characters, in a fixed order.
    pub fn iter(&self) -> impl Iterator<Item = (Face, BTreeSet<char>)> + '_ {
        self.per_face.iter().map(|(f, c)| (*f, c.keys().copied().collect()))
    }

    /// The characters used in `face`, each once, ordered by their last use.
    pub fn in_order_of_last_use(&self, face: Face) -> String {
        let mut chars: Vec<(u64, char)> =
            self.per_face.get(&face).map(|m| m.iter().map(|(c, n)| (*n, *c)).collect()).unwrap_or_default();
        chars.sort_unstable();
        chars.into_iter().map(|(_, c)| c).collect()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_face_parses_and_has_the_engineering_symbols() {
        let faces = faces().expect("embedded faces parse");
        // The symbols a calculation package prints; all are in DejaVu's coverage
        // (DejaVu Sans documentation, "unicover.txt" coverage table).
        for face in [Face::Regular, Face::Bold, Face::Italic, Face::BoldItalic] {
            for ch in "·−≤≥√²³°σ×πα".chars() {
                assert!(metrics(faces, face).has_glyph(ch), "{face:?} lacks {ch}");
            }
        }
        for ch in "·−≤≥²³°σ×π".chars() {
            assert!(metrics(faces, Face::Mono).has_glyph(ch), "Mono lacks {ch}");
        }
    }

    #[test]
    fn mono_advances_are_all_equal_and_sans_are_not() {
        let faces = faces().expect("embedded faces parse");
        let mono = metrics(faces, Face::Mono);
        // DejaVu Sans Mono advances are 1233 units of 2048 per em (font's hmtx).
        assert!((mono.advance_em('i') - 1233.0 / 2048.0).abs() < 1e-6);
        assert_eq!(mono.advance_em('i'), mono.advance_em('W'));
        let sans = metrics(faces, Face::Regular);
        assert!(sans.advance_em('i') < sans.advance_em('W'));
        assert!((sans.width("ii", 10.0) - 2.0 * sans.width("i", 10.0)).abs() < 1e-4);
    }

    #[test]
    fn unprintable_characters_are_replaced() {
        let faces = faces().expect("embedded faces parse");
        let text = printable(faces, Face::Regular, "a\tb\u{7}c\u{10FFFD}");
        assert_eq!(text, "a    bc\u{FFFD}");
    }

    #[test]
    fn a_subset_maps_the_characters_it_was_built_for() {
        let faces = faces().expect("embedded faces parse");
        let chars: BTreeSet<char> = "t = P·R/(S·E − 0.6·P)".chars().collect();
        let sub = subset(faces, Face::Regular, &chars).expect("subset");
        for ch in &chars {
            assert!(sub.lookup_glyph_index(*ch as u32).is_some(), "{ch} lost");
        }
        assert!(sub.lookup_glyph_index('Z' as u32).is_none());
        assert!(sub.original_bytes.len() < 40_000, "{}", sub.original_bytes.len());
    }
}
