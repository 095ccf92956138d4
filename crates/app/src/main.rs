//! The `gradewright` binary: see the library for everything it does.

fn main() -> std::process::ExitCode {
    gradewright::cli::main()
}
