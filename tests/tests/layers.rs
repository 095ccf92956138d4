//! The crates are layered: geometry has no GUI dependency, sheet has no window
//! dependency. Proved with `cargo tree` (common practice, after rerun's script).

use std::process::Command;

fn normal_dependencies(package: &str) -> Vec<String> {
    let cargo = std::env::var("CARGO").unwrap_or_else(|_| "cargo".to_owned());
    let output = Command::new(cargo)
        .args(["tree", "--offline", "-p", package, "-e", "normal", "--prefix", "none", "--format", "{p}"])
        .current_dir(env!("CARGO_MANIFEST_DIR"))
        .output()
        .unwrap_or_else(|e| panic!("cargo tree: {e}"));
    assert!(output.status.success(), "{}", String::from_utf8_lossy(&output.stderr));
    String::from_utf8_lossy(&output.stdout)
        .lines()
        .filter_map(|l| l.split_whitespace().next().map(str::to_owned))
        .collect()
}

const GUI: [&str; 7] = ["egui", "eframe", "egui_plot", "egui_kittest", "rfd", "winit", "glow"];

#[test]
fn geometry_has_no_gui_dependency() {
    let deps = normal_dependencies("gradewright-geometry");
    assert!(deps.iter().any(|d| d == "gradewright-geometry"), "{deps:?}");
    for gui in GUI {
        assert!(!deps.iter().any(|d| d == gui), "geometry depends on {gui}");
    }
}

#[test]
fn exchange_has_no_gui_dependency() {
    let deps = normal_dependencies("gradewright-exchange");
    assert!(deps.iter().any(|d| d == "gradewright-geometry"), "{deps:?}");
    assert!(!deps.iter().any(|d| d == "gradewright-draw"), "exchange formats need no drawing");
    for gui in GUI {
        assert!(!deps.iter().any(|d| d == gui), "exchange depends on {gui}");
    }
}

#[test]
fn draw_has_no_gui_dependency() {
    let deps = normal_dependencies("gradewright-draw");
    assert!(deps.iter().any(|d| d == "gradewright-geometry"), "{deps:?}");
    assert!(!deps.iter().any(|d| d == "gradewright-exchange"), "the drawing model needs no exchange format");
    for gui in GUI {
        assert!(!deps.iter().any(|d| d == gui), "draw depends on {gui}");
    }
}

/// The check above is not vacuous: the app does pull in the GUI stack.
#[test]
fn app_does_depend_on_the_gui() {
    let deps = normal_dependencies("gradewright");
    assert!(deps.iter().any(|d| d == "eframe"), "{deps:?}");
}
