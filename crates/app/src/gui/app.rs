//! The application state and the one place where actions are applied.

use std::path::{Path, PathBuf};

use gradewright_document::Project;
use gradewright_geometry::{Analysis, Pvi, Units, VerticalCurve};

use super::command::{Action, Edit, REDO_ALT, UiCommand};
use super::files::AppFiles;
use super::history::History;
use super::view::ViewState;

/// The demo project shown on first start (a fictional road).
pub const DEMO_PROJECT: &str = include_str!("../../../../assets/alder-brook-road.ron");

/// How often unsaved work is written to the recovery file, seconds.
const AUTOSAVE_SECONDS: f64 = 30.0;

/// What a drag may change: both coordinates, or only one.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum DragLock {
    /// Station and elevation.
    Free,
    /// Elevation only: the station stays (Shift held).
    Vertical,
    /// Station only: the elevation stays (Ctrl held).
    Horizontal,
}

/// A message shown in the window.
#[derive(Clone, Debug, PartialEq)]
pub struct Notice {
    /// Whether it reports an error.
    pub error: bool,
    /// The text.
    pub text: String,
}

/// What waits for the user's answer about unsaved changes.
#[derive(Clone, Debug, PartialEq)]
pub enum Pending {
    /// Unsaved changes: save, discard or cancel before `then`.
    UnsavedChanges(Box<Action>),
    /// A recovery file was found at start.
    Recovery(Box<Project>),
}

/// The Gradewright editor: project, history, analysis and view state.
pub struct GradewrightApp {
    project: Project,
    path: Option<PathBuf>,
    saved: Option<Project>,
    history: History,
    drag_origin: Option<Project>,
    analysis: Analysis,
    revision: u64,
    /// View state (selection, plot settings, cell buffers).
    pub view: ViewState,
    files: AppFiles,
    recent: Vec<PathBuf>,
    /// A dialog waiting for an answer.
    pub pending: Option<Pending>,
    /// The latest message.
    pub notice: Option<Notice>,
    actions: Vec<Action>,
    last_autosave: Option<f64>,
    close_confirmed: bool,
    /// Whether the last edit renamed the project (typing a name is one step).
    renaming: bool,
    /// Set when the window should close (read by the eframe shell).
    pub close_requested: bool,
}

impl GradewrightApp {
    /// The editor on `project`, keeping its own files in `files`.
    pub fn new(project: Project, path: Option<PathBuf>, files: AppFiles) -> Self {
        let analysis = Analysis::of(&project.design());
        let recent = files.recent();
        // The project as given is the clean state: nothing to lose yet.
        let saved = Some(project.clone());
        let mut app = Self {
            project,
            path,
            saved,
            history: History::default(),
            drag_origin: None,
            analysis,
            revision: 0,
            view: ViewState::default(),
            files,
            recent,
            pending: None,
            notice: None,
            actions: Vec::new(),
            last_autosave: None,
            close_confirmed: false,
            renaming: false,
            close_requested: false,
        };
        app.view.request_fit();
        app.view.lengthen_increment = app.project.units.curve_length_increment();
        if let Some(recovered) = app.files.read_recovery() {
            app.pending = Some(Pending::Recovery(Box::new(recovered)));
        }
        app
    }

    /// The editor on the built-in demo project (first start).
    pub fn with_demo(files: AppFiles) -> Self {
        let project = Project::from_ron(DEMO_PROJECT, Path::new("alder-brook-road.ron"))
            .unwrap_or_else(|_| Project::new("Untitled", Units::Metric));
        let mut app = Self::new(project, None, files);
        app.view.selected = Some(3);
        app
    }

    /// Opens `path` at start (a project or a LandXML file), or falls back to
    /// the demo with the error shown.
    pub fn with_file(path: &Path, files: AppFiles) -> Self {
        if gradewright_exchange::is_landxml_path(path) {
            let mut app = Self::with_demo(files);
            app.open_landxml(path, &gradewright_exchange::Selection::default());
            return app;
        }
        match Project::load(path) {
            Ok(project) => {
                let app = Self::new(project, Some(path.to_owned()), files);
                let _ = app.files.add_recent(path);
                app
            }
            Err(e) => {
                let mut app = Self::with_demo(files);
                app.notice = Some(Notice { error: true, text: format!("Could not open: {e}") });
                app
            }
        }
    }

