//! The interactive profile editor (eframe + egui + egui_plot).
//!
//! [`GradewrightApp::show`] builds the whole UI into any `egui::Ui`, so tests
//! and benchmarks drive it without a window; [`run`] puts it in one.

mod about_ui;
mod app;
mod cell;
mod command;
mod criteria_ui;
mod export_ui;
mod files;
mod findings_ui;
mod history;
mod plot_ui;
mod sight_ui;
mod site;
mod site_ui;
mod table_ui;
mod theme;
mod view;

use std::path::{Path, PathBuf};

pub use about_ui::CAUTION_SHORT;
pub use app::{DEMO_PROJECT, DragLock, GradewrightApp, Notice, Pending};
pub use command::{Action, Edit, UiCommand};
pub use files::{AppFiles, default_config_dir};
pub use view::{CellId, PviColumn, SidePage, ViewState};

use egui::RichText;

impl GradewrightApp {
    /// Builds the whole editor into `ui` for one frame, then applies what the
    /// user did.
    pub fn show(&mut self, ui: &mut egui::Ui) {
        let ctx = ui.ctx().clone();
        self.read_shortcuts(&ctx);
        self.read_dropped_files(&ctx);
        egui::Panel::top("menu").show(ui, |ui| self.menu_ui(ui));
        egui::Panel::bottom("status").show(ui, |ui| self.status_ui(ui));
        egui::Panel::bottom("pvi-table").resizable(true).default_size(250.0).min_size(120.0).show(ui, |ui| {
            table_ui::table_ui(self, ui);
        });
        egui::Panel::right("side").resizable(true).default_size(430.0).min_size(300.0).show(ui, |ui| {
            ui.heading("Findings");
            findings_ui::findings_ui(self, ui);
            ui.separator();
            ui.horizontal(|ui| {
                ui.selectable_value(&mut self.view.side_page, view::SidePage::Criteria, "Design criteria");
                ui.selectable_value(&mut self.view.side_page, view::SidePage::Site, "Ground & controls");
            });
            egui::ScrollArea::vertical().id_salt("side-scroll").show(ui, |ui| match self.view.side_page {
                view::SidePage::Criteria => {
                    egui::CollapsingHeader::new(RichText::new("Design criteria").heading())
                        .default_open(true)
                        .show(ui, |ui| criteria_ui::criteria_ui(self, ui));
                }
                view::SidePage::Site => {
                    egui::CollapsingHeader::new(RichText::new("Control points").heading())
                        .default_open(true)
                        .show(ui, |ui| site_ui::controls_ui(self, ui));
                    egui::CollapsingHeader::new(RichText::new("Ground and earthwork").heading())
                        .default_open(true)
                        .show(ui, |ui| site_ui::earthwork_ui(self, ui));
                }
            });
        });
        egui::CentralPanel::default().show(ui, |ui| {
            plot_ui::plot_toolbar_ui(self, ui);
            let mass = self.view.show_mass_strip && self.project().ground.range().is_some();
            let share = if mass { 0.2 } else { 0.3 };
            let strip = |on: bool, ui: &egui::Ui| {
                if on { (ui.available_height() * share).clamp(80.0, 240.0) } else { 0.0 }
            };
            let (sight_h, mass_h) = (strip(self.view.show_sight_strip, ui), strip(mass, ui));
            plot_ui::plot_ui(self, ui, ui.available_height() - sight_h - mass_h);
            if self.view.show_sight_strip {
                ui.allocate_ui(egui::vec2(ui.available_width(), sight_h), |ui| sight_ui::sight_ui(self, ui));
            }
            if mass {
                site_ui::mass_strip_ui(self, ui);
            }
        });
        about_ui::about_ui(self, &ctx);
        self.path_dialog_ui(&ctx);
        self.landxml_choice_ui(&ctx);
        self.pvi_table_units_ui(&ctx);
        export_ui::export_ui(self, &ctx);
        export_ui::tables_ui(self, &ctx);
        self.dialogs_ui(&ctx);
        self.apply_queued(&ctx);
        self.autosave(ctx.input(|i| i.time));
    }

