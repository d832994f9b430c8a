//! Command-line arguments, all in one place (clap derive). Each command's
//! help ends with an example; `app` carries the commands out.

use clap::{Parser, Subcommand};
use std::path::PathBuf;

/// Staged construction of embankments on soft clay: consolidation, strength
/// gain, stability and the fastest lift timetable that meets the FS target
/// (a prediction for the engineer of record to check, not a release).
#[derive(Debug, Parser)]
#[command(name = "fillpace", version, about, propagate_version = true)]
pub struct Cli {
    /// For scripts: no progress bars and no `warning:` lines on the terminal
    /// (results, files and errors are unchanged; warnings stay in --json).
    #[arg(long, global = true)]
    pub quiet: bool,
    #[command(subcommand)]
    pub command: Command,
}

#[derive(Debug, Subcommand)]
pub enum Command {
    /// Write a commented starter project into a new folder.
    #[command(after_help = "Example:\n  fillpace new my-site\n  fillpace check my-site/project.toml")]
    New {
        /// Folder to create (must not exist or be empty).
        dir: PathBuf,
        /// Print JSON ({"written": path}).
        #[arg(long)]
        json: bool,
    },
    /// Validate a project and print the initial ground model.
    #[command(
        after_help = "Example:\n  fillpace check examples/kestrel-fen.toml\n  fillpace check examples/kestrel-fen.toml --json"
    )]
    Check {
        /// Project file (TOML).
        project: PathBuf,
        /// Depth step of the printed profile, m.
        #[arg(long, default_value_t = 1.0)]
        step: f64,
        /// Print JSON instead of tables.
        #[arg(long)]
        json: bool,
    },
    /// Check the proposed lift sequence written in the project file.
    #[command(after_help = "Example:\n  fillpace assess examples/kestrel-fen.toml --csv history.csv")]
    Assess {
        /// Project file with a [[sequence]] of lifts.
        project: PathBuf,
        /// Days of rest to follow after the last lift.
        #[arg(long, default_value_t = 365)]
        tail_days: i64,
        /// Write the daily time series to this CSV file.
        #[arg(long)]
        csv: Option<PathBuf>,
        /// Print JSON instead of tables.
        #[arg(long)]
        json: bool,
    },
    /// Factor of safety of the section at one height (and date).
    #[command(
        after_help = "Example:\n  fillpace stability examples/kestrel-fen.toml --height 3\n  fillpace stability examples/kestrel-fen.toml --height 3 --circle 14,12,14.5"
    )]
    Stability {
        /// Project file.
        project: PathBuf,
        /// Crest height above original ground, m.
        #[arg(long)]
        height: f64,
        /// Ground state on this date (YYYY-MM-DD), following the project's
        /// [[sequence]]; without it the ground is in its initial state.
        #[arg(long)]
        date: Option<String>,
        /// Analyse one circle: centre x, centre y (m above original ground),
        /// radius, e.g. 14,12,14.5.
        #[arg(long, value_name = "XC,YC,R")]
        circle: Option<String>,
        /// Print JSON.
        #[arg(long)]
        json: bool,
    },
    /// Plan the fastest lift timetable that meets the FS target (the bundled
    /// demo when no project is given).
    #[command(
        after_help = "Example:\n  fillpace plan\n  fillpace plan examples/kestrel-fen.toml --csv plan.csv --ics holds.ics"
    )]
    Plan {
        /// Project file; omit to plan the bundled demo site.
        project: Option<PathBuf>,
        /// Write the stage table as CSV.
        #[arg(long)]
        csv: Option<PathBuf>,
        /// Write placements and hold points as an iCalendar file.
        #[arg(long)]
        ics: Option<PathBuf>,
        /// Write the PDF schedule report.
        #[arg(long)]
        pdf: Option<PathBuf>,
        /// Write plan.csv, plan.ics, plan.pdf and plan.json into this folder.
        #[arg(long, value_name = "DIR")]
        out: Option<PathBuf>,
        /// Plan the remaining lifts from the hold point of this readings
        /// file, with the model calibrated on it.
        #[arg(long, value_name = "CSV")]
        readings: Option<PathBuf>,
        /// Print JSON instead of tables.
        #[arg(long)]
        json: bool,
    },
    /// Compare design options: plan the project once for every combination
    /// of the values given (several --vary multiply into a grid), sorted by
    /// finish date.
    #[command(
        after_help = "Example:\n  fillpace compare examples/kestrel-fen.toml --vary drains.spacing_m=1.0,1.5,2.0 --vary embankment.surcharge_height_m=0,1"
    )]
    Compare {
        /// Project file.
        project: PathBuf,
        /// A key path of the project file and the values to try, e.g.
        /// drains.spacing_m=1.0,1.5,2.0 or ground.layers[1].cv_m2_per_year=1,2.
        #[arg(long = "vary", value_name = "KEY=V1,V2,...", required = true)]
        vary: Vec<String>,
        /// Write the comparison table as CSV.
        #[arg(long)]
        csv: Option<PathBuf>,
        /// Write a PDF page with the table and a duration chart.
        #[arg(long)]
        pdf: Option<PathBuf>,
        /// Print JSON instead of tables.
        #[arg(long)]
        json: bool,
    },
    /// Monte Carlo over the project's [[uncertain]] parameters: the chance
    /// that the best-estimate timetable falls below FS 1.0 or the target,
    /// and the spread of the finish date when each realisation is planned
    /// afresh.
    #[command(after_help = "Example:\n  fillpace risk examples/kestrel-fen.toml --runs 500 --seed 7 --pdf risk.pdf")]
    Risk {
        /// Project file with [[uncertain]] entries.
        project: PathBuf,
        /// Number of realisations.
        #[arg(long, default_value_t = 200)]
        runs: usize,
        /// Seed of the random streams (same seed, same answer).
        #[arg(long, default_value_t = 1)]
        seed: u64,
        /// Worker threads (default: one per core); the answer does not
        /// depend on it.
        #[arg(long)]
        threads: Option<usize>,
        /// Plan to a probability instead of the file's FS target: the
        /// lowest FS target whose timetable keeps the estimated P(FS < 1)
        /// at every stage at or below this (e.g. 0.001).
        #[arg(long, value_name = "P")]
        max_failure_probability: Option<f64>,
        /// Write the PDF pages (finish-date histogram, FS per stage).
        #[arg(long)]
        pdf: Option<PathBuf>,
        /// Print JSON instead of tables.
        #[arg(long)]
        json: bool,
    },
    /// Corridor programme: many sections along a road planned together
    /// with shared fill supply, placing crews and drain rigs (the bundled
    /// demo corridor when no file is given).
    #[command(
        after_help = "Example:\n  fillpace corridor\n  fillpace corridor examples/kestrel-fen-corridor.toml --csv works.csv --ics works.ics --pdf programme.pdf"
    )]
    Corridor {
        /// Corridor file (TOML); omit to run the bundled demo corridor.
        corridor: Option<PathBuf>,
        /// Write one row per activity as CSV.
        #[arg(long)]
        csv: Option<PathBuf>,
        /// Write placements and hold points of every section as one
        /// iCalendar file.
        #[arg(long)]
        ics: Option<PathBuf>,
        /// Write the programme as a PDF report (charts, section table,
        /// inputs with SHA-256, cautions and sign-off fields).
        #[arg(long)]
        pdf: Option<PathBuf>,
        /// Print JSON instead of tables.
        #[arg(long)]
        json: bool,
    },
    /// Hold-point check: interprets the readings, calibrates the model and
    /// recommends one of three levels (criteria met / hold pending review /
    /// stop filling and act now); writes a numbered PDF record and appends
    /// it to the record log in one transaction. The program recommends; the
    /// lift is released only when the engineer of record signs.
    #[command(
        after_help = "Example:\n  fillpace release examples/kestrel-fen.toml --readings examples/kestrel-fen-readings.csv --lift 1.0"
    )]
    Release {
        /// Project file with [[instrument]] entries.
        project: PathBuf,
        /// Readings file (CSV: instrument,time,value; `fill` rows give the
        /// as-built crest height).
        #[arg(long, value_name = "CSV")]
        readings: PathBuf,
        /// Thickness of the proposed next lift, m.
        #[arg(long, value_name = "M")]
        lift: f64,
        /// Proposed start date of the lift (YYYY-MM-DD); default the day
        /// after the last reading.
        #[arg(long, value_name = "DATE")]
        on: Option<String>,
        /// Record PDF (never overwritten); default
        /// <project>-hold-point-<date>-record-<N>.pdf next to the project.
        #[arg(long)]
        pdf: Option<PathBuf>,
        /// Record log; default <project>.hold-point-log.jsonl next to the
        /// project.
        #[arg(long)]
        log: Option<PathBuf>,
        /// Print JSON instead of tables.
        #[arg(long)]
        json: bool,
    },
    /// The record log of hold-point checks.
    #[command(subcommand)]
    Log(LogCommand),
    /// Print a shell completion script (generated from these definitions).
    #[command(
        after_help = "Example:\n  fillpace completions bash > ~/.local/share/bash-completion/completions/fillpace\n  fillpace completions zsh > ~/.zfunc/_fillpace"
    )]
    Completions {
        /// The shell to complete for.
        shell: clap_complete::Shell,
        /// Print JSON ({"script": ...}).
        #[arg(long)]
        json: bool,
    },
    /// Print the manual page (roff, generated from these definitions).
    #[command(after_help = "Example:\n  fillpace man > fillpace.1 && man ./fillpace.1")]
    Man {
        /// Print JSON ({"roff": ...}).
        #[arg(long)]
        json: bool,
    },
}