    /// The project as it stands.
    pub fn project(&self) -> &Project {
        &self.project
    }

    /// The file the project was last opened from or saved to.
    pub fn path(&self) -> Option<&Path> {
        self.path.as_deref()
    }

    /// The analysis of the current project (alignment, curves, criteria,
    /// findings, sight distance), refreshed on every change.
    pub fn analysis(&self) -> &Analysis {
        &self.analysis
    }

    /// Recent files, newest first.
    pub fn recent(&self) -> &[PathBuf] {
        &self.recent
    }

    /// Whether there are changes not saved to a file.
    pub fn is_dirty(&self) -> bool {
        self.saved.as_ref() != Some(&self.project)
    }

    /// Whether there is something to undo or redo.
    pub fn can_undo_redo(&self) -> (bool, bool) {
        (self.history.can_undo(), self.history.can_redo())
    }

    /// A counter that changes whenever the project does.
    pub fn revision(&self) -> u64 {
        self.revision
    }

    /// The window title: file name, unsaved mark, program name.
    pub fn title(&self) -> String {
        let name = self.path.as_ref().and_then(|p| p.file_name()).map_or_else(
            || format!("{} (not saved)", self.project.name),
            |n| n.to_string_lossy().into_owned(),
        );
        let mark = if self.is_dirty() { " ●" } else { "" };
        format!("{name}{mark} — Gradewright")
    }

    /// Queues an action for the end of this frame.
    pub fn push(&mut self, action: Action) {
        self.actions.push(action);
    }

    fn changed(&mut self) {
        self.revision += 1;
        self.analysis.refresh(&self.project.design());
        if let Some(sel) = self.view.selected
            && sel >= self.project.pvis.len()
        {
            self.view.selected = self.project.pvis.len().checked_sub(1);
        }
    }

    /// Shows another project; `clean` says whether it counts as saved
    /// (opened or new) or holds work that still needs saving (recovered).
    fn replace_project(&mut self, project: Project, path: Option<PathBuf>, clean: bool) {
        self.project = project;
        self.saved = clean.then(|| self.project.clone());
        self.path = path;
        self.history.clear();
        self.view.reset_for_new_project();
        self.changed();
    }

    /// Applies an edit as one undo step. Returns whether anything changed.
    pub fn apply_edit(&mut self, edit: Edit) -> bool {
        let before = self.project.clone();
        let renaming = matches!(edit, Edit::SetName(_));
        let pvis = &mut self.project.pvis;
        match edit {
            Edit::SetPvi { index, pvi } => match pvis.get_mut(index) {
                Some(slot) => *slot = pvi,
                None => return false,
            },
            Edit::Insert { index, pvi } => {
                if index > pvis.len() {
                    return false;
                }
                pvis.insert(index, pvi);
                self.view.selected = Some(index);
            }
            Edit::Delete { index } => {
                if pvis.len() <= 2 || index >= pvis.len() {
                    self.notice =
                        Some(Notice { error: true, text: "A profile keeps at least two PVIs".to_owned() });
                    return false;
                }
                pvis.remove(index);
                // The new first/last PVI carries no curve.
                let last = pvis.len() - 1;
                for end in [0, last] {
                    if let Some(p) = pvis.get_mut(end) {
                        p.curve = gradewright_geometry::VerticalCurve::None;
                    }
                }
                self.view.selected = Some(index.min(last));
            }
            Edit::SetCriteria(criteria) => self.project.criteria = *criteria,
            Edit::SetName(name) => self.project.name = name,
            Edit::SetGround(ground) => self.project.ground = ground,
            Edit::SetControls(controls) => self.project.controls = controls,
            Edit::SetSection(section) => self.project.section = section,
            Edit::Replace(project) => self.project = *project,
        }
        if self.project == before {
            return false;
        }
        // Typing a name letter by letter is one undo step.
        if !(renaming && self.renaming) {
            self.history.record(before);
        }
        // A message about the old project would mislead now.
        self.notice = None;
        self.renaming = renaming;
        self.changed();
        true
    }

