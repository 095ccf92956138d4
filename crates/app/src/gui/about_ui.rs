//! About & cautions.

use egui::RichText;

use super::app::GradewrightApp;

/// The cautions, short, for the status bar and the sheet footer.
pub const CAUTION_SHORT: &str = "Design aid only: results must be checked by a licensed engineer; local codes and agency standards govern.";

/// The About & cautions window.
pub fn about_ui(app: &mut GradewrightApp, ctx: &egui::Context) {
    let mut open = app.view.show_about;
    egui::Window::new("About & cautions").open(&mut open).default_width(520.0).show(ctx, |ui| {
        ui.heading(format!("Gradewright {}", env!("CARGO_PKG_VERSION")));
        ui.label("Vertical-profile design for roads: grade lines, PVIs and parabolic vertical curves, checked live against the design criteria you enter.");
        ui.add_space(6.0);
        ui.label(RichText::new("What it computes").strong());
        ui.label("• Equal- and unequal-tangent parabolic curves: PVC/PVT, grades, A, K, external, high and low points.");
        ui.label("• Stopping sight distance from the design speed, and the minimum crest and sag K, by the AASHTO method (A Policy on Geometric Design of Highways and Streets), rounded as its tables are.");
        ui.label("• Required lengths by the exact crest and headlight formulas (both the S < L and S > L cases), optional sag comfort, a minimum-length rule of thumb, grade limits and a drainage check on flat curves.");
        ui.add_space(6.0);
        ui.label(RichText::new("Where the defaults come from").strong());
        ui.label("AASHTO values as quoted in the TxDOT Roadway Design Manual and state DOT course material; the maximum-grade table and the metric coefficients are recalled rather than confirmed and are marked so in the source. Every default can be overridden.");
        ui.add_space(6.0);
        ui.label(RichText::new("Cautions").strong().color(ui.visuals().warn_fg_color));
        ui.label("Gradewright is a design aid, not a design authority. Every result — curve lengths, K-values, sight distances, checks passed or failed — must be checked by a licensed professional engineer before it is used. Local codes and the standards of the agency that owns the road govern over anything this program computes or assumes. Road geometry that is wrong can hurt people.");
    });
    app.view.show_about = open;
}
