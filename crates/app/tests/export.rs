//! `gradewright export`: the sheet as SVG, PNG and PDF and the hand-over
//! tables, checked by reading them back.

use std::path::{Path, PathBuf};
use std::process::Command;

use gradewright_document::Project;
use gradewright_geometry::{Analysis, Station};

fn root() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("../..")
}

fn demo() -> PathBuf {
    root().join("assets/alder-brook-road.ron")
}

fn scratch(name: &str) -> PathBuf {
    let dir = std::env::temp_dir().join(format!("gradewright-export-{name}-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&dir);
    std::fs::create_dir_all(&dir).unwrap_or_else(|e| panic!("{e}"));
    dir
}

fn run(args: &[&str]) -> (Option<i32>, String, String) {
    let out =
        Command::new(env!("CARGO_BIN_EXE_gradewright")).args(args).output().unwrap_or_else(|e| panic!("{e}"));
    (
        out.status.code(),
        String::from_utf8_lossy(&out.stdout).into_owned(),
        String::from_utf8_lossy(&out.stderr).into_owned(),
    )
}

fn s(p: &Path) -> String {
    p.to_string_lossy().into_owned()
}

#[test]
fn the_demo_sheet_in_every_format() {
    let dir = scratch("all");
    let (png, svg, pdf, csv) = (dir.join("a.png"), dir.join("a.svg"), dir.join("a.pdf"), dir.join("tables"));
    let (code, stdout, stderr) = run(&[
        "export",
        &s(&demo()),
        "--png",
        &s(&png),
        "--svg",
        &s(&svg),
        "--pdf",
        &s(&pdf),
        "--csv-dir",
        &s(&csv),
        "--dpi",
        "100",
        "--designer",
        "T. Tester",
    ]);
    // The demo's crest fails: the files are written and the status says so.
    assert_eq!(code, Some(1), "{stdout}{stderr}");
    // SVG: real text, the failure marked, the cautions and the title block.
    let text = std::fs::read_to_string(&svg).unwrap_or_default();
    for part in [
        "PVI 4",
        "1+100.000",
        "× FAILS: crest.k-min",
        "K 18.0 &lt; 26",
        "CAUTION:",
        "licensed professional engineer",
        "T. Tester",
        "1 of 1",
        "H 1:10000",
        "Alder Brook Road",
        "+3.000 %",
        "Proposed",
    ] {
        assert!(text.contains(part), "{part:?} not in the SVG");
    }
    assert!(text.matches("<text").count() > 60, "{} text elements", text.matches("<text").count());
    assert_eq!(text.matches(r#"class="Profile""#).count(), 1);
    assert_eq!(text.matches(r#"class="FailingCurve""#).count(), 1);
    // PNG: 17 × 11 in at 100 dpi, not blank, the profile where the geometry says.
    let decoder = png::Decoder::new(std::io::BufReader::new(
        std::fs::File::open(&png).unwrap_or_else(|e| panic!("{e}")),
    ));
    let mut reader = decoder.read_info().unwrap_or_else(|e| panic!("{e}"));
    let mut pixels = vec![0; reader.output_buffer_size()];
    let info = reader.next_frame(&mut pixels).unwrap_or_else(|e| panic!("{e}"));
    assert_eq!((info.width, info.height), (1700, 1100));
    let channels = info.line_size / info.width as usize;
    let dark = |x: u32, y: u32| -> bool {
        let at = y as usize * info.line_size + x as usize * channels;
        pixels.get(at..at + 3).is_some_and(|p| p.iter().map(|&c| u32::from(c)).sum::<u32>() < 200)
    };
    let project = Project::load(&demo()).unwrap_or_else(|e| panic!("{e}"));
    let analysis = Analysis::of(&project.design());
    let options = gradewright_draw::SheetOptions::default();
    let layout = gradewright_draw::layout(&analysis, &options).unwrap_or_else(|e| panic!("{e}"));
    let alignment = analysis.alignment.as_ref().unwrap_or_else(|| panic!("alignment"));
    // The profile is drawn where the geometry says, within 2 px, at three
    // stations (the line is 0.5 mm wide: look for its dark pixels nearby).
    for station in [150.0, 500.0, 1800.0] {
        let elevation = alignment.sample(Station(station)).map(|p| p.elevation).unwrap_or(f64::NAN);
        let (x_mm, y_mm) = layout.paper(0, station, elevation).unwrap_or_else(|| panic!("page"));
        let (x, y) = ((x_mm / 25.4 * 100.0).round() as u32, y_mm / 25.4 * 100.0);
        let near: Vec<u32> = ((y - 6.0) as u32..=(y + 6.0) as u32).filter(|&py| dark(x, py)).collect();
        let centre = f64::from(near.iter().sum::<u32>()) / near.len().max(1) as f64;
        assert!(
            !near.is_empty() && (centre - y).abs() <= 2.0,
            "station {station}: expected y {y:.1}, dark at {near:?}"
        );
    }
    // PDF: one page, 17 × 11 in.
    let bytes = std::fs::read(&pdf).unwrap_or_default();
    let body = String::from_utf8_lossy(&bytes);
    assert!(body.starts_with("%PDF-"));
    assert_eq!(
        body.matches("/Type /Page\n").count()
            + body.matches("/Type /Page ").count()
            + body.matches("/Type /Page/").count(),
        1,
        "one page"
    );
    let media = body.split("/MediaBox [").nth(1).and_then(|r| r.split(']').next()).unwrap_or("");
    let numbers: Vec<f64> = media.split_whitespace().filter_map(|v| v.parse().ok()).collect();
    assert_eq!(numbers.len(), 4, "{media}");
    assert!(
        (numbers[2] - 1224.0).abs() < 0.01 && (numbers[3] - 792.0).abs() < 0.01,
        "17 × 11 in in points: {media}"
    );
    // CSV read back: every curve value is the geometry crate's, rounded as a
    // plan shows it (0.001 m; K to 0.1).
    let near = |got: Option<f64>, want: Option<f64>, half: f64| match (got, want) {
        (Some(g), Some(w)) => (g - w).abs() <= half + 1e-9,
        (g, w) => g.is_none() && w.is_none(),
    };
    let mut curves = csv::Reader::from_path(csv.join("curves.csv")).unwrap_or_else(|e| panic!("{e}"));
    let headers = curves.headers().unwrap_or_else(|e| panic!("{e}")).clone();
    let col = |name: &str| headers.iter().position(|h| h == name).unwrap_or_else(|| panic!("{name}"));
    for (i, row) in curves.records().enumerate() {
        let row = row.unwrap_or_else(|e| panic!("{e}"));
        let number = |name: &str| row.get(col(name)).and_then(|v| v.parse::<f64>().ok());
        assert!(near(number("station_m"), Some(project.pvis[i].station.0), 0.0005));
        if let Some(check) = analysis.report.curves.iter().find(|c| c.curve.index == i) {
            assert!(near(number("k_m_per_percent"), check.curve.k(), 0.05), "K of PVI {}", i + 1);
            assert!(near(number("length_required_m"), Some(check.length_required), 0.0005));
            assert!(near(number("pvc_station_m"), Some(check.curve.pvc.0), 0.0005));
        }
    }
    let findings =
        csv::Reader::from_path(csv.join("findings.csv")).unwrap_or_else(|e| panic!("{e}")).records().count();
    assert_eq!(findings, analysis.report.findings.len());
    let stations = csv::Reader::from_path(csv.join("stations.csv")).unwrap_or_else(|e| panic!("{e}"));
    assert_eq!(
        stations.into_records().count(),
        gradewright_exchange::interval_stations(alignment, 20.0).len()
    );
}

/// At 1:1000 the 2 km demo needs several sheets: numbered files, one PDF page
/// each, match lines, and every station on a sheet, overlaps apart.
#[test]
fn a_long_profile_splits_over_numbered_sheets() {
    let dir = scratch("split");
    let (svg, pdf) = (dir.join("road.svg"), dir.join("road.pdf"));
    let (code, _, stderr) = run(&[
        "export",
        &s(&demo()),
        "--svg",
        &s(&svg),
        "--pdf",
        &s(&pdf),
        "--h-scale",
        "1000",
        "--overlap",
        "50",
    ]);
    assert_eq!(code, Some(1), "{stderr}");
    let project = Project::load(&demo()).unwrap_or_else(|e| panic!("{e}"));
    let analysis = Analysis::of(&project.design());
    let options =
        gradewright_draw::SheetOptions { h_scale: Some(1000.0), overlap: 50.0, ..Default::default() };
    let layout = gradewright_draw::layout(&analysis, &options).unwrap_or_else(|e| panic!("{e}"));
    let n = layout.pages.len();
    assert!(n >= 5, "{n} sheets");
    for k in 1..=n {
        let file = dir.join(format!("road-{k}.svg"));
        let text = std::fs::read_to_string(&file).unwrap_or_else(|e| panic!("{}: {e}", file.display()));
        assert!(text.contains(&format!("{k} of {n}")));
        assert!(text.contains("MATCH LINE"), "sheet {k}");
    }
    let body = String::from_utf8_lossy(&std::fs::read(&pdf).unwrap_or_default()).into_owned();
    assert!(body.contains(&format!("/Count {n}")), "{n} pages");
    // Coverage: consecutive sheets overlap by exactly 50 m; the first starts
    // at the first PVI and the last reaches the last one.
    assert!((layout.pages[0].0 - 0.0).abs() < 1e-9);
    for w in layout.pages.windows(2) {
        assert!((w[0].1 - w[1].0 - 50.0).abs() < 1e-6, "{w:?}");
    }
    assert!(layout.pages[n - 1].1 >= 2000.0);
}

/// Refused options stop before anything is written (exit 2, one line).
#[test]
fn refused_options_write_nothing() {
    let dir = scratch("refused");
    let out = dir.join("x.png");
    for args in [
        vec!["--png", &*out.to_string_lossy(), "--sheet", "letterhead"],
        vec!["--png", &*out.to_string_lossy(), "--dpi", "0"],
        vec!["--png", &*out.to_string_lossy(), "--dpi", "100000"],
        vec!["--png", "/nonexistent-folder/x.png"],
        vec!["--png", "/dev/null"],
        vec!["--png", &*out.to_string_lossy(), "--h-scale", "-5"],
        vec![],
    ] {
        let mut full = vec!["export", &*demo().to_string_lossy().into_owned().leak()];
        full.extend(args.iter().copied());
        let (code, stdout, stderr) = run(&full);
        assert_eq!(code, Some(2), "{args:?}: {stdout}{stderr}");
        assert_eq!(stderr.lines().count(), 1, "{args:?}: {stderr}");
        assert!(!out.exists(), "{args:?} wrote a file");
    }
    // A dpi that would make an absurd image is refused with the reason.
    let (code, _, stderr) =
        run(&["export", &s(&demo()), "--png", &s(&out), "--sheet", "2000x2000mm", "--dpi", "1200"]);
    assert_eq!(code, Some(2));
    assert!(stderr.contains("million"), "{stderr}");
    assert!(!out.exists());
}

/// The earthwork totals say which stations they cover, on the command line,
/// in `check` and on the sheet (the demo's survey covers 0+000 to 2+000).
#[test]
fn earthwork_totals_name_the_stations_they_cover() {
    let dir = scratch("earthwork-range");
    let svg = dir.join("alder.svg");
    let (code, _, err) = run(&["export", &s(&demo()), "--svg", &s(&svg)]);
    assert_eq!(code, Some(1), "{err}");
    let text = std::fs::read_to_string(&svg).unwrap_or_default();
    assert!(
        text.contains("Earthwork (level section) from 0+000.000 to 2+000.000, where the ground covers"),
        "no totals on the sheet"
    );
    let (_, out, _) = run(&["check", &s(&demo())]);
    assert!(
        out.contains("earthwork from 0+000.000 to 2+000.000 (where the ground covers the profile)"),
        "{out}"
    );
    let (code, _, err) =
        run(&["earthwork", &s(&demo()), "--width", "10", "--cut-slope", "2", "--fill-slope", "3"]);
    assert_eq!(code, Some(0), "{err}");
    assert!(err.contains("from 0+000.000 to 2+000.000 (where the ground covers the profile)"), "{err}");
}

/// A sheet drawn with the checks off (no design speed) says so where the
/// findings count would be: "0 fail, 0 warn" would read as a pass.
#[test]
fn a_sheet_whose_checks_did_not_run_says_not_checked() {
    let mut project = Project::load(&demo()).unwrap_or_else(|e| panic!("{e}"));
    let options = gradewright_draw::SheetOptions::default();
    let checked = gradewright_draw::sheet_svgs(&Analysis::of(&project.design()), &options)
        .unwrap_or_else(|e| panic!("{e}"))
        .concat();
    assert!(checked.contains("Findings: ") && !checked.contains("NOT CHECKED"));
    project.criteria.design_speed = None;
    let sheets = gradewright_draw::sheet_svgs(&Analysis::of(&project.design()), &options)
        .unwrap_or_else(|e| panic!("{e}"));
    for svg in &sheets {
        assert!(svg.contains("NOT CHECKED: no design speed is set; no curve, grade or sight check has run"));
        assert!(!svg.contains("Findings: 0 fail"), "a count that reads as a pass");
    }
}

/// Every number of a hand-over table, column by column: how many decimals
/// it has.
fn decimals_by_column(path: &Path) -> Vec<(String, std::collections::BTreeSet<usize>)> {
    let mut reader = csv::Reader::from_path(path).unwrap_or_else(|e| panic!("{}: {e}", path.display()));
    let headers: Vec<String> =
        reader.headers().unwrap_or_else(|e| panic!("{e}")).iter().map(str::to_owned).collect();
    let mut seen = vec![std::collections::BTreeSet::new(); headers.len()];
    for row in reader.records() {
        let row = row.unwrap_or_else(|e| panic!("{e}"));
        for (k, field) in row.iter().enumerate() {
            if field.parse::<f64>().is_ok() && !field.contains('+') {
                seen[k].insert(field.split_once('.').map_or(0, |(_, d)| d.len()));
            }
        }
    }
    headers.into_iter().zip(seen).collect()
}

/// The hand-over tables carry what a plan shows, not float noise: a curve of
/// +2.5 % to −1.0 % over 120 m (K = 120/3.5 = 34.2857…, written 34.3, the
/// grade −1.000, not −1.0000000000000029), stations and elevations to
/// 0.001 m, grades to 0.001 %, K and quantities to 0.1; the unit in every
/// column of earthwork.csv (m², m³; ft², yd³ in US units), the mass in
/// compacted measure. `--decimals exact` gives the unrounded numbers,
/// `--decimals N` N decimals everywhere; a count over 15 is refused.
#[test]
fn hand_over_tables_are_rounded_as_a_plan_shows() {
    let dir = scratch("rounded");
    let tables = dir.join("plan");
    let (code, _, err) = run(&["export", &s(&demo()), "--csv-dir", &s(&tables)]);
    assert_eq!(code, Some(1), "{err}");
    let expected = |name: &str| -> Option<usize> {
        match name {
            "pvi" => Some(0),
            n if n.starts_with("k_") => Some(1),
            n if n.contains("percent") => Some(3),
            n if n.ends_with("_m2") || n.ends_with("_m3") => Some(1),
            n if n.ends_with("_m") => Some(3),
            _ => None,
        }
    };
    for table in ["stations.csv", "curves.csv", "findings.csv", "earthwork.csv"] {
        for (column, seen) in decimals_by_column(&tables.join(table)) {
            if let Some(d) = expected(&column) {
                assert!(seen.iter().all(|&s| s == d), "{table} {column}: decimals {seen:?}, want {d}");
            } else {
                assert!(seen.is_empty(), "{table} {column} holds numbers: {seen:?}");
            }
        }
    }
    let curves = std::fs::read_to_string(tables.join("curves.csv")).unwrap_or_default();
    assert!(
        curves.contains(
            "2,320.000,0+320.000,220.400,2.500,-1.000,crest,120.000,60.000,60.000,3.500,34.3,34.3,26.0,"
        ),
        "{curves}"
    );
    let earthwork = std::fs::read_to_string(tables.join("earthwork.csv")).unwrap_or_default();
    assert!(
        earthwork.starts_with(
            "station_m,station_label,cut_area_m2,fill_area_m2,cut_volume_m3,fill_volume_m3,mass_compacted_m3\n"
        ),
        "{earthwork}"
    );
    // Exact: the float as computed.
    let exact = dir.join("exact");
    let (code, _, err) = run(&["export", &s(&demo()), "--csv-dir", &s(&exact), "--decimals", "exact"]);
    assert_eq!(code, Some(1), "{err}");
    let curves = std::fs::read_to_string(exact.join("curves.csv")).unwrap_or_default();
    assert!(curves.contains(&format!(",{},", 120.0 / 3.5)) || curves.contains(",34.28571428571"), "{curves}");
    // Two decimals everywhere.
    let two = dir.join("two");
    let (code, _, err) = run(&["export", &s(&demo()), "--csv-dir", &s(&two), "--decimals", "2"]);
    assert_eq!(code, Some(1), "{err}");
    for (column, seen) in decimals_by_column(&two.join("curves.csv")) {
        if column != "pvi" {
            assert!(seen.iter().all(|&d| d == 2), "{column}: {seen:?}");
        }
    }
    // Refused before anything is written.
    let none = dir.join("none");
    let (code, _, err) = run(&["export", &s(&demo()), "--csv-dir", &s(&none), "--decimals", "16"]);
    assert_eq!(code, Some(2));
    assert!(err.contains("--decimals") && err.contains("'16'"), "{err}");
    assert!(!none.exists());
    // US customary: ft², yd³ and 0.01 ft.
    let us = dir.join("us.ron");
    let mut project = Project::load(&demo()).unwrap_or_else(|e| panic!("{e}"));
    project.units = gradewright_geometry::Units::UsCustomary;
    project.criteria.design_speed = Some(50.0);
    std::fs::write(&us, project.to_ron().unwrap_or_default()).unwrap_or_else(|e| panic!("{e}"));
    let us_tables = dir.join("us");
    let (_, _, err) = run(&["export", &s(&us), "--csv-dir", &s(&us_tables)]);
    let earthwork = std::fs::read_to_string(us_tables.join("earthwork.csv")).unwrap_or_default();
    assert!(
        earthwork.starts_with(
            "station_ft,station_label,cut_area_ft2,fill_area_ft2,cut_volume_yd3,fill_volume_yd3,mass_compacted_yd3\n"
        ),
        "{err}{earthwork}"
    );
    for (column, seen) in decimals_by_column(&us_tables.join("stations.csv")) {
        if column.ends_with("_ft") {
            assert!(seen.iter().all(|&d| d == 2), "{column}: {seen:?}");
        }
    }
}
