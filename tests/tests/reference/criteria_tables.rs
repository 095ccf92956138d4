//! The default criteria against the published design tables (sources in
//! `docs/sources.md`).

use gradewright_geometry::{Area, Criteria, CriterionId, RoadClass, Terrain, Units, max_grade, sight};

fn max_grade_percent(units: Units, v: f64, terrain: Terrain) -> (f64, String) {
    max_grade(units, v, RoadClass::Arterial, Area::Rural, terrain)
}

fn resolved(units: Units, speed: f64) -> gradewright_geometry::ResolvedCriteria {
    let criteria = Criteria { design_speed: Some(speed), ..Criteria::default() };
    criteria.resolve(units).unwrap_or_else(|e| panic!("{e}"))
}

/// AASHTO Green Book 2011 Tables 3-1 (SSD), 3-34 (crest K) and 3-36 (sag K),
/// US customary: (V mph, SSD ft, K crest, K sag). Tables from memory; SSD at
/// K 151/136 at 60 mph confirmed in Mannering & Washburn, *Principles of
/// Highway Engineering and Traffic Analysis*, Tables 3.2 and 3.3.
const US_TABLE: [(f64, f64, f64, f64); 14] = [
    (15.0, 80.0, 3.0, 10.0),
    (20.0, 115.0, 7.0, 17.0),
    (25.0, 155.0, 12.0, 26.0),
    (30.0, 200.0, 19.0, 37.0),
    (35.0, 250.0, 29.0, 49.0),
    (40.0, 305.0, 44.0, 64.0),
    (45.0, 360.0, 61.0, 79.0),
    (50.0, 425.0, 84.0, 96.0),
    (55.0, 495.0, 114.0, 115.0),
    (60.0, 570.0, 151.0, 136.0),
    (65.0, 645.0, 193.0, 157.0),
    (70.0, 730.0, 247.0, 181.0),
    (75.0, 820.0, 312.0, 206.0),
    (80.0, 910.0, 384.0, 231.0),
];

/// The same tables, metric edition: AASHTO, *A Policy on Geometric Design of
/// Highways and Streets* (2018), Tables 3-1, 3-34 and 3-36, metric columns
/// (from memory: not read in the published edition).
const METRIC_TABLE: [(f64, f64, f64, f64); 12] = [
    (20.0, 20.0, 1.0, 3.0),
    (30.0, 35.0, 2.0, 6.0),
    (40.0, 50.0, 4.0, 9.0),
    (50.0, 65.0, 7.0, 13.0),
    (60.0, 85.0, 11.0, 18.0),
    (70.0, 105.0, 17.0, 23.0),
    (80.0, 130.0, 26.0, 30.0),
    (90.0, 160.0, 39.0, 38.0),
    (100.0, 185.0, 52.0, 45.0),
    (110.0, 220.0, 74.0, 55.0),
    (120.0, 250.0, 95.0, 63.0),
    (130.0, 285.0, 124.0, 73.0),
];

#[test]
fn us_ssd_and_k_tables_exactly() {
    for (v, ssd, crest, sag) in US_TABLE {
        let c = resolved(Units::UsCustomary, v);
        assert_eq!(c.get(CriterionId::StoppingSightDistance).to_bits(), ssd.to_bits(), "SSD at {v} mph");
        assert_eq!(c.get(CriterionId::CrestK).to_bits(), crest.to_bits(), "crest K at {v} mph");
        assert_eq!(c.get(CriterionId::SagK).to_bits(), sag.to_bits(), "sag K at {v} mph");
    }
}

#[test]
fn metric_ssd_and_k_tables_exactly() {
    for (v, ssd, crest, sag) in METRIC_TABLE {
        let c = resolved(Units::Metric, v);
        assert_eq!(c.get(CriterionId::StoppingSightDistance).to_bits(), ssd.to_bits(), "SSD at {v} km/h");
        assert_eq!(c.get(CriterionId::CrestK).to_bits(), crest.to_bits(), "crest K at {v} km/h");
        assert_eq!(c.get(CriterionId::SagK).to_bits(), sag.to_bits(), "sag K at {v} km/h");
    }
}

