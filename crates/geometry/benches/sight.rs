//! Available sight distance for a 20 km, 200-PVI profile at a 1 m step, both
//! directions (target: under 50 ms, and at least 20× faster than the
//! ray-marching reference on the same grid).

use std::hint::black_box;

use criterion::{Criterion, criterion_group, criterion_main};
use gradewright_geometry::visibility::{
    Direction, Requirement, Road, SightSetup, reference_daylight, reference_headlight, sight_profile,
    stations_every,
};
use gradewright_geometry::{Alignment, Units, synthetic::rolling_profile};

fn setup() -> SightSetup {
    SightSetup {
        eye_height: 1.08,
        object_height: 0.6,
        headlight_height: 0.6,
        headlight_angle_deg: 1.0,
        daylight: true,
        headlights: true,
        cap: 3.0 * 160.0,
    }
}

fn sight(c: &mut Criterion) {
    let profile = rolling_profile(Units::Metric, 200, 20_000.0);
    let Ok(alignment) = Alignment::new(&profile) else { return };
    let stations = stations_every(&alignment, 1.0);
    let s = setup();
    c.bench_function("sight distance, 20 km / 200 PVIs, 1 m step, both directions (exact)", |b| {
        b.iter(|| {
            black_box(sight_profile(&alignment, &s, Requirement::Design(160.0), &stations).samples.len())
        });
    });
    // The dense case: PVIs 20 m apart with 12 m curves, so an eye crosses
    // some 60 pieces within the cap.
    let dense = rolling_profile(Units::Metric, 1001, 20_000.0);
    let Ok(dense) = Alignment::new(&dense) else { return };
    let dense_stations = stations_every(&dense, 1.0);
    c.bench_function(
        "sight distance, 20 km / 1000 PVIs (20 m apart), 1 m step, both directions (exact)",
        |b| {
            b.iter(|| {
                black_box(
                    sight_profile(&dense, &s, Requirement::Design(160.0), &dense_stations).samples.len(),
                )
            });
        },
    );
    // The editor's incremental update while a PVI is dragged: PVI 101
    // moved, only the stations that can see the changed stretch recomputed.
    let mut moved = profile.clone();
    let full = sight_profile(&alignment, &s, Requirement::Design(160.0), &stations);
    let (lo, hi) = {
        let at = |i: usize| moved.pvis.get(i).map_or(0.0, |p| p.station.0);
        (at(99), at(102))
    };
    if let Some(p) = moved.pvis.get_mut(100) {
        p.elevation += 0.5;
    }
    let Ok(after) = Alignment::new(&moved) else { return };
    c.bench_function("incremental sight update, one PVI of 200 moved (1 m step, both directions)", |b| {
        b.iter(|| {
            let mut sight = full.clone();
            sight.update_after_change(&after, &s, Requirement::Design(160.0), lo, hi);
            black_box(sight.samples.len())
        });
    });
    let mut group = c.benchmark_group("reference");
    group.sample_size(10);
    group.bench_function("sight distance, same grid, ray-marching reference (0.1 m march)", |b| {
        let roads = [Road::new(&alignment, Direction::Forward), Road::new(&alignment, Direction::Backward)];
        b.iter(|| {
            let mut sum = 0.0;
            for &x in &stations {
                for (road, at) in roads.iter().zip([x, -x]) {
                    sum += reference_daylight(road, at, &s, 0.1).min(reference_headlight(road, at, &s, 0.1));
                }
            }
            black_box(sum)
        });
    });
    group.finish();
}

criterion_group!(benches, sight);
criterion_main!(benches);
