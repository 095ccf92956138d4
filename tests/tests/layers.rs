//! The crates are layered: geometry knows no GUI and no file format, the
//! document knows its own file format only, exchange and draw know no GUI,
//! and no library speaks the command line's words. Proved with `cargo tree`
//! and by reading the sources (common practice, after rerun's script).

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

/// File formats: the geometry crate holds the model and its mathematics,
/// never how a file is written.
const FORMATS: [&str; 5] = ["ron", "csv", "roxmltree", "serde_json", "quick-xml"];

#[test]
fn geometry_knows_no_file_format() {
    let deps = normal_dependencies("gradewright-geometry");
    for format in FORMATS {
        assert!(!deps.iter().any(|d| d == format), "geometry depends on {format}");
    }
}

#[test]
fn the_document_knows_its_own_format_only() {
    let deps = normal_dependencies("gradewright-document");
    assert!(deps.iter().any(|d| d == "gradewright-geometry") && deps.iter().any(|d| d == "ron"), "{deps:?}");
    for other in ["gradewright-exchange", "gradewright-draw", "csv", "roxmltree"].into_iter().chain(GUI) {
        assert!(!deps.iter().any(|d| d == other), "the document depends on {other}");
    }
}

/// Every string literal of a library's sources that names a command-line
/// option (`--units`, `--surface NAME`): the front ends word their own.
fn flags_named(dir: &std::path::Path, found: &mut Vec<String>) {
    let Ok(entries) = std::fs::read_dir(dir) else { return };
    for entry in entries.flatten() {
        let path = entry.path();
        if path.is_dir() {
            flags_named(&path, found);
            continue;
        }
        if path.extension().is_none_or(|e| e != "rs") {
            continue;
        }
        let text = std::fs::read_to_string(&path).unwrap_or_default();
        for (n, line) in text.lines().enumerate() {
            let code = line.trim_start();
            if code.starts_with("//") {
                continue;
            }
            // The quoted parts of the line: every other piece between quotes.
            for (k, piece) in line.split('"').enumerate() {
                let names_flag = piece.match_indices("--").any(|(at, _)| {
                    piece
                        .get(at + 2..)
                        .and_then(|rest| rest.chars().next())
                        .is_some_and(|c| c.is_ascii_lowercase())
                });
                if k % 2 == 1 && names_flag {
                    found.push(format!("{}:{}: {}", path.display(), n + 1, line.trim()));
                }
            }
        }
    }
}

#[test]
fn no_library_names_a_command_line_option() {
    let root = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("..").join("crates");
    let mut found = Vec::new();
    for library in ["geometry", "document", "exchange", "draw"] {
        flags_named(&root.join(library).join("src"), &mut found);
    }
    assert!(found.is_empty(), "libraries name command-line options:\n{}", found.join("\n"));
    // The check is not vacuous: the command line does name them.
    let mut cli = Vec::new();
    flags_named(&root.join("app").join("src").join("cli"), &mut cli);
    assert!(cli.iter().any(|l| l.contains("--units")), "{cli:?}");
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
