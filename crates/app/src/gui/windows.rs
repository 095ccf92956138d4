//! The menu bar, the status line, and the windows that ask something: the
//! choosers for a LandXML file's profiles and ground lines, the units of a
//! PVI table, open or save by path, unsaved changes, recovery, and About.
//! Every menu entry issues a command ([`UiCommand`] or an [`Action`]);
//! nothing here reads or writes a file.

use std::path::{Path, PathBuf};

use egui::RichText;
use gradewright_exchange::Selection;

use super::app::{GradewrightApp, Pending};
use super::command::{Action, Edit, UiCommand};

/// The cautions, short, for the status bar.
pub const CAUTION_SHORT: &str = "Design aid only: results must be checked by a licensed engineer; local codes and agency standards govern.";

/// Open or save by typing a path: works where no file dialog is available.
#[derive(Clone, Debug, Default)]
pub struct PathDialog {
    /// Whether it is open.
    pub open: bool,
    /// The path typed.
    pub text: String,
}

/// The state of the editor's windows.
#[derive(Clone, Debug, Default)]
pub struct Windows {
    /// About & cautions is open.
    pub about: bool,
    /// Open or save by path.
    pub path: PathDialog,
    /// A LandXML file holding several design profiles or ground lines, and
    /// the choices it offers (the chooser is open while set).
    pub landxml_choice: Option<(PathBuf, Vec<Selection>)>,
    /// A LandXML file holding several ground lines to import, and the
    /// choices (the chooser is open while set).
    pub ground_choice: Option<(PathBuf, Vec<Selection>)>,
    /// A PVI table being opened, waiting for the user to say its units.
    pub pvi_units: Option<PathBuf>,
}

/// A menu button for `command`, with its shortcut.
pub fn command_button(app: &mut GradewrightApp, ui: &mut egui::Ui, command: UiCommand, enabled: bool) {
    let mut button = egui::Button::new(command.label());
    if let Some(s) = command.shortcut() {
        button = button.shortcut_text(ui.ctx().format_shortcut(&s));
    }
    if ui.add_enabled(enabled, button).clicked() {
        app.push(command.action());
        ui.close();
    }
}

/// A menu button for `action`.
fn action_button(
    app: &mut GradewrightApp,
    ui: &mut egui::Ui,
    label: &str,
    hint: Option<&str>,
    action: Action,
) {
    let mut response = ui.button(label);
    if let Some(hint) = hint {
        response = response.on_hover_text(hint);
    }
    if response.clicked() {
        app.push(action);
        ui.close();
    }
}

/// The menu bar, and the project's name.
pub fn menu_bar(app: &mut GradewrightApp, ui: &mut egui::Ui) {
    egui::Panel::top("menu").show(ui, |ui| {
        egui::MenuBar::new().ui(ui, |ui| {
            ui.menu_button("File", |ui| file_menu(app, ui));
            ui.menu_button("Edit", |ui| {
                let (undo, redo) = app.doc.can_undo_redo();
                command_button(app, ui, UiCommand::Undo, undo);
                command_button(app, ui, UiCommand::Redo, redo);
                ui.separator();
                let selected = app.selected.is_some();
                command_button(app, ui, UiCommand::Insert, true);
                command_button(app, ui, UiCommand::Delete, selected && app.project().pvis.len() > 2);
                command_button(app, ui, UiCommand::Previous, true);
                command_button(app, ui, UiCommand::Next, true);
                ui.separator();
                command_button(app, ui, UiCommand::LengthenSelected, selected);
                command_button(app, ui, UiCommand::LengthenAll, true);
            });
            ui.menu_button("View", |ui| {
                command_button(app, ui, UiCommand::Fit, true);
                let selected = app.selected.is_some();
                command_button(app, ui, UiCommand::ZoomToSelection, selected);
                ui.checkbox(&mut app.panels.sight.shown, "Sight-distance strip");
                ui.separator();
                egui::widgets::global_theme_preference_buttons(ui);
            });
            ui.menu_button("Help", |ui| command_button(app, ui, UiCommand::About, true));
            ui.separator();
            let mut name = app.project().name.clone();
            let response =
                ui.add(egui::TextEdit::singleline(&mut name).desired_width(320.0).hint_text("Project name"));
            if response.changed() {
                app.push(Action::edit(Edit::SetName(name)));
            }
        });
    });
}

