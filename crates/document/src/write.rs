//! The one safe writer every save goes through (CLI outputs, project saves,
//! the editor's Save, Save As, autosave and recovery file).
//!
//! * Only a regular file, or a path where nothing exists yet, is written:
//!   a folder, device, pipe or socket is refused before anything is read,
//!   and so is a read-only file (it is not replaced behind its owner's back).
//! * A symbolic link is followed and its target is saved (atomically); the
//!   link itself stays a link.
//! * The new content goes to a temporary file beside the target, created
//!   exclusively under a random name (never through a link planted there),
//!   is flushed and synced, and is renamed over it, so a reader never sees
//!   half a file.
//! * Several files are saved together ([`write_all_atomic`]): every one is
//!   written to its temporary first, and only when all of them are, are
//!   they renamed into place; on any failure none is.
//! * The target's permissions (and owner, where the process may set it) are
//!   kept, for the file and its `.bak`; access is never widened. The `.bak`
//!   is made the same way and renamed into place: a link of that name is
//!   replaced, never followed.
//! * Temporaries of our own naming left by a killed save are removed on the
//!   next save in that folder; errors name the user's file, never a
//!   temporary.

use std::fs;
use std::io::Write as _;
use std::path::{Path, PathBuf};

use crate::{FileError, Unwritable};

/// How many symbolic links are followed before giving up (a loop).
const MAX_LINKS: usize = 40;

/// Temporaries are named `.gw<pid>-<random>.tmp` (short, so that a long
/// file name still leaves room, and telling which process made them).
const TEMP_PREFIX: &str = ".gw";
const TEMP_SUFFIX: &str = ".tmp";

fn refused(path: &Path, why: Unwritable) -> FileError {
    FileError::NotWritable { path: path.to_owned(), why }
}

/// The file a save to `path` really writes: `path` itself, or the target of
/// the chain of symbolic links it names (a dangling link gives the file it
/// names, which a save would create).
///
/// # Errors
/// [`FileError::NotWritable`] for a loop of links, [`FileError::Io`] when a
/// link cannot be read.
pub fn written_file(path: &Path) -> Result<PathBuf, FileError> {
    follow_links(path)
}

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
/// a writable regular file, an error for anything else.
fn existing(path: &Path, target: &Path) -> Result<Option<fs::Metadata>, FileError> {
    match fs::metadata(target) {
        Ok(meta) if meta.is_file() && meta.permissions().readonly() => {
            Err(refused(path, Unwritable::ReadOnly))
        }
        Ok(meta) if meta.is_file() => Ok(Some(meta)),
        Ok(meta) if meta.is_dir() => Err(refused(path, Unwritable::Folder)),
        Ok(_) => Err(refused(path, Unwritable::NotRegular)),
        Err(e) if e.kind() == std::io::ErrorKind::NotFound => Ok(None),
        Err(e) => Err(FileError::io(path, e)),
    }
}

/// The folder of `target`.
fn folder(path: &Path, target: &Path) -> Result<PathBuf, FileError> {
    if target.file_name().is_none_or(std::ffi::OsStr::is_empty) {
        return Err(refused(path, Unwritable::NoName));
    }
    Ok(match target.parent() {
        Some(d) if !d.as_os_str().is_empty() => d.to_owned(),
        _ => PathBuf::from("."),
    })
}

/// Whether process `pid` is still running (where the system can tell; where
/// it cannot, a temporary is taken as stale).
fn alive(pid: u32) -> bool {
    let proc = Path::new("/proc");
    proc.is_dir() && proc.join(pid.to_string()).exists()
}

/// Removes our temporaries in `dir` left by saves that died (regular files
/// only: a link of such a name is left alone).
fn remove_stale_temporaries(dir: &Path) {
    let Ok(entries) = fs::read_dir(dir) else { return };
    for entry in entries.flatten() {
        let file = entry.file_name();
        let file = file.to_string_lossy();
        let Some(rest) = file.strip_prefix(TEMP_PREFIX).filter(|_| file.ends_with(TEMP_SUFFIX)) else {
            continue;
        };
        let Some(Ok(pid)) = rest.split_once('-').map(|(pid, _)| pid.parse::<u32>()) else { continue };
        if pid != std::process::id() && !alive(pid) && entry.file_type().is_ok_and(|t| t.is_file()) {
            let _ = fs::remove_file(entry.path());
        }
    }
}

