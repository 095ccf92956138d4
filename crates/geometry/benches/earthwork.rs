//! The level-section earthwork over a dense survey: 20 km, 200 PVIs and a
//! 200 000-point ground (0.1 m spacing), a section at every ground point
//! (target: well inside the editor's 4 ms frame, since the estimate follows
//! a dragged PVI live).

use std::hint::black_box;

use criterion::{Criterion, criterion_group, criterion_main};
use gradewright_geometry::{
    Alignment, Ground, GroundPoint, Section, Station, Units, earthwork, earthwork_at, grade_points,
    synthetic::rolling_profile,
};

fn estimate(c: &mut Criterion) {
    let profile = rolling_profile(Units::Metric, 200, 20_000.0);
    let Ok(alignment) = Alignment::new(&profile) else { return };
    let ground: Ground = (0..200_000)
        .map(|i| {
            let s = f64::from(i) * 0.1;
            let y = alignment.sample(Station(s)).map_or(0.0, |x| x.elevation) + 1.5 * (s / 180.0).sin();
            GroundPoint { station: s, elevation: y }
        })
        .collect::<Vec<_>>()
        .into();
    let section = Section::default_for(Units::Metric);
    c.bench_function("earthwork, 20 km / 200 PVIs, 200k-point ground, a section at every point", |b| {
        b.iter(|| black_box(earthwork(&alignment, &ground, &section, 20.0).map(|e| e.cut).unwrap_or(0.0)));
    });
    // The editor's part: the grade points come from the site scan it has
    // already made.
    let points = grade_points(&alignment, &ground);
    c.bench_function("earthwork sections alone (grade points known), same survey", |b| {
        b.iter(|| {
            black_box(
                earthwork_at(&alignment, &ground, &section, 20.0, &points).map(|e| e.cut).unwrap_or(0.0),
            )
        });
    });
}

criterion_group!(benches, estimate);
criterion_main!(benches);
