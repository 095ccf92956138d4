//! The headless command line: `gradewright table|check|…`. One function per
//! subcommand, each in its own file; what they share — loading the input,
//! resolving the criteria, the words for what the libraries report, the
//! output — is here.

mod args;
mod check;
mod earthwork;
mod export;
mod fit;
mod import;
mod report;
mod sight;
mod table;

use std::io::Write as _;
use std::path::Path;
use std::process::ExitCode;

pub use args::{Checking, Cli, Command, Format, Source, UnitsArg};

use anyhow::{Context as _, anyhow, bail};
use clap::Parser as _;
use gradewright_document::{FileError, LooksLike};
use gradewright_exchange::{Choosing, ReadError};
use gradewright_geometry::{Alignment, ProfileProblem, ResolvedCriteria, excerpt};

use crate::export::{Field, PlanError};
use crate::load::{Input, LoadError, load_input};

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
    let mut run = Run::default();
    match run.command(cli) {
        Ok(code) => {
            for note in &run.notes {
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

/// One run of the command line: what the readers noted, told on standard
/// error once the run succeeded (a failed run says only its one-line error).
#[derive(Debug, Default)]
pub struct Run {
    /// The notes, worded.
    pub notes: Vec<String>,
}

impl Run {
    /// Runs a parsed command line.
    ///
    /// # Errors
    /// Bad input, with a message naming file, line and field.
    pub fn command(&mut self, cli: Cli) -> anyhow::Result<ExitCode> {
        match cli.command {
            None => {
                crate::gui::run(None)?;
                Ok(ExitCode::SUCCESS)
            }
            Some(Command::Edit { input }) => {
                crate::gui::run(input.as_deref())?;
                Ok(ExitCode::SUCCESS)
            }
            Some(Command::Table(args)) => table::run(self, &args),
            Some(Command::Sight(args)) => sight::run(self, &args),
            Some(Command::Fit(args)) => fit::run(self, &args),
            Some(Command::Import(args)) => import::run(self, &args),
            Some(Command::Earthwork(args)) => earthwork::run(self, &args),
            Some(Command::Export(args)) => export::run(self, &args),
            Some(Command::Check(args)) => check::run(self, &args),
        }
    }

    /// Loads the input and keeps what the reader noted (for LandXML: the
    /// alignment and profile taken, the units, anything skipped).
    ///
    /// # Errors
    /// The input cannot be read, worded with this command line's options.
    pub fn load(&mut self, source: &Source) -> anyhow::Result<Input> {
        let loaded = load_input(&source.input, source.units.map(Into::into), &source.selection())
            .map_err(load_error)?;
        if let Some(p) = &loaded.picked {
            self.notes.push(format!(
                "{}: alignment '{}', profile '{}'{}",
                loaded.path.display(),
                excerpt(&p.alignment),
                excerpt(&p.profile),
                p.surface.as_ref().map(|s| format!(", ground '{}'", excerpt(s))).unwrap_or_default()
            ));
        }
        self.notes.extend(loaded.notes.iter().map(ToString::to_string));
        Ok(loaded)
    }

    /// Loads the input for a check: `--design-speed` and `--step` checked
    /// first and set over the project's, the criteria resolved.
    ///
    /// # Errors
    /// As [`Run::load`], and an unusable speed, step or criteria.
    pub fn load_checked(
        &mut self,
        source: &Source,
        checking: &Checking,
    ) -> anyhow::Result<(Input, ResolvedCriteria)> {
        let speed = checking.speed.design_speed;
        check_speed(speed)?;
        let mut loaded = self.load(source)?;
        override_step(&mut loaded, checking.step)?;
        let criteria = resolve(&mut loaded.project, speed, &source.input, &mut self.notes)?;
        Ok((loaded, criteria))
    }
}

fn is_broken_pipe(e: &anyhow::Error) -> bool {
    e.chain().any(|c| {
        c.downcast_ref::<std::io::Error>().is_some_and(|io| io.kind() == std::io::ErrorKind::BrokenPipe)
    })
}

fn one_line(e: &anyhow::Error) -> String {
    e.chain().map(ToString::to_string).collect::<Vec<_>>().join(": ").replace('\n', " ")
}

/// The option that chooses what a LandXML file holds several of.
fn choose_with(choosing: Choosing) -> &'static str {
    match choosing {
        Choosing::Profile => "--alignment NAME and --profile NAME",
        Choosing::Surface => "--surface NAME",
        Choosing::Alignment => "--alignment NAME",
    }
}

/// A reader's error in this command line's words: an open choice names the
/// option that makes it.
pub fn read_error(e: ReadError) -> anyhow::Error {
    match &e.ambiguous {
        Some(a) => anyhow!("{e}; choose one with {}", choose_with(a.choosing)),
        None => e.into(),
    }
}

/// A load error in this command line's words.
fn load_error(e: LoadError) -> anyhow::Error {
    match e {
        LoadError::MissingUnits { path } => {
            anyhow!("{}: a CSV PVI table needs --units metric|us", path.display())
        }
        LoadError::UnitsDisagree { path, given, project } => anyhow!(
            "{}: --units {} disagrees with the project's units ({}); units are never converted silently",
            path.display(),
            given.key(),
            project.key()
        ),
        LoadError::Project(e @ FileError::Syntax { looks_like: Some(LooksLike::PviTable), .. }) => {
            anyhow!("{e}: name it .csv and give --units")
        }
        LoadError::Exchange(e) => read_error(e),
        other => other.into(),
    }
}

/// The option of an export field.
fn option_of(field: Field) -> &'static str {
    match field {
        Field::Sheet => "--sheet",
        Field::Dpi => "--dpi",
        Field::HScale => "--h-scale",
        Field::VScale => "--v-scale",
        Field::Overlap => "--overlap",
        Field::Interval => "--interval",
        Field::Decimals => "--decimals",
        Field::Png => "--png",
        Field::Svg => "--svg",
        Field::Pdf => "--pdf",
        Field::Tables => "--csv-dir",
        Field::LandXml => "--landxml",
        Field::Output => "-o",
    }
}

/// A plan's error in this command line's words, naming the option.
fn plan_error(e: PlanError) -> anyhow::Error {
    match e {
        PlanError::Nothing => anyhow!("nothing to export: give --png, --svg, --pdf, --csv-dir or --landxml"),
        PlanError::Value { field, problem } => anyhow!("{}: {problem}", option_of(field)),
        PlanError::Path { field, path, problem } => {
            anyhow!("{}: {}: {problem}", path.display(), option_of(field))
        }
    }
}

/// Refuses an output `-o` that is not a regular file or a new path.
fn check_output(path: &Path) -> anyhow::Result<()> {
    crate::export::check_file(Field::Output, path).map_err(plan_error)
}

/// A length option: finite and above zero, or the reason.
fn positive(option: &str, what: &str, value: f64) -> anyhow::Result<f64> {
    if value.is_finite() && value > 0.0 {
        Ok(value)
    } else {
        bail!("{option}: {what} must be a positive number (got {})", gradewright_geometry::shown(value))
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

/// `--step`: the sight-distance station step, over the project's.
fn override_step(loaded: &mut Input, step: Option<f64>) -> anyhow::Result<()> {
    if let Some(step) = step {
        positive("--step", "the station step", step)?;
        let units = loaded.project.units;
        if step > units.max_sight_step() {
            bail!(
                "--step: a step of {} {len} is coarser than {} {len}; a stretch that falls short could be missed",
                gradewright_geometry::shown(step),
                units.max_sight_step(),
                len = units.length_symbol()
            );
        }
        loaded.project.criteria.sight_step = gradewright_geometry::Setting::Override(step);
    }
    Ok(())
}

/// `--design-speed`, checked before anything is read.
fn check_speed(design_speed: Option<f64>) -> anyhow::Result<()> {
    if let Some(v) = design_speed {
        positive("--design-speed", "the design speed", v)?;
    }
    Ok(())
}

/// A check that could not run must not pass: the sight distance at the step
/// in force must be computable, or the command stops with the limit named.
fn refuse_unchecked_sight(
    alignment: &Alignment,
    criteria: &ResolvedCriteria,
    input: &Path,
    step_option: bool,
) -> anyhow::Result<()> {
    let step = criteria.get(gradewright_geometry::CriterionId::SightStep);
    let span = alignment.end() - alignment.start();
    let count = span / step;
    if count.is_nan() || count > gradewright_geometry::MAX_SIGHT_STATIONS {
        bail!(
            "{}: criteria.sight_step: a step of {step} {} over {span} {} would need more than {} stations; \
             the sight distance could not be checked ({})",
            input.display(),
            alignment.units().length_symbol(),
            alignment.units().length_symbol(),
            gradewright_geometry::MAX_SIGHT_STATIONS,
            if step_option {
                "use a larger step: --step"
            } else {
                "set a larger criteria.sight_step in the project"
            }
        );
    }
    Ok(())
}

/// Resolves the criteria in force (the project's and its criteria
/// ranges'), with `--design-speed` taking precedence over the whole road (a
/// note in `notes` says so when it overrides ranges' speeds).
fn resolve(
    project: &mut gradewright_document::Project,
    design_speed: Option<f64>,
    input: &Path,
    notes: &mut Vec<String>,
) -> anyhow::Result<ResolvedCriteria> {
    if let Some(v) = design_speed {
        positive("--design-speed", "the design speed", v)?;
        project.criteria.design_speed = Some(v);
        let overridden = project.criteria_ranges.iter_mut().filter_map(|r| r.design_speed.take()).count();
        if overridden > 0 {
            notes.push(format!(
                "{}: --design-speed {} {} overrides the whole road, the design speed of {overridden} criteria range(s) included",
                input.display(),
                gradewright_geometry::trimmed(v, 2),
                project.units.speed_symbol()
            ));
        }
    }
    project.criteria.resolve_with(project.units, &project.criteria_ranges).map_err(|e| match e {
        gradewright_geometry::CriteriaError::NoDesignSpeed => anyhow!(
            "{}: no design speed: give --design-speed or set criteria.design_speed in the project",
            input.display()
        ),
        e @ gradewright_geometry::CriteriaError::BadDesignSpeed { .. } if design_speed.is_some() => {
            anyhow!("--design-speed: {e}")
        }
        other => anyhow!("{}: criteria: {other}", input.display()),
    })
}

/// Writes `project` in the format `output`'s extension names (`.ron`
/// project, `.csv` PVI table, `.xml` LandXML), or in the format of `input`
/// when the extension names none.
fn write_like_input(
    project: &gradewright_document::Project,
    input: &Path,
    output: &Path,
) -> anyhow::Result<()> {
    use crate::load::FileKind;
    let kind = if FileKind::is_named(output) { FileKind::of(output) } else { FileKind::of(input) };
    let bytes = crate::load::encode(project, kind)?;
    gradewright_document::write_atomic(output, &bytes, true)?;
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
    let profile = gradewright_geometry::Profile::new(input.project.units, pvis)
        .with_equations(input.project.equations.clone());
    let problems = profile.problems();
    if problems.is_empty() { Ok(profile) } else { Err(refused(input, &problems)) }
}

/// The error for a profile that cannot be built, at its first problem.
fn refused(input: &Input, problems: &[ProfileProblem]) -> anyhow::Error {
    let Some(first) = problems.first() else { return anyhow!("invalid profile") };
    let more = match problems.len() {
        1 => String::new(),
        n => format!(" (and {} more problem(s); `gradewright check` lists them all)", n - 1),
    };
    anyhow!("{}: {first}{more}", input.locate(first))
}
