//! The editor driven through its real widgets with egui_kittest (no window,
//! no GPU): type into cells, change criteria, drag a PVI, undo, open,
//! import, save and export files. One module per topic; the harness and
//! its helpers are here.

mod editing;
mod files;
mod site;

use egui::accesskit::Role;
use egui_kittest::Harness;
use egui_kittest::kittest::Queryable as _;
use egui_plot::PlotPoint;
use gradewright::gui::{Action, AppFiles, GradewrightApp};
use gradewright_geometry::{CurveKind, FindingCode, Severity, VerticalCurve};

fn harness(app: GradewrightApp) -> Harness<'static, GradewrightApp> {
    let mut h = Harness::builder()
        .with_size([1500.0, 950.0])
        // A new project lays out its table and plot over a few passes.
        .with_max_steps(12)
        .build_ui_state(|ui, app: &mut GradewrightApp| app.show(ui), app);
    h.run();
    h
}

fn demo() -> Harness<'static, GradewrightApp> {
    harness(GradewrightApp::with_demo(AppFiles::new(None)))
}

/// The demo's crest at PVI 4 (index 3): K = 90/5 = 18 < 26, the AASHTO metric
/// minimum at 80 km/h (Table 3-34, from memory).
fn crest_check(h: &Harness<'_, GradewrightApp>) -> gradewright_geometry::CurveCheck {
    h.state()
        .analysis()
        .report
        .curves
        .iter()
        .find(|c| c.curve.index == 3)
        .cloned()
        .unwrap_or_else(|| panic!("no curve"))
}

fn replace_text(h: &mut Harness<'_, GradewrightApp>, label: &str, text: &str) {
    h.get_by_label(label).click();
    h.run();
    h.key_press_modifiers(egui::Modifiers::COMMAND, egui::Key::A);
    h.get_by_label(label).type_text(text);
    h.run();
    h.key_press(egui::Key::Enter);
    h.run();
}

/// Drags a PVI by the pointer from its place by `offset` screen points,
/// holding `modifiers`.
fn drag_pvi(
    h: &mut Harness<'_, GradewrightApp>,
    index: usize,
    offset: egui::Vec2,
    modifiers: egui::Modifiers,
) {
    let pvi = h.state().project().pvis[index];
    let transform =
        h.state().panels.plot.last_transform().copied().unwrap_or_else(|| panic!("plot not shown"));
    let from = transform.position_from_point(&PlotPoint::new(pvi.station.0, pvi.elevation));
    let to = from + offset;
    h.hover_at(from);
    h.run();
    h.drag_at(from);
    h.run();
    // Held for the whole drag, as a user holds the key.
    h.event(egui::Event::ModifiersChanged(modifiers));
    for step in 1..=5u8 {
        let t = f32::from(step) / 5.0;
        h.hover_at(from + (to - from) * t);
        h.step();
    }
    h.drop_at(to);
    h.run();
    h.event(egui::Event::ModifiersChanged(egui::Modifiers::NONE));
    h.run();
}

fn h_text() -> String {
    demo().state().project().to_ron().unwrap_or_else(|e| panic!("{e}"))
}

/// A file dropped on the window in a test (what the windowing layer hands
/// over).
#[derive(Debug)]
struct Dropped(std::path::PathBuf);

impl egui::DroppedFile for Dropped {
    fn path(&self) -> &std::path::Path {
        &self.0
    }

    fn bytes(&self) -> Result<Vec<u8>, String> {
        std::fs::read(&self.0).map_err(|e| e.to_string())
    }
}

fn site_file(name: &str, text: &str) -> std::path::PathBuf {
    let dir = std::env::temp_dir().join(format!("gradewright-gui-site-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap_or_else(|e| panic!("{e}"));
    let path = dir.join(name);
    std::fs::write(&path, text).unwrap_or_else(|e| panic!("{e}"));
    path
}

/// A LandXML 1.2 file of `alignments` (the `Alignment` elements) in US
/// survey feet (`imperial`) or metres.
fn landxml(imperial: bool, alignments: &str) -> String {
    let units = if imperial {
        r#"<Imperial linearUnit="USSurveyFoot" areaUnit="squareFoot" volumeUnit="cubicYard" temperatureUnit="fahrenheit" pressureUnit="inHG"/>"#
    } else {
        r#"<Metric linearUnit="meter" areaUnit="squareMeter" volumeUnit="cubicMeter" temperatureUnit="celsius" pressureUnit="milliBars"/>"#
    };
    format!(
        "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n<LandXML xmlns=\"http://www.landxml.org/schema/LandXML-1.2\" \
         version=\"1.2\" date=\"2026-12-03\" time=\"09:00:00\">\n  <Units>{units}</Units>\n  <Alignments>\n{alignments}  </Alignments>\n</LandXML>\n"
    )
}
