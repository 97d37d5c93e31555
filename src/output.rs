//! Writing result files safely: every output goes to a temporary file in the target
//! folder and is renamed into place only when complete, so a failure never leaves a
//! half-written or clobbered file; and no output may replace one of the inputs.

use std::fs::File;
use std::path::{Path, PathBuf};

use crate::error::{Error, Result};

/// Refuses `dest` when it is the same file as any of `inputs`.
pub fn check_not_input(dest: &Path, inputs: &[PathBuf]) -> Result<()> {
    let Ok(d) = dest.canonicalize() else {
        return Ok(());
    };
    for input in inputs {
        if input.canonicalize().is_ok_and(|i| i == d) {
            return Err(Error::input(format!(
                "the output {} is also an input; refusing to write over it",
                dest.display()
            )));
        }
    }
    Ok(())
}

/// An output file being written: a temporary file beside its destination.
pub struct OutputFile {
    tmp: tempfile::NamedTempFile,
    dest: PathBuf,
}

impl OutputFile {
    pub fn create(dest: &Path, inputs: &[PathBuf]) -> Result<Self> {
        check_not_input(dest, inputs)?;
        if dest.is_dir() {
            return Err(Error::input(format!(
                "the output {} is a folder",
                dest.display()
            )));
        }
        let folder = match dest.parent() {
            Some(p) if !p.as_os_str().is_empty() => p,
            _ => Path::new("."),
        };
        let name = dest
            .file_name()
            .map(|n| n.to_string_lossy().into_owned())
            .unwrap_or_default();
        let prefix = format!(".{name}.");
        let mut builder = tempfile::Builder::new();
        builder.prefix(&prefix).suffix(".part");
        #[cfg(unix)]
        {
            // Readable by others like any ordinary output, not the private 0600 default.
            use std::os::unix::fs::PermissionsExt;
            builder.permissions(std::fs::Permissions::from_mode(0o644));
        }
        let tmp = builder.tempfile_in(folder).map_err(|e| {
            Error::input(format!(
                "cannot write in the folder {}: {e}",
                folder.display()
            ))
        })?;
        Ok(OutputFile {
            tmp,
            dest: dest.to_path_buf(),
        })
    }

    pub fn file(&mut self) -> &mut File {
        self.tmp.as_file_mut()
    }

    /// Moves the finished file into place.
    pub fn commit(self) -> Result<()> {
        let dest = self.dest;
        self.tmp
            .persist(&dest)
            .map_err(|e| Error::input(format!("cannot create {}: {}", dest.display(), e.error)))?;
        Ok(())
    }
}

/// Writes a whole small file (CSV, JSON) atomically.
pub fn write_bytes(dest: &Path, inputs: &[PathBuf], bytes: &[u8]) -> Result<()> {
    use std::io::Write;
    let mut out = OutputFile::create(dest, inputs)?;
    out.file()
        .write_all(bytes)
        .map_err(|e| Error::internal(format!("writing {} failed: {e}", dest.display())))?;
    out.commit()
}
