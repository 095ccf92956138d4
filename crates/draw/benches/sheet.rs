//! The profile sheet: one ANSI B sheet at 200 dpi (3400 × 2200 px) to PNG
//! (target: under 1 s), and the SVG of a 20 km / 200-PVI profile at 1:1000
//! (every sheet; target: under 100 ms).

use std::hint::black_box;

use criterion::{Criterion, criterion_group, criterion_main};
use gradewright_draw::{SheetOptions, png, sheet_svgs};
use gradewright_geometry::{Analysis, Criteria, Units, synthetic::rolling_profile};

fn analysis(pvis: usize, length: f64) -> Analysis {
    let criteria = Criteria { design_speed: Some(80.0), ..Criteria::default() };
    Analysis::with_criteria(rolling_profile(Units::Metric, pvis, length), criteria.resolve(Units::Metric))
}

fn sheet(c: &mut Criterion) {
    let small = analysis(8, 2000.0);
    let options = SheetOptions::default();
    let svgs = sheet_svgs(&small, &options).unwrap_or_default();
    let first = svgs.first().cloned().unwrap_or_default();
    let mut group = c.benchmark_group("sheet");
    group.sample_size(10);
    group.bench_function("png_ansi_b_200dpi", |b| b.iter(|| black_box(png(&first, 200.0).map(|p| p.len()))));
    let long = analysis(200, 20_000.0);
    let options = SheetOptions { h_scale: Some(1000.0), ..SheetOptions::default() };
    group.bench_function("svg_20km_200pvi_1to1000", |b| {
        b.iter(|| black_box(sheet_svgs(&long, &options).map(|s| s.len())));
    });
    group.finish();
}

criterion_group!(benches, sheet);
criterion_main!(benches);
