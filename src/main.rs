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
    let code = wherefore::cli::main_with_args(std::env::args_os());
    std::process::exit(code);
}
