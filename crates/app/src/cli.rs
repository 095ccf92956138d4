//! The headless command line: `gradewright table|check …`.

use std::io::Write as _;
use std::path::PathBuf;
use std::process::ExitCode;

use anyhow::{Context as _, anyhow, bail};
use clap::{Parser, Subcommand, ValueEnum};
use gradewright_geometry::{Alignment, Analysis, Units, parse_station};

use crate::input::{FileKind, Input, load_input};
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

/// Which alignment, design profile and ground line of a LandXML input to
/// read when the file holds several.
#[derive(Clone, Debug, Default, clap::Args)]
pub struct PickArgs {
    /// LandXML input: the Alignment to read (by name) when the file has several
    #[arg(long, value_name = "NAME")]
    pub alignment: Option<String>,
    /// LandXML input: the design profile (ProfAlign name) when there are several
    #[arg(long, value_name = "NAME")]
    pub profile: Option<String>,
    /// LandXML input: the ground line (ProfSurf name) when there are several
    #[arg(long, value_name = "NAME")]
    pub surface: Option<String>,
}

impl PickArgs {
    /// As the LandXML reader's selection.
    pub fn selection(&self) -> gradewright_exchange::Selection {
        gradewright_exchange::Selection {
            alignment: self.alignment.clone(),
            profile: self.profile.clone(),
            surface: self.surface.clone(),
        }
    }
}

