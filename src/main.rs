//! fillpace command-line entry point: parse arguments, run the command,
//! print the result (or, when the target cannot be reached, how far it
//! can go) and the error once, exit 0 / 1 (failed computation) /
//! 2 (bad input).

use clap::Parser;

fn main() {
    let cli = fillpace::cli::Cli::parse();
    match fillpace::app::run(&cli.command) {
        Ok(text) => print!("{text}"),
        Err(e) => {
            if let Some(report) = e.report() {
                print!("{report}");
            }
            eprintln!("error: {e}");
            std::process::exit(e.exit_code());
        }
    }
}
