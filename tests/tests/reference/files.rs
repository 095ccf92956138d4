//! Project files: round trip, errors with line and column, versions, atomic
//! saves with a backup (common practice for design data).

use std::path::{Path, PathBuf};

use gradewright_document::{FileError, Project};
use gradewright_geometry::{Pvi, Setting, Units, VerticalCurve};

fn temp_dir(name: &str) -> PathBuf {
    let dir = std::env::temp_dir().join(format!("gradewright-files-{name}-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&dir);
    std::fs::create_dir_all(&dir).unwrap_or_else(|e| panic!("{e}"));
    dir
}

fn sample_project() -> Project {
    let mut p = Project::new("Test road", Units::UsCustomary);
    p.criteria.design_speed = Some(45.0);
    p.criteria.crest_k = Setting::Override(70.0);
    p.pvis = vec![
        Pvi::new(1000.0, 500.0),
        Pvi::with_curve(1500.0, 510.0, 300.0),
        Pvi {
            curve: VerticalCurve::Unequal { length_in: 100.0, length_out: 150.0 },
            ..Pvi::new(2000.0, 505.0)
        },
        Pvi::new(2500.0, 512.0),
    ];
    p
}

#[test]
fn round_trip_keeps_everything() {
    let p = sample_project();
    let text = p.to_ron().unwrap_or_else(|e| panic!("{e}"));
    let back = Project::from_ron(&text, Path::new("x.ron")).unwrap_or_else(|e| panic!("{e}"));
    assert_eq!(p, back);
}

#[test]
fn syntax_error_names_line_and_column() {
    let text = "Project(\n  format_version: 1,\n  units: Metric,\n  pvis: [\n    Pvi(station: 0.0, elevation: oops),\n  ],\n)\n";
    let err = Project::from_ron(text, Path::new("road.ron")).err().unwrap_or_else(|| panic!("accepted"));
    match &err {
        FileError::Syntax { line, .. } => assert_eq!(*line, 5, "{err}"),
        other => panic!("{other}"),
    }
    assert!(err.to_string().starts_with("road.ron:5:"), "{err}");
    let unknown = "Project(format_version: 1, units: Metric, pvis: [], colour: 3)";
    let err = Project::from_ron(unknown, Path::new("road.ron")).err().map(|e| e.to_string());
    assert!(err.as_deref().is_some_and(|e| e.contains("colour")), "{err:?}");
}

#[test]
fn newer_version_says_so() {
    let text = "Project(format_version: 99, units: Metric, pvis: [], new_thing: (a: 1))";
    let err = Project::from_ron(text, Path::new("new.ron")).err();
    assert!(matches!(err, Some(FileError::NewerVersion { found: 99, .. })), "{err:?}");
}

#[test]
fn save_is_atomic_and_keeps_a_backup() {
    let dir = temp_dir("save");
    let path = dir.join("road.ron");
    let mut p = sample_project();
    p.save(&path).unwrap_or_else(|e| panic!("{e}"));
    p.name = "Second".to_owned();
    p.save(&path).unwrap_or_else(|e| panic!("{e}"));
    let now = Project::load(&path).unwrap_or_else(|e| panic!("{e}"));
    assert_eq!(now.name, "Second");
    let bak = Project::load(&dir.join("road.ron.bak")).unwrap_or_else(|e| panic!("{e}"));
    assert_eq!(bak.name, "Test road");
    // No temporary files are left behind.
    let names: Vec<_> = std::fs::read_dir(&dir)
        .unwrap_or_else(|e| panic!("{e}"))
        .filter_map(|e| e.ok().map(|e| e.file_name().to_string_lossy().into_owned()))
        .collect();
    assert_eq!(names.len(), 2, "{names:?}");
    // Saving into a folder that does not exist fails and names the file.
    let err = p.save(&dir.join("missing").join("x.ron")).err().map(|e| e.to_string());
    assert!(err.as_deref().is_some_and(|e| e.contains("x.ron")), "{err:?}");
    let _ = std::fs::remove_dir_all(&dir);
}

/// The demo project in assets/ loads and is valid.
#[test]
fn demo_project_loads() {
    let path = Path::new(env!("CARGO_MANIFEST_DIR")).join("../assets/alder-brook-road.ron");
    let p = Project::load(&path).unwrap_or_else(|e| panic!("{e}"));
    assert!(p.profile().problems().is_empty());
    assert!(p.pvis.len() >= 6);
}

/// The second demo (a fictional county road opened from LandXML) loads with
/// its station equation, its criteria range and the file it came from, and
/// writes that file back with its plan geometry.
#[test]
fn second_demo_loads_with_its_equation_range_and_file() {
    let path = Path::new(env!("CARGO_MANIFEST_DIR")).join("../assets/birch-hollow-connector.ron");
    let p = Project::load(&path).unwrap_or_else(|e| panic!("{e}"));
    assert!(p.profile().problems().is_empty());
    assert_eq!(p.equations.as_slice().len(), 1);
    assert_eq!(p.criteria_ranges.len(), 1);
    let mut out = Vec::new();
    let stamp = gradewright_exchange::Stamp { date: "2026-12-04".to_owned(), time: "12:00:00".to_owned() };
    gradewright_exchange::write_landxml(&mut out, &p, &stamp).unwrap_or_else(|e| panic!("{e}"));
    let text = String::from_utf8_lossy(&out);
    assert!(text.contains("<Spiral ") && text.contains("StaEquation"), "{text}");
}
