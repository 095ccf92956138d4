//! Frame time of the editor with no renderer: a 200-PVI, 20 km profile with a
//! PVI dragged every frame and every check live (target: median under 4 ms),
//! without and with a 200 000-point ground, control points and the
//! earthwork.

use std::hint::black_box;

use criterion::{Criterion, criterion_group, criterion_main};
use gradewright::gui::{AppFiles, GradewrightApp};
use gradewright_document::Project;
use gradewright_geometry::{
    Alignment, ControlKind, ControlPoint, GroundPoint, Section, Station, Units, synthetic::rolling_profile,
};

fn input() -> egui::RawInput {
    egui::RawInput {
        screen_rect: Some(egui::Rect::from_min_size(egui::Pos2::ZERO, egui::vec2(1500.0, 950.0))),
        ..Default::default()
    }
}

/// The benchmark profile, unsnapped so every frame really moves the PVI.
fn project(name: &str) -> Project {
    let profile = rolling_profile(Units::Metric, 200, 20_000.0);
    let mut project = Project::new(name, Units::Metric);
    project.pvis = profile.pvis;
    project.criteria.design_speed = Some(90.0);
    project.snap.on = false;
    project
}

/// Benchmarks a whole frame and the drag step alone while PVI 101 is dragged.
fn drag(c: &mut Criterion, project: Project, frame_name: &str, step_name: &str) {
    let mut app = GradewrightApp::new(project, None, AppFiles::new(None));
    let ctx = egui::Context::default();
    // Warm up: lay out once so panels have their sizes.
    for _ in 0..3 {
        let _ = ctx.run_ui(input(), |ui| app.show(ui));
    }
    let index = 100;
    let base = app.project().pvis[index];
    app.begin_drag(index);
    let mut step = 0u32;
    let mut wiggle = move || {
        step = step.wrapping_add(1);
        f64::from(step % 20) * 0.05
    };
    c.bench_function(frame_name, |b| {
        b.iter(|| {
            let w = wiggle();
            app.drag_to(index, base.station.0 + w, base.elevation + w);
            let output = ctx.run_ui(input(), |ui| app.show(ui));
            black_box(output.shapes.len())
        });
    });
    c.bench_function(step_name, |b| {
        b.iter(|| {
            let w = wiggle();
            app.drag_to(index, base.station.0 + w, base.elevation + w);
            black_box(app.analysis().report.findings.len())
        });
    });
    app.end_drag();
}

fn frame(c: &mut Criterion) {
    drag(
        c,
        project("Benchmark"),
        "editor frame, 200 PVIs / 20 km, PVI dragged every frame",
        "drag step alone (derived data, no UI), 200 PVIs / 20 km",
    );
    // The same over a 200 000-point ground (0.1 m spacing), two control
    // points and the level-section earthwork: cut/fill hatching, the
    // decimated ground, the control checks and the mass haul all live.
    let mut with_ground = project("Benchmark with ground");
    let alignment = Alignment::new(&with_ground.profile()).unwrap_or_else(|e| panic!("{e:?}"));
    with_ground.ground = (0..200_000)
        .map(|i| {
            let s = f64::from(i) * 0.1;
            let y = alignment.sample(Station(s)).map_or(0.0, |x| x.elevation) + 1.5 * (s / 180.0).sin();
            GroundPoint { station: s, elevation: y }
        })
        .collect::<Vec<_>>()
        .into();
    let control = |name: &str, station, kind, elevation| ControlPoint {
        name: name.to_owned(),
        station,
        kind,
        elevation,
        tolerance: 0.0,
        clearance: 0.0,
    };
    with_ground.controls = vec![
        control("Culvert", 5_000.0, ControlKind::Minimum, 0.0),
        control("Bridge", 12_000.0, ControlKind::Maximum, 1.0e4),
    ];
    with_ground.section = Some(Section::default_for(Units::Metric));
    drag(
        c,
        with_ground,
        "editor frame, 200 PVIs / 20 km, 200k ground, earthwork live, PVI dragged",
        "drag step alone with the 200k ground and the earthwork",
    );
}

criterion_group!(benches, frame);
criterion_main!(benches);