    /// Starts dragging PVI `index` (the whole drag becomes one undo step).
    pub fn begin_drag(&mut self, index: usize) {
        self.view.selected = Some(index);
        self.renaming = false;
        if self.drag_origin.is_none() {
            self.drag_origin = Some(self.project.clone());
        }
    }

    /// Moves the dragged PVI towards a point, within its limits; live.
    pub fn drag_to(&mut self, index: usize, station: f64, elevation: f64) {
        self.drag_locked(index, station, elevation, DragLock::Free);
    }

    /// As [`Self::drag_to`], keeping the station (vertical only) or the
    /// elevation (horizontal only) the PVI had when the drag began.
    pub fn drag_locked(&mut self, index: usize, station: f64, elevation: f64, lock: DragLock) {
        let (mut station, mut elevation) = self.project.snap.apply(station, elevation);
        let origin = self.drag_origin.as_ref().and_then(|p| p.pvis.get(index)).copied();
        if let Some(origin) = origin {
            match lock {
                DragLock::Free => {}
                DragLock::Vertical => station = origin.station.0,
                DragLock::Horizontal => elevation = origin.elevation,
            }
        }
        let Some(pvi) = self.project.profile().move_pvi_clamped(index, station, elevation) else { return };
        if let Some(slot) = self.project.pvis.get_mut(index)
            && *slot != pvi
        {
            *slot = pvi;
            self.notice = None;
            self.changed();
        }
    }

    /// Ends a drag: records one undo step if anything moved.
    pub fn end_drag(&mut self) {
        if let Some(origin) = self.drag_origin.take()
            && origin != self.project
        {
            self.history.record(origin);
        }
    }

    /// Whether a drag is under way.
    pub fn is_dragging(&self) -> bool {
        self.drag_origin.is_some()
    }

    /// Opens `path`, keeping the current work if it fails (the error is shown).
    /// A LandXML file (`.xml`) opens as a new, unsaved project (Save asks
    /// where to keep it as a project file); its design profile and ground
    /// line are read, and when it holds several the error lists their names.
    pub fn open_path(&mut self, path: &Path) -> bool {
        if gradewright_exchange::is_landxml_path(path) {
            return self.open_landxml(path, &gradewright_exchange::Selection::default());
        }
        if path.extension().is_some_and(|e| e.eq_ignore_ascii_case("csv")) {
            // A PVI table carries no units: ask for them first.
            self.view.pvi_table_units = Some(path.to_owned());
            self.notice = Some(Notice {
                error: false,
                text: format!("{}: a PVI table; choose its units", path.display()),
            });
            return false;
        }
        match Project::load(path) {
            Ok(project) => {
                self.view.lengthen_increment = project.units.curve_length_increment();
                self.replace_project(project, Some(path.to_owned()), true);
                self.note_recent(path);
                self.notice = Some(Notice { error: false, text: format!("Opened {}", path.display()) });
                true
            }
            Err(e) => {
                self.notice = Some(Notice { error: true, text: format!("Could not open: {e}") });
                false
            }
        }
    }