/// The subcommands.
#[derive(Debug, Subcommand)]
#[allow(clippy::large_enum_variant)] // parsed once per run
pub enum Command {
    /// Open the editor (on FILE, or on the demo project)
    Edit {
        /// Project file (.ron)
        input: Option<PathBuf>,
    },
    /// Elevation and grade at stations, as CSV
    Table {
        /// Project file (.ron), PVI table (.csv) or LandXML file (.xml)
        input: PathBuf,
        /// Which alignment, profile and ground line of a LandXML input
        #[command(flatten)]
        pick: PickArgs,
        /// Units of a CSV input; a LandXML input is converted to them
        #[arg(long, value_enum)]
        units: Option<UnitsArg>,
        /// Station interval (default 20 m or 50 ft); not with --at
        #[arg(long, allow_negative_numbers = true, conflicts_with = "at")]
        interval: Option<f64>,
        /// A station to report (repeatable; notation like 1+250 or a number); not with --interval
        #[arg(long = "at", value_name = "STATION", allow_hyphen_values = true)]
        at: Vec<String>,
        /// Round numbers to N decimals, 0 to 15 (default: shortest exact form)
        #[arg(long, value_name = "N", allow_negative_numbers = true)]
        decimals: Option<i64>,
    },
    /// Available and required sight distance along the profile, as CSV
    Sight {
        /// Project file (.ron), PVI table (.csv) or LandXML file (.xml)
        input: PathBuf,
        /// Which alignment, profile and ground line of a LandXML input
        #[command(flatten)]
        pick: PickArgs,
        /// Units of a CSV input; a LandXML input is converted to them
        #[arg(long, value_enum)]
        units: Option<UnitsArg>,
        /// Design speed (km/h or mph); overrides the project's
        #[arg(long, allow_negative_numbers = true)]
        design_speed: Option<f64>,
        /// Station step (default 1 m or 5 ft)
        #[arg(long, allow_negative_numbers = true)]
        step: Option<f64>,
    },
    /// Lengthen every failing curve to the shortest length that clears it
    Fit {
        /// Project file (.ron), PVI table (.csv) or LandXML file (.xml)
        input: PathBuf,
        /// Which alignment, profile and ground line of a LandXML input
        #[command(flatten)]
        pick: PickArgs,
        /// Where to write the fitted profile: .ron project, .csv PVI table or .xml LandXML
        /// (another extension: the format of INPUT)
        #[arg(short, long)]
        output: PathBuf,
        /// Units of a CSV input; a LandXML input is converted to them
        #[arg(long, value_enum)]
        units: Option<UnitsArg>,
        /// Round lengths up to this increment (default 5 m or 10 ft)
        #[arg(long, allow_negative_numbers = true)]
        increment: Option<f64>,
        /// Design speed (km/h or mph); overrides the project's
        #[arg(long, allow_negative_numbers = true)]
        design_speed: Option<f64>,
        /// Sight-distance station step (default 1 m or 5 ft); overrides the project's
        #[arg(long, allow_negative_numbers = true)]
        step: Option<f64>,
    },
    /// Merge existing ground (CSV or LandXML) and/or control points (CSV) into a project, replacing what it had
    Import {
        /// Project file (.ron), PVI table (.csv) or LandXML file (.xml)
        input: PathBuf,
        /// Which alignment, profile and ground line of a LandXML input
        #[command(flatten)]
        pick: PickArgs,
        /// Units of a CSV input (and of the ground and controls files' stations); a LandXML input is converted to them
        #[arg(long, value_enum)]
        units: Option<UnitsArg>,
        /// Existing ground: a CSV of station,elevation rows (header optional; comma, semicolon or
        /// tab), or a LandXML file's ground line (ProfSurf)
        #[arg(long, value_name = "FILE")]
        ground: Option<PathBuf>,
        /// Control points: header station,kind,elevation,tolerance,name; kind fixed, min or max
        #[arg(long, value_name = "FILE")]
        controls: Option<PathBuf>,
        /// Where to write the project (.ron)
        #[arg(short, long)]
        output: PathBuf,
    },
    /// Centreline earthwork for a level typical section, as CSV
    Earthwork {
        /// Project file (.ron), PVI table (.csv) or LandXML file (.xml); it needs ground
        input: PathBuf,
        /// Which alignment, profile and ground line of a LandXML input
        #[command(flatten)]
        pick: PickArgs,
        /// Units of a CSV input; a LandXML input is converted to them
        #[arg(long, value_enum)]
        units: Option<UnitsArg>,
        /// Roadway width W (m or ft)
        #[arg(long, allow_negative_numbers = true)]
        width: f64,
        /// Cut slope, horizontal per unit rise (2 for 2:1)
        #[arg(long, allow_negative_numbers = true)]
        cut_slope: f64,
        /// Fill slope, horizontal per unit rise
        #[arg(long, allow_negative_numbers = true)]
        fill_slope: f64,
        /// Shrinkage of cut placed as fill, percent (default 0)
        #[arg(long, allow_negative_numbers = true)]
        shrinkage: Option<f64>,
        /// Station interval (default 20 m or 50 ft); grade points, PVCs, PVIs and PVTs are added
        #[arg(long, allow_negative_numbers = true)]
        interval: Option<f64>,
    },
    /// Hand the design over: the profile sheet (SVG, PNG, PDF) and the tables (CSV)
    Export {
        /// Project file (.ron), PVI table (.csv) or LandXML file (.xml)
        input: PathBuf,
        /// Which alignment, profile and ground line of a LandXML input
        #[command(flatten)]
        pick: PickArgs,
        /// Write the sheet as PNG (numbered NAME-1.png, … when there are several sheets)
        #[arg(long, value_name = "FILE")]
        png: Option<PathBuf>,
        /// Write the sheet as SVG (numbered like PNG)
        #[arg(long, value_name = "FILE")]
        svg: Option<PathBuf>,
        /// Write the sheets as one PDF, one page per sheet
        #[arg(long, value_name = "FILE")]
        pdf: Option<PathBuf>,
        /// Write stations.csv, curves.csv and findings.csv into this folder
        #[arg(long, value_name = "DIR")]
        csv_dir: Option<PathBuf>,
        /// Write the design profile and the ground as LandXML 1.2
        #[arg(long, value_name = "FILE")]
        landxml: Option<PathBuf>,
        /// Sheet size: ansi-b, ansi-d, a3, a1, or WxHmm / WxHin
        #[arg(long, default_value = "ansi-b")]
        sheet: String,
        /// PNG resolution, 10 to 1200 dpi
        #[arg(long, default_value_t = 150.0, allow_negative_numbers = true)]
        dpi: f64,
        /// Horizontal scale: 1:N in metric, 1 in = N ft in US units (default: fits one sheet)
        #[arg(long, value_name = "N", allow_negative_numbers = true)]
        h_scale: Option<f64>,
        /// Vertical scale, the same way (default: a tenth of the horizontal)
        #[arg(long, value_name = "N", allow_negative_numbers = true)]
        v_scale: Option<f64>,
        /// Stations repeated at the start of each following sheet
        #[arg(long, default_value_t = 0.0, allow_negative_numbers = true)]
        overlap: f64,
        /// Station interval of stations.csv (default 20 m or 50 ft)
        #[arg(long, allow_negative_numbers = true)]
        interval: Option<f64>,
        /// Title block: road or section
        #[arg(long, default_value = "")]
        road: String,
        /// Title block: designer
        #[arg(long, default_value = "")]
        designer: String,
        /// Title block: checker
        #[arg(long, default_value = "")]
        checker: String,
        /// Title block: date
        #[arg(long, default_value = "")]
        date: String,
        /// Title block: revision
        #[arg(long, default_value = "")]
        revision: String,
        /// Leave the sight-distance band off the sheet
        #[arg(long)]
        no_sight_band: bool,
        /// Units of a CSV input; a LandXML input is converted to them
        #[arg(long, value_enum)]
        units: Option<UnitsArg>,
        /// Design speed (km/h or mph); overrides the project's
        #[arg(long, allow_negative_numbers = true)]
        design_speed: Option<f64>,
    },
    /// Check curves and grades against the design criteria
    Check {
        /// Project file (.ron), PVI table (.csv) or LandXML file (.xml)
        input: PathBuf,
        /// Which alignment, profile and ground line of a LandXML input
        #[command(flatten)]
        pick: PickArgs,
        /// Units of a CSV input; a LandXML input is converted to them
        #[arg(long, value_enum)]
        units: Option<UnitsArg>,
        /// Design speed (km/h or mph); overrides the project's
        #[arg(long, allow_negative_numbers = true)]
        design_speed: Option<f64>,
        /// Sight-distance station step (default 1 m or 5 ft); overrides the project's
        #[arg(long, allow_negative_numbers = true)]
        step: Option<f64>,
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
        Ok(code) => {
            for note in take_notes() {
                eprintln!("note: {note}");
            }
            code
        }
        // A reader that went away (`| head`) is the end of the output, not an error.
        Err(e) if is_broken_pipe(&e) => ExitCode::SUCCESS,
        Err(e) => {
            eprintln!("gradewright: {}", one_line(&e));
            ExitCode::from(2)
        }
    }
}

