//! The project file: a profile, its criteria and room for ground and controls.
//!
//! Saved as RON with a `format_version`. Loading names the line and column of
//! any error; saving is atomic and keeps the previous file as `*.bak`.

use std::fs;
use std::path::{Path, PathBuf};

use serde::{Deserialize, Serialize};

use crate::{ControlPoint, Criteria, Foot, Ground, Profile, Pvi, Section, Units};

/// The newest file format this build reads and the one it writes.
pub const FORMAT_VERSION: u32 = 1;

/// A point of the existing ground line.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct GroundPoint {
    /// Station.
    pub station: f64,
    /// Ground elevation.
    pub elevation: f64,
}

/// How the editor snaps dragged and inserted PVIs, kept with the project.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
#[serde(default, deny_unknown_fields)]
pub struct Snap {
    /// Whether snapping is on.
    pub on: bool,
    /// Station increment (a whole metre or foot by default).
    pub station: f64,
    /// Elevation increment.
    pub elevation: f64,
}

impl Default for Snap {
    fn default() -> Self {
        Self { on: true, station: 1.0, elevation: 0.01 }
    }
}

impl Snap {
    /// `(station, elevation)` rounded to the increments when snapping is on.
    pub fn apply(self, station: f64, elevation: f64) -> (f64, f64) {
        if !self.on {
            return (station, elevation);
        }
        let round =
            |v: f64, step: f64| if step > 0.0 && step.is_finite() { (v / step).round() * step } else { v };
        (round(station, self.station), round(elevation, self.elevation))
    }

    fn is_default(&self) -> bool {
        *self == Self::default()
    }
}

/// How the sheet and tables are exported, kept with the project.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(default, deny_unknown_fields)]
pub struct ExportSettings {
    /// Sheet size: `ansi-b`, `ansi-d`, `a3`, `a1`, `WxHmm`, `WxHin`.
    pub sheet: String,
    /// PNG resolution, dpi.
    pub dpi: f64,
    /// Horizontal scale (1:N, or 1 in = N ft); `None` fits one sheet.
    pub h_scale: Option<f64>,
    /// Vertical scale; `None` is a tenth of the horizontal.
    pub v_scale: Option<f64>,
    /// Overlap between sheets.
    pub overlap: f64,
    /// Title block: road or section.
    pub road: String,
    /// Title block: designer.
    pub designer: String,
    /// Title block: checker.
    pub checker: String,
    /// Title block: date.
    pub date: String,
    /// Title block: revision.
    pub revision: String,
    /// Whether the sight-distance band is drawn.
    pub sight_band: bool,
    /// Write PNG.
    pub png: bool,
    /// Write SVG.
    pub svg: bool,
    /// Write PDF.
    pub pdf: bool,
    /// Write the CSV tables.
    pub tables: bool,
    /// Where: the sheet files are this path with each format's extension, the
    /// tables go in a folder of this name.
    pub path: String,
    /// Station interval of `stations.csv`; `None` is 20 m or 50 ft.
    pub interval: Option<f64>,
    /// Folder for File ▸ Export tables… (empty: beside the project file).
    pub tables_path: String,
}

impl Default for ExportSettings {
    fn default() -> Self {
        Self {
            sheet: "ansi-b".to_owned(),
            dpi: 150.0,
            h_scale: None,
            v_scale: None,
            overlap: 0.0,
            road: String::new(),
            designer: String::new(),
            checker: String::new(),
            date: String::new(),
            revision: String::new(),
            sight_band: true,
            png: true,
            svg: false,
            pdf: true,
            tables: true,
            path: String::new(),
            interval: None,
            tables_path: String::new(),
        }
    }
}

impl ExportSettings {
    fn is_default(&self) -> bool {
        *self == Self::default()
    }
}

