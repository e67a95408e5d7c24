//! `cargo bench`: compile the SI example to MD + PDF + JSON in-process, and
//! a batch of 1,000 generated cases in parallel. Prints the mean time per
//! package; targets on a 2-core machine: under 20 ms per package, 1,000
//! packages under 10 s.

use knuckle::geometry::deviation;
use knuckle::package::{self, Options};
use knuckle::pipeline::evaluate;
use knuckle::render::pdf::{markdown_to_pdf, Paper, PdfMetadata, PdfOptions};
use knuckle::render::templates::TemplateSet;
use rayon::prelude::*;
use std::time::Instant;

fn compile(name: &str, source: &str, templates: &TemplateSet) -> usize {
    let ev = evaluate(name, source).expect("case evaluates");
    let additions = package::Additions::for_case(&ev);
    let pkg = package::compile(&ev, templates, &additions, &Options::default()).expect("package compiles");
    pkg.files.iter().map(|(_, b)| b.len()).sum()
}

fn main() {
    let source = std::fs::read_to_string("examples/v310-receiver-si.toml").expect("example");
    let templates = TemplateSet::default();
    // Warm the font cache and the allocator before timing.
    compile("warm.toml", &source, &templates);

    let n = 50;
    let t = Instant::now();
    let mut bytes = 0;
    for _ in 0..n {
        bytes += compile("v310.toml", &source, &templates);
    }
    let per = t.elapsed().as_secs_f64() * 1e3 / n as f64;
    println!("single package (SI example, MD+PDF+JSON): {per:.2} ms per package ({} bytes)", bytes / n);

    // Where the time goes, stage by stage, each averaged over `n` runs.
    let mean_ms = |f: &mut dyn FnMut()| {
        let t = Instant::now();
        for _ in 0..n {
            f();
        }
        t.elapsed().as_secs_f64() * 1e3 / n as f64
    };
    let ev = evaluate("v310.toml", &source).expect("case evaluates");
    let ms = mean_ms(&mut || {
        evaluate("v310.toml", &source).expect("case evaluates");
    });
    println!("  evaluate (rules, head geometry): {ms:.2} ms");
    let mut heads = Vec::new();
    for c in &ev.calculation.components {
        if let Some(g) = &c.geometry {
            if let (Ok(p), Some(r)) = (g.profile(), g.reference()) {
                heads.push((p, r));
            }
        }
    }
    let ms = mean_ms(&mut || {
        for (p, r) in &heads {
            std::hint::black_box(deviation(p, r));
        }
    });
    println!("    of which shape deviation search ({} heads): {ms:.2} ms", heads.len());
    let additions = package::Additions::for_case(&ev);
    let ms = mean_ms(&mut || {
        std::hint::black_box(package::Additions::for_case(&ev));
    });
    println!("  head sheets (profile drawings and SVG): {ms:.2} ms");
    let md_only = Options { formats: package::Formats { md: true, pdf: false, json: true }, ..Options::default() };
    let ms = mean_ms(&mut || {
        package::compile(&ev, &templates, &additions, &md_only).expect("package compiles");
    });
    println!("  context, templates, Markdown and JSON: {ms:.2} ms");
    let pkg = package::compile(&ev, &templates, &additions, &md_only).expect("package compiles");
    let opts = PdfOptions {
        paper: Paper::A4,
        header_left: "DEMO-V310-CALC-001  bench".into(),
        header_right: "Revision B".into(),
        footer_left: format!("Digest {}", &pkg.digest[..12]),
        metadata: PdfMetadata {
            title: "bench".into(),
            author: "bench".into(),
            subject: "bench".into(),
            keywords: vec![],
            date: "2024-01-01".into(),
        },
        document_id: pkg.digest.clone(),
    };
    let ms = mean_ms(&mut || {
        std::hint::black_box(markdown_to_pdf(&pkg.markdown, &additions.figures, &opts).expect("pdf"));
    });
    println!("  PDF from the Markdown: {ms:.2} ms");
    // `KNUCKLE_BENCH_PDF_LOOP=N` repeats only the PDF stage N more times and
    // stops, so that a sampling profiler sees nothing else.
    if let Some(loops) = std::env::var("KNUCKLE_BENCH_PDF_LOOP").ok().and_then(|v| v.parse::<usize>().ok()) {
        for _ in 0..loops {
            std::hint::black_box(markdown_to_pdf(&pkg.markdown, &additions.figures, &opts).expect("pdf"));
        }
        return;
    }

    let cases: Vec<String> = (0..1000)
        .map(|i| {
            let p = 0.5 + (i % 40) as f64 * 0.05;
            let d = 1300 + (i % 25) * 100;
            source
                .replace("internal_pressure = \"1.0 MPa\"", &format!("internal_pressure = \"{p} MPa\""))
                .replace("inside_diameter = \"1800 mm\"", &format!("inside_diameter = \"{d} mm\""))
                .replace("number = \"DEMO-V310-CALC-001\"", &format!("number = \"BATCH-{i:04}\""))
        })
        .collect();
    let t = Instant::now();
    let total: usize =
        cases.par_iter().enumerate().map(|(i, s)| compile(&format!("batch-{i}.toml"), s, &templates)).sum();
    let secs = t.elapsed().as_secs_f64();
    println!("batch of 1000 generated cases (MD+PDF+JSON, rayon): {secs:.2} s ({:.1} MB)", total as f64 / 1e6);
}
