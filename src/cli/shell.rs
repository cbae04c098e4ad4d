//! `wherefore shell`: the terminal side of the shell (rustyline: history, completion,
//! multi-line input, Ctrl-C) and the scripted mode. The session and its commands are in
//! `crate::shell`.

use super::common::KbOptions;
use crate::kb::load::LoadOptions;
use crate::shell::{COMMANDS, Session, run_script, syntax};
use clap::Args;
use rustyline::completion::{Completer, FilenameCompleter, Pair};
use rustyline::error::ReadlineError;
use rustyline::highlight::Highlighter;
use rustyline::hint::Hinter;
use rustyline::history::FileHistory;
use rustyline::validate::{ValidationContext, ValidationResult, Validator};
use rustyline::{CompletionType, Config, Context, Editor, Helper};
use std::cell::RefCell;
use std::io::{IsTerminal, Read};
use std::path::PathBuf;
use std::rc::Rc;
use std::sync::atomic::{AtomicBool, Ordering};
use std::sync::{Arc, OnceLock};
use std::time::Duration;

/// Arguments of `wherefore shell`.
#[derive(Args, Debug)]
pub struct ShellArgs {
    /// Ontology files to load at the start.
    pub kb: Vec<PathBuf>,
    /// A facts file whose findings are the observations for `explain`.
    #[arg(long)]
    pub facts: Option<PathBuf>,
    /// Run the commands of this file and stop at the first error (exit code 2).
    #[arg(long)]
    pub script: Option<PathBuf>,
    /// Time limit in seconds for the reasoning of each command.
    #[arg(long, value_name = "SECONDS")]
    pub timeout: Option<f64>,
    /// Largest number of completion-graph nodes in one test.
    #[arg(
        long = "max-graph-nodes",
        value_name = "N",
        default_value_t = 1_000_000
    )]
    pub max_graph_nodes: usize,
    #[command(flatten)]
    kb_opts: KbOptions,
}

/// The cancel flag that SIGINT sets while a command runs.
static CANCEL: OnceLock<Arc<AtomicBool>> = OnceLock::new();

extern "C" fn on_sigint(_: libc::c_int) {
    // Only an atomic store: safe in a signal handler.
    if let Some(f) = CANCEL.get() {
        f.store(true, Ordering::SeqCst);
    }
}

/// Runs the shell and returns the exit code.
pub fn run(args: ShellArgs) -> i32 {
    let mut session = Session::new(LoadOptions {
        import_dirs: args.kb_opts.import_dirs.clone(),
        lenient: args.kb_opts.lenient,
        catalog: args.kb_opts.catalog.clone(),
    });
    session.timeout = args
        .timeout
        .filter(|t| t.is_finite() && *t >= 0.0)
        .map(|t| Duration::from_secs_f64(t.min(1e9)));
    session.max_graph_nodes = args.max_graph_nodes;
    if !args.kb.is_empty() {
        match session.load_files(&args.kb) {
            Ok(m) => eprintln!("{m}"),
            Err(e) => {
                eprintln!("{e}");
                return super::EXIT_BAD_INPUT;
            }
        }
    }
    if let Some(f) = &args.facts {
        match session.execute(&format!("import \"{}\" as observations", f.display())) {
            Ok(m) => eprint!("{m}"),
            Err(e) => {
                eprintln!("{e}");
                return super::EXIT_BAD_INPUT;
            }
        }
    }
    let script = match &args.script {
        Some(p) => match std::fs::read_to_string(p) {
            Ok(t) => Some((p.display().to_string(), t)),
            Err(e) => {
                eprintln!("error: {}: cannot read the script: {e}", p.display());
                return super::EXIT_BAD_INPUT;
            }
        },
        None if !std::io::stdin().is_terminal() => {
            let mut t = String::new();
            if let Err(e) = std::io::stdin().read_to_string(&mut t) {
                eprintln!("error: cannot read standard input: {e}");
                return super::EXIT_BAD_INPUT;
            }
            Some(("<stdin>".to_string(), t))
        }
        None => None,
    };
    if let Some((name, text)) = script {
        session.show_times = true;
        let result = run_script(&mut session, &text, |s| {
            use std::io::Write;
            let mut o = std::io::stdout().lock();
            let _ = o.write_all(s.as_bytes());
        });
        return match result {
            Ok(()) => super::EXIT_OK,
            Err((line, e)) => {
                eprintln!("{e}");
                eprintln!("{name}:{line}: stopped at the first error");
                super::EXIT_BAD_INPUT
            }
        };
    }
    interactive(session)
}

/// The file that keeps the history: `$XDG_DATA_HOME/wherefore/shell-history`, or the
/// platform's data directory.
pub fn history_path() -> Option<PathBuf> {
    let base = std::env::var_os("XDG_DATA_HOME")
        .filter(|v| !v.is_empty())
        .map(PathBuf::from)
        .or_else(dirs::data_dir)?;
    Some(base.join("wherefore").join("shell-history"))
}

