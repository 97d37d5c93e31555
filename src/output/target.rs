//! Where an output path really points, and whether lobecast may write there. Checked
//! before any computing starts so that a bad path never costs a long run.

use std::path::{Component, Path, PathBuf};

use crate::error::{Error, Result};

/// The longest chain of symbolic links followed (the Linux kernel's own limit).
const MAX_LINK_HOPS: usize = 40;

/// A checked destination: standard output, or a regular file (existing or not) in an
/// existing folder, reached through any symbolic links.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum Target {
    Stdout,
    File {
        /// The path the user gave, for messages.
        shown: PathBuf,
        /// The file the path names once every symbolic link is followed.
        real: PathBuf,
    },
}

impl Target {
    /// Checks one output path: `-` is standard output; otherwise the folder must
    /// exist, and an existing target must be a regular file (never a device, FIFO,
    /// socket or folder: those would be replaced by the rename).
    pub fn check(path: &Path) -> Result<Target> {
        if path.as_os_str().is_empty() {
            return Err(Error::input("an output file name is empty"));
        }
        if path == Path::new("-") {
            return Ok(Target::Stdout);
        }
        // A name ending in '/' asks for a folder ("out/" is read as "out" by Path).
        if path.as_os_str().as_encoded_bytes().ends_with(b"/") {
            return Err(Error::input(format!(
                "the output {} names a folder, not a file",
                path.display()
            )));
        }
        // What the name finally leads to, through every link the system follows
        // (also /dev/stdout → a pipe), must be a regular file if it exists.
        if let Ok(m) = std::fs::metadata(path) {
            if !m.is_file() {
                return Err(not_regular(path, &m));
            }
        }
        let real = follow_links(path)?;
        if real.file_name().is_none() || real.ends_with(Component::ParentDir) {
            return Err(Error::input(format!(
                "the output {} names a folder, not a file",
                path.display()
            )));
        }
        let folder = folder_of(&real);
        match std::fs::metadata(&folder) {
            Ok(m) if m.is_dir() => {}
            Ok(_) => {
                return Err(Error::input(format!(
                    "cannot write {}: {} is not a folder",
                    path.display(),
                    folder.display()
                )));
            }
            Err(_) => {
                return Err(Error::input(format!(
                    "cannot write {}: the folder {} does not exist",
                    path.display(),
                    folder.display()
                ))
                .with_hint("create the folder first; lobecast does not create folders"));
            }
        }
        if let Ok(m) = std::fs::metadata(&real) {
            if !m.is_file() {
                return Err(not_regular(path, &m));
            }
        }
        // The folder must take a new file now, not only after the work is done.
        tempfile::Builder::new()
            .prefix(".lobecast-probe.")
            .tempfile_in(&folder)
            .map_err(|e| {
                Error::input(format!(
                    "cannot write {}: the folder {} does not take new files: {e}",
                    path.display(),
                    folder.display()
                ))
            })?;
        Ok(Target::File {
            shown: path.to_path_buf(),
            real,
        })
    }

    /// The name to print in messages.
    pub fn shown(&self) -> String {
        match self {
            Target::Stdout => "standard output".into(),
            Target::File { shown, .. } => shown.display().to_string(),
        }
    }
}

/// The folder a file lives in (`.` for a bare name).
pub fn folder_of(path: &Path) -> PathBuf {
    match path.parent() {
        Some(p) if !p.as_os_str().is_empty() => p.to_path_buf(),
        _ => PathBuf::from("."),
    }
}

/// Follows symbolic links (relative ones from the link's own folder) until a path
/// that is not a link, which may not exist yet: writing through a dangling link
/// creates the file it names.
fn follow_links(path: &Path) -> Result<PathBuf> {
    let mut p = path.to_path_buf();
    for _ in 0..MAX_LINK_HOPS {
        match std::fs::symlink_metadata(&p) {
            Ok(m) if m.file_type().is_symlink() => {
                let to = std::fs::read_link(&p).map_err(|e| {
                    Error::input(format!("cannot read the link {}: {e}", p.display()))
                })?;
                p = if to.is_absolute() {
                    to
                } else {
                    folder_of(&p).join(to)
                };
            }
            _ => return Ok(p),
        }
    }
    Err(Error::input(format!(
        "the output {} is a chain of more than {MAX_LINK_HOPS} symbolic links",
        path.display()
    )))
}

fn not_regular(path: &Path, m: &std::fs::Metadata) -> Error {
    Error::input(format!(
        "the output {} exists and is {}; lobecast writes only regular files and will not replace it",
        path.display(),
        kind_of(m)
    ))
    .with_hint("give a new file name, or '-' to write to standard output")
}

fn kind_of(m: &std::fs::Metadata) -> &'static str {
    if m.is_dir() {
        return "a folder";
    }
    #[cfg(unix)]
    {
        use std::os::unix::fs::FileTypeExt;
        let t = m.file_type();
        if t.is_char_device() || t.is_block_device() {
            return "a device";
        }
        if t.is_fifo() {
            return "a FIFO (named pipe)";
        }
        if t.is_socket() {
            return "a socket";
        }
    }
    "not a regular file"
}

/// An identity for "is this the same file?": device and inode where the file exists
/// (catches hard links and different spellings), else the canonical folder plus name.
pub fn identity(path: &Path) -> Option<(u64, u64, PathBuf)> {
    #[cfg(unix)]
    if let Ok(m) = std::fs::metadata(path) {
        use std::os::unix::fs::MetadataExt;
        return Some((m.dev(), m.ino(), PathBuf::new()));
    }
    let folder = folder_of(path).canonicalize().ok()?;
    Some((0, 0, folder.join(path.file_name()?)))
}
