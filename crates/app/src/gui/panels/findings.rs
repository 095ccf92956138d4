//! The findings list: every check result; clicking one selects its PVI and
//! brings its curve into view.

use egui::RichText;
use gradewright_geometry::Severity;

use super::View;
use super::table::status_text;
use crate::gui::command::Action;
use crate::gui::theme::Palette;

/// The findings list. Failures first, then by station; each row shows the
/// severity, stations, code and message (the full message on hover). Only
/// the rows in view are built.
pub fn findings_ui(ui: &mut egui::Ui, view: &mut View<'_>) {
    let doc = view.doc;
    let palette = Palette::of(ui);
    let findings = &doc.analysis().report.findings;
    let count = |s| findings.iter().filter(|f| f.severity() == s).count();
    if let Err(why) = &doc.analysis().criteria {
        // No count of failures may read as a pass when nothing was checked.
        ui.label(
            RichText::new(format!("⚠ Not checked: {why}. No curve, grade or sight check has run."))
                .color(palette.warn)
                .strong(),
        );
        ui.label(RichText::new("Enter the design speed under Criteria to check the profile.").weak());
    }
    ui.label(format!(
        "{} fail · {} warn · {} info",
        count(Severity::Fail),
        count(Severity::Warn),
        count(Severity::Info)
    ));
    if findings.is_empty() {
        ui.label(RichText::new("✔ No findings: every check passes").color(palette.ok));
        return;
    }
    let mut order: Vec<usize> = (0..findings.len()).collect();
    order.sort_by(|&a, &b| {
        let (a, b) = (&findings[a], &findings[b]);
        b.severity().cmp(&a.severity()).then(a.station_start.total_cmp(&b.station_start))
    });
    let mut clicked = None;
    // Room for the whole reason: wrapped over up to four lines.
    let row_height = 5.0 * ui.text_style_height(&egui::TextStyle::Body) + 14.0;
    egui::ScrollArea::vertical().id_salt("findings").auto_shrink([false, true]).max_height(300.0).show_rows(
        ui,
        row_height,
        order.len(),
        |ui, rows| {
            for &k in order.get(rows).unwrap_or(&[]) {
                let Some(f) = findings.get(k) else { continue };
                let range = if f.station_start == f.station_end {
                    doc.project().stationing().label(f.station_start.0, 1)
                } else {
                    format!(
                        "{} – {}",
                        doc.project().stationing().label(f.station_start.0, 1),
                        doc.project().stationing().label(f.station_end.0, 1)
                    )
                };
                let response = egui::Frame::group(ui.style())
                    .inner_margin(3.0)
                    .show(ui, |ui| {
                        ui.set_width(ui.available_width());
                        ui.set_height(row_height - 12.0);
                        ui.horizontal(|ui| {
                            ui.label(status_text(Some(f.severity()), palette));
                            ui.label(RichText::new(&range).monospace());
                            ui.label(RichText::new(f.code.as_str()).weak());
                        });
                        ui.add(egui::Label::new(&f.message).wrap());
                    })
                    .response
                    .interact(egui::Sense::click());
                if response.clicked() {
                    clicked = f.pvi;
                }
                response.on_hover_text(format!("{}\n\nClick to select and zoom to this PVI", f.message));
            }
        },
    );
    if let Some(i) = clicked {
        view.push(Action::Focus(i));
    }
}
