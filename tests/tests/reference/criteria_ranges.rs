//! Design criteria that change along the road. The values come from AASHTO,
//! *A Policy on Geometric Design of Highways and Streets* (2018), metric
//! columns (from memory): Table 3-1, SSD 85 m at 60 km/h and 185 m at
//! 100 km/h; Table 3-34, crest K 11 at 60 km/h and 52 at 100 km/h (the same
//! values `criteria_tables` checks). The rules (common practice): outside
//! every range the project's criteria apply; a curve straddling a change is
//! judged under the stricter; the SSD an eye needs follows the eye's
//! station.
//!
//! The profile: PVIs at 0 (100.00 m), 1500 (130.00 m, crest L = 200 m) and
//! 3000 (100.00 m): g1 = +2 %, g2 = −2 %, A = 4 %, K = 200/4 = 50.

use gradewright_document::Project;
use gradewright_geometry::{
    Analysis, CriteriaRange, CriterionId, FindingCode, Pvi, Severity, Units, lengthen_to_clear,
};

fn project(ranges: Vec<CriteriaRange>, base_speed: f64, crest_at: f64) -> Project {
    let mut p = Project::new("Ranges", Units::Metric);
    p.criteria.design_speed = Some(base_speed);
    p.pvis = vec![
        Pvi::new(0.0, 100.0),
        Pvi::with_curve(crest_at, 100.0 + 0.02 * crest_at, 200.0),
        Pvi::new(2.0 * crest_at, 100.0),
    ];
    p.criteria_ranges = ranges;
    p
}

fn range(from: f64, to: f64, speed: f64) -> CriteriaRange {
    CriteriaRange { from, to, design_speed: Some(speed), ..CriteriaRange::default() }
}

fn crest_fails(a: &Analysis) -> Vec<String> {
    a.report.findings.iter().filter(|f| f.code == FindingCode::CrestKMin).map(|f| f.message.clone()).collect()
}

/// A crest K = 50 in a 60 km/h range of a 100 km/h road passes (K ≥ 11);
/// the same crest without the range fails (K < 52); the SSD needed follows
/// the eye: 85 m inside the range, 185 m outside.
#[test]
fn a_crest_in_the_slow_range_passes_and_would_fail_in_the_fast() {
    let slow = Analysis::once(&project(vec![range(1000.0, 2000.0, 60.0)], 100.0, 1500.0).design());
    let criteria = slow.criteria.clone().unwrap_or_else(|e| panic!("{e}"));
    assert!((criteria.get(CriterionId::CrestK) - 52.0).abs() < 1e-9);
    let (inside, r) = criteria.at(1500.0);
    assert!(r.is_some() && (inside.get(CriterionId::CrestK) - 11.0).abs() < 1e-9);
    assert!(crest_fails(&slow).is_empty(), "{:?}", slow.report.findings);
    let check = slow.report.curves.first().unwrap_or_else(|| panic!("a curve"));
    assert!(check.ok, "{check:?}");
    assert!(
        !slow.report.findings.iter().any(|f| f.severity() == Severity::Fail),
        "{:?}",
        slow.report.findings
    );
    let sight = slow.sight.as_ref().unwrap_or_else(|| panic!("sight"));
    let at = |s: f64| sight.samples.iter().find(|x| (x.station - s).abs() < 1e-9).map(|x| x.required_forward);
    assert_eq!(at(1500.0), Some(85.0));
    assert_eq!(at(500.0), Some(185.0));
    assert_eq!(at(2500.0), Some(185.0));
    // Without the range: K 50 < 52 fails at 100 km/h.
    let fast = Analysis::once(&project(Vec::new(), 100.0, 1500.0).design());
    let fails = crest_fails(&fast);
    assert_eq!(fails.len(), 1, "{fails:?}");
    assert!(!fails[0].contains("judged under"), "{}", fails[0]);
}

/// A curve straddling a change (PVC 900 under the project's 60 km/h, PVT
/// 1100 in a 100 km/h range from 1050) is judged under the stricter, the
/// range's, and says so; the fit lengthens it to the range's need,
/// K 52 × A 4 = 208 m, rounded up to the 10 m increment: 210 m.
#[test]
fn a_curve_across_a_change_is_judged_under_the_stricter() {
    let p = project(vec![range(1050.0, 2000.0, 100.0)], 60.0, 1000.0);
    let a = Analysis::once(&p.design());
    let fails = crest_fails(&a);
    assert_eq!(fails.len(), 1, "{:?}", a.report.findings);
    assert!(
        fails[0].contains("[judged under criteria range 1, 1+050.000 to 2+000.000: 100 km/h]"),
        "{}",
        fails[0]
    );
    let check = a.report.curves.first().unwrap_or_else(|| panic!("a curve"));
    assert!((check.k_required.unwrap_or(0.0) - 52.0).abs() < 1e-9, "{check:?}");
    // The same curve wholly outside the range is judged at 60 km/h: passes.
    let p2 = project(vec![range(1200.0, 2000.0, 100.0)], 60.0, 1000.0);
    assert!(crest_fails(&Analysis::once(&p2.design())).is_empty());
    // Lengthen to clear asks the stricter length.
    let criteria = a.criteria.clone().unwrap_or_else(|e| panic!("{e}"));
    let (fitted, outcomes) = lengthen_to_clear(&p.profile(), &criteria, &[], &[1], 10.0);
    assert!(outcomes.first().is_some_and(|o| o.cleared), "{outcomes:?}");
    assert!((fitted.pvis[1].curve.length() - 210.0).abs() < 1e-9, "{:?}", fitted.pvis[1]);
    let mut after = p.clone();
    after.pvis = fitted.pvis;
    assert!(crest_fails(&Analysis::once(&after.design())).is_empty());
}

/// Ranges that overlap, or run backwards, are refused with the range named;
/// a range's unusable speed turns the checks off naming the range.
#[test]
fn bad_ranges_are_refused() {
    let p = project(vec![range(0.0, 1000.0, 60.0), range(900.0, 2000.0, 80.0)], 100.0, 1500.0);
    let e = p.check().err().map(|e| e.to_string()).unwrap_or_default();
    assert!(e.contains("criteria range 2") && e.contains("overlap"), "{e}");
    let p = project(vec![range(1000.0, 500.0, 60.0)], 100.0, 1500.0);
    assert!(p.check().is_err());
    let p = project(vec![range(0.0, 1000.0, 500.0)], 100.0, 1500.0);
    let a = Analysis::once(&p.design());
    let why = a.criteria.err().map(|e| e.to_string()).unwrap_or_default();
    assert!(why.starts_with("criteria range 1: design speed 500"), "{why}");
}
