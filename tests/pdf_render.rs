//! End-to-end checks of the Markdown to PDF renderer: the produced file is read
//! back with lopdf and its pages, text and metadata are inspected.

use std::collections::BTreeMap;

use knuckle::drawing::{Anchor, Drawing, Shape, Stroke};
use knuckle::render::pdf::{markdown_to_pdf, Paper, PdfError, PdfMetadata, PdfOptions};
use lopdf::{Document, Object};

fn options(paper: Paper) -> PdfOptions {
    PdfOptions {
        paper,
        header_left: "KN-0042 Receiver vessel V-101".to_string(),
        header_right: "Revision B".to_string(),
        footer_left: "Digest 1a2b3c4d5e6f".to_string(),
        metadata: PdfMetadata {
            title: "Receiver vessel V-101 — calculation package".to_string(),
            author: "A. Engineer".to_string(),
            subject: "Internal pressure design".to_string(),
            keywords: vec!["pressure vessel".to_string(), "shell".to_string()],
            date: "2024-03-15".to_string(),
        },
        document_id: "1a2b3c4d5e6f7a8b9c0d".to_string(),
    }
}

fn render(md: &str) -> Vec<u8> {
    markdown_to_pdf(md, &BTreeMap::new(), &options(Paper::A4)).expect("renders")
}

/// Text of every page, in page order.
fn page_texts(pdf: &[u8]) -> Vec<String> {
    let doc = Document::load_mem(pdf).expect("the output parses as PDF");
    let pages = doc.get_pages();
    pages.keys().map(|n| doc.extract_text(&[*n]).expect("text extracts")).collect()
}

/// Text with all white space removed, so that checks do not depend on how a
/// reader joins the pieces of a line.
fn squash(s: &str) -> String {
    s.chars().filter(|c| !c.is_whitespace()).collect()
}

fn has(page: &str, needle: &str) -> bool {
    squash(page).contains(&squash(needle))
}

/// A torispherical head profile (crown radius L = D, knuckle radius r = 0.06·D)
/// built from sampled arcs, with a dashed centre line, a diameter line and
/// labels, like the figures of a calculation package.
fn head_drawing() -> Drawing {
    // Drawing millimetres; y grows downwards. The knuckle centres lie on the
    // line y = base; the flange runs 15 mm below it.
    let (axis, base, ro) = (75.0_f64, 42.0_f64, 60.0_f64);
    let (crown, knuckle) = (2.0 * ro, 0.06 * 2.0 * ro);
    // Crown centre below the knuckle line so that the arcs meet tangentially:
    // |crown centre - knuckle centre| = L - r (common practice, no source).
    let h = ((crown - knuckle).powi(2) - (ro - knuckle).powi(2)).sqrt();
    let theta = h.atan2(ro - knuckle);
    let arc = |cx: f64, cy: f64, r: f64, a0: f64, a1: f64| -> Vec<(f64, f64)> {
        (0..=48)
            .map(|i| {
                let a = a0 + (a1 - a0) * f64::from(i) / 48.0;
                (cx + r * a.cos(), cy - r * a.sin())
            })
            .collect()
    };
    let mut right = vec![(axis + ro, base + 15.0)];
    right.extend(arc(axis + ro - knuckle, base, knuckle, 0.0, theta));
    right.extend(arc(axis, base + h, crown, theta, std::f64::consts::FRAC_PI_2));
    // Left flange up to the crown top (the mirror image), then back down the right.
    let mut profile: Vec<(f64, f64)> = right.iter().map(|&(x, y)| (2.0 * axis - x, y)).collect();
    profile.extend(right.iter().rev().skip(1));
    let dim_y = base + 22.0;
    Drawing {
        width: 150.0,
        height: 75.0,
        caption: "Head profile".to_string(),
        shapes: vec![
            Shape::Polyline { points: profile, stroke: Stroke::solid(0.5), closed: false },
            Shape::Polyline {
                points: vec![(axis, 4.0), (axis, base + 20.0)],
                stroke: Stroke::dashed(0.25, 4.0, 1.5).grey(0.4),
                closed: false,
            },
            Shape::Polyline {
                points: vec![(axis - ro, dim_y), (axis + ro, dim_y)],
                stroke: Stroke::solid(0.2),
                closed: false,
            },
            Shape::Polyline {
                points: vec![(axis - ro, dim_y - 2.0), (axis - ro, dim_y + 2.0)],
                stroke: Stroke::solid(0.2),
                closed: false,
            },
            Shape::Polyline {
                points: vec![(axis + ro, dim_y - 2.0), (axis + ro, dim_y + 2.0)],
                stroke: Stroke::solid(0.2),
                closed: false,
            },
            Shape::Text { at: (axis, dim_y + 5.0), size: 8.0, text: "D = 1200 mm".to_string(), anchor: Anchor::Middle },
            Shape::Text {
                at: (axis + ro + 2.0, base - 4.0),
                size: 8.0,
                text: "r = 0.06·D".to_string(),
                anchor: Anchor::Start,
            },
            Shape::Text { at: (axis + 3.0, 14.0), size: 8.0, text: "L = D".to_string(), anchor: Anchor::Start },
        ],
    }
}