    fn command_button(&mut self, ui: &mut egui::Ui, command: UiCommand, enabled: bool) {
        let mut button = egui::Button::new(command.label());
        if let Some(s) = command.shortcut() {
            button = button.shortcut_text(ui.ctx().format_shortcut(&s));
        }
        if ui.add_enabled(enabled, button).clicked() {
            self.push(command.action());
            ui.close();
        }
    }

    fn menu_ui(&mut self, ui: &mut egui::Ui) {
        egui::MenuBar::new().ui(ui, |ui| {
            ui.menu_button("File", |ui| {
                for c in [
                    UiCommand::NewMetric,
                    UiCommand::NewUs,
                    UiCommand::Open,
                    UiCommand::Save,
                    UiCommand::SaveAs,
                ] {
                    self.command_button(ui, c, true);
                }
                ui.menu_button("Recent files", |ui| {
                    if self.recent().is_empty() {
                        ui.label("None yet");
                    }
                    for path in self.recent().to_vec() {
                        if ui.button(path.display().to_string()).clicked() {
                            self.push(Action::Open(Some(path)));
                            ui.close();
                        }
                    }
                });
                ui.separator();
                if ui.button("Import ground…").on_hover_text("A CSV of station, elevation, or a LandXML ground line: replaces the existing ground").clicked() {
                    self.push(Action::ImportGround(None));
                    ui.close();
                }
                if ui
                    .button("Import control points…")
                    .on_hover_text("A CSV with the header station,kind,elevation,tolerance,name (kind fixed, min or max)")
                    .clicked()
                {
                    self.push(Action::ImportControls(None));
                    ui.close();
                }
                ui.separator();
                if ui.button("Export sheet and tables…").clicked() {
                    self.view.show_export = true;
                    ui.close();
                }
                if ui.button("Export tables…").clicked() {
                    self.view.show_tables_export = true;
                    ui.close();
                }
                if ui
                    .button("Export LandXML…")
                    .on_hover_text("The design profile and the ground as LandXML 1.2, for other tools")
                    .clicked()
                {
                    self.push(Action::ExportLandXml(None));
                    ui.close();
                }
                if ui.button("Open or save by path…").clicked() {
                    self.view.show_path_dialog = true;
                    ui.close();
                }
                ui.separator();
                self.command_button(ui, UiCommand::Quit, true);
            });
            ui.menu_button("Edit", |ui| {
                let (undo, redo) = self.can_undo_redo();
                self.command_button(ui, UiCommand::Undo, undo);
                self.command_button(ui, UiCommand::Redo, redo);
                ui.separator();
                let selected = self.view.selected.is_some();
                self.command_button(ui, UiCommand::Insert, true);
                self.command_button(ui, UiCommand::Delete, selected && self.project().pvis.len() > 2);
                self.command_button(ui, UiCommand::Previous, true);
                self.command_button(ui, UiCommand::Next, true);
                ui.separator();
                self.command_button(ui, UiCommand::LengthenSelected, selected);
                self.command_button(ui, UiCommand::LengthenAll, true);
            });
            ui.menu_button("View", |ui| {
                self.command_button(ui, UiCommand::Fit, true);
                let selected = self.view.selected.is_some();
                self.command_button(ui, UiCommand::ZoomToSelection, selected);
                ui.checkbox(&mut self.view.show_sight_strip, "Sight-distance strip");
                ui.separator();
                egui::widgets::global_theme_preference_buttons(ui);
            });
            ui.menu_button("Help", |ui| self.command_button(ui, UiCommand::About, true));
            ui.separator();
            let mut name = self.project().name.clone();
            let response =
                ui.add(egui::TextEdit::singleline(&mut name).desired_width(320.0).hint_text("Project name"));
            if response.changed() {
                self.push(Action::edit(Edit::SetName(name)));
            }
        });
    }

