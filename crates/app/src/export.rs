//! The hand-over: sheet files (SVG, PNG, PDF) and tables (CSV), for the
//! command line and the editor alike. Everything is rendered in memory first
//! and written only when all of it succeeded, each file atomically.

use std::path::{Path, PathBuf};

use anyhow::{Context as _, bail};
use gradewright_document::{Project, write_atomic};
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

/// Refuses an output (named by its command-line `option`) that is not a
/// regular file or a new path in an existing folder, before any work is done.
///
/// # Errors
/// The reason, naming the path and the option.
pub fn check_file(option: &str, path: &Path) -> anyhow::Result<()> {
    match std::fs::metadata(path) {
        Ok(meta) if meta.is_file() => {}
        Ok(meta) if meta.is_dir() => bail!("{}: {option}: is a folder, not a file", path.display()),
        Ok(_) => bail!(
            "{}: {option}: is not a regular file; Gradewright writes only to regular files",
            path.display()
        ),
        Err(e) if e.kind() == std::io::ErrorKind::NotFound => {}
        Err(e) => bail!("{}: {option}: {e}", path.display()),
    }
    let dir = path.parent().filter(|d| !d.as_os_str().is_empty()).unwrap_or(Path::new("."));
    if !dir.is_dir() {
        bail!("{}: {option}: the folder {} does not exist", path.display(), dir.display());
    }
    Ok(())
}

/// Checks every option of `request`: the sheet size, dpi, scales, overlap,
/// and that every output can be written (a regular file or a new path).
///
/// # Errors
/// The first unusable option, named.
pub fn plan(request: &Request) -> anyhow::Result<Plan> {
    let size = SheetSize::parse(&request.sheet).map_err(|e| anyhow::anyhow!("--sheet: {e}"))?;
    let (lo, hi) = gradewright_draw::render::DPI_RANGE;
    if !(request.dpi.is_finite() && request.dpi >= lo && request.dpi <= hi) {
        bail!("--dpi: {} is outside {lo} to {hi} dpi", request.dpi);
    }
    for (name, scale) in [("--h-scale", request.h_scale), ("--v-scale", request.v_scale)] {
        if let Some(s) = scale
            && !(s.is_finite() && s > 0.0)
        {
            bail!("{name}: {s} is not a usable scale (a positive number)");
        }
    }
    if !(request.overlap.is_finite() && request.overlap >= 0.0) {
        bail!("--overlap: {} is not a length of 0 or more", request.overlap);
    }
    if let Some(v) = request.interval
        && !(v.is_finite() && v > 0.0)
    {
        bail!("--interval: the station interval must be a positive number (got {v})");
    }
    if request.png.is_none()
        && request.svg.is_none()
        && request.pdf.is_none()
        && request.csv_dir.is_none()
        && request.landxml.is_none()
    {
        bail!("nothing to export: give --png, --svg, --pdf, --csv-dir or --landxml");
    }
    for (name, path) in [
        ("--png", &request.png),
        ("--svg", &request.svg),
        ("--pdf", &request.pdf),
        ("--landxml", &request.landxml),
    ] {
        if let Some(p) = path {
            check_file(name, p)?;
        }
    }
    if let Some(dir) = &request.csv_dir {
        match std::fs::metadata(dir) {
            Ok(meta) if meta.is_dir() => {
                for name in ["stations.csv", "curves.csv", "findings.csv"] {
                    check_file("--csv-dir", &dir.join(name))?;
                }
            }
            Ok(_) => bail!("{}: --csv-dir: is not a folder", dir.display()),
            Err(e) if e.kind() == std::io::ErrorKind::NotFound => {
                let parent = dir.parent().filter(|d| !d.as_os_str().is_empty()).unwrap_or(Path::new("."));
                if !parent.is_dir() {
                    bail!("{}: --csv-dir: the folder {} does not exist", dir.display(), parent.display());
                }
            }
            Err(e) => bail!("{}: --csv-dir: {e}", dir.display()),
        }
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

/// Every file of the request, rendered in memory: (path, bytes).
///
/// # Errors
/// A sheet that cannot be laid out or rendered (e.g. too many pixels).
pub fn render(
    plan: &Plan,
    request: &Request,
    analysis: &Analysis,
    project: &Project,
) -> anyhow::Result<Vec<(PathBuf, Vec<u8>)>> {
    let mut files = Vec::new();
    if request.png.is_some() || request.svg.is_some() || request.pdf.is_some() {
        let options = sheet_options(plan, request, project);
        let svgs = gradewright_draw::sheet_svgs(analysis, &options)?;
        let count = svgs.len();
        if let Some(path) = &request.svg {
            for (i, svg) in svgs.iter().enumerate() {
                files.push((numbered(path, i + 1, count), svg.clone().into_bytes()));
            }
        }
        if let Some(path) = &request.png {
            for (i, svg) in svgs.iter().enumerate() {
                let bytes =
                    gradewright_draw::png(svg, request.dpi).map_err(|e| anyhow::anyhow!("--dpi: {e}"))?;
                files.push((numbered(path, i + 1, count), bytes));
            }
        }
        if let Some(path) = &request.pdf {
            files.push((path.clone(), gradewright_draw::pdf(&svgs)?));
        }
    }
    if let Some(path) = &request.landxml {
        let mut buffer = Vec::new();
        gradewright_exchange::write_landxml(&mut buffer, project, &gradewright_exchange::Stamp::now())?;
        files.push((path.clone(), buffer));
    }
    if let Some(dir) = &request.csv_dir {
        let Some(alignment) = analysis.alignment.as_ref() else {
            bail!("the profile has problems to fix first")
        };
        let interval = request.interval.unwrap_or(project.units.table_interval());
        let stations = gradewright_exchange::interval_stations(alignment, interval);
        let mut buffer = Vec::new();
        gradewright_exchange::write_stations_csv(&mut buffer, alignment, &analysis.ground, &stations)?;
        files.push((dir.join("stations.csv"), buffer));
        let mut buffer = Vec::new();
        gradewright_exchange::write_curves_csv(&mut buffer, analysis)?;
        files.push((dir.join("curves.csv"), buffer));
        let mut buffer = Vec::new();
        gradewright_exchange::write_findings_csv(&mut buffer, analysis)?;
        files.push((dir.join("findings.csv"), buffer));
        // The level-section earthwork, when the project sets a section.
        if let Some(section) = &project.section
            && analysis.ground.range().is_some()
        {
            let estimate = gradewright_geometry::earthwork(alignment, &analysis.ground, section, interval)
                .map_err(|e| anyhow::anyhow!("earthwork: {e}"))?;
            let mut buffer = Vec::new();
            gradewright_exchange::write_earthwork_csv(&mut buffer, &estimate)?;
            files.push((dir.join("earthwork.csv"), buffer));
        }
    }
    Ok(files)
}

/// Writes every file atomically (creating the CSV folder if needed).
///
/// # Errors
/// The first write that fails, naming the file.
pub fn write_all(files: &[(PathBuf, Vec<u8>)]) -> anyhow::Result<()> {
    for (path, bytes) in files {
        if let Some(dir) = path.parent().filter(|d| !d.as_os_str().is_empty() && !d.exists()) {
            std::fs::create_dir_all(dir).with_context(|| format!("{}", dir.display()))?;
        }
        write_atomic(path, bytes, false)?;
    }
    Ok(())
}
