//! Editing: cells, criteria, drags, undo, insertion, the table.

use super::*;

#[test]
fn typing_a_longer_length_fixes_the_failing_crest() {
    let mut h = demo();
    let before = crest_check(&h);
    assert!(!before.ok);
    assert_eq!(before.curve.kind, CurveKind::Crest);
    // K, exact SSD length, and sight distance both ways: four failing findings,
    // shown in the findings list, plus the status cell of PVI 4.
    let fails =
        h.state().analysis().report.findings.iter().filter(|f| f.severity() == Severity::Fail).count();
    assert_eq!(fails, 4);
    assert_eq!(h.query_all_by_label("✖ fail").count(), 1 + fails, "one status cell and the findings");
    replace_text(&mut h, "PVI 4 curve length", "140");
    let after = crest_check(&h);
    assert!((after.curve.length() - 140.0).abs() < 1e-9, "{}", after.curve.length());
    // K = 140/5 = 28 ≥ 26: the status turns to ok.
    assert!((after.curve.k().unwrap_or(0.0) - 28.0).abs() < 1e-9);
    assert!(after.ok);
    assert!(!h.state().analysis().report.has_failures());
    assert_eq!(h.query_all_by_label("✖ fail").count(), 0);
    // One undo step brings back the failing length.
    h.state_mut().push(Action::Undo);
    h.run();
    assert!((crest_check(&h).curve.length() - 90.0).abs() < 1e-9);
}

#[test]
fn a_bad_entry_is_refused_in_place_and_never_reaches_the_model() {
    let mut h = demo();
    let project = h.state().project().clone();
    replace_text(&mut h, "PVI 4 curve length", "-20");
    assert_eq!(h.state().project(), &project);
    assert!(h.query_by_label_contains("invalid").is_some(), "invalid mark shown");
    replace_text(&mut h, "PVI 3 station", "abc");
    assert_eq!(h.state().project(), &project);
    // A station past its neighbour is refused too (it would reorder PVIs).
    replace_text(&mut h, "PVI 3 station", "1+200");
    assert_eq!(h.state().project(), &project);
}

#[test]
fn raising_the_design_speed_flags_a_curve() {
    let mut h = demo();
    let sag_at_pvi_3 = |h: &Harness<'_, GradewrightApp>| {
        h.state().analysis().report.curves.iter().find(|c| c.curve.index == 2).map(|c| c.ok)
    };
    assert_eq!(sag_at_pvi_3(&h), Some(true));
    replace_text(&mut h, "Design speed value", "100");
    assert_eq!(h.state().project().criteria.design_speed, Some(100.0));
    // 100 km/h: sag K 45 (AASHTO metric Table 3-36, from memory); 160/4 = 40 < 45.
    assert_eq!(sag_at_pvi_3(&h), Some(false));
    let flagged = h
        .state()
        .analysis()
        .report
        .findings
        .iter()
        .any(|f| f.code == FindingCode::SagKMin && f.pvi == Some(2));
    assert!(flagged);
}

#[test]
fn dragging_a_pvi_moves_it_and_one_undo_restores_it_exactly() {
    let mut h = demo();
    let original = h.state().project().clone();
    let pvi = original.pvis[2];
    let transform =
        h.state().panels.plot.last_transform().copied().unwrap_or_else(|| panic!("plot not shown"));
    let from = transform.position_from_point(&PlotPoint::new(pvi.station.0, pvi.elevation));
    let to = from + egui::vec2(25.0, -40.0);
    h.hover_at(from);
    h.run();
    h.drag_at(from);
    h.run();
    for step in 1..=5u8 {
        let t = f32::from(step) / 5.0;
        h.hover_at(from + (to - from) * t);
        h.step();
    }
    // Live: the model follows the pointer during the drag.
    let moving = h.state().project().pvis[2];
    assert!(moving.elevation > pvi.elevation + 0.5, "{} vs {}", moving.elevation, pvi.elevation);
    h.drop_at(to);
    h.run();
    let moved = h.state().project().pvis[2];
    assert!(moved.elevation > pvi.elevation + 0.5);
    assert!(moved.station.0 > pvi.station.0, "station follows the pointer too");
    // The plot did not pan: the same point maps to the same place.
    let after = h.state().panels.plot.last_transform().copied().unwrap_or_else(|| panic!("plot not shown"));
    let same = after.position_from_point(&PlotPoint::new(pvi.station.0, pvi.elevation));
    assert!((same - from).length() < 0.5, "plot panned by {:?}", same - from);
    // The whole drag is one undo step.
    h.state_mut().push(Action::Undo);
    h.run();
    assert_eq!(h.state().project(), &original);
    h.state_mut().push(Action::Redo);
    h.run();
    assert_eq!(h.state().project().pvis[2], moved);
}

