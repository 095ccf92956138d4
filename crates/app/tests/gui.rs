//! The editor driven through its real widgets with egui_kittest (no window,
//! no GPU): type into cells, change criteria, drag a PVI, undo, open files.

use egui::accesskit::Role;
use egui_kittest::Harness;
use egui_kittest::kittest::Queryable as _;
use egui_plot::PlotPoint;
use gradewright::gui::{Action, AppFiles, GradewrightApp};
use gradewright_geometry::{CurveKind, FindingCode, Severity, VerticalCurve};

fn harness(app: GradewrightApp) -> Harness<'static, GradewrightApp> {
    let mut h = Harness::builder()
        .with_size([1500.0, 950.0])
        // A new project lays out its table and plot over a few passes.
        .with_max_steps(12)
        .build_ui_state(|ui, app: &mut GradewrightApp| app.show(ui), app);
    h.run();
    h
}

fn demo() -> Harness<'static, GradewrightApp> {
    harness(GradewrightApp::with_demo(AppFiles::new(None)))
}

/// The demo's crest at PVI 4 (index 3): K = 90/5 = 18 < 26, the AASHTO metric
/// minimum at 80 km/h (Table 3-34, from memory).
fn crest_check(h: &Harness<'_, GradewrightApp>) -> gradewright_geometry::CurveCheck {
    h.state()
        .analysis()
        .report
        .curves
        .iter()
        .find(|c| c.curve.index == 3)
        .cloned()
        .unwrap_or_else(|| panic!("no curve"))
}

