//! `earthwork`: the level-section estimate along the centreline, as CSV.

use std::process::ExitCode;

use anyhow::{anyhow, bail};
use gradewright_document::TableDecimals;
use gradewright_geometry::{EarthworkError, Section, SectionField};

use super::args::EarthworkArgs;
use super::{Run, build, positive, print};

/// The option of a section value.
fn option_of(field: SectionField) -> &'static str {
    match field {
        SectionField::Width => "--width",
        SectionField::CutSlope => "--cut-slope",
        SectionField::FillSlope => "--fill-slope",
        SectionField::Shrinkage => "--shrinkage",
    }
}

/// Runs `earthwork`.
///
/// # Errors
/// Bad input or options, or a project without ground.
pub fn run(run: &mut Run, args: &EarthworkArgs) -> anyhow::Result<ExitCode> {
    let section = Section {
        width: args.width,
        cut_slope: args.cut_slope,
        fill_slope: args.fill_slope,
        shrinkage_percent: args.shrinkage.unwrap_or(0.0),
    };
    if let Err(EarthworkError::Field { field, value, why }) = section.validate() {
        bail!("{}: {why} (got {})", option_of(field), gradewright_geometry::shown(value));
    }
    if let Some(v) = args.interval {
        positive("--interval", "the station interval", v)?;
    }
    let input = &args.source.input;
    let loaded = run.load(&args.source)?;
    let alignment = build(&loaded)?;
    let project = &loaded.project;
    if project.ground.range().is_none() {
        bail!("{}: the project has no ground; add it with gradewright import --ground FILE", input.display());
    }
    let interval = args.interval.unwrap_or(project.units.table_interval());
    let estimate = gradewright_geometry::earthwork(&alignment, &project.ground, &section, interval)
        .map_err(|e| anyhow!("{}: {e}", input.display()))?;
    let mut buffer = Vec::new();
    let rounding =
        gradewright_exchange::Rounding::of(args.decimals.unwrap_or(TableDecimals::Exact), project.units);
    gradewright_exchange::write_earthwork_csv(&mut buffer, &estimate, project.stationing(), rounding)
        .map_err(|e| anyhow!("{}: {e}", input.display()))?;
    print(&buffer)?;
    let vol = gradewright_geometry::volume_symbol(project.units);
    let label = |s: f64| project.equations.stationing(project.units).label_std(s);
    eprintln!(
        "level-section estimate from {} to {} (where the ground covers the profile): cut {:.1} {vol}, fill {:.1} {vol}, \
         net {:+.1} {vol} after {}% shrinkage (areas in {}, volumes in {vol})",
        label(estimate.range.0),
        label(estimate.range.1),
        estimate.cut,
        estimate.fill,
        estimate.net(),
        section.shrinkage_percent,
        gradewright_geometry::area_symbol(project.units)
    );
    Ok(ExitCode::SUCCESS)
}