    /// The chooser for a LandXML file holding several design profiles or
    /// ground lines: one button per choice.
    fn landxml_choice_ui(&mut self, ctx: &egui::Context) {
        let Some((path, choices)) = self.view.landxml_choice.clone() else { return };
        let mut open = true;
        let mut chosen = None;
        egui::Window::new("Choose a profile").open(&mut open).collapsible(false).show(ctx, |ui| {
            ui.label(format!("{} holds several design profiles or ground lines:", path.display()));
            for selection in &choices {
                let label = format!(
                    "{} / {}{}",
                    selection.alignment.as_deref().unwrap_or(""),
                    selection.profile.as_deref().unwrap_or(""),
                    selection.surface.as_ref().map(|s| format!(" (ground: {s})")).unwrap_or_default()
                );
                if ui.button(label).clicked() {
                    chosen = Some(selection.clone());
                }
            }
        });
        if let Some(selection) = chosen {
            self.push(Action::OpenLandXml(path, selection));
            open = false;
        }
        if !open {
            self.view.landxml_choice = None;
        }
    }

    /// Asks the units of a PVI table being opened (a CSV carries none).
    fn pvi_table_units_ui(&mut self, ctx: &egui::Context) {
        let Some(path) = self.view.pvi_table_units.clone() else { return };
        let mut open = true;
        let mut chosen = None;
        egui::Window::new("Units of the PVI table").open(&mut open).collapsible(false).show(ctx, |ui| {
            ui.label(format!(
                "{} carries no units. Its stations, elevations and lengths are in:",
                path.display()
            ));
            ui.horizontal(|ui| {
                if ui.button("Metres (metric)").clicked() {
                    chosen = Some(gradewright_geometry::Units::Metric);
                }
                if ui.button("Feet (US customary)").clicked() {
                    chosen = Some(gradewright_geometry::Units::UsCustomary);
                }
            });
        });
        if let Some(units) = chosen {
            self.push(Action::OpenPviTable(path, units));
            open = false;
        }
        if !open {
            self.view.pvi_table_units = None;
        }
    }

    /// Open or save by typing a path: works where no file dialog is available.
    fn path_dialog_ui(&mut self, ctx: &egui::Context) {
        let mut open = self.view.show_path_dialog;
        // Start from the project's own file, or its folder and a name made
        // from the project name.
        if open && self.view.path_text.trim().is_empty() {
            self.view.path_text = suggested_path(self.path(), &self.project().name).display().to_string();
        }
        let mut close = false;
        egui::Window::new("Open or save by path").open(&mut open).collapsible(false).show(ctx, |ui| {
            ui.label("Project file (.ron):");
            ui.add(
                egui::TextEdit::singleline(&mut self.view.path_text)
                    .hint_text("/path/to/project.ron")
                    .desired_width(380.0),
            );
            ui.horizontal(|ui| {
                let path = PathBuf::from(self.view.path_text.trim());
                let ok = !self.view.path_text.trim().is_empty();
                if ui.add_enabled(ok, egui::Button::new("Open")).clicked() {
                    self.push(Action::Open(Some(path.clone())));
                    close = true;
                }
                if ui.add_enabled(ok, egui::Button::new("Save here")).clicked() {
                    self.push(Action::SaveAs(Some(path)));
                    close = true;
                }
            });
        });
        self.view.show_path_dialog = open && !close;
    }

    fn status_ui(&mut self, ui: &mut egui::Ui) {
        ui.horizontal(|ui| {
            ui.label(RichText::new(format!("⚠ {CAUTION_SHORT}")).color(ui.visuals().warn_fg_color))
                .on_hover_text("Help, About & cautions (F1)");
            ui.separator();
            if let Some(notice) = &self.notice {
                let text = RichText::new(&notice.text);
                ui.label(if notice.error { text.color(ui.visuals().error_fg_color) } else { text });
            }
        });
    }

