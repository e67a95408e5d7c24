//! `knuckle register list|show|history|verify --archive ARCHIVE`: reads the
//! archive register.

use super::{EXIT_INPUT, EXIT_NOT_ACCEPTABLE, EXIT_OK};
use crate::archive::register::Record;
use crate::archive::Archive;
use std::path::PathBuf;

/// Arguments of `register`.
#[derive(clap::Args, Debug)]
pub struct Args {
    /// What to show.
    #[command(subcommand)]
    pub action: Action,
}

/// Options every register action takes.
#[derive(clap::Args, Debug)]
pub struct Common {
    /// The archive folder.
    #[arg(long)]
    pub archive: PathBuf,
    /// Print JSON instead of text.
    #[arg(long)]
    pub json: bool,
}

/// The register actions.
#[derive(clap::Subcommand, Debug)]
pub enum Action {
    /// The current revision of every document.
    List(Common),
    /// One revision in full (the current one unless --revision is given).
    Show {
        /// Document number.
        document: String,
        /// Revision to show.
        #[arg(long)]
        revision: Option<String>,
        #[command(flatten)]
        common: Common,
    },
    /// Every issued revision of a document.
    History {
        /// Document number.
        document: String,
        #[command(flatten)]
        common: Common,
    },
    /// Re-hash every stored file and walk the hash chain.
    Verify(Common),
}

fn print_json<T: serde::Serialize>(v: &T) -> i32 {
    match serde_json::to_string_pretty(v) {
        Ok(s) => {
            println!("{s}");
            EXIT_OK
        }
        Err(e) => {
            eprintln!("error: cannot write JSON: {e}");
            EXIT_INPUT
        }
    }
}

fn signers(r: &Record) -> String {
    if r.signatures.is_empty() {
        return "unsigned".into();
    }
    r.signatures.iter().map(|s| format!("{}: {}", s.role, s.signer)).collect::<Vec<_>>().join(", ")
}

fn line(r: &Record) -> String {
    format!(
        "{}  rev {}  {}  {}  digest {}  issued {} by {}  ({})",
        r.document,
        r.revision,
        r.date,
        r.status.as_str(),
        r.digest.get(..16).unwrap_or(&r.digest),
        r.issued_at,
        r.issued_by,
        signers(r)
    )
}

fn detail(r: &Record) -> String {
    let mut out = format!(
        "{} revision {}: {}\n  date {}, {}, design {}\n  digest {}\n  issued {} by {} (record {})\n",
        r.document,
        r.revision,
        r.title,
        r.date,
        r.status.as_str(),
        r.design_status,
        r.digest,
        r.issued_at,
        r.issued_by,
        r.seq
    );
    if let Some(s) = &r.supersedes {
        out.push_str(&format!("  supersedes revision {s}\n"));
    }
    if let Some(b) = &r.superseded_by {
        out.push_str(&format!("  superseded by revision {b}\n"));
    }
    out.push_str("  signatures:\n");
    if r.signatures.is_empty() {
        out.push_str("    none\n");
    }
    for s in &r.signatures {
        out.push_str(&format!("    {:<9} {} on {}, key {}\n", s.role, s.signer, s.date, s.fingerprint));
    }
    out.push_str("  files:\n");
    for f in &r.files {
        out.push_str(&format!("    {}  {:>9} bytes  {}\n", f.sha256, f.bytes, f.name));
    }
    out.push_str(&format!("  record hash {}\n", r.record_hash));
    out
}

/// Runs `register`: 0 done (verify: intact), 1 verify found problems, 2 usage error.
pub fn run(a: &Args) -> i32 {
    let common = match &a.action {
        Action::List(c) | Action::Verify(c) => c,
        Action::Show { common, .. } | Action::History { common, .. } => common,
    };
    let archive = match Archive::open(&common.archive) {
        Ok(x) => x,
        Err(e) => {
            eprintln!("error: {e}");
            return EXIT_INPUT;
        }
    };
    let result = match &a.action {
        Action::List(c) => archive.list().map(|rs| {
            if c.json {
                return print_json(&rs);
            }
            if rs.is_empty() {
                println!("the register is empty");
            }
            for r in &rs {
                println!("{}", line(r));
            }
            EXIT_OK
        }),
        Action::Show { document, revision, common } => archive.show(document, revision.as_deref()).map(|r| {
            if common.json {
                print_json(&r)
            } else {
                print!("{}", detail(&r));
                EXIT_OK
            }
        }),
        Action::History { document, common } => archive.history(document).map(|rs| {
            if common.json {
                return print_json(&rs);
            }
            if rs.is_empty() {
                eprintln!("error: document {document} is not in the register");
                return EXIT_INPUT;
            }
            for r in &rs {
                println!("{}", line(r));
            }
            EXIT_OK
        }),
        Action::Verify(c) => archive.verify().map(|v| {
            let code = if v.intact() { EXIT_OK } else { EXIT_NOT_ACCEPTABLE };
            if c.json {
                let printed = print_json(&v);
                return if printed == EXIT_OK { code } else { printed };
            }
            for p in &v.problems {
                println!("PROBLEM: {p}");
            }
            println!("{} records, {} stored files re-hashed; chain head {}", v.records, v.files_checked, v.head);
            println!("{}", if v.intact() { "archive intact" } else { "archive NOT intact" });
            code
        }),
    };
    match result {
        Ok(code) => code,
        Err(e) => {
            eprintln!("error: {e}");
            EXIT_INPUT
        }
    }
}
