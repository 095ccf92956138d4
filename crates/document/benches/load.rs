//! Opening a project that holds a long survey: `Project::from_ron` on a
//! project with a 200 000-point ground line (target: well under a second;
//! text positions are found only when an error is reported).

use std::hint::black_box;
use std::path::Path;

use criterion::{Criterion, criterion_group, criterion_main};
use gradewright_document::Project;
use gradewright_geometry::{GroundPoint, Units, synthetic::rolling_profile};

fn project_text(points: u32) -> String {
    let mut project = Project::new("Long survey", Units::Metric);
    project.pvis = rolling_profile(Units::Metric, 200, 20_000.0).pvis;
    project.criteria.design_speed = Some(90.0);
    project.ground = (0..points)
        .map(|i| {
            let s = 20_000.0 * f64::from(i) / f64::from(points - 1);
            GroundPoint { station: s, elevation: 100.0 + 3.0 * (s / 700.0).sin() }
        })
        .collect::<Vec<_>>()
        .into();
    project.to_ron().unwrap_or_else(|e| panic!("{e}"))
}

fn load(c: &mut Criterion) {
    let text = project_text(200_000);
    let origin = Path::new("long-survey.ron");
    let mut group = c.benchmark_group("project file");
    group.sample_size(10);
    group.bench_function("from_ron, 200 PVIs and a 200k-point ground", |b| {
        b.iter(|| black_box(Project::from_ron(&text, origin).map(|p| p.ground.len()).unwrap_or(0)));
    });
    group.bench_function("pvi_position of the last PVI, same text", |b| {
        b.iter(|| black_box(gradewright_document::pvi_position(&text, 199)));
    });
    group.finish();
}

criterion_group!(benches, load);
criterion_main!(benches);
