//! The one safe writer every save goes through (CLI outputs, project saves,
//! the editor's Save, Save As, autosave and recovery file).
//!
//! * Only a regular file, or a path where nothing exists yet, is written:
//!   a folder, device, pipe or socket is refused before anything is read.
//! * A symbolic link is followed and its target is saved (atomically); the
//!   link itself stays a link.
//! * The new content goes to a temporary file beside the target, is flushed
//!   and synced, and is renamed over it, so a reader never sees half a file.
//! * The target's permissions (and owner, where the process may set it) are
//!   kept, for the file and its `.bak`; access is never widened.
//! * Temporaries of our own naming left by a killed save of the same file are
//!   removed on the next save; errors name the user's file, never a temporary.

use std::fs;
use std::io::Write as _;
use std::path::{Path, PathBuf};

use crate::{FileError, Unwritable};

/// How many symbolic links are followed before giving up (a loop).
const MAX_LINKS: usize = 40;

fn refused(path: &Path, why: Unwritable) -> FileError {
    FileError::NotWritable { path: path.to_owned(), why }
}

/// The file a save to `path` really writes: `path` itself, or the target of
/// the chain of symbolic links it names.
fn follow_links(path: &Path) -> Result<PathBuf, FileError> {
    let mut current = path.to_owned();
    for _ in 0..MAX_LINKS {
        match fs::symlink_metadata(&current) {
            Ok(meta) if meta.file_type().is_symlink() => {
                let link = fs::read_link(&current).map_err(|e| FileError::io(path, e))?;
                current = match current.parent() {
                    Some(dir) if link.is_relative() => dir.join(link),
                    _ => link,
                };
            }
            _ => return Ok(current),
        }
    }
    Err(refused(path, Unwritable::LinkLoop))
}

/// What is at `target` now: `None` when nothing is, its metadata when it is
/// a regular file, an error for anything else.
fn existing(path: &Path, target: &Path) -> Result<Option<fs::Metadata>, FileError> {
    match fs::metadata(target) {
        Ok(meta) if meta.is_file() => Ok(Some(meta)),
        Ok(meta) if meta.is_dir() => Err(refused(path, Unwritable::Folder)),
        Ok(_) => Err(refused(path, Unwritable::NotRegular)),
        Err(e) if e.kind() == std::io::ErrorKind::NotFound => Ok(None),
        Err(e) => Err(FileError::io(path, e)),
    }
}

/// The folder and file name of `target`.
fn split(path: &Path, target: &Path) -> Result<(PathBuf, String), FileError> {
    let dir = match target.parent() {
        Some(d) if !d.as_os_str().is_empty() => d.to_owned(),
        _ => PathBuf::from("."),
    };
    let name = target.file_name().map(|n| n.to_string_lossy().into_owned()).unwrap_or_default();
    if name.is_empty() {
        return Err(refused(path, Unwritable::NoName));
    }
    Ok((dir, name))
}

/// Whether process `pid` is still running (where the system can tell; where
/// it cannot, a temporary is taken as stale).
fn alive(pid: u32) -> bool {
    let proc = Path::new("/proc");
    proc.is_dir() && proc.join(pid.to_string()).exists()
}

/// Removes `.NAME.<pid>.tmp` files in `dir` left by saves that died.
fn remove_stale_temporaries(dir: &Path, name: &str) {
    let Ok(entries) = fs::read_dir(dir) else { return };
    let prefix = format!(".{name}.");
    for entry in entries.flatten() {
        let file = entry.file_name();
        let file = file.to_string_lossy();
        let Some(pid) = file.strip_prefix(&prefix).and_then(|rest| rest.strip_suffix(".tmp")) else {
            continue;
        };
        let Ok(pid) = pid.parse::<u32>() else { continue };
        if pid != std::process::id() && !alive(pid) && entry.file_type().is_ok_and(|t| t.is_file()) {
            let _ = fs::remove_file(entry.path());
        }
    }
}

/// Gives `file` the mode (and owner, where allowed) of `like`.
fn copy_access(file: &Path, like: &fs::Metadata) -> std::io::Result<()> {
    fs::set_permissions(file, like.permissions())?;
    #[cfg(unix)]
    {
        use std::os::unix::fs::MetadataExt as _;
        // Only a privileged process may give a file away; otherwise it stays ours.
        let _ = std::os::unix::fs::chown(file, Some(like.uid()), Some(like.gid()));
    }
    Ok(())
}

