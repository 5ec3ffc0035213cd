//! The `tidewright` binary: parse arguments, hand over to the library, map errors to exit codes.

fn main() -> std::process::ExitCode {
    tidewright::cli::main_entry()
}
