//! Colours that read in both light and dark themes. Failing items are always
//! marked by symbol and text as well as colour.

use egui::Color32;

/// Colours of the plot and tables for the current theme.
#[derive(Clone, Copy, Debug)]
pub struct Palette {
    /// The proposed profile.
    pub profile: Color32,
    /// Grade lines through the PVIs.
    pub grade_line: Color32,
    /// Existing ground.
    pub ground: Color32,
    /// PVI handles.
    pub handle: Color32,
    /// The selected PVI.
    pub selected: Color32,
    /// PVC/PVT and high/low marks.
    pub marks: Color32,
    /// Labels.
    pub text: Color32,
    /// Failures.
    pub fail: Color32,
    /// Warnings.
    pub warn: Color32,
    /// Stretches where the sight distance falls short (the same in the plot
    /// and the strip).
    pub shortfall: Color32,
    /// Passing.
    pub ok: Color32,
    /// Cut hatching (solid strokes).
    pub cut: Color32,
    /// Fill hatching (dotted strokes).
    pub fill: Color32,
    /// Control-point symbols that are met.
    pub control: Color32,
}

impl Palette {
    /// The palette for `ui`'s theme.
    pub fn of(ui: &egui::Ui) -> Self {
        if ui.visuals().dark_mode {
            Self {
                profile: Color32::from_rgb(110, 170, 255),
                grade_line: Color32::from_gray(140),
                ground: Color32::from_rgb(190, 150, 100),
                handle: Color32::from_rgb(235, 235, 235),
                selected: Color32::from_rgb(255, 190, 60),
                marks: Color32::from_rgb(150, 210, 150),
                text: Color32::from_gray(220),
                fail: Color32::from_rgb(255, 95, 85),
                warn: Color32::from_rgb(240, 190, 60),
                shortfall: Color32::from_rgb(255, 95, 85).gamma_multiply(0.45),
                ok: Color32::from_rgb(120, 200, 120),
                cut: Color32::from_rgba_unmultiplied(200, 160, 110, 150),
                fill: Color32::from_rgba_unmultiplied(120, 190, 230, 190),
                control: Color32::from_rgb(230, 230, 230),
            }
        } else {
            Self {
                profile: Color32::from_rgb(20, 80, 200),
                grade_line: Color32::from_gray(120),
                ground: Color32::from_rgb(130, 90, 40),
                handle: Color32::from_rgb(30, 30, 30),
                selected: Color32::from_rgb(210, 110, 0),
                marks: Color32::from_rgb(30, 120, 50),
                text: Color32::from_gray(30),
                fail: Color32::from_rgb(200, 20, 20),
                warn: Color32::from_rgb(170, 110, 0),
                shortfall: Color32::from_rgb(200, 20, 20).gamma_multiply(0.35),
                ok: Color32::from_rgb(20, 130, 40),
                cut: Color32::from_rgba_unmultiplied(150, 105, 50, 140),
                fill: Color32::from_rgba_unmultiplied(40, 110, 170, 190),
                control: Color32::from_rgb(20, 20, 20),
            }
        }
    }
}