fn sample_markdown() -> String {
    let mut md = String::from(
        "# Calculation package KN-0042\n\n\
         | Item | Value |\n|---|---|\n\
         | Vessel | Receiver V-101 |\n| Design code | ASME BPVC Section VIII Division 1 |\n\
         | Design pressure | 1.20 MPa at 150 °C |\n| Revision | B |\n\n\
         <!-- page-break -->\n\n\
         ## 1 Cylindrical shell\n\n\
         The required thickness under internal pressure follows UG-27(c)(1): \
         **t = P·R/(S·E − 0.6·P)**, valid while *t ≤ R/2* and P ≤ 0.385·S·E. \
         Stress is written σ, angles in °, areas in mm², volumes in m³, √ and π and α \
         as in the code, and 2 × 3 for products. Inline `t_min = 6.35 mm` is code.\n\n\
         | Part | P (MPa) | R (mm) | S (MPa) | E | t = P·R/(S·E − 0.6·P) (mm) | Check |\n\
         |---|--:|--:|--:|--:|--:|:-:|\n",
    );
    for i in 1..=6 {
        md.push_str(&format!(
            "| Shell course {i} | 1.20 | {} | 138 | 0.85 | {:.2} | t ≥ t_req |\n",
            600 + 50 * i,
            1.2 * f64::from(600 + 50 * i) / (138.0 * 0.85 - 0.72)
        ));
    }
    md.push_str(
        "\n### 1.0 Loadings\n\n\
         | Load case | Pressure | Temperature | Allowable stress | Joint efficiency | Governing formula | Remark |\n\
         |---|---|---|---|---|---|---|\n\
         | Design | 1.20 MPa internal | 150 °C | S = 138 MPa at design temperature | E = 0.85 (spot radiography, UW-12) | t = P·R/(S·E − 0.6·P) | circumferential stress governs |\n\
         | Hydrostatic test | 1.3 × MAWP × (S_test/S_design) | ambient, 20 °C | S = 138 MPa | E = 0.85 | P_T = 1.3·MAWP·S_T/S | UG-99(b); a long remark that must wrap over several lines of its narrow cell |\n\
         \n![Torispherical head profile with the knuckle and crown radii](head)\n\n\
         ### 1.1 Notes\n\n\
         - Joint efficiency from UW-12, full radiography.\n\
         - Corrosion allowance added to the required thickness.\n  \
           1. nested item one\n  2. nested item two\n\n\
         > Checker's remark: the crown radius shall not exceed the outside diameter.\n\n\
         ```\nt_req = 1.20 * 650 / (138 * 0.85 - 0.6 * 1.20)\n```\n\n---\n\n",
    );
    for i in 0..60 {
        md.push_str(&format!(
            "Paragraph {i} of running text that fills the package with enough words to \
             wrap across several lines and several pages, as a long report does.\n\n"
        ));
    }
    md
}

/// Markdown that pushes every block across page ends: a long table, a long
/// code block, a long quote, deep lists and a table too wide for the page.
fn stress_markdown() -> String {
    let mut md = String::from("# Nozzle schedule\n\n| Mark | Service | Size | Rating | Facing | Projection (mm) | Remark |\n|---|---|--:|---|---|--:|---|\n");
    for i in 0..70 {
        md.push_str(&format!(
            "| N{i} | {} | DN {} | Class 300 | RF | {} | {} |\n",
            if i % 3 == 0 { "Inlet from the upstream separator" } else { "Drain" },
            50 + 5 * i,
            150 + i,
            if i % 7 == 0 { "reinforcing pad per UG-37, see the separate calculation" } else { "" }
        ));
    }
    md.push_str("\n## Listing\n\n```\n");
    for i in 0..80 {
        md.push_str(&format!("step {i:3}: t_req = P * R / (S * E - 0.6 * P)   # {}\n", "x".repeat(i % 90)));
    }
    md.push_str("```\n\n");
    for _ in 0..3 {
        md.push_str("> A long remark of the checker that runs on and on, quoted in full so that the bar beside it must continue on the next page. A long remark of the checker that runs on.\n>\n");
    }
    md.push('\n');
    for i in 0..6 {
        md.push_str(&format!("{}- level {i} item with some text\n", "  ".repeat(i)));
    }
    md.push_str("\n| a | b | c | d | e | f | g | h | i | j |\n|---|---|---|---|---|---|---|---|---|---|\n");
    md.push_str(&format!("| {} | 1 | 2 | 3 | 4 | 5 | 6 | 7 | 8 | 9 |\n", "y".repeat(300)));
    md
}

