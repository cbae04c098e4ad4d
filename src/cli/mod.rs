//! Argument parsing, exit codes and the choice between text and JSON output.

pub mod check;
pub mod classify;
pub mod common;
pub mod demo;
pub mod explain;
pub mod measure;
pub mod report;
pub mod shell;
pub mod why;

use clap::{Parser, Subcommand};
use std::ffi::OsString;

/// Exit code for success.
pub const EXIT_OK: i32 = 0;
/// Exit code of `check` when a case failed.
pub const EXIT_FAILED: i32 = 1;
/// Exit code for bad input or usage.
pub const EXIT_BAD_INPUT: i32 = 2;
/// Exit code when a resource limit stopped the work.
pub const EXIT_LIMIT: i32 = 3;

/// Output format selected with `--format`.
#[derive(Clone, Copy, Debug, PartialEq, Eq, clap::ValueEnum)]
pub enum Format {
    /// Human-readable text.
    Text,
    /// JSON as the contract describes.
    Json,
}

#[derive(Parser, Debug)]
#[command(
    name = "wherefore",
    version,
    about = "Measure, reason, explain and draft reports over labelled medical volumes and OWL 2 knowledge."
)]
struct Cli {
    #[command(subcommand)]
    command: Command,
}

#[derive(Subcommand, Debug)]
enum Command {
    /// Classify ontologies: consistency, unsatisfiable classes, subsumptions.
    Classify(classify::ClassifyArgs),
    /// Explain observations by abduction: minimal hypotheses that account for them.
    Explain(explain::ExplainArgs),
    /// Justify an entailment, an unsatisfiable class or the inconsistency; list repairs.
    Why(why::WhyArgs),
    /// Draft reports (clinician, patient, formal) for a case or a batch of cases.
    Report(report::ReportArgs),
    /// Run the whole job on the built-in synthetic demo.
    Demo(demo::DemoArgs),
    /// Measure spatial relations between labelled regions of NIfTI label maps.
    Measure(measure::MeasureArgs),
    /// Run regression cases for a knowledge base (see the README's case format).
    Check(check::CheckArgs),
    /// An interactive shell over a knowledge base (or a script of its commands).
    Shell(shell::ShellArgs),
}

/// Runs the command line and returns the process exit code.
pub fn main_with_args<I, T>(args: I) -> i32
where
    I: IntoIterator<Item = T>,
    T: Into<OsString> + Clone,
{
    let cli = match Cli::try_parse_from(args) {
        Ok(cli) => cli,
        Err(e) => {
            let code = match e.kind() {
                clap::error::ErrorKind::DisplayHelp | clap::error::ErrorKind::DisplayVersion => {
                    EXIT_OK
                }
                _ => EXIT_BAD_INPUT,
            };
            let _ = e.print();
            return code;
        }
    };
    match cli.command {
        Command::Classify(a) => classify::run(a),
        Command::Measure(a) => measure::run(a),
        Command::Explain(a) => explain::run(a),
        Command::Why(a) => why::run(a),
        Command::Demo(a) => demo::run(a),
        Command::Report(a) => report::run(a),
        Command::Check(a) => check::run(a),
        Command::Shell(a) => shell::run(a),
    }
}