    /// Opens the design profile `selection` picks from the LandXML file at
    /// `path` as a new, unsaved project.
    pub fn open_landxml(&mut self, path: &Path, selection: &gradewright_exchange::Selection) -> bool {
        let read = gradewright_exchange::open_file(path)
            .and_then(|f| gradewright_exchange::read_landxml(f, path, selection, None));
        match read {
            Ok(read) => {
                let project = read.project();
                self.view.lengthen_increment = project.units.curve_length_increment();
                self.replace_project(project, None, true);
                let skipped: Vec<&str> =
                    read.notes.iter().filter(|n| !n.contains("lengths in")).map(String::as_str).collect();
                let ground = read.surface.map(|s| format!(" and ground '{s}'")).unwrap_or_default();
                let more =
                    if skipped.is_empty() { String::new() } else { format!(" · {}", skipped.join(" · ")) };
                self.notice = Some(Notice {
                    error: false,
                    text: format!(
                        "Opened profile '{}'{ground} of alignment '{}' from LandXML {} in {}; Save keeps it as a project{more}",
                        read.profile,
                        read.alignment,
                        path.display(),
                        match (read.units, read.foot) {
                            (Units::Metric, _) => "metres",
                            (Units::UsCustomary, gradewright_geometry::Foot::UsSurvey) => "US survey feet",
                            (Units::UsCustomary, _) => "feet",
                        }
                    ),
                });
                true
            }
            Err(e) => {
                // Several profiles or ground lines: offer them to choose from.
                let choices = gradewright_exchange::open_file(path)
                    .and_then(|f| gradewright_exchange::landxml_choices(f, path))
                    .map(|c| landxml_selections(&c))
                    .unwrap_or_default();
                if choices.len() > 1 && selection.profile.is_none() {
                    self.notice = Some(Notice {
                        error: false,
                        text: format!(
                            "{} holds {} design profiles or ground lines: choose one",
                            path.display(),
                            choices.len()
                        ),
                    });
                    self.view.landxml_choice = Some((path.to_owned(), choices));
                } else {
                    self.notice = Some(Notice { error: true, text: format!("Could not open: {e}") });
                }
                false
            }
        }
    }

    /// Opens the PVI table (CSV) at `path`, read in `units`, as a new,
    /// unsaved project.
    pub fn open_pvi_table(&mut self, path: &Path, units: Units) -> bool {
        // The command line's reader, so a table opens the same project here.
        let read = crate::input::load_input(path, Some(units), &gradewright_exchange::Selection::default());
        match read {
            Ok(input) => {
                self.view.lengthen_increment = units.curve_length_increment();
                self.replace_project(input.project, None, true);
                self.notice = Some(Notice {
                    error: false,
                    text: format!(
                        "Opened the PVI table {} in {units}; Save keeps it as a project",
                        path.display()
                    ),
                });
                true
            }
            Err(e) => {
                self.notice = Some(Notice { error: true, text: format!("Could not open: {e}") });
                false
            }
        }
    }

    /// Writes the design profile and the ground as LandXML 1.2 to `path`
    /// (atomically); the outcome is shown in the status line.
    pub fn export_landxml(&mut self, path: &Path) -> bool {
        let mut buffer = Vec::new();
        let written = gradewright_exchange::write_landxml(
            &mut buffer,
            &self.project,
            &gradewright_exchange::Stamp::now(),
        )
        .map_err(|e| e.to_string())
        .and_then(|()| gradewright_document::write_atomic(path, &buffer, true).map_err(|e| e.to_string()));
        match written {
            Ok(()) => {
                self.notice =
                    Some(Notice { error: false, text: format!("Exported LandXML {}", path.display()) });
                true
            }
            Err(e) => {
                self.notice = Some(Notice { error: true, text: format!("LandXML export failed: {e}") });
                false
            }
        }
    }

    /// Saves to `path` (atomically, keeping a backup). Returns whether it worked.
    pub fn save_to(&mut self, path: &Path) -> bool {
        let mut project = self.project.clone();
        project.format_version = gradewright_document::FORMAT_VERSION;
        match project.save(path) {
            Ok(()) => {
                self.saved = Some(self.project.clone());
                self.path = Some(path.to_owned());
                self.files.clear_recovery();
                self.note_recent(path);
                self.notice = Some(Notice { error: false, text: format!("Saved {}", path.display()) });
                true
            }
            Err(e) => {
                self.notice = Some(Notice { error: true, text: format!("Could not save: {e}") });
                false
            }
        }
    }

    fn note_recent(&mut self, path: &Path) {
        if let Ok(list) = self.files.add_recent(path) {
            self.recent = list;
        }
    }

    /// Writes the recovery file when there are unsaved changes and the
    /// interval has passed; `now` is seconds since start.
    pub fn autosave(&mut self, now: f64) {
        let due = self.last_autosave.is_none_or(|t| now - t >= AUTOSAVE_SECONDS);
        if !due {
            return;
        }
        self.last_autosave = Some(now);
        if self.is_dirty()
            && !self.is_dragging()
            && let Err(e) = self.files.write_recovery(&self.project)
        {
            self.notice = Some(Notice { error: true, text: format!("Autosave failed: {e}") });
        }
    }

