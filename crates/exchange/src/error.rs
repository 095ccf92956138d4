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
}

impl ReadError {
    /// A located problem in the content of `path`.
    pub fn new(path: &Path, line: u64, field: &str, message: impl Into<String>) -> Self {
        Self { path: path.to_owned(), line, field: field.to_owned(), message: message.into(), source: None }
    }

    /// The file `path` could not be opened or read.
    pub fn io(path: &Path, error: std::io::Error) -> Self {
        Self {
            path: path.to_owned(),
            line: 0,
            field: "file".to_owned(),
            message: error.to_string(),
            source: Some(Arc::new(error)),
        }
    }
}

impl std::fmt::Display for ReadError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
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
        assert!(error.to_string().starts_with("ground.csv:0: file: "), "{error}");
    }
}
