//! What leaves the frame: file dialogs, opening, importing, saving and
//! exporting. Run after the frame from the action queue
//! ([`GradewrightApp::apply`]), never from inside a panel; each outcome is
//! told in the status line.

use std::path::{Path, PathBuf};

use gradewright_document::{FileError, LooksLike};
use gradewright_exchange::{Choosing, ReadError, Selection};
use gradewright_geometry::{Foot, Ground, Units, excerpt};

use super::app::GradewrightApp;
use super::command::{Action, Edit};
use crate::load::{FileKind, LoadError};

/// Whether the header of the CSV file at `path` (its first line that is
/// not a comment) names one of `columns`.
fn header_names(path: &Path, columns: &[&str]) -> bool {
    use std::io::Read as _;
    // The first line is enough: read no more than the start of the file.
    let mut bytes = Vec::new();
    if std::fs::File::open(path).and_then(|f| f.take(4096).read_to_end(&mut bytes)).is_err() {
        return false;
    }
    let head = String::from_utf8_lossy(&bytes).to_ascii_lowercase();
    head.lines().find(|l| !l.trim().is_empty() && !l.starts_with('#')).is_some_and(|l| {
        l.split([',', ';', '\t']).any(|cell| columns.contains(&cell.trim().trim_start_matches('\u{feff}')))
    })
}

/// Every (alignment, design profile, ground line) a file offers, as the
/// selections that open them.
fn profile_selections(choices: &[gradewright_exchange::Choice]) -> Vec<Selection> {
    let mut out = Vec::new();
    for c in choices {
        let surfaces: Vec<Option<String>> =
            if c.surfaces.is_empty() { vec![None] } else { c.surfaces.iter().cloned().map(Some).collect() };
        for surface in surfaces {
            out.push(Selection {
                alignment: Some(c.alignment.clone()),
                profile: Some(c.profile.clone()),
                surface,
            });
        }
    }
    out
}

/// Every (alignment, ground line) a file offers, each once.
fn ground_selections(choices: &[gradewright_exchange::Choice]) -> Vec<Selection> {
    let mut out: Vec<Selection> = Vec::new();
    for c in choices {
        for s in &c.surfaces {
            let pick =
                Selection { alignment: Some(c.alignment.clone()), profile: None, surface: Some(s.clone()) };
            if !out.contains(&pick) {
                out.push(pick);
            }
        }
    }
    out
}

/// The choices a LandXML file offers, by `selections` of them.
fn landxml_offers(
    path: &Path,
    selections: fn(&[gradewright_exchange::Choice]) -> Vec<Selection>,
) -> Vec<Selection> {
    gradewright_exchange::open_file(path)
        .and_then(|f| gradewright_exchange::landxml_choices(f, path))
        .map(|c| selections(&c))
        .unwrap_or_default()
}

/// A save dialog for a project file named after `name`.
fn pick_save_path(name: &str) -> Option<PathBuf> {
    let slug: String =
        name.chars().map(|c| if c.is_ascii_alphanumeric() { c.to_ascii_lowercase() } else { '-' }).collect();
    let slug = slug.split('-').filter(|p| !p.is_empty()).collect::<Vec<_>>().join("-");
    let slug = if slug.is_empty() { "profile".to_owned() } else { slug };
    rfd::FileDialog::new()
        .add_filter("Gradewright project", &["ron"])
        .set_file_name(format!("{slug}.ron"))
        .save_file()
}

/// An open dialog for an import, titled `title`.
fn pick_import(title: &str) -> Option<PathBuf> {
    rfd::FileDialog::new()
        .set_title(title)
        .add_filter("CSV table", &["csv", "txt"])
        .add_filter("LandXML ground line", &["xml"])
        .pick_file()
}

