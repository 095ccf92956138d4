//! Files: open, save, recovery, export, LandXML, PVI tables.

use super::*;

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

/// File ▸ Export tables…: only the tables are written, at the interval
/// chosen, into the folder chosen (made when it does not exist), rounded as
/// chosen.
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
    // Rounded as a plan shows them by default (the choice is in the window);
    // a fixed count of decimals chosen there is what is written.
    let curves = std::fs::read_to_string(folder.join("curves.csv")).unwrap_or_default();
    assert!(curves.contains(",34.3,34.3,26.0,"), "{curves}");
    h.get_by_label("Numbers in the tables").click();
    h.run();
    h.get_by_label("A fixed number of decimals").click();
    h.run();
    assert_eq!(h.state().project().export.decimals, gradewright_document::TableDecimals::Fixed(3));
    h.get_by_label("Write tables").click();
    h.run();
    let curves = std::fs::read_to_string(folder.join("curves.csv")).unwrap_or_default();
    assert!(curves.contains(",34.286,34.286,26.000,"), "{curves}");
    let _ = std::fs::remove_dir_all(&dir);
}

/// File, Open on a LandXML file (what the dialog hands over) opens its design
/// profile and ground line as a new, unsaved project in the file's units and
/// foot; dropping the file does the same; File, Export LandXML… writes a file
/// that opens back to the same profile; a file with two design profiles is
/// offered in a chooser, and the one clicked opens.
#[test]
fn a_landxml_file_opens_as_a_new_project_and_exports_back() {
    let text = landxml(
        true,
        r#"    <Alignment name="Heron Creek Road" staStart="1000" length="2400">
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
"#,
    );
    let file = site_file("heron-creek.xml", &text);
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

/// A LandXML file with no design speed opens with its checks off, and
/// nothing reads as a pass: each PVI row says "not checked: no design speed"
/// (never "✔ ok"), the findings say no check has run; entering the speed
/// checks the rows.
#[test]
fn a_profile_without_a_design_speed_is_not_shown_as_passing() {
    let text = landxml(
        false,
        r#"    <Alignment name="Wren Gap Road" staStart="0" length="900">
      <Profile>
        <ProfAlign name="Proposed">
          <PVI>0 100</PVI>
          <ParaCurve length="150">400 108</ParaCurve>
          <PVI>900 101.5</PVI>
        </ProfAlign>
      </Profile>
    </Alignment>
"#,
    );
    let mut h = demo();
    h.state_mut().push(Action::Open(Some(site_file("wren-gap.xml", &text))));
    h.run();
    assert_eq!(h.state().project().criteria.design_speed, None);
    assert_eq!(h.query_all_by_label("○ not checked: no design speed").count(), 3, "every row");
    assert_eq!(h.query_all_by_label("✔ ok").count(), 0, "no row reads as passed");
    assert!(
        h.query_by_label("⚠ Not checked: no design speed is set. No curve, grade or sight check has run.")
            .is_some()
    );
    // The speed entered, the rows are checked: +2.0 % to −1.3 %, K =
    // 150/3.3 = 45.5 ≥ 26, the crest minimum at 80 km/h (Green Book 2018
    // Table 3-34, from memory), so every row passes.
    replace_text(&mut h, "Design speed value", "80");
    assert_eq!(h.state().project().criteria.design_speed, Some(80.0));
    assert_eq!(h.query_all_by_label("○ not checked: no design speed").count(), 0);
    assert_eq!(h.query_all_by_label("✔ ok").count(), 3, "every row checked and passing");
    assert!(h.query_by_label_contains("Not checked").is_none());
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

/// The editor's messages carry the cause underneath (the system's words)
/// and never a command-line option: a file that is not there says so, and
/// an export with every format off says which choices to tick.
#[test]
fn error_messages_carry_their_cause_in_the_editors_words() {
    let mut h = demo();
    let missing = std::env::temp_dir().join(format!("gradewright-gui-missing-{}.ron", std::process::id()));
    h.state_mut().push(Action::Open(Some(missing.clone())));
    h.run();
    let notice = h.state().notice.clone().unwrap_or_else(|| panic!("no message"));
    assert!(notice.error);
    assert!(notice.text.contains(&missing.display().to_string()), "{}", notice.text);
    assert!(notice.text.contains("os error"), "the system's words are kept: {}", notice.text);
    let table = missing.with_extension("csv");
    h.state_mut().push(Action::OpenPviTable(table, gradewright_geometry::Units::Metric));
    h.run();
    let text = h.state().notice.as_ref().map(|n| n.text.clone()).unwrap_or_default();
    assert!(text.contains("os error") && !text.contains("--"), "{text}");
    let mut project = h.state().project().clone();
    (project.export.png, project.export.svg, project.export.pdf, project.export.tables) =
        (false, false, false, false);
    h.state_mut().apply_edit(gradewright::gui::Edit::Replace(Box::new(project)));
    h.state_mut().push(Action::ExportSheet);
    h.run();
    let text = h.state().notice.as_ref().map(|n| n.text.clone()).unwrap_or_default();
    assert!(text.contains("nothing to export: tick"), "{text}");
    assert!(!text.contains("--"), "no command-line option in the editor: {text}");
}
