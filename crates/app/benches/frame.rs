//! Frame time of the editor with no renderer: a 200-PVI, 20 km profile with a
//! PVI dragged every frame and every check live (target: median under 4 ms).

use std::hint::black_box;

use criterion::{Criterion, criterion_group, criterion_main};
use gradewright::gui::{AppFiles, GradewrightApp};
use gradewright_geometry::{Project, Units, synthetic::rolling_profile};

fn frame(c: &mut Criterion) {
    let profile = rolling_profile(Units::Metric, 200, 20_000.0);
    let mut project = Project::new("Benchmark", Units::Metric);
    project.pvis = profile.pvis;
    project.criteria.design_speed = Some(90.0);
    // Unsnapped, so every frame really moves the PVI (and recomputes).
    project.snap.on = false;
    let mut app = GradewrightApp::new(project, None, AppFiles::new(None));
    let ctx = egui::Context::default();
    let input = || egui::RawInput {
        screen_rect: Some(egui::Rect::from_min_size(egui::Pos2::ZERO, egui::vec2(1500.0, 950.0))),
        ..Default::default()
    };
    // Warm up: lay out once so panels have their sizes.
    for _ in 0..3 {
        let _ = ctx.run_ui(input(), |ui| app.show(ui));
    }
    let index = 100;
    let base = app.project().pvis[index];
    app.begin_drag(index);
    let mut step = 0u32;
    c.bench_function("editor frame, 200 PVIs / 20 km, PVI dragged every frame", |b| {
        b.iter(|| {
            step = step.wrapping_add(1);
            let wiggle = f64::from(step % 20) * 0.05;
            app.drag_to(index, base.station.0 + wiggle, base.elevation + wiggle);
            let output = ctx.run_ui(input(), |ui| app.show(ui));
            black_box(output.shapes.len())
        });
    });
    c.bench_function("drag step alone (derived data, no UI), 200 PVIs / 20 km", |b| {
        b.iter(|| {
            step = step.wrapping_add(1);
            let wiggle = f64::from(step % 20) * 0.05;
            app.drag_to(index, base.station.0 + wiggle, base.elevation + wiggle);
            black_box(app.analysis().report.findings.len())
        });
    });
    app.end_drag();
}

criterion_group!(benches, frame);
criterion_main!(benches);
