//! `check`: every curve and every finding, as text or JSON.

use std::process::ExitCode;

use anyhow::bail;
use gradewright_geometry::{Alignment, Analysis};

use super::args::{CheckArgs, Format};
use super::{Run, Spill, print, refuse_unchecked_sight, report};

/// Runs `check`.
///
/// # Errors
/// Bad input or options (a profile that cannot be evaluated at all included).
pub fn run(run: &mut Run, args: &CheckArgs) -> anyhow::Result<ExitCode> {
    let input = &args.source.input;
    let (loaded, criteria) = run.load_checked(&args.source, &args.checking)?;
    // Input that cannot be evaluated at all is bad input (exit 2), as for
    // every other command; curves that overlap or do not fit are design
    // failures and are listed as findings.
    let problems = loaded.project.profile().problems();
    if let Some(problem) = problems.iter().find(|p| !gradewright_geometry::is_design_problem(p)) {
        let more = problems.len() - 1;
        let more = if more == 0 { String::new() } else { format!(" (and {more} more problem(s))") };
        bail!("{}: {problem}{more}", loaded.locate(problem));
    }
    if let Ok(alignment) = Alignment::new(&loaded.project.profile()) {
        refuse_unchecked_sight(&alignment, &criteria, input, true)?;
    }
    let project = loaded.project;
    let analysis = Analysis::once(&project.design());
    let checks = &analysis.report;
    match args.format {
        // The text report streams (memory stays flat however many findings).
        Format::Text => {
            let mut out = Spill::new();
            let written = report::text(&mut out, &project, &criteria, &analysis);
            out.finish(written.map_err(anyhow::Error::from))?;
        }
        Format::Json => print(report::json(&project, &criteria, &analysis)?.as_bytes())?,
    }
    Ok(if checks.has_failures() { ExitCode::from(1) } else { ExitCode::SUCCESS })
}
