//! The editor: its document, its files, its panels and windows, and the
//! queue of actions collected during a frame and applied after it, in one
//! place ([`GradewrightApp::apply`]). What leaves the frame — dialogs, file
//! reads and writes, exports — runs from that queue too ([`super::effects`]).

use std::path::{Path, PathBuf};

use gradewright_document::Project;
use gradewright_geometry::{Pvi, Units, VerticalCurve};

use super::command::{Action, Edit, REDO_ALT, UiCommand};
use super::document::{Applied, Document, DragLock};
use super::files::{AppFiles, Session};
use super::panels::Panels;
use super::windows::Windows;

/// The demo project shown on first start (a fictional road).
pub const DEMO_PROJECT: &str = include_str!("../../../../assets/alder-brook-road.ron");

/// A message shown in the window.
#[derive(Clone, Debug, PartialEq)]
pub struct Notice {
    /// Whether it reports an error.
    pub error: bool,
    /// The text.
    pub text: String,
}

/// What waits for the user's answer.
#[derive(Clone, Debug, PartialEq)]
pub enum Pending {
    /// Unsaved changes: save, discard or cancel before `then`.
    UnsavedChanges(Box<Action>),
    /// A recovery file was found at start.
    Recovery(Box<Project>),
}

/// The Gradewright editor.
pub struct GradewrightApp {
    /// The project, its history and its analysis.
    pub doc: Document,
    /// Where the project lives, recent files, autosave.
    pub session: Session,
    /// The panels, each with its own state.
    pub panels: Panels,
    /// The windows and dialogs, with their state.
    pub windows: Windows,
    /// The selected PVI.
    pub selected: Option<usize>,
    /// A dialog waiting for an answer.
    pub pending: Option<Pending>,
    /// The latest message.
    pub notice: Option<Notice>,
    queue: Vec<Action>,
    close_confirmed: bool,
    /// Set when the window should close (read by the eframe shell).
    pub close_requested: bool,
}

impl GradewrightApp {
    /// The editor on `project`, keeping its own files in `files`.
    pub fn new(project: Project, path: Option<PathBuf>, files: AppFiles) -> Self {
        let mut app = Self {
            // The project as given is the clean state: nothing to lose yet.
            doc: Document::new(project, true),
            session: Session::new(files, path),
            panels: Panels::default(),
            windows: Windows::default(),
            selected: None,
            pending: None,
            notice: None,
            queue: Vec::new(),
            close_confirmed: false,
            close_requested: false,
        };
        app.panels.plot.request_fit();
        if let Some(recovered) = app.session.files.read_recovery() {
            app.pending = Some(Pending::Recovery(Box::new(recovered)));
        }
        app
    }

