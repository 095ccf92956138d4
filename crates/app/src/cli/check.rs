//! `check`: every curve and every finding, as text or JSON.

use std::process::ExitCode;

use anyhow::bail;
use gradewright_geometry::{Alignment, Analysis, PVIS_PER_STRETCH, StreamedCheck};

use super::args::{CheckArgs, Format};
use super::{Run, Spill, print, refuse_unchecked_sight, report};

/// PVIs from which `check` and `fit` check a stretch at a time. Streaming
/// computes the sight distance twice (a pass to count, a pass to write) on
/// one core's worth of curves, so below this the whole analysis is faster
/// (100k dense PVIs: 1.85 s whole, 3.31 s streamed) and its memory, about
/// 5 kB a PVI when every curve fails, is still moderate.
pub const STREAM_FROM: usize = 200_000;

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
    let design = project.design();
    // A long profile's text report is checked and written an item at a
    // time (the same report: memory stays flat however many findings).
    if args.format == Format::Text
        && design.pvis.len() >= STREAM_FROM
        && let Some(streamed) = StreamedCheck::new(&design, PVIS_PER_STRETCH)
    {
        let mut out = Spill::new();
        let written = report::text(&mut out, &project, &criteria, &streamed);
        out.finish(written.map_err(anyhow::Error::from))?;
        return Ok(if streamed.has_failures() { ExitCode::from(1) } else { ExitCode::SUCCESS });
    }
    let analysis = Analysis::once(&design);
    match args.format {
        Format::Text => {
            let mut out = Spill::new();
            let written = report::text(&mut out, &project, &criteria, &analysis);
            out.finish(written.map_err(anyhow::Error::from))?;
        }
        Format::Json => print(report::json(&project, &criteria, &analysis)?.as_bytes())?,
    }
    Ok(if analysis.has_failures() { ExitCode::from(1) } else { ExitCode::SUCCESS })
}