/// Gives `file` the mode (and owner, where allowed) of `like`, through its
/// open handle.
fn copy_access(file: &fs::File, like: &fs::Metadata) -> std::io::Result<()> {
    file.set_permissions(like.permissions())?;
    #[cfg(unix)]
    {
        use std::os::unix::fs::MetadataExt as _;
        // Only a privileged process may give a file away; otherwise it stays ours.
        let _ = std::os::unix::fs::fchown(file, Some(like.uid()), Some(like.gid()));
    }
    Ok(())
}

/// `bytes` in a new temporary in `dir`, made exclusively under a random
/// name, with the access of `like` (or the usual access of a new file).
fn stage(
    path: &Path,
    dir: &Path,
    bytes: &[u8],
    like: Option<&fs::Metadata>,
) -> Result<tempfile::TempPath, FileError> {
    let fail = |e: std::io::Error| FileError::io(path, unnamed(&e));
    let mut builder = tempfile::Builder::new();
    let prefix = format!("{TEMP_PREFIX}{}-", std::process::id());
    builder.prefix(&prefix).suffix(TEMP_SUFFIX);
    #[cfg(unix)]
    {
        use std::os::unix::fs::PermissionsExt as _;
        // A new file gets what the umask leaves of rw-rw-rw-; an existing
        // one's mode is set below (never wider than it was).
        builder.permissions(fs::Permissions::from_mode(if like.is_some() { 0o600 } else { 0o666 }));
    }
    let mut temp = builder.tempfile_in(dir).map_err(fail)?;
    if let Some(meta) = like {
        copy_access(temp.as_file(), meta).map_err(fail)?;
    }
    temp.write_all(bytes).map_err(fail)?;
    temp.as_file().sync_all().map_err(fail)?;
    Ok(temp.into_temp_path())
}

/// The system's error without the temporary's name that the temporary-file
/// maker adds (a message names the file the user asked for, never ours).
fn unnamed(e: &std::io::Error) -> std::io::Error {
    let inner =
        e.get_ref().and_then(std::error::Error::source).and_then(|s| s.downcast_ref::<std::io::Error>());
    match inner.and_then(std::io::Error::raw_os_error).or_else(|| e.raw_os_error()) {
        Some(code) => std::io::Error::from_raw_os_error(code),
        None => std::io::Error::from(e.kind()),
    }
}

/// One file of a save, written to its temporary and waiting to be renamed.
struct Staged {
    path: PathBuf,
    target: PathBuf,
    temp: tempfile::TempPath,
    /// The old content's copy and where it goes (`target` + `.bak`).
    backup: Option<(tempfile::TempPath, PathBuf)>,
}

/// Writes `bytes` to `path` atomically (see the module docs). With `backup`,
/// an existing file is first copied to `path` + `.bak` (with the same
/// permissions).
///
/// # Errors
/// [`FileError::Io`] or [`FileError::NotWritable`] naming `path`; on error the old file is untouched and
/// nothing else is left behind.
pub fn write_atomic(path: &Path, bytes: &[u8], backup: bool) -> Result<(), FileError> {
    write_all_atomic(&[(path, bytes)], backup)
}

