//! Required curve lengths by the Green Book's formulas, and textbook worked
//! examples (sources listed in `docs/sources.md`).

use gradewright_acceptance::{alignment, assert_close};
use gradewright_geometry::{
    Criteria, FindingCode, Profile, Pvi, Setting, Severity, Units, check_profile,
    sight::{self, SightCase},
};

/// 40 mph, SSD 305 ft (Green Book 2018 Table 3-1), +1.25 % / −2.75 %: A = 4.0;
/// the S < L trial A·S²/2158 = 172.43 ft is shorter than S and is rejected, and
/// S > L gives 2·305 − 2158/4 = 70.5 ft (derived from Green Book 2018
/// eq. 3-43 and 3-44; equation numbers from memory).
#[test]
fn crest_example_s_longer_than_l() {
    let c = sight::published_crest_constant(Units::UsCustomary);
    assert_close(4.0 * 305.0 * 305.0 / c, 172.43, 0.005, "S < L trial (eq. 3-43)");
    let r = sight::crest_length(4.0, 305.0, c);
    assert_eq!(r.case, SightCase::LongerThanCurve);
    assert_close(r.length, 70.5, 1e-9, "S > L length (eq. 3-44)");
}

/// 40 mph, SSD 305 ft, −3.2 % / +2.4 %: A = 5.6; headlight S < L
/// A·S²/(400 + 3.5S) = 354.98 ft (the S > L trial 347.95 ft is rejected);
/// comfort A·V²/46.5 = 192.69 ft (derived from Green Book 2018 eq. 3-48 to
/// 3-50; equation numbers from memory).
#[test]
fn sag_example_headlight_and_comfort() {
    let terms = sight::published_headlight_terms(Units::UsCustomary);
    let r = sight::sag_headlight_length(5.6, 305.0, terms);
    assert_eq!(r.case, SightCase::ShorterThanCurve);
    assert_close(r.length, 354.98, 0.005, "headlight length (eq. 3-48)");
    assert_close(2.0 * 305.0 - (400.0 + 3.5 * 305.0) / 5.6, 347.95, 0.005, "rejected trial (eq. 3-49)");
    let comfort = 5.6 * 40.0 * 40.0 / sight::published_comfort_divisor(Units::UsCustomary);
    assert_close(comfort, 192.69, 0.005, "comfort length (eq. 3-50)");
    // The general form at 1 ft/s² agrees with the published divisor to 0.1 %.
    let general = sight::sag_comfort_length(Units::UsCustomary, 5.6, 40.0, 1.0);
    assert_close(general, comfort, 0.002 * comfort, "A·v²/(100·a)");
}

/// M. Rogers, *Highway Engineering* (2nd ed.), Example 6.8: 85 km/h, +4 % / −2.5 %, eye
/// 1.05 m, object 0.26 m, SSD 160 m → L = 353 m (S ≤ L); with h2 = 0, 792 m.
#[test]
fn rogers_crest_with_uk_heights() {
    let c = sight::crest_constant(1.05, 0.26);
    let r = sight::crest_length(6.5, 160.0, c);
    assert_eq!(r.case, SightCase::ShorterThanCurve);
    assert_close(r.length, 353.29, 0.01, "Rogers Ex 6.8");
    let c0 = sight::crest_constant(1.05, 0.0);
    assert_close(sight::crest_length(6.5, 160.0, c0).length, 792.4, 0.1, "Rogers Ex 6.8, h2 = 0");
}