impl GradewrightApp {
    /// Runs an action that leaves the frame: a dialog, a file read or write.
    pub(super) fn run_effect(&mut self, action: Action) {
        match action {
            Action::Open(Some(path)) => {
                self.open_path(&path);
            }
            Action::Open(None) => match rfd::FileDialog::new()
                .add_filter("Gradewright project, LandXML or PVI table", &["ron", "xml", "csv"])
                .add_filter("Gradewright project", &["ron"])
                .add_filter("LandXML 1.2", &["xml"])
                .add_filter("PVI table", &["csv"])
                .pick_file()
            {
                Some(path) => {
                    self.open_path(&path);
                }
                None => self.no_dialog(),
            },
            Action::OpenLandXml(path, selection) => {
                self.open_landxml(&path, &selection);
            }
            Action::OpenPviTable(path, units) => {
                self.open_pvi_table(&path, units);
            }
            Action::Save => {
                self.save();
            }
            Action::SaveAs(Some(path)) => {
                self.save_to(&path);
            }
            Action::SaveAs(None) => match pick_save_path(&self.project().name) {
                Some(path) => {
                    self.save_to(&path);
                }
                None => self.no_dialog(),
            },
            Action::ImportGround(Some(path)) => {
                self.import_ground(&path, &Selection::default());
            }
            Action::ImportGroundFrom(path, selection) => {
                self.import_ground(&path, &selection);
            }
            Action::ImportGround(None) => match pick_import("Import existing ground (station, elevation)") {
                Some(path) => {
                    self.import_ground(&path, &Selection::default());
                }
                None => self.say(false, "No file chosen".to_owned()),
            },
            Action::ImportControls(Some(path)) => {
                self.import_controls(&path);
            }
            Action::ImportControls(None) => {
                match pick_import("Import control points (station, kind, elevation, tolerance, name)") {
                    Some(path) => {
                        self.import_controls(&path);
                    }
                    None => self.say(false, "No file chosen".to_owned()),
                }
            }
            Action::ExportLandXml(Some(path)) => {
                self.export_landxml(&path);
            }
            Action::ExportLandXml(None) => {
                let name = format!(
                    "{}.xml",
                    if self.project().name.is_empty() { "profile" } else { &self.project().name }
                );
                match rfd::FileDialog::new()
                    .add_filter("LandXML 1.2", &["xml"])
                    .set_file_name(name)
                    .save_file()
                {
                    Some(path) => {
                        self.export_landxml(&path);
                    }
                    None => self.say(false, "No file chosen".to_owned()),
                }
            }
            Action::ExportSheet => {
                self.export_now();
            }
            Action::ExportTables => {
                self.export_tables_now();
            }
            Action::Dropped(path) => self.dropped(path),
            _ => {}
        }
    }

    fn no_dialog(&mut self) {
        self.say(false, "No file chosen (if no dialog appeared, use File, Open or save by path…)".to_owned());
        self.windows.path.open = true;
    }

    /// A file dropped on the window: opened or imported by what it holds.
    fn dropped(&mut self, path: PathBuf) {
        let ext = path.extension().map(|e| e.to_string_lossy().to_ascii_lowercase());
        match ext.as_deref() {
            Some("csv" | "txt") if header_names(&path, &["curve_length", "length_in", "length_out"]) => {
                self.push(Action::Open(Some(path)));
            }
            Some("csv" | "txt") if header_names(&path, &["kind"]) => {
                self.import_controls(&path);
            }
            Some("csv" | "txt") => {
                self.import_ground(&path, &Selection::default());
            }
            Some("ron" | "xml") => self.push(Action::Open(Some(path))),
            _ => self.say(
                true,
                format!(
                    "{}: drop a project (.ron), a LandXML file (.xml), a ground table or a control-points table (.csv)",
                    path.display()
                ),
            ),
        }
    }

    /// Opens `path`, keeping the current work if it fails (the error is
    /// shown). A LandXML file opens as a new, unsaved project (Save asks
    /// where to keep it as a project file), offering a chooser when it holds
    /// several profiles; a PVI table asks for its units first.
    pub fn open_path(&mut self, path: &Path) -> bool {
        match FileKind::of(path) {
            FileKind::LandXml => self.open_landxml(path, &Selection::default()),
            FileKind::PviTable => {
                // A PVI table carries no units: ask for them first.
                self.windows.pvi_units = Some(path.to_owned());
                self.say(false, format!("{}: a PVI table; choose its units", path.display()));
                false
            }
            FileKind::Project => match gradewright_document::Project::load(path) {
                Ok(project) => {
                    self.replace_project(project, Some(path.to_owned()), true);
                    self.session.note_recent(path);
                    self.say(false, format!("Opened {}", path.display()));
                    true
                }
                Err(e) => {
                    let hint = match &e {
                        FileError::Syntax { looks_like: Some(LooksLike::PviTable), .. } => {
                            " (name it .csv to open it as a PVI table)"
                        }
                        _ => "",
                    };
                    self.fail("Could not open", &e);
                    if let Some(n) = &mut self.notice {
                        n.text.push_str(hint);
                    }
                    false
                }
            },
        }
    }

