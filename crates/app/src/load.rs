//! Reading what the user points either front end at — a project file
//! (`.ron`), a PVI table (`.csv`) or a LandXML 1.2 file (`.xml`) — into a
//! project, and writing a project in the format a file's name asks for.
//! The command line and the editor both call these; errors and notes are
//! data, which each front end words (the command line names its options,
//! the editor opens a chooser or asks for the units).

use std::path::{Path, PathBuf};

use gradewright_document::{FileError, Project};
use gradewright_exchange::{Note, ReadError, Selection};
use gradewright_geometry::{ProfileProblem, Units};

/// A loaded input: the project, and where each PVI came from in the file.
#[derive(Clone, Debug)]
pub struct Input {
    /// Where it came from.
    pub path: PathBuf,
    /// The project (a CSV table or a LandXML file becomes a project with
    /// default criteria).
    pub project: Project,
    /// File line of each PVI, when known (CSV and LandXML input).
    pub pvi_lines: Option<Vec<u64>>,
    /// The text of a project file, kept to name where a problem is (found
    /// only when one is reported).
    pub text: Option<std::sync::Arc<str>>,
    /// What the reader wants the user to know (LandXML: the units read or
    /// converted, elements skipped).
    pub notes: Vec<Note>,
    /// What a LandXML file's design profile and ground line were.
    pub picked: Option<Picked>,
}

/// The design profile (and ground line) read from a LandXML file.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Picked {
    /// The alignment.
    pub alignment: String,
    /// The design profile (`ProfAlign`).
    pub profile: String,
    /// The ground line (`ProfSurf`), if the alignment has one.
    pub surface: Option<String>,
}

impl Input {
    /// Where a profile problem sits: `file:line: field` for CSV and LandXML
    /// input, `file:line:column: pvis[i].field` for a project file.
    pub fn locate(&self, problem: &ProfileProblem) -> String {
        let index = problem.pvi_index();
        let line = index.and_then(|i| self.pvi_lines.as_ref().and_then(|lines| lines.get(i)));
        let position =
            index.zip(self.text.as_deref()).and_then(|(i, text)| gradewright_document::pvi_position(text, i));
        match (line, position.as_ref()) {
            (Some(line), _) => format!("{}:{line}: {}", self.path.display(), problem.field()),
            (None, Some((line, column))) => {
                format!(
                    "{}:{line}:{column}: pvis[{}].{}",
                    self.path.display(),
                    index.unwrap_or(0),
                    problem.field()
                )
            }
            (None, None) => format!("{}: pvis", self.path.display()),
        }
    }
}

/// Which kind of file `path` is, by its extension.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum FileKind {
    /// A Gradewright project (`.ron`, or any other extension).
    Project,
    /// A PVI table (`.csv`).
    PviTable,
    /// A LandXML 1.2 file (`.xml`, `.landxml`).
    LandXml,
}

impl FileKind {
    /// The kind of `path`.
    pub fn of(path: &Path) -> Self {
        if path.extension().is_some_and(|e| e.eq_ignore_ascii_case("csv")) {
            Self::PviTable
        } else if gradewright_exchange::is_landxml_path(path) {
            Self::LandXml
        } else {
            Self::Project
        }
    }

    /// Whether `path`'s extension names a kind (`.ron`, `.csv`, `.xml`,
    /// `.landxml`).
    pub fn is_named(path: &Path) -> bool {
        path.extension().is_some_and(|e| {
            ["ron", "csv", "xml", "landxml"].iter().any(|known| e.eq_ignore_ascii_case(known))
        })
    }
}

