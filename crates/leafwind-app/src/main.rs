//! The `leafwind` binary: the desktop window by default, headless subcommands otherwise.

fn main() -> std::process::ExitCode {
    leafwind_app::cli::main()
}
