//! rollsleuth command line: parse, run, map the outcome to an exit code.

fn main() -> std::process::ExitCode {
    rollsleuth::cli::main(std::env::args_os())
}