#[test]
fn text_of_headings_tables_and_symbols_is_extractable() {
    let mut figures = BTreeMap::new();
    figures.insert("head".to_string(), head_drawing());
    let pdf = markdown_to_pdf(&sample_markdown(), &figures, &options(Paper::A4)).expect("renders");
    let pages = page_texts(&pdf);
    let all: String = pages.concat();
    for needle in [
        "Calculation package KN-0042",
        "1 Cylindrical shell",
        "Receiver V-101",
        "t = P·R/(S·E − 0.6·P)",
        "t ≤ R/2",
        "Shell course 6",
        "·−≤≥",
        "σ",
        "°",
        "mm²",
        "m³",
        "√",
        "π",
        "α",
        "2 × 3",
        "t_min = 6.35 mm",
        "Torispherical head profile",
        "r = 0.06·D",
        "Checker's remark",
        "t_req = 1.20 * 650",
        "nested item two",
    ] {
        // "·−≤≥" does not occur as such; check each of its characters.
        if needle == "·−≤≥" {
            for c in needle.chars() {
                assert!(all.contains(c), "{c} missing");
            }
            continue;
        }
        assert!(has(&all, needle), "`{needle}` missing from the text");
    }
    // The cover table sits alone on page 1 because of the forced page break.
    assert!(has(&pages[0], "Design pressure"));
    assert!(!has(&pages[0], "Cylindrical shell"));
    // Subset fonts keep the file small (whole DejaVu faces are ~700 KB each).
    assert!(pdf.len() < 150_000, "{} bytes", pdf.len());

    if let Ok(path) = std::env::var("KNUCKLE_SAMPLE_PDF") {
        std::fs::write(&path, &pdf).expect("sample written");
        let letter = markdown_to_pdf(&sample_markdown(), &figures, &options(Paper::Letter)).expect("renders on Letter");
        std::fs::write(format!("{path}.letter.pdf"), letter).expect("sample written");
        std::fs::write(format!("{path}.stress.pdf"), render(&stress_markdown())).expect("sample written");
        // Timing of a ten-page package (the sample with its text doubled).
        let long = format!("{}\n\n{}", sample_markdown(), sample_markdown());
        let reference = markdown_to_pdf(&long, &figures, &options(Paper::A4)).expect("renders");
        let start = std::time::Instant::now();
        let runs = 20;
        for _ in 0..runs {
            let again = markdown_to_pdf(&long, &figures, &options(Paper::A4)).expect("renders");
            assert_eq!(again, reference);
        }
        eprintln!(
            "{} pages, {} bytes, {:.2} ms per call",
            page_texts(&reference).len(),
            reference.len(),
            start.elapsed().as_secs_f64() * 1000.0 / f64::from(runs)
        );
    }
}

#[test]
fn every_page_has_the_running_header_and_footer() {
    let pdf = render(&sample_markdown().replace("![Torispherical", "[Torispherical"));
    let pages = page_texts(&pdf);
    assert!(pages.len() >= 3, "{} pages", pages.len());
    let n = pages.len();
    for (i, page) in pages.iter().enumerate() {
        assert!(has(page, "KN-0042 Receiver vessel V-101"), "page {}", i + 1);
        assert!(has(page, "Revision B"), "page {}", i + 1);
        assert!(has(page, "Digest 1a2b3c4d5e6f"), "page {}", i + 1);
        assert!(has(page, &format!("Page {} of {n}", i + 1)), "page {}", i + 1);
    }
}

#[test]
fn the_same_input_gives_the_same_bytes() {
    let md = sample_markdown().replace("![Torispherical", "[Torispherical");
    let first = render(&md);
    // Another document in between must not change the next one's bytes.
    let _other = render("# Something else\n\nwith σ and other text.\n");
    let second = render(&md);
    assert!(first == second, "two renderings differ");
    // A different package digest changes the file identifier only.
    let mut other_id = options(Paper::A4);
    other_id.document_id = "ffff".to_string();
    let third = markdown_to_pdf(&md, &BTreeMap::new(), &other_id).expect("renders");
    assert_ne!(first, third);
    assert_eq!(first.len(), third.len());
}

