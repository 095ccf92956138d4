//! The command line as typed: subcommands and their options, parsed by clap
//! into these types before anything runs. The input, its selection and its
//! units are the same options on every subcommand ([`Source`]).

use std::path::PathBuf;

use clap::{Parser, Subcommand, ValueEnum};
use gradewright_document::TableDecimals;
use gradewright_geometry::Units;

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

/// The input every subcommand reads: the file, which alignment, profile and
/// ground line of a LandXML file, and the units.
#[derive(Clone, Debug, clap::Args)]
pub struct Source {
    /// Project file (.ron), PVI table (.csv) or LandXML file (.xml)
    pub input: PathBuf,
    /// LandXML input: the Alignment to read (by name) when the file has several
    #[arg(long, value_name = "NAME")]
    pub alignment: Option<String>,
    /// LandXML input: the design profile (ProfAlign name) when there are several
    #[arg(long, value_name = "NAME")]
    pub profile: Option<String>,
    /// LandXML input: the ground line (ProfSurf name) when there are several
    #[arg(long, value_name = "NAME")]
    pub surface: Option<String>,
    /// Units of a CSV input (and of the ground and controls files' stations); a LandXML input is
    /// converted to them
    #[arg(long, value_enum)]
    pub units: Option<UnitsArg>,
}

impl Source {
    /// As the LandXML reader's selection.
    pub fn selection(&self) -> gradewright_exchange::Selection {
        gradewright_exchange::Selection {
            alignment: self.alignment.clone(),
            profile: self.profile.clone(),
            surface: self.surface.clone(),
        }
    }
}

/// The design speed, over the project's.
#[derive(Clone, Copy, Debug, clap::Args)]
pub struct Speed {
    /// Design speed (km/h or mph); overrides the project's
    #[arg(long, allow_negative_numbers = true)]
    pub design_speed: Option<f64>,
}

/// The criteria a check may set from the command line.
#[derive(Clone, Copy, Debug, clap::Args)]
pub struct Checking {
    /// The design speed.
    #[command(flatten)]
    pub speed: Speed,
    /// Sight-distance station step (default 1 m or 5 ft); overrides the project's
    #[arg(long, allow_negative_numbers = true)]
    pub step: Option<f64>,
}

/// The subcommands.
#[derive(Debug, Subcommand)]
#[allow(clippy::large_enum_variant)] // parsed once per run
pub enum Command {
    /// Open the editor (on FILE, or on the demo project)
    Edit {
        /// Project file (.ron) or LandXML file (.xml)
        input: Option<PathBuf>,
    },
    /// Elevation and grade at stations, as CSV
    Table(TableArgs),
    /// Available and required sight distance along the profile, as CSV
    Sight(SightArgs),
    /// Lengthen every failing curve to the shortest length that clears it
    Fit(FitArgs),
    /// Merge existing ground (CSV or LandXML) and/or control points (CSV) into a project, replacing what it had
    Import(ImportArgs),
    /// Centreline earthwork for a level typical section, as CSV (the project needs ground)
    Earthwork(EarthworkArgs),
    /// Hand the design over: the profile sheet (SVG, PNG, PDF) and the tables (CSV)
    Export(ExportArgs),
    /// Check curves and grades against the design criteria
    Check(CheckArgs),
}

/// `table`.
#[derive(Debug, clap::Args)]
pub struct TableArgs {
    /// The input.
    #[command(flatten)]
    pub source: Source,
    /// Station interval (default 20 m or 50 ft); not with --at
    #[arg(long, allow_negative_numbers = true, conflicts_with = "at")]
    pub interval: Option<f64>,
    /// A station to report (repeatable; notation like 1+250 or a number); not with --interval
    #[arg(long = "at", value_name = "STATION", allow_hyphen_values = true)]
    pub at: Vec<String>,
    /// Round numbers to N decimals, 0 to 15 (default: shortest exact form)
    #[arg(long, value_name = "N", allow_negative_numbers = true)]
    pub decimals: Option<i64>,
}

/// `sight`.
#[derive(Debug, clap::Args)]
pub struct SightArgs {
    /// The input.
    #[command(flatten)]
    pub source: Source,
    /// Design speed and sight step.
    #[command(flatten)]
    pub checking: Checking,
}

/// `fit`.
#[derive(Debug, clap::Args)]
pub struct FitArgs {
    /// The input.
    #[command(flatten)]
    pub source: Source,
    /// Where to write the fitted profile: .ron project, .csv PVI table or .xml LandXML
    /// (another extension: the format of INPUT)
    #[arg(short, long)]
    pub output: PathBuf,
    /// Round lengths up to this increment (default 5 m or 10 ft)
    #[arg(long, allow_negative_numbers = true)]
    pub increment: Option<f64>,
    /// Design speed and sight step.
    #[command(flatten)]
    pub checking: Checking,
}

/// `import`.
#[derive(Debug, clap::Args)]
pub struct ImportArgs {
    /// The input.
    #[command(flatten)]
    pub source: Source,
    /// Existing ground: a CSV of station,elevation rows (header optional; comma, semicolon or
    /// tab), or a LandXML file's ground line (ProfSurf)
    #[arg(long, value_name = "FILE")]
    pub ground: Option<PathBuf>,
    /// Control points: header station,kind,elevation,tolerance,name; kind fixed, min or max
    #[arg(long, value_name = "FILE")]
    pub controls: Option<PathBuf>,
    /// Where to write the project (.ron)
    #[arg(short, long)]
    pub output: PathBuf,
}

