//! Gradewright documents: the project as a file (RON with a
//! `format_version`, read naming the line and column of any error), the
//! editor's and the export's settings kept with it, and the one safe writer
//! every save goes through. The model and its mathematics are the geometry
//! crate's; this crate knows how they are kept.

mod error;
mod project;
mod settings;
mod write;

mod kept;
pub use error::{FileError, LooksLike, Unreadable, Unwritable, read_text};
pub use kept::Kept;
pub use project::{FORMAT_VERSION, Invalid, Part, Project, pvi_position};
pub use settings::{ExportSettings, Snap, TableDecimals};
pub use write::{same_file, write_all_atomic, write_atomic, written_file};
