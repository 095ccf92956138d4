//! The hand-over: sheet files (SVG, PNG, PDF) and tables (CSV), for the
//! command line and the editor alike. Everything is checked before anything
//! is read or drawn, rendered in memory, and written only when all of it
//! succeeded, each file atomically. Problems are data naming the [`Field`]
//! at fault; each front end words the field its own way (an option, a
//! label).

use std::path::{Path, PathBuf};

use gradewright_document::{Project, TableDecimals};
use gradewright_draw::{SheetOptions, SheetSize, TitleBlock};
use gradewright_geometry::Analysis;

/// What the user asked to export.
#[derive(Clone, Debug, PartialEq)]
pub struct Request {
    /// PNG file (numbered when there are several sheets).
    pub png: Option<PathBuf>,
    /// SVG file (numbered when there are several sheets).
    pub svg: Option<PathBuf>,
    /// PDF file (one page per sheet).
    pub pdf: Option<PathBuf>,
    /// Folder for stations.csv, curves.csv and findings.csv.
    pub csv_dir: Option<PathBuf>,
    /// LandXML 1.2 file of the design profile and the ground.
    pub landxml: Option<PathBuf>,
    /// Sheet size as typed.
    pub sheet: String,
    /// PNG resolution.
    pub dpi: f64,
    /// Horizontal scale (1:N or 1 in = N ft).
    pub h_scale: Option<f64>,
    /// Vertical scale.
    pub v_scale: Option<f64>,
    /// Overlap between sheets.
    pub overlap: f64,
    /// Station interval of stations.csv.
    pub interval: Option<f64>,
    /// How the tables round their numbers.
    pub decimals: TableDecimals,
    /// Title block fields (the project name is filled in from the project).
    pub title: TitleBlock,
    /// Whether the sheet carries the sight-distance band.
    pub sight_band: bool,
}

/// A request checked before anything is read or drawn.
#[derive(Clone, Debug, PartialEq)]
pub struct Plan {
    /// The paper.
    pub size: SheetSize,
}

/// A choice of an export request (or another output) that is at fault.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Field {
    /// The sheet size.
    Sheet,
    /// The PNG resolution.
    Dpi,
    /// The horizontal scale.
    HScale,
    /// The vertical scale.
    VScale,
    /// The overlap between sheets.
    Overlap,
    /// The station interval of the tables.
    Interval,
    /// The decimals of the tables.
    Decimals,
    /// The PNG file.
    Png,
    /// The SVG file.
    Svg,
    /// The PDF file.
    Pdf,
    /// The folder of the tables.
    Tables,
    /// The LandXML file.
    LandXml,
    /// The output of another command (a fitted profile, an imported project).
    Output,
}

