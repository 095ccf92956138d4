//! Evaluation speed: elevation at 1,000,000 sorted stations on a 200-PVI
//! profile (target: under 10 ms).

use std::hint::black_box;

use criterion::{Criterion, criterion_group, criterion_main};
use gradewright_geometry::{Alignment, Station, Units, synthetic::rolling_profile};

fn evaluate(c: &mut Criterion) {
    let profile = rolling_profile(Units::Metric, 200, 20_000.0);
    let Ok(alignment) = Alignment::new(&profile) else { return };
    let (start, end) = (alignment.start().0, alignment.end().0);
    let n = 1_000_000;
    let stations: Vec<f64> =
        (0..n).map(|i| start + (end - start) * f64::from(i) / f64::from(n - 1)).collect();
    c.bench_function("elevation at 1M sorted stations, 200 PVIs (cursor)", |b| {
        b.iter(|| {
            let mut cursor = alignment.cursor();
            let mut sum = 0.0;
            for &s in &stations {
                if let Ok(sample) = cursor.sample(Station(s)) {
                    sum += sample.elevation;
                }
            }
            black_box(sum)
        });
    });
    c.bench_function("elevation at 1M sorted stations, 200 PVIs (random access)", |b| {
        b.iter(|| {
            let mut sum = 0.0;
            for &s in &stations {
                if let Ok(sample) = alignment.sample(Station(s)) {
                    sum += sample.elevation;
                }
            }
            black_box(sum)
        });
    });
}

criterion_group!(benches, evaluate);
criterion_main!(benches);
