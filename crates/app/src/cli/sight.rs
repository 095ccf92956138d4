//! `sight`: available and required sight distance along the profile, as
//! CSV, one stretch of PVIs at a time.

use std::process::ExitCode;

use anyhow::{anyhow, bail};
use gradewright_geometry::Streamed;

use super::args::SightArgs;
use super::{Run, Spill, take_profile};

/// Runs `sight`.
///
/// # Errors
/// Bad input or options, or a table that cannot be written.
pub fn run(run: &mut Run, args: &SightArgs) -> anyhow::Result<ExitCode> {
    let input = &args.source.input;
    let (mut loaded, criteria) = run.load_checked(&args.source, &args.checking)?;
    let profile = take_profile(&mut loaded)?;
    // One stretch of PVIs at a time, straight to the output: memory stays
    // flat however long the profile is.
    let mut out = Spill::new();
    let written = {
        let mut table = gradewright_exchange::SightTable::new(&mut out, profile.stationing())?;
        let streamed = gradewright_geometry::sight_by_stretch(
            &profile,
            &criteria,
            gradewright_geometry::PVIS_PER_STRETCH,
            |block| table.rows(block),
        );
        match streamed {
            Ok(Streamed::Done) => table.finish().map_err(anyhow::Error::from),
            Ok(Streamed::TooManyStations) => {
                let span = profile.end().unwrap_or_default() - profile.start().unwrap_or_default();
                bail!(
                    "--step: more than {} stations for a profile {span} {} long; use a larger step",
                    gradewright_geometry::MAX_SIGHT_STATIONS,
                    profile.units.length_symbol()
                );
            }
            Ok(Streamed::Problems) => Err(anyhow!("invalid profile")),
            Err(e) => Err(e.into()),
        }
    }
    .map_err(|e| anyhow!("{}: {e}", input.display()));
    out.finish(written)?;
    Ok(ExitCode::SUCCESS)
}
