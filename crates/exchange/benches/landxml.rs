//! Reading large LandXML files: a design profile of 200 000 PVIs and a
//! ground line of 1 000 000 points (targets: under a second each; the line
//! of every element is found in one walk through the text).

use std::fmt::Write as _;
use std::hint::black_box;
use std::path::Path;

use criterion::{Criterion, criterion_group, criterion_main};
use gradewright_exchange::{Selection, read_landxml};

const HEAD: &str = r#"<?xml version="1.0"?>
<LandXML xmlns="http://www.landxml.org/schema/LandXML-1.2" version="1.2">
<Units><Metric linearUnit="meter" areaUnit="squareMeter" volumeUnit="cubicMeter" temperatureUnit="celsius" pressureUnit="milliBars"/></Units>
<Alignments><Alignment name="Long" staStart="0" length="2000000"><Profile>
"#;

fn pvis(n: u32) -> String {
    let mut text = String::from(HEAD);
    text.push_str("<ProfAlign name=\"Proposed\">\n");
    for i in 0..n {
        let _ = writeln!(text, "<PVI>{} {:.3}</PVI>", f64::from(i) * 10.0, 100.0 + f64::from(i % 2) * 0.5);
    }
    text.push_str("</ProfAlign></Profile></Alignment></Alignments></LandXML>\n");
    text
}

fn ground(n: u32) -> String {
    let mut text = String::from(HEAD);
    text.push_str("<ProfSurf name=\"Survey\"><PntList2D>\n");
    for i in 0..n {
        let s = f64::from(i) * 0.1;
        let _ = writeln!(text, "{s:.1} {:.3}", 100.0 + (s / 70.0).sin());
    }
    let _ = write!(
        text,
        "</PntList2D></ProfSurf>\n<ProfAlign name=\"Proposed\"><PVI>0 100</PVI><PVI>{} 101</PVI></ProfAlign></Profile></Alignment></Alignments></LandXML>\n",
        f64::from(n) * 0.1
    );
    text
}

fn read(c: &mut Criterion) {
    let mut group = c.benchmark_group("LandXML");
    group.sample_size(10);
    let profile = pvis(200_000);
    group.bench_function("read a design profile of 200k PVIs", |b| {
        b.iter(|| {
            black_box(
                read_landxml(profile.as_bytes(), Path::new("long.xml"), &Selection::default(), None)
                    .map(|p| p.pvis.len())
                    .unwrap_or(0),
            )
        });
    });
    let survey = ground(1_000_000);
    group.bench_function("read a ground line of 1M points", |b| {
        b.iter(|| {
            black_box(
                read_landxml(survey.as_bytes(), Path::new("survey.xml"), &Selection::default(), None)
                    .map(|p| p.ground.len())
                    .unwrap_or(0),
            )
        });
    });
    group.finish();
}

criterion_group!(benches, read);
criterion_main!(benches);
