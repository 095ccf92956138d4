//! Parabola relations and a worked curve example (sources in `docs/sources.md`).

use gradewright_acceptance::{alignment, assert_close};
use gradewright_geometry::{
    Alignment, CurveKind, FindingCode, Profile, Pvi, Station, Units, VerticalCurve, format_station,
};

/// A worked crest, hand-computed (derived from the parabola relations in
/// Mannering & Washburn, ch. 3): PVI 32+00.00 at 842.60 ft, grades +3.0 % /
/// −2.0 %, L = 400 ft. PVC 30+00 at 842.60 − 0.03·200 = 836.600, PVT 34+00 at
/// 842.60 − 0.02·200 = 838.600; y = 836.60 + 0.03x − 0.05x²/800 and
/// g = 3.0 − 5.0·x/400 % at x ft from the PVC.
#[test]
fn a_worked_crest_station_elevations_and_grades() {
    let a =
        alignment(Units::UsCustomary, &[(2600.0, 824.6, 0.0), (3200.0, 842.6, 400.0), (3800.0, 830.6, 0.0)]);
    let curve = a.curves()[0];
    assert_eq!(format_station(curve.pvc.0, Units::UsCustomary, 2), "30+00.00");
    assert_close(curve.pvc_elevation, 836.6, 1e-9, "PVC elevation (derived)");
    assert_eq!(format_station(curve.pvt.0, Units::UsCustomary, 2), "34+00.00");
    assert_close(curve.pvt_elevation, 838.6, 1e-9, "PVT elevation (derived)");
    // x = 100, 200, 300 ft: 836.60 + 3 − 0.625, + 6 − 2.5, + 9 − 5.625.
    for (station, elevation, grade) in
        [(3100.0, 838.975, 1.75), (3200.0, 840.1, 0.5), (3300.0, 839.975, -0.75)]
    {
        let s = a.sample(Station(station)).unwrap_or_else(|e| panic!("{e}"));
        assert_close(s.elevation, elevation, 1e-9, "elevation (derived)");
        assert_close(s.grade_percent, grade, 1e-9, "grade (derived)");
    }
    // High point, derived from x = g1·L/(g1 − g2) = 3·400/5 = 240 ft: 32+40.00
    // at 836.60 + 7.2 − 3.6 = 840.200.
    let (station, elevation) = curve.turning.unwrap_or_else(|| panic!("no high point"));
    assert_close(station.0, 3240.0, 1e-9, "high point station (derived)");
    assert_close(elevation, 840.2, 1e-9, "high point elevation (derived)");
    assert_eq!(curve.kind, CurveKind::Crest);
}

/// Elevation y = y_PVC + g1·x/100 + (g2 − g1)·x²/(200L) and grade
/// g = g1 + (g2 − g1)·x/L at every metre (Mannering & Washburn ch. 3; grade
/// derived by differentiating).
#[test]
fn closed_form_elevation_and_grade_metric() {
    let (g1, g2, l) = (-2.2, 3.4, 180.0);
    let a = alignment(Units::Metric, &[(0.0, 105.5, 0.0), (400.0, 96.7, l), (900.0, 113.7, 0.0)]);
    let c = a.curves()[0];
    assert_close(c.grade_in_percent, g1, 1e-12, "g1");
    assert_close(c.grade_out_percent, g2, 1e-12, "g2");
    // PVC/PVT (Mannering & Washburn ch. 3): elev_PVC = elev_PVI − g1·L/200, elev_PVT = elev_PVI + g2·L/200.
    assert_close(c.pvc_elevation, 96.7 - g1 * l / 200.0, 1e-9, "PVC elevation");
    assert_close(c.pvt_elevation, 96.7 + g2 * l / 200.0, 1e-9, "PVT elevation");
    for step in 0..=180 {
        let x = f64::from(step);
        let s = a.sample(c.pvc + x).unwrap_or_else(|e| panic!("{e}"));
        let y = c.pvc_elevation + g1 * x / 100.0 + (g2 - g1) * x * x / (200.0 * l);
        assert_close(s.elevation, y, 1e-9, "elevation (Mannering & Washburn ch. 3)");
        assert_close(s.grade_percent, g1 + (g2 - g1) * x / l, 1e-9, "grade (derived)");
    }
    // r = (g2 − g1)/L, K = L/A, E = A·L/800, offset Y = A·x²/(200L) (Mannering &
    // Washburn ch. 3; Green Book 2018 §3.4.6, K = L/A).
    let (r1, r2) = c.rates_percent();
    assert_close(r1, (g2 - g1) / l, 1e-12, "r");
    assert_close(r2, (g2 - g1) / l, 1e-12, "r");
    assert_close(c.k().unwrap_or(f64::NAN), l / 5.6, 1e-9, "K = L/A (Green Book 2018 §3.4.6)");
    assert_close(c.external(), 5.6 * l / 800.0, 1e-9, "E = A·L/800 (derived)");
    let x = 50.0;
    let tangent = c.pvc_elevation + g1 * x / 100.0;
    let s = a.sample(c.pvc + x).unwrap_or_else(|e| panic!("{e}"));
    assert_close(s.elevation - tangent, 5.6 * x * x / (200.0 * l), 1e-9, "offset (Mannering Ex 3.3 form)");
    // Sag low point at x = g1·L/(g1 − g2) (derived).
    let (low, _) = c.turning.unwrap_or_else(|| panic!("no low point"));
    assert_close(low - c.pvc, g1 * l / (g1 - g2), 1e-9, "low point");
}

