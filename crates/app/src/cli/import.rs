//! `import`: existing ground and control points merged into a project.

use std::path::Path;
use std::process::ExitCode;

use anyhow::{anyhow, bail};

use super::args::ImportArgs;
use super::{Run, check_output, print, read_error};

/// Opens an import file named by `flag`.
fn open(flag: &str, path: &Path) -> anyhow::Result<std::io::BufReader<std::fs::File>> {
    gradewright_exchange::open_file(path).map_err(|e| {
        let said = std::error::Error::source(&e).map_or_else(|| e.message.clone(), ToString::to_string);
        anyhow!("{}: {flag}: {said}", path.display())
    })
}

/// Runs `import`.
///
/// # Errors
/// Bad input or options, or an output that cannot be written.
pub fn run(run: &mut Run, args: &ImportArgs) -> anyhow::Result<ExitCode> {
    let output = &args.output;
    check_output(output)?;
    if !output.extension().is_some_and(|e| e.eq_ignore_ascii_case("ron")) {
        bail!("{}: -o: the output is a project file; give it the extension .ron", output.display());
    }
    if args.ground.is_none() && args.controls.is_none() {
        bail!("nothing to import: give --ground FILE and/or --controls FILE");
    }
    let mut loaded = run.load(&args.source)?;
    let units = loaded.project.units;
    let equations = loaded.project.equations.clone();
    let at = equations.stationing(units);
    let label = |s: f64| at.label_std(s);
    let mut text = String::new();
    if let Some(ground) = &args.ground {
        let table = if gradewright_exchange::is_landxml_path(ground) {
            let read = gradewright_exchange::read_landxml_ground(
                open("--ground", ground)?,
                ground,
                &args.source.selection(),
                units,
                loaded.project.foot,
            )
            .map_err(read_error)?;
            // What the reader noted goes where every command's notes go.
            run.notes.push(format!(
                "{}: ground line '{}' of alignment '{}'",
                ground.display(),
                gradewright_geometry::excerpt(&read.surface),
                gradewright_geometry::excerpt(&read.alignment)
            ));
            run.notes.extend(read.notes.iter().map(ToString::to_string));
            gradewright_exchange::GroundTable { points: read.points, warnings: Vec::new() }
        } else {
            gradewright_exchange::read_ground_csv(open("--ground", ground)?, ground, at)?
        };
        for w in &table.warnings {
            text.push_str(&format!("warning: {w}\n"));
        }
        if let (Some(first), Some(last)) = (table.points.first(), table.points.last()) {
            text.push_str(&format!(
                "{} ground point(s) from {} to {}\n",
                table.points.len(),
                label(first.station),
                label(last.station)
            ));
        }
        let points = gradewright_geometry::Ground::new(table.points);
        for w in points.review(units) {
            text.push_str(&format!("warning: {}: {}\n", ground.display(), w.describe(at)));
        }
        loaded.project.ground = points;
    }
    if let Some(controls) = &args.controls {
        let points = gradewright_exchange::read_controls_csv(open("--controls", controls)?, controls, at)?;
        text.push_str(&format!("{} control point(s)\n", points.len()));
        loaded.project.controls = points;
    }
    loaded.project.save(output)?;
    text.push_str(&format!("wrote {}\n", output.display()));
    print(text.as_bytes())?;
    Ok(ExitCode::SUCCESS)
}
