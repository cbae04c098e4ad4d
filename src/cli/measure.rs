//! `wherefore measure`: label maps to facts.

use clap::Args;
use std::path::PathBuf;

/// Arguments of `wherefore measure`.
#[derive(Args, Debug)]
pub struct MeasureArgs {
    /// NIfTI-1 label maps on one grid.
    #[arg(required = true)]
    pub labelmaps: Vec<PathBuf>,
    /// Tab-separated label table.
    #[arg(long)]
    pub labels: PathBuf,
    /// Write the facts here instead of standard output.
    #[arg(long)]
    pub out: Option<PathBuf>,
}

/// Runs `measure` and returns the exit code.
pub fn run(_args: MeasureArgs) -> i32 {
    eprintln!("wherefore measure: not built yet in this version");
    super::EXIT_BAD_INPUT
}