#[test]
fn a_dragged_pvi_stops_at_its_neighbours() {
    let mut h = demo();
    let app = h.state_mut();
    app.begin_drag(2);
    app.drag_to(2, 5000.0, 216.6);
    app.end_drag();
    let p = app.project();
    let next = p.pvis[3];
    // PVI 3's curve (160 m) and PVI 4's (90 m) may touch but not overlap.
    let pvt = p.pvis[2].station.0 + p.pvis[2].curve.length_out();
    assert!(pvt <= next.station.0 - next.curve.length_in() + 1e-6);
    assert!(p.profile().problems().is_empty());
}

#[test]
fn delete_and_insert_keep_at_least_two_pvis() {
    let mut h = demo();
    let n = h.state().project().pvis.len();
    h.state_mut().selected = Some(1);
    h.state_mut().push(Action::DeleteSelected);
    h.run();
    assert_eq!(h.state().project().pvis.len(), n - 1);
    for _ in 0..10 {
        h.state_mut().selected = Some(0);
        h.state_mut().push(Action::DeleteSelected);
        h.run();
    }
    assert_eq!(h.state().project().pvis.len(), 2);
    h.state_mut().selected = Some(0);
    h.state_mut().push(Action::InsertAfterSelected);
    h.run();
    assert_eq!(h.state().project().pvis.len(), 3);
    assert!(h.state().project().profile().problems().is_empty());
}

#[test]
fn findings_list_and_cautions_are_shown() {
    let mut h = demo();
    let fails =
        h.state().analysis().report.findings.iter().filter(|f| f.severity() == Severity::Fail).count();
    assert_eq!(fails, 4);
    for code in ["crest.k-min", "crest.ssd-length", "sight.forward", "sight.backward"] {
        assert!(h.query_by_label_contains(code).is_some(), "{code}");
    }
    assert!(h.query_by_label_contains("licensed engineer").is_some());
    h.state_mut().push(Action::ToggleAbout);
    h.run();
    assert!(h.query_by_label_contains("licensed professional engineer").is_some());
    let _ = h.get_all_by_role(Role::TextInput).count();
}

#[test]
fn lengthen_all_failing_clears_the_demo_in_one_undo_step() {
    let mut h = demo();
    let original = h.state().project().clone();
    h.get_by_label("All failing").click();
    h.run();
    // K 26 · A 5 = 130 m (AASHTO metric Table 3-34 at 80 km/h, from memory).
    assert!((crest_check(&h).curve.length() - 130.0).abs() < 1e-9);
    assert!(!h.state().analysis().report.has_failures(), "{:?}", h.state().analysis().report.findings);
    let notice = h.state().notice.clone().map(|n| n.text).unwrap_or_default();
    assert!(notice.contains("lengthened from 90.00 m to 130.00 m"), "{notice}");
    h.state_mut().push(Action::Undo);
    h.run();
    assert_eq!(h.state().project(), &original);
}

