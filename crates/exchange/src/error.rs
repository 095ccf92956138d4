//! The one error of every reader in this crate: where in which file, what
//! was wrong, and the I/O error underneath when reading itself failed.

use std::path::{Path, PathBuf};
use std::sync::Arc;

/// A problem in an exchange file, naming the file, the line and the field
/// (a CSV column, an XML element or attribute, or `file`, `header`,
/// `record`). When the file could not be read at all, `source` keeps the
/// operating system's error.
#[derive(Clone, Debug)]
pub struct ReadError {
    /// The file.
    pub path: PathBuf,
    /// 1-based line (0 when the file as a whole is at fault).
    pub line: u64,
    /// The field at fault: a column name, an element or attribute name, or
    /// `file`, `header`, `record`.
    pub field: String,
    /// What was wrong.
    pub message: String,
    /// The I/O error underneath, when reading failed (what
    /// [`std::error::Error::source`] gives).
    pub source: Option<Arc<std::io::Error>>,
    /// When the file holds several of what was asked for one of: which
    /// choice is open and the names to choose from (a front end offers
    /// them, or names its option to give one).
    pub ambiguous: Option<Ambiguous>,
}

/// A choice a file leaves open.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Ambiguous {
    /// What is to be chosen.
    pub choosing: Choosing,
    /// The names to choose from.
    pub names: Vec<String>,
}

/// What a file holds several of.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Choosing {
    /// Design profiles (named alignment / profile).
    Profile,
    /// Ground lines of one alignment.
    Surface,
    /// Alignments (with ground lines).
    Alignment,
}

impl ReadError {
    /// A located problem in the content of `path`.
    pub fn new(path: &Path, line: u64, field: &str, message: impl Into<String>) -> Self {
        Self {
            path: path.to_owned(),
            line,
            field: field.to_owned(),
            message: message.into(),
            source: None,
            ambiguous: None,
        }
    }

    /// The file `path` could not be opened or read: `error` is the source,
    /// the message says no more than that.
    pub fn io(path: &Path, error: std::io::Error) -> Self {
        Self {
            path: path.to_owned(),
            line: 0,
            field: "file".to_owned(),
            message: String::new(),
            source: Some(Arc::new(error)),
            ambiguous: None,
        }
    }

    /// The same error, saying the file holds several `choosing` to choose
    /// from by `names`.
    #[must_use]
    pub fn with_choice(mut self, choosing: Choosing, names: Vec<String>) -> Self {
        self.ambiguous = Some(Ambiguous { choosing, names });
        self
    }
}

impl std::fmt::Display for ReadError {
    /// `file:line: field: message`; for a file that could not be read at
    /// all only the file (the system's error is the source).
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        if self.source.is_some() && self.message.is_empty() {
            return write!(f, "{}", self.path.display());
        }
        if self.line == 0 && self.field == "file" {
            return write!(f, "{}: {}", self.path.display(), self.message);
        }
        write!(f, "{}:{}: {}: {}", self.path.display(), self.line, self.field, self.message)
    }
}

impl std::error::Error for ReadError {
    fn source(&self) -> Option<&(dyn std::error::Error + 'static)> {
        self.source.as_deref().map(|e| e as &(dyn std::error::Error + 'static))
    }
}

/// Opens `path` for one of this crate's readers, buffered; a file that
/// cannot be opened is a [`ReadError`] keeping the operating system's error.
///
/// # Errors
/// [`ReadError::io`] when the file cannot be opened.
pub fn open_file(path: &Path) -> Result<std::io::BufReader<std::fs::File>, ReadError> {
    // Only a regular file is read: a folder is said so, and a pipe or a
    // device is refused before it is opened (opening a pipe waits for a
    // writer that may never come).
    let meta = std::fs::metadata(path).map_err(|e| ReadError::io(path, e))?;
    if meta.is_dir() {
        return Err(ReadError::new(path, 0, "file", "is a folder, not a file"));
    }
    if !meta.is_file() {
        return Err(ReadError::new(
            path,
            0,
            "file",
            "is not a regular file (a device, pipe or socket); Gradewright reads only regular files",
        ));
    }
    std::fs::File::open(path).map(std::io::BufReader::new).map_err(|e| ReadError::io(path, e))
}

/// Two errors are equal when they say the same thing at the same place (the
/// I/O errors underneath are compared by kind).
impl PartialEq for ReadError {
    fn eq(&self, other: &Self) -> bool {
        self.path == other.path
            && self.line == other.line
            && self.field == other.field
            && self.message == other.message
            && self.source.as_ref().map(|e| e.kind()) == other.source.as_ref().map(|e| e.kind())
            && self.ambiguous == other.ambiguous
    }
}

#[cfg(test)]
mod tests {
    use std::error::Error as _;

    use super::*;

    #[test]
    fn an_io_error_is_kept_underneath() {
        let error =
            ReadError::io(Path::new("ground.csv"), std::io::Error::from(std::io::ErrorKind::NotFound));
        assert_eq!(error.line, 0);
        assert_eq!(error.field, "file");
        let source = error.source().and_then(|e| e.downcast_ref::<std::io::Error>());
        assert_eq!(source.map(std::io::Error::kind), Some(std::io::ErrorKind::NotFound));
        assert_eq!(error.to_string(), "ground.csv", "the system's error is the source, not repeated");
    }
}