fn file_menu(app: &mut GradewrightApp, ui: &mut egui::Ui) {
    for c in [UiCommand::NewMetric, UiCommand::NewUs, UiCommand::Open, UiCommand::Save, UiCommand::SaveAs] {
        command_button(app, ui, c, true);
    }
    ui.menu_button("Recent files", |ui| {
        if app.recent().is_empty() {
            ui.label("None yet");
        }
        for path in app.recent().to_vec() {
            if ui.button(path.display().to_string()).clicked() {
                app.push(Action::Open(Some(path)));
                ui.close();
            }
        }
    });
    ui.separator();
    action_button(
        app,
        ui,
        "Import ground…",
        Some("A CSV of station, elevation, or a LandXML ground line: replaces the existing ground"),
        Action::ImportGround(None),
    );
    action_button(
        app,
        ui,
        "Import control points…",
        Some("A CSV with the header station,kind,elevation,tolerance,name (kind fixed, min or max)"),
        Action::ImportControls(None),
    );
    ui.separator();
    action_button(app, ui, "Export sheet and tables…", None, Action::ShowExport);
    action_button(app, ui, "Export tables…", None, Action::ShowTablesExport);
    action_button(
        app,
        ui,
        "Export LandXML…",
        Some("The design profile and the ground as LandXML 1.2, for other tools"),
        Action::ExportLandXml(None),
    );
    action_button(app, ui, "Open or save by path…", None, Action::ShowPathDialog);
    ui.separator();
    command_button(app, ui, UiCommand::Quit, true);
}

/// The status line: the cautions and the latest message.
pub fn status_bar(app: &mut GradewrightApp, ui: &mut egui::Ui) {
    egui::Panel::bottom("status").show(ui, |ui| {
        ui.horizontal(|ui| {
            ui.label(RichText::new(format!("⚠ {CAUTION_SHORT}")).color(ui.visuals().warn_fg_color))
                .on_hover_text("Help, About & cautions (F1)");
            ui.separator();
            if let Some(notice) = &app.notice {
                let text = RichText::new(&notice.text);
                ui.label(if notice.error { text.color(ui.visuals().error_fg_color) } else { text });
            }
        });
    });
}

/// Every window that floats over the editor, for one frame.
pub fn windows_ui(app: &mut GradewrightApp, ctx: &egui::Context) {
    about_ui(app, ctx);
    path_dialog_ui(app, ctx);
    choice_ui(app, ctx, Chooser::Profile);
    choice_ui(app, ctx, Chooser::Ground);
    pvi_table_units_ui(app, ctx);
    let (base, tables) = (app.export_base(), app.tables_dir());
    let (doc, panels, queue) = app.parts();
    panels.export.windows_ui(ctx, doc, (&base, &tables), queue);
    dialogs_ui(app, ctx);
}

/// Which chooser.
#[derive(Clone, Copy)]
enum Chooser {
    /// A design profile (and its ground line) to open.
    Profile,
    /// A ground line to import.
    Ground,
}

/// The chooser for a LandXML file holding several design profiles or ground
/// lines: one button per choice.
fn choice_ui(app: &mut GradewrightApp, ctx: &egui::Context, chooser: Chooser) {
    let slot = match chooser {
        Chooser::Profile => &mut app.windows.landxml_choice,
        Chooser::Ground => &mut app.windows.ground_choice,
    };
    let Some((path, choices)) = slot.clone() else { return };
    let (title, says) = match chooser {
        Chooser::Profile => ("Choose a profile", "holds several design profiles or ground lines:"),
        Chooser::Ground => ("Choose a ground line", "holds several ground lines:"),
    };
    let mut open = true;
    let mut chosen = None;
    egui::Window::new(title).open(&mut open).collapsible(false).show(ctx, |ui| {
        ui.label(format!("{} {says}", path.display()));
        for selection in &choices {
            let label = match chooser {
                Chooser::Profile => format!(
                    "{} / {}{}",
                    selection.alignment.as_deref().unwrap_or(""),
                    selection.profile.as_deref().unwrap_or(""),
                    selection.surface.as_ref().map(|s| format!(" (ground: {s})")).unwrap_or_default()
                ),
                Chooser::Ground => format!(
                    "{} / {}",
                    selection.alignment.as_deref().unwrap_or(""),
                    selection.surface.as_deref().unwrap_or("")
                ),
            };
            if ui.button(label).clicked() {
                chosen = Some(selection.clone());
            }
        }
    });
    if let Some(selection) = chosen {
        app.push(match chooser {
            Chooser::Profile => Action::OpenLandXml(path, selection),
            Chooser::Ground => Action::ImportGroundFrom(path, selection),
        });
        open = false;
    }
    if !open {
        match chooser {
            Chooser::Profile => app.windows.landxml_choice = None,
            Chooser::Ground => app.windows.ground_choice = None,
        }
    }
}

/// Asks the units of a PVI table being opened (a CSV carries none).
fn pvi_table_units_ui(app: &mut GradewrightApp, ctx: &egui::Context) {
    let Some(path) = app.windows.pvi_units.clone() else { return };
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
        app.push(Action::OpenPviTable(path, units));
        open = false;
    }
    if !open {
        app.windows.pvi_units = None;
    }
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
    std::env::current_dir().unwrap_or_default().join(format!("{stem}.ron"))
}

