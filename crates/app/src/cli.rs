//! The headless command line: `gradewright table|check …`.

use std::io::Write as _;
use std::path::PathBuf;
use std::process::ExitCode;

use anyhow::{Context as _, anyhow, bail};
use clap::{Parser, Subcommand, ValueEnum};
use gradewright_geometry::{Alignment, Units, check_profile, parse_station};

use crate::input::{Input, load_input};
use crate::report;

/// Gradewright: design the vertical profile of a road.
#[derive(Debug, Parser)]
#[command(name = "gradewright", version, about, long_about = None)]
pub struct Cli {
    /// What to do; with none, opens the editor.
    #[command(subcommand)]
    pub command: Option<Command>,
}

/// Unit system on the command line.
#[derive(Clone, Copy, Debug, PartialEq, Eq, ValueEnum)]
pub enum UnitsArg {
    /// Metres and km/h.
    Metric,
    /// US customary: feet and mph.
    Us,
}

impl From<UnitsArg> for Units {
    fn from(u: UnitsArg) -> Self {
        match u {
            UnitsArg::Metric => Units::Metric,
            UnitsArg::Us => Units::UsCustomary,
        }
    }
}

/// Output format of `check`.
#[derive(Clone, Copy, Debug, PartialEq, Eq, ValueEnum, Default)]
pub enum Format {
    /// Human-readable text.
    #[default]
    Text,
    /// One JSON object.
    Json,
}

/// The subcommands.
#[derive(Debug, Subcommand)]
pub enum Command {
    /// Open the editor (on FILE, or on the demo project)
    Edit {
        /// Project file (.ron)
        input: Option<PathBuf>,
    },
    /// Elevation and grade at stations, as CSV
    Table {
        /// Project file (.ron) or PVI table (.csv)
        input: PathBuf,
        /// Units of a CSV input
        #[arg(long, value_enum)]
        units: Option<UnitsArg>,
        /// Station interval (default 20 m or 50 ft)
        #[arg(long)]
        interval: Option<f64>,
        /// A station to report (repeatable; notation like 1+250 or a number)
        #[arg(long = "at", value_name = "STATION", allow_hyphen_values = true)]
        at: Vec<String>,
        /// Round numbers to N decimals (default: shortest exact form)
        #[arg(long, value_name = "N")]
        decimals: Option<usize>,
    },
    /// Available and required sight distance along the profile, as CSV
    Sight {
        /// Project file (.ron) or PVI table (.csv)
        input: PathBuf,
        /// Units of a CSV input
        #[arg(long, value_enum)]
        units: Option<UnitsArg>,
        /// Design speed (km/h or mph); overrides the project's
        #[arg(long)]
        design_speed: Option<f64>,
        /// Station step (default 1 m or 5 ft)
        #[arg(long)]
        step: Option<f64>,
    },
    /// Lengthen every failing curve to the shortest length that clears it
    Fit {
        /// Project file (.ron) or PVI table (.csv)
        input: PathBuf,
        /// Where to write the fitted profile (same format as INPUT)
        #[arg(short, long)]
        output: PathBuf,
        /// Units of a CSV input
        #[arg(long, value_enum)]
        units: Option<UnitsArg>,
        /// Round lengths up to this increment (default 5 m or 10 ft)
        #[arg(long)]
        increment: Option<f64>,
        /// Design speed (km/h or mph); overrides the project's
        #[arg(long)]
        design_speed: Option<f64>,
    },
    /// Check curves and grades against the design criteria
    Check {
        /// Project file (.ron) or PVI table (.csv)
        input: PathBuf,
        /// Units of a CSV input
        #[arg(long, value_enum)]
        units: Option<UnitsArg>,
        /// Design speed (km/h or mph); overrides the project's
        #[arg(long)]
        design_speed: Option<f64>,
        /// Output format
        #[arg(long, value_enum, default_value_t)]
        format: Format,
    },
}

/// Runs the command line and maps the outcome to an exit status: 0 when no
/// finding fails, 1 when one does, 2 on bad input or usage.
pub fn main() -> ExitCode {
    let cli = match Cli::try_parse() {
        Ok(cli) => cli,
        Err(e) => {
            let _ = e.print();
            return if e.use_stderr() { ExitCode::from(2) } else { ExitCode::SUCCESS };
        }
    };
    match run(cli) {
        Ok(code) => code,
        Err(e) => {
            eprintln!("gradewright: {}", one_line(&e));
            ExitCode::from(2)
        }
    }
}

fn one_line(e: &anyhow::Error) -> String {
    e.chain().map(ToString::to_string).collect::<Vec<_>>().join(": ").replace('\n', " ")
}

