//! Importing a 200 000-point ground CSV (20 km at 0.1 m) and tabulating the
//! profile with ground, cut and fill every 5 m (target: well under a second
//! together); the earthwork estimate over the same ground.

use std::hint::black_box;
use std::path::Path;

use criterion::{Criterion, criterion_group, criterion_main};
use gradewright_exchange::{interval_stations, read_ground_csv, write_station_table};
use gradewright_geometry::{Alignment, Ground, Section, Units, earthwork, synthetic::rolling_profile};

fn ground_csv(alignment: &Alignment, points: u32) -> String {
    let (a, b) = (alignment.start().0, alignment.end().0);
    let mut text = String::with_capacity(points as usize * 20);
    text.push_str("station,elevation\n");
    for i in 0..points {
        let s = a + (b - a) * f64::from(i) / f64::from(points - 1);
        let y = alignment.sample(gradewright_geometry::Station(s)).map_or(0.0, |x| x.elevation)
            + 1.5 * (s / 180.0).sin()
            + 0.2 * (s / 7.0).sin();
        text.push_str(&format!("{s:.3},{y:.3}\n"));
    }
    text
}

fn ground(c: &mut Criterion) {
    let profile = rolling_profile(Units::Metric, 200, 20_000.0);
    let alignment = Alignment::new(&profile).unwrap_or_else(|e| panic!("{e:?}"));
    let text = ground_csv(&alignment, 200_000);
    let origin = Path::new("ground.csv");
    c.bench_function("import 200k ground points and tabulate every 5 m with cut/fill", |b| {
        b.iter(|| {
            let table = read_ground_csv(
                text.as_bytes(),
                origin,
                gradewright_geometry::Stationing::plain(Units::Metric),
            )
            .unwrap_or_else(|e| panic!("{e}"));
            let ground = Ground::new(table.points);
            let stations = interval_stations(&alignment, 5.0);
            let mut out = Vec::with_capacity(stations.len() * 64);
            write_station_table(&mut out, &alignment, &ground, &stations, Some(3))
                .unwrap_or_else(|e| panic!("{e}"));
            black_box(out.len())
        });
    });
    let table =
        read_ground_csv(text.as_bytes(), origin, gradewright_geometry::Stationing::plain(Units::Metric))
            .unwrap_or_else(|e| panic!("{e}"));
    let ground = Ground::new(table.points);
    let section = Section { width: 10.0, cut_slope: 2.0, fill_slope: 3.0, shrinkage_percent: 10.0 };
    c.bench_function("earthwork over 200k ground points, 20 m interval", |b| {
        b.iter(|| black_box(earthwork(&alignment, &ground, &section, 20.0).map(|e| e.len())));
    });
}

criterion_group!(benches, ground);
criterion_main!(benches);