fn is_broken_pipe(e: &anyhow::Error) -> bool {
    e.chain().any(|c| {
        c.downcast_ref::<std::io::Error>().is_some_and(|io| io.kind() == std::io::ErrorKind::BrokenPipe)
    })
}

/// A length option: finite and above zero, or the reason.
fn positive(option: &str, what: &str, value: f64) -> anyhow::Result<f64> {
    if value.is_finite() && value > 0.0 {
        Ok(value)
    } else {
        bail!("{option}: {what} must be a positive number (got {value})")
    }
}

/// Writes `bytes` to standard output.
fn print(bytes: &[u8]) -> anyhow::Result<()> {
    let mut out = std::io::stdout().lock();
    out.write_all(bytes).context("writing to standard output")?;
    out.flush().context("writing to standard output")?;
    Ok(())
}

/// Bytes held before standard output starts to stream.
const SPILL_BYTES: usize = 8 << 20;

/// Standard output for a table: what is written is held until it passes
/// [`SPILL_BYTES`], so a table that fits is written whole or not at all (an
/// error part-way writes nothing); a longer one streams, and memory stays
/// flat however many rows there are (an error then ends the output where it
/// happened, with exit status 2).
struct Spill {
    held: Vec<u8>,
    /// The error standard output gave, if it did (a reader gone away ends
    /// the output, it is not an error).
    failed: Option<std::io::ErrorKind>,
}

