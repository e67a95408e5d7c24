//! The command line. Only this module touches the terminal, the process
//! exit status and (through the subcommands) the file system.
//!
//! Exit status everywhere: 0 all checks pass, 1 a design is not acceptable
//! (or a verification failed), 2 an input or usage error (nothing written).

mod check;
pub mod compile;
pub(crate) mod diff;
mod heads;
mod inspect;
mod issue;
mod keygen;
mod materials;
mod register;
mod sign;
mod starter;
pub mod verify;

use clap::{Parser, Subcommand};
use std::ffi::OsString;
use std::path::Path;

/// Exit status: everything holds.
pub const EXIT_OK: i32 = 0;
/// Exit status: a design is not acceptable, or a verification failed.
pub const EXIT_NOT_ACCEPTABLE: i32 = 1;
/// Exit status: input or usage error; nothing computed or written.
pub const EXIT_INPUT: i32 = 2;

#[derive(Parser, Debug)]
#[command(name = "knuckle", version, about = "Compiles pressure-vessel case files into traceable calculation packages", long_about = None)]
struct Cli {
    #[command(subcommand)]
    command: Command,
}

#[derive(Subcommand, Debug)]
enum Command {
    /// Evaluate a case file and print the summary (or the results as JSON).
    Check(check::CheckArgs),
    /// Compile case files into calculation packages (Markdown, PDF, JSON, manifest).
    Compile(compile::CompileArgs),
    /// Check that a package's files are as compiled (and, with --case, that it recompiles the same).
    Verify(verify::VerifyArgs),
    /// Compare head shapes for one diameter: depth, volume, area, blank, thickness, mass, deviation.
    Heads(heads::HeadsArgs),
    /// Judge measured points of a formed head against its specified profile (UG-81) and write a record.
    InspectHead(inspect::InspectArgs),
    /// Write a commented starter case file.
    New {
        /// Where to write the case file (must not exist).
        path: std::path::PathBuf,
    },
    /// Print the JSON Schema of the case file.
    Schema,
    /// List the materials of a library, or show one with its stress table.
    Materials(materials::MaterialsArgs),
    /// Create a signing key pair for one person.
    Keygen(keygen::Args),
    /// Sign a package for a sign-off role.
    Sign(sign::Args),
    /// Show what changed between two revisions.
    Diff(diff::Args),
    /// Record an issued revision in an archive.
    Issue(issue::Args),
    /// Read or verify an archive's register.
    Register(register::Args),
}

/// Runs the command line and returns the exit status.
pub fn run(args: Vec<OsString>) -> i32 {
    let cli = match Cli::try_parse_from(args) {
        Ok(c) => c,
        Err(e) => {
            let code = if e.use_stderr() { EXIT_INPUT } else { EXIT_OK };
            let _ = e.print();
            return code;
        }
    };
    match cli.command {
        Command::Check(a) => check::run(&a),
        Command::Compile(a) => compile::run(&a),
        Command::Verify(a) => verify::run(&a),
        Command::Heads(a) => heads::run(&a),
        Command::InspectHead(a) => inspect::run(&a),
        Command::New { path } => starter::write_new(&path),
        Command::Materials(a) => materials::run(&a),
        Command::Schema => {
            println!("{}", starter::schema_text());
            EXIT_OK
        }
        Command::Keygen(a) => keygen::run(&a),
        Command::Sign(a) => sign::run(&a),
        Command::Diff(a) => diff::run(&a),
        Command::Issue(a) => issue::run(&a),
        Command::Register(a) => register::run(&a),
    }
}

/// Reads a case file, or prints why not.
pub(crate) fn read_case(path: &Path) -> Result<String, i32> {
    std::fs::read_to_string(path).map_err(|e| {
        eprintln!("error: cannot read case file `{}`: {e}", path.display());
        EXIT_INPUT
    })
}

/// The built-in templates, or those of `dir` laid over them; prints why not.
pub(crate) fn load_templates(dir: Option<&Path>) -> Result<crate::render::templates::TemplateSet, i32> {
    match dir {
        Some(d) => crate::render::templates::TemplateSet::with_overrides(d).map_err(|e| {
            eprintln!("error: {e}");
            EXIT_INPUT
        }),
        None => Ok(crate::render::templates::TemplateSet::default()),
    }
}

/// The public keys of a `--trust` list; prints why not.
pub(crate) fn load_trusted(paths: &[std::path::PathBuf]) -> Result<Vec<crate::signing::PublicKey>, i32> {
    paths
        .iter()
        .map(|p| {
            crate::signing::PublicKey::load(p).map_err(|e| {
                eprintln!("error: --trust: {e}");
                EXIT_INPUT
            })
        })
        .collect()
}