    fn dialogs_ui(&mut self, ctx: &egui::Context) {
        let Some(pending) = self.pending.clone() else { return };
        let mut answer = None;
        egui::Modal::new(egui::Id::unique("pending-dialog")).show(ctx, |ui| match &pending {
            Pending::UnsavedChanges(_) => {
                ui.heading("Unsaved changes");
                ui.label(format!("“{}” has changes that are not saved.", self.project().name));
                ui.horizontal(|ui| {
                    if ui.button("Save first").clicked() {
                        answer = Some(1);
                    }
                    if ui.button("Discard changes").clicked() {
                        answer = Some(2);
                    }
                    if ui.button("Cancel").clicked() {
                        answer = Some(0);
                    }
                });
            }
            Pending::Recovery(p) => {
                ui.heading("Recover unsaved work?");
                ui.label(format!(
                    "Gradewright found unsaved work from an earlier session: “{}”, {} PVIs.",
                    p.name,
                    p.pvis.len()
                ));
                ui.horizontal(|ui| {
                    if ui.button("Recover it").clicked() {
                        answer = Some(1);
                    }
                    if ui.button("Discard it").clicked() {
                        answer = Some(2);
                    }
                });
            }
        });
        let Some(answer) = answer else { return };
        self.pending = None;
        match (pending, answer) {
            (Pending::UnsavedChanges(action), 1) => self.resolve_unsaved(true, *action),
            (Pending::UnsavedChanges(action), 2) => self.resolve_unsaved(false, *action),
            (Pending::Recovery(project), 1) => self.accept_recovery(*project),
            (Pending::Recovery(_), 2) => self.discard_recovery(),
            _ => {}
        }
    }
}

/// The eframe shell around [`GradewrightApp`]: window title, close guard.
struct Shell {
    app: GradewrightApp,
    title: String,
}

impl eframe::App for Shell {
    fn ui(&mut self, ui: &mut egui::Ui, _frame: &mut eframe::Frame) {
        let ctx = ui.ctx().clone();
        if ctx.input(|i| i.viewport().close_requested()) && !self.app.may_close() {
            ctx.send_viewport_cmd(egui::ViewportCommand::CancelClose);
            self.app.push(Action::Quit);
        }
        self.app.show(ui);
        if self.app.close_requested {
            self.app.close_requested = false;
            self.app.discard_recovery();
            ctx.send_viewport_cmd(egui::ViewportCommand::Close);
        }
        let title = self.app.title();
        if title != self.title {
            ctx.send_viewport_cmd(egui::ViewportCommand::Title(title.clone()));
            self.title = title;
        }
        // Autosave runs on a timer even when nothing moves.
        ctx.request_repaint_after(std::time::Duration::from_secs(5));
    }
}

/// Opens the editor window on `path`; without one, on the most recent file
/// that still exists, or (on first start) on the demo project.
///
/// # Errors
/// When no window can be opened (no display).
pub fn run(path: Option<&Path>) -> anyhow::Result<()> {
    let files = AppFiles::new(default_config_dir());
    let last = files.recent().into_iter().find(|p| p.is_file());
    let app = match path.map(Path::to_owned).or(last) {
        Some(p) => GradewrightApp::with_file(&p, files),
        None => GradewrightApp::with_demo(files),
    };
    let title = app.title();
    let options = eframe::NativeOptions {
        viewport: egui::ViewportBuilder::default().with_title(title.clone()).with_inner_size([1500.0, 950.0]),
        ..Default::default()
    };
    eframe::run_native("Gradewright", options, Box::new(move |_cc| Ok(Box::new(Shell { app, title }))))
        .map_err(|e| anyhow::anyhow!("could not open the window: {e}"))
}

/// Where to save a project by default: its own file, else a file named after
/// the project in the current folder.
fn suggested_path(current: Option<&Path>, name: &str) -> PathBuf {
    if let Some(path) = current {
        return path.to_owned();
    }
    let stem: String = name
        .chars()
        .map(|c| if c.is_alphanumeric() || c == '-' || c == '_' { c.to_ascii_lowercase() } else { '-' })
        .collect();
    let stem = stem.split('-').filter(|p| !p.is_empty()).collect::<Vec<_>>().join("-");
    let stem = if stem.is_empty() { "profile".to_owned() } else { stem };
    let folder = std::env::current_dir().unwrap_or_default();
    folder.join(format!("{stem}.ron"))
}
