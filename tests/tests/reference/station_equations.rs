//! Station equations, worked by hand. A station equation at internal
//! station I says that the plan station just behind it (back) is the same
//! point as the plan station ahead (LandXML 1.2 schema, `StaEquation`:
//! `staInternal`, `staBack`, `staAhead`, `staIncrement`); before the first
//! equation the plan station is the internal station, after one it is
//! ahead + (internal − I) (common practice). The geometry runs along the
//! internal station; the curve elevations below are derived from
//! y = y_PVC + g1·x + r·x²/2 with r = (g2 − g1)/L.
//!
//! The US road: internal 1000 to 3000 ft; a short equation at internal
//! 1500 (15+00.00 back = 16+00.00 ahead: plan 15+00 to 16+00 do not exist)
//! and a long one at internal 2500, where the road reaches plan 26+00.00
//! (26+00.00 back = 24+50.00 ahead: plan 24+50 to 26+00 occur twice).
//! PVIs at internal 1000 (400.00), 2000 (410.00, L = 400) and 3000 (405.00):
//! g1 = +1 %, g2 = −0.5 %, r = −0.015/400 per ft, PVC at internal 1800.
//!
//! The metric road is the same in metres: equations at internal 500
//! (0+500 back = 0+600 ahead) and 1500 (1+600 back = 1+450 ahead); PVIs at
//! 0 (100.00), 1000 (110.00, L = 300), 2000 (104.00): g1 = +1 %,
//! g2 = −0.6 %, PVC at 850.

use std::path::Path;

use gradewright_acceptance::assert_close;
use gradewright_document::Project;
use gradewright_exchange::{
    Selection, Stamp, read_controls_csv, read_landxml, write_landxml, write_station_table,
};
use gradewright_geometry::{
    Alignment, Analysis, ControlStatus, Equations, FindingCode, Ground, Profile, Pvi, Station,
    StationEquation, StationError, Units,
};

fn us() -> Equations {
    Equations::new(vec![
        StationEquation { internal: 1500.0, back: 1500.0, ahead: 1600.0 },
        StationEquation { internal: 2500.0, back: 2600.0, ahead: 2450.0 },
    ])
}

fn metric() -> Equations {
    Equations::new(vec![
        StationEquation { internal: 500.0, back: 500.0, ahead: 600.0 },
        StationEquation { internal: 1500.0, back: 1600.0, ahead: 1450.0 },
    ])
}

fn us_profile() -> Profile {
    Profile::new(
        Units::UsCustomary,
        vec![Pvi::new(1000.0, 400.0), Pvi::with_curve(2000.0, 410.0, 400.0), Pvi::new(3000.0, 405.0)],
    )
    .with_equations(us())
}

fn metric_profile() -> Profile {
    Profile::new(
        Units::Metric,
        vec![Pvi::new(0.0, 100.0), Pvi::with_curve(1000.0, 110.0, 300.0), Pvi::new(2000.0, 104.0)],
    )
    .with_equations(metric())
}

fn elevation(profile: &Profile, internal: f64) -> f64 {
    let alignment = Alignment::new(profile).unwrap_or_else(|e| panic!("{e:?}"));
    alignment.cursor().sample(Station(internal)).unwrap_or_else(|e| panic!("{e}")).elevation
}

