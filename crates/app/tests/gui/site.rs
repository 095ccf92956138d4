//! The site: ground and control points, imported, dropped and edited.

use super::*;

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

/// Import ground from a LandXML file whose alignment holds two ground lines
/// offers both in a chooser, as File, Open does for profiles; nothing is
/// imported until one is clicked, and the one clicked is.
#[test]
fn importing_ground_from_a_file_with_two_ground_lines_offers_a_chooser() {
    let text = landxml(
        false,
        r#"    <Alignment name="Alder Brook Road" staStart="0" length="2000">
      <Profile>
        <ProfSurf name="Survey 2025"><PntList2D>0 212.0 1000 220.0 2000 222.0</PntList2D></ProfSurf>
        <ProfSurf name="Survey 2026"><PntList2D>0 212.5 500 216.0 1000 221.0 2000 223.0</PntList2D></ProfSurf>
        <ProfAlign name="Design"><PVI>0 212.4</PVI><PVI>2000 222.9</PVI></ProfAlign>
      </Profile>
    </Alignment>
"#,
    );
    let file = site_file("two-surveys.xml", &text);
    let mut h = demo();
    let before = h.state().project().clone();
    h.state_mut().push(Action::ImportGround(Some(file)));
    h.run();
    assert_eq!(h.state().project(), &before, "nothing imported before a choice");
    let notice = h.state().notice.as_ref().map(|n| n.text.clone()).unwrap_or_default();
    assert!(notice.contains("2 ground lines: choose one"), "{notice}");
    assert!(!notice.contains("--"), "the editor names no command-line option: {notice}");
    assert!(h.query_by_label("Alder Brook Road / Survey 2025").is_some());
    h.get_by_label("Alder Brook Road / Survey 2026").click();
    h.run();
    let ground = h.state().project().ground.clone();
    assert_eq!(ground.len(), 4, "the chosen ground line was imported");
    let notice = h.state().notice.as_ref().map(|n| n.text.clone()).unwrap_or_default();
    assert!(notice.contains("ground line 'Survey 2026'"), "{notice}");
    h.state_mut().push(Action::Undo);
    h.run();
    assert_eq!(h.state().project().ground, before.ground, "one undo step");
}

/// The station-equation table: add one at the selected PVI, type its ahead
/// station (one undo step each), see every station relabelled as a plan
/// station (the PVI table's cell), delete it; a change that would put two
/// equations at one place is refused and says why.
#[test]
fn station_equations_are_added_edited_and_deleted() {
    // Tall enough that the whole side panel is on screen.
    let mut h = Harness::builder().with_size([1500.0, 2200.0]).with_max_steps(12).build_ui_state(
        |ui, app: &mut GradewrightApp| app.show(ui),
        GradewrightApp::with_demo(AppFiles::new(None)),
    );
    h.run();
    h.get_by_label("Ground & controls").click();
    h.run();
    h.state_mut().push(Action::Select(Some(2)));
    h.run();
    let pvi = h.state().project().pvis[2].station.0;
    let pvi4 = h.state().project().pvis[3].station.0;
    h.get_by_label("Station equations (0)").click();
    h.run();
    h.get_by_label("Add station equation").click();
    h.run();
    let equations = h.state().project().equations.as_slice().to_vec();
    assert_eq!(equations.len(), 1);
    assert_eq!(equations[0].internal.to_bits(), pvi.to_bits());
    // Ahead 100 m further on: a short equation.
    let ahead = gradewright_geometry::format_station(pvi + 100.0, gradewright_geometry::Units::Metric, 3);
    replace_text(&mut h, "Equation 1 ahead station", &ahead);
    let e = h.state().project().equations.as_slice()[0];
    assert!((e.ahead - (pvi + 100.0)).abs() < 1e-9 && (e.back - pvi).abs() < 1e-9, "{e:?}");
    // PVI 4 is now shown at its plan station, 100 m on.
    let plan4 = gradewright_geometry::format_station(pvi4 + 100.0, gradewright_geometry::Units::Metric, 3);
    assert!(h.query_by_label("PVI 4 station").is_some());
    let shown = h.get_by_label("PVI 4 station").value().unwrap_or_default();
    assert_eq!(shown, plan4);
    // A second equation at the same place is refused.
    h.get_by_label("Add station equation").click();
    h.run();
    assert_eq!(h.state().project().equations.as_slice().len(), 1);
    assert!(h.query_by_label_contains("Not changed: station equation").is_some());
    // Undo takes back the ahead station, then the equation.
    h.state_mut().push(Action::Undo);
    h.run();
    let e = h.state().project().equations.as_slice()[0];
    assert!((e.ahead - pvi).abs() < 1e-9, "{e:?}");
    h.get_by_label("Delete station equation 1").click();
    h.run();
    assert!(h.state().project().equations.is_empty());
}