impl Spill {
    fn new() -> Self {
        Self { held: Vec::new(), failed: None }
    }

    fn pass_on(&mut self) -> std::io::Result<()> {
        let mut out = std::io::stdout().lock();
        let written = out.write_all(&self.held).and_then(|()| out.flush());
        self.held.clear();
        written.inspect_err(|e| self.failed = Some(e.kind()))
    }

    /// Writes what is held. A table written with an error is passed on here
    /// too when the error came from standard output itself.
    fn finish(mut self, written: anyhow::Result<()>) -> anyhow::Result<()> {
        if self.failed == Some(std::io::ErrorKind::BrokenPipe) {
            return Ok(());
        }
        written?;
        self.pass_on().context("writing to standard output")
    }
}

impl std::io::Write for Spill {
    fn write(&mut self, bytes: &[u8]) -> std::io::Result<usize> {
        self.held.extend_from_slice(bytes);
        if self.held.len() >= SPILL_BYTES {
            self.pass_on()?;
        }
        Ok(bytes.len())
    }

    fn flush(&mut self) -> std::io::Result<()> {
        Ok(())
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
        Some(Command::Table { input, pick, units, interval, at, decimals }) => {
            let decimals = match decimals {
                None => None,
                Some(d) => match usize::try_from(d) {
                    Ok(d) if d <= 15 => Some(d),
                    _ => bail!("--decimals: {d} is not a number of decimals from 0 to 15"),
                },
            };
            if let Some(v) = interval {
                positive("--interval", "the station interval", v)?;
            }
            let mut loaded = load(&input, units, &pick)?;
            let profile = take_profile(&mut loaded)?;
            let project = &loaded.project;
            let mut out = Spill::new();
            let written = if at.is_empty() {
                let len = project.units.length_symbol();
                let (interval, given) = match interval {
                    Some(v) => (v, true),
                    None => (project.units.table_interval(), false),
                };
                let span = profile.end().unwrap_or_default() - profile.start().unwrap_or_default();
                if span / interval > 1.0e7 {
                    if given {
                        bail!(
                            "--interval: {interval} {len} would give more than 10 million rows over {span} {len}"
                        );
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
                let stations = at
                    .iter()
                    .map(|text| parse_station(text, project.units).map_err(|e| anyhow!("--at: {e}")))
                    .collect::<anyhow::Result<Vec<_>>>()?;
                let alignment =
                    Alignment::from_profile(profile).map_err(|problems| refused(&loaded, &problems))?;
                gradewright_exchange::write_station_table(
                    &mut out,
                    &alignment,
                    &project.ground,
                    &stations,
                    decimals,
                )
                .map_err(|e| anyhow!("--at: {e}"))
            };
            out.finish(written)?;
            Ok(ExitCode::SUCCESS)
        }
        Some(Command::Sight { input, pick, units, design_speed, step }) => {
            if let Some(v) = design_speed {
                positive("--design-speed", "the design speed", v)?;
            }
            let mut loaded = load(&input, units, &pick)?;
            override_step(&mut loaded, step)?;
            let criteria = resolve(&mut loaded.project, design_speed, &input)?;
            let profile = take_profile(&mut loaded)?;
            // One stretch of PVIs at a time, straight to the output: memory
            // stays flat however long the profile is.
            let mut out = Spill::new();
            let written = {
                let mut table = gradewright_exchange::SightTable::new(&mut out)?;
                let streamed = gradewright_geometry::sight_by_stretch(
                    &profile,
                    &criteria,
                    gradewright_geometry::PVIS_PER_STRETCH,
                    |block| table.rows(block),
                );
                match streamed {
                    Ok(gradewright_geometry::Streamed::Done) => table.finish().map_err(anyhow::Error::from),
                    Ok(gradewright_geometry::Streamed::TooManyStations) => {
                        let span = profile.end().unwrap_or_default() - profile.start().unwrap_or_default();
                        bail!(
                            "--step: more than {} stations for a profile {span} {} long; use a larger step",
                            gradewright_geometry::MAX_SIGHT_STATIONS,
                            profile.units.length_symbol()
                        );
                    }
                    Ok(gradewright_geometry::Streamed::Problems) => Err(anyhow!("invalid profile")),
                    Err(e) => Err(e.into()),
                }
            }
            .map_err(|e| anyhow!("{}: {e}", input.display()));
            out.finish(written)?;
            Ok(ExitCode::SUCCESS)
        }
        Some(Command::Fit { input, pick, output, units, increment, design_speed, step }) => {
            if let Some(v) = design_speed {
                positive("--design-speed", "the design speed", v)?;
            }
            if let Some(v) = increment {
                positive("--increment", "the length increment", v)?;
            }
            crate::export::check_file("-o", &output)?;
            let mut loaded = load(&input, units, &pick)?;
            override_step(&mut loaded, step)?;
            let criteria = resolve(&mut loaded.project, design_speed, &input)?;
            let alignment = build(&loaded)?;
            refuse_unchecked_sight(&alignment, &criteria, &input)?;
            let project = &loaded.project;
            let increment = increment.unwrap_or(project.units.curve_length_increment());
            let before = Analysis::of(&project.design());
            let targets = before.report.failing_curves();
            let (fitted, outcomes) = gradewright_geometry::lengthen_to_clear(
                &before.profile,
                &criteria,
                &loaded.project.controls,
                &targets,
                increment,
            );
            let mut out = project.clone();
            out.pvis = fitted.pvis;
            let after = Analysis::of(&out.design()).report;
            write_like_input(&out, &input, &output)?;
            let mut text = String::new();
            if outcomes.is_empty() {
                text.push_str("No curve fails; nothing to lengthen.\n");
            }
            for o in &outcomes {
                text.push_str(&o.message);
                text.push('\n');
            }
            let remaining = after
                .findings
                .iter()
                .filter(|f| f.severity() == gradewright_geometry::Severity::Fail)
                .count();
            text.push_str(&format!("Wrote {} ({remaining} failing finding(s) remain).\n", output.display()));
            print(text.as_bytes())?;
            Ok(if after.has_failures() { ExitCode::from(1) } else { ExitCode::SUCCESS })
        }
        Some(Command::Import { input, pick, units, ground, controls, output }) => {
            crate::export::check_file("-o", &output)?;
            if !output.extension().is_some_and(|e| e.eq_ignore_ascii_case("ron")) {
                bail!("{}: -o: the output is a project file; give it the extension .ron", output.display());
            }
            if ground.is_none() && controls.is_none() {
                bail!("nothing to import: give --ground FILE and/or --controls FILE");
            }
            let mut loaded = load(&input, units, &pick)?;
            let units = loaded.project.units;
            let open = |flag: &str, path: &std::path::Path| {
                gradewright_exchange::open_file(path)
                    .map_err(|e| anyhow!("{}: {flag}: {}", path.display(), e.message))
            };
            let label = |s: f64| gradewright_geometry::format_station(s, units, units.station_decimals());
            let mut text = String::new();
            if let Some(ground) = ground {
                let table = if gradewright_exchange::is_landxml_path(&ground) {
                    let read = gradewright_exchange::read_landxml_ground(
                        open("--ground", &ground)?,
                        &ground,
                        &pick.selection(),
                        units,
                        loaded.project.foot,
                    )?;
                    text.push_str(&format!(
                        "note: {}: ground line '{}' of alignment '{}'\n",
                        ground.display(),
                        read.surface,
                        read.alignment
                    ));
                    for n in &read.notes {
                        text.push_str(&format!("note: {n}\n"));
                    }
                    gradewright_exchange::GroundTable { points: read.points, warnings: Vec::new() }
                } else {
                    gradewright_exchange::read_ground_csv(open("--ground", &ground)?, &ground, units)?
                };
                for w in &table.warnings {
                    text.push_str(&format!("warning: {w}\n"));
                }
                let range = (table.points.first(), table.points.last());
                if let (Some(first), Some(last)) = range {
                    text.push_str(&format!(
                        "{} ground point(s) from {} to {}\n",
                        table.points.len(),
                        label(first.station),
                        label(last.station)
                    ));
                }
                loaded.project.ground = table.points.into();
            }
            if let Some(controls) = controls {
                let points = gradewright_exchange::read_controls_csv(
                    open("--controls", &controls)?,
                    &controls,
                    units,
                )?;
                text.push_str(&format!("{} control point(s)\n", points.len()));
                loaded.project.controls = points;
            }
            loaded.project.save(&output)?;
            text.push_str(&format!("wrote {}\n", output.display()));
            print(text.as_bytes())?;
            Ok(ExitCode::SUCCESS)
        }
        Some(Command::Earthwork {
            input,
            pick,
            units,
            width,
            cut_slope,
            fill_slope,
            shrinkage,
            interval,
        }) => {
            let section = gradewright_geometry::Section {
                width,
                cut_slope,
                fill_slope,
                shrinkage_percent: shrinkage.unwrap_or(0.0),
            };
            if let Err(gradewright_geometry::EarthworkError::Field { field, why }) = section.validate() {
                bail!(
                    "--{}: {why} (got {})",
                    field.replace(' ', "-"),
                    match field {
                        "width" => width,
                        "cut slope" => cut_slope,
                        "fill slope" => fill_slope,
                        _ => section.shrinkage_percent,
                    }
                );
            }
            if let Some(v) = interval {
                positive("--interval", "the station interval", v)?;
            }
            let loaded = load(&input, units, &pick)?;
            let alignment = build(&loaded)?;
            let project = &loaded.project;
            if project.ground.range().is_none() {
                bail!(
                    "{}: the project has no ground; add it with gradewright import --ground FILE",
                    input.display()
                );
            }
            let interval = interval.unwrap_or(project.units.table_interval());
            let estimate = gradewright_geometry::earthwork(&alignment, &project.ground, &section, interval)
                .map_err(|e| anyhow!("{}: {e}", input.display()))?;
            let mut buffer = Vec::new();
            gradewright_exchange::write_earthwork_csv(&mut buffer, &estimate)
                .map_err(|e| anyhow!("{}: {e}", input.display()))?;
            print(&buffer)?;
            let vol = gradewright_geometry::volume_symbol(project.units);
            eprintln!(
                "level-section estimate: cut {:.1} {vol}, fill {:.1} {vol}, net {:+.1} {vol} after {}% shrinkage \
                 (areas in {}, volumes in {vol})",
                estimate.cut,
                estimate.fill,
                estimate.net(),
                section.shrinkage_percent,
                gradewright_geometry::area_symbol(project.units)
            );
            Ok(ExitCode::SUCCESS)
        }
        Some(Command::Export {
            input,
            png,
            svg,
            pdf,
            csv_dir,
            landxml,
            sheet,
            dpi,
            h_scale,
            v_scale,
            overlap,
            interval,
            road,
            designer,
            checker,
            date,
            revision,
            no_sight_band,
            units,
            design_speed,
            pick,
        }) => {
            let request = crate::export::Request {
                png,
                svg,
                pdf,
                csv_dir,
                landxml,
                sheet,
                dpi,
                h_scale,
                v_scale,
                overlap,
                interval,
                title: gradewright_draw::TitleBlock {
                    project: String::new(),
                    road,
                    designer,
                    checker,
                    date,
                    revision,
                },
                sight_band: !no_sight_band,
            };
            if let Some(v) = design_speed {
                positive("--design-speed", "the design speed", v)?;
            }
            let plan = crate::export::plan(&request)?;
            let mut loaded = load(&input, units, &pick)?;
            let criteria = resolve(&mut loaded.project, design_speed, &input)?;
            if let Some(problem) = loaded.project.profile().problems().into_iter().next() {
                bail!("{}: {problem}", loaded.locate(&problem));
            }
            let alignment = build(&loaded)?;
            refuse_unchecked_sight(&alignment, &criteria, &input)?;
            let analysis = Analysis::of(&loaded.project.design());
            let files = crate::export::render(&plan, &request, &analysis, &loaded.project)
                .map_err(|e| anyhow!("{}: {e}", input.display()))?;
            crate::export::write_all(&files)?;
            let mut text = String::new();
            for (path, _) in &files {
                text.push_str(&format!("Wrote {}\n", path.display()));
            }
            let fails = analysis
                .report
                .findings
                .iter()
                .filter(|f| f.severity() == gradewright_geometry::Severity::Fail)
                .count();
            if fails > 0 {
                text.push_str(&format!(
                    "{fails} failing finding(s), marked on the sheet and listed in the findings\n"
                ));
            }
            print(text.as_bytes())?;
            Ok(if analysis.has_failures() { ExitCode::from(1) } else { ExitCode::SUCCESS })
        }
        Some(Command::Check { input, pick, units, design_speed, step, format }) => {
            if let Some(v) = design_speed {
                positive("--design-speed", "the design speed", v)?;
            }
            let mut loaded = load(&input, units, &pick)?;
            override_step(&mut loaded, step)?;
            let criteria = resolve(&mut loaded.project, design_speed, &input)?;
            // Input that cannot be evaluated at all is bad input (exit 2), as
            // for every other command; curves that overlap or do not fit are
            // design failures and are listed as findings.
            if let Some(problem) = loaded
                .project
                .profile()
                .problems()
                .into_iter()
                .find(|p| !gradewright_geometry::is_design_problem(p))
            {
                let more = loaded.project.profile().problems().len() - 1;
                let more = if more == 0 { String::new() } else { format!(" (and {more} more problem(s))") };
                bail!("{}: {problem}{more}", loaded.locate(&problem));
            }
            if let Ok(alignment) = Alignment::new(&loaded.project.profile()) {
                refuse_unchecked_sight(&alignment, &criteria, &input)?;
            }
            let project = loaded.project;
            let analysis = Analysis::of(&project.design());
            let checks = &analysis.report;
            let text = match format {
                Format::Text => report::text(&project, &criteria, &analysis),
                Format::Json => report::json(&project, &criteria, checks)?,
            };
            print(text.as_bytes())?;
            Ok(if checks.has_failures() { ExitCode::from(1) } else { ExitCode::SUCCESS })
        }
    }
}

/// What the readers noted during a run, told on standard error once the run
/// succeeded (a failed run says only its one-line error).
static NOTES: std::sync::Mutex<Vec<String>> = std::sync::Mutex::new(Vec::new());

fn take_notes() -> Vec<String> {
    NOTES.lock().map(|mut n| std::mem::take(&mut *n)).unwrap_or_default()
}

/// Loads INPUT and keeps what the reader noted (for LandXML: the alignment
/// and profile taken, the units, anything skipped) to tell the user.
fn load(input: &std::path::Path, units: Option<UnitsArg>, pick: &PickArgs) -> anyhow::Result<Input> {
    let loaded = load_input(input, units.map(Into::into), &pick.selection())?;
    if let Ok(mut notes) = NOTES.lock() {
        notes.extend(loaded.notes.iter().cloned());
    }
    Ok(loaded)
}

/// `--step`: the sight-distance station step, over the project's.
fn override_step(loaded: &mut Input, step: Option<f64>) -> anyhow::Result<()> {
    if let Some(step) = step {
        positive("--step", "the station step", step)?;
        loaded.project.criteria.sight_step = gradewright_geometry::Setting::Override(step);
    }
    Ok(())
}

/// A check that could not run must not pass: the sight distance at the step
/// in force must be computable, or the command stops with the limit named.
fn refuse_unchecked_sight(
    alignment: &Alignment,
    criteria: &gradewright_geometry::ResolvedCriteria,
    input: &std::path::Path,
) -> anyhow::Result<()> {
    let step = criteria.get(gradewright_geometry::CriterionId::SightStep);
    let span = alignment.end() - alignment.start();
    let count = span / step;
    if count.is_nan() || count > gradewright_geometry::MAX_SIGHT_STATIONS {
        bail!(
            "{}: criteria.sight_step: a step of {step} {} over {span} {} would need more than {} stations; \
             the sight distance could not be checked (use a larger step: --step)",
            input.display(),
            alignment.units().length_symbol(),
            alignment.units().length_symbol(),
            gradewright_geometry::MAX_SIGHT_STATIONS
        );
    }
    Ok(())
}

/// Resolves the criteria, with `--design-speed` taking precedence.
fn resolve(
    project: &mut gradewright_document::Project,
    design_speed: Option<f64>,
    input: &std::path::Path,
) -> anyhow::Result<gradewright_geometry::ResolvedCriteria> {
    if let Some(v) = design_speed {
        positive("--design-speed", "the design speed", v)?;
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

/// Writes `project` in the format `output`'s extension names (`.ron`
/// project, `.csv` PVI table, `.xml` LandXML), or in the format of `input`
/// when the extension names none.
fn write_like_input(
    project: &gradewright_document::Project,
    input: &std::path::Path,
    output: &std::path::Path,
) -> anyhow::Result<()> {
    let named = output
        .extension()
        .is_some_and(|e| ["ron", "csv", "xml", "landxml"].iter().any(|known| e.eq_ignore_ascii_case(known)));
    let kind = if named { FileKind::of(output) } else { FileKind::of(input) };
    match kind {
        FileKind::PviTable => {
            let mut buffer = Vec::new();
            gradewright_exchange::write_pvi_csv(&mut buffer, &project.pvis, project.units)?;
            gradewright_document::write_atomic(output, &buffer, true)?;
        }
        FileKind::LandXml => {
            let mut buffer = Vec::new();
            gradewright_exchange::write_landxml(&mut buffer, project, &gradewright_exchange::Stamp::now())?;
            gradewright_document::write_atomic(output, &buffer, true)?;
        }
        FileKind::Project => project.save(output)?,
    }
    Ok(())
}

/// Builds the alignment, or one line naming file, line and field of the first
/// problem (and how many more there are).
fn build(input: &Input) -> anyhow::Result<Alignment> {
    Alignment::new(&input.project.profile()).map_err(|problems| refused(input, &problems))
}

/// The project's profile, moved out of it (no copy), once it is known to
/// have no problem.
fn take_profile(input: &mut Input) -> anyhow::Result<gradewright_geometry::Profile> {
    let pvis = std::mem::take(&mut input.project.pvis);
    let profile = gradewright_geometry::Profile::new(input.project.units, pvis);
    let problems = profile.problems();
    if problems.is_empty() { Ok(profile) } else { Err(refused(input, &problems)) }
}

/// The error for a profile that cannot be built, at its first problem.
fn refused(input: &Input, problems: &[gradewright_geometry::ProfileProblem]) -> anyhow::Error {
    let Some(first) = problems.first() else { return anyhow!("invalid profile") };
    let more = match problems.len() {
        1 => String::new(),
        n => format!(" (and {} more problem(s); `gradewright check` lists them all)", n - 1),
    };
    anyhow!("{}: {first}{more}", input.locate(first))
}