/// Writes `bytes` to `path` atomically (see the module docs). With `backup`,
/// an existing file is first copied to `path` + `.bak` (itself written
/// atomically, with the same permissions).
///
/// # Errors
/// [`FileError::Io`] or [`FileError::NotWritable`] naming `path`; on error the old file is untouched and
/// nothing else is left behind.
pub fn write_atomic(path: &Path, bytes: &[u8], backup: bool) -> Result<(), FileError> {
    let target = follow_links(path)?;
    let before = existing(path, &target)?;
    let (dir, name) = split(path, &target)?;
    remove_stale_temporaries(&dir, &name);
    let temp = dir.join(format!(".{name}.{}.tmp", std::process::id()));
    let fail = |e: std::io::Error| FileError::io(path, e);
    let result = (|| {
        let mut file = fs::File::create(&temp).map_err(fail)?;
        if let Some(meta) = &before {
            copy_access(&temp, meta).map_err(fail)?;
        }
        file.write_all(bytes).map_err(fail)?;
        file.sync_all().map_err(fail)?;
        drop(file);
        if backup && before.is_some() {
            let old = fs::read(&target).map_err(fail)?;
            let mut bak = target.as_os_str().to_owned();
            bak.push(".bak");
            write_atomic(Path::new(&bak), &old, false)?;
            if let Some(meta) = &before {
                copy_access(Path::new(&bak), meta).map_err(fail)?;
            }
        }
        fs::rename(&temp, &target).map_err(fail)?;
        if let Ok(d) = fs::File::open(&dir) {
            let _ = d.sync_all();
        }
        Ok(())
    })();
    if result.is_err() {
        let _ = fs::remove_file(&temp);
    }
    result
}

#[cfg(test)]
mod tests {
    use super::*;

    fn scratch(name: &str) -> PathBuf {
        let dir = std::env::temp_dir().join(format!("gradewright-write-{name}-{}", std::process::id()));
        let _ = fs::remove_dir_all(&dir);
        fs::create_dir_all(&dir).unwrap_or_else(|e| panic!("{e}"));
        dir
    }

    #[test]
    fn refuses_devices_and_folders_before_reading() {
        let e = write_atomic(Path::new("/dev/full"), b"x", true).expect_err("a device");
        assert!(e.to_string().contains("not a regular file"), "{e}");
        assert!(e.to_string().starts_with("/dev/full:"), "{e}");
        let dir = scratch("folder");
        let e = write_atomic(&dir, b"x", true).expect_err("a folder");
        assert!(e.to_string().contains("is a folder"), "{e}");
        assert!(!Path::new("/dev/full.bak").exists());
    }

    #[cfg(unix)]
    #[test]
    fn follows_a_link_and_keeps_the_mode() {
        use std::os::unix::fs::PermissionsExt as _;
        let dir = scratch("link");
        let real = dir.join("real.ron");
        fs::write(&real, b"old").unwrap_or_else(|e| panic!("{e}"));
        fs::set_permissions(&real, fs::Permissions::from_mode(0o600)).unwrap_or_else(|e| panic!("{e}"));
        let link = dir.join("link.ron");
        std::os::unix::fs::symlink("real.ron", &link).unwrap_or_else(|e| panic!("{e}"));
        write_atomic(&link, b"new", true).unwrap_or_else(|e| panic!("{e}"));
        assert!(fs::symlink_metadata(&link).is_ok_and(|m| m.file_type().is_symlink()), "still a link");
        assert_eq!(fs::read(&real).unwrap_or_default(), b"new");
        assert_eq!(fs::read(dir.join("real.ron.bak")).unwrap_or_default(), b"old");
        for file in [real.clone(), dir.join("real.ron.bak")] {
            let mode = fs::metadata(&file).map(|m| m.permissions().mode() & 0o777).unwrap_or(0);
            assert_eq!(mode, 0o600, "{}", file.display());
        }
    }

    #[test]
    fn removes_stale_temporaries_and_never_names_one() {
        let dir = scratch("stale");
        let file = dir.join("p.ron");
        // A save killed long ago, by a process that no longer runs.
        let stale = dir.join(".p.ron.4000000000.tmp");
        fs::write(&stale, b"half").unwrap_or_else(|e| panic!("{e}"));
        write_atomic(&file, b"whole", true).unwrap_or_else(|e| panic!("{e}"));
        assert!(!stale.exists());
        let leftovers: Vec<_> = fs::read_dir(&dir)
            .map(|d| d.flatten().map(|e| e.file_name().to_string_lossy().into_owned()).collect())
            .unwrap_or_default();
        assert_eq!(leftovers, vec!["p.ron".to_owned()]);
        let e = write_atomic(Path::new("/proc/version"), b"x", false).expect_err("read-only");
        let said =
            format!("{e}: {}", std::error::Error::source(&e).map(ToString::to_string).unwrap_or_default());
        assert!(e.to_string() == "/proc/version" && !said.contains(".tmp"), "{said}");
    }
}