/// Why an output path cannot be written.
#[derive(Clone, Debug, PartialEq, thiserror::Error)]
pub enum PathProblem {
    /// A folder where a file is wanted.
    #[error("is a folder, not a file")]
    Folder,
    /// A device, pipe or socket.
    #[error("is not a regular file; Gradewright writes only to regular files")]
    NotRegular,
    /// A file where a folder is wanted.
    #[error("is not a folder")]
    NotAFolder,
    /// The folder it would go in does not exist.
    #[error("the folder {} does not exist", .0.display())]
    NoFolder(PathBuf),
    /// The system could not tell.
    #[error("{0}")]
    System(String),
    /// A file without write permission (not replaced behind its owner's back).
    #[error("is read-only; make it writable or choose another name")]
    ReadOnly,
    /// The file the project was read from.
    #[error("is the input; the export would replace it")]
    Input,
    /// Another output of the same export.
    #[error("is also the {0} output; each output needs a file of its own")]
    Also(&'static str),
}

/// Why an export (or another output) cannot go ahead, named by its field.
#[derive(Clone, Debug, PartialEq, thiserror::Error)]
pub enum PlanError {
    /// A value that is not usable.
    #[error("{problem}")]
    Value {
        /// Which value.
        field: Field,
        /// What is wrong with it.
        problem: String,
    },
    /// An output that cannot be written.
    #[error("{}: {problem}", .path.display())]
    Path {
        /// Which output.
        field: Field,
        /// The path.
        path: PathBuf,
        /// What is wrong with it.
        problem: PathProblem,
    },
    /// No output was asked for.
    #[error("nothing to export")]
    Nothing,
}

impl PlanError {
    /// The field at fault (none when nothing was asked for).
    pub fn field(&self) -> Option<Field> {
        match self {
            Self::Value { field, .. } | Self::Path { field, .. } => Some(*field),
            Self::Nothing => None,
        }
    }
}

/// Whether `path` can be written as output `field`: a regular file or a new
/// path in an existing folder, checked before any work is done.
///
/// # Errors
/// [`PlanError::Path`] with the reason.
pub fn check_file(field: Field, path: &Path) -> Result<(), PlanError> {
    let fail = |problem| Err(PlanError::Path { field, path: path.to_owned(), problem });
    // Through links to the file a save would write (a dangling link's too).
    let target = match gradewright_document::written_file(path) {
        Ok(target) => target,
        Err(e) => return fail(PathProblem::System(e.to_string())),
    };
    match std::fs::metadata(&target) {
        Ok(meta) if meta.is_file() && meta.permissions().readonly() => return fail(PathProblem::ReadOnly),
        Ok(meta) if meta.is_file() => {}
        Ok(meta) if meta.is_dir() => return fail(PathProblem::Folder),
        Ok(_) => return fail(PathProblem::NotRegular),
        Err(e) if e.kind() == std::io::ErrorKind::NotFound => {}
        Err(e) => return fail(PathProblem::System(e.to_string())),
    }
    let dir = target.parent().filter(|d| !d.as_os_str().is_empty()).unwrap_or(Path::new("."));
    if !dir.is_dir() {
        return fail(PathProblem::NoFolder(dir.to_owned()));
    }
    Ok(())
}

/// Whether `dir` can take the tables: a folder, or a new one in an existing
/// folder, with room for each table.
fn check_folder(dir: &Path) -> Result<(), PlanError> {
    let fail = |problem| Err(PlanError::Path { field: Field::Tables, path: dir.to_owned(), problem });
    match std::fs::metadata(dir) {
        Ok(meta) if meta.is_dir() => {
            for name in ["stations.csv", "curves.csv", "findings.csv", "earthwork.csv"] {
                check_file(Field::Tables, &dir.join(name))?;
            }
            Ok(())
        }
        Ok(_) => fail(PathProblem::NotAFolder),
        Err(e) if e.kind() == std::io::ErrorKind::NotFound => {
            let parent = dir.parent().filter(|d| !d.as_os_str().is_empty()).unwrap_or(Path::new("."));
            if parent.is_dir() { Ok(()) } else { fail(PathProblem::NoFolder(parent.to_owned())) }
        }
        Err(e) => fail(PathProblem::System(e.to_string())),
    }
}

/// Checks every choice of `request`: the sheet size, dpi, scales, overlap,
/// and that every output can be written (a regular file or a new path).
///
/// # Errors
/// The first unusable choice, named by its [`Field`].
pub fn plan(request: &Request) -> Result<Plan, PlanError> {
    let value = |field, problem: String| Err(PlanError::Value { field, problem });
    let size = match SheetSize::parse(&request.sheet) {
        Ok(size) => size,
        Err(e) => return value(Field::Sheet, e.to_string()),
    };
    let (lo, hi) = gradewright_draw::render::DPI_RANGE;
    if !(request.dpi.is_finite() && request.dpi >= lo && request.dpi <= hi) {
        return value(Field::Dpi, format!("{} is outside {lo} to {hi} dpi", request.dpi));
    }
    for (field, scale) in [(Field::HScale, request.h_scale), (Field::VScale, request.v_scale)] {
        if let Some(s) = scale
            && !(s.is_finite() && s > 0.0)
        {
            return value(field, format!("{s} is not a usable scale (a positive number)"));
        }
    }
    if !(request.overlap.is_finite() && request.overlap >= 0.0) {
        return value(Field::Overlap, format!("{} is not a length of 0 or more", request.overlap));
    }
    if let Some(v) = request.interval
        && !(v.is_finite() && v > 0.0)
    {
        return value(
            Field::Interval,
            format!(
                "the station interval must be a positive number (got {})",
                gradewright_geometry::shown(v)
            ),
        );
    }
    if let TableDecimals::Fixed(n) = request.decimals
        && n > TableDecimals::MAX
    {
        return value(Field::Decimals, format!("{n} decimals is more than {}", TableDecimals::MAX));
    }
    let files = [
        (Field::Png, &request.png),
        (Field::Svg, &request.svg),
        (Field::Pdf, &request.pdf),
        (Field::LandXml, &request.landxml),
    ];
    if files.iter().all(|(_, p)| p.is_none()) && request.csv_dir.is_none() {
        return Err(PlanError::Nothing);
    }
    for (field, path) in files {
        if let Some(p) = path {
            check_file(field, p)?;
        }
    }
    if let Some(dir) = &request.csv_dir {
        check_folder(dir)?;
    }
    Ok(Plan { size })
}

/// `path` numbered for sheet `n` of `count` (`road.png` → `road-2.png`).
pub fn numbered(path: &Path, n: usize, count: usize) -> PathBuf {
    if count <= 1 {
        return path.to_owned();
    }
    let stem = path.file_stem().map(|s| s.to_string_lossy().into_owned()).unwrap_or_default();
    let name = match path.extension() {
        Some(ext) => format!("{stem}-{n}.{}", ext.to_string_lossy()),
        None => format!("{stem}-{n}"),
    };
    path.with_file_name(name)
}

/// The sheet options of a request for `project`.
pub fn sheet_options(plan: &Plan, request: &Request, project: &Project) -> SheetOptions {
    let mut title = request.title.clone();
    if title.project.is_empty() {
        title.project =
            if project.name.is_empty() { "Vertical profile".to_owned() } else { project.name.clone() };
    }
    SheetOptions {
        size: plan.size.clone(),
        h_scale: request.h_scale,
        v_scale: request.v_scale,
        overlap: request.overlap,
        title,
        sight_band: request.sight_band,
    }
}

/// Why the files of a request could not be made.
#[derive(Debug, thiserror::Error)]
pub enum RenderError {
    /// The sheet could not be laid out.
    #[error(transparent)]
    Sheet(#[from] gradewright_draw::SheetError),
    /// A PNG could not be rendered (too many pixels at the dpi asked for).
    #[error("{0}")]
    Png(gradewright_draw::RenderError),
    /// The PDF could not be made.
    #[error(transparent)]
    Pdf(gradewright_draw::RenderError),
    /// The tables need a profile without problems.
    #[error("the profile has problems to fix first")]
    Unusable,
    /// The earthwork estimate failed.
    #[error("earthwork: {0}")]
    Earthwork(#[from] gradewright_geometry::EarthworkError),
    /// A table or the LandXML file could not be encoded.
    #[error(transparent)]
    Table(#[from] gradewright_exchange::TableError),
    /// Encoding into memory failed.
    #[error(transparent)]
    Io(#[from] std::io::Error),
}

/// One file of an export, rendered in memory.
#[derive(Clone, Debug, PartialEq)]
pub struct Output {
    /// The choice it answers.
    pub field: Field,
    /// Where it goes.
    pub path: PathBuf,
    /// Its content.
    pub bytes: Vec<u8>,
}

/// Every file of the request, rendered in memory.
///
/// # Errors
/// A sheet that cannot be laid out or rendered (e.g. too many pixels).
pub fn render(
    plan: &Plan,
    request: &Request,
    analysis: &Analysis,
    project: &Project,
) -> Result<Vec<Output>, RenderError> {
    let mut files = Vec::new();
    let mut push = |field: Field, path: PathBuf, bytes: Vec<u8>| files.push(Output { field, path, bytes });
    if request.png.is_some() || request.svg.is_some() || request.pdf.is_some() {
        let options = sheet_options(plan, request, project);
        let svgs = gradewright_draw::sheet_svgs(analysis, &options)?;
        let count = svgs.len();
        if let Some(path) = &request.svg {
            for (i, svg) in svgs.iter().enumerate() {
                push(Field::Svg, numbered(path, i + 1, count), svg.clone().into_bytes());
            }
        }
        if let Some(path) = &request.png {
            for (i, svg) in svgs.iter().enumerate() {
                let bytes = gradewright_draw::png(svg, request.dpi).map_err(RenderError::Png)?;
                push(Field::Png, numbered(path, i + 1, count), bytes);
            }
        }
        if let Some(path) = &request.pdf {
            push(Field::Pdf, path.clone(), gradewright_draw::pdf(&svgs).map_err(RenderError::Pdf)?);
        }
    }
    if let Some(path) = &request.landxml {
        let mut buffer = Vec::new();
        gradewright_exchange::write_landxml(&mut buffer, project, &gradewright_exchange::Stamp::now())?;
        push(Field::LandXml, path.clone(), buffer);
    }
    if let Some(dir) = &request.csv_dir {
        let Some(alignment) = analysis.alignment.as_ref() else { return Err(RenderError::Unusable) };
        let interval = request.interval.unwrap_or(project.units.table_interval());
        let stations = gradewright_exchange::interval_stations(alignment, interval);
        let rounding = gradewright_exchange::Rounding::of(request.decimals, project.units);
        let mut buffer = Vec::new();
        gradewright_exchange::write_stations_csv(
            &mut buffer,
            alignment,
            &analysis.ground,
            &stations,
            rounding,
        )?;
        push(Field::Tables, dir.join("stations.csv"), buffer);
        let mut buffer = Vec::new();
        gradewright_exchange::write_curves_csv(&mut buffer, analysis, rounding)?;
        push(Field::Tables, dir.join("curves.csv"), buffer);
        let mut buffer = Vec::new();
        gradewright_exchange::write_findings_csv(&mut buffer, analysis, rounding)?;
        push(Field::Tables, dir.join("findings.csv"), buffer);
        // The level-section earthwork, when the project sets a section.
        if let Some(section) = &project.section
            && analysis.ground.range().is_some()
        {
            let estimate = gradewright_geometry::earthwork(alignment, &analysis.ground, section, interval)?;
            let mut buffer = Vec::new();
            gradewright_exchange::write_earthwork_csv(
                &mut buffer,
                &estimate,
                alignment.stationing(),
                rounding,
            )?;
            push(Field::Tables, dir.join("earthwork.csv"), buffer);
        }
    }
    Ok(files)
}

/// Checks every file an export will write, before any is written: each a
/// regular file or a new name in an existing folder (a numbered sheet and
/// every table included), none of them one of `inputs` (the files the
/// project was read from, through links too), no two of them the same file.
///
/// # Errors
/// The first output at fault, named by its field.
pub fn check_outputs(files: &[Output], inputs: &[&Path]) -> Result<(), PlanError> {
    for (i, out) in files.iter().enumerate() {
        let fail = |problem| Err(PlanError::Path { field: out.field, path: out.path.clone(), problem });
        if inputs.iter().any(|input| gradewright_document::same_file(&out.path, input)) {
            return fail(PathProblem::Input);
        }
        if let Some(other) =
            files.iter().take(i).find(|o| gradewright_document::same_file(&o.path, &out.path))
        {
            return fail(PathProblem::Also(field_word(other.field)));
        }
        // A tables folder that does not exist yet is made when writing.
        let new_folder = out.field == Field::Tables && out.path.parent().is_some_and(|d| !d.exists());
        if !new_folder {
            check_file(out.field, &out.path)?;
        }
    }
    Ok(())
}

/// A field's output as a word for a message (what it is, not how a front
/// end names the option).
fn field_word(field: Field) -> &'static str {
    match field {
        Field::Png => "PNG",
        Field::Svg => "SVG",
        Field::Pdf => "PDF",
        Field::LandXml => "LandXML",
        Field::Tables => "tables",
        _ => "other",
    }
}

/// Writes every file together and atomically (creating the tables folder if
/// needed): all of them, or, when one cannot be written, none (and no new
/// folder left behind).
///
/// # Errors
/// The first write that fails, naming the file.
pub fn write_all(files: &[Output]) -> Result<(), gradewright_document::FileError> {
    let mut made: Vec<PathBuf> = Vec::new();
    for out in files {
        if let Some(dir) = out.path.parent().filter(|d| !d.as_os_str().is_empty() && !d.exists()) {
            if let Err(e) = std::fs::create_dir_all(dir) {
                remove_made(&made);
                return Err(gradewright_document::FileError::io(dir, e));
            }
            made.push(dir.to_owned());
        }
    }
    let list: Vec<(&Path, &[u8])> = files.iter().map(|o| (o.path.as_path(), o.bytes.as_slice())).collect();
    gradewright_document::write_all_atomic(&list, false).inspect_err(|_| remove_made(&made))
}

/// Removes the folders an export made, when they are still empty.
fn remove_made(made: &[PathBuf]) {
    for dir in made.iter().rev() {
        let _ = std::fs::remove_dir(dir);
    }
}
