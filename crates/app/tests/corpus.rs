//! The bad-input corpus (`tests/corpus/cases.tsv`): every case gives its exit
//! status and message, never panics or hangs, never prints a non-finite
//! number, and writes nothing when it fails.

use std::path::{Path, PathBuf};
use std::process::{Command, Stdio};
use std::time::{Duration, Instant};

fn root() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("../..")
}

/// Runs the binary with a time limit (a hang is a failure, not a stuck test).
fn run(args: &[String]) -> (Option<i32>, String, String) {
    let mut child = Command::new(env!("CARGO_BIN_EXE_gradewright"))
        .args(args)
        .stdin(Stdio::null())
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .unwrap_or_else(|e| panic!("{e}"));
    let start = Instant::now();
    loop {
        if child.try_wait().ok().flatten().is_some() {
            break;
        }
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

#[test]
fn every_corpus_case_gives_its_status_and_message() {
    let corpus = root().join("tests/corpus");
    let assets = root().join("assets");
    let scratch = std::env::temp_dir().join(format!("gradewright-corpus-{}", std::process::id()));
    std::fs::create_dir_all(&scratch).unwrap_or_else(|e| panic!("{e}"));
    let cases = std::fs::read_to_string(corpus.join("cases.tsv")).unwrap_or_else(|e| panic!("{e}"));
    let mut count = 0;
    for (n, line) in cases.lines().enumerate() {
        if line.starts_with('#') || line.trim().is_empty() {
            continue;
        }
        let mut columns = line.splitn(3, '\t');
        let (Some(status), Some(fragment), Some(args)) = (columns.next(), columns.next(), columns.next())
        else {
            panic!("cases.tsv:{}: needs three tab-separated columns", n + 1);
        };
        let status: i32 = status.parse().unwrap_or_else(|e| panic!("cases.tsv:{}: {e}", n + 1));
        let out = scratch.join(format!("out-{n}.ron"));
        let args: Vec<String> = args
            .split(' ')
            .map(|a| {
                a.replace("{corpus}", &corpus.to_string_lossy())
                    .replace("{assets}", &assets.to_string_lossy())
                    .replace("{out}", &out.to_string_lossy())
            })
            .collect();
        let (code, stdout, stderr) = run(&args);
        let case = format!("cases.tsv:{} {args:?}", n + 1);
        assert_eq!(code, Some(status), "{case}: {stderr}");
        assert!(!stderr.contains("panicked"), "{case}: {stderr}");
        if fragment != "-" {
            assert!(stderr.contains(fragment), "{case}: {fragment:?} not in {stderr:?}");
        }
        if status == 2 {
            // Usage errors are clap's (with a usage line); every other is one line.
            if !stderr.starts_with("error:") {
                assert_eq!(stderr.lines().count(), 1, "{case}: one line on stderr: {stderr}");
            }
            assert!(stdout.is_empty(), "{case}: nothing on stdout on bad input: {stdout}");
            assert!(!out.exists(), "{case}: an output was written on failure");
        }
        if status == 0 && out.is_file() && args.first().is_some_and(|a| a == "import" || a == "fit") {
            // Nothing is written that cannot be read back: every project an
            // import or a fit wrote opens again.
            let (code, _, stderr) = run(&["table".to_owned(), out.to_string_lossy().into_owned()]);
            assert_eq!(code, Some(0), "{case}: the written project does not open again: {stderr}");
        }
        for bad in ["NaN", "inf"] {
            assert!(!stdout.contains(bad), "{case}: {bad} in the output");
        }
        assert!(!stderr.contains(".tmp"), "{case}: a temporary named: {stderr}");
        count += 1;
    }
    assert!(count >= 30, "the corpus has {count} cases");
}

/// A 10 MB cell is quoted in a short excerpt, not echoed whole.
#[test]
fn a_huge_cell_is_quoted_short() {
    let dir = std::env::temp_dir().join(format!("gradewright-corpus-cell-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap_or_else(|e| panic!("{e}"));
    let file = dir.join("big.csv");
    let text = format!("station,elevation,curve_length\n0,{},0\n100,1,0\n", "x".repeat(10_000_000));
    std::fs::write(&file, text).unwrap_or_else(|e| panic!("{e}"));
    let (code, _, stderr) = run(&[
        "table".to_owned(),
        file.to_string_lossy().into_owned(),
        "--units".to_owned(),
        "metric".to_owned(),
    ]);
    assert_eq!(code, Some(2));
    assert!(stderr.len() < 400, "{} bytes on stderr", stderr.len());
    assert!(stderr.contains("big.csv:2: elevation") && stderr.contains("10000000 characters"), "{stderr}");
}

/// A reader that closes the pipe early (`| head -1`) ends the output quietly.
#[test]
fn a_closed_pipe_ends_quietly() {
    let mut child = Command::new(env!("CARGO_BIN_EXE_gradewright"))
        .args(["table", &root().join("assets/alder-brook-road.ron").to_string_lossy(), "--interval", "0.01"])
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .unwrap_or_else(|e| panic!("{e}"));
    // Read one line, then close our end.
    let mut stdout = child.stdout.take().unwrap_or_else(|| panic!("no stdout"));
    let mut first = [0u8; 64];
    let _ = std::io::Read::read(&mut stdout, &mut first);
    drop(stdout);
    let out = child.wait_with_output().unwrap_or_else(|e| panic!("{e}"));
    assert_eq!(out.status.code(), Some(0), "{}", String::from_utf8_lossy(&out.stderr));
    assert!(out.stderr.is_empty(), "{}", String::from_utf8_lossy(&out.stderr));
}
