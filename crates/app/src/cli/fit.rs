//! `fit`: Lengthen to clear on every failing curve, written as a new file.

use std::process::ExitCode;

use std::io::Write as _;

use gradewright_geometry::{Analysis, PVIS_PER_STRETCH};

use super::args::FitArgs;
use super::check::STREAM_FROM;
use super::{
    Run, Spill, build, check_output, check_speed, positive, refuse_unchecked_sight, write_like_input,
};

/// Runs `fit`.
///
/// # Errors
/// Bad input or options, or an output that cannot be written.
pub fn run(run: &mut Run, args: &FitArgs) -> anyhow::Result<ExitCode> {
    check_speed(args.checking.speed.design_speed)?;
    if let Some(v) = args.increment {
        positive("--increment", "the length increment", v)?;
    }
    check_output(&args.output)?;
    let input = &args.source.input;
    let (loaded, criteria) = run.load_checked(&args.source, &args.checking)?;
    let alignment = build(&loaded)?;
    refuse_unchecked_sight(&alignment, &criteria, input, true)?;
    drop(alignment);
    let mut out = loaded.project;
    let increment = args.increment.unwrap_or(out.units.curve_length_increment());
    let (fitted, outcomes) = {
        let design = out.design();
        // A long profile is checked an item at a time (the same findings).
        let targets = match streamed(&design) {
            Some(check) => check.failing_curves(),
            None => Analysis::once(&design).report.failing_curves(),
        };
        let profile = design.profile();
        drop(design);
        gradewright_geometry::lengthen_to_clear(&profile, &criteria, &out.controls, &targets, increment)
    };
    out.pvis = fitted.pvis;
    let (remaining, fails) = {
        let design = out.design();
        match streamed(&design) {
            Some(check) => (check.failures(), check.has_failures()),
            None => {
                let after = Analysis::once(&design).report;
                (after.findings.iter().filter(|f| f.fails()).count(), after.has_failures())
            }
        }
    };
    write_like_input(&out, input, &args.output)?;
    let mut text = Spill::new();
    let written = (|| -> std::io::Result<()> {
        if outcomes.is_empty() {
            writeln!(text, "No curve fails; nothing to lengthen.")?;
        }
        for o in &outcomes {
            writeln!(text, "{}", o.message)?;
        }
        writeln!(text, "Wrote {} ({remaining} failing finding(s) remain).", args.output.display())
    })();
    text.finish(written.map_err(anyhow::Error::from))?;
    Ok(if fails { ExitCode::from(1) } else { ExitCode::SUCCESS })
}

/// The check of a long profile, an item at a time (`None` for a short one,
/// or one the whole analysis must report).
fn streamed(design: &gradewright_geometry::Design) -> Option<gradewright_geometry::StreamedCheck<'_>> {
    (design.pvis.len() >= STREAM_FROM)
        .then(|| gradewright_geometry::StreamedCheck::new(design, PVIS_PER_STRETCH))
        .flatten()
}