    /// Opens the design profile `selection` picks from the LandXML file at
    /// `path` as a new, unsaved project; when the file holds several, they
    /// are offered in a chooser.
    pub fn open_landxml(&mut self, path: &Path, selection: &Selection) -> bool {
        match crate::load::load_input(path, None, selection) {
            Ok(input) => {
                let project = input.project;
                let lengths = match (project.units, project.foot) {
                    (Units::Metric, _) => "metres",
                    (Units::UsCustomary, Foot::UsSurvey) => "US survey feet",
                    (Units::UsCustomary, _) => "feet",
                };
                self.replace_project(project, None, true);
                let told: Vec<String> =
                    input.notes.iter().filter(|n| !n.kind.is_units_read()).map(ToString::to_string).collect();
                let more = if told.is_empty() { String::new() } else { format!(" · {}", told.join(" · ")) };
                let (name, alignment, ground) = match input.picked {
                    Some(p) => (
                        excerpt(&p.profile),
                        excerpt(&p.alignment),
                        p.surface.map(|s| format!(" and ground '{}'", excerpt(&s))),
                    ),
                    None => (String::new(), String::new(), None),
                };
                self.say(
                    false,
                    format!(
                        "Opened profile '{name}'{} of alignment '{alignment}' from LandXML {} in {lengths}; Save keeps it as a project{more}",
                        ground.unwrap_or_default(),
                        path.display(),
                    ),
                );
                true
            }
            Err(LoadError::Exchange(e @ ReadError { ambiguous: Some(_), .. }))
                if selection.profile.is_none() =>
            {
                let choices = landxml_offers(path, profile_selections);
                if choices.len() > 1 {
                    self.say(
                        false,
                        format!(
                            "{} holds {} design profiles or ground lines: choose one",
                            path.display(),
                            choices.len()
                        ),
                    );
                    self.windows.landxml_choice = Some((path.to_owned(), choices));
                } else {
                    self.fail("Could not open", &e);
                }
                false
            }
            Err(e) => {
                self.fail("Could not open", &e);
                false
            }
        }
    }

    /// Opens the PVI table (CSV) at `path`, read in `units`, as a new,
    /// unsaved project.
    pub fn open_pvi_table(&mut self, path: &Path, units: Units) -> bool {
        // The command line's reader, so a table opens the same project here.
        match crate::load::load_input(path, Some(units), &Selection::default()) {
            Ok(input) => {
                self.replace_project(input.project, None, true);
                self.say(
                    false,
                    format!("Opened the PVI table {} in {units}; Save keeps it as a project", path.display()),
                );
                true
            }
            Err(e) => {
                self.fail("Could not open", &e);
                false
            }
        }
    }

    /// Replaces the ground by the CSV file at `path`, or by the ground line
    /// `selection` picks from a LandXML file (`.xml`, converted to the
    /// project's units), as one undo step; when a LandXML file holds several
    /// ground lines they are offered in a chooser. On failure the project is
    /// untouched and the error names file, line and field.
    pub fn import_ground(&mut self, path: &Path, selection: &Selection) -> bool {
        let (units, foot) = (self.project().units, self.project().foot);
        let equations = self.project().equations.clone();
        let at = equations.stationing(units);
        let read = if gradewright_exchange::is_landxml_path(path) {
            gradewright_exchange::open_file(path)
                .and_then(|f| gradewright_exchange::read_landxml_ground(f, path, selection, units, foot))
                .map(|g| {
                    let mut said =
                        vec![format!("ground line '{}' of alignment '{}'", g.surface, g.alignment)];
                    said.extend(g.notes.iter().filter(|n| !n.kind.is_units_read()).map(ToString::to_string));
                    (g.points, said)
                })
        } else {
            gradewright_exchange::open_file(path)
                .and_then(|f| gradewright_exchange::read_ground_csv(f, path, at))
                .map(|t| (t.points, t.warnings.iter().map(ToString::to_string).collect()))
        };
        match read {
            Ok((points, mut said)) => {
                let count = points.len();
                let ground = Ground::new(points);
                said.extend(ground.review(units).iter().map(|w| w.describe(at)));
                let changed = self.apply_edit(Edit::SetGround(ground));
                let mut text = format!("Imported {count} ground point(s) from {}", path.display());
                if !changed {
                    text.push_str(" (the same ground as before)");
                }
                if !said.is_empty() {
                    text.push_str(&format!(" — {}", said.join("; ")));
                }
                self.say(false, text);
                true
            }
            Err(e) if e.ambiguous.as_ref().is_some_and(|a| a.choosing != Choosing::Profile) => {
                let choices = landxml_offers(path, ground_selections);
                self.say(
                    false,
                    format!("{} holds {} ground lines: choose one", path.display(), choices.len()),
                );
                self.windows.ground_choice = Some((path.to_owned(), choices));
                false
            }
            Err(e) => {
                self.fail("Could not import the ground", &e);
                false
            }
        }
    }

