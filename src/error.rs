//! The library's error type. Bad input (exit code 2) names the file, line,
//! key path, value and what is allowed; a failed computation (exit code 1)
//! says which computation and why. The binary prints the chain once.

use std::fmt;
use std::path::PathBuf;

/// One problem found in an input file.
#[derive(Debug, Clone, PartialEq)]
pub struct InputIssue {
    /// 1-based line in the file, where known.
    pub line: Option<usize>,
    /// Key path such as `ground.layers[2].cr`, or empty for the whole file.
    pub key: String,
    /// Whole sentence: the value and what is allowed.
    pub message: String,
}

impl fmt::Display for InputIssue {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        if let Some(line) = self.line {
            write!(f, "{line}: ")?;
        }
        if self.key.is_empty() {
            write!(f, "{}", self.message)
        } else if self.message.starts_with("= ") {
            write!(f, "{} {}", self.key, self.message)
        } else {
            write!(f, "{}: {}", self.key, self.message)
        }
    }
}

/// Everything that can go wrong in fillpace.
#[derive(Debug, thiserror::Error)]
pub enum Error {
    /// A file could not be read.
    #[error("cannot read {}: {source}", path.display())]
    Read { path: PathBuf, source: std::io::Error },
    /// An input file has one or more problems.
    #[error("{}", render_issues(file, issues))]
    Input { file: String, issues: Vec<InputIssue> },
    /// A command-line value is out of range or inconsistent with the project.
    #[error("{0}")]
    Usage(String),
    /// An output could not be written (nothing partial is left behind).
    #[error("cannot write {}: {source}", path.display())]
    Write { path: PathBuf, source: std::io::Error },
    /// A computation could not produce a trustworthy answer.
    #[error("{0}")]
    Computation(String),
    /// The target height cannot be reached at the FS target; `report` (for
    /// standard output) shows how far it can go and why not further.
    #[error("{reason}")]
    Unbuildable { reason: String, report: String },
    /// A date computed from a day count lies outside the dates the calendar
    /// can represent (day `day` counted from `start`).
    #[error("day {day} after {start} is outside the representable calendar; {context}")]
    DateOutOfRange { start: chrono::NaiveDate, day: i64, context: &'static str },
}

impl Error {
    /// Process exit code: 2 for bad input, 1 for everything else.
    pub fn exit_code(&self) -> i32 {
        match self {
            Error::Input { .. } | Error::Usage(_) | Error::Read { .. } => 2,
            Error::Write { .. } | Error::Computation(_) | Error::Unbuildable { .. } | Error::DateOutOfRange { .. } => 1,
        }
    }

    /// What to print on standard output before the error, if anything.
    pub fn report(&self) -> Option<&str> {
        match self {
            Error::Unbuildable { report, .. } => Some(report),
            _ => None,
        }
    }

    /// Short machine-readable name of the kind of error.
    pub fn kind(&self) -> &'static str {
        match self {
            Error::Read { .. } => "read",
            Error::Input { .. } => "input",
            Error::Usage(_) => "usage",
            Error::Write { .. } => "write",
            Error::Computation(_) => "computation",
            Error::Unbuildable { .. } => "unbuildable",
            Error::DateOutOfRange { .. } => "date-out-of-range",
        }
    }

    /// The error as one JSON object (printed on standard output under
    /// `--json`): kind, exit code, message, and for input errors the file
    /// and each issue's line, key and message.
    pub fn to_json(&self, command: &str) -> serde_json::Value {
        let mut error = serde_json::json!({
            "kind": self.kind(),
            "exit_code": self.exit_code(),
            "message": self.to_string(),
        });
        match self {
            Error::Input { file, issues } => {
                error["file"] = file.as_str().into();
                error["issues"] = issues
                    .iter()
                    .map(|i| serde_json::json!({ "line": i.line, "key": i.key, "message": i.message }))
                    .collect();
            }
            Error::Read { path, .. } | Error::Write { path, .. } => error["file"] = path.display().to_string().into(),
            _ => {}
        }
        serde_json::json!({ "fillpace": env!("CARGO_PKG_VERSION"), "command": command, "error": error })
    }

    /// A single input issue.
    pub fn input(file: &str, line: Option<usize>, key: &str, message: String) -> Self {
        Error::Input { file: file.to_string(), issues: vec![InputIssue { line, key: key.to_string(), message }] }
    }
}

fn render_issues(file: &str, issues: &[InputIssue]) -> String {
    let mut out = String::new();
    if issues.len() > 1 {
        out.push_str(&format!("{file}: {} problems\n", issues.len()));
    }
    for (i, issue) in issues.iter().enumerate() {
        if i > 0 {
            out.push('\n');
        }
        match issue.line {
            Some(_) => out.push_str(&format!("{file}:{issue}")),
            None => out.push_str(&format!("{file}: {issue}")),
        }
    }
    out
}

/// Result alias used across the library.
pub type Result<T> = std::result::Result<T, Error>;
