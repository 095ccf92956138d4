//! `fit`: Lengthen to clear on every failing curve, written as a new file.

use std::process::ExitCode;

use gradewright_geometry::Analysis;

use super::args::FitArgs;
use super::{
    Run, build, check_output, check_speed, positive, print, refuse_unchecked_sight, write_like_input,
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
    let project = &loaded.project;
    let increment = args.increment.unwrap_or(project.units.curve_length_increment());
    let before = Analysis::once(&project.design());
    let targets = before.report.failing_curves();
    let (fitted, outcomes) = gradewright_geometry::lengthen_to_clear(
        &before.profile,
        &criteria,
        &project.controls,
        &targets,
        increment,
    );
    drop(before);
    let mut out = project.clone();
    out.pvis = fitted.pvis;
    let after = Analysis::once(&out.design()).report;
    write_like_input(&out, input, &args.output)?;
    let mut text = String::new();
    if outcomes.is_empty() {
        text.push_str("No curve fails; nothing to lengthen.\n");
    }
    for o in &outcomes {
        text.push_str(&o.message);
        text.push('\n');
    }
    let remaining = after.findings.iter().filter(|f| f.fails()).count();
    text.push_str(&format!("Wrote {} ({remaining} failing finding(s) remain).\n", args.output.display()));
    print(text.as_bytes())?;
    Ok(if after.has_failures() { ExitCode::from(1) } else { ExitCode::SUCCESS })
}