    /// The editor on the built-in demo project (first start).
    pub fn with_demo(files: AppFiles) -> Self {
        let project = Project::from_ron(DEMO_PROJECT, Path::new("alder-brook-road.ron"))
            .unwrap_or_else(|_| Project::new("Untitled", Units::Metric));
        let mut app = Self::new(project, None, files);
        app.selected = Some(3);
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
                let mut app = Self::new(project, Some(path.to_owned()), files);
                app.session.note_recent(path);
                app
            }
            Err(e) => {
                let mut app = Self::with_demo(files);
                app.fail("Could not open", &e);
                app
            }
        }
    }

    /// The project as it stands.
    pub fn project(&self) -> &Project {
        self.doc.project()
    }

    /// The analysis of the current project (alignment, curves, criteria,
    /// findings, sight distance), refreshed on every change.
    pub fn analysis(&self) -> &gradewright_geometry::Analysis {
        self.doc.analysis()
    }

    /// The file the project was last opened from or saved to.
    pub fn path(&self) -> Option<&Path> {
        self.session.path()
    }

    /// Recent files, newest first.
    pub fn recent(&self) -> &[PathBuf] {
        self.session.recent()
    }

    /// Whether there are changes not saved to a file.
    pub fn is_dirty(&self) -> bool {
        self.doc.is_dirty()
    }

    /// The window title: file name, unsaved mark, program name.
    pub fn title(&self) -> String {
        let name = self.path().and_then(|p| p.file_name()).map_or_else(
            || format!("{} (not saved)", self.project().name),
            |n| n.to_string_lossy().into_owned(),
        );
        let mark = if self.is_dirty() { " ●" } else { "" };
        format!("{name}{mark} — Gradewright")
    }

    /// Queues an action for the end of this frame.
    pub fn push(&mut self, action: Action) {
        self.queue.push(action);
    }

    /// The document (read only), the panels and the queue, apart: what a
    /// panel is drawn with.
    pub(super) fn parts(&mut self) -> (&super::document::Document, &mut Panels, &mut Vec<Action>) {
        (&self.doc, &mut self.panels, &mut self.queue)
    }

    /// Shows a message.
    pub(super) fn say(&mut self, error: bool, text: String) {
        self.notice = Some(Notice { error, text });
    }

    /// Shows `what` failed, with the error and every cause under it.
    pub(super) fn fail(&mut self, what: &str, e: &(dyn std::error::Error + 'static)) {
        self.say(true, format!("{what}: {}", crate::load::one_line(e)));
    }

    /// Keeps the selection on a PVI that exists.
    fn keep_selection(&mut self) {
        let n = self.project().pvis.len();
        if let Some(sel) = self.selected
            && sel >= n
        {
            self.selected = n.checked_sub(1);
        }
    }

    /// Shows another project; `clean` says whether it counts as saved
    /// (opened or new) or holds work that still needs saving (recovered).
    pub(super) fn replace_project(&mut self, project: Project, path: Option<PathBuf>, clean: bool) {
        self.doc.replace(project, clean);
        self.session.set_path(path);
        self.selected = None;
        self.panels.reset();
        self.panels.plot.request_fit();
    }

    /// Applies an edit as one undo step. Returns whether anything changed.
    pub fn apply_edit(&mut self, edit: Edit) -> bool {
        let changed = match self.doc.apply(edit) {
            Applied::Unchanged => false,
            Applied::Refused(why) => {
                self.say(true, why.to_owned());
                false
            }
            Applied::Changed => true,
            Applied::Select(index) => {
                self.selected = Some(index);
                true
            }
        };
        if changed {
            // A message about the old project would mislead now.
            self.notice = None;
            self.keep_selection();
        }
        changed
    }

    /// Starts dragging PVI `index` (the whole drag becomes one undo step).
    pub fn begin_drag(&mut self, index: usize) {
        self.selected = Some(index);
        self.doc.begin_drag(index);
    }

    /// Moves the dragged PVI towards a point, within its limits; live.
    pub fn drag_to(&mut self, index: usize, station: f64, elevation: f64) {
        if self.doc.drag_to(index, station, elevation, DragLock::Free) {
            self.notice = None;
        }
    }

    /// Ends a drag: records one undo step if anything moved.
    pub fn end_drag(&mut self) {
        self.doc.end_drag();
    }

    /// Writes the recovery file when there are unsaved changes and the
    /// interval has passed; `now` is seconds since start.
    pub fn autosave(&mut self, now: f64) {
        if !self.session.autosave_due(now) || !self.is_dirty() || self.doc.dragging().is_some() {
            return;
        }
        if let Err(e) = self.session.files.write_recovery(self.project()) {
            self.say(true, format!("Autosave failed: {e}"));
        }
    }

    /// Takes the recovered project offered at start.
    pub fn accept_recovery(&mut self, project: Project) {
        self.replace_project(project, None, false);
        self.say(false, "Recovered unsaved work; save it to keep it".to_owned());
    }

    /// Discards the recovery file.
    pub fn discard_recovery(&mut self) {
        self.session.files.clear_recovery();
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
            self.replacing(action);
        }
    }

    /// Runs an action that was waiting for the unsaved-changes answer.
    pub fn resolve_unsaved(&mut self, save_first: bool, action: Action) {
        if save_first && !self.save() {
            return;
        }
        self.replacing(action);
    }

    /// Runs an action that replaces the project (or closes the window).
    fn replacing(&mut self, action: Action) {
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
            }
            Action::Quit => self.confirm_close(),
            other => self.run_effect(other),
        }
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
            | Action::Quit => self.guarded(action),
            Action::Undo => {
                if self.doc.undo() {
                    self.keep_selection();
                }
            }
            Action::Redo => {
                if self.doc.redo() {
                    self.keep_selection();
                }
            }
            Action::FitView => self.panels.plot.request_fit(),
            Action::Focus(index) => {
                self.selected = Some(index);
                self.focus(index);
            }
            Action::Select(index) => {
                self.selected = index.filter(|&i| i < self.project().pvis.len());
            }
            Action::ZoomToSelection => {
                if let Some(index) = self.selected {
                    self.focus(index);
                }
            }
            Action::MakeSymmetric(index) => {
                if let Some(pvi) = self.project().pvis.get(index).copied()
                    && matches!(pvi.curve, VerticalCurve::Unequal { .. })
                {
                    let curve = VerticalCurve::Symmetric { length: pvi.curve.length() };
                    self.apply_edit(Edit::SetPvi { index, pvi: Pvi { curve, ..pvi } });
                }
            }
            Action::DeleteSelected => {
                if let Some(index) = self.selected {
                    self.apply_edit(Edit::Delete { index });
                }
            }
            Action::InsertAfterSelected => {
                // The middle of the tangent between the two curves' ends.
                if let Some((start, end)) = self.analysis().profile.tangent(self.selected.unwrap_or(0)) {
                    self.insert_at(0.5 * (start + end));
                }
            }
            Action::InsertAt(station) => self.insert_at(station),
            Action::AddControl { station, elevation } => self.add_control(station, elevation),
            Action::SelectPrevious => self.selected = Some(self.selected.map_or(0, |i| i.saturating_sub(1))),
            Action::SelectNext => {
                let last = self.project().pvis.len().saturating_sub(1);
                self.selected = Some(self.selected.map_or(0, |i| (i + 1).min(last)));
            }
            Action::ToggleAbout => self.windows.about = !self.windows.about,
            Action::ShowExport => self.panels.export.open = true,
            Action::ShowTablesExport => self.panels.export.tables_open = true,
            Action::ShowPathDialog => self.windows.path.open = true,
            Action::LengthenSelected => match self.selected {
                Some(i) => self.lengthen(&[i]),
                None => self.say(true, "Select a curve's PVI first".to_owned()),
            },
            Action::LengthenAll => {
                let targets = self.analysis().report.failing_curves();
                if targets.is_empty() {
                    self.say(false, "No curve fails; nothing to lengthen".to_owned());
                } else {
                    self.lengthen(&targets);
                }
            }
            effect => self.run_effect(effect),
        }
    }

    /// Selects nothing new, but brings PVI `index` and its curve into view
    /// in the plot and its row in the table.
    fn focus(&mut self, index: usize) {
        self.panels.table.scroll_to(index);
        self.panels.plot.request_focus(self.doc.project(), self.doc.analysis(), index);
    }

    /// "Lengthen to clear" on the curves at `targets`, as one undo step; the
    /// outcome of each curve is shown.
    pub fn lengthen(&mut self, targets: &[usize]) {
        let Ok(criteria) = self.analysis().criteria.clone() else {
            self.say(true, "Set a design speed first".to_owned());
            return;
        };
        let (fitted, outcomes) = gradewright_geometry::lengthen_to_clear(
            &self.analysis().profile,
            &criteria,
            &self.project().controls,
            targets,
            self.doc.increment(),
        );
        let mut project = self.project().clone();
        project.pvis = fitted.pvis;
        let text = outcomes.iter().map(|o| o.message.as_str()).collect::<Vec<_>>().join(" · ");
        let all_cleared = outcomes.iter().all(|o| o.cleared);
        self.apply_edit(Edit::Replace(Box::new(project)));
        self.say(!all_cleared, text);
    }

    /// Inserts a PVI at `station` on the profile (refused on a curve), with
    /// a curve that passes for the grades it makes.
    pub fn insert_at(&mut self, station: f64) {
        let Some(alignment) = self.analysis().alignment.clone() else {
            self.say(true, "Fix the profile's problems before inserting PVIs".to_owned());
            return;
        };
        let (station, _) = self.project().snap.apply(station, 0.0);
        match alignment.insertion(station) {
            Ok((index, mut pvi)) => {
                // A new PVI starts with a curve that passes for the grades it
                // makes, so it is not flagged the moment it appears.
                let mut probe = self.analysis().profile.clone();
                probe.pvis.insert(index, pvi);
                let units = self.project().units;
                let len = units.length_symbol();
                let increment = self.doc.increment();
                let chosen =
                    self.analysis().criteria.as_ref().ok().and_then(|c| {
                        gradewright_geometry::default_curve_length(&probe, c, index, increment)
                    });
                let at = self.project().stationing().label_std(pvi.station.0);
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
                self.say(false, text);
            }
            Err(e) => self.say(true, format!("Cannot insert: {e}")),
        }
    }

    /// Adds a minimum control point at `station` (elevation: `elevation`, or
    /// the profile's there), named after its position in the list.
    fn add_control(&mut self, station: f64, elevation: Option<f64>) {
        let on_profile = self
            .analysis()
            .alignment
            .as_ref()
            .and_then(|a| a.sample(gradewright_geometry::Station(station)).ok())
            .map(|s| s.elevation);
        let Some(elevation) = elevation.or(on_profile) else { return };
        let mut next = self.project().controls.clone();
        next.push(gradewright_geometry::ControlPoint {
            name: format!("Control {}", next.len() + 1),
            station,
            kind: gradewright_geometry::ControlKind::Minimum,
            // Rounded down to the millimetre (or 0.001 ft): a minimum on the
            // profile stays met.
            elevation: (elevation * 1000.0).floor() / 1000.0,
            tolerance: 0.0,
            clearance: 0.0,
        });
        self.apply_edit(Edit::SetControls(next));
    }

    /// Applies every action queued during the frame, and asks for another
    /// frame to show the result.
    pub fn apply_queued(&mut self, ctx: &egui::Context) {
        let actions = std::mem::take(&mut self.queue);
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

    /// Queues the files dropped on the window this frame.
    pub fn read_dropped_files(&mut self, ctx: &egui::Context) {
        let dropped: Vec<PathBuf> =
            ctx.input(|i| i.raw.dropped_files.iter().map(|f| f.path().to_path_buf()).collect());
        for path in dropped {
            self.push(Action::Dropped(path));
        }
    }

    /// Builds the whole editor into `ui` for one frame, then applies what the
    /// user did.
    pub fn show(&mut self, ui: &mut egui::Ui) {
        let ctx = ui.ctx().clone();
        self.read_shortcuts(&ctx);
        self.read_dropped_files(&ctx);
        super::windows::menu_bar(self, ui);
        super::windows::status_bar(self, ui);
        let Self { doc, panels, selected, queue, notice, .. } = self;
        if panels.show(ui, doc, selected, queue) {
            // A message about the profile before the drag would mislead now.
            *notice = None;
        }
        super::windows::windows_ui(self, &ctx);
        self.apply_queued(&ctx);
        self.autosave(ctx.input(|i| i.time));
    }
}