fn media_boxes(pdf: &[u8]) -> Vec<Vec<f32>> {
    let doc = Document::load_mem(pdf).expect("parses");
    doc.get_pages()
        .values()
        .map(|id| {
            let page = doc.get_dictionary(*id).expect("page dictionary");
            page.get(b"MediaBox")
                .and_then(Object::as_array)
                .expect("media box")
                .iter()
                .map(|o| o.as_float().expect("number"))
                .collect()
        })
        .collect()
}

#[test]
fn paper_size_sets_the_media_box() {
    let md = "# Title\n\nText.\n";
    let a4 = markdown_to_pdf(md, &BTreeMap::new(), &options(Paper::A4)).expect("renders");
    let letter = markdown_to_pdf(md, &BTreeMap::new(), &options(Paper::Letter)).expect("renders");
    // ISO 216: A4 is 210 mm x 297 mm = 595.28 pt x 841.89 pt (1 pt = 25.4/72 mm).
    let b = &media_boxes(&a4)[0];
    assert!((b[2] - 595.28).abs() < 0.05 && (b[3] - 841.89).abs() < 0.05, "{b:?}");
    // US Letter is 8.5 in x 11 in = 612 pt x 792 pt.
    let b = &media_boxes(&letter)[0];
    assert!((b[2] - 612.0).abs() < 0.05 && (b[3] - 792.0).abs() < 0.05, "{b:?}");
}

#[test]
fn a_missing_figure_is_an_error_that_names_it() {
    let err = markdown_to_pdf("Text\n\n![Nozzle detail](nozzle-n1)\n", &BTreeMap::new(), &options(Paper::A4))
        .expect_err("must fail");
    assert_eq!(err, PdfError::UnknownFigure { name: "nozzle-n1".to_string() });
    assert!(err.to_string().contains("nozzle-n1"));
}

#[test]
fn a_bad_date_is_an_error() {
    let mut o = options(Paper::A4);
    o.metadata.date = "15.03.2024".to_string();
    let err = markdown_to_pdf("x", &BTreeMap::new(), &o).expect_err("must fail");
    assert!(err.to_string().contains("15.03.2024"), "{err}");
}

#[test]
fn a_forced_page_break_starts_a_new_page() {
    let one = page_texts(&render("Alpha\n\nBeta\n"));
    assert_eq!(one.len(), 1);
    let two = page_texts(&render("Alpha\n\n<!-- page-break -->\n\nBeta\n"));
    assert_eq!(two.len(), 2);
    assert!(has(&two[0], "Alpha") && !has(&two[0], "Beta"));
    assert!(has(&two[1], "Beta"));
    // A break at the very end, or two in a row, adds no empty page.
    let trailing =
        page_texts(&render("Alpha\n\n<!-- page-break -->\n\n<!-- page-break -->\n\nBeta\n\n<!-- page-break -->\n"));
    assert_eq!(trailing.len(), 2);
}

#[test]
fn a_long_table_repeats_its_head_on_every_page() {
    let mut md = String::from("| Nozzle mark | Size | Rating |\n|---|---|---|\n");
    for i in 0..150 {
        md.push_str(&format!("| N{i} | DN {} | Class 300 |\n", 50 + i));
    }
    let pages = page_texts(&render(&md));
    assert!(pages.len() >= 3, "{} pages", pages.len());
    for (i, page) in pages.iter().enumerate() {
        assert!(has(page, "Nozzle mark"), "head missing on page {}", i + 1);
    }
    // Every row is printed exactly once.
    let all = squash(&pages.concat());
    for i in 0..150 {
        assert_eq!(all.matches(&format!("N{i}DN{}", 50 + i)).count(), 1, "row {i}");
    }
}

#[test]
fn a_heading_is_never_left_alone_at_the_bottom_of_a_page() {
    // Whatever the amount of text before it, the heading shares its page with
    // the start of the paragraph that follows it.
    for n in 40..75 {
        let mut md = String::new();
        for i in 0..n {
            md.push_str(&format!("Filler line {i}.\n\n"));
        }
        md.push_str("## Heading to keep\n\nFirst words after the heading.\n");
        let pages = page_texts(&render(&md));
        let page = pages.iter().find(|p| has(p, "Heading to keep")).expect("heading printed");
        assert!(has(page, "First words after the heading"), "n = {n}");
    }
}

