//! The command line, run as a user would: output text, exit status, errors.

use std::path::{Path, PathBuf};
use std::process::{Command, Output};

fn bin() -> Command {
    Command::new(env!("CARGO_BIN_EXE_gradewright"))
}

fn asset(name: &str) -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("../../assets").join(name)
}

fn run(args: &[&str]) -> Output {
    bin().args(args).output().unwrap_or_else(|e| panic!("{e}"))
}

fn stdout(o: &Output) -> String {
    String::from_utf8_lossy(&o.stdout).into_owned()
}

fn stderr(o: &Output) -> String {
    String::from_utf8_lossy(&o.stderr).into_owned()
}

fn temp_file(name: &str, text: &str) -> PathBuf {
    let dir = std::env::temp_dir().join(format!("gradewright-cli-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap_or_else(|e| panic!("{e}"));
    let path = dir.join(name);
    std::fs::write(&path, text).unwrap_or_else(|e| panic!("{e}"));
    path
}

/// `table --at` on a worked crest, hand-computed (derived from the parabola
/// relations in Mannering & Washburn, ch. 3): PVI 32+00 at 842.60 ft,
/// +3.0 % / −2.0 %, L 400 ft; 33+00 at 839.975 (−0.75 %), 31+00 at 838.975
/// (+1.75 %), in the order given.
#[test]
fn table_at_stations_reproduces_a_worked_crest() {
    let csv = temp_file(
        "worked-crest.csv",
        "station,elevation,curve_length\n26+00,824.6,\n32+00,842.60,400\n38+00,830.6,0\n",
    );
    let csv = csv.to_string_lossy().into_owned();
    let o = run(&["table", &csv, "--units", "us", "--at", "33+00", "--at", "3100", "--decimals", "3"]);
    assert!(o.status.success(), "{}", stderr(&o));
    let text = stdout(&o);
    let lines: Vec<_> = text.lines().collect();
    assert_eq!(lines[0], "station,station_label,elevation,grade_percent");
    assert_eq!(lines[1], "3300.000,33+00.000,839.975,-0.750");
    assert_eq!(lines[2], "3100.000,31+00.000,838.975,1.750");
    assert_eq!(lines.len(), 3);
}

/// A station typed at the very end of a profile converted from metres is
/// that end: 92.9 m is 304.790026246719… ft, and `--at 304.7900263` (the
/// end rounded up to seven decimals, 5e-8 ft past it) is accepted as it; a
/// station a thousandth past the end is still refused.
#[test]
fn at_the_end_of_a_converted_profile_within_the_station_tolerance() {
    let csv = temp_file("end-m.csv", "station,elevation,curve_length\n0,100,0\n50,103,30\n92.9,101,0\n");
    let xml = csv.with_extension("xml");
    let o = run(&[
        "export",
        &csv.to_string_lossy(),
        "--units",
        "metric",
        "--design-speed",
        "50",
        "--landxml",
        &xml.to_string_lossy(),
    ]);
    assert!(o.status.code().is_some_and(|c| c <= 1), "{}", stderr(&o));
    let xml = xml.to_string_lossy().into_owned();
    let o = run(&[
        "table",
        &xml,
        "--units",
        "us",
        "--at",
        "304.7900262",
        "--at",
        "304.7900263",
        "--decimals",
        "3",
    ]);
    assert!(o.status.success(), "{}", stderr(&o));
    // 101 m is 331.365 ft; both rows are the end.
    assert_eq!(stdout(&o).lines().nth(2), stdout(&o).lines().nth(1));
    assert_eq!(stdout(&o).lines().nth(1), Some("304.790,3+04.790,331.365,-4.662"), "{}", stdout(&o));
    // And the start the same way.
    let o = run(&["table", &xml, "--units", "us", "--at", "-0.0000001", "--decimals", "3"]);
    assert_eq!(stdout(&o).lines().nth(1), Some("0.000,0+00.000,328.084,6.000"), "{}", stderr(&o));
    let o = run(&["table", &xml, "--units", "us", "--at", "304.791"]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("304.791 is outside the profile"), "{}", stderr(&o));
}

/// `check --format json` on the demo: both control points met at the
/// profile's elevation there, the ground's extent and the earthwork totals
/// with the stations they cover, equal to what `earthwork` reports.
#[test]
fn check_json_carries_the_site() {
    let demo = asset("alder-brook-road.ron").to_string_lossy().into_owned();
    let o = run(&["check", &demo, "--format", "json"]);
    let json: serde_json::Value = serde_json::from_str(&stdout(&o)).unwrap_or_else(|e| panic!("{e}"));
    let controls = json["controls"].as_array().cloned().unwrap_or_default();
    assert_eq!(controls.len(), 2);
    assert_eq!(controls[0]["kind"], "fixed");
    assert_eq!(controls[0]["status"], "met");
    assert!((controls[0]["tolerance"].as_f64().unwrap_or(f64::NAN) - 0.02).abs() < 1e-12);
    // The culvert at 0+690 on the sag (PVC 620 at 217.4, −1 % to +3 %,
    // L 160): y = 217.4 − 0.01·70 + (0.04/160)·70²/2 = 217.3125.
    assert_eq!(controls[1]["station"], 690.0);
    assert!((controls[1]["profile"].as_f64().unwrap_or(f64::NAN) - 217.3125).abs() < 1e-9, "{json}");
    assert_eq!((json["ground"]["start"].as_f64(), json["ground"]["end"].as_f64()), (Some(0.0), Some(2000.0)));
    let earthwork = &json["earthwork"];
    assert_eq!((earthwork["start"].as_f64(), earthwork["end"].as_f64()), (Some(0.0), Some(2000.0)));
    assert_eq!(earthwork["volume_unit"], "m³");
    let o = run(&[
        "earthwork",
        &demo,
        "--width",
        "10",
        "--cut-slope",
        "2",
        "--fill-slope",
        "3",
        "--shrinkage",
        "10",
    ]);
    let said = stderr(&o);
    let cut = earthwork["cut"].as_f64().unwrap_or(f64::NAN);
    assert!(said.contains(&format!("cut {cut:.1} m³")), "{said} vs {cut}");
}

#[test]
fn table_interval_includes_ends_and_key_points() {
    let o = run(&["table", &asset("alder-brook-road.ron").to_string_lossy(), "--interval", "100"]);
    assert!(o.status.success(), "{}", stderr(&o));
    let text = stdout(&o);
    let stations: Vec<f64> = text
        .lines()
        .skip(1)
        .map(|l| l.split(',').next().and_then(|s| s.parse().ok()).unwrap_or(f64::NAN))
        .collect();
    for key in [0.0, 100.0, 260.0, 320.0, 380.0, 1055.0, 1500.0, 1640.0, 2000.0] {
        assert!(stations.contains(&key), "missing {key}: {stations:?}");
    }
    assert!(stations.windows(2).all(|w| w[0] < w[1]), "not sorted");
    // Unrounded numbers are the shortest exact form, not padded.
    assert!(text.contains("\n0,0+000.000,212.4,2.5"), "{text}");
}

#[test]
fn check_json_has_the_documented_shape() {
    let o = run(&["check", &asset("alder-brook-road.ron").to_string_lossy(), "--format", "json"]);
    assert_eq!(o.status.code(), Some(1), "the demo has a failing crest: {}", stderr(&o));
    let v: serde_json::Value = serde_json::from_str(&stdout(&o)).unwrap_or_else(|e| panic!("{e}"));
    assert_eq!(v["units"], "metric");
    assert_eq!(v["design_speed"], 80.0);
    // AASHTO metric Table 3-1 (from memory): 80 km/h → 130 m.
    assert_eq!(v["ssd_required"], 130.0);
    let curves = v["curves"].as_array().map_or(0, Vec::len);
    assert_eq!(curves, 4);
    let crest = &v["curves"][2];
    for key in [
        "pvi_station",
        "pvi_elevation",
        "kind",
        "g1",
        "g2",
        "a",
        "length",
        "k",
        "k_required",
        "length_required",
        "pvc_station",
        "pvc_elevation",
        "pvt_station",
        "pvt_elevation",
        "turning_station",
        "turning_elevation",
        "ok",
    ] {
        assert!(crest.get(key).is_some(), "missing {key}");
    }
    assert_eq!(crest["kind"], "crest");
    assert_eq!(crest["ok"], false);
    // AASHTO metric Table 3-34 (from memory): 80 km/h → crest K 26.
    assert_eq!(crest["k_required"], 26.0);
    let finding = &v["findings"][0];
    for key in ["severity", "code", "station_start", "station_end", "message"] {
        assert!(finding.get(key).is_some(), "missing {key}");
    }
}

#[test]
fn design_speed_flag_overrides_and_passing_exits_zero() {
    let csv = asset("cedar-hollow-lane.csv").to_string_lossy().into_owned();
    let o = run(&["check", &csv, "--units", "us", "--design-speed", "45"]);
    assert_eq!(o.status.code(), Some(0), "{}{}", stdout(&o), stderr(&o));
    let o = run(&["check", &csv, "--units", "us", "--design-speed", "70"]);
    assert_eq!(o.status.code(), Some(1), "70 mph needs crest K 247: {}", stdout(&o));
    let o = run(&["check", &csv, "--units", "us"]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("design speed"), "{}", stderr(&o));
}

#[test]
fn bad_inputs_exit_2_with_file_line_and_field() {
    let bad = temp_file("bad.csv", "station,elevation,curve_length\n0+00,100,0\n5+00,abc,0\n");
    let o = run(&["table", &bad.to_string_lossy(), "--units", "us"]);
    assert_eq!(o.status.code(), Some(2));
    let err = stderr(&o);
    assert!(err.contains("bad.csv:3: elevation:"), "{err}");
    assert_eq!(err.trim().lines().count(), 1, "one line: {err}");

    let bad = temp_file(
        "bad.ron",
        "Project(format_version: 1, units: Metric,\n pvis: [Pvi(station: 1.0 elevation: 2.0)])\n",
    );
    let o = run(&["check", &bad.to_string_lossy(), "--design-speed", "50"]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("bad.ron:2:"), "{}", stderr(&o));

    let o = run(&["table", &asset("cedar-hollow-lane.csv").to_string_lossy()]);
    assert_eq!(o.status.code(), Some(2), "CSV without --units");
    let o = run(&["table", &asset("alder-brook-road.ron").to_string_lossy(), "--units", "us"]);
    assert_eq!(o.status.code(), Some(2), "units that disagree with the project");
    assert!(stderr(&o).contains("never converted"), "{}", stderr(&o));
    let o = run(&["table", &asset("alder-brook-road.ron").to_string_lossy(), "--at", "9+000"]);
    assert_eq!(o.status.code(), Some(2), "station outside the profile");
    assert!(stderr(&o).contains("outside"), "{}", stderr(&o));
    let o = run(&["table", "/nonexistent/x.ron"]);
    assert_eq!(o.status.code(), Some(2));
    let o = run(&["frobnicate"]);
    assert_eq!(o.status.code(), Some(2));
}

/// No input file makes the program panic: a few hostile files.
#[test]
fn never_panics_on_odd_files() {
    let cases = [
        ("empty.csv", ""),
        ("header.csv", "station,elevation,curve_length\n"),
        ("one.csv", "station,elevation,curve_length\n0,1,0\n"),
        ("nan.csv", "station,elevation,curve_length\n0,NaN,0\n10,1,0\n"),
        ("ragged.csv", "station,elevation,curve_length\n0,1\n"),
        ("overlap.csv", "station,elevation,curve_length\n0,0,0\n10,1,15\n20,0,15\n30,1,0\n"),
        ("binary.ron", "\u{0}\u{1}\u{2}garbage(("),
        ("empty.ron", ""),
        ("neg.csv", "station,elevation,length_in,length_out\n0,0,0,0\n10,1,-3,2\n20,0,0,0\n"),
        ("big.csv", "station,elevation,curve_length\n0,0,0\n1e308,1,0\n"),
    ];
    for (name, text) in cases {
        let path = temp_file(name, text).to_string_lossy().into_owned();
        for args in [
            vec!["table", &path, "--units", "metric"],
            vec!["check", &path, "--units", "metric", "--design-speed", "60", "--format", "json"],
        ] {
            let o = run(&args);
            let code = o.status.code();
            assert!(matches!(code, Some(0..=2)), "{name}: {code:?} {}", stderr(&o));
            assert!(!stderr(&o).contains("panicked"), "{name}: {}", stderr(&o));
        }
    }
}

#[test]
fn sight_writes_the_documented_csv() {
    let o = run(&["sight", &asset("alder-brook-road.ron").to_string_lossy(), "--step", "10"]);
    assert!(o.status.success(), "{}", stderr(&o));
    let text = stdout(&o);
    let mut lines = text.lines();
    assert_eq!(
        lines.next(),
        Some("station,available_forward,available_backward,required_forward,required_backward,reaches_cap")
    );
    let lines: Vec<&str> = lines.collect();
    let flags: Vec<&str> = lines.iter().filter_map(|l| l.rsplit(',').next()).collect();
    assert!(flags.iter().all(|f| ["none", "forward", "backward", "both"].contains(f)), "{flags:?}");
    let rows: Vec<Vec<f64>> =
        lines.iter().map(|l| l.split(',').take(5).map(|v| v.parse().unwrap_or(f64::NAN)).collect()).collect();
    assert_eq!(rows.len(), 201, "0 to 2000 every 10 m");
    // Where the flag says the cap, the number is the cap (3 × 130 m), and
    // where a number is the cap the flag says so.
    for (row, flag) in rows.iter().zip(&flags) {
        let capped = (row[1] >= 390.0 - 1e-9, row[2] >= 390.0 - 1e-9);
        let expected = match capped {
            (false, false) => "none",
            (true, false) => "forward",
            (false, true) => "backward",
            (true, true) => "both",
        };
        assert_eq!(*flag, expected, "{row:?}");
    }
    assert!(flags.contains(&"both"), "the demo's long tangents reach the cap");
    // The short crest at PVI 4 (L 90 m, A 5 %) leaves (L + C/A)/2 = 110.8 m at
    // worst (S > L, C = 100(√2.16 + √1.2)², Green Book 2018 eq. 3-42; derived) < 130 m.
    let worst = rows.iter().map(|r| r[1]).fold(f64::INFINITY, f64::min);
    assert!((worst - 110.8).abs() < 0.5, "{worst}");
    assert!(rows.iter().all(|r| (r[3] - 130.0).abs() < 1e-9), "design SSD 130 m at 80 km/h");
}

#[test]
fn fit_writes_the_same_format_and_reports() {
    let dir = std::env::temp_dir().join(format!("gradewright-cli-fit-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap_or_else(|e| panic!("{e}"));
    let out = dir.join("fitted.ron");
    let o = run(&["fit", &asset("alder-brook-road.ron").to_string_lossy(), "-o", &out.to_string_lossy()]);
    assert_eq!(o.status.code(), Some(0), "{}{}", stdout(&o), stderr(&o));
    assert!(stdout(&o).contains("PVI 4: lengthened from 90.00 m to 130.00 m"), "{}", stdout(&o));
    let o = run(&["check", &out.to_string_lossy()]);
    assert_eq!(o.status.code(), Some(0), "{}", stdout(&o));
    // A CSV input gives a CSV output; at 70 mph one crest cannot fit.
    let out = dir.join("fitted.csv");
    let csv = asset("cedar-hollow-lane.csv").to_string_lossy().into_owned();
    let o = run(&["fit", &csv, "--units", "us", "--design-speed", "70", "-o", &out.to_string_lossy()]);
    assert_eq!(o.status.code(), Some(1));
    assert!(stdout(&o).contains("needs 800 ft, at most 500 ft fits"), "{}", stdout(&o));
    let written = std::fs::read_to_string(&out).unwrap_or_default();
    assert!(written.starts_with("station,elevation,curve_length\n"), "{written}");
    assert!(written.contains("19+00.00,846.1,570"), "{written}");
}

/// An unequal-tangent crest is reported with its total length, both K values
/// and the total length needed at its own ratio, the same in JSON and text:
/// 300 m + 500 m with A = 6 % at 120 km/h needs 570 × 5/3 = 950 m (K 95,
/// Green Book 2018 Table 3-34, metric, from memory; ratio derived from the
/// branch rates).
#[test]
fn unequal_tangent_curve_reports_the_total_length_needed() {
    let dir = std::env::temp_dir().join(format!("gradewright-cli-unequal-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap_or_else(|e| panic!("{e}"));
    let file = dir.join("unequal.ron");
    std::fs::write(
        &file,
        "Project(format_version: 1, name: \"unequal\", units: Metric, criteria: Criteria(design_speed: Some(120.0)),\n\
         pvis: [Pvi(station: 0.0, elevation: 100.0),\n\
         Pvi(station: 1000.0, elevation: 130.0, curve: Unequal(length_in: 300.0, length_out: 500.0)),\n\
         Pvi(station: 2000.0, elevation: 100.0)])\n",
    )
    .unwrap_or_else(|e| panic!("{e}"));
    let o = run(&["check", &file.to_string_lossy(), "--format", "json"]);
    assert_eq!(o.status.code(), Some(1), "{}", stderr(&o));
    let json: serde_json::Value = serde_json::from_str(&stdout(&o)).unwrap_or_else(|e| panic!("{e}"));
    let curve = &json["curves"][0];
    let number = |key: &str| curve[key].as_f64().unwrap_or(f64::NAN);
    assert!((number("length") - 800.0).abs() < 1e-9);
    assert!((number("length_in") - 300.0).abs() < 1e-9);
    assert!((number("k") - 80.0).abs() < 1e-9, "sharper branch");
    assert!((number("k_overall") - 800.0 / 6.0).abs() < 1e-9, "L/A");
    assert!((number("length_required") - 950.0).abs() < 1e-6, "{curve}");
    let o = run(&["check", &file.to_string_lossy()]);
    let text = stdout(&o);
    assert!(text.contains("needs L ≥ 950.00 m in all"), "{text}");
    assert!(text.contains("950.00  FAIL"), "{text}");
}

/// `import --ground` merges a ground profile (semicolon-delimited, with a
/// byte-order mark, unsorted) into the project: sorted, with a warning, and
/// the rest of the project kept.
#[test]
fn import_merges_the_ground_into_the_project() {
    let ground = temp_file(
        "ground-import.csv",
        "\u{feff}station;elevation\r\n0+040;213.1\r\n0+000;212.0\r\n0+020;212.6\r\n",
    );
    let out = std::env::temp_dir().join(format!("gradewright-cli-{}/with-ground.ron", std::process::id()));
    let _ = std::fs::remove_file(&out);
    let o = run(&[
        "import",
        &asset("alder-brook-road.ron").to_string_lossy(),
        "--ground",
        &ground.to_string_lossy(),
        "-o",
        &out.to_string_lossy(),
    ]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    let text = stdout(&o);
    assert!(text.contains("sorted"), "{text}");
    assert!(text.contains("3 ground point(s) from 0+000.000 to 0+040.000"), "{text}");
    let project = gradewright_document::Project::load(&out).unwrap_or_else(|e| panic!("{e}"));
    let points: Vec<(f64, f64)> = project.ground.iter().map(|g| (g.station, g.elevation)).collect();
    assert_eq!(points, vec![(0.0, 212.0), (20.0, 212.6), (40.0, 213.1)]);
    let original =
        gradewright_document::Project::load(&asset("alder-brook-road.ron")).unwrap_or_else(|e| panic!("{e}"));
    assert_eq!(project.pvis, original.pvis);
    assert_eq!(project.criteria, original.criteria);
}

/// Ground and control points imported together; `check` reports the missed
/// control point and fails, `table` gains the ground columns, `earthwork`
/// gives the hand-computed average-end-area volumes (Ghilani and Wolf,
/// *Elementary Surveying*, 13th ed., ch. 26, V = L(A1 + A2)/2; see
/// `earthwork.rs` for the arithmetic).
#[test]
fn site_data_flows_through_check_table_and_earthwork() {
    let pvis = temp_file("site-pvis.csv", "station,elevation,curve_length\n0,100,\n20,100,\n");
    let ground = temp_file("site-ground.csv", "0,101\n20,99\n");
    let controls = temp_file(
        "site-controls.csv",
        "station,kind,elevation,tolerance,name\n10,min,100.5,,Culvert C1\n15,max,100.2,,Footbridge\n",
    );
    let out = std::env::temp_dir().join(format!("gradewright-cli-{}/site.ron", std::process::id()));
    let _ = std::fs::remove_file(&out);
    let (pvis, ground, controls, out_s) = (
        pvis.to_string_lossy().into_owned(),
        ground.to_string_lossy().into_owned(),
        controls.to_string_lossy().into_owned(),
        out.to_string_lossy().into_owned(),
    );
    let o = run(&[
        "import",
        &pvis,
        "--units",
        "metric",
        "--ground",
        &ground,
        "--controls",
        &controls,
        "-o",
        &out_s,
    ]);
    assert_eq!(o.status.code(), Some(0), "{}", stderr(&o));
    assert!(stdout(&o).contains("2 control point(s)"), "{}", stdout(&o));

    let o = run(&["check", &out_s, "--design-speed", "50"]);
    let text = stdout(&o);
    assert_ne!(o.status.code(), Some(0), "a missed control point fails: {text}");
    assert!(text.contains("control.min"), "{text}");
    assert!(text.contains("0.500 m below the minimum 100.500"), "{text}");
    assert!(!text.contains("control.max"), "a met point gives no finding: {text}");
    assert!(text.contains("Footbridge") && text.contains("met"), "the site section lists it: {text}");
    // The JSON report carries the control points, the ground and the
    // earthwork totals too.
    let o = run(&["check", &out_s, "--design-speed", "50", "--format", "json"]);
    let json: serde_json::Value = serde_json::from_str(&stdout(&o)).unwrap_or_else(|e| panic!("{e}"));
    let controls = json["controls"].as_array().cloned().unwrap_or_default();
    assert_eq!(controls.len(), 2, "{json}");
    let missed: Vec<_> = controls.iter().filter(|c| c["status"] == "missed").collect();
    assert_eq!(missed.len(), 1, "{json}");
    assert_eq!(missed[0]["kind"], "min");
    assert!((missed[0]["miss"].as_f64().unwrap_or(f64::NAN) - 0.5).abs() < 1e-9, "{json}");
    assert!((missed[0]["elevation"].as_f64().unwrap_or(f64::NAN) - 100.5).abs() < 1e-9, "{json}");
    assert!(controls.iter().any(|c| c["name"] == "Footbridge" && c["status"] == "met" && c["miss"] == 0.0));
    assert!(json["ground"]["points"].as_u64().is_some_and(|n| n >= 2), "{json}");

    let o = run(&["table", &out_s, "--interval", "10"]);
    assert!(o.status.success(), "{}", stderr(&o));
    let text = stdout(&o);
    let lines: Vec<&str> = text.lines().collect();
    assert_eq!(
        lines.first().copied(),
        Some("station,station_label,elevation,grade_percent,ground_elevation,cut,fill")
    );
    assert_eq!(lines.get(1).copied(), Some("0,0+000.000,100,0,101,1,0"));
    assert_eq!(lines.get(3).copied(), Some("20,0+020.000,100,0,99,0,1"));

    let o = run(&[
        "earthwork",
        &out_s,
        "--width",
        "10",
        "--cut-slope",
        "2",
        "--fill-slope",
        "3",
        "--shrinkage",
        "10",
        "--interval",
        "20",
    ]);
    assert!(o.status.success(), "{}", stderr(&o));
    let text = stdout(&o);
    let lines: Vec<&str> = text.lines().collect();
    assert_eq!(
        lines.first().copied(),
        Some(
            "station_m,station_label,cut_area_m2,fill_area_m2,cut_volume_m3,fill_volume_m3,mass_compacted_m3"
        )
    );
    assert_eq!(lines.get(1).copied(), Some("0,0+000.000,12,0,0,0,0"));
    assert_eq!(lines.get(2).copied(), Some("10,0+010.000,0,0,60,0,54"));
    assert_eq!(lines.get(3).copied(), Some("20,0+020.000,0,13,0,65,-11"));
    assert_eq!(lines.len(), 4);
    assert!(stderr(&o).contains("level-section"), "{}", stderr(&o));
    // Rounded on request as a plan shows it (0.001 m, quantities to 0.1).
    let o = run(&[
        "earthwork",
        &out_s,
        "--width",
        "10",
        "--cut-slope",
        "2",
        "--fill-slope",
        "3",
        "--shrinkage",
        "10",
        "--interval",
        "20",
        "--decimals",
        "plan",
    ]);
    assert!(o.status.success(), "{}", stderr(&o));
    assert_eq!(stdout(&o).lines().nth(2), Some("10.000,0+010.000,0.0,0.0,60.0,0.0,54.0"));

    // Bad input: one line naming the flag, exit 2, nothing on stdout.
    let o = run(&["earthwork", &out_s, "--width", "-1", "--cut-slope", "2", "--fill-slope", "2"]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stdout(&o).is_empty());
    assert_eq!(stderr(&o).trim().lines().count(), 1, "{}", stderr(&o));
    assert!(stderr(&o).contains("--width"), "{}", stderr(&o));
    let o = run(&[
        "earthwork",
        &pvis,
        "--units",
        "metric",
        "--width",
        "10",
        "--cut-slope",
        "2",
        "--fill-slope",
        "2",
    ]);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("no ground"), "{}", stderr(&o));
}

/// `check --step` and `fit --step` set the sight-distance station step as
/// `sight --step` does: a step so small that the stations pass the limit is
/// refused (exit 2, naming the option to use), a usable one runs, and a
/// step that is not a positive number is bad usage.
#[test]
fn check_and_fit_take_the_sight_step() {
    let project = asset("alder-brook-road.ron");
    let project = project.to_string_lossy();
    let out = temp_file("fitted.ron", "");
    let out = out.to_string_lossy();
    let tiny = run(&["check", &project, "--step", "1e-6"]);
    assert_eq!(tiny.status.code(), Some(2), "{}", stderr(&tiny));
    assert!(stderr(&tiny).contains("--step"), "{}", stderr(&tiny));
    let coarse = run(&["check", &project, "--step", "10", "--format", "json"]);
    assert!(matches!(coarse.status.code(), Some(0 | 1)), "{}", stderr(&coarse));
    assert!(stdout(&coarse).contains("\"findings\""), "{}", stdout(&coarse));
    for args in [["check", &project, "--step", "0"], ["fit", &project, "--step", "-5"]] {
        let bad = if args[0] == "fit" {
            run(&[args[0], args[1], args[2], args[3], "-o", &out])
        } else {
            run(&args)
        };
        assert_eq!(bad.status.code(), Some(2), "{args:?}: {}", stderr(&bad));
        assert!(stderr(&bad).contains("--step"), "{}", stderr(&bad));
    }
    let fitted = run(&["fit", &project, "--step", "2", "-o", &out]);
    assert!(matches!(fitted.status.code(), Some(0 | 1)), "{}", stderr(&fitted));
}

/// Two curves that exactly touch (PVT 130.4 = PVC 130.4 but for round-off:
/// 100.3 + 30.1 and 170.6 − 40.2) are no overlap, and the profile is
/// evaluated at the point where they meet (common practice: curves may
/// abut).
#[test]
fn curves_that_exactly_touch_are_no_overlap() {
    let csv = temp_file(
        "touching.csv",
        "station,elevation,curve_length\n0,100,0\n100.3,103,60.2\n170.6,100.5,80.4\n300,104,0\n",
    );
    let csv = csv.to_string_lossy().into_owned();
    let o = run(&["check", &csv, "--units", "metric", "--design-speed", "50"]);
    let text = stdout(&o);
    assert!(!text.contains("curve.overlap") && !text.contains("exceeds-tangent"), "{text}");
    let o = run(&["table", &csv, "--units", "metric", "--at", "130", "--at", "130.4"]);
    assert!(o.status.success(), "{}", stderr(&o));
    assert_eq!(stdout(&o).lines().count(), 3, "{}", stdout(&o));
}

/// Tables are on even stations, as plans and cross-sections are stationed
/// (common practice): a road from 12+34.56 at 50 ft gives 12+34.56, 12+50,
/// 13+00, … and the end, plus the PVC, PVI and PVT of its curve.
#[test]
fn tables_are_on_even_stations() {
    let csv = temp_file(
        "uneven-start.csv",
        "station,elevation,curve_length\n12+34.56,500,0\n15+00,505,200\n18+10.20,498,0\n",
    );
    let csv = csv.to_string_lossy().into_owned();
    let o = run(&["table", &csv, "--units", "us", "--interval", "50", "--decimals", "2"]);
    assert!(o.status.success(), "{}", stderr(&o));
    let text = stdout(&o);
    let stations: Vec<&str> = text.lines().skip(1).filter_map(|l| l.split(',').nth(1)).collect();
    assert_eq!(stations.first().copied(), Some("12+34.56"));
    assert_eq!(stations.get(1..4), Some(&["12+50.00", "13+00.00", "13+50.00"][..]), "{stations:?}");
    assert!(stations.contains(&"14+00.00") && stations.contains(&"16+00.00"), "{stations:?}");
    assert_eq!(stations.last().copied(), Some("18+10.20"));
}

/// A survey with a no-data elevation and a long gap imports, with a warning
/// for each saying where; `check` then lists them as warnings (never a
/// silent 10 099 m of fill).
#[test]
fn implausible_ground_is_warned_about() {
    let ground = temp_file(
        "no-data-ground.csv",
        "station,elevation\n0,212\n10,212.1\n20,-9999\n30,212.3\n40,212.4\n400,213\n",
    );
    let out = std::env::temp_dir().join(format!("gradewright-cli-{}-no-data.ron", std::process::id()));
    let o = run(&[
        "import",
        &asset("alder-brook-road.ron").to_string_lossy(),
        "--ground",
        &ground.to_string_lossy(),
        "-o",
        &out.to_string_lossy(),
    ]);
    assert!(o.status.success(), "{}", stderr(&o));
    let said = stdout(&o);
    assert!(said.contains("warning:") && said.contains("0+020.000 has elevation -9999"), "{said}");
    assert!(said.contains("no point from 0+040.000 to 0+400.000"), "{said}");
    let o = run(&["check", &out.to_string_lossy()]);
    let text = stdout(&o);
    assert_eq!(text.matches("[WARN] ground.suspicious").count(), 2, "{text}");
}

/// A LandXML alignment with a station equation (the repository's fictional
/// Birch Hollow Connector, US survey feet, 15+00 back = 16+00 ahead at
/// internal 1500): `table --at 17+00` is internal 1600, labelled 17+00.00,
/// elevation 419.5 − 0.014 × 200 = 416.7 ft (the −1.4 % tangent from PVI
/// 14+00, 419.5 ft; derived from the tangent grade); a station in the gap
/// is refused naming it; the sight table labels plan stations; `check`
/// lists the equation.
#[test]
fn station_equations_from_landxml_label_and_locate_plan_stations() {
    let file = Path::new(env!("CARGO_MANIFEST_DIR")).join("../../tests/data/kept/birch-hollow-connector.xml");
    let file = file.to_string_lossy().into_owned();
    let pick = ["--alignment", "BHC-1", "--profile", "Design"];
    let mut args = vec!["table", file.as_str()];
    args.extend(pick);
    args.extend(["--at", "17+00"]);
    let o = run(&args);
    assert!(o.status.success(), "{}", stderr(&o));
    let row = stdout(&o).lines().nth(1).unwrap_or_default().to_owned();
    assert!(row.starts_with("1600,17+00.00,416.7,-1.4"), "{row}");
    assert!(stderr(&o).contains("1 station equation(s): applied"), "{}", stderr(&o));
    let mut args = vec!["table", file.as_str()];
    args.extend(pick);
    args.extend(["--at", "15+50"]);
    let o = run(&args);
    assert_eq!(o.status.code(), Some(2));
    assert!(stderr(&o).contains("--at: station '15+50' does not exist"), "{}", stderr(&o));
    assert!(stdout(&o).is_empty());
    let mut args = vec!["sight", file.as_str()];
    args.extend(pick);
    let o = run(&args);
    assert!(o.status.success(), "{}", stderr(&o));
    let text = stdout(&o);
    assert!(text.starts_with("station,station_label,available_forward"), "{text}");
    assert!(text.lines().any(|l| l.starts_with("1600,17+00.00,")), "no row at 17+00");
    let mut args = vec!["check", file.as_str()];
    args.extend(pick);
    let o = run(&args);
    assert!(stdout(&o).contains("15+00.00 back = 16+00.00 ahead (internal station 1500)"), "{}", stdout(&o));
    assert!(stdout(&o).contains("PVI 4 (23+50.00)"), "{}", stdout(&o));
}