/// While a PVI is dragged only the stretch it can affect is recomputed; the
/// result must equal a full computation.
#[test]
fn incremental_sight_distance_equals_a_full_computation() {
    for index in 0..6 {
        let mut h = demo();
        let app = h.state_mut();
        let pvi = app.project().pvis[index];
        app.begin_drag(index);
        for k in 0..5 {
            let k = f64::from(k);
            app.drag_to(index, pvi.station.0 + 7.0 * k, pvi.elevation + 0.9 * k);
        }
        app.end_drag();
        let full = gradewright_geometry::Analysis::of(&app.project().design());
        assert!(app.analysis().sight().is_some());
        assert_eq!(app.analysis().sight(), full.sight(), "PVI {}", index + 1);
        assert_eq!(app.analysis().report.findings, full.report.findings, "PVI {}", index + 1);
    }
}

/// Ctrl+Shift+Z redoes (it must not be taken for Ctrl+Z, common practice).
#[test]
fn keyboard_undo_and_redo() {
    let mut h = demo();
    replace_text(&mut h, "PVI 4 curve length", "150");
    let edited = h.state().project().clone();
    h.key_press_modifiers(egui::Modifiers::COMMAND, egui::Key::Z);
    h.run();
    assert!((crest_check(&h).curve.length() - 90.0).abs() < 1e-9);
    h.key_press_modifiers(egui::Modifiers::COMMAND | egui::Modifiers::SHIFT, egui::Key::Z);
    h.run();
    assert_eq!(h.state().project(), &edited);
    h.key_press_modifiers(egui::Modifiers::COMMAND, egui::Key::Z);
    h.run();
    h.key_press_modifiers(egui::Modifiers::COMMAND, egui::Key::Y);
    h.run();
    assert_eq!(h.state().project(), &edited);
}

/// Typing a project name letter by letter is one undo step.
#[test]
fn renaming_is_one_undo_step() {
    let mut h = demo();
    let original = h.state().project().name.clone();
    for name in ["N", "Ne", "New"] {
        h.state_mut().apply_edit(gradewright::gui::Edit::SetName(name.to_owned()));
    }
    h.state_mut().push(Action::Undo);
    h.run();
    assert_eq!(h.state().project().name, original);
}

/// The PVI table's own column names, one severity word everywhere, and the
/// sag rule in force shown beside the criteria (it follows the lighting).
#[test]
fn table_names_severity_word_and_sag_rule_are_shown() {
    let mut h = demo();
    for header in ["g1 back (%)", "g2 ahead (%)", "L back", "L ahead"] {
        assert!(h.query_by_label(header).is_some(), "{header}");
    }
    for old in ["Grade in", "Grade out", "L in", "L out"] {
        assert!(h.query_by_label(old).is_none(), "{old} still shown");
    }
    assert!(h.query_by_label_contains("headlight sight distance (unlit road)").is_some());
    let mut criteria = h.state().project().criteria.clone();
    criteria.headlight_check = false;
    h.state_mut().apply_edit(gradewright::gui::Edit::SetCriteria(Box::new(criteria)));
    h.run();
    assert!(h.query_by_label_contains("comfort (lit road)").is_some());
    // Severity: "info" on screen as in the CLI and JSON, never "note".
    let mut project = h.state().project().clone();
    // PVI 3 moved onto the line between its neighbours: its curve is not needed.
    let (a, b) = (project.pvis[1], project.pvis[3]);
    let t = (project.pvis[2].station - a.station) / (b.station - a.station);
    project.pvis[2].elevation = a.elevation + t * (b.elevation - a.elevation);
    h.state_mut().apply_edit(gradewright::gui::Edit::Replace(Box::new(project)));
    h.run();
    assert!(h.state().analysis().report.findings.iter().any(|f| f.severity() == Severity::Info));
    assert!(h.query_all_by_label("ℹ info").count() >= 1);
    assert!(h.query_by_label_contains("1 info").is_some(), "the findings count says info");
    assert_eq!(h.query_all_by_label("ℹ note").count(), 0);
}

