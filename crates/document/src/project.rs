//! The project file: a profile, its criteria and room for ground and controls.
//!
//! Saved as RON with a `format_version`. Loading names the line and column of
//! any error; saving is atomic and keeps the previous file as `*.bak`.

use std::path::Path;

use serde::{Deserialize, Serialize};

use gradewright_geometry::{
    ControlPoint, Criteria, Design, Equations, Foot, Ground, GroundPoint, Profile, Pvi, Section, Units,
};

use crate::{ExportSettings, FileError, LooksLike, Snap};

/// The newest file format this build reads and the one it writes.
pub const FORMAT_VERSION: u32 = 1;

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
    /// The station equations, in internal-station order: the PVIs, ground,
    /// controls and every other station in the file are internal stations
    /// (the alignment's start plus the distance along it); people read and
    /// type plan stations.
    #[serde(default, skip_serializing_if = "Equations::is_empty")]
    pub equations: Equations,
    /// Where the criteria differ along the road (internal stations, in
    /// order, not overlapping); outside every range `criteria` apply.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub criteria_ranges: Vec<gradewright_geometry::CriteriaRange>,
    /// How the editor snaps PVIs in this project.
    #[serde(default, skip_serializing_if = "Snap::is_default")]
    pub snap: Snap,
    /// How the sheet and tables are exported.
    #[serde(default, skip_serializing_if = "ExportSettings::is_default")]
    pub export: ExportSettings,
    /// The file the project was opened from, kept to be written back
    /// around the edited profile (a LandXML file's plan geometry, station
    /// equations and everything else it holds).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub kept: Option<crate::Kept>,
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
            equations: Equations::default(),
            criteria_ranges: Vec::new(),
            snap: Snap::default(),
            export: ExportSettings::default(),
            kept: None,
        }
    }

    /// The profile (a copy of units and PVIs).
    pub fn profile(&self) -> Profile {
        Profile::new(self.units, self.pvis.clone()).with_equations(self.equations.clone())
    }

    /// How its stations read as plan stations (its station equations).
    pub fn stationing(&self) -> gradewright_geometry::Stationing<'_> {
        self.equations.stationing(self.units)
    }

    /// The design as the analysis reads it (a copy; the ground is shared).
    pub fn design(&self) -> Design {
        Design {
            units: self.units,
            criteria: self.criteria.clone(),
            pvis: self.pvis.clone(),
            ground: self.ground.clone(),
            controls: self.controls.clone(),
            section: self.section,
            equations: self.equations.clone(),
            ranges: self.criteria_ranges.clone(),
            interval: self.export.interval,
        }
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
        let project: Self = ron::from_str(text).map_err(|e| {
            let looks_like = looks_like(text);
            FileError::Syntax {
                path: origin.to_owned(),
                line: e.span.start.line,
                column: e.span.start.col,
                message: match looks_like {
                    Some(kind) => format!("{}; the file looks like {kind}", e.code),
                    None => e.code.to_string(),
                },
                looks_like,
            }
        })?;
        if let Err(invalid) = project.check() {
            let (line, column) = match invalid.part {
                Part::Ground => entry_position(text, "ground", invalid.index),
                Part::Control => entry_position(text, "controls", invalid.index),
                Part::Equation => entry_position(text, "equations", invalid.index),
                Part::CriteriaRange => entry_position(text, "criteria_ranges", invalid.index),
            }
            .unwrap_or((1, 1));
            return Err(FileError::Syntax {
                path: origin.to_owned(),
                line,
                column,
                message: invalid.to_string(),
                looks_like: None,
            });
        }
        if project.format_version == 0 {
            return Err(FileError::Syntax {
                path: origin.to_owned(),
                line: 1,
                column: 1,
                message: "format_version must be 1 or more".to_owned(),
                looks_like: None,
            });
        }
        Ok(project)
    }

    /// What the project holds that no project file may (so that nothing is
    /// written that cannot be read back): a ground point or a control point
    /// that is not usable.
    ///
    /// # Errors
    /// The first such point, and why.
    pub fn check(&self) -> Result<(), Invalid> {
        if let Some((index, why)) = self.ground.problem() {
            return Err(Invalid { part: Part::Ground, index, why: why.to_owned() });
        }
        if let Some((index, why)) =
            self.controls.iter().enumerate().find_map(|(i, c)| c.problem().map(|w| (i, w)))
        {
            return Err(Invalid { part: Part::Control, index, why: why.to_owned() });
        }
        if let Some((index, why)) = self.equations.problem() {
            return Err(Invalid { part: Part::Equation, index, why });
        }
        if let Some((index, why)) = gradewright_geometry::ranges_problem(&self.criteria_ranges) {
            return Err(Invalid { part: Part::CriteriaRange, index, why });
        }
        Ok(())
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
        let text = crate::read_text(path)?;
        Self::from_ron(&text, path)
    }

    /// Saves atomically: writes a temporary file beside `path`, flushes it to
    /// disk, copies any existing file to `path.bak`, then renames the temporary
    /// file over `path`. A failure at any step leaves the old file as it was.
    ///
    /// # Errors
    /// [`FileError::Io`] naming the file.
    pub fn save(&self, path: &Path) -> Result<(), FileError> {
        self.check().map_err(|invalid| FileError::Unsavable { path: path.to_owned(), invalid })?;
        let text = self.to_ron()?;
        crate::write_atomic(path, text.as_bytes(), true)
    }
}