/// Rogers, *Highway Engineering* (2nd ed.), Example 6.6: 100 km/h, A = 7 %, K 100 (desirable) and 55 (absolute) →
/// 700 m and 385 m, via a K override in the criteria.
#[test]
fn rogers_k_override_lengths() {
    for (k, expected) in [(100.0, 700.0), (55.0, 385.0)] {
        let criteria =
            Criteria { design_speed: Some(100.0), crest_k: Setting::Override(k), ..Criteria::default() };
        let resolved = criteria.resolve(Units::Metric).unwrap_or_else(|e| panic!("{e}"));
        let profile = Profile::new(
            Units::Metric,
            vec![Pvi::new(0.0, 100.0), Pvi::with_curve(1000.0, 130.0, 300.0), Pvi::new(2000.0, 90.0)],
        );
        let report = check_profile(&profile, &resolved);
        let curve = &report.curves[0];
        assert_close(
            curve.k_required.unwrap_or(0.0) * curve.curve.a_percent(),
            expected,
            1e-9,
            "L = K·A (Rogers Ex 6.6)",
        );
        assert!(report.findings.iter().any(|f| f.code == FindingCode::CrestKMin), "{report:?}");
    }
}

/// General crest constant C = 100(√(2h1) + √(2h2))² (Green Book 2018
/// eq. 3-41; from memory): 2158.3 at 3.5/2.0 ft, 657.99 at 1.08/0.60 m; passing
/// h1 = h2 = 3.5 ft gives 2800 and 1.08 m gives 864 (constants derived from
/// that formula).
#[test]
fn crest_constants() {
    assert_close(sight::crest_constant(3.5, 2.0), 2158.3, 0.1, "US");
    assert_close(sight::crest_constant(1.08, 0.6), 657.99, 0.01, "metric");
    assert_close(sight::crest_constant(3.5, 3.5), 2800.0, 1e-9, "passing US");
    assert_close(sight::crest_constant(1.08, 1.08), 864.0, 1e-9, "passing metric");
    // Published rounded constants (Green Book 2018 eq. 3-43: 2158; metric 658,
    // from memory).
    assert_close(sight::published_crest_constant(Units::UsCustomary), 2158.0, 0.0, "published US");
    assert_close(sight::published_crest_constant(Units::Metric), 658.0, 0.0, "published metric");
}

/// "Use the published rounded constant" follows whether the heights are
/// computed or overridden, never a comparison of values: an override equal
/// to the default height uses the general formula (common practice: an
/// entered value is taken as entered).
#[test]
fn published_constant_follows_the_setting_not_the_value() {
    let computed = Criteria { design_speed: Some(80.0), ..Criteria::default() };
    let c = computed.resolve(Units::Metric).unwrap_or_else(|e| panic!("{e}"));
    assert_close(c.crest_constant(), 658.0, 0.0, "computed heights: published 658");
    let entered = Criteria { eye_height: Setting::Override(1.08), ..computed };
    let c = entered.resolve(Units::Metric).unwrap_or_else(|e| panic!("{e}"));
    assert_close(c.crest_constant(), sight::crest_constant(1.08, 0.6), 1e-12, "override: formula");
}

/// Headlight basis L = A·S²/(200(H + S·tan β)) (Green Book 2018 eq. 3-46;
/// from memory): 200·tan 1° = 3.49 (derived), published rounded to 3.5.
#[test]
fn headlight_terms_general() {
    let (base, slope) = sight::headlight_terms(0.75, 1.0);
    assert_close(base, 150.0, 1e-9, "200·H");
    assert_close(slope, 3.49, 0.005, "200·tan 1°");
    assert_eq!(sight::published_headlight_terms(Units::Metric), (120.0, 3.5));
}

/// Undercrossing sag (Green Book 2018 eq. 3-51, 3-52; Mannering & Washburn,
/// *Principles of Highway Engineering and Traffic Analysis*, ch. 3; truck eye
/// h1 = 8 ft, h2 = 2 ft, from memory): L = A·S²/(800(C − 5)) when S < L,
/// else 2S − 800(C − 5)/A; metric C − 1.5 with 2.4 m / 0.6 m.
#[test]
fn undercrossing_lengths() {
    let (a, s, c) = (10.0, 1000.0, 16.5);
    let r = sight::sag_undercrossing_length(a, s, c, 8.0, 2.0);
    assert_eq!(r.case, SightCase::ShorterThanCurve);
    assert_close(r.length, a * s * s / (800.0 * (c - 5.0)), 1e-9, "S < L");
    let r = sight::sag_undercrossing_length(3.0, 2000.0, 16.5, 8.0, 2.0);
    assert_eq!(r.case, SightCase::LongerThanCurve);
    assert_close(r.length, 4000.0 - 800.0 * 11.5 / 3.0, 1e-9, "S > L");
    let r = sight::sag_undercrossing_length(8.0, 400.0, 5.0, 2.4, 0.6);
    assert_eq!(r.case, SightCase::ShorterThanCurve);
    assert_close(r.length, 8.0 * 400.0 * 400.0 / (800.0 * 3.5), 1e-9, "metric S < L");
}