/// A refused entry's mark sits inside its own cell: the cells after it in the
/// row stay under their headings.
#[test]
fn an_invalid_cell_does_not_shift_its_row() {
    let mut h = demo();
    let before = h.get_by_label("PVI 3 curve length").rect().left();
    replace_text(&mut h, "PVI 3 elevation", "abc");
    assert!(h.query_by_label_contains("invalid").is_some(), "invalid mark shown");
    let heading = h.get_by_label("Curve L (m)").rect().left();
    let after = h.get_by_label("PVI 3 curve length").rect().left();
    // The column may widen to make room for the mark, but the cell stays in
    // its column: at or right of its heading, and not a whole column over.
    assert!(after >= heading - 1.0, "{after} vs heading {heading}");
    let next_heading = h.get_by_label("L back").rect().left();
    assert!(after < next_heading, "{after} is under the next heading {next_heading} (was {before})");
}

/// Snap is on by default: a drag lands on a whole metre and a hundredth.
#[test]
fn a_snapped_drag_lands_on_whole_units() {
    let mut h = demo();
    assert!(h.state().project().snap.on, "snap is on by default");
    drag_pvi(&mut h, 2, egui::vec2(23.0, -37.0), egui::Modifiers::NONE);
    let p = h.state().project().pvis[2];
    assert!((p.station.0 - p.station.0.round()).abs() < 1e-9, "station {}", p.station.0);
    let hundredths = p.elevation * 100.0;
    assert!((hundredths - hundredths.round()).abs() < 1e-6, "elevation {}", p.elevation);
    assert!((p.station.0 - 700.0).abs() > 0.5, "it moved along the station too");
}

/// Holding Shift drags up and down only: the station stays exactly.
#[test]
fn a_vertical_only_drag_keeps_the_station_exactly() {
    let mut h = demo();
    let before = h.state().project().pvis[2];
    drag_pvi(&mut h, 2, egui::vec2(40.0, -40.0), egui::Modifiers::SHIFT);
    let after = h.state().project().pvis[2];
    assert_eq!(after.station.0.to_bits(), before.station.0.to_bits());
    assert!(after.elevation > before.elevation + 0.5, "{} vs {}", after.elevation, before.elevation);
}

/// Selecting a row never moves the view; Zoom to selection does.
#[test]
fn selecting_a_row_leaves_the_view_unchanged() {
    let mut h = demo();
    let before = *h.state().panels.plot.last_transform().copied().unwrap_or_else(|| panic!("plot")).bounds();
    h.get_by_label("2").click();
    h.run();
    assert_eq!(h.state().selected, Some(1));
    let after = *h.state().panels.plot.last_transform().copied().unwrap_or_else(|| panic!("plot")).bounds();
    assert_eq!(format!("{before:?}"), format!("{after:?}"));
    h.get_by_label("Zoom to selection").click();
    h.run();
    let zoomed = *h.state().panels.plot.last_transform().copied().unwrap_or_else(|| panic!("plot")).bounds();
    assert_ne!(format!("{before:?}"), format!("{zoomed:?}"));
}

/// Typing a K sets the length to K·A: 30 m/% on the demo's A = 5 % crest
/// gives 150 m (K = L/A, Green Book 2018 §3.4.6).
#[test]
fn typing_k_sets_the_length() {
    let mut h = demo();
    replace_text(&mut h, "PVI 4 K", "30");
    let curve = crest_check(&h);
    assert!((curve.curve.length() - 150.0).abs() < 1e-9, "{}", curve.curve.length());
    assert!(curve.ok);
}

/// Typing the grade ahead moves the next PVI's elevation on that grade.
#[test]
fn typing_a_grade_sets_the_next_elevation() {
    let mut h = demo();
    let (a, b) = (h.state().project().pvis[0], h.state().project().pvis[1]);
    replace_text(&mut h, "PVI 1 grade ahead", "+2.0");
    let moved = h.state().project().pvis[1];
    assert!((moved.elevation - (a.elevation + 0.02 * (b.station - a.station))).abs() < 1e-9);
    assert_eq!(moved.station, b.station);
}