/// TxDOT RDM 4.11.1: t = 2.5 s, a = 11.2 ft/s², eye 3.5 ft, object 2.0 ft;
/// metric a = 3.4 m/s², eye 1.08 m, object 0.60 m (Green Book 2018 §3.2.2 and
/// §3.2.6, metric; from memory).
#[test]
fn default_parameters() {
    let us = resolved(Units::UsCustomary, 50.0);
    assert_eq!(us.get(CriterionId::ReactionTime).to_bits(), 2.5f64.to_bits());
    assert_eq!(us.get(CriterionId::Deceleration).to_bits(), 11.2f64.to_bits());
    assert_eq!(us.get(CriterionId::EyeHeight).to_bits(), 3.5f64.to_bits());
    assert_eq!(us.get(CriterionId::ObjectHeight).to_bits(), 2.0f64.to_bits());
    let si = resolved(Units::Metric, 50.0);
    assert_eq!(si.get(CriterionId::Deceleration).to_bits(), 3.4f64.to_bits());
    assert_eq!(si.get(CriterionId::EyeHeight).to_bits(), 1.08f64.to_bits());
    assert_eq!(si.get(CriterionId::ObjectHeight).to_bits(), 0.6f64.to_bits());
    // Drainage review K: 167 ft/% and 51 m/% (Green Book 2018 §3.4.6.2; from memory).
    assert_eq!(us.get(CriterionId::DrainageK).to_bits(), 167f64.to_bits());
    assert_eq!(si.get(CriterionId::DrainageK).to_bits(), 51f64.to_bits());
    // Minimum gutter grade 0.30 % (TxDOT Hydraulic Design Manual ch. 10).
    assert_eq!(si.get(CriterionId::MinGrade).to_bits(), 0.3f64.to_bits());
}

/// Overrides win, and a computed value follows an overridden input: with SSD
/// overridden to 200 m the crest K is 200²/658 rounded = 61 (derived from the
/// Green Book 2018 eq. 3-43, metric constant 658; from memory).
#[test]
fn overrides_feed_later_criteria() {
    let mut criteria = Criteria { design_speed: Some(80.0), ..Criteria::default() };
    criteria.stopping_sight_distance = gradewright_geometry::Setting::Override(200.0);
    let c = criteria.resolve(Units::Metric).unwrap_or_else(|e| panic!("{e}"));
    assert_eq!(c.get(CriterionId::CrestK).to_bits(), 61f64.to_bits());
    assert!(c.entry(CriterionId::StoppingSightDistance).is_some_and(|e| e.overridden));
    assert!(c.entry(CriterionId::CrestK).is_some_and(|e| !e.overridden));
    criteria.design_speed = None;
    assert!(criteria.resolve(Units::Metric).is_err());
    criteria.design_speed = Some(80.0);
    criteria.crest_k = gradewright_geometry::Setting::Override(-3.0);
    assert!(criteria.resolve(Units::Metric).is_err());
}

/// SSD on grades, derived from Green Book 2018 eq. 3-3 (from memory):
/// SSD = 1.47Vt + V²/(30(a/32.2 ± G)) and 0.278Vt + V²/(254(a/9.81 ± G)).
#[test]
fn ssd_on_grades() {
    let us = [
        (30.0, [204.6, 214.5, 226.6, 189.7, 183.8, 178.8]),
        (50.0, [445.9, 473.3, 507.0, 404.3, 388.1, 374.1]),
        (60.0, [598.1, 637.4, 685.9, 538.1, 514.7, 494.6]),
        (70.0, [771.2, 824.7, 890.8, 689.5, 657.7, 630.3]),
    ];
    let si = [
        (50.0, [65.8, 69.1, 73.1, 60.9, 59.0, 57.3]),
        (80.0, [135.2, 143.5, 153.8, 122.5, 117.6, 113.3]),
        (100.0, [193.9, 206.9, 222.9, 174.0, 166.3, 159.7]),
    ];
    let grades = [-0.03, -0.06, -0.09, 0.03, 0.06, 0.09];
    for (units, rows, decel) in [(Units::UsCustomary, &us[..], 11.2), (Units::Metric, &si[..], 3.4)] {
        for (v, values) in rows {
            for (g, expected) in grades.iter().zip(values) {
                let d = sight::stopping_sight_distance_on_grade(units, *v, 2.5, decel, *g);
                assert!((d - expected).abs() <= 0.051, "{units:?} {v} at {g}: {d} vs {expected}");
            }
        }
    }
}

/// Green Book Table 7-2, rural arterials (from memory).
#[test]
fn max_grade_defaults() {
    let us = [
        (Terrain::Level, [5.0, 5.0, 4.0, 4.0, 3.0, 3.0, 3.0, 3.0, 3.0]),
        (Terrain::Rolling, [6.0, 6.0, 5.0, 5.0, 4.0, 4.0, 4.0, 4.0, 4.0]),
        (Terrain::Mountainous, [8.0, 7.0, 7.0, 6.0, 6.0, 5.0, 5.0, 5.0, 5.0]),
    ];
    for (terrain, row) in us {
        for (i, &expected) in row.iter().enumerate() {
            let expected: f64 = expected;
            let v = 40.0 + 5.0 * f64::from(u8::try_from(i).unwrap_or(0));
            let (g, _) = max_grade_percent(Units::UsCustomary, v, terrain);
            assert_eq!(g.to_bits(), expected.to_bits(), "{terrain:?} {v} mph");
        }
    }
    let (g, _) = max_grade_percent(Units::Metric, 100.0, Terrain::Mountainous);
    assert_eq!(g.to_bits(), 6f64.to_bits());
    let (g, note) = max_grade_percent(Units::Metric, 50.0, Terrain::Level);
    assert_eq!(g.to_bits(), 5f64.to_bits());
    assert!(note.contains("starts at"), "{note}");
}