/// Unequal-tangent curve (derived from the equal-tangent relations): offset at the PVI
/// e = l1·l2·(g2 − g1)/(2L), grade at the CVC g_c = (l1·g1 + l2·g2)/L, branch
/// elevations tangent + e·(x/l1)² and y_PVT − g2·x' + e·(x'/l2)². The curve is
/// an invented test case: PVI 63+00 at 1302.25 ft,
/// lengthIn 200, lengthOut 300, grades −3.5 % / +2.0 %.
#[test]
fn unequal_tangent_branches() {
    let pvis = vec![
        Pvi::new(5700.0, 1323.25),
        Pvi {
            station: Station(6300.0),
            elevation: 1302.25,
            curve: VerticalCurve::Unequal { length_in: 200.0, length_out: 300.0 },
        },
        Pvi::new(6900.0, 1314.25),
    ];
    let a = Alignment::new(&Profile::new(Units::UsCustomary, pvis)).unwrap_or_else(|e| panic!("{e:?}"));
    let c = a.curves()[0];
    let (g1, g2, l1, l2) = (-0.035, 0.02, 200.0, 300.0);
    let l = l1 + l2;
    let e = l1 * l2 * (g2 - g1) / (2.0 * l);
    assert_close(c.offset_at_pvi, e, 1e-9, "e at PVI (derived)");
    let cvc = a.sample(Station(6300.0)).unwrap_or_else(|e| panic!("{e}"));
    assert_close(cvc.elevation, 1302.25 + e, 1e-9, "CVC elevation");
    assert_close(cvc.grade_percent, (l1 * g1 + l2 * g2) / l * 100.0, 1e-9, "g_c (derived)");
    let y_pvc = 1302.25 - g1 * l1;
    let y_pvt = 1302.25 + g2 * l2;
    for step in 0..=20 {
        let x = 10.0 * f64::from(step);
        let s = a.sample(Station(6100.0 + x)).unwrap_or_else(|e| panic!("{e}"));
        assert_close(s.elevation, y_pvc + g1 * x + e * (x / l1).powi(2), 1e-9, "branch 1");
    }
    for step in 0..=30 {
        let xp = 10.0 * f64::from(step);
        let s = a.sample(Station(6600.0 - xp)).unwrap_or_else(|e| panic!("{e}"));
        assert_close(s.elevation, y_pvt - g2 * xp + e * (xp / l2).powi(2), 1e-9, "branch 2");
    }
    // Low point: on branch 2 at x = l1 − g_c/r2 from the PVC (derived).
    let gc = (l1 * g1 + l2 * g2) / l;
    let r2 = l1 * (g2 - g1) / (l2 * l);
    let (low, _) = c.turning.unwrap_or_else(|| panic!("no low point"));
    assert_close(low.0 - 6100.0, l1 - gc / r2, 1e-9, "turning point on branch 2");
}

/// Stations outside the profile are an error, never an extrapolation.
#[test]
fn outside_the_profile_is_an_error() {
    let a = alignment(Units::Metric, &[(100.0, 50.0, 0.0), (300.0, 52.0, 0.0)]);
    assert!(a.sample(Station(99.999)).is_err());
    assert!(a.sample(Station(300.001)).is_err());
    assert!(a.sample(Station(f64::NAN)).is_err());
    assert!(a.sample(Station(300.0)).is_ok());
}

/// Validation reports every problem at once (common practice).
#[test]
fn validation_lists_every_problem() {
    let pvis = vec![
        Pvi::with_curve(0.0, 10.0, 40.0),    // curve at the first PVI
        Pvi::with_curve(100.0, 12.0, 120.0), // overlaps the next
        Pvi::with_curve(200.0, 11.0, 100.0),
        Pvi::new(150.0, f64::NAN), // out of order and not finite
    ];
    let problems = Profile::new(Units::Metric, pvis).problems();
    let codes: Vec<_> = problems.iter().map(gradewright_geometry::ProfileProblem::code).collect();
    assert!(codes.contains(&FindingCode::ProfileCurveAtEnd), "{codes:?}");
    assert!(codes.contains(&FindingCode::ProfileNotFinite), "{codes:?}");
    assert_eq!(Profile::new(Units::Metric, vec![Pvi::new(0.0, 1.0)]).problems().len(), 1);
    let overlapping = vec![
        Pvi::new(0.0, 10.0),
        Pvi::with_curve(100.0, 12.0, 120.0),
        Pvi::with_curve(200.0, 11.0, 100.0),
        Pvi::new(300.0, 12.0),
    ];
    let problems = Profile::new(Units::Metric, overlapping).problems();
    assert!(problems.iter().any(|p| p.code() == FindingCode::CurveOverlap), "{problems:?}");
}
