//! `wherefore report`: report drafts for one case (facts file) or a batch (manifest).

use super::common::{KbOptions, load_kb};
use crate::files::write_atomic;
use crate::kb::KnowledgeBase;
use crate::render;
use clap::{Args, ValueEnum};
use rayon::prelude::*;
use serde::Deserialize;
use std::io::IsTerminal;
use std::path::{Path, PathBuf};

/// The register of text output.
#[derive(Clone, Copy, Debug, PartialEq, Eq, ValueEnum)]
pub enum Register {
    /// Concise, in the trade's terms.
    Clinician,
    /// Plain words.
    Patient,
    /// Description logic and functional syntax.
    Formal,
}

/// The format of a single report.
#[derive(Clone, Copy, Debug, PartialEq, Eq, ValueEnum)]
pub enum ReportFormat {
    /// Plain text of one register (all three when none is chosen).
    Text,
    /// The report as JSON.
    Json,
    /// Markdown draft.
    Md,
    /// Self-contained HTML draft.
    Html,
    /// HL7 FHIR R4 DiagnosticReport (JSON), status preliminary.
    Fhir,
}

/// Arguments of `wherefore report`.
#[derive(Args, Debug)]
pub struct ReportArgs {
    /// Knowledge-base ontology files.
    #[arg(long = "kb", required = true, num_args = 1..)]
    pub kb: Vec<PathBuf>,
    /// A facts file (from `measure`).
    #[arg(long, conflicts_with = "manifest")]
    pub facts: Option<PathBuf>,
    /// A batch manifest (TOML, `[[case]]` tables).
    #[arg(long)]
    pub manifest: Option<PathBuf>,
    /// Register for text output.
    #[arg(long, value_enum)]
    pub register: Option<Register>,
    /// Output format of a single report.
    #[arg(long, value_enum, default_value = "text")]
    pub format: ReportFormat,
    /// Output file (single report) or folder (batch).
    #[arg(long)]
    pub out: Option<PathBuf>,
    /// α-cut for graded facts.
    #[arg(long, default_value_t = 0.5)]
    pub alpha: f64,
    /// Largest explanation size.
    #[arg(long = "max-size", default_value_t = 3)]
    pub max_size: usize,
    /// Process only slice i of n (1-based), e.g. 2/8, for array jobs.
    #[arg(long)]
    pub shard: Option<String>,
    /// Redo cases whose outputs are newer than their inputs.
    #[arg(long)]
    pub force: bool,
    /// Cases run at once in a batch (0: one per core).
    #[arg(long, default_value_t = 0)]
    pub jobs: usize,
    #[command(flatten)]
    kb_opts: KbOptions,
}

fn bad(msg: String) -> i32 {
    eprintln!("error: {msg}");
    super::EXIT_BAD_INPUT
}

