//! The `wherefore` binary: parses arguments and hands over to the library.

fn main() {
    let code = wherefore::cli::main_with_args(std::env::args_os());
    std::process::exit(code);
}