/// Writes every file of `files` atomically, together: each is written to a
/// temporary beside it first, and only when every one is, are they renamed
/// into place (with a `.bak` of each existing one when `backup`).
///
/// # Errors
/// The first file that cannot be written (named, and why), or the same file
/// asked for twice; then no file is replaced.
pub fn write_all_atomic(files: &[(&Path, &[u8])], backup: bool) -> Result<(), FileError> {
    let mut staged: Vec<Staged> = Vec::with_capacity(files.len());
    let mut cleaned: Vec<PathBuf> = Vec::new();
    for &(path, bytes) in files {
        let target = follow_links(path)?;
        if staged.iter().any(|s| same_file(&s.target, &target)) {
            return Err(refused(path, Unwritable::Twice));
        }
        let before = existing(path, &target)?;
        let dir = folder(path, &target)?;
        if !cleaned.contains(&dir) {
            remove_stale_temporaries(&dir);
            cleaned.push(dir.clone());
        }
        let temp = stage(path, &dir, bytes, before.as_ref())?;
        let backup = match &before {
            Some(meta) if backup => {
                let old = fs::read(&target).map_err(|e| FileError::io(path, e))?;
                let mut bak = target.as_os_str().to_owned();
                bak.push(".bak");
                Some((stage(path, &dir, &old, Some(meta))?, PathBuf::from(bak)))
            }
            _ => None,
        };
        staged.push(Staged { path: path.to_owned(), target, temp, backup });
    }
    // Everything is written: now into place. A rename replaces a link of
    // the `.bak`'s name instead of following it.
    let mut dirs: Vec<PathBuf> = Vec::new();
    for file in staged {
        let fail = |e: std::io::Error| FileError::io(&file.path, e);
        if let Some((temp, bak)) = file.backup {
            temp.persist(&bak).map_err(|e| fail(e.error))?;
        }
        file.temp.persist(&file.target).map_err(|e| fail(e.error))?;
        if let Some(dir) = file.target.parent()
            && !dirs.iter().any(|d| d == dir)
        {
            dirs.push(dir.to_owned());
        }
    }
    for dir in dirs {
        if let Ok(d) = fs::File::open(if dir.as_os_str().is_empty() { Path::new(".") } else { &dir }) {
            let _ = d.sync_all();
        }
    }
    Ok(())
}