fn replace_text(h: &mut Harness<'_, GradewrightApp>, label: &str, text: &str) {
    h.get_by_label(label).click();
    h.run();
    h.key_press_modifiers(egui::Modifiers::COMMAND, egui::Key::A);
    h.get_by_label(label).type_text(text);
    h.run();
    h.key_press(egui::Key::Enter);
    h.run();
}

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
fn opening_a_malformed_file_shows_the_error_and_keeps_the_work() {
    let dir = std::env::temp_dir().join(format!("gradewright-gui-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap_or_else(|e| panic!("{e}"));
    let bad = dir.join("broken.ron");
    std::fs::write(&bad, "Project(\n  format_version: 1,\n  units: Metric\n  pvis: [],\n)\n")
        .unwrap_or_else(|e| panic!("{e}"));
    let mut h = demo();
    replace_text(&mut h, "PVI 4 curve length", "150");
    let work = h.state().project().clone();
    h.state_mut().push(Action::Open(Some(bad.clone())));
    h.run();
    // Unsaved changes are asked about first; discard to go ahead.
    h.get_by_label("Discard changes").click();
    h.run();
    assert_eq!(h.state().project(), &work, "the current work is untouched");
    let notice = h.state().notice.clone().unwrap_or_else(|| panic!("no message"));
    assert!(notice.error);
    assert!(notice.text.contains("broken.ron:4:"), "{}", notice.text);
    assert!(h.query_by_label_contains("broken.ron:4:").is_some(), "the error is on screen");
}

#[test]
fn save_reopen_and_title_mark() {
    let dir = std::env::temp_dir().join(format!("gradewright-gui-save-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap_or_else(|e| panic!("{e}"));
    let path = dir.join("alder.ron");
    let mut h = demo();
    replace_text(&mut h, "PVI 4 curve length", "140");
    assert!(h.state().title().contains('●'), "{}", h.state().title());
    h.state_mut().push(Action::SaveAs(Some(path.clone())));
    h.run();
    assert!(!h.state().is_dirty());
    assert!(h.state().title().starts_with("alder.ron"), "{}", h.state().title());
    let saved = h.state().project().clone();
    let mut other = harness(GradewrightApp::new(
        gradewright_document::Project::new("x", gradewright_geometry::Units::Metric),
        None,
        AppFiles::new(Some(dir.clone())),
    ));
    other.state_mut().push(Action::Open(Some(path.clone())));
    other.run();
    assert_eq!(other.state().project(), &saved);
    assert_eq!(other.state().recent().first().and_then(|p| p.file_name()), path.file_name());
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

/// Unsaved work is written to the recovery file and offered back on the next
/// start (as after a crash); recovering it restores the edit.
#[test]
fn autosave_recovery_is_offered_after_a_crash() {
    let dir = std::env::temp_dir().join(format!("gradewright-gui-recovery-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&dir);
    let mut h = harness(GradewrightApp::with_demo(AppFiles::new(Some(dir.clone()))));
    replace_text(&mut h, "PVI 4 curve length", "155");
    h.state_mut().autosave(1000.0);
    let edited = h.state().project().clone();
    drop(h); // no clean exit: the recovery file stays
    let mut again = harness(GradewrightApp::with_demo(AppFiles::new(Some(dir.clone()))));
    assert!(matches!(again.state().pending, Some(gradewright::gui::Pending::Recovery(_))));
    again.get_by_label("Recover it").click();
    again.run();
    assert_eq!(again.state().project().pvis, edited.pvis);
    assert!(again.state().is_dirty(), "recovered work still needs saving");
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

/// The editor's saves go through the same safe writer as the command line: a
/// 0600 project stays 0600 (and so does its backup), and a symbolic link
/// stays a link to the saved file.
#[cfg(unix)]
#[test]
fn editor_saves_keep_permissions_and_links() {
    use std::os::unix::fs::PermissionsExt as _;
    let dir = std::env::temp_dir().join(format!("gradewright-gui-mode-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&dir);
    std::fs::create_dir_all(&dir).unwrap_or_else(|e| panic!("{e}"));
    let real = dir.join("private.ron");
    let mut h = demo();
    assert!(h.state_mut().save_to(&real));
    std::fs::set_permissions(&real, std::fs::Permissions::from_mode(0o600)).unwrap_or_else(|e| panic!("{e}"));
    let link = dir.join("link.ron");
    std::os::unix::fs::symlink(&real, &link).unwrap_or_else(|e| panic!("{e}"));
    assert!(h.state_mut().save_to(&link));
    assert!(std::fs::symlink_metadata(&link).is_ok_and(|m| m.file_type().is_symlink()));
    for file in [real.clone(), dir.join("private.ron.bak")] {
        let mode = std::fs::metadata(&file).map(|m| m.permissions().mode() & 0o777).unwrap_or(0);
        assert_eq!(mode, 0o600, "{}", file.display());
    }
    assert!(!h.state_mut().save_to(std::path::Path::new("/dev/null")), "a device is refused");
}

/// Drags a PVI by the pointer from its place by `offset` screen points,
/// holding `modifiers`.
fn drag_pvi(
    h: &mut Harness<'_, GradewrightApp>,
    index: usize,
    offset: egui::Vec2,
    modifiers: egui::Modifiers,
) {
    let pvi = h.state().project().pvis[index];
    let transform =
        h.state().panels.plot.last_transform().copied().unwrap_or_else(|| panic!("plot not shown"));
    let from = transform.position_from_point(&PlotPoint::new(pvi.station.0, pvi.elevation));
    let to = from + offset;
    h.hover_at(from);
    h.run();
    h.drag_at(from);
    h.run();
    // Held for the whole drag, as a user holds the key.
    h.event(egui::Event::ModifiersChanged(modifiers));
    for step in 1..=5u8 {
        let t = f32::from(step) / 5.0;
        h.hover_at(from + (to - from) * t);
        h.step();
    }
    h.drop_at(to);
    h.run();
    h.event(egui::Event::ModifiersChanged(egui::Modifiers::NONE));
    h.run();
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

/// A saved project never reads `r#None`: a PVI without a curve leaves the
/// field out, and files written before still open.
#[test]
fn saved_files_have_no_raw_identifiers() {
    let text = h_text();
    assert!(!text.contains("r#None"), "{text}");
    let old = text.replacen("elevation: 212.4,\n", "elevation: 212.4,\n            curve: r#None,\n", 1);
    assert_ne!(old, text, "the first PVI is written without a curve: {text}");
    let project = gradewright_document::Project::from_ron(&old, std::path::Path::new("old.ron"))
        .unwrap_or_else(|e| panic!("{e}"));
    assert_eq!(project.pvis[0].curve, gradewright_geometry::VerticalCurve::None);
}

fn h_text() -> String {
    demo().state().project().to_ron().unwrap_or_else(|e| panic!("{e}"))
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

/// File ▸ Export sheet and tables…: the preview is the sheet that will be
/// written, the choices are kept with the project, and Export writes them.
#[test]
fn export_window_previews_and_writes_the_sheet() {
    let dir = std::env::temp_dir().join(format!("gradewright-gui-export-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&dir);
    std::fs::create_dir_all(&dir).unwrap_or_else(|e| panic!("{e}"));
    let mut h = demo();
    h.state_mut().push(Action::ShowExport);
    h.run();
    assert!(h.query_by_label_contains("Preview of sheet 1 of 1").is_some());
    let mut project = h.state().project().clone();
    project.export.path = dir.join("alder").to_string_lossy().into_owned();
    project.export.designer = "Q. Checker".to_owned();
    h.state_mut().apply_edit(gradewright::gui::Edit::Replace(Box::new(project)));
    h.run();
    h.get_by_label("Export").click();
    h.run();
    for file in [
        "alder.pdf",
        "alder.png",
        "alder-tables/curves.csv",
        "alder-tables/findings.csv",
        "alder-tables/stations.csv",
    ] {
        assert!(dir.join(file).exists(), "{file}");
    }
    let text = h.state().project().to_ron().unwrap_or_default();
    assert!(text.contains("designer: \"Q. Checker\""), "the choices are saved with the project");
}

/// File ▸ Export tables…: only the three tables are written, at the interval
/// chosen, into the folder chosen (made when it does not exist).
#[test]
fn export_tables_writes_only_the_tables() {
    let dir = std::env::temp_dir().join(format!("gradewright-gui-tables-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&dir);
    std::fs::create_dir_all(&dir).unwrap_or_else(|e| panic!("{e}"));
    let mut h = demo();
    h.get_by_label("File").click();
    h.run();
    h.get_by_label("Export tables…").click();
    h.run();
    assert!(h.state().panels.export.tables_open);
    let mut project = h.state().project().clone();
    project.export.tables_path = dir.join("hand-over").to_string_lossy().into_owned();
    project.export.interval = Some(50.0);
    h.state_mut().apply_edit(gradewright::gui::Edit::Replace(Box::new(project)));
    h.run();
    h.get_by_label("Write tables").click();
    h.run();
    let folder = dir.join("hand-over");
    let mut names: Vec<String> = std::fs::read_dir(&folder)
        .unwrap_or_else(|e| panic!("{e}"))
        .filter_map(Result::ok)
        .map(|e| e.file_name().to_string_lossy().into_owned())
        .collect();
    names.sort();
    // The demo sets a level section, so the earthwork table goes with them.
    assert_eq!(names, ["curves.csv", "earthwork.csv", "findings.csv", "stations.csv"]);
    assert!(std::fs::read_dir(&dir).unwrap_or_else(|e| panic!("{e}")).count() == 1, "no sheet written");
    // Every 50 m plus every PVC, PVI and PVT of the demo.
    let project = h.state().project().clone();
    let analysis = gradewright_geometry::Analysis::of(&project.design());
    let alignment = analysis.alignment.as_ref().unwrap_or_else(|| panic!("valid demo"));
    let expected = gradewright_exchange::interval_stations(alignment, 50.0).len();
    let mut reader = csv::Reader::from_path(folder.join("stations.csv")).unwrap_or_else(|e| panic!("{e}"));
    assert_eq!(reader.records().count(), expected);
    let _ = std::fs::remove_dir_all(&dir);
}

/// A file dropped on the window in a test (what the windowing layer hands
/// over).
#[derive(Debug)]
struct Dropped(std::path::PathBuf);

impl egui::DroppedFile for Dropped {
    fn path(&self) -> &std::path::Path {
        &self.0
    }

    fn bytes(&self) -> Result<Vec<u8>, String> {
        std::fs::read(&self.0).map_err(|e| e.to_string())
    }
}

fn site_file(name: &str, text: &str) -> std::path::PathBuf {
    let dir = std::env::temp_dir().join(format!("gradewright-gui-site-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap_or_else(|e| panic!("{e}"));
    let path = dir.join(name);
    std::fs::write(&path, text).unwrap_or_else(|e| panic!("{e}"));
    path
}

/// Re-importing the ground is one undo step; dragging a PVI afterwards never
/// copies the ground (the project, the analysis and every undo snapshot
/// share the one line), and the cut and fill follow the drag live.
#[test]
fn imported_ground_is_one_undo_step_and_never_copied_by_edits() {
    let mut h = demo();
    let demo_ground = h.state().project().ground.clone();
    let text: String = (0..=50_000)
        .map(|i| format!("{},{:.3}\n", f64::from(i) * 0.04, 215.0 + f64::from(i % 7) * 0.1))
        .collect();
    let file = site_file("dense-ground.csv", &text);
    h.state_mut().push(Action::ImportGround(Some(file)));
    h.run();
    let imported = h.state().project().ground.clone();
    assert_eq!(imported.len(), 50_001);
    assert!(h.state().analysis().ground.shares(&imported), "the analysis shares the project's ground");
    let before = h.state().analysis().cut_fill;
    // A drag of PVI 3 by 2 m, frame by frame.
    let pvi = h.state().project().pvis[2];
    h.state_mut().begin_drag(2);
    for step in 1..=10 {
        h.state_mut().drag_to(2, pvi.station.0, pvi.elevation + 0.2 * f64::from(step));
        h.step();
        assert!(h.state().project().ground.shares(&imported), "a drag frame copied the ground");
        assert!(h.state().analysis().ground.shares(&imported));
    }
    h.state_mut().end_drag();
    h.run();
    assert_ne!(h.state().analysis().cut_fill, before, "cut and fill follow the drag");
    // Undo the drag, then the import: back to the demo's ground in one step.
    h.state_mut().push(Action::Undo);
    h.run();
    assert!(h.state().project().ground.shares(&imported));
    h.state_mut().push(Action::Undo);
    h.run();
    assert_eq!(h.state().project().ground, demo_ground);
}

/// Dropping a control-points CSV on the window imports it (one undo step);
/// a missed point is a failing `control.` finding with the amount, shown
/// in the table; a bad file is refused with file, line and field, and the
/// project is untouched.
#[test]
fn a_dropped_controls_file_is_imported_and_checked() {
    let mut h = demo();
    let before = h.state().project().clone();
    let file = site_file(
        "controls.csv",
        "station,kind,elevation,tolerance,name\n1+100,max,227.0,,Power line\n0+690,min,216.9,,Alder Brook culvert cover\n",
    );
    h.get_by_label("Ground & controls").click();
    h.run();
    h.input_mut().dropped_files.push(std::sync::Arc::new(Dropped(file)));
    h.run();
    let project = h.state().project().clone();
    assert_eq!(project.controls.len(), 2);
    let finding = h
        .state()
        .analysis()
        .report
        .findings
        .iter()
        .find(|f| f.code == FindingCode::ControlMax)
        .cloned()
        .unwrap_or_else(|| panic!("no control finding"));
    assert_eq!(finding.severity(), Severity::Fail);
    assert!(finding.message.contains("above the maximum 227.000"), "{}", finding.message);
    // The road is at 228.6 − 5·90/800 = 228.0375 there (the external, E = A·L/800).
    assert!(finding.message.contains("1.037 m above"), "{}", finding.message);
    assert!(h.query_by_label_contains("✖ 1.037 m above").is_some(), "the table shows the miss");
    let bad = site_file("bad-controls.csv", "station,kind,elevation\n0+100,sideways,1\n");
    h.input_mut().dropped_files.push(std::sync::Arc::new(Dropped(bad)));
    h.run();
    assert_eq!(h.state().project(), &project, "a bad file changes nothing");
    let notice = h.state().notice.as_ref().map(|n| n.text.clone()).unwrap_or_default();
    assert!(notice.contains("bad-controls.csv:2: kind"), "{notice}");
    h.state_mut().push(Action::Undo);
    h.run();
    assert_eq!(h.state().project().controls, before.controls);
}

/// Adding a control point from the table puts it on the profile (met), and
/// the earthwork totals are on screen for the demo's level section.
#[test]
fn control_table_and_earthwork_totals_are_live() {
    let mut h = demo();
    let count = h.state().project().controls.len();
    h.get_by_label("Ground & controls").click();
    h.run();
    h.get_by_label("Add control point").click();
    h.run();
    assert_eq!(h.state().project().controls.len(), count + 1);
    assert!(matches!(
        h.state().analysis().control_status.last(),
        Some(gradewright_geometry::ControlStatus::Met(_))
    ));
    assert!(h.query_by_label_contains("Net ").is_some(), "the earthwork totals are shown");
    assert!(h.query_by_label_contains("Largest fill").is_some());
}

/// File, Open on a LandXML file (what the dialog hands over) opens its design
/// profile and ground line as a new, unsaved project in the file's units and
/// foot; dropping the file does the same; File, Export LandXML… writes a file
/// that opens back to the same profile; a file with two design profiles is
/// offered in a chooser, and the one clicked opens.
#[test]
fn a_landxml_file_opens_as_a_new_project_and_exports_back() {
    let text = r#"<?xml version="1.0" encoding="UTF-8"?>
<LandXML xmlns="http://www.landxml.org/schema/LandXML-1.2" version="1.2" date="2026-12-03" time="09:00:00">
  <Units><Imperial linearUnit="USSurveyFoot" areaUnit="squareFoot" volumeUnit="cubicYard" temperatureUnit="fahrenheit" pressureUnit="inHG"/></Units>
  <Alignments>
    <Alignment name="Heron Creek Road" staStart="1000" length="2400">
      <Profile>
        <ProfSurf name="Survey 2026"><PntList2D>1000 498.2 1800 507.9 2600 503.1 3400 511.6</PntList2D></ProfSurf>
        <ProfAlign name="Finished grade">
          <PVI>1000 500</PVI>
          <ParaCurve length="400">1800 512</ParaCurve>
          <UnsymParaCurve lengthIn="200" lengthOut="300">2600 504</UnsymParaCurve>
          <PVI>3400 512</PVI>
        </ProfAlign>
      </Profile>
    </Alignment>
  </Alignments>
</LandXML>
"#;
    let file = site_file("heron-creek.xml", text);
    let mut h = demo();
    h.state_mut().push(Action::Open(Some(file.clone())));
    h.run();
    let project = h.state().project().clone();
    assert_eq!(project.name, "Heron Creek Road");
    assert_eq!(project.units, gradewright_geometry::Units::UsCustomary);
    assert_eq!(project.foot, gradewright_geometry::Foot::UsSurvey);
    assert_eq!(project.pvis.len(), 4);
    assert!(matches!(project.pvis[2].curve, VerticalCurve::Unequal { length_in: 200.0, length_out: 300.0 }));
    assert_eq!(project.ground.len(), 4);
    assert!(h.state().path().is_none(), "opened from LandXML: Save asks for a project file");
    let notice = h.state().notice.as_ref().map(|n| n.text.clone()).unwrap_or_default();
    assert!(notice.contains("'Finished grade'") && notice.contains("US survey feet"), "{notice}");
    // Export it back from the editor and open the export: the same profile.
    let out = file.with_file_name("heron-creek-out.xml");
    h.state_mut().push(Action::ExportLandXml(Some(out.clone())));
    h.run();
    let written = std::fs::read_to_string(&out).unwrap_or_else(|e| panic!("{e}"));
    assert!(written.contains(r#"linearUnit="USSurveyFoot""#), "the foot is written back");
    let mut other = demo();
    other.input_mut().dropped_files.push(std::sync::Arc::new(Dropped(out)));
    other.run();
    other.run();
    assert_eq!(other.state().project().pvis, project.pvis, "a dropped LandXML file opens too");
    assert_eq!(other.state().project().ground, project.ground);
    // Two design profiles: a chooser offers both, nothing is replaced until
    // one is clicked.
    let two = site_file(
        "two.xml",
        &text.replace(
            "</ProfAlign>",
            "</ProfAlign>\n        <ProfAlign name=\"Option 2\"><PVI>1000 500</PVI><PVI>3400 510</PVI></ProfAlign>",
        ),
    );
    h.state_mut().push(Action::Open(Some(two)));
    h.run();
    assert_eq!(h.state().project(), &project, "nothing replaced before a choice");
    let notice = h.state().notice.as_ref().map(|n| n.text.clone()).unwrap_or_default();
    assert!(notice.contains("choose one"), "{notice}");
    assert!(h.query_by_label("Heron Creek Road / Finished grade (ground: Survey 2026)").is_some());
    h.get_by_label("Heron Creek Road / Option 2 (ground: Survey 2026)").click();
    h.run();
    assert_eq!(h.state().project().pvis.len(), 2, "the chosen profile opened");
    assert_eq!(h.state().project().ground, project.ground);
}

/// `gradewright edit FILE.xml` starts on the LandXML file's profile.
#[test]
fn the_editor_starts_on_a_landxml_file() {
    let dir = std::env::temp_dir().join(format!("gradewright-gui-start-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap_or_else(|e| panic!("{e}"));
    let path = dir.join("start.xml");
    let mut project =
        gradewright_document::Project::new("Birch Hill Road", gradewright_geometry::Units::Metric);
    project.pvis = vec![
        gradewright_geometry::Pvi::new(0.0, 100.0),
        gradewright_geometry::Pvi::with_curve(400.0, 108.0, 150.0),
        gradewright_geometry::Pvi::new(900.0, 101.5),
    ];
    let mut bytes = Vec::new();
    gradewright_exchange::write_landxml(&mut bytes, &project, &gradewright_exchange::Stamp::now())
        .unwrap_or_else(|e| panic!("{e}"));
    std::fs::write(&path, bytes).unwrap_or_else(|e| panic!("{e}"));
    let app = GradewrightApp::with_file(&path, AppFiles::new(None));
    assert_eq!(app.project().name, "Birch Hill Road");
    assert_eq!(app.project().pvis, project.pvis);
    assert!(app.path().is_none());
}

/// Dropping a PVI table (a CSV naming curve lengths) asks for its units and
/// opens it as a new, unsaved project; a ground CSV still imports as ground.
#[test]
fn a_dropped_pvi_table_asks_its_units_and_opens() {
    let file = site_file(
        "pine-ridge.csv",
        "station,elevation,curve_length\n10+00,612.0,0\n16+00,630.0,400\n24+00,618.0,0\n",
    );
    let mut h = demo();
    let before = h.state().project().clone();
    h.input_mut().dropped_files.push(std::sync::Arc::new(Dropped(file)));
    h.run();
    assert_eq!(h.state().project(), &before, "nothing opens before the units are chosen");
    h.get_by_label("Feet (US customary)").click();
    h.run();
    let project = h.state().project().clone();
    assert_eq!(project.units, gradewright_geometry::Units::UsCustomary);
    assert_eq!(project.pvis.len(), 3);
    assert!(matches!(project.pvis[1].curve, VerticalCurve::Symmetric { length: 400.0 }));
    assert!(h.state().path().is_none(), "opened from CSV: Save asks for a project file");
}
