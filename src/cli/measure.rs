//! `wherefore measure`: label maps to facts.

use crate::facts::measure::measure;
use crate::spatial::SpatialError;
use crate::spatial::config::MeasureConfig;
use crate::spatial::landscape::{Aggregate, LandscapeMode};
use crate::spatial::measure::{MeasureOptions, PairSelection};
use crate::spatial::nifti_io::read_label_map;
use crate::spatial::table::read_table;
use clap::Args;
use std::path::{Path, PathBuf};

/// Arguments of `wherefore measure`.
#[derive(Args, Debug)]
pub struct MeasureArgs {
    /// NIfTI-1 label maps (.nii or .nii.gz) on one grid.
    #[arg(required = true)]
    pub labelmaps: Vec<PathBuf>,
    /// Tab-separated label table, header `value individual class` (tabs; optional leading `map`).
    #[arg(long)]
    pub labels: PathBuf,
    /// Write the facts here (atomically) instead of standard output.
    #[arg(long)]
    pub out: Option<PathBuf>,
    /// Parameters file (TOML; defaults as in config/measure.toml).
    #[arg(long)]
    pub config: Option<PathBuf>,
    /// Ordered pairs to measure, `SUBJECTS>OBJECTS`, each side a comma list of `*`,
    /// `finding`, `anatomy`, individual ids or class IRIs; repeatable. Default `*>*`.
    #[arg(long)]
    pub pairs: Vec<String>,
    /// Digital adjacency for RCC-8 (6 or 26); overrides the config.
    #[arg(long)]
    pub adjacency: Option<u32>,
    /// How a target's landscape values are combined; overrides the config.
    #[arg(long, value_enum)]
    pub aggregate: Option<Aggregate>,
    /// Exact or fast (propagated) directional landscapes; overrides the config.
    #[arg(long, value_enum)]
    pub landscape: Option<LandscapeMode>,
    /// Write an axial and a coronal PNG per finding into this folder.
    #[arg(long)]
    pub png: Option<PathBuf>,
}

/// Runs `measure` and returns the exit code.
pub fn run(args: MeasureArgs) -> i32 {
    match run_inner(&args) {
        Ok(()) => super::EXIT_OK,
        Err(e) => {
            eprintln!("wherefore measure: error: {e}");
            match e {
                SpatialError::Limit(_) => super::EXIT_LIMIT,
                _ => super::EXIT_BAD_INPUT,
            }
        }
    }
}

fn same_file(a: &Path, b: &Path) -> bool {
    match (std::fs::canonicalize(a), std::fs::canonicalize(b)) {
        (Ok(x), Ok(y)) => x == y,
        _ => false,
    }
}

fn run_inner(args: &MeasureArgs) -> Result<(), SpatialError> {
    let mut config = match &args.config {
        Some(p) => MeasureConfig::from_file(p)?,
        None => MeasureConfig::default(),
    };
    if let Some(a) = args.adjacency {
        config.topology.adjacency = a;
    }
    if let Some(a) = args.aggregate {
        config.directional.aggregate = a;
    }
    if let Some(l) = args.landscape {
        config.directional.landscape = l;
    }
    config
        .validate()
        .map_err(|m| SpatialError::Usage(format!("bad option: {m}")))?;
    let pairs = args
        .pairs
        .iter()
        .map(|p| PairSelection::parse(p))
        .collect::<Result<Vec<_>, _>>()
        .map_err(SpatialError::Usage)?;
    if let Some(out) = &args.out {
        let inputs = args
            .labelmaps
            .iter()
            .chain([&args.labels])
            .chain(args.config.iter());
        for i in inputs {
            if same_file(out, i) {
                return Err(SpatialError::Usage(format!(
                    "--out {} is one of the inputs; choose another file name",
                    out.display()
                )));
            }
        }
    }
    let rows = read_table(&args.labels)?;
    let maps = args
        .labelmaps
        .iter()
        .map(|p| read_label_map(p))
        .collect::<Result<Vec<_>, _>>()?;
    let opts = MeasureOptions { config, pairs };
    let measured = measure(&maps, &rows, &args.labels.display().to_string(), &opts)?;
    for w in &measured.geometry.warnings {
        eprintln!("wherefore measure: warning: {w}");
    }
    if let Some(dir) = &args.png {
        crate::spatial::picture::write_pictures(dir, &maps[0], &measured.geometry, &opts.config)?;
    }
    let json = measured.facts.to_json();
    match &args.out {
        Some(out) => {
            crate::spatial::atomic_write(out, json.as_bytes()).map_err(|e| SpatialError::Write {
                file: out.display().to_string(),
                message: e.to_string(),
            })?
        }
        None => {
            use std::io::Write;
            let mut so = std::io::stdout().lock();
            so.write_all(json.as_bytes())
                .map_err(|e| SpatialError::Write {
                    file: "standard output".into(),
                    message: e.to_string(),
                })?;
        }
    }
    Ok(())
}
