//! fillpace command-line entry point: parse arguments, run the command,
//! print the result (or, when the target cannot be reached, how far it
//! can go) and the error once, exit 0 / 1 (failed computation or failed
//! write) / 2 (bad input). Under `--json` an error is also printed on
//! standard output as one JSON object. A reader that closes the pipe early
//! (`fillpace plan | head -1`) ends the program quietly with 0.

use clap::Parser;
use std::io::Write;

fn main() {
    let cli = fillpace::cli::Cli::parse();
    let cmd = &cli.command;
    match fillpace::app::run_with(cmd, cli.quiet) {
        Ok(text) => {
            if let Err(e) = emit(&text) {
                if e.kind() == std::io::ErrorKind::BrokenPipe {
                    std::process::exit(0);
                }
                eprintln!("error: cannot write standard output: {e}");
                std::process::exit(1);
            }
        }
        Err(e) => {
            eprintln!("error: {e}");
            // How far the target can go (already JSON under `--json`), or
            // under `--json` the error itself as JSON. A failed write of
            // either changes nothing about the exit code.
            if let Some(report) = e.report() {
                let _ = emit(report);
            } else if cmd.json() {
                let _ = emit(&format!("{}\n", e.to_json(cmd.name())));
            }
            std::process::exit(e.exit_code());
        }
    }
}

/// Write `text` to standard output and flush it.
fn emit(text: &str) -> std::io::Result<()> {
    let mut out = std::io::stdout().lock();
    out.write_all(text.as_bytes())?;
    out.flush()
}