/// Runs a parsed command line.
///
/// # Errors
/// Bad input, with a message naming file, line and field.
pub fn run(cli: Cli) -> anyhow::Result<ExitCode> {
    match cli.command {
        None => {
            crate::gui::run(None)?;
            Ok(ExitCode::SUCCESS)
        }
        Some(Command::Edit { input }) => {
            crate::gui::run(input.as_deref())?;
            Ok(ExitCode::SUCCESS)
        }
        Some(Command::Table { input, units, interval, at, decimals }) => {
            let loaded = load_input(&input, units.map(Into::into))?;
            let alignment = build(&loaded)?;
            let project = &loaded.project;
            let stations = if at.is_empty() {
                let interval = interval.unwrap_or(match project.units {
                    Units::Metric => 20.0,
                    Units::UsCustomary => 50.0,
                });
                if !interval.is_finite() || interval <= 0.0 {
                    bail!("--interval: {interval} is not a positive length");
                }
                let span = alignment.end() - alignment.start();
                if span / interval > 1.0e7 {
                    bail!("--interval: {interval} would give more than 10 million rows");
                }
                gradewright_sheet::interval_stations(&alignment, interval)
            } else {
                at.iter()
                    .map(|text| parse_station(text, project.units).map_err(|e| anyhow!("--at: {e}")))
                    .collect::<anyhow::Result<Vec<_>>>()?
            };
            let mut buffer = Vec::new();
            gradewright_sheet::write_station_table(&mut buffer, &alignment, &stations, decimals)
                .map_err(|e| anyhow!("--at: {e}"))?;
            std::io::stdout().lock().write_all(&buffer).context("writing the table")?;
            Ok(ExitCode::SUCCESS)
        }
        Some(Command::Sight { input, units, design_speed, step }) => {
            let mut loaded = load_input(&input, units.map(Into::into))?;
            if let Some(step) = step {
                if !step.is_finite() || step <= 0.0 {
                    bail!("--step: {step} is not a positive length");
                }
                loaded.project.criteria.sight_step = gradewright_geometry::Setting::Override(step);
            }
            let criteria = resolve(&mut loaded.project, design_speed, &input)?;
            let alignment = build(&loaded)?;
            let Some(sight) = gradewright_geometry::compute_sight(&alignment, &criteria) else {
                bail!(
                    "--step: more than {} stations for a profile {} long",
                    gradewright_geometry::MAX_SIGHT_STATIONS,
                    alignment.end() - alignment.start()
                );
            };
            let mut buffer = Vec::new();
            gradewright_sheet::write_sight_table(&mut buffer, &sight)?;
            std::io::stdout().lock().write_all(&buffer).context("writing the table")?;
            Ok(ExitCode::SUCCESS)
        }
        Some(Command::Fit { input, output, units, increment, design_speed }) => {
            let mut loaded = load_input(&input, units.map(Into::into))?;
            let criteria = resolve(&mut loaded.project, design_speed, &input)?;
            build(&loaded)?;
            let project = &loaded.project;
            let increment = increment.unwrap_or(match project.units {
                Units::Metric => 5.0,
                Units::UsCustomary => 10.0,
            });
            if !increment.is_finite() || increment <= 0.0 {
                bail!("--increment: {increment} is not a positive length");
            }
            let profile = project.profile();
            let report = check_profile(&profile, &criteria);
            let targets = report.failing_curves();
            let (fitted, outcomes) =
                gradewright_geometry::lengthen_to_clear(&profile, &criteria, &targets, increment);
            let mut out = project.clone();
            out.pvis = fitted.pvis;
            let after = check_profile(&out.profile(), &criteria);
            write_like_input(&out, &input, &output)?;
            let mut text = String::new();
            if outcomes.is_empty() {
                text.push_str("No curve fails; nothing to lengthen.\n");
            }
            for o in &outcomes {
                text.push_str(&o.message);
                text.push('\n');
            }
            let remaining =
                after.findings.iter().filter(|f| f.severity == gradewright_geometry::Severity::Fail).count();
            text.push_str(&format!("Wrote {} ({remaining} failing finding(s) remain).\n", output.display()));
            std::io::stdout().lock().write_all(text.as_bytes())?;
            Ok(if after.has_failures() { ExitCode::from(1) } else { ExitCode::SUCCESS })
        }
        Some(Command::Check { input, units, design_speed, format }) => {
            let mut project = load_input(&input, units.map(Into::into))?.project;
            let criteria = resolve(&mut project, design_speed, &input)?;
            let checks = check_profile(&project.profile(), &criteria);
            let text = match format {
                Format::Text => report::text(&project, &criteria, &checks),
                Format::Json => report::json(&project, &criteria, &checks)?,
            };
            std::io::stdout().lock().write_all(text.as_bytes())?;
            Ok(if checks.has_failures() { ExitCode::from(1) } else { ExitCode::SUCCESS })
        }
    }
}

/// Resolves the criteria, with `--design-speed` taking precedence.
fn resolve(
    project: &mut gradewright_geometry::Project,
    design_speed: Option<f64>,
    input: &std::path::Path,
) -> anyhow::Result<gradewright_geometry::ResolvedCriteria> {
    if let Some(v) = design_speed {
        project.criteria.design_speed = Some(v);
    }
    project.criteria.resolve(project.units).map_err(|e| match e {
        gradewright_geometry::CriteriaError::NoDesignSpeed => anyhow!(
            "{}: no design speed: give --design-speed or set criteria.design_speed in the project",
            input.display()
        ),
        other => anyhow!("{}: criteria: {other}", input.display()),
    })
}

/// Writes `project` in the format of `input`: a project file, or a PVI table.
fn write_like_input(
    project: &gradewright_geometry::Project,
    input: &std::path::Path,
    output: &std::path::Path,
) -> anyhow::Result<()> {
    let is_csv = input.extension().is_some_and(|e| e.eq_ignore_ascii_case("csv"));
    if is_csv {
        let mut buffer = Vec::new();
        gradewright_sheet::write_pvi_csv(&mut buffer, &project.pvis, project.units)?;
        gradewright_geometry::write_atomic(output, &buffer, true)?;
    } else {
        project.save(output)?;
    }
    Ok(())
}

/// Builds the alignment, or one line naming file, line and field of the first
/// problem (and how many more there are).
fn build(input: &Input) -> anyhow::Result<Alignment> {
    Alignment::new(&input.project.profile()).map_err(|problems| {
        let Some(first) = problems.first() else { return anyhow!("invalid profile") };
        let more = match problems.len() {
            1 => String::new(),
            n => format!(" (and {} more problem(s); `gradewright check` lists them all)", n - 1),
        };
        anyhow!("{}: {first}{more}", input.locate(first))
    })
}
