//! `table`: elevation and grade at an interval or at given stations, as CSV.

use std::process::ExitCode;

use anyhow::{anyhow, bail};
use gradewright_geometry::Alignment;

use super::args::TableArgs;
use super::{Run, Spill, positive, refused, take_profile};

/// Runs `table`.
///
/// # Errors
/// Bad input or options, or a table that cannot be written.
pub fn run(run: &mut Run, args: &TableArgs) -> anyhow::Result<ExitCode> {
    let decimals = match args.decimals {
        None => None,
        Some(d) => match usize::try_from(d) {
            Ok(d) if d <= 15 => Some(d),
            _ => bail!("--decimals: {d} is not a number of decimals from 0 to 15"),
        },
    };
    if let Some(v) = args.interval {
        positive("--interval", "the station interval", v)?;
    }
    let input = &args.source.input;
    let mut loaded = run.load(&args.source)?;
    let profile = take_profile(&mut loaded)?;
    let project = &loaded.project;
    let mut out = Spill::new();
    let written = if args.at.is_empty() {
        let len = project.units.length_symbol();
        let (interval, given) = match args.interval {
            Some(v) => (v, true),
            None => (project.units.table_interval(), false),
        };
        let span = profile.end().unwrap_or_default() - profile.start().unwrap_or_default();
        if span / interval > 1.0e7 {
            if given {
                bail!("--interval: {interval} {len} would give more than 10 million rows over {span} {len}");
            }
            bail!(
                "{}: the default interval of {interval} {len} would give more than 10 million rows over \
                 {span} {len}; choose one with --interval or give stations with --at",
                input.display()
            );
        }
        // One stretch of PVIs at a time, straight to the output.
        gradewright_exchange::write_interval_table(
            &mut out,
            &profile,
            &project.ground,
            interval,
            decimals,
            gradewright_geometry::PVIS_PER_STRETCH,
        )
        .map_err(|e| anyhow!("{}: {e}", input.display()))
    } else {
        let stations = args
            .at
            .iter()
            .map(|text| profile.stationing().parse(text).map_err(|e| anyhow!("--at: {e}")))
            .collect::<anyhow::Result<Vec<_>>>()?;
        let alignment = Alignment::from_profile(profile).map_err(|problems| refused(&loaded, &problems))?;
        gradewright_exchange::write_station_table(&mut out, &alignment, &project.ground, &stations, decimals)
            .map_err(|e| anyhow!("--at: {e}"))
    };
    out.finish(written)?;
    Ok(ExitCode::SUCCESS)
}