    /// Takes the recovered project offered at start.
    pub fn accept_recovery(&mut self, project: Project) {
        self.replace_project(project, None, false);
        self.notice =
            Some(Notice { error: false, text: "Recovered unsaved work; save it to keep it".to_owned() });
    }

    /// Discards the recovery file.
    pub fn discard_recovery(&mut self) {
        self.files.clear_recovery();
    }

    /// Marks that the user agreed to close with unsaved changes.
    pub fn confirm_close(&mut self) {
        self.close_confirmed = true;
        self.close_requested = true;
    }

    /// Whether closing may go ahead now (no unsaved changes, or confirmed).
    pub fn may_close(&self) -> bool {
        self.close_confirmed || !self.is_dirty()
    }

    /// Asks about unsaved changes before `action`, or runs it.
    fn guarded(&mut self, action: Action) {
        if self.is_dirty() {
            self.pending = Some(Pending::UnsavedChanges(Box::new(action)));
        } else {
            self.run_now(action);
        }
    }

    /// Runs an action that was waiting for the unsaved-changes answer.
    pub fn resolve_unsaved(&mut self, save_first: bool, action: Action) {
        if save_first {
            let saved = match self.path.clone() {
                Some(path) => self.save_to(&path),
                None => match pick_save_path(&self.project) {
                    Some(path) => self.save_to(&path),
                    None => false,
                },
            };
            if !saved {
                return;
            }
        }
        self.run_now(action);
    }

    fn run_now(&mut self, action: Action) {
        match action {
            Action::New(units) => {
                let mut project = Project::new("Untitled", units);
                project.criteria.design_speed = Some(match units {
                    Units::Metric => 80.0,
                    Units::UsCustomary => 50.0,
                });
                let (length, rise) = match units {
                    Units::Metric => (1000.0, 10.0),
                    Units::UsCustomary => (3000.0, 30.0),
                };
                project.pvis = vec![Pvi::new(0.0, 100.0), Pvi::new(length, 100.0 + rise)];
                self.replace_project(project, None, true);
                self.view.lengthen_increment = units.curve_length_increment();
            }
            Action::Open(Some(path)) => {
                self.open_path(&path);
            }
            Action::OpenLandXml(path, selection) => {
                self.open_landxml(&path, &selection);
            }
            Action::OpenPviTable(path, units) => {
                self.open_pvi_table(&path, units);
            }
            Action::Open(None) => {
                if let Some(path) = rfd::FileDialog::new()
                    .add_filter("Gradewright project or LandXML", &["ron", "xml"])
                    .add_filter("Gradewright project", &["ron"])
                    .add_filter("LandXML 1.2", &["xml"])
                    .pick_file()
                {
                    self.open_path(&path);
                } else {
                    self.no_dialog();
                    self.view.show_path_dialog = true;
                }
            }
            Action::Quit => self.confirm_close(),
            other => self.apply(other),
        }
    }

    fn no_dialog(&mut self) {
        self.notice = Some(Notice {
            error: false,
            text: "No file chosen (if no dialog appeared, use File, Open or save by path…)".to_owned(),
        });
    }