/// `earthwork`.
#[derive(Debug, clap::Args)]
pub struct EarthworkArgs {
    /// The input.
    #[command(flatten)]
    pub source: Source,
    /// Roadway width W (m or ft)
    #[arg(long, allow_negative_numbers = true)]
    pub width: f64,
    /// Cut slope, horizontal per unit rise (2 for 2:1)
    #[arg(long, allow_negative_numbers = true)]
    pub cut_slope: f64,
    /// Fill slope, horizontal per unit rise
    #[arg(long, allow_negative_numbers = true)]
    pub fill_slope: f64,
    /// Shrinkage of cut placed as fill, percent (default 0)
    #[arg(long, allow_negative_numbers = true)]
    pub shrinkage: Option<f64>,
    /// Station interval (default 20 m or 50 ft); grade points, PVCs, PVIs and PVTs are added
    #[arg(long, allow_negative_numbers = true)]
    pub interval: Option<f64>,
    /// Numbers: exact (unrounded, the default), plan (stations to 0.001 m or 0.01 ft, areas and volumes to
    /// 0.1) or N decimals (0 to 15)
    #[arg(long, value_name = "plan|N|exact", value_parser = table_decimals, allow_hyphen_values = true)]
    pub decimals: Option<TableDecimals>,
}

/// `--decimals` of the hand-over tables: `plan`, `exact` or a number of
/// decimals from 0 to 15.
fn table_decimals(text: &str) -> Result<TableDecimals, String> {
    match text.trim() {
        "plan" => Ok(TableDecimals::Plan),
        "exact" => Ok(TableDecimals::Exact),
        n => match n.parse::<u8>() {
            Ok(n) if n <= TableDecimals::MAX => Ok(TableDecimals::Fixed(n)),
            _ => Err(format!(
                "'{text}' is not plan, exact or a number of decimals from 0 to {}",
                TableDecimals::MAX
            )),
        },
    }
}

/// `export`.
#[derive(Debug, clap::Args)]
pub struct ExportArgs {
    /// The input.
    #[command(flatten)]
    pub source: Source,
    /// Write the sheet as PNG (numbered NAME-1.png, … when there are several sheets)
    #[arg(long, value_name = "FILE")]
    pub png: Option<PathBuf>,
    /// Write the sheet as SVG (numbered like PNG)
    #[arg(long, value_name = "FILE")]
    pub svg: Option<PathBuf>,
    /// Write the sheets as one PDF, one page per sheet
    #[arg(long, value_name = "FILE")]
    pub pdf: Option<PathBuf>,
    /// Write stations.csv, curves.csv and findings.csv into this folder
    #[arg(long, value_name = "DIR")]
    pub csv_dir: Option<PathBuf>,
    /// Write the design profile and the ground as LandXML 1.2
    #[arg(long, value_name = "FILE")]
    pub landxml: Option<PathBuf>,
    /// Sheet size: ansi-b, ansi-d, a3, a1, or WxHmm / WxHin
    #[arg(long, default_value = "ansi-b")]
    pub sheet: String,
    /// PNG resolution, 10 to 1200 dpi
    #[arg(long, default_value_t = 150.0, allow_negative_numbers = true)]
    pub dpi: f64,
    /// Horizontal scale: 1:N in metric, 1 in = N ft in US units (default: fits one sheet)
    #[arg(long, value_name = "N", allow_negative_numbers = true)]
    pub h_scale: Option<f64>,
    /// Vertical scale, the same way (default: a tenth of the horizontal)
    #[arg(long, value_name = "N", allow_negative_numbers = true)]
    pub v_scale: Option<f64>,
    /// Stations repeated at the start of each following sheet
    #[arg(long, default_value_t = 0.0, allow_negative_numbers = true)]
    pub overlap: f64,
    /// Station interval of stations.csv (default 20 m or 50 ft)
    #[arg(long, allow_negative_numbers = true)]
    pub interval: Option<f64>,
    /// Numbers in the tables: plan (stations and elevations to 0.001 m or 0.01 ft, grades to 0.001 %, K and
    /// quantities to 0.1), N decimals (0 to 15) for every number, or exact (unrounded); default: the
    /// project's choice, plan unless changed in the editor
    #[arg(long, value_name = "plan|N|exact", value_parser = table_decimals, allow_hyphen_values = true)]
    pub decimals: Option<TableDecimals>,
    /// Title block: road or section
    #[arg(long, default_value = "")]
    pub road: String,
    /// Title block: designer
    #[arg(long, default_value = "")]
    pub designer: String,
    /// Title block: checker
    #[arg(long, default_value = "")]
    pub checker: String,
    /// Title block: date
    #[arg(long, default_value = "")]
    pub date: String,
    /// Title block: revision
    #[arg(long, default_value = "")]
    pub revision: String,
    /// Leave the sight-distance band off the sheet
    #[arg(long)]
    pub no_sight_band: bool,
    /// The design speed.
    #[command(flatten)]
    pub speed: Speed,
}

/// `check`.
#[derive(Debug, clap::Args)]
pub struct CheckArgs {
    /// The input.
    #[command(flatten)]
    pub source: Source,
    /// Design speed and sight step.
    #[command(flatten)]
    pub checking: Checking,
    /// Output format
    #[arg(long, value_enum, default_value_t)]
    pub format: Format,
}
