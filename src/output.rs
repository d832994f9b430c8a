//! Safe file output: every file is written to a temporary file in the same
//! folder, flushed and synced, then renamed over the target, so a crash or
//! error never leaves a half-written report. An output may not overwrite an
//! input of the same run.

use crate::error::{Error, Result};
use std::io::Write;
use std::path::{Path, PathBuf};

/// Refuse an output path that names one of the inputs.
pub fn refuse_overwrite_of_inputs(output: &Path, inputs: &[&Path]) -> Result<()> {
    let out = canonical_or_self(output);
    for input in inputs {
        if canonical_or_self(input) == out {
            return Err(Error::Usage(format!(
                "output {} is also an input; choose another file name",
                output.display()
            )));
        }
    }
    Ok(())
}

fn canonical_or_self(p: &Path) -> PathBuf {
    std::fs::canonicalize(p).unwrap_or_else(|_| p.to_path_buf())
}

/// Write `bytes` to `path` atomically (temporary file + rename).
pub fn write_atomic(path: &Path, bytes: &[u8]) -> Result<()> {
    write_atomic_with(path, bytes, |_| Ok(()))
}

/// As `write_atomic`, with a hook run after the temporary file is complete
/// and before the rename (tests inject failures here).
pub fn write_atomic_with(
    path: &Path,
    bytes: &[u8],
    before_rename: impl FnOnce(&Path) -> std::io::Result<()>,
) -> Result<()> {
    let err = |source| Error::Write { path: path.to_path_buf(), source };
    let dir = match path.parent() {
        Some(d) if !d.as_os_str().is_empty() => d.to_path_buf(),
        _ => PathBuf::from("."),
    };
    let name = path.file_name().map(|n| n.to_string_lossy().into_owned()).unwrap_or_default();
    let tmp = dir.join(format!(".{name}.{}.tmp", std::process::id()));
    let result = (|| {
        let mut f = std::fs::File::create(&tmp)?;
        f.write_all(bytes)?;
        f.sync_all()?;
        drop(f);
        before_rename(&tmp)?;
        std::fs::rename(&tmp, path)
    })();
    if result.is_err() {
        let _ = std::fs::remove_file(&tmp);
    }
    result.map_err(err)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn failure_before_rename_keeps_previous_output() {
        let dir = tempfile::tempdir().unwrap();
        let path = dir.path().join("plan.csv");
        write_atomic(&path, b"old").unwrap();
        let r = write_atomic_with(&path, b"new", |_| Err(std::io::Error::other("killed")));
        assert!(r.is_err());
        assert_eq!(std::fs::read(&path).unwrap(), b"old");
        // no temporary file left behind
        assert_eq!(std::fs::read_dir(dir.path()).unwrap().count(), 1);
    }

    #[test]
    fn output_equal_to_input_is_refused() {
        let dir = tempfile::tempdir().unwrap();
        let input = dir.path().join("p.toml");
        std::fs::write(&input, "x").unwrap();
        assert!(refuse_overwrite_of_inputs(&input, &[&input]).is_err());
        assert!(refuse_overwrite_of_inputs(&dir.path().join("q.csv"), &[&input]).is_ok());
    }
}