/// A Gradewright project.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Project {
    /// File format version ([`FORMAT_VERSION`] when written by this build).
    pub format_version: u32,
    /// Project name.
    #[serde(default)]
    pub name: String,
    /// Unit system of everything in the file.
    pub units: Units,
    /// Which foot a US customary project is in (international unless a
    /// file read in US survey feet said otherwise); unused in metric.
    #[serde(default, skip_serializing_if = "Foot::is_default")]
    pub foot: Foot,
    /// Design criteria.
    #[serde(default)]
    pub criteria: Criteria,
    /// The proposed profile's PVIs, in station order.
    pub pvis: Vec<Pvi>,
    /// Existing ground line (station, elevation), in station order; shared,
    /// so copies of the project do not copy it.
    #[serde(default, skip_serializing_if = "<[GroundPoint]>::is_empty")]
    pub ground: Ground,
    /// Elevations the profile must meet, stay above or stay below.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub controls: Vec<ControlPoint>,
    /// The level typical section of the earthwork estimate, when one is set.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub section: Option<Section>,
    /// How the editor snaps PVIs in this project.
    #[serde(default, skip_serializing_if = "Snap::is_default")]
    pub snap: Snap,
    /// How the sheet and tables are exported.
    #[serde(default, skip_serializing_if = "ExportSettings::is_default")]
    pub export: ExportSettings,
}

impl Project {
    /// An empty project in `units`.
    pub fn new(name: impl Into<String>, units: Units) -> Self {
        Self {
            format_version: FORMAT_VERSION,
            name: name.into(),
            units,
            foot: Foot::default(),
            criteria: Criteria::default(),
            pvis: Vec::new(),
            ground: Ground::default(),
            controls: Vec::new(),
            section: None,
            snap: Snap::default(),
            export: ExportSettings::default(),
        }
    }

    /// The profile (a copy of units and PVIs).
    pub fn profile(&self) -> Profile {
        Profile::new(self.units, self.pvis.clone())
    }

    /// Parses project text; `origin` names the file in errors.
    ///
    /// # Errors
    /// [`FileError::Syntax`] with line and column, or [`FileError::NewerVersion`].
    pub fn from_ron(text: &str, origin: &Path) -> Result<Self, FileError> {
        // A byte-order mark some editors write is not part of the text.
        let text = text.strip_prefix('\u{feff}').unwrap_or(text);
        // Read the version first, so a newer file says so instead of failing
        // on a field this build does not know.
        if let Ok(probe) = ron::from_str::<VersionProbe>(text)
            && probe.format_version > FORMAT_VERSION
        {
            return Err(FileError::NewerVersion {
                path: origin.to_owned(),
                found: probe.format_version,
                supported: FORMAT_VERSION,
            });
        }
        let project: Self = ron::from_str(text).map_err(|e| FileError::Syntax {
            path: origin.to_owned(),
            line: e.span.start.line,
            column: e.span.start.col,
            message: match looks_like(text) {
                Some(kind) => format!("{}; the file looks like {kind}", e.code),
                None => e.code.to_string(),
            },
        })?;
        if let Some((index, why)) = project.ground.problem() {
            let (line, column) = ground_position(text, index);
            return Err(FileError::Syntax {
                path: origin.to_owned(),
                line,
                column,
                message: format!("ground point {}: {why}", index + 1),
            });
        }
        if project.format_version == 0 {
            return Err(FileError::Syntax {
                path: origin.to_owned(),
                line: 1,
                column: 1,
                message: "format_version must be 1 or more".to_owned(),
            });
        }
        Ok(project)
    }

    /// The project as pretty RON text.
    ///
    /// # Errors
    /// [`FileError::Encode`] if serialisation fails (it does not for finite data).
    pub fn to_ron(&self) -> Result<String, FileError> {
        let config = ron::ser::PrettyConfig::new().depth_limit(4).struct_names(true);
        let mut text =
            ron::ser::to_string_pretty(self, config).map_err(|e| FileError::Encode(e.to_string()))?;
        text.push('\n');
        Ok(text)
    }

