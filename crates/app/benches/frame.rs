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
    with_ground(c);
}

/// The same drag over a 200 000-point ground (0.1 m spacing), two control
/// points and the level-section earthwork: cut/fill hatching, the
/// decimated ground, the control checks and the mass haul all live.
fn with_ground(c: &mut Criterion) {
    let profile = rolling_profile(Units::Metric, 200, 20_000.0);
    let alignment = gradewright_geometry::Alignment::new(&profile).unwrap_or_else(|e| panic!("{e:?}"));
    let mut project = Project::new("Benchmark with ground", Units::Metric);
    project.ground = (0..200_000)
        .map(|i| {
            let s = f64::from(i) * 0.1;
            let y = alignment.sample(gradewright_geometry::Station(s)).map_or(0.0, |x| x.elevation)
                + 1.5 * (s / 180.0).sin();
            gradewright_geometry::GroundPoint { station: s, elevation: y }
        })
        .collect::<Vec<_>>()
        .into();
    project.controls = vec![
        gradewright_geometry::ControlPoint {
            name: "Culvert".to_owned(),
            station: 5_000.0,
            kind: gradewright_geometry::ControlKind::Minimum,
            elevation: 0.0,
            tolerance: 0.0,
            clearance: 0.0,
        },
        gradewright_geometry::ControlPoint {
            name: "Bridge".to_owned(),
            station: 12_000.0,
            kind: gradewright_geometry::ControlKind::Maximum,
            elevation: 1.0e4,
            tolerance: 0.0,
            clearance: 0.0,
        },
    ];
    project.section = Some(gradewright_geometry::Section::default_for(Units::Metric));
    project.pvis = profile.pvis;
    project.criteria.design_speed = Some(90.0);
    project.snap.on = false;
    let mut app = GradewrightApp::new(project, None, AppFiles::new(None));
    let ctx = egui::Context::default();
    let input = || egui::RawInput {
        screen_rect: Some(egui::Rect::from_min_size(egui::Pos2::ZERO, egui::vec2(1500.0, 950.0))),
        ..Default::default()
    };
    for _ in 0..3 {
        let _ = ctx.run_ui(input(), |ui| app.show(ui));
    }
    let index = 100;
    let base = app.project().pvis[index];
    app.begin_drag(index);
    let mut step = 0u32;
    c.bench_function("editor frame, 200 PVIs / 20 km, 200k ground, earthwork live, PVI dragged", |b| {
        b.iter(|| {
            step = step.wrapping_add(1);
            let wiggle = f64::from(step % 20) * 0.05;
            app.drag_to(index, base.station.0 + wiggle, base.elevation + wiggle);
            let output = ctx.run_ui(input(), |ui| app.show(ui));
            black_box(output.shapes.len())
        });
    });
    c.bench_function("drag step alone with the 200k ground and the earthwork", |b| {
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