/// Runs `report` and returns the exit code.
pub fn run(args: ReportArgs) -> i32 {
    if !(0.0..=1.0).contains(&args.alpha) || args.alpha == 0.0 {
        return bad(format!("--alpha {} must lie in (0, 1]", args.alpha));
    }
    let kb = match load_kb(&args.kb, &args.kb_opts) {
        Ok(kb) => kb,
        Err(c) => return c,
    };
    if let Some(m) = &args.manifest {
        return batch(&args, &kb, m);
    }
    let Some(fp) = &args.facts else {
        return bad("give --facts FACTS.json or --manifest CASES.toml".into());
    };
    let facts = match crate::facts::read_facts(fp) {
        Ok(f) => f,
        Err(e) => return bad(e),
    };
    let case = fp
        .file_stem()
        .map(|s| s.to_string_lossy().to_string())
        .unwrap_or_else(|| "case".into());
    let report = match render::report_for(
        &kb,
        &facts,
        &case,
        &fp.display().to_string(),
        args.alpha,
        args.max_size,
    ) {
        Ok(r) => r,
        Err(e) => return bad(format!("{}: {e}", fp.display())),
    };
    let text = match args.format {
        ReportFormat::Json => serde_json::to_string_pretty(&report).unwrap_or_default() + "\n",
        ReportFormat::Md => render::markdown(&report),
        ReportFormat::Html => render::html::page(&report, &[]),
        ReportFormat::Fhir => render::fhir::diagnostic_report(&report),
        ReportFormat::Text => match args.register {
            Some(Register::Clinician) => report.registers.clinician.clone(),
            Some(Register::Patient) => report.registers.patient.clone(),
            Some(Register::Formal) => report.registers.formal.clone(),
            None => format!(
                "{}\n{}\n{}",
                report.registers.clinician, report.registers.patient, report.registers.formal
            ),
        },
    };
    match &args.out {
        Some(p) => {
            let mut inputs = args.kb.clone();
            inputs.push(fp.clone());
            if let Err(e) = write_atomic(p, text.as_bytes(), &inputs) {
                return bad(e);
            }
        }
        None => print!("{text}"),
    }
    super::EXIT_OK
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct Manifest {
    case: Vec<ManifestCase>,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct ManifestCase {
    id: String,
    facts: Option<PathBuf>,
    maps: Option<Vec<PathBuf>>,
    labels: Option<PathBuf>,
}

fn batch(args: &ReportArgs, kb: &KnowledgeBase, manifest: &Path) -> i32 {
    let Some(out) = &args.out else {
        return bad("batch mode needs --out DIR".into());
    };
    let text = match std::fs::read_to_string(manifest) {
        Ok(t) => t,
        Err(e) => return bad(format!("{}: cannot read: {e}", manifest.display())),
    };
    let m: Manifest = match toml::from_str(&text) {
        Ok(m) => m,
        Err(e) => return bad(format!("{}: {e}", manifest.display())),
    };
    let (shard, shards) = match &args.shard {
        None => (1, 1),
        Some(s) => match s
            .split_once('/')
            .and_then(|(a, b)| Some((a.parse::<usize>().ok()?, b.parse::<usize>().ok()?)))
        {
            Some((i, n)) if n >= 1 && (1..=n).contains(&i) => (i, n),
            _ => return bad(format!("--shard {s}: expected i/n with 1 ≤ i ≤ n")),
        },
    };
    let base = manifest.parent().unwrap_or(Path::new("."));
    let mut seen = std::collections::BTreeSet::new();
    for c in &m.case {
        if !seen.insert(c.id.as_str()) {
            return bad(format!(
                "{}: case id {:?} appears twice; ids name output folders and must be unique",
                manifest.display(),
                c.id
            ));
        }
    }
    let selected: Vec<&ManifestCase> = m
        .case
        .iter()
        .enumerate()
        .filter(|(k, _)| k % shards == shard - 1)
        .map(|(_, c)| c)
        .collect();
    let progress = if std::io::stderr().is_terminal() {
        let pb = indicatif::ProgressBar::new(selected.len() as u64);
        pb.set_style(
            indicatif::ProgressStyle::with_template(
                "{bar:40} {pos}/{len} cases, {elapsed} (eta {eta})",
            )
            .unwrap_or_else(|_| indicatif::ProgressStyle::default_bar()),
        );
        Some(pb)
    } else {
        None
    };
    let one = |c: &ManifestCase| -> CaseOutcome {
        let t = std::time::Instant::now();
        let status = if c.id.is_empty() || c.id.contains(['/', '\\']) || c.id.starts_with('.') {
            Err("the id must be a plain folder name".to_string())
        } else {
            let dir = out.join(&c.id);
            let inputs = c.inputs(base);
            if !args.force && is_fresh(&dir.join("report.json"), &inputs) {
                Ok(None)
            } else {
                run_case(kb, c, base, &dir, args).map(Some)
            }
        };
        let o = CaseOutcome {
            id: c.id.clone(),
            status,
            secs: t.elapsed().as_secs_f64(),
        };
        let line = o.line();
        match &progress {
            Some(pb) => {
                if o.status.is_err() {
                    pb.println(&line);
                }
                pb.inc(1);
            }
            None => eprintln!("{line}"),
        }
        o
    };
    let run_all = || -> Vec<CaseOutcome> { selected.par_iter().map(|c| one(c)).collect() };
    if args.jobs > 1024 {
        return bad(format!(
            "--jobs {}: at most 1024 threads; give 0 for one per core",
            args.jobs
        ));
    }
    let outcomes = if args.jobs > 0 {
        match rayon::ThreadPoolBuilder::new()
            .num_threads(args.jobs)
            .build()
        {
            Ok(pool) => pool.install(run_all),
            Err(e) => {
                return bad(format!(
                    "--jobs {}: cannot start the threads: {e}",
                    args.jobs
                ));
            }
        }
    } else {
        run_all()
    };
    if let Some(pb) = &progress {
        pb.finish_and_clear();
    }
    // The closing table, in manifest order.
    let width = outcomes
        .iter()
        .map(|o| o.id.len())
        .max()
        .unwrap_or(4)
        .max(4);
    println!(
        "{:<width$}  {:<8}  {:>12}  {:>8}",
        "case", "status", "explanations", "seconds"
    );
    let (mut done, mut skipped, mut failed) = (0, 0, 0);
    for o in &outcomes {
        let (status, n) = match &o.status {
            Ok(Some(n)) => {
                done += 1;
                ("ok", n.to_string())
            }
            Ok(None) => {
                skipped += 1;
                ("skipped", "-".to_string())
            }
            Err(_) => {
                failed += 1;
                ("FAILED", "-".to_string())
            }
        };
        println!(
            "{:<width$}  {:<8}  {:>12}  {:>8.2}",
            o.id, status, n, o.secs
        );
    }
    println!(
        "{done} done, {skipped} skipped (up to date), {failed} failed (shard {shard}/{shards})"
    );
    if failed > 0 {
        super::EXIT_BAD_INPUT
    } else {
        super::EXIT_OK
    }
}

impl ManifestCase {
    /// The case's input files (facts, or label maps and their table), relative to `base`.
    fn inputs(&self, base: &Path) -> Vec<PathBuf> {
        self.facts
            .iter()
            .chain(self.maps.iter().flatten())
            .chain(self.labels.iter())
            .map(|p| base.join(p))
            .collect()
    }
}

/// What became of one case of a batch.
struct CaseOutcome {
    id: String,
    /// Number of explanations written, `None` when skipped as up to date, or the error.
    status: Result<Option<usize>, String>,
    secs: f64,
}

impl CaseOutcome {
    fn line(&self) -> String {
        match &self.status {
            Ok(Some(n)) => format!("{}: ok, {n} explanation(s), {:.2} s", self.id, self.secs),
            Ok(None) => format!("{}: up to date, skipped", self.id),
            Err(e) => format!("{}: FAILED: {e}", self.id),
        }
    }
}

fn is_fresh(target: &Path, inputs: &[PathBuf]) -> bool {
    let Ok(t) = std::fs::metadata(target).and_then(|m| m.modified()) else {
        return false;
    };
    inputs.iter().all(|i| {
        std::fs::metadata(i)
            .and_then(|m| m.modified())
            .map(|m| m <= t)
            .unwrap_or(false)
    })
}

fn run_case(
    kb: &KnowledgeBase,
    c: &ManifestCase,
    base: &Path,
    dir: &Path,
    args: &ReportArgs,
) -> Result<usize, String> {
    let facts = match (&c.facts, &c.maps, &c.labels) {
        (Some(f), None, None) => crate::facts::read_facts(&base.join(f))?,
        (None, Some(maps), Some(labels)) => {
            let maps: Vec<PathBuf> = maps.iter().map(|p| base.join(p)).collect();
            crate::facts::from_label_maps(&maps, &base.join(labels))?
        }
        _ => return Err("give either `facts` or both `maps` and `labels`".into()),
    };
    std::fs::create_dir_all(dir).map_err(|e| format!("{}: cannot create: {e}", dir.display()))?;
    let report = render::report_for(kb, &facts, &c.id, &c.id, args.alpha, args.max_size)?;
    // Never write over an input: the case's own files and the KB.
    let mut inputs = c.inputs(base);
    inputs.extend(args.kb.iter().cloned());
    let w = |name: &str, bytes: &[u8]| write_atomic(&dir.join(name), bytes, &inputs);
    if c.facts.is_none() {
        w("facts.json", facts.to_json().as_bytes())?;
    }
    w("report.md", render::markdown(&report).as_bytes())?;
    w("report.html", render::html::page(&report, &[]).as_bytes())?;
    w(
        "report.json",
        (serde_json::to_string_pretty(&report).unwrap_or_default() + "\n").as_bytes(),
    )?;
    Ok(report.explanations.len())
}