    /// Replaces the control points by the CSV file at `path` (one undo step).
    pub fn import_controls(&mut self, path: &Path) -> bool {
        let units = self.project().units;
        let equations = self.project().equations.clone();
        let read = gradewright_exchange::open_file(path)
            .and_then(|f| gradewright_exchange::read_controls_csv(f, path, equations.stationing(units)));
        match read {
            Ok(points) => {
                let count = points.len();
                self.apply_edit(Edit::SetControls(points));
                self.say(false, format!("Imported {count} control point(s) from {}", path.display()));
                true
            }
            Err(e) => {
                self.fail("Could not import the control points", &e);
                false
            }
        }
    }

    /// Writes the design profile and the ground as LandXML 1.2 to `path`
    /// (atomically); the outcome is shown in the status line.
    pub fn export_landxml(&mut self, path: &Path) -> bool {
        let written = crate::load::encode(self.project(), FileKind::LandXml)
            .and_then(|bytes| Ok(gradewright_document::write_atomic(path, &bytes, true)?));
        match written {
            Ok(()) => {
                self.say(false, format!("Exported LandXML {}", path.display()));
                true
            }
            Err(e) => {
                self.fail("LandXML export failed", e.as_ref());
                false
            }
        }
    }

    /// Saves to the project's file, or asks where. Returns whether it saved.
    pub fn save(&mut self) -> bool {
        match self.path().map(Path::to_owned).or_else(|| pick_save_path(&self.project().name)) {
            Some(path) => self.save_to(&path),
            None => {
                self.no_dialog();
                false
            }
        }
    }

    /// Saves to `path` (atomically, keeping a backup). Returns whether it worked.
    pub fn save_to(&mut self, path: &Path) -> bool {
        let mut project = self.project().clone();
        project.format_version = gradewright_document::FORMAT_VERSION;
        match project.save(path) {
            Ok(()) => {
                self.doc.mark_saved();
                self.session.set_path(Some(path.to_owned()));
                self.session.files.clear_recovery();
                self.session.note_recent(path);
                self.say(false, format!("Saved {}", path.display()));
                true
            }
            Err(e) => {
                self.fail("Could not save", &e);
                false
            }
        }
    }

    /// Where the export goes: the settings' path, else beside the project file.
    pub fn export_base(&self) -> PathBuf {
        let settings = &self.project().export;
        if !settings.path.trim().is_empty() {
            return PathBuf::from(settings.path.trim());
        }
        match self.path() {
            Some(p) => p.with_extension(""),
            None => std::env::current_dir().unwrap_or_default().join("profile"),
        }
    }

    /// Where File, Export tables… writes: the settings' folder, else
    /// `NAME-tables` beside the project file.
    pub fn tables_dir(&self) -> PathBuf {
        let settings = &self.project().export;
        if !settings.tables_path.trim().is_empty() {
            return PathBuf::from(settings.tables_path.trim());
        }
        let mut dir = self.export_base().into_os_string();
        dir.push("-tables");
        PathBuf::from(dir)
    }

    /// Writes only the tables (stations, curves, findings) to
    /// [`GradewrightApp::tables_dir`]; the outcome is shown in the status line.
    pub fn export_tables_now(&mut self) -> bool {
        let dir = self.tables_dir();
        let mut request = super::panels::export::request(&self.project().export, &dir);
        (request.png, request.svg, request.pdf) = (None, None, None);
        request.csv_dir = Some(dir.clone());
        self.write_export(&request, &dir)
    }

    /// Exports as the settings say; the outcome is shown in the status line.
    pub fn export_now(&mut self) -> bool {
        let base = self.export_base();
        let request = super::panels::export::request(&self.project().export, &base);
        self.write_export(&request, &base)
    }

    fn write_export(&mut self, request: &crate::export::Request, base: &Path) -> bool {
        let planned = crate::export::plan(request).map_err(|e| super::panels::export::plan_words(&e));
        let result = planned.and_then(|plan| {
            let analysis = self.analysis();
            if let Some(problem) = analysis.problems.first() {
                return Err(format!("the profile has problems to fix first: {problem}"));
            }
            let files = crate::export::render(&plan, request, analysis, self.project())
                .map_err(|e| crate::load::one_line(&e))?;
            let inputs: Vec<&Path> = self.path().into_iter().collect();
            crate::export::check_outputs(&files, &inputs)
                .map_err(|e| super::panels::export::plan_words(&e))?;
            crate::export::write_all(&files).map_err(|e| crate::load::one_line(&e))?;
            Ok(files.len())
        });
        match result {
            Ok(n) => {
                self.say(false, format!("Exported {n} file(s) to {}", base.display()));
                true
            }
            Err(e) => {
                self.say(true, format!("Export failed: {e}"));
                false
            }
        }
    }
}
