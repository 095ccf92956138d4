//! Reading what the user points the program at: a project file (`.ron`) or a
//! PVI table (`.csv`).

use std::path::{Path, PathBuf};

use anyhow::{Context as _, bail};
use gradewright_geometry::{ProfileProblem, Project, Units};

/// A loaded input: the project, and for a CSV table the line of every PVI.
#[derive(Clone, Debug)]
pub struct Input {
    /// Where it came from.
    pub path: PathBuf,
    /// The project (a CSV table becomes a project with default criteria).
    pub project: Project,
    /// File line of each PVI, when known (CSV input).
    pub pvi_lines: Option<Vec<u64>>,
    /// Line and column of each PVI in a project file.
    pub pvi_positions: Vec<(usize, usize)>,
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

/// Loads `path` as a project. A `.csv` file is read as a PVI table and needs
/// `units`; a project file already has units, and a `units` that disagrees
/// with them is an error (units are never mixed silently).
///
/// # Errors
/// A message naming the file, line and field.
pub fn load_input(path: &Path, units: Option<Units>) -> anyhow::Result<Input> {
    let is_csv = path.extension().is_some_and(|e| e.eq_ignore_ascii_case("csv"));
    if is_csv {
        let Some(units) = units else {
            bail!("{}: a CSV PVI table needs --units metric|us", path.display());
        };
        let file = std::fs::File::open(path).with_context(|| format!("{}", path.display()))?;
        let table = gradewright_exchange::read_pvi_csv(std::io::BufReader::new(file), path, units)?;
        let name = path.file_stem().map(|s| s.to_string_lossy().into_owned()).unwrap_or_default();
        let mut project = Project::new(name, units);
        project.pvis = table.pvis;
        return Ok(Input {
            path: path.to_owned(),
            project,
            pvi_lines: Some(table.lines),
            pvi_positions: Vec::new(),
        });
    }
    let meta = std::fs::metadata(path).with_context(|| format!("{}", path.display()))?;
    if !meta.is_file() {
        bail!("{}: not a regular file", path.display());
    }
    let text = std::fs::read_to_string(path).with_context(|| format!("{}", path.display()))?;
    let project = Project::from_ron(&text, path)?;
    let pvi_positions = gradewright_geometry::pvi_positions(&text);
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
    Ok(Input { path: path.to_owned(), project, pvi_lines: None, pvi_positions })
}