/// What a file that fails to parse as a project looks like, when it looks
/// like something else Gradewright reads.
fn looks_like(text: &str) -> Option<LooksLike> {
    let first =
        text.lines().map(str::trim).find(|l| !l.is_empty() && !l.starts_with('#') && !l.starts_with("//"))?;
    let lower = first.to_ascii_lowercase();
    if lower.starts_with("<?xml") || lower.starts_with('<') {
        Some(LooksLike::Xml)
    } else if !first.contains('(')
        && (first.contains(',') || first.contains(';') || first.contains('\t'))
        && (lower.contains("station") || first.chars().next().is_some_and(|c| c.is_ascii_digit()))
    {
        Some(LooksLike::PviTable)
    } else {
        None
    }
}

/// The 1-based line and column of the `station` key of PVI `index` (0-based)
/// in project text, for naming where a PVI's problem is: found when a
/// problem is reported, in one pass over the text up to it.
pub fn pvi_position(text: &str, index: usize) -> Option<(usize, usize)> {
    entry_position(text.strip_prefix('\u{feff}').unwrap_or(text), "pvis", index)
}

/// The line and column of entry `index` (0-based) of the list in field
/// `key` of a project's text: its `index`-th `station` key after the
/// field's name.
fn entry_position(text: &str, key: &str, index: usize) -> Option<(usize, usize)> {
    // Each entry's first field names it.
    let field = match key {
        "equations" => "internal",
        "criteria_ranges" => "from",
        _ => "station",
    };
    let start = field_start(text, key)?;
    let mut rest = start;
    let mut seen = 0;
    while let Some(found) = text.get(rest..).and_then(|t| t.find(field)) {
        let at = rest + found;
        let after = text.get(at + field.len()..).unwrap_or("");
        let before = text.get(..at).and_then(|b| b.chars().next_back());
        if after.trim_start().starts_with(':') && !before.is_some_and(|c| c.is_alphanumeric() || c == '_') {
            if seen == index {
                return Some(line_column(text, at));
            }
            seen += 1;
        }
        rest = at + field.len();
    }
    None
}

/// Where field `key` of the project starts: `key` followed by `:` and not
/// part of a longer name or of a string.
fn field_start(text: &str, key: &str) -> Option<usize> {
    let mut from = 0;
    while let Some(found) = text.get(from..).and_then(|t| t.find(key)) {
        let at = from + found;
        let before = text.get(..at).and_then(|b| b.chars().next_back());
        let after = text.get(at + key.len()..).unwrap_or("");
        if after.trim_start().starts_with(':')
            && before.is_none_or(|c| c.is_whitespace() || c == ',' || c == '(')
        {
            return Some(at);
        }
        from = at + key.len();
    }
    None
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

/// Which list of a project an unusable entry is in.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Part {
    /// The ground line.
    Ground,
    /// The control points.
    Control,
    /// The station equations.
    Equation,
    /// The criteria ranges.
    CriteriaRange,
}

/// An entry no project file may hold.
#[derive(Clone, Debug, PartialEq, Eq, thiserror::Error)]
#[error("{} {}: {why}", match .part { Part::Ground => "ground point", Part::Control => "control point", Part::Equation => "station equation", Part::CriteriaRange => "criteria range" }, .index + 1)]
pub struct Invalid {
    /// Which list.
    pub part: Part,
    /// Which entry (0-based).
    pub index: usize,
    /// What is wrong.
    pub why: String,
}

#[derive(Deserialize)]
#[serde(rename = "Project")]
struct VersionProbe {
    format_version: u32,
}
