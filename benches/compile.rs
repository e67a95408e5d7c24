//! `cargo bench`: compile the SI example to MD + PDF + JSON in-process, and
//! a batch of 1,000 generated cases in parallel. Prints the mean time per
//! package; targets on a 2-core machine: under 20 ms per package, 1,000
//! packages under 10 s.

use knuckle::package::{self, Options};
use knuckle::pipeline::evaluate;
use knuckle::render::templates::TemplateSet;
use rayon::prelude::*;
use std::time::Instant;

fn compile(name: &str, source: &str, templates: &TemplateSet) -> usize {
    let ev = evaluate(name, source).expect("case evaluates");
    let additions = knuckle::cli::compile::additions_for(&ev);
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

    // Where the time goes: evaluation, Markdown only, and the whole package.
    let t = Instant::now();
    for _ in 0..n {
        evaluate("v310.toml", &source).expect("case evaluates");
    }
    println!("  evaluate only: {:.2} ms", t.elapsed().as_secs_f64() * 1e3 / n as f64);
    let ev = evaluate("v310.toml", &source).expect("case evaluates");
    let md_only = Options { formats: package::Formats { md: true, pdf: false, json: true }, ..Options::default() };
    let t = Instant::now();
    for _ in 0..n {
        let additions = knuckle::cli::compile::additions_for(&ev);
        package::compile(&ev, &templates, &additions, &md_only).expect("package compiles");
    }
    println!("  geometry + Markdown + JSON (no PDF): {:.2} ms", t.elapsed().as_secs_f64() * 1e3 / n as f64);

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
