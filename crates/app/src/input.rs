//! Reading what the user points the program at: a project file (`.ron`), a
//! PVI table (`.csv`) or a LandXML 1.2 file (`.xml`).

use std::path::{Path, PathBuf};

use anyhow::{Context as _, bail};
use gradewright_document::Project;
use gradewright_exchange::Selection;
use gradewright_geometry::{ProfileProblem, Units};

/// A loaded input: the project, and for a CSV table the line of every PVI.
#[derive(Clone, Debug)]
pub struct Input {
    /// Where it came from.
    pub path: PathBuf,
    /// The project (a CSV table becomes a project with default criteria).
    pub project: Project,
    /// File line of each PVI, when known (CSV and LandXML input).
    pub pvi_lines: Option<Vec<u64>>,
    /// Line and column of each PVI in a project file.
    pub pvi_positions: Vec<(usize, usize)>,
    /// What the reader wants the user to know (LandXML: the units read or
    /// converted, the alignment and profile taken, elements skipped).
    pub notes: Vec<String>,
}

impl Input {
    /// Where a profile problem sits: `file:line: field` for CSV input,
    /// `file: pvis` for a project file.
    pub fn locate(&self, problem: &ProfileProblem) -> String {
        let index = problem.pvi_index();
        let line = index.and_then(|i| self.pvi_lines.as_ref().and_then(|lines| lines.get(i)));
        let position = index.and_then(|i| self.pvi_positions.get(i));
        match (line, position) {
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
/// A message naming the file, line and field.
pub fn load_input(path: &Path, units: Option<Units>, selection: &Selection) -> anyhow::Result<Input> {
    match FileKind::of(path) {
        FileKind::PviTable => {
            let Some(units) = units else {
                bail!("{}: a CSV PVI table needs --units metric|us", path.display());
            };
            let file = gradewright_exchange::open_file(path)?;
            let table = gradewright_exchange::read_pvi_csv(file, path, units)?;
            let mut project = Project::new(stem(path), units);
            project.pvis = table.pvis;
            return Ok(Input {
                path: path.to_owned(),
                project,
                pvi_lines: Some(table.lines),
                pvi_positions: Vec::new(),
                notes: Vec::new(),
            });
        }
        FileKind::LandXml => {
            let file = gradewright_exchange::open_file(path)?;
            let read = gradewright_exchange::read_landxml(file, path, selection, units)?;
            let project = read.project();
            let mut notes = read.notes;
            notes.insert(
                0,
                format!(
                    "{}: alignment '{}', profile '{}'{}",
                    path.display(),
                    read.alignment,
                    read.profile,
                    read.surface.map(|s| format!(", ground '{s}'")).unwrap_or_default()
                ),
            );
            return Ok(Input {
                path: path.to_owned(),
                project,
                pvi_lines: Some(read.lines),
                pvi_positions: Vec::new(),
                notes,
            });
        }
        FileKind::Project => {}
    }
    let meta = std::fs::metadata(path).with_context(|| format!("{}", path.display()))?;
    if !meta.is_file() {
        bail!("{}: not a regular file", path.display());
    }
    let text = std::fs::read_to_string(path).with_context(|| format!("{}", path.display()))?;
    let project = Project::from_ron(&text, path)?;
    let pvi_positions = gradewright_document::pvi_positions(&text);
    if let Some(units) = units
        && units != project.units
    {
        bail!(
            "{}: --units {} disagrees with the project's units ({}); units are never converted silently",
            path.display(),
            units.key(),
            project.units.key()
        );
    }
    Ok(Input { path: path.to_owned(), project, pvi_lines: None, pvi_positions, notes: Vec::new() })
}