/// Why an input could not be loaded.
#[derive(Debug, thiserror::Error)]
pub enum LoadError {
    /// A PVI table carries no units and none were given.
    #[error("{}: a CSV PVI table carries no units", .path.display())]
    MissingUnits {
        /// The table.
        path: PathBuf,
    },
    /// Units were given that are not the project file's own.
    #[error("{}: the units given ({}) are not the project's ({}); units are never converted silently", .path.display(), .given.key(), .project.key())]
    UnitsDisagree {
        /// The project file.
        path: PathBuf,
        /// The units given.
        given: Units,
        /// The project's.
        project: Units,
    },
    /// A project file that cannot be read.
    #[error(transparent)]
    Project(#[from] FileError),
    /// A PVI table or a LandXML file that cannot be read.
    #[error(transparent)]
    Exchange(#[from] ReadError),
}

/// The name a project read from `path` gets (its file stem).
fn stem(path: &Path) -> String {
    path.file_stem().map(|s| s.to_string_lossy().into_owned()).unwrap_or_default()
}

/// Loads `path` as a project. A `.csv` file is read as a PVI table and needs
/// `units`. A LandXML file (`.xml`) states its units: with `units` the same
/// the values are kept, with other `units` they are converted (and a note
/// says so); `selection` picks its alignment, design profile and ground
/// line. A project file already has units, and a `units` that disagrees
/// with them is an error (units are never mixed silently).
///
/// # Errors
/// [`LoadError`], naming the file, line and field.
pub fn load_input(path: &Path, units: Option<Units>, selection: &Selection) -> Result<Input, LoadError> {
    match FileKind::of(path) {
        FileKind::PviTable => {
            let Some(units) = units else { return Err(LoadError::MissingUnits { path: path.to_owned() }) };
            let table =
                gradewright_exchange::read_pvi_csv(gradewright_exchange::open_file(path)?, path, units)?;
            let mut project = Project::new(stem(path), units);
            project.pvis = table.pvis;
            Ok(Input {
                path: path.to_owned(),
                project,
                pvi_lines: Some(table.lines),
                text: None,
                notes: Vec::new(),
                picked: None,
            })
        }
        FileKind::LandXml => {
            let file = gradewright_exchange::open_file(path)?;
            let read = gradewright_exchange::read_landxml(file, path, selection, units)?;
            Ok(Input {
                path: path.to_owned(),
                project: read.project(),
                pvi_lines: Some(read.lines),
                text: None,
                notes: read.notes,
                picked: Some(Picked {
                    alignment: read.alignment,
                    profile: read.profile,
                    surface: read.surface,
                }),
            })
        }
        FileKind::Project => {
            let text = gradewright_document::read_text(path)?;
            let project = Project::from_ron(&text, path)?;
            if let Some(units) = units
                && units != project.units
            {
                return Err(LoadError::UnitsDisagree {
                    path: path.to_owned(),
                    given: units,
                    project: project.units,
                });
            }
            Ok(Input {
                path: path.to_owned(),
                project,
                pvi_lines: None,
                text: Some(text.into()),
                notes: Vec::new(),
                picked: None,
            })
        }
    }
}

/// `project` as the bytes of the format `kind` names: a project file, a PVI
/// table, or LandXML stamped now.
///
/// # Errors
/// When the project cannot be encoded or written into memory.
pub fn encode(project: &Project, kind: FileKind) -> anyhow::Result<Vec<u8>> {
    let mut buffer = Vec::new();
    match kind {
        FileKind::PviTable => gradewright_exchange::write_pvi_csv(&mut buffer, &project.pvis, project.units)?,
        FileKind::LandXml => {
            gradewright_exchange::write_landxml(&mut buffer, project, &gradewright_exchange::Stamp::now())?;
        }
        FileKind::Project => {
            // Nothing is written that cannot be read back.
            project.check().map_err(|invalid| anyhow::anyhow!("not written: {invalid}"))?;
            buffer = project.to_ron()?.into_bytes();
        }
    }
    Ok(buffer)
}

/// The message of an error with every cause under it, on one line
/// (`file: what the system said`): how both front ends show an error.
pub fn one_line(e: &(dyn std::error::Error + 'static)) -> String {
    let mut text = e.to_string();
    let mut source = e.source();
    while let Some(cause) = source {
        let said = cause.to_string();
        // A cause that only repeats its error (transparent wrappers) is not said twice.
        if !text.ends_with(&said) {
            text.push_str(": ");
            text.push_str(&said);
        }
        source = cause.source();
    }
    text.replace('\n', " ")
}
