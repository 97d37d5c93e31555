//! Writing result files safely. A command first lists every file it will write in an
//! [`OutputPlan`], which checks them all before any work starts: each folder exists,
//! no output is an input, no two outputs are the same file, and an existing target is
//! a regular file. Opening the plan creates a temporary file beside each target
//! (proving the folder writable); the command fills them and [`Outputs::commit`]
//! renames them all into place at the end. An error or an interrupt before then
//! leaves every target as it was: all files are written, or none.
//!
//! Symbolic links are written through: the temporary file is made beside the file
//! the link names and renamed onto it, so the link stays a link. `-` means standard
//! output (streamed, so a failure there can leave a partial stream); while an output
//! goes there, progress and report lines go to standard error instead.

mod cleanup;
mod target;

use std::io::{IsTerminal, Write};
use std::path::{Path, PathBuf};
use std::sync::atomic::{AtomicBool, Ordering};

pub use target::Target;

use crate::error::{Error, Result};

/// Set while an output is standard output: reports then go to standard error.
static STDOUT_TAKEN: AtomicBool = AtomicBool::new(false);

/// True when standard output carries data, so messages must go elsewhere.
pub fn stdout_taken() -> bool {
    STDOUT_TAKEN.load(Ordering::Relaxed)
}

/// A handle to one planned output.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Slot(usize);

/// The outputs of one command, checked together before anything is written.
#[derive(Debug)]
pub struct OutputPlan {
    inputs: Vec<PathBuf>,
    targets: Vec<Target>,
}

impl OutputPlan {
    pub fn new(inputs: &[PathBuf]) -> Self {
        OutputPlan {
            inputs: inputs.to_vec(),
            targets: Vec::new(),
        }
    }

    /// Adds an output of text (CSV, JSON, cube); `-` is standard output.
    pub fn add(&mut self, path: &Path) -> Result<Slot> {
        self.add_checked(path, false)
    }

    /// Adds an output of binary data (PNG, gzip): `-` is refused when standard
    /// output is a terminal.
    pub fn add_binary(&mut self, path: &Path) -> Result<Slot> {
        self.add_checked(path, true)
    }

    /// Adds an optional output.
    pub fn add_opt(&mut self, path: Option<&Path>, binary: bool) -> Result<Option<Slot>> {
        path.map(|p| self.add_checked(p, binary)).transpose()
    }

    fn add_checked(&mut self, path: &Path, binary: bool) -> Result<Slot> {
        let t = Target::check(path)?;
        match &t {
            Target::Stdout => {
                // Reports printed from now on (before the data) must not mix with it.
                STDOUT_TAKEN.store(true, Ordering::Relaxed);
                if self.targets.contains(&Target::Stdout) {
                    return Err(Error::input(
                        "only one output can go to standard output ('-')",
                    ));
                }
                if binary && std::io::stdout().is_terminal() {
                    return Err(Error::input(
                        "refusing to write binary data (PNG or gzip) to a terminal",
                    )
                    .with_hint("redirect standard output to a file or a pipe"));
                }
            }
            Target::File { real, .. } => {
                check_not_input(real, &self.inputs).map_err(|e| {
                    Error::input(e.message.replace(&real.display().to_string(), &t.shown()))
                })?;
                let id = target::identity(real);
                for other in &self.targets {
                    if let Target::File { real: r2, .. } = other {
                        if id.is_some() && target::identity(r2) == id {
                            return Err(Error::input(format!(
                                "{} and {} are the same file; each output needs its own name",
                                other.shown(),
                                t.shown()
                            )));
                        }
                    }
                }
            }
        }
        self.targets.push(t);
        Ok(Slot(self.targets.len() - 1))
    }

    /// Creates the temporary files (and takes standard output if asked). Stale
    /// temporary files of dead lobecast runs in the same folders are removed first.
    pub fn open(self) -> Result<Outputs> {
        let mut items = Vec::with_capacity(self.targets.len());
        for t in self.targets {
            items.push(match t {
                // A descriptor closed by the shell (`>&-`) is reopened on /dev/null
                // by the Rust runtime before main, so it reads as an ordinary sink.
                Target::Stdout => Open::Stdout(DataStdout {
                    out: std::io::stdout(),
                }),
                Target::File { shown, real } => {
                    let folder = target::folder_of(&real);
                    cleanup::remove_stale(&folder);
                    cleanup::watch_folder(&folder);
                    Open::File(Pending::create(shown, real, &folder)?)
                }
            });
        }
        Ok(Outputs { items })
    }
}

/// A temporary file beside its final place, removed if never committed.
#[derive(Debug)]
struct Pending {
    tmp: tempfile::NamedTempFile,
    shown: PathBuf,
    real: PathBuf,
    _registered: Registered,
}

/// Keeps a temporary file in the interrupt registry for as long as it lives.
#[derive(Debug)]
struct Registered(PathBuf);

impl Drop for Registered {
    fn drop(&mut self) {
        // NamedTempFile deletes or renames the file itself; only the entry remains.
        cleanup::forget(&self.0);
    }
}

