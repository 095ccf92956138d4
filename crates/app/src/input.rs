//! Reading what the user points the program at: a project file (`.ron`) or a
//! PVI table (`.csv`).

use std::path::Path;

use anyhow::{Context as _, bail};
use gradewright_geometry::{Project, Units};

/// Loads `path` as a project. A `.csv` file is read as a PVI table and needs
/// `units`; a project file already has units, and a `units` that disagrees
/// with them is an error (units are never mixed silently).
///
/// # Errors
/// A message naming the file, line and field.
pub fn load_input(path: &Path, units: Option<Units>) -> anyhow::Result<Project> {
    let is_csv = path
        .extension()
        .is_some_and(|e| e.eq_ignore_ascii_case("csv"));
    if is_csv {
        let Some(units) = units else {
            bail!("{}: a CSV PVI table needs --units metric|us", path.display());
        };
        let file = std::fs::File::open(path).with_context(|| format!("{}", path.display()))?;
        let pvis = gradewright_sheet::read_pvi_csv(std::io::BufReader::new(file), path, units)?;
        let name = path.file_stem().map(|s| s.to_string_lossy().into_owned()).unwrap_or_default();
        let mut project = Project::new(name, units);
        project.pvis = pvis;
        return Ok(project);
    }
    let project = Project::load(path)?;
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
    Ok(project)
}