#[test]
fn document_information_is_written_and_not_labelled_pdf_x() {
    let pdf = render("# T\n");
    let doc = Document::load_mem(&pdf).expect("parses");
    let info_id = doc.trailer.get(b"Info").and_then(Object::as_reference).expect("info");
    let info = doc.get_dictionary(info_id).expect("info dictionary");
    let text = |key: &[u8]| -> String {
        let bytes = info.get(key).and_then(Object::as_str).expect("string");
        if bytes.starts_with(&[0xFE, 0xFF]) {
            let units: Vec<u16> = bytes[2..].chunks(2).map(|c| u16::from_be_bytes([c[0], c[1]])).collect();
            String::from_utf16(&units).expect("utf-16")
        } else {
            String::from_utf8(bytes.to_vec()).expect("utf-8")
        }
    };
    assert_eq!(text(b"Title"), "Receiver vessel V-101 — calculation package");
    assert_eq!(text(b"Author"), "A. Engineer");
    assert_eq!(text(b"Subject"), "Internal pressure design");
    assert_eq!(text(b"Keywords"), "pressure vessel, shell");
    assert_eq!(text(b"CreationDate"), "D:20240315000000+00'00'");
    assert_eq!(text(b"ModDate"), "D:20240315000000+00'00'");
    assert!(info.get(b"GTS_PDFXVersion").is_err());
    assert!(doc.catalog().expect("catalog").get(b"Metadata").is_err());
    let id = doc.trailer.get(b"ID").and_then(Object::as_array).expect("id");
    assert_eq!(id.len(), 2);
}

#[test]
fn figures_are_drawn_as_vectors_with_dashes_and_labels() {
    let mut figures = BTreeMap::new();
    figures.insert("head".to_string(), head_drawing());
    let pdf = markdown_to_pdf("![](head)\n", &figures, &options(Paper::A4)).expect("renders");
    let doc = Document::load_mem(&pdf).expect("parses");
    let page = *doc.get_pages().values().next().expect("a page");
    let content = doc.get_and_decode_page_content(page).expect("content");
    let ops: Vec<&str> = content.operations.iter().map(|o| o.operator.as_str()).collect();
    // A dash pattern with entries is set for the centre line (ISO 32000-1, 8.4.3.6).
    assert!(content.operations.iter().any(
        |o| o.operator == "d" && o.operands.first().and_then(|a| a.as_array().ok()).is_some_and(|a| !a.is_empty())
    ));
    // The sampled arcs are one path of many segments.
    assert!(ops.iter().filter(|o| **o == "l").count() >= 80);
    let text = page_texts(&pdf).concat();
    // The empty alternative text falls back to the drawing's own caption.
    assert!(has(&text, "Head profile"));
    assert!(has(&text, "L = D"));
}

#[test]
fn hostile_markdown_renders_without_panicking() {
    let long_word = "x".repeat(5000);
    let wide_table = format!(
        "|{}|\n|{}|\n|{}|\n",
        (0..30).map(|i| format!("c{i}")).collect::<Vec<_>>().join("|"),
        vec!["---"; 30].join("|"),
        (0..30).map(|_| long_word.as_str()).collect::<Vec<_>>().join("|"),
    );
    let deep_list: String = (0..300).map(|i| format!("{}- level {i}\n", "  ".repeat(i))).collect();
    let deep_quote = format!("{} deep\n", ">".repeat(5000));
    let tall_cell = format!("| a | b |\n|---|---|\n| {} | x |\n", "word ".repeat(8000));
    let tall_head = format!("| {} | b |\n|---|---|\n| 1 | x |\n| 2 | y |\n", "head ".repeat(4000));
    let inputs = [
        String::new(),
        "   \n\n\n".to_string(),
        "<!-- page-break -->".to_string(),
        long_word.clone(),
        format!("# {long_word}\n\n`{long_word}`\n\n```\n{long_word}\n```\n"),
        "| |\n|-|\n".to_string(),
        "| a | b |\n|---|---|\n".to_string(),
        wide_table,
        deep_list,
        deep_quote,
        tall_cell,
        tall_head,
        "| ![in a cell](nothing) | b |\n|---|---|\n| 1 | 2 |\n".to_string(),
        "# ![in a heading](nothing)\n".to_string(),
        "\u{0}\u{7}\u{1b}[31m\u{202e}\u{10ffff}\u{fffe}\t\r\n".to_string(),
        "- \n- \n\n1. \n".to_string(),
        "<div>raw html</div>\n\n<br>\n".to_string(),
        "***bold italic*** ~~strike~~ [^1] [link](http://example.org) ![](".to_string(),
        "中文 العربية עברית 🙂 emoji\n".to_string(),
        "a  \nb\\\nc\n".to_string(),
    ];
    for md in &inputs {
        let pdf = render(md);
        assert!(Document::load_mem(&pdf).is_ok(), "unreadable PDF for {:?}", md.chars().take(40).collect::<String>());
    }
}