impl Command {
    /// The command's name as typed (`log verify` for the subcommand).
    pub fn name(&self) -> &'static str {
        match self {
            Command::New { .. } => "new",
            Command::Check { .. } => "check",
            Command::Assess { .. } => "assess",
            Command::Stability { .. } => "stability",
            Command::Plan { .. } => "plan",
            Command::Compare { .. } => "compare",
            Command::Risk { .. } => "risk",
            Command::Release { .. } => "release",
            Command::Corridor { .. } => "corridor",
            Command::Log(LogCommand::Verify { .. }) => "log verify",
            Command::Completions { .. } => "completions",
            Command::Man { .. } => "man",
        }
    }

    /// Whether `--json` was given (errors are then printed as JSON too).
    pub fn json(&self) -> bool {
        match self {
            Command::New { json, .. }
            | Command::Check { json, .. }
            | Command::Assess { json, .. }
            | Command::Stability { json, .. }
            | Command::Plan { json, .. }
            | Command::Compare { json, .. }
            | Command::Risk { json, .. }
            | Command::Release { json, .. }
            | Command::Corridor { json, .. }
            | Command::Log(LogCommand::Verify { json, .. })
            | Command::Completions { json, .. }
            | Command::Man { json } => *json,
        }
    }
}

#[derive(Debug, Subcommand)]
pub enum LogCommand {
    /// Check the hash chain of a record log (the first broken, edited or
    /// torn entry), optionally against the anchor printed on a signed
    /// record, and every record PDF against its logged SHA-256 (exit code 2
    /// on any failure).
    #[command(
        after_help = "Example:\n  fillpace log verify examples/kestrel-fen.hold-point-log.jsonl --record 3 --head 5f2c…"
    )]
    Verify {
        /// The log file (JSON lines).
        log: PathBuf,
        /// Record number printed on a signed record; with --head, the log
        /// must contain it and end in that head before it.
        #[arg(long, requires = "head")]
        record: Option<usize>,
        /// The log head printed on that record (64 hex digits).
        #[arg(long, requires = "record")]
        head: Option<String>,
        /// Print JSON.
        #[arg(long)]
        json: bool,
    },
}