/// Open or save by typing a path: works where no file dialog is available.
fn path_dialog_ui(app: &mut GradewrightApp, ctx: &egui::Context) {
    let mut open = app.windows.path.open;
    // Start from the project's own file, or its folder and a name made
    // from the project name.
    if open && app.windows.path.text.trim().is_empty() {
        app.windows.path.text = suggested_path(app.path(), &app.project().name).display().to_string();
    }
    let mut chosen = None;
    egui::Window::new("Open or save by path").open(&mut open).collapsible(false).show(ctx, |ui| {
        ui.label("Project file (.ron):");
        ui.add(
            egui::TextEdit::singleline(&mut app.windows.path.text)
                .hint_text("/path/to/project.ron")
                .desired_width(380.0),
        );
        ui.horizontal(|ui| {
            let path = PathBuf::from(app.windows.path.text.trim());
            let ok = !app.windows.path.text.trim().is_empty();
            if ui.add_enabled(ok, egui::Button::new("Open")).clicked() {
                chosen = Some(Action::Open(Some(path.clone())));
            }
            if ui.add_enabled(ok, egui::Button::new("Save here")).clicked() {
                chosen = Some(Action::SaveAs(Some(path)));
            }
        });
    });
    let close = chosen.is_some();
    if let Some(action) = chosen {
        app.push(action);
    }
    app.windows.path.open = open && !close;
}

/// The About & cautions window.
fn about_ui(app: &mut GradewrightApp, ctx: &egui::Context) {
    let mut open = app.windows.about;
    egui::Window::new("About & cautions").open(&mut open).default_width(520.0).show(ctx, |ui| {
        ui.heading(format!("Gradewright {}", env!("CARGO_PKG_VERSION")));
        ui.label("Vertical-profile design for roads: grade lines, PVIs and parabolic vertical curves, checked live against the design criteria you enter.");
        ui.add_space(6.0);
        ui.label(RichText::new("What it computes").strong());
        ui.label("• Equal- and unequal-tangent parabolic curves: PVC/PVT, grades, A, K, external, high and low points.");
        ui.label("• Stopping sight distance from the design speed, and the minimum crest and sag K, by the method of AASHTO's A Policy on Geometric Design of Highways and Streets (2018), rounded as its tables are.");
        ui.label("• Required lengths by the exact crest and headlight formulas (both the S < L and S > L cases); on a lit road (headlight check off) sags follow the comfort rule instead. The Green Book's minimum length for appearance, grade limits by road class, area and terrain, and a drainage check on flat curves.");
        ui.label("• Grade breaks without a curve are allowed up to a limit you can set and judged by the sight distance along the profile; unequal-tangent curves are reported with their total length and both K values.");
        ui.add_space(6.0);
        ui.label(RichText::new("Where the defaults come from").strong());
        ui.label("AASHTO, A Policy on Geometric Design of Highways and Streets (2018), ch. 3 and 5–8, and the TxDOT Roadway Design Manual (2020) §4.11.1 that quotes it. The maximum-grade tables, the metric coefficients and the equation numbers are recalled rather than confirmed and are marked \"from memory\"; the full list, with table and equation numbers, is docs/sources.md in the source. Every default can be overridden.");
        ui.add_space(6.0);
        ui.label(RichText::new("Cautions").strong().color(ui.visuals().warn_fg_color));
        ui.label("Gradewright is a design aid, not a design authority. Every result — curve lengths, K-values, sight distances, checks passed or failed — must be checked by a licensed professional engineer before it is used. Local codes and the standards of the agency that owns the road govern over anything this program computes or assumes. Road geometry that is wrong can hurt people.");
    });
    app.windows.about = open;
}

/// The modal questions: unsaved changes, recovery at start.
fn dialogs_ui(app: &mut GradewrightApp, ctx: &egui::Context) {
    let Some(pending) = app.pending.clone() else { return };
    let mut answer = None;
    egui::Modal::new(egui::Id::unique("pending-dialog")).show(ctx, |ui| match &pending {
        Pending::UnsavedChanges(_) => {
            ui.heading("Unsaved changes");
            ui.label(format!("“{}” has changes that are not saved.", app.project().name));
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
    app.pending = None;
    match (pending, answer) {
        (Pending::UnsavedChanges(action), 1) => app.resolve_unsaved(true, *action),
        (Pending::UnsavedChanges(action), 2) => app.resolve_unsaved(false, *action),
        (Pending::Recovery(project), 1) => app.accept_recovery(*project),
        (Pending::Recovery(_), 2) => app.discard_recovery(),
        _ => {}
    }
}
