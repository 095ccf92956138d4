//! Files are never lost: an export never replaces its own input, two outputs
//! are never the same file, an export's files are written together or not at
//! all, pipes never hang a reader, planted links are never written through,
//! read-only files are refused, and hostile names come out escaped.

#![cfg(unix)]

use std::os::unix::fs::{PermissionsExt, symlink};
use std::path::{Path, PathBuf};
use std::process::{Command, Stdio};
use std::time::{Duration, Instant};

fn root() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("../..")
}

fn scratch(name: &str) -> PathBuf {
    let dir = std::env::temp_dir().join(format!("gradewright-safety-{name}-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&dir);
    std::fs::create_dir_all(&dir).unwrap_or_else(|e| panic!("{e}"));
    dir
}

/// A copy of the demo project in `dir`.
fn demo_in(dir: &Path) -> PathBuf {
    let file = dir.join("p.ron");
    std::fs::copy(root().join("assets/alder-brook-road.ron"), &file).unwrap_or_else(|e| panic!("{e}"));
    file
}

/// Runs the binary with a time limit: a hang is a failure, not a stuck test.
fn run(args: &[&str]) -> (Option<i32>, String, String) {
    let mut child = Command::new(env!("CARGO_BIN_EXE_gradewright"))
        .args(args)
        .stdin(Stdio::null())
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .unwrap_or_else(|e| panic!("{e}"));
    let start = Instant::now();
    while child.try_wait().ok().flatten().is_none() {
        if start.elapsed() > Duration::from_secs(60) {
            let _ = child.kill();
            panic!("{args:?} hung");
        }
        std::thread::sleep(Duration::from_millis(10));
    }
    let out = child.wait_with_output().unwrap_or_else(|e| panic!("{e}"));
    (
        out.status.code(),
        String::from_utf8_lossy(&out.stdout).into_owned(),
        String::from_utf8_lossy(&out.stderr).into_owned(),
    )
}

fn s(p: &Path) -> String {
    p.to_string_lossy().into_owned()
}

fn read(p: &Path) -> Vec<u8> {
    std::fs::read(p).unwrap_or_else(|e| panic!("{}: {e}", p.display()))
}

/// The folder's entries, sorted (to show that nothing was added).
fn entries(dir: &Path) -> Vec<String> {
    let mut names: Vec<String> = std::fs::read_dir(dir)
        .unwrap_or_else(|e| panic!("{e}"))
        .filter_map(Result::ok)
        .map(|e| e.file_name().to_string_lossy().into_owned())
        .collect();
    names.sort();
    names
}

#[test]
fn an_export_never_replaces_its_input() {
    let dir = scratch("input");
    let project = demo_in(&dir);
    let before = read(&project);
    let link = dir.join("link.svg");
    symlink(&project, &link).unwrap_or_else(|e| panic!("{e}"));
    for (flag, out) in [("--svg", &project), ("--pdf", &project), ("--png", &link)] {
        let (code, stdout, stderr) = run(&["export", &s(&project), flag, &s(out)]);
        assert_eq!(code, Some(2), "{flag}: {stdout}{stderr}");
        assert!(stderr.contains(flag) && stderr.contains("input"), "{flag}: {stderr}");
        assert_eq!(read(&project), before, "{flag}: the project changed");
    }
    // The same for a LandXML input written as a PNG.
    let xml = dir.join("a.xml");
    std::fs::copy(root().join("tests/corpus/landxml-valid.xml"), &xml).unwrap_or_else(|e| panic!("{e}"));
    let xml_before = read(&xml);
    let (code, _, stderr) = run(&["export", &s(&xml), "--design-speed", "60", "--png", &s(&xml)]);
    assert_eq!(code, Some(2), "{stderr}");
    assert_eq!(read(&xml), xml_before);
    assert_eq!(entries(&dir), ["a.xml", "link.svg", "p.ron"]);
}

#[test]
fn two_outputs_that_are_one_file_are_refused_and_nothing_is_written() {
    let dir = scratch("twice");
    let project = demo_in(&dir);
    let same = dir.join("same.svg");
    let (code, _, stderr) =
        run(&["export", &s(&project), "--svg", &s(&same), "--png", &s(&same), "--landxml", &s(&same)]);
    assert_eq!(code, Some(2), "{stderr}");
    assert!(stderr.contains("--png") && stderr.contains("SVG output"), "{stderr}");
    assert!(!same.exists());
    // A table folder and a sheet that land on the same file are refused too.
    let tables = dir.join("tables");
    let (code, _, stderr) =
        run(&["export", &s(&project), "--csv-dir", &s(&tables), "--svg", &s(&tables.join("curves.csv"))]);
    assert_eq!(code, Some(2), "{stderr}");
    assert!(!tables.exists(), "the tables' folder was left behind");
    assert_eq!(entries(&dir), ["p.ron"]);
}

#[test]
fn sheets_are_written_together_or_not_at_all() {
    let dir = scratch("together");
    let project = demo_in(&dir);
    // At 1:1000 the demo splits over numbered sheets; the third one's name is
    // taken by a folder, so none may be written.
    std::fs::create_dir(dir.join("road-3.svg")).unwrap_or_else(|e| panic!("{e}"));
    let (code, _, stderr) = run(&[
        "export",
        &s(&project),
        "--svg",
        &s(&dir.join("road.svg")),
        "--pdf",
        &s(&dir.join("road.pdf")),
        "--h-scale",
        "1000",
    ]);
    assert_eq!(code, Some(2), "{stderr}");
    assert!(stderr.contains("road-3.svg"), "{stderr}");
    assert_eq!(entries(&dir), ["p.ron", "road-3.svg"]);
}

#[test]
fn pipes_as_input_are_refused_without_waiting() {
    let dir = scratch("fifo");
    let fifo = dir.join("ground.csv");
    let made = Command::new("mkfifo").arg(&fifo).status();
    if !made.is_ok_and(|s| s.success()) {
        eprintln!("mkfifo is not available; skipped");
        return;
    }
    let project = demo_in(&dir);
    let out = dir.join("out.ron");
    for args in [
        vec!["import", &*s(&project).leak(), "--ground", &*s(&fifo).leak(), "-o", &*s(&out).leak()],
        vec!["check", &*s(&fifo).leak(), "--units", "metric"],
        vec!["table", &*s(&fifo.with_extension("xml")).leak()],
    ] {
        if args[0] == "table" {
            let _ = Command::new("mkfifo").arg(fifo.with_extension("xml")).status();
        }
        let (code, _, stderr) = run(&args);
        assert_eq!(code, Some(2), "{args:?}: {stderr}");
        assert!(stderr.contains("not a regular file"), "{args:?}: {stderr}");
        assert!(!out.exists());
    }
}

#[test]
fn a_read_only_output_is_refused_and_kept() {
    let dir = scratch("readonly");
    let project = demo_in(&dir);
    let target = dir.join("fitted.ron");
    std::fs::write(&target, b"keep me").unwrap_or_else(|e| panic!("{e}"));
    std::fs::set_permissions(&target, std::fs::Permissions::from_mode(0o444))
        .unwrap_or_else(|e| panic!("{e}"));
    let (code, _, stderr) = run(&["fit", &s(&project), "-o", &s(&target)]);
    assert_eq!(code, Some(2), "{stderr}");
    assert!(stderr.contains("read-only"), "{stderr}");
    assert_eq!(read(&target), b"keep me");
    let mode = std::fs::metadata(&target).map(|m| m.permissions().mode() & 0o777).unwrap_or(0);
    assert_eq!(mode, 0o444);
    assert_eq!(entries(&dir), ["fitted.ron", "p.ron"]);
}

#[test]
fn planted_links_are_never_written_through() {
    let dir = scratch("planted");
    let project = demo_in(&dir);
    let victim = dir.join("victim.txt");
    std::fs::write(&victim, b"precious").unwrap_or_else(|e| panic!("{e}"));
    std::fs::set_permissions(&victim, std::fs::Permissions::from_mode(0o600))
        .unwrap_or_else(|e| panic!("{e}"));
    // Links under every name a writer might once have predicted: temporaries
    // by process number and the backup.
    let out = dir.join("o.ron");
    std::fs::copy(&project, &out).unwrap_or_else(|e| panic!("{e}"));
    for n in 0..64 {
        let _ = symlink(&victim, dir.join(format!(".o.ron.{n}.tmp")));
    }
    symlink(&victim, dir.join("o.ron.bak")).unwrap_or_else(|e| panic!("{e}"));
    let (code, _, stderr) = run(&["fit", &s(&project), "-o", &s(&out)]);
    assert!(code == Some(0) || code == Some(1), "{stderr}");
    assert_eq!(read(&victim), b"precious");
    let mode = std::fs::metadata(&victim).map(|m| m.permissions().mode() & 0o777).unwrap_or(0);
    assert_eq!(mode, 0o600, "the victim's mode was widened");
    assert!(!std::fs::symlink_metadata(&out).map(|m| m.file_type().is_symlink()).unwrap_or(true));
    let bak = std::fs::symlink_metadata(dir.join("o.ron.bak")).unwrap_or_else(|e| panic!("{e}"));
    assert!(bak.file_type().is_file(), "the backup is a file of its own, not the planted link");
    assert_eq!(read(&dir.join("o.ron.bak")), read(&project));
    let (code, _, stderr) = run(&["table", &s(&out)]);
    assert_eq!(code, Some(0), "{stderr}");
}

#[test]
fn a_dangling_link_as_output_is_refused_or_written_where_it_points() {
    let dir = scratch("dangling");
    let project = demo_in(&dir);
    let out = dir.join("sheet.svg");
    symlink(dir.join("missing-folder/sheet.svg"), &out).unwrap_or_else(|e| panic!("{e}"));
    let (code, _, stderr) = run(&["export", &s(&project), "--svg", &s(&out)]);
    assert_eq!(code, Some(2), "{stderr}");
    assert!(stderr.contains("--svg"), "{stderr}");
    assert!(!dir.join("missing-folder").exists());
}

#[test]
fn a_long_output_name_still_saves() {
    let dir = scratch("long");
    let project = demo_in(&dir);
    let out = dir.join(format!("{}.ron", "n".repeat(246)));
    let (code, _, stderr) = run(&["fit", &s(&project), "-o", &s(&out)]);
    assert!(code == Some(0) || code == Some(1), "{stderr}");
    let (code, _, stderr) = run(&["table", &s(&out)]);
    assert_eq!(code, Some(0), "{stderr}");
}

/// A project name with markup and control characters comes out of every
/// writer as well-formed XML, and a name of a million characters is cut to
/// the title block rather than written whole.
#[test]
fn hostile_names_come_out_escaped_and_bounded() {
    let dir = scratch("names");
    let text = std::fs::read_to_string(root().join("assets/alder-brook-road.ron")).unwrap_or_default();
    let start = text.find("name: \"").map(|i| i + 7).unwrap_or_else(|| panic!("no name in the demo"));
    let end = start + text[start..].find('"').unwrap_or(0);
    for (label, name) in [
        ("markup", "A</text><script>x</script>&amp;\\u{1b}[31m\\u{7}\\u{0}".to_owned()),
        ("huge", "W".repeat(1_000_000)),
    ] {
        let project = dir.join(format!("{label}.ron"));
        std::fs::write(&project, format!("{}{name}{}", &text[..start], &text[end..]))
            .unwrap_or_else(|e| panic!("{e}"));
        let (svg, xml) = (dir.join(format!("{label}.svg")), dir.join(format!("{label}.xml")));
        let (code, _, stderr) = run(&["export", &s(&project), "--svg", &s(&svg), "--landxml", &s(&xml)]);
        assert!(code == Some(0) || code == Some(1), "{label}: {stderr}");
        assert!(stderr.len() < 2000, "{label}: {} bytes on stderr", stderr.len());
        for file in [&svg, &xml] {
            let body = std::fs::read_to_string(file).unwrap_or_else(|e| panic!("{e}"));
            assert!(
                !body.chars().any(|c| c.is_control() && !matches!(c, '\n' | '\r' | '\t')),
                "{label}: a control character in {}",
                file.display()
            );
            assert!(!body.contains("<script>"), "{label}: markup came through");
            let parsed = roxmltree::Document::parse(&body);
            assert!(parsed.is_ok(), "{label}: {} is not well-formed: {parsed:?}", file.display());
        }
        let sheet = std::fs::metadata(&svg).map(|m| m.len()).unwrap_or(0);
        assert!(sheet < 600_000, "{label}: a {sheet}-byte sheet");
    }
}