/// Metric comfort L = A·V²/395 (Green Book 2018 eq. 3-50, metric; from
/// memory; 395 = 1296 × 0.3048, derived) and the Green Book's appearance
/// minimum L ≥ 0.6V m / 3V ft (2018 §3.4.6.2; from memory).
#[test]
fn comfort_and_appearance_rules() {
    assert_close(
        sight::sag_comfort_length(Units::Metric, 4.0, 80.0, 0.3048),
        4.0 * 6400.0 / 395.0,
        0.01,
        "395",
    );
    let general = sight::sag_comfort_length(Units::Metric, 4.0, 80.0, 0.3);
    assert_close(general, 4.0 * 6400.0 / (1296.0 * 0.3), 1e-9, "general");
    assert_close(sight::appearance_min_length(Units::UsCustomary, 50.0), 150.0, 0.0, "3V");
    assert_close(sight::appearance_min_length(Units::Metric, 80.0), 48.0, 1e-12, "0.6V");
}

/// The checks on a whole profile: a short crest fails both its K and its exact
/// SSD length; a sag passes; a flat sag with a low point gets the drainage
/// warning (K > 51 m/%, Green Book 2018 §3.4.6.2; from memory); a steep grade
/// fails the maximum.
#[test]
fn profile_checks_flag_what_fails() {
    let a = alignment(
        Units::Metric,
        &[(0.0, 100.0, 0.0), (300.0, 109.0, 90.0), (600.0, 103.0, 400.0), (1000.0, 107.0, 0.0)],
    );
    let criteria = Criteria { design_speed: Some(80.0), ..Criteria::default() };
    let resolved = criteria.resolve(Units::Metric).unwrap_or_else(|e| panic!("{e}"));
    let profile = Profile::new(Units::Metric, a.pvis().to_vec());
    let report = check_profile(&profile, &resolved);
    let codes: Vec<_> = report.findings.iter().map(|f| (f.code, f.severity(), f.pvi)).collect();
    // Crest +3 % → −2 %, A = 5, L 90: K 18 < 26 (Green Book 2018 Table 3-34,
    // metric, 80 km/h; from memory).
    assert!(codes.contains(&(FindingCode::CrestKMin, Severity::Fail, Some(1))), "{codes:?}");
    // Exact: S = 130 m > L → L = 2·130 − 658/5 = 128.4 m > 90.
    assert!(codes.contains(&(FindingCode::CrestSsdLength, Severity::Fail, Some(1))), "{codes:?}");
    assert_close(report.curves[0].sight_length, 128.4, 1e-9, "2S − 658/A");
    assert!(!report.curves[0].ok);
    // Sag −2 % → +1 %, A = 3, L 400 → K 133 > 51 with a low point: drainage warning.
    assert!(codes.contains(&(FindingCode::DrainageFlatCurve, Severity::Warn, Some(2))), "{codes:?}");
    assert!(report.curves[1].ok);
    assert_close(report.curves[1].length_required, 90.0, 1e-9, "sag K 30 · A 3");
    let steep = Profile::new(Units::Metric, vec![Pvi::new(0.0, 100.0), Pvi::new(100.0, 108.0)]);
    let report = check_profile(&steep, &resolved);
    assert!(
        report.findings.iter().any(|f| f.code == FindingCode::GradeMax && f.severity() == Severity::Fail)
    );
    let flat = Profile::new(Units::Metric, vec![Pvi::new(0.0, 100.0), Pvi::new(100.0, 100.1)]);
    let report = check_profile(&flat, &resolved);
    assert!(
        report.findings.iter().any(|f| f.code == FindingCode::GradeMin && f.severity() == Severity::Warn)
    );
    assert!(!report.has_failures());
}