/// "Make symmetric" turns the demo's 60/80 m curve at PVI 5 into a 140 m
/// symmetric one, one undo step; the table marks unequal curves.
#[test]
fn make_symmetric_from_the_table() {
    let mut h = demo();
    assert!(h.query_by_label("⚖ unequal").is_some());
    h.get_by_label("Make symmetric").click();
    h.run();
    let curve = h.state().project().pvis[4].curve;
    assert_eq!(curve, gradewright_geometry::VerticalCurve::Symmetric { length: 140.0 });
    assert!(h.query_by_label("⚖ unequal").is_none());
    h.state_mut().push(Action::Undo);
    h.run();
    assert!(matches!(h.state().project().pvis[4].curve, gradewright_geometry::VerticalCurve::Unequal { .. }));
}

/// A PVI inserted on a tangent starts with a curve that passes: the minimum
/// length (0.6V = 48 m at 80 km/h, the Green Book's appearance rule; from
/// memory) rounded up to the 5 m increment, 50 m; the status line says so.
#[test]
fn an_inserted_pvi_gets_a_passing_curve() {
    let mut h = demo();
    h.get_by_label("1").click();
    h.run();
    h.get_by_label("Insert after selected").click();
    h.run();
    let project = h.state().project().clone();
    assert_eq!(project.pvis.len(), 7);
    let new = project.pvis[1];
    assert!((new.curve.length() - 50.0).abs() < 1e-9, "{:?}", new.curve);
    assert!(h.state().analysis().report.worst_at(1) != Some(Severity::Fail));
    let notice = h.state().notice.clone().map(|n| n.text).unwrap_or_default();
    assert!(notice.contains("50.00 m curve") && notice.contains("minimum length"), "{notice}");
    // The next edit clears the message.
    replace_text(&mut h, "PVI 4 curve length", "95");
    assert!(h.state().notice.is_none(), "{:?}", h.state().notice);
}

/// Typing a point the tangent must pass through (station = elevation) sets
/// the grade ahead through it: from PVI 1 at 0+000 / 212.400 through
/// 0+100 / 215.400 is +3 %, which puts PVI 2 (0+320) at 222.000.
#[test]
fn typing_a_point_on_the_tangent_sets_the_grade() {
    let mut h = demo();
    replace_text(&mut h, "PVI 1 grade ahead", "0+100 = 215.4");
    let moved = h.state().project().pvis[1];
    assert!((moved.elevation - 222.0).abs() < 1e-9, "{}", moved.elevation);
}

/// The criteria-range table: adding a range is one undo step, the range's
/// speed is typed into its cell, and the analysis judges under it (the
/// demo's failing crest at PVI 4 passes in a 30 km/h range over it).
#[test]
fn a_criteria_range_is_added_typed_and_undone() {
    let mut h = Harness::builder().with_size([1500.0, 2400.0]).with_max_steps(12).build_ui_state(
        |ui, app: &mut GradewrightApp| app.show(ui),
        GradewrightApp::with_demo(AppFiles::new(None)),
    );
    h.run();
    assert!(!crest_check(&h).ok, "the demo's crest fails at the project's speed");
    h.get_by_label("Criteria by station range (0)").click();
    h.run();
    h.get_by_label("Add criteria range").click();
    h.run();
    assert_eq!(h.state().project().criteria_ranges.len(), 1);
    // Over the whole road, at 30 km/h.
    let first = h.state().project().pvis.first().map_or(0.0, |p| p.station.0);
    let last = h.state().project().pvis.last().map_or(0.0, |p| p.station.0);
    let at = |s: f64| gradewright_geometry::format_station(s, gradewright_geometry::Units::Metric, 3);
    replace_text(&mut h, "Range 1 from", &at(first));
    replace_text(&mut h, "Range 1 to", &at(last));
    replace_text(&mut h, "Range 1 design speed", "30");
    let range = h.state().project().criteria_ranges[0].clone();
    assert_eq!(range.design_speed, Some(30.0));
    assert!(crest_check(&h).ok, "judged at 30 km/h the crest passes: {:?}", crest_check(&h));
    for _ in 0..4 {
        h.state_mut().push(Action::Undo);
        h.run();
    }
    assert!(h.state().project().criteria_ranges.is_empty());
    assert!(!crest_check(&h).ok);
}
