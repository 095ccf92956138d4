//! `export`: the profile sheet and the hand-over tables.

use std::process::ExitCode;

use anyhow::{anyhow, bail};
use gradewright_geometry::Analysis;

use super::args::ExportArgs;
use super::{Run, build, check_speed, plan_error, print, refuse_unchecked_sight, resolve};
use gradewright_draw::SheetError;

use crate::export::{RenderError, Request};

/// Runs `export`.
///
/// # Errors
/// Bad input or options, or a file that cannot be written.
pub fn run(run: &mut Run, args: &ExportArgs) -> anyhow::Result<ExitCode> {
    let request = Request {
        png: args.png.clone(),
        svg: args.svg.clone(),
        pdf: args.pdf.clone(),
        csv_dir: args.csv_dir.clone(),
        landxml: args.landxml.clone(),
        sheet: args.sheet.clone(),
        dpi: args.dpi,
        h_scale: args.h_scale,
        v_scale: args.v_scale,
        overlap: args.overlap,
        interval: args.interval,
        decimals: args.decimals.unwrap_or_default(),
        title: gradewright_draw::TitleBlock {
            project: String::new(),
            road: args.road.clone(),
            designer: args.designer.clone(),
            checker: args.checker.clone(),
            date: args.date.clone(),
            revision: args.revision.clone(),
        },
        sight_band: !args.no_sight_band,
    };
    let speed = args.speed.design_speed;
    check_speed(speed)?;
    let plan = crate::export::plan(&request).map_err(plan_error)?;
    let input = &args.source.input;
    let mut loaded = run.load(&args.source)?;
    // Without --decimals, the tables round as the project chose.
    let request = Request { decimals: args.decimals.unwrap_or(loaded.project.export.decimals), ..request };
    let criteria = resolve(&mut loaded.project, speed, input, &mut run.notes)?;
    if let Some(problem) = loaded.project.profile().problems().into_iter().next() {
        bail!("{}: {problem}", loaded.locate(&problem));
    }
    let alignment = build(&loaded)?;
    refuse_unchecked_sight(&alignment, &criteria, input, false)?;
    let analysis = Analysis::once(&loaded.project.design());
    let files = crate::export::render(&plan, &request, &analysis, &loaded.project).map_err(|e| match e {
        RenderError::Png(e) => anyhow!("{}: --dpi: {e}", input.display()),
        RenderError::Sheet(e @ (SheetError::TooShort(_) | SheetError::TooManySheets(_))) => {
            anyhow!("{}: --h-scale: {e}", input.display())
        }
        RenderError::Sheet(e @ SheetError::NoHeight { .. }) => anyhow!("{}: --v-scale: {e}", input.display()),
        other => anyhow!("{}: {other}", input.display()),
    })?;
    // Every file checked before any is written: none is the input, no two
    // are the same, each can be written (the numbered sheets and every table).
    crate::export::check_outputs(&files, &[input.as_path()]).map_err(plan_error)?;
    crate::export::write_all(&files)?;
    let mut text = String::new();
    for out in &files {
        text.push_str(&format!("Wrote {}\n", out.path.display()));
    }
    let fails = analysis.report.findings.iter().filter(|f| f.fails()).count();
    if fails > 0 {
        text.push_str(&format!(
            "{fails} failing finding(s), marked on the sheet and listed in the findings\n"
        ));
    }
    print(text.as_bytes())?;
    Ok(if analysis.has_failures() { ExitCode::from(1) } else { ExitCode::SUCCESS })
}