/// Overlapping curves are reported as failures by the checks, with both PVIs'
/// curves still evaluated (common practice: show everything at once).
#[test]
fn overlap_is_a_failure_finding() {
    let profile = Profile::new(
        Units::Metric,
        vec![
            Pvi::new(0.0, 100.0),
            Pvi::with_curve(200.0, 106.0, 200.0),
            Pvi::with_curve(350.0, 103.0, 200.0),
            Pvi::new(600.0, 108.0),
        ],
    );
    let criteria = Criteria { design_speed: Some(60.0), ..Criteria::default() };
    let report = check_profile(&profile, &criteria.resolve(Units::Metric).unwrap_or_else(|e| panic!("{e}")));
    assert!(
        report.findings.iter().any(|f| f.code == FindingCode::CurveOverlap && f.severity() == Severity::Fail)
    );
    assert_eq!(report.curves.len(), 2);
}

/// "Lengthen to clear" on a crest that fails at 80 km/h (A = 5 %, L = 90 m):
/// the shortest multiple of 5 m meeting K ≥ 26 (Green Book 2018 Table 3-34,
/// metric; from memory) is 130 m, and the available sight distance then clears 130 m.
#[test]
fn lengthen_to_clear_finds_the_shortest_clearing_length() {
    let criteria = Criteria { design_speed: Some(80.0), ..Criteria::default() };
    let resolved = criteria.resolve(Units::Metric).unwrap_or_else(|e| panic!("{e}"));
    let profile = Profile::new(
        Units::Metric,
        vec![Pvi::new(0.0, 100.0), Pvi::with_curve(400.0, 112.0, 90.0), Pvi::new(800.0, 104.0)],
    );
    let report = check_profile(&profile, &resolved);
    assert_eq!(report.failing_curves(), vec![1]);
    assert!(report.findings.iter().any(|f| f.code == FindingCode::SightForward), "{:?}", report.findings);
    let (fitted, outcomes) = gradewright_geometry::lengthen_to_clear(&profile, &resolved, &[], &[1], 5.0);
    assert_close(fitted.pvis[1].curve.length(), 130.0, 1e-9, "K·A = 26 · 5");
    assert!(outcomes[0].cleared, "{outcomes:?}");
    assert!(!check_profile(&fitted, &resolved).has_failures());
    // With a 20 m increment the answer rounds up to the next multiple, 140 m.
    let (fitted, _) = gradewright_geometry::lengthen_to_clear(&profile, &resolved, &[], &[1], 20.0);
    assert_close(fitted.pvis[1].curve.length(), 140.0, 1e-9, "rounded up to 20 m");
}

/// Where no length fits between the neighbours, nothing changes and the
/// outcome says by how much it falls short (common practice).
#[test]
fn lengthen_to_clear_reports_what_does_not_fit() {
    let criteria = Criteria { design_speed: Some(100.0), ..Criteria::default() };
    let resolved = criteria.resolve(Units::Metric).unwrap_or_else(|e| panic!("{e}"));
    // Crest +4 % → −4 %, A = 8: needs K 52 · 8 = 416 m; the tangents leave 300 m.
    let profile = Profile::new(
        Units::Metric,
        vec![Pvi::new(0.0, 100.0), Pvi::with_curve(150.0, 106.0, 100.0), Pvi::new(300.0, 100.0)],
    );
    let (fitted, outcomes) = gradewright_geometry::lengthen_to_clear(&profile, &resolved, &[], &[1], 5.0);
    assert_eq!(fitted, profile);
    assert!(!outcomes[0].cleared);
    assert!(outcomes[0].message.contains("needs 420 m, at most 300 m fits"), "{}", outcomes[0].message);
}