/// Whether `a` and `b` name the same file: the same file on disk (through
/// links and other names), or, where neither exists yet, the same path in
/// the same folder.
pub fn same_file(a: &Path, b: &Path) -> bool {
    #[cfg(unix)]
    {
        use std::os::unix::fs::MetadataExt as _;
        if let (Ok(x), Ok(y)) = (fs::metadata(a), fs::metadata(b)) {
            return x.dev() == y.dev() && x.ino() == y.ino();
        }
    }
    let resolve = |p: &Path| -> Option<PathBuf> {
        if let Ok(full) = fs::canonicalize(p) {
            return Some(full);
        }
        let dir = match p.parent() {
            Some(d) if !d.as_os_str().is_empty() => d,
            _ => Path::new("."),
        };
        Some(fs::canonicalize(dir).ok()?.join(p.file_name()?))
    };
    match (resolve(a), resolve(b)) {
        (Some(x), Some(y)) => x == y,
        _ => a == b,
    }
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
        let stale = dir.join(".gw4000000000-abcdef.tmp");
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
        assert!(e.to_string().starts_with("/proc/version:") && !said.contains(".tmp"), "{said}");
        // A folder nothing may be written in: the error names the file.
        let e = write_atomic(Path::new("/proc/p.ron"), b"x", false).expect_err("no room");
        assert!(e.to_string().starts_with("/proc/p.ron"), "{e}");
    }

    /// A read-only file is refused, not replaced; a long name (250
    /// characters) still saves, its temporary being short.
    #[cfg(unix)]
    #[test]
    fn read_only_files_are_refused_and_long_names_save() {
        use std::os::unix::fs::PermissionsExt as _;
        let dir = scratch("readonly");
        let file = dir.join("locked.ron");
        fs::write(&file, b"keep").unwrap_or_else(|e| panic!("{e}"));
        fs::set_permissions(&file, fs::Permissions::from_mode(0o444)).unwrap_or_else(|e| panic!("{e}"));
        let e = write_atomic(&file, b"new", true).expect_err("read-only");
        assert!(e.to_string().contains("is read-only"), "{e}");
        assert_eq!(fs::read(&file).unwrap_or_default(), b"keep");
        assert!(!dir.join("locked.ron.bak").exists());
        let long = dir.join(format!("{}.svg", "n".repeat(246)));
        write_atomic(&long, b"<svg/>", false).unwrap_or_else(|e| panic!("{e}"));
        assert_eq!(fs::read(&long).unwrap_or_default(), b"<svg/>");
    }

    /// Links planted where a temporary or the backup would go are never
    /// followed: the temporary's name is random and made exclusively, and a
    /// link named like the `.bak` is replaced by the backup itself; the file
    /// the links point at keeps its content and its mode.
    #[cfg(unix)]
    #[test]
    fn planted_links_are_never_written_through() {
        use std::os::unix::fs::PermissionsExt as _;
        let dir = scratch("planted");
        let victim = dir.join("victim.txt");
        fs::write(&victim, b"secret").unwrap_or_else(|e| panic!("{e}"));
        fs::set_permissions(&victim, fs::Permissions::from_mode(0o600)).unwrap_or_else(|e| panic!("{e}"));
        let out = dir.join("o.svg");
        fs::write(&out, b"old").unwrap_or_else(|e| panic!("{e}"));
        fs::set_permissions(&out, fs::Permissions::from_mode(0o640)).unwrap_or_else(|e| panic!("{e}"));
        // Links under the old predictable names and the backup's name.
        for name in [format!(".o.svg.{}.tmp", std::process::id()), "o.svg.bak".to_owned()] {
            std::os::unix::fs::symlink(&victim, dir.join(name)).unwrap_or_else(|e| panic!("{e}"));
        }
        write_atomic(&out, b"new", true).unwrap_or_else(|e| panic!("{e}"));
        assert_eq!(fs::read(&victim).unwrap_or_default(), b"secret");
        let mode = |p: &Path| fs::metadata(p).map(|m| m.permissions().mode() & 0o777).unwrap_or(0);
        assert_eq!(mode(&victim), 0o600, "the victim's mode is not widened");
        assert!(fs::symlink_metadata(&out).is_ok_and(|m| m.file_type().is_file()), "o.svg is a file");
        assert_eq!(fs::read(&out).unwrap_or_default(), b"new");
        let bak = dir.join("o.svg.bak");
        assert!(fs::symlink_metadata(&bak).is_ok_and(|m| m.file_type().is_file()), "the .bak is a file");
        assert_eq!(fs::read(&bak).unwrap_or_default(), b"old");
        assert_eq!((mode(&out), mode(&bak)), (0o640, 0o640));
    }

    /// Files saved together: when one cannot be written, none is; the same
    /// file twice is refused.
    #[test]
    fn files_saved_together_are_all_written_or_none() {
        let dir = scratch("together");
        let (a, b) = (dir.join("a.csv"), dir.join("b.csv"));
        fs::write(&a, b"old a").unwrap_or_else(|e| panic!("{e}"));
        let folder = dir.join("c.csv");
        fs::create_dir_all(&folder).unwrap_or_else(|e| panic!("{e}"));
        let e = write_all_atomic(&[(&a, b"new a"), (&b, b"new b"), (&folder, b"c")], false)
            .expect_err("a folder");
        assert!(e.to_string().contains("c.csv") && e.to_string().contains("folder"), "{e}");
        assert_eq!(fs::read(&a).unwrap_or_default(), b"old a");
        assert!(!b.exists());
        let e =
            write_all_atomic(&[(&a, b"1"), (&dir.join(".").join("a.csv"), b"2")], false).expect_err("twice");
        assert!(e.to_string().contains("twice"), "{e}");
        write_all_atomic(&[(&a, b"new a"), (&b, b"new b")], false).unwrap_or_else(|e| panic!("{e}"));
        assert_eq!(
            (fs::read(&a).unwrap_or_default(), fs::read(&b).unwrap_or_default()),
            (b"new a".to_vec(), b"new b".to_vec())
        );
        let names: Vec<String> = fs::read_dir(&dir)
            .map(|d| d.flatten().map(|e| e.file_name().to_string_lossy().into_owned()).collect())
            .unwrap_or_default();
        assert!(names.iter().all(|n| !n.ends_with(".tmp")), "{names:?}");
    }
}
