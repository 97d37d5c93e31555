//! Temporary files must not outlive an interrupted run: the ones in flight are kept in
//! a registry that a SIGINT/SIGTERM/SIGHUP handler empties before the process exits,
//! and a new run removes the leftovers of runs that died harder (SIGKILL, power loss).

use std::path::{Path, PathBuf};
use std::sync::{Mutex, Once};

/// Every temporary file of this process not yet renamed into place.
static LIVE: Mutex<Vec<PathBuf>> = Mutex::new(Vec::new());
/// Folders where this process creates temporary files: an interrupt that lands
/// between a file's creation and its registration still finds it there by name.
static FOLDERS: Mutex<Vec<PathBuf>> = Mutex::new(Vec::new());
static HANDLER: Once = Once::new();

/// The marker in our temporary names: `.NAME.lobecast-PID.XXXXXX.part`.
pub const MARK: &str = ".lobecast-";
pub const SUFFIX: &str = ".part";

/// Exit status after an interrupt: 128 + SIGINT, the shell's convention.
const INTERRUPTED: i32 = 130;

/// Installs the interrupt handler (once) and records a folder about to receive
/// temporary files; call before creating them.
pub fn watch_folder(folder: &Path) {
    if let Ok(mut f) = FOLDERS.lock() {
        if !f.iter().any(|x| x == folder) {
            f.push(folder.to_path_buf());
        }
    }
    HANDLER.call_once(|| {
        // If another handler is already installed (a host program embedding the
        // library), leave it alone: the drop guards still clean up on errors.
        let _ = ctrlc::set_handler(|| {
            remove_live();
            eprintln!("error: interrupted; unfinished output removed");
            std::process::exit(INTERRUPTED);
        });
    });
}

/// Records a temporary file so an interrupt removes it.
pub fn register(path: &Path) {
    if let Ok(mut live) = LIVE.lock() {
        live.push(path.to_path_buf());
    }
}

/// Forgets a temporary file that was renamed into place or deleted.
pub fn forget(path: &Path) {
    if let Ok(mut live) = LIVE.lock() {
        live.retain(|p| p != path);
    }
}

fn remove_live() {
    if let Ok(live) = LIVE.lock() {
        for p in live.iter() {
            let _ = std::fs::remove_file(p);
        }
    }
    let me = std::process::id();
    if let Ok(folders) = FOLDERS.lock() {
        for folder in folders.iter() {
            let Ok(entries) = std::fs::read_dir(folder) else {
                continue;
            };
            for e in entries.flatten() {
                if e.file_name().to_str().and_then(writer_pid) == Some(me) {
                    let _ = std::fs::remove_file(e.path());
                }
            }
        }
    }
}

/// Removes our temporary files in `folder` whose writing process is gone, or was
/// started after the file was last written (its number was reused). Best effort:
/// only on systems with `/proc`; anything unreadable is left alone.
pub fn remove_stale(folder: &Path) {
    if !Path::new("/proc/self/stat").exists() {
        return;
    }
    let Ok(entries) = std::fs::read_dir(folder) else {
        return;
    };
    let me = std::process::id();
    for entry in entries.flatten() {
        let name = entry.file_name();
        let Some(pid) = name.to_str().and_then(writer_pid) else {
            continue;
        };
        if pid == me {
            continue;
        }
        let Ok(meta) = entry.metadata() else { continue };
        if !meta.is_file() {
            continue;
        }
        let written = meta.modified().ok();
        let alive_since = process_start(pid);
        let stale = match (alive_since, written) {
            (None, _) => true,
            (Some(start), Some(w)) => start > w,
            (Some(_), None) => false,
        };
        if stale {
            let _ = std::fs::remove_file(entry.path());
        }
    }
}

/// The process number in one of our temporary names, or None for any other file.
pub fn writer_pid(name: &str) -> Option<u32> {
    if !name.starts_with('.') || !name.ends_with(SUFFIX) {
        return None;
    }
    let rest = &name[name.rfind(MARK)? + MARK.len()..];
    let (pid, tail) = rest.split_once('.')?;
    // The tail is tempfile's random part then ".part"; nothing else may follow.
    if tail.len() <= SUFFIX.len() || tail[..tail.len() - SUFFIX.len()].contains('.') {
        return None;
    }
    pid.parse().ok()
}

/// When a live process started (None if there is no such process), from the boot
/// time in /proc/stat and the start tick in /proc/PID/stat at 100 ticks per second,
/// the Linux USER_HZ on every mainstream architecture (common practice).
fn process_start(pid: u32) -> Option<std::time::SystemTime> {
    let stat = std::fs::read_to_string(format!("/proc/{pid}/stat")).ok()?;
    // Field 22 (starttime) counted after the command name, which is in parentheses
    // and may itself hold spaces.
    let after = &stat[stat.rfind(')')? + 1..];
    let ticks: u64 = after.split_whitespace().nth(19)?.parse().ok()?;
    let boot: u64 = std::fs::read_to_string("/proc/stat")
        .ok()?
        .lines()
        .find_map(|l| l.strip_prefix("btime ")?.trim().parse().ok())
        // A live process whose start cannot be told is treated as the writer.
        .unwrap_or(0);
    Some(std::time::UNIX_EPOCH + std::time::Duration::from_millis(boot * 1000 + ticks * 10))
}

#[cfg(test)]
mod tests {
    use super::*;

    // Names are our own scheme (common practice: dot-prefixed hidden temp files).
    #[test]
    fn only_our_temp_names_carry_a_pid() {
        assert_eq!(writer_pid(".a.cube.lobecast-4242.Xy12ab.part"), Some(4242));
        assert_eq!(
            writer_pid(".x.lobecast-1.cube.lobecast-77.abcdef.part"),
            Some(77)
        );
        assert_eq!(writer_pid("a.cube.lobecast-4242.Xy12ab.part"), None);
        assert_eq!(writer_pid(".a.cube.lobecast-4242.Xy12ab.part.bak"), None);
        assert_eq!(writer_pid(".notes.part"), None);
        assert_eq!(writer_pid(".a.lobecast-x1.abc.part"), None);
    }

    #[test]
    fn this_process_started_before_now() {
        let start = process_start(std::process::id()).expect("own /proc entry");
        assert!(start <= std::time::SystemTime::now());
        assert!(process_start(u32::MAX).is_none());
    }
}