/// Sight under a structure on a sag: PVIs 0/115, 500/100 (L = 200 m),
/// 1000/115 at 80 km/h (SSD 130 m, Green Book 2018 Table 3-1), A = 6 %; a
/// maximum at 0+500, 103.0, with a clearance of 0.5 m (underside 103.5).
/// The road at the PVI is 100 + A·L/800 = 101.5, so C = 2.0 and the sag
/// needs L = A·S²/(800(C − 1.5)) = 6·130²/400 = 253.50 m (eq. 3-51 form,
/// truck eye 2.4 m and taillights 0.6 m, from memory; hand-computed). The
/// curve's required length says so; and since lengthening the sag raises
/// the road (C = 3.5 − 0.0075·L), the clearance is met only while
/// L ≤ 162.96 m, below the 180 m the sag K asks (K 30, Table 3-36): no
/// length meets both, and the fit says so rather than "already clears".
#[test]
fn sight_under_a_structure_is_part_of_the_required_length_and_the_fit() {
    let pvis = vec![Pvi::new(0.0, 115.0), Pvi::with_curve(500.0, 100.0, 200.0), Pvi::new(1000.0, 115.0)];
    let bridge = |station: f64, elevation: f64| gradewright_geometry::ControlPoint {
        name: "Rail bridge".to_owned(),
        station,
        kind: gradewright_geometry::ControlKind::Maximum,
        elevation,
        tolerance: 0.0,
        clearance: 0.5,
    };
    let design = |controls| gradewright_geometry::Design {
        units: Units::Metric,
        criteria: gradewright_geometry::Criteria { design_speed: Some(80.0), ..Default::default() },
        pvis: pvis.clone(),
        controls,
        ..Default::default()
    };
    let analysis = gradewright_geometry::Analysis::of(&design(vec![bridge(500.0, 103.0)]));
    let curve = analysis.report.curves.first().unwrap_or_else(|| panic!("a curve"));
    assert_close(curve.length_required, 253.5, 1e-9, "L req with the undercrossing (hand-computed)");
    let criteria = analysis.criteria.clone().unwrap_or_else(|e| panic!("{e}"));
    let profile = Profile::new(Units::Metric, pvis.clone());
    let (fitted, outcomes) =
        gradewright_geometry::lengthen_to_clear(&profile, &criteria, &[bridge(500.0, 103.0)], &[1], 5.0);
    let outcome = outcomes.first().unwrap_or_else(|| panic!("an outcome"));
    assert!(!outcome.cleared && fitted == profile, "{outcome:?}");
    assert!(!outcome.message.contains("already clears"), "{}", outcome.message);
    assert!(outcome.message.contains("need L ≥ 180 m"), "{}", outcome.message);
    // Below S = 130 m the S > L form 2S − 800(C − 1.5)/A = L − 6.67 is always
    // met; above it, while L ≥ 126.75/(2 − 0.0075L), i.e. up to 162.96 m (the
    // upper root of 0.0075L² − 2L + 126.75): 160 m on the 5 m grid; at 180 m
    // it needs 126.75/(2 − 1.35) = 195.00 m (derived from eq. 3-51 and 3-52).
    assert!(outcome.message.contains("met only for L up to 160 m"), "{}", outcome.message);
    assert!(outcome.message.contains("at 180 m it needs 195.00 m"), "{}", outcome.message);
    assert!(outcome.message.contains("no length meets both"), "{}", outcome.message);
    // With the structure over 0+600 (104.6, underside 105.1) a length exists:
    // about 213.5 m (derived), so 215 m at the 5 m increment, and the whole
    // check then passes.
    let (fitted, outcomes) =
        gradewright_geometry::lengthen_to_clear(&profile, &criteria, &[bridge(600.0, 104.6)], &[1], 5.0);
    let outcome = outcomes.first().unwrap_or_else(|| panic!("an outcome"));
    assert!(outcome.cleared, "{}", outcome.message);
    assert_close(outcome.new_length, 215.0, 1e-9, "the shortest length at the increment");
    let after = gradewright_geometry::Analysis::of(&gradewright_geometry::Design {
        pvis: fitted.pvis,
        ..design(vec![bridge(600.0, 104.6)])
    });
    assert!(!after.has_failures(), "{:?}", after.report.findings);
}
