//! Command-line subcommands.

/// Runs the program with the process arguments and returns its exit code.
pub fn main_entry() -> std::process::ExitCode {
    std::process::ExitCode::SUCCESS
}
