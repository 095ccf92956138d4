//! The interactive profile editor (eframe + egui + egui_plot).
//!
//! * [`document`]: the project, its history and its analysis, changed only
//!   by applying an [`Edit`].
//! * [`files`]: where the project lives, recent files, autosave and recovery.
//! * [`panels`]: the plot, the PVI table, the strips, the site, the criteria
//!   and the export windows, each owning its state.
//! * [`windows`]: the menu bar, the status line and the dialogs.
//! * [`command`]: every user action as a value; [`app`] applies them after
//!   the frame, and [`effects`] runs those that leave it (dialogs, files).
//!
//! [`GradewrightApp::show`] builds the whole UI into any `egui::Ui`, so tests
//! and benchmarks drive it without a window; [`run`] puts it in one.

pub mod app;
mod cell;
pub mod command;
pub mod document;
mod effects;
pub mod files;
mod history;
pub mod panels;
mod theme;
pub mod windows;

use std::path::Path;

pub use app::{DEMO_PROJECT, GradewrightApp, Notice, Pending};
pub use command::{Action, Edit, UiCommand};
pub use document::{Applied, Document, DragLock};
pub use files::{AppFiles, Session, default_config_dir};
pub use panels::{Panels, SidePage};
pub use windows::CAUTION_SHORT;

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
