//! The `wherefore` binary: parses arguments and hands over to the library.

fn main() {
    // Writing into a closed pipe (`wherefore classify … | head`) ends the program quietly, as
    // command-line tools do, instead of panicking in `println!`.
    #[cfg(unix)]
    // SAFETY: restoring the default action of SIGPIPE before any thread starts.
    unsafe {
        libc::signal(libc::SIGPIPE, libc::SIG_DFL);
    }
    let default_hook = std::panic::take_hook();
    std::panic::set_hook(Box::new(move |info| {
        // A parser panic is turned into an error message by the loader; stay quiet for it.
        if std::thread::current().name() == Some(wherefore::kb::load::PARSER_THREAD) {
            return;
        }
        default_hook(info);
    }));
    // The work runs on a thread with a large stack: recursive walks over class expressions
    // (conversion, writing axioms back as text, dropping parsed trees) go as deep as the
    // input nests, and a document may nest tens of thousands of levels. The loader refuses
    // deeper ones (`kb::owl::MAX_NESTING`); this stack holds that depth with room to spare.
    let worker = std::thread::Builder::new()
        .name("wherefore".into())
        .stack_size(1 << 30)
        .spawn(|| wherefore::cli::main_with_args(std::env::args_os()));
    let code = match worker {
        Ok(handle) => handle.join().unwrap_or(101),
        // No thread could be made (a very low limit on virtual memory): run here instead.
        Err(_) => wherefore::cli::main_with_args(std::env::args_os()),
    };
    std::process::exit(code);
}