fn interactive(mut session: Session) -> i32 {
    let cancel = CANCEL
        .get_or_init(|| Arc::new(AtomicBool::new(false)))
        .clone();
    session.cancel = cancel;
    #[cfg(unix)]
    // SAFETY: the handler only stores into an atomic flag.
    unsafe {
        libc::signal(
            libc::SIGINT,
            on_sigint as extern "C" fn(libc::c_int) as libc::sighandler_t,
        );
    }
    let config = Config::builder()
        .completion_type(CompletionType::List)
        .auto_add_history(false)
        .build();
    let mut rl: Editor<ShellHelper, FileHistory> = match Editor::with_config(config) {
        Ok(e) => e,
        Err(e) => {
            eprintln!("error: cannot start the line editor: {e}");
            return super::EXIT_BAD_INPUT;
        }
    };
    let words = Rc::new(RefCell::new(session.names().completion_words()));
    rl.set_helper(Some(ShellHelper {
        words: words.clone(),
        files: FilenameCompleter::new(),
    }));
    let history = history_path();
    if let Some(h) = &history {
        if let Some(dir) = h.parent() {
            let _ = std::fs::create_dir_all(dir);
        }
        let _ = rl.load_history(h);
    }
    println!("wherefore shell: type help for the commands, quit or Ctrl-D to leave.");
    // Confirmations read a line from the terminal.
    session.confirm = Some(Box::new(|q: &str| {
        use std::io::Write;
        print!("{q}");
        let _ = std::io::stdout().flush();
        let mut a = String::new();
        let _ = std::io::stdin().read_line(&mut a);
        matches!(a.trim(), "y" | "Y" | "yes")
    }));
    loop {
        let prompt = session.prompt();
        match rl.readline(&prompt) {
            Ok(line) => {
                if line.trim().is_empty() {
                    continue;
                }
                let _ = rl.add_history_entry(line.as_str());
                match session.execute(&line) {
                    Ok(out) => print!("{out}"),
                    Err(e) => eprintln!("{e}"),
                }
                if session.wants_quit() {
                    break;
                }
                *words.borrow_mut() = session.names().completion_words();
            }
            Err(ReadlineError::Interrupted) => {
                println!("(Ctrl-C: line cleared; type quit or press Ctrl-D to leave)");
            }
            Err(ReadlineError::Eof) => break,
            Err(e) => {
                eprintln!("error: {e}");
                break;
            }
        }
    }
    if let Some(h) = &history
        && let Err(e) = rl.save_history(h)
    {
        eprintln!("warning: cannot save the history to {}: {e}", h.display());
    }
    super::EXIT_OK
}

/// Completion, multi-line input and the rest of rustyline's helper.
struct ShellHelper {
    words: Rc<RefCell<Vec<String>>>,
    files: FilenameCompleter,
}

/// Commands whose arguments are file paths.
const PATH_COMMANDS: [&str; 4] = ["load", "unload", "import", "save"];

impl Completer for ShellHelper {
    type Candidate = Pair;

    fn complete(
        &self,
        line: &str,
        pos: usize,
        ctx: &Context<'_>,
    ) -> rustyline::Result<(usize, Vec<Pair>)> {
        let before = &line[..pos];
        let first = before.split_whitespace().next().unwrap_or("");
        let in_first_word = !before.trim_start().contains(char::is_whitespace);
        if in_first_word {
            let start = before.len() - before.trim_start().len();
            let prefix = before.trim_start();
            let c = COMMANDS
                .iter()
                .filter(|c| c.name.starts_with(prefix))
                .map(|c| Pair {
                    display: c.name.to_string(),
                    replacement: format!("{} ", c.name),
                })
                .collect();
            return Ok((start, c));
        }
        if PATH_COMMANDS.contains(&first) {
            return self.files.complete(line, pos, ctx);
        }
        // Inside an open 'label' the word starts at the quote; else after a separator.
        let start = if before.matches('\'').count() % 2 == 1 {
            before.rfind('\'').unwrap_or(0)
        } else {
            before
                .rfind(|c: char| c.is_whitespace() || "(){},".contains(c))
                .map(|i| i + 1)
                .unwrap_or(0)
        };
        let prefix = &before[start..];
        let lower = prefix.trim_start_matches('\'').to_lowercase();
        let c = self
            .words
            .borrow()
            .iter()
            .filter(|w| {
                w.trim_start_matches('\'')
                    .to_lowercase()
                    .starts_with(&lower)
            })
            .map(|w| Pair {
                display: w.clone(),
                replacement: w.clone(),
            })
            .collect();
        Ok((start, c))
    }
}

impl Hinter for ShellHelper {
    type Hint = String;
}

impl Highlighter for ShellHelper {}

impl Validator for ShellHelper {
    fn validate(&self, ctx: &mut ValidationContext) -> rustyline::Result<ValidationResult> {
        // Unbalanced parentheses continue on the next line.
        Ok(if syntax::balanced(ctx.input()) {
            ValidationResult::Valid(None)
        } else {
            ValidationResult::Incomplete
        })
    }
}

impl Helper for ShellHelper {}
