//! Why a project file could not be read or written.

use std::path::{Path, PathBuf};
use std::sync::Arc;

/// Why a project file could not be read or written. The system's error,
/// when there is one, is the [`std::error::Error::source`], never copied
/// into the message: a front end shows the chain.
#[derive(Clone, Debug, thiserror::Error)]
pub enum FileError {
    /// Reading or writing failed; the system's error underneath.
    #[error("{}", .path.display())]
    Io {
        /// The file.
        path: PathBuf,
        /// What the system said.
        #[source]
        source: Arc<std::io::Error>,
    },
    /// The path is not one Gradewright writes to (nothing was written).
    #[error("{}: {why}", .path.display())]
    NotWritable {
        /// The file.
        path: PathBuf,
        /// Why not: a folder, a device, a loop of links.
        why: Unwritable,
    },
    /// Not a file that can be read: a folder, a pipe or a device.
    #[error("{}: {why}", .path.display())]
    NotReadable {
        /// The path.
        path: PathBuf,
        /// What it is instead.
        why: Unreadable,
    },
    /// The text is not a valid project.
    #[error("{}:{line}:{column}: {message}", .path.display())]
    Syntax {
        /// The file.
        path: PathBuf,
        /// 1-based line.
        line: usize,
        /// 1-based column.
        column: usize,
        /// What was wrong or expected.
        message: String,
        /// What the file looks like instead, when it looks like something
        /// else Gradewright reads (each front end says what to do).
        looks_like: Option<LooksLike>,
    },
    /// The file was written by a newer Gradewright.
    #[error("{}: file format version {found} is newer than this build reads (up to {supported}); update Gradewright", .path.display())]
    NewerVersion {
        /// The file.
        path: PathBuf,
        /// Version in the file.
        found: u32,
        /// Newest version this build reads.
        supported: u32,
    },
    /// The project holds what no project file may; nothing was written.
    #[error("{}: not saved: {invalid}", .path.display())]
    Unsavable {
        /// The file.
        path: PathBuf,
        /// What is wrong.
        invalid: crate::project::Invalid,
    },
    /// The project could not be encoded.
    #[error("could not encode the project: {0}")]
    Encode(String),
}

/// Why a path is not written to.
#[derive(Clone, Copy, Debug, PartialEq, Eq, thiserror::Error)]
pub enum Unwritable {
    /// A folder.
    #[error("is a folder, not a file; give a file name")]
    Folder,
    /// A device, pipe or socket.
    #[error("is not a regular file (a device, pipe or socket); Gradewright writes only to regular files")]
    NotRegular,
    /// Symbolic links without end.
    #[error("too many symbolic links (a loop?)")]
    LinkLoop,
    /// No file name at all.
    #[error("not a file name")]
    NoName,
    /// A file without write permission (it is not replaced behind its
    /// owner's back).
    #[error("is read-only; make it writable or choose another name")]
    ReadOnly,
    /// Two of the files of one save are the same file.
    #[error("is asked for twice (the same file)")]
    Twice,
}

/// Why a path cannot be read as a file.
#[derive(Clone, Copy, Debug, PartialEq, Eq, thiserror::Error)]
pub enum Unreadable {
    /// A folder.
    #[error("is a folder, not a file")]
    Folder,
    /// A device, pipe or socket (opening a pipe would wait for a writer).
    #[error("is not a regular file (a device, pipe or socket); Gradewright reads only regular files")]
    NotRegular,
}

/// Reads `path` as text when it is a regular file.
///
/// # Errors
/// [`FileError::NotReadable`] for a folder, pipe or device (refused before
/// it is opened); [`FileError::Io`] when reading fails.
pub fn read_text(path: &std::path::Path) -> Result<String, FileError> {
    let meta = std::fs::metadata(path).map_err(|e| FileError::io(path, e))?;
    let why = if meta.is_dir() {
        Some(Unreadable::Folder)
    } else if meta.is_file() {
        None
    } else {
        Some(Unreadable::NotRegular)
    };
    if let Some(why) = why {
        return Err(FileError::NotReadable { path: path.to_owned(), why });
    }
    std::fs::read_to_string(path).map_err(|e| FileError::io(path, e))
}

/// What a file that is not a project looks like.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum LooksLike {
    /// XML (LandXML, perhaps).
    Xml,
    /// A CSV PVI table.
    PviTable,
}

impl std::fmt::Display for LooksLike {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(match self {
            Self::Xml => "XML, not a project file",
            Self::PviTable => "a CSV PVI table, not a project file",
        })
    }
}

impl FileError {
    /// A read or write of `path` that failed with `error`.
    pub fn io(path: &Path, error: std::io::Error) -> Self {
        Self::Io { path: path.to_owned(), source: Arc::new(error) }
    }
}

/// Two errors are equal when they say the same thing about the same file
/// (the system's errors underneath are compared by kind).
impl PartialEq for FileError {
    fn eq(&self, other: &Self) -> bool {
        match (self, other) {
            (Self::Io { path: a, source: x }, Self::Io { path: b, source: y }) => {
                a == b && x.kind() == y.kind()
            }
            (Self::NotWritable { path: a, why: x }, Self::NotWritable { path: b, why: y }) => {
                a == b && x == y
            }
            (
                Self::Syntax { path: a, line: l1, column: c1, message: m1, looks_like: k1 },
                Self::Syntax { path: b, line: l2, column: c2, message: m2, looks_like: k2 },
            ) => a == b && l1 == l2 && c1 == c2 && m1 == m2 && k1 == k2,
            (
                Self::NewerVersion { path: a, found: f1, supported: s1 },
                Self::NewerVersion { path: b, found: f2, supported: s2 },
            ) => a == b && f1 == f2 && s1 == s2,
            (Self::Encode(a), Self::Encode(b)) => a == b,
            _ => false,
        }
    }
}
