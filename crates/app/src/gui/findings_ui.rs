//! The findings list: every check result; clicking one selects its PVI and
//! brings its curve into view.

use egui::RichText;
use gradewright_geometry::{Severity, format_station};

use super::app::GradewrightApp;
use super::command::Action;
use super::table_ui::status_text;
use super::theme::Palette;

/// The findings list.
pub fn findings_ui(app: &mut GradewrightApp, ui: &mut egui::Ui) {
    let palette = Palette::of(ui);
    let units = app.project().units;
    let findings = app.derived().report.findings.clone();
    let count = |s| findings.iter().filter(|f| f.severity == s).count();
    ui.label(format!(
        "{} fail · {} warn · {} note",
        count(Severity::Fail),
        count(Severity::Warn),
        count(Severity::Info)
    ));
    if findings.is_empty() {
        ui.label(RichText::new("✔ No findings: every check passes").color(palette.ok));
        return;
    }
    let mut sorted = findings;
    sorted.sort_by(|a, b| b.severity.cmp(&a.severity).then(a.station_start.total_cmp(&b.station_start)));
    egui::ScrollArea::vertical().id_salt("findings").auto_shrink([false, false]).show(ui, |ui| {
        for f in &sorted {
            let range = if f.station_start == f.station_end {
                format_station(f.station_start.0, units, 1)
            } else {
                format!(
                    "{} – {}",
                    format_station(f.station_start.0, units, 1),
                    format_station(f.station_end.0, units, 1)
                )
            };
            let frame = egui::Frame::group(ui.style()).inner_margin(4.0);
            let response = frame
                .show(ui, |ui| {
                    ui.set_width(ui.available_width());
                    ui.horizontal(|ui| {
                        ui.label(status_text(Some(f.severity), palette));
                        ui.label(RichText::new(&range).monospace());
                        ui.label(RichText::new(f.code).weak());
                    });
                    ui.add(egui::Label::new(&f.message).wrap());
                })
                .response
                .interact(egui::Sense::click());
            if response.clicked()
                && let Some(i) = f.pvi
            {
                app.push(Action::Focus(i));
            }
            response.on_hover_text("Click to select and zoom to this PVI");
        }
    });
}