    /// Applies one action now.
    pub fn apply(&mut self, action: Action) {
        match action {
            Action::Edit(edit) => {
                self.apply_edit(*edit);
            }
            Action::New(_)
            | Action::Open(_)
            | Action::OpenLandXml(..)
            | Action::OpenPviTable(..)
            | Action::Quit => {
                self.guarded(action);
            }
            Action::ImportGround(_)
            | Action::ImportControls(_)
            | Action::Dropped(_)
            | Action::ExportLandXml(_) => {
                self.site_action(action);
            }
            Action::Save => match self.path.clone() {
                Some(path) => {
                    self.save_to(&path);
                }
                None => self.apply(Action::SaveAs(None)),
            },
            Action::SaveAs(Some(path)) => {
                self.save_to(&path);
            }
            Action::SaveAs(None) => match pick_save_path(&self.project) {
                Some(path) => {
                    self.save_to(&path);
                }
                None => {
                    self.no_dialog();
                    self.view.show_path_dialog = true;
                }
            },
            Action::Undo => {
                self.renaming = false;
                if let Some(p) = self.history.undo(self.project.clone()) {
                    self.project = p;
                    self.changed();
                }
            }
            Action::Redo => {
                self.renaming = false;
                if let Some(p) = self.history.redo(self.project.clone()) {
                    self.project = p;
                    self.changed();
                }
            }
            Action::FitView => self.view.request_fit(),
            Action::Focus(index) => {
                self.view.selected = Some(index);
                self.view.request_focus(&self.project, &self.analysis, index);
            }
            Action::Select(index) => {
                self.view.selected = (index < self.project.pvis.len()).then_some(index);
            }
            Action::ZoomToSelection => {
                if let Some(index) = self.view.selected {
                    self.view.request_focus(&self.project, &self.analysis, index);
                }
            }
            Action::MakeSymmetric(index) => {
                if let Some(pvi) = self.project.pvis.get(index).copied()
                    && matches!(pvi.curve, VerticalCurve::Unequal { .. })
                {
                    let curve = VerticalCurve::Symmetric { length: pvi.curve.length() };
                    self.apply_edit(Edit::SetPvi { index, pvi: Pvi { curve, ..pvi } });
                }
            }
            Action::DeleteSelected => {
                if let Some(index) = self.view.selected {
                    self.apply_edit(Edit::Delete { index });
                }
            }
            Action::InsertAfterSelected => self.insert_after_selected(),
            Action::SelectPrevious => {
                self.view.selected = Some(self.view.selected.map_or(0, |i| i.saturating_sub(1)));
            }
            Action::SelectNext => {
                let last = self.project.pvis.len().saturating_sub(1);
                self.view.selected = Some(self.view.selected.map_or(0, |i| (i + 1).min(last)));
            }
            Action::ToggleAbout => self.view.show_about = !self.view.show_about,
            Action::LengthenSelected => match self.view.selected {
                Some(i) => self.lengthen(&[i]),
                None => {
                    self.notice = Some(Notice { error: true, text: "Select a curve's PVI first".to_owned() });
                }
            },
            Action::LengthenAll => {
                let targets = self.analysis.report.failing_curves();
                if targets.is_empty() {
                    self.notice =
                        Some(Notice { error: false, text: "No curve fails; nothing to lengthen".to_owned() });
                } else {
                    self.lengthen(&targets);
                }
            }
        }
    }

    /// "Lengthen to clear" on the curves at `targets`, as one undo step; the
    /// outcome of each curve is shown.
    pub fn lengthen(&mut self, targets: &[usize]) {
        let Ok(criteria) = self.analysis.criteria.clone() else {
            self.notice = Some(Notice { error: true, text: "Set a design speed first".to_owned() });
            return;
        };
        let increment = self.view.lengthen_increment;
        let (fitted, outcomes) = gradewright_geometry::lengthen_to_clear(
            &self.project.profile(),
            &criteria,
            &self.project.controls,
            targets,
            increment,
        );
        let mut project = self.project.clone();
        project.pvis = fitted.pvis;
        let text = outcomes.iter().map(|o| o.message.as_str()).collect::<Vec<_>>().join(" · ");
        let all_cleared = outcomes.iter().all(|o| o.cleared);
        self.apply_edit(Edit::Replace(Box::new(project)));
        self.notice = Some(Notice { error: !all_cleared, text });
    }

