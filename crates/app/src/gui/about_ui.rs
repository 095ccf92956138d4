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
    app.view.show_about = open;
}