/// Labels and elevations, US customary, written out by hand.
#[test]
fn us_labels_and_elevations_by_hand() {
    assert_eq!(us().problem(), None);
    let profile = us_profile();
    let at = profile.stationing();
    // (internal, plan label, elevation)
    let rows = [
        // Before the equations, plan = internal; on the +1 % tangent.
        (1200.0, "12+00.00", 402.0),
        // Past the short equation: 1600 + (1600 − 1500) = 1700.
        (1600.0, "17+00.00", 406.0),
        // On the curve, x = 300 from the PVC: 408 + 3 − 0.015/400·300²/2 = 409.3125.
        (2100.0, "22+00.00", 409.3125),
        // Plan 25+00.00 twice: at internal 2400 (1600 + 900) and 2550 (2450 + 50).
        // 2400: x = 600 > L, on the −0.5 % tangent: 410 − 0.005·400 = 408.
        (2400.0, "25+00.00 (1)", 408.0),
        (2550.0, "25+00.00 (2)", 407.25),
        // Plan 29+50.00 = 2450 + 500, once.
        (3000.0, "29+50.00", 405.0),
    ];
    for (internal, label, z) in rows {
        assert_eq!(at.label_std(internal), label, "internal {internal}");
        assert_close(elevation(&profile, internal), z, 1e-9, label);
        // A label typed back gives the same internal station.
        assert_eq!(at.parse(label), Ok(internal), "{label}");
    }
    // At an equation, the ahead side's label (the back one is in the marks).
    assert_eq!(at.label_std(1500.0), "16+00.00");
    assert_eq!(at.marks()[0].1, "15+00.00 back = 16+00.00 ahead");
    assert_eq!(at.parse("15+00"), Ok(1500.0));
    assert_eq!(at.parse("16+00"), Ok(1500.0));
    // Typed plan stations.
    assert_eq!(at.parse("17+00"), Ok(1600.0));
    assert_eq!(at.parse("1700"), Ok(1600.0));
    assert!(
        matches!(at.parse("15+50"), Err(StationError::InGap { ref back, ref ahead, .. }) if back == "15+00.00" && ahead == "16+00.00")
    );
    let ambiguous = at.parse("25+00");
    assert!(
        matches!(ambiguous, Err(StationError::Ambiguous { ref choices, .. }) if choices == &["25+00.00 (1)", "25+00.00 (2)"]),
        "{ambiguous:?}"
    );
    assert!(ambiguous.is_err_and(|e| e.to_string().contains("say which, 25+00.00 (1) or 25+00.00 (2)")));
    assert_eq!(at.parse("25+00 (2)"), Ok(2550.0));
    assert!(matches!(at.parse("25+00 (3)"), Err(StationError::NoSuchOccurrence { count: 2, .. })));
    // The grid restarts on even stations ahead of each equation.
    assert_eq!(at.even(1000.0, 1800.0, 250.0), vec![1000.0, 1250.0, 1500.0, 1650.0]);
    assert_eq!(at.even(2400.0, 2700.0, 100.0), vec![2400.0, 2500.0, 2550.0, 2650.0]);
}

/// The same by hand in metres.
#[test]
fn metric_labels_and_elevations_by_hand() {
    assert_eq!(metric().problem(), None);
    let profile = metric_profile();
    let at = profile.stationing();
    let rows = [
        (300.0, "0+300.000", 103.0),
        // 600 + (600 − 500) = 700.
        (600.0, "0+700.000", 106.0),
        // x = 250 from the PVC: 108.5 + 2.5 − (0.016/300)·250²/2 = 109.333….
        (1100.0, "1+200.000", 111.0 - 0.016 / 300.0 * 250.0 * 250.0 / 2.0),
        // Plan 1+500 twice: internal 1400 (600 + 800) and 1550 (1450 + 50).
        // 1400: past the PVT (1150), on −0.6 %: 110 − 0.006·400 = 107.6.
        (1400.0, "1+500.000 (1)", 107.6),
        (1550.0, "1+500.000 (2)", 110.0 - 0.006 * 550.0),
        (2000.0, "1+950.000", 104.0),
    ];
    for (internal, label, z) in rows {
        assert_eq!(at.label_std(internal), label, "internal {internal}");
        assert_close(elevation(&profile, internal), z, 1e-9, label);
        assert_eq!(at.parse(label), Ok(internal), "{label}");
    }
    assert!(matches!(at.parse("0+550"), Err(StationError::InGap { .. })));
    assert!(matches!(at.parse("1+500"), Err(StationError::Ambiguous { .. })));
    assert_eq!(at.parse("1+500 (1)"), Ok(1400.0));
}

/// A station table gives a row for each side of an equation (same point,
/// same elevation) and plan labels everywhere.
#[test]
fn a_table_has_a_row_for_each_side() {
    let alignment = Alignment::new(&us_profile()).unwrap_or_else(|e| panic!("{e:?}"));
    let mut out = Vec::new();
    write_station_table(&mut out, &alignment, &Ground::default(), &[1400.0, 1500.0, 1600.0], Some(2))
        .unwrap_or_else(|e| panic!("{e}"));
    let text = String::from_utf8(out).unwrap_or_else(|e| panic!("{e}"));
    let rows: Vec<&str> = text.lines().skip(1).collect();
    assert_eq!(
        rows,
        [
            "1400.00,14+00.00,404.00,1.00",
            "1500.00,15+00.00,405.00,1.00",
            "1500.00,16+00.00,405.00,1.00",
            "1600.00,17+00.00,406.00,1.00"
        ]
    );
}