    /// Loads a project file.
    ///
    /// # Errors
    /// [`FileError`] naming the file, and line and column for syntax errors.
    pub fn load(path: &Path) -> Result<Self, FileError> {
        let text = fs::read_to_string(path)
            .map_err(|e| FileError::Io { path: path.to_owned(), message: e.to_string() })?;
        Self::from_ron(&text, path)
    }

    /// Saves atomically: writes a temporary file beside `path`, flushes it to
    /// disk, copies any existing file to `path.bak`, then renames the temporary
    /// file over `path`. A failure at any step leaves the old file as it was.
    ///
    /// # Errors
    /// [`FileError::Io`] naming the file.
    pub fn save(&self, path: &Path) -> Result<(), FileError> {
        let text = self.to_ron()?;
        crate::write_atomic(path, text.as_bytes(), true)
    }
}

/// What a file that fails to parse as a project looks like, when it looks
/// like something else Gradewright reads.
fn looks_like(text: &str) -> Option<&'static str> {
    let first =
        text.lines().map(str::trim).find(|l| !l.is_empty() && !l.starts_with('#') && !l.starts_with("//"))?;
    let lower = first.to_ascii_lowercase();
    if lower.starts_with("<?xml") || lower.starts_with('<') {
        Some("XML, not a project file")
    } else if !first.contains('(')
        && (first.contains(',') || first.contains(';') || first.contains('\t'))
        && (lower.contains("station") || first.chars().next().is_some_and(|c| c.is_ascii_digit()))
    {
        Some("a CSV PVI table, not a project file: name it .csv and give --units")
    } else {
        None
    }
}

/// The 1-based line and column of the `station` key of every PVI in project
/// text, in order (for naming where a PVI's problem is).
pub fn pvi_positions(text: &str) -> Vec<(usize, usize)> {
    let text = text.strip_prefix('\u{feff}').unwrap_or(text);
    let Some(start) = text.find("pvis") else { return Vec::new() };
    let mut positions = Vec::new();
    let mut rest = start;
    while let Some(found) = text.get(rest..).and_then(|t| t.find("station")) {
        let at = rest + found;
        let after = text.get(at + "station".len()..).unwrap_or("");
        let before = text.get(..at).and_then(|b| b.chars().next_back());
        if after.trim_start().starts_with(':') && !before.is_some_and(|c| c.is_alphanumeric() || c == '_') {
            positions.push(line_column(text, at));
        }
        rest = at + "station".len();
    }
    positions
}

/// The 1-based line and column of byte offset `at` in `text`.
fn line_column(text: &str, at: usize) -> (usize, usize) {
    let head = text.get(..at).unwrap_or("");
    let line = head.matches('\n').count() + 1;
    let column =
        head.rfind('\n').map_or(head.chars().count(), |n| head.get(n + 1..).map_or(0, |h| h.chars().count()))
            + 1;
    (line, column)
}

/// The 1-based line and column of ground point `index` in project text
/// (the start of the ground list when the point is not found).
fn ground_position(text: &str, index: usize) -> (usize, usize) {
    let position = |at: usize| line_column(text, at);
    let Some(start) = text.find("ground:").or_else(|| text.find("ground")) else { return (1, 1) };
    let mut at = start;
    for _ in 0..=index {
        match text.get(at + 1..).and_then(|t| t.find("GroundPoint").or_else(|| t.find("station"))) {
            Some(found) => at += 1 + found,
            None => return position(start),
        }
    }
    position(at)
}

#[derive(Deserialize)]
#[serde(rename = "Project")]
struct VersionProbe {
    format_version: u32,
}

/// Why a project file could not be read or written.
#[derive(Clone, Debug, PartialEq, thiserror::Error)]
pub enum FileError {
    /// Reading or writing failed.
    #[error("{}: {message}", .path.display())]
    Io {
        /// The file.
        path: PathBuf,
        /// What the system said.
        message: String,
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
    /// The project could not be encoded.
    #[error("could not encode the project: {0}")]
    Encode(String),
}