impl Pending {
    fn create(shown: PathBuf, real: PathBuf, folder: &Path) -> Result<Pending> {
        let name = real
            .file_name()
            .map(|n| n.to_string_lossy().into_owned())
            .unwrap_or_default();
        let prefix = format!(".{name}{}{}.", cleanup::MARK, std::process::id());
        let mut builder = tempfile::Builder::new();
        builder.prefix(&prefix).suffix(cleanup::SUFFIX);
        #[cfg(unix)]
        {
            // An existing file keeps its permissions; a new one is readable by
            // others like any ordinary output, not the private 0600 default.
            use std::os::unix::fs::PermissionsExt;
            let mode = std::fs::metadata(&real).map_or(0o644, |m| m.permissions().mode());
            builder.permissions(std::fs::Permissions::from_mode(mode));
        }
        let tmp = builder.tempfile_in(folder).map_err(|e| {
            Error::input(format!(
                "cannot write {}: cannot create a file in {}: {e}",
                shown.display(),
                folder.display()
            ))
        })?;
        cleanup::register(tmp.path());
        let registered = Registered(tmp.path().to_path_buf());
        Ok(Pending {
            tmp,
            shown,
            real,
            _registered: registered,
        })
    }
}

#[derive(Debug)]
enum Open {
    Stdout(DataStdout),
    File(Pending),
}

/// Standard output as a data output. A reader that closes the pipe early
/// (`lobecast … --out - | head -c 100`) leaves the output incomplete: that is an
/// error naming what happened, never a silent success.
#[derive(Debug)]
struct DataStdout {
    out: std::io::Stdout,
}

fn closed_early(e: std::io::Error) -> std::io::Error {
    if e.kind() == std::io::ErrorKind::BrokenPipe {
        std::io::Error::new(
            e.kind(),
            "standard output was closed by its reader before the output was complete",
        )
    } else {
        e
    }
}

impl Write for DataStdout {
    fn write(&mut self, buf: &[u8]) -> std::io::Result<usize> {
        self.out.write(buf).map_err(closed_early)
    }

    fn flush(&mut self) -> std::io::Result<()> {
        self.out.flush().map_err(closed_early)
    }
}

/// Open outputs being filled; nothing reaches its final name until `commit`.
#[derive(Debug)]
pub struct Outputs {
    items: Vec<Open>,
}

impl Outputs {
    /// The writer of one output (a temporary file, or standard output).
    pub fn writer(&mut self, slot: Slot) -> &mut dyn Write {
        match &mut self.items[slot.0] {
            Open::Stdout(s) => s,
            Open::File(p) => p.tmp.as_file_mut(),
        }
    }

    /// Writes a whole small output at once.
    pub fn put(&mut self, slot: Slot, bytes: &[u8]) -> Result<()> {
        let name = self.name(slot);
        self.writer(slot)
            .write_all(bytes)
            .map_err(|e| Error::io(format!("writing {name}"), e))
    }

    /// The name of an output as given, for messages.
    pub fn name(&self, slot: Slot) -> String {
        match &self.items[slot.0] {
            Open::Stdout(_) => "standard output".into(),
            Open::File(p) => p.shown.display().to_string(),
        }
    }

    /// Flushes and renames every file into place, in the order planned. Returns the
    /// names written, for the report.
    pub fn commit(self) -> Result<Vec<String>> {
        let mut names = Vec::with_capacity(self.items.len());
        for item in self.items {
            match item {
                Open::Stdout(mut s) => {
                    s.flush()
                        .map_err(|e| Error::io("writing standard output", e))?;
                    names.push("standard output".into());
                }
                Open::File(p) => names.push(commit_one(p)?),
            }
        }
        Ok(names)
    }
}

fn commit_one(mut p: Pending) -> Result<String> {
    let shown = p.shown.display().to_string();
    p.tmp
        .as_file_mut()
        .flush()
        .map_err(|e| Error::io(format!("writing {shown}"), e))?;
    // Recheck: the target may have become a folder or device since the plan.
    Target::check(&p.real)?;
    let Pending {
        tmp,
        real,
        _registered,
        ..
    } = p;
    tmp.persist(&real)
        .map_err(|e| Error::io(format!("moving the finished {shown} into place"), e.error))?;
    Ok(shown)
}

/// Refuses `dest` when it is the same file as any of `inputs` (also through hard
/// links or another spelling of the path).
pub fn check_not_input(dest: &Path, inputs: &[PathBuf]) -> Result<()> {
    let Some(d) = target::identity(dest) else {
        return Ok(());
    };
    if std::fs::metadata(dest).is_err() {
        return Ok(());
    }
    for input in inputs {
        if target::identity(input).is_some_and(|i| i == d) {
            return Err(Error::input(format!(
                "the output {} is also an input; refusing to write over it",
                dest.display()
            )));
        }
    }
    Ok(())
}

/// Writes one whole small file (CSV, JSON, PNG) through a one-output plan.
pub fn write_bytes(dest: &Path, inputs: &[PathBuf], bytes: &[u8]) -> Result<()> {
    let mut plan = OutputPlan::new(inputs);
    let slot = plan.add_binary(dest)?;
    let mut out = plan.open()?;
    out.put(slot, bytes)?;
    out.commit().map(|_| ())
}

/// Opens one output for streaming (the cube writers).
pub fn open_one(dest: &Path, inputs: &[PathBuf]) -> Result<(Outputs, Slot)> {
    let mut plan = OutputPlan::new(inputs);
    let slot = plan.add(dest)?;
    Ok((plan.open()?, slot))
}