/// A culvert typed at plan station 17+00 (US survey feet, the issue's
/// equation 15+00 back = 16+00 ahead at internal 1500) is checked at
/// internal 1600, where the profile is 406.00 by hand: a fixed elevation
/// of 405.00 (no tolerance) is missed by 1.00 ft (at internal 1700, where the
/// station would be without the equation, the profile is 407.00).
#[test]
fn a_control_typed_at_a_plan_station_is_checked_there() {
    let mut project = Project::new("Culvert test", Units::UsCustomary);
    project.pvis = us_profile().pvis;
    project.equations = us();
    project.criteria.design_speed = Some(45.0);
    let csv = "station,kind,elevation,tolerance,name\n17+00,fixed,405.00,0,Culvert\n";
    project.controls =
        read_controls_csv(csv.as_bytes(), Path::new("c.csv"), project.equations.stationing(project.units))
            .unwrap_or_else(|e| panic!("{e}"));
    assert_eq!(project.controls[0].station.to_bits(), 1600.0_f64.to_bits());
    let analysis = Analysis::once(&project.design());
    assert!(
        matches!(analysis.control_status[0], ControlStatus::Missed(z, miss) if (z - 406.0).abs() < 1e-9 && (miss - 1.0).abs() < 1e-9),
        "{:?}",
        analysis.control_status
    );
    let finding = analysis
        .report
        .findings
        .iter()
        .find(|f| f.code == FindingCode::ControlFixed)
        .unwrap_or_else(|| panic!("no control finding: {:?}", analysis.report.findings));
    assert!(finding.message.contains("17+00.00"), "{}", finding.message);
    // In a gap the station is refused, naming the line and field.
    let gap = "station,kind,elevation\n15+50,fixed,405\n";
    let err =
        read_controls_csv(gap.as_bytes(), Path::new("c.csv"), project.equations.stationing(project.units));
    assert!(err.is_err_and(|e| e.to_string().contains("c.csv:2: station") && e.to_string().contains("gap")));
}

/// LandXML keeps the equations both ways: a project written fresh has its
/// `StaEquation`s (and validates against the schema); read back, they are
/// the same; a kept file whose equations changed has them replaced.
#[test]
fn landxml_keeps_the_equations() {
    let mut project = Project::new("Equation_test", Units::UsCustomary);
    project.pvis = us_profile().pvis;
    project.equations = us();
    let mut out = Vec::new();
    let stamp = Stamp { date: "2026-12-04".to_owned(), time: "12:00:00".to_owned() };
    write_landxml(&mut out, &project, &stamp).unwrap_or_else(|e| panic!("{e}"));
    let text = String::from_utf8(out).unwrap_or_else(|e| panic!("{e}"));
    assert!(
        text.contains(
            r#"<StaEquation staInternal="1500" staBack="1500" staAhead="1600" staIncrement="increasing"/>"#
        ),
        "{text}"
    );
    super::landxml_kept::validates(&text, "equations.xml");
    let read = read_landxml(text.as_bytes(), Path::new("e.xml"), &Selection::default(), None)
        .unwrap_or_else(|e| panic!("{e}"));
    assert_eq!(read.project().equations, project.equations);
    // Kept: the file's one equation replaced by two.
    let mut kept = read.project();
    kept.equations = metric_like_us();
    let mut out = Vec::new();
    write_landxml(&mut out, &kept, &stamp).unwrap_or_else(|e| panic!("{e}"));
    let again = String::from_utf8(out).unwrap_or_else(|e| panic!("{e}"));
    super::landxml_kept::validates(&again, "equations-kept.xml");
    let read = read_landxml(again.as_bytes(), Path::new("e.xml"), &Selection::default(), None)
        .unwrap_or_else(|e| panic!("{e}"));
    assert_eq!(read.project().equations, metric_like_us());
    // An equation whose back station is not where the road is: refused with its line.
    let bad = text.replace(r#"staBack="1500""#, r#"staBack="1490""#);
    let err = read_landxml(bad.as_bytes(), Path::new("bad.xml"), &Selection::default(), None);
    assert!(
        err.is_err_and(
            |e| e.to_string().contains("StaEquation") && e.to_string().contains("back station 1490")
        )
    );
}

/// One short equation only.
fn metric_like_us() -> Equations {
    Equations::new(vec![StationEquation { internal: 1200.0, back: 1200.0, ahead: 1250.0 }])
}
