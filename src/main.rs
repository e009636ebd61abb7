//! The `tonewright` binary: all work happens in the library's `cli` module.

fn main() {
    std::process::exit(tonewright::cli::run(std::env::args_os()));
}