    /// Inserts a PVI at `station` on the profile (refused on a curve).
    pub fn insert_at(&mut self, station: f64) {
        let Some(alignment) = self.analysis.alignment.clone() else {
            self.notice = Some(Notice {
                error: true,
                text: "Fix the profile's problems before inserting PVIs".to_owned(),
            });
            return;
        };
        let (station, _) = self.project.snap.apply(station, 0.0);
        match alignment.insertion(station) {
            Ok((index, mut pvi)) => {
                // A new PVI starts with a curve that passes for the grades it
                // makes, so it is not flagged the moment it appears.
                let mut probe = self.project.profile();
                probe.pvis.insert(index, pvi);
                let units = self.project.units;
                let len = units.length_symbol();
                let increment = self.view.lengthen_increment;
                let chosen =
                    self.analysis.criteria.as_ref().ok().and_then(|c| {
                        gradewright_geometry::default_curve_length(&probe, c, index, increment)
                    });
                let at = gradewright_geometry::format_station(pvi.station.0, units, units.station_decimals());
                let text = match chosen {
                    Some((length, rule)) => {
                        pvi.curve = VerticalCurve::Symmetric { length };
                        format!(
                            "Inserted PVI {} at {at} with a {length:.2} {len} curve ({rule}, rounded up to {increment} {len})",
                            index + 1
                        )
                    }
                    None => format!("Inserted PVI {} at {at} without a curve (none fits here)", index + 1),
                };
                self.apply_edit(Edit::Insert { index, pvi });
                self.notice = Some(Notice { error: false, text });
            }
            Err(e) => self.notice = Some(Notice { error: true, text: format!("Cannot insert: {e}") }),
        }
    }

    fn insert_after_selected(&mut self) {
        let index = self.view.selected.unwrap_or(0);
        // The middle of the tangent between the two curves' ends.
        if let Some((start, end)) = self.analysis.profile.tangent(index) {
            self.insert_at(0.5 * (start + end));
        }
    }

    /// Applies every action queued during the frame, and asks for another
    /// frame to show the result.
    pub fn apply_queued(&mut self, ctx: &egui::Context) {
        let actions = std::mem::take(&mut self.actions);
        if !actions.is_empty() {
            ctx.request_repaint();
        }
        for action in actions {
            self.apply(action);
        }
    }

    /// Reads the keyboard shortcuts of `ctx` into actions.
    pub fn read_shortcuts(&mut self, ctx: &egui::Context) {
        let typing = ctx.egui_wants_keyboard_input();
        // Shortcuts match logically (Ctrl+Z also matches Ctrl+Shift+Z), so the
        // ones with more modifiers go first.
        let mut commands = UiCommand::ALL;
        commands.sort_by_key(|c| {
            std::cmp::Reverse(c.shortcut().map_or(0, |s| {
                u8::from(s.modifiers.shift) + u8::from(s.modifiers.command) + u8::from(s.modifiers.alt)
            }))
        });
        for command in commands {
            let Some(shortcut) = command.shortcut() else { continue };
            if typing && command.is_plain_key() {
                continue;
            }
            if ctx.input_mut(|i| i.consume_shortcut(&shortcut)) {
                self.push(command.action());
            }
        }
        if ctx.input_mut(|i| i.consume_shortcut(&REDO_ALT)) {
            self.push(Action::Redo);
        }
    }
}

fn pick_save_path(project: &Project) -> Option<PathBuf> {
    let name = if project.name.is_empty() { "profile".to_owned() } else { slug(&project.name) };
    rfd::FileDialog::new()
        .add_filter("Gradewright project", &["ron"])
        .set_file_name(format!("{name}.ron"))
        .save_file()
}

fn slug(name: &str) -> String {
    let s: String =
        name.chars().map(|c| if c.is_ascii_alphanumeric() { c.to_ascii_lowercase() } else { '-' }).collect();
    let s = s.split('-').filter(|p| !p.is_empty()).collect::<Vec<_>>().join("-");
    if s.is_empty() { "profile".to_owned() } else { s }
}

/// Every (alignment, design profile, ground line) a file offers, as the
/// selections that open them.
fn landxml_selections(choices: &[gradewright_exchange::Choice]) -> Vec<gradewright_exchange::Selection> {
    let mut out = Vec::new();
    for c in choices {
        let surfaces: Vec<Option<String>> =
            if c.surfaces.is_empty() { vec![None] } else { c.surfaces.iter().cloned().map(Some).collect() };
        for surface in surfaces {
            out.push(gradewright_exchange::Selection {
                alignment: Some(c.alignment.clone()),
                profile: Some(c.profile.clone()),
                surface,
            });
        }
    }
    out
}
