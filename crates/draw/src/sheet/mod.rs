//! The profile sheet: the scene laid out on paper at the chosen scales, split
//! over as many sheets as the profile needs. Rendered as a pipeline: the
//! layout of the sheets ([`layout`]), each sheet laid out into its tree
//! ([`compose`], [`blocks`]: frame, grid, profile, labels, bands, sight
//! band, findings, title block), the tree written as SVG in millimetres
//! ([`tree`]).

mod blocks;
mod compose;
pub mod tree;

pub use tree::{Element, Part, PartKind, SheetTree};

use gradewright_geometry::{Analysis, Units};

use crate::place::Spacing;

/// The cautions printed on every sheet.
pub const CAUTION: &str = "Design aid only: every result must be checked by a licensed professional engineer; local codes and agency standards govern.";

/// Paper size.
#[derive(Clone, Debug, PartialEq)]
pub struct SheetSize {
    /// How it was named (`ansi-b`, `420x297mm`, …).
    pub name: String,
    /// Width, mm (landscape).
    pub width_mm: f64,
    /// Height, mm.
    pub height_mm: f64,
}

impl SheetSize {
    /// ANSI B, 17 × 11 in.
    pub fn ansi_b() -> Self {
        Self { name: "ansi-b".to_owned(), width_mm: 17.0 * 25.4, height_mm: 11.0 * 25.4 }
    }

    /// Parses `ansi-b`, `ansi-d`, `a3`, `a1`, `WxHmm` or `WxHin`.
    ///
    /// # Errors
    /// [`SheetError::Size`] for anything else, or a size outside 100 mm to 2 m.
    pub fn parse(text: &str) -> Result<Self, SheetError> {
        let t = text.trim().to_ascii_lowercase();
        let named = match t.as_str() {
            "ansi-b" => Some((17.0 * 25.4, 11.0 * 25.4)),
            "ansi-d" => Some((34.0 * 25.4, 22.0 * 25.4)),
            "a3" => Some((420.0, 297.0)),
            "a1" => Some((841.0, 594.0)),
            _ => None,
        };
        let (w, h) = match named {
            Some(size) => size,
            None => {
                let (numbers, factor) = if let Some(n) = t.strip_suffix("mm") {
                    (n, 1.0)
                } else if let Some(n) = t.strip_suffix("in") {
                    (n, 25.4)
                } else {
                    return Err(SheetError::Size(text.to_owned()));
                };
                let (w, h) = numbers.split_once('x').ok_or_else(|| SheetError::Size(text.to_owned()))?;
                let parse = |v: &str| v.trim().parse::<f64>().map_err(|_| SheetError::Size(text.to_owned()));
                (parse(w)? * factor, parse(h)? * factor)
            }
        };
        let ok = |v: f64| v.is_finite() && (100.0..=2000.0).contains(&v);
        if !ok(w) || !ok(h) {
            return Err(SheetError::Size(text.to_owned()));
        }
        // Profiles are drawn landscape.
        Ok(Self { name: t, width_mm: w.max(h), height_mm: w.min(h) })
    }
}

/// The title block's fields.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct TitleBlock {
    /// Project name.
    pub project: String,
    /// Road or section.
    pub road: String,
    /// Designer.
    pub designer: String,
    /// Checker.
    pub checker: String,
    /// Date.
    pub date: String,
    /// Revision.
    pub revision: String,
}

/// How the sheet is drawn.
#[derive(Clone, Debug, PartialEq)]
pub struct SheetOptions {
    /// Paper size.
    pub size: SheetSize,
    /// Horizontal scale: metric 1:N (N m of road per m of paper), US
    /// 1 in = N ft. `None` picks the largest standard scale that fits.
    pub h_scale: Option<f64>,
    /// Vertical scale, the same way. `None` is a tenth of the horizontal
    /// (10:1 exaggeration), coarser if the elevations need it.
    pub v_scale: Option<f64>,
    /// Stations repeated at the start of each following sheet.
    pub overlap: f64,
    /// Title block fields.
    pub title: TitleBlock,
    /// Whether the sight-distance band is drawn.
    pub sight_band: bool,
}

impl Default for SheetOptions {
    fn default() -> Self {
        Self {
            size: SheetSize::ansi_b(),
            h_scale: None,
            v_scale: None,
            overlap: 0.0,
            title: TitleBlock::default(),
            sight_band: true,
        }
    }
}

/// Why a sheet could not be drawn.
#[derive(Clone, Debug, PartialEq, thiserror::Error)]
pub enum SheetError {
    /// Not a paper size.
    #[error("'{0}' is not a sheet size (ansi-b, ansi-d, a3, a1, or WxHmm / WxHin between 100 mm and 2 m)")]
    Size(String),
    /// A scale that is not a positive number.
    #[error("{0} is not a usable scale (a positive number)")]
    Scale(f64),
    /// The overlap is negative or leaves no room.
    #[error("overlap {0} is not usable (at least 0 and less than the length one sheet shows)")]
    Overlap(f64),
    /// Too many sheets.
    #[error(
        "the profile would need {0} sheets at this horizontal scale (at most {MAX_SHEETS}); choose a larger scale number N"
    )]
    TooManySheets(u64),
    /// A horizontal scale at which the profile would be a speck.
    #[error("at this horizontal scale the profile would be {} mm long on the sheet (at least {MIN_PROFILE_MM} mm); choose a smaller scale number N", gradewright_geometry::shown(*.0))]
    TooShort(f64),
    /// A vertical scale at which the frame would show next to no elevation.
    #[error("at this vertical scale the frame would show {} {unit} of elevation (at least {MIN_FRAME_HEIGHT} {unit}); choose a larger scale number N", gradewright_geometry::shown(*.height))]
    NoHeight {
        /// The elevation the frame would show.
        height: f64,
        /// `m` or `ft`.
        unit: &'static str,
    },
    /// The profile cannot be evaluated.
    #[error("the profile has problems to fix first: {0}")]
    Unusable(String),
}

/// The most sheets one export makes.
pub const MAX_SHEETS: u64 = 200;

/// The shortest the profile may be on paper, mm.
const MIN_PROFILE_MM: f64 = 10.0;

/// The least elevation (in the project's unit) a sheet's frame may show.
const MIN_FRAME_HEIGHT: f64 = 0.1;

/// Margins and bands, mm.
pub(super) const MARGIN: f64 = 10.0;
pub(super) const SIDE_LABELS: f64 = 20.0;
pub(super) const TOP: f64 = 8.0;
pub(super) const BOTTOM_BLOCK: f64 = 46.0;
pub(super) const BAND_ROW: f64 = 16.0;
pub(super) const AXIS_LABELS: f64 = 8.0;
pub(super) const SIGHT_BAND: f64 = 34.0;
/// Text sizes, mm.
pub(super) const TEXT: f64 = 2.4;
pub(super) const SMALL: f64 = 2.0;
/// The one accent colour (failures); everything else is black and greys.
pub(super) const ACCENT: &str = "#b3261e";
/// Labels on paper: 2.5 mm from their point, stepping 3.9 mm (a line of text
/// and a millimetre) up to five times; 0.4 mm kept clear each side of the line.
pub(super) const LABEL_SPACING: Spacing =
    Spacing { gap: 2.5, step: TEXT * 1.2 + 1.0, tries: 6, line_clearance: 0.4, piece: 2.0 };

/// Where everything goes on one sheet.
#[derive(Clone, Debug, PartialEq)]
pub struct Layout {
    /// Station range of each sheet.
    pub pages: Vec<(f64, f64)>,
    /// Stations per mm of paper.
    pub h_units_per_mm: f64,
    /// Elevation units per mm of paper.
    pub v_units_per_mm: f64,
    /// The scales as printed (`1:1000` or `1 in = 50 ft`).
    pub scale_text: (String, String),
    /// Profile frame: left, top, width, height, mm.
    pub frame: (f64, f64, f64, f64),
    /// Elevation at the bottom edge of each sheet's frame (the profile on
    /// that sheet is centred, on a whole grid line).
    pub bottoms: Vec<f64>,
}

impl Layout {
    /// Paper position (mm from the sheet's top left) of a profile point on
    /// sheet `page` (0-based).
    pub fn paper(&self, page: usize, station: f64, elevation: f64) -> Option<(f64, f64)> {
        let (&(start, _), &bottom) = (self.pages.get(page)?, self.bottoms.get(page)?);
        let (fx, fy, _, fh) = self.frame;
        Some((
            fx + (station - start) / self.h_units_per_mm,
            fy + fh - (elevation - bottom) / self.v_units_per_mm,
        ))
    }

    /// The elevation grid interval.
    pub fn elevation_step(&self) -> f64 {
        grid_step(self.v_units_per_mm, 8.0)
    }
}

fn paper_mm_per_unit(units: Units, scale: f64) -> f64 {
    match units {
        Units::Metric => 1000.0 / scale,
        Units::UsCustomary => 25.4 / scale,
    }
}

fn scale_text(units: Units, scale: f64) -> String {
    match units {
        Units::Metric => format!("1:{scale}"),
        Units::UsCustomary => format!("1 in = {scale} ft"),
    }
}

/// Standard scales, finest first.
fn standard_scales(units: Units) -> &'static [f64] {
    match units {
        Units::Metric => {
            &[100.0, 200.0, 250.0, 500.0, 1000.0, 2000.0, 2500.0, 5000.0, 10000.0, 20000.0, 25000.0, 50000.0]
        }
        Units::UsCustomary => {
            &[10.0, 20.0, 30.0, 40.0, 50.0, 100.0, 200.0, 400.0, 500.0, 1000.0, 2000.0, 5000.0]
        }
    }
}

/// Lays the profile out on sheets.
///
/// # Errors
/// [`SheetError`] for unusable options or a profile with problems.
pub fn layout(analysis: &Analysis, options: &SheetOptions) -> Result<Layout, SheetError> {
    let Some(alignment) = analysis.alignment.as_ref() else {
        let first = analysis.problems.first().map_or_else(|| "no PVIs".to_owned(), ToString::to_string);
        return Err(SheetError::Unusable(first));
    };
    let units = analysis.profile.units;
    let (w, h) = (options.size.width_mm, options.size.height_mm);
    let sight = if options.sight_band && analysis.sight.is_some() { SIGHT_BAND } else { 0.0 };
    let frame_w = w - 2.0 * MARGIN - 2.0 * SIDE_LABELS;
    let bands = if analysis.ground.range().is_some() { 3.0 } else { 1.0 };
    let frame_h = h - 2.0 * MARGIN - TOP - BOTTOM_BLOCK - bands * BAND_ROW - AXIS_LABELS - sight;
    let (start, end) = (alignment.start().0, alignment.end().0);
    let span = (end - start).max(1.0);
    let h_scale = match options.h_scale {
        Some(s) if s.is_finite() && s > 0.0 => s,
        Some(s) => return Err(SheetError::Scale(s)),
        None => {
            let fits = |s: f64| span * paper_mm_per_unit(units, s) <= frame_w;
            let scales = standard_scales(units);
            scales.iter().copied().find(|&s| fits(s)).unwrap_or(scales.last().copied().unwrap_or(1000.0))
        }
    };
    let h_units_per_mm = 1.0 / paper_mm_per_unit(units, h_scale);
    let on_paper = span / h_units_per_mm;
    if on_paper.is_nan() || on_paper < MIN_PROFILE_MM {
        return Err(SheetError::TooShort(on_paper));
    }
    let sheet_length = frame_w * h_units_per_mm;
    if !(options.overlap.is_finite() && options.overlap >= 0.0 && options.overlap < sheet_length) {
        return Err(SheetError::Overlap(options.overlap));
    }
    // The count the scale asks for, before any sheet is laid out.
    let needed = ((end - start - options.overlap) / (sheet_length - options.overlap)).ceil().max(1.0);
    if needed > MAX_SHEETS as f64 {
        #[allow(clippy::cast_possible_truncation, clippy::cast_sign_loss)]
        return Err(SheetError::TooManySheets(if needed < 1e18 { needed as u64 } else { u64::MAX }));
    }
    let mut pages = Vec::new();
    let mut from = start;
    loop {
        pages.push((from, from + sheet_length));
        if !gradewright_geometry::tolerance::below(from + sheet_length, end) {
            break;
        }
        from += sheet_length - options.overlap;
        if pages.len() as u64 > MAX_SHEETS {
            return Err(SheetError::TooManySheets(pages.len() as u64));
        }
    }
    // The largest elevation range any sheet shows sets the vertical scale.
    let relief = pages
        .iter()
        .map(|&(a, b)| {
            let points = alignment.flatten((a, b), 0.01);
            let ys = points.iter().map(|p| p[1]).chain(
                analysis
                    .profile
                    .pvis
                    .iter()
                    .filter(|p| p.station.0 >= a && p.station.0 <= b)
                    .map(|p| p.elevation),
            );
            let (lo, hi) = ys.fold((f64::INFINITY, f64::NEG_INFINITY), |(l, u), y| (l.min(y), u.max(y)));
            hi - lo
        })
        .fold(0.0, f64::max);
    let v_scale = match options.v_scale {
        Some(s) if s.is_finite() && s > 0.0 => s,
        Some(s) => return Err(SheetError::Scale(s)),
        None => {
            // 10:1 where the relief fits in 70 % of the frame, else coarser.
            let mut s = h_scale / 10.0;
            let scales = standard_scales(units);
            while relief * paper_mm_per_unit(units, s) > 0.7 * frame_h {
                match scales.iter().copied().find(|&c| c > s) {
                    Some(next) => s = next,
                    None => break,
                }
            }
            s
        }
    };
    let v_units_per_mm = 1.0 / paper_mm_per_unit(units, v_scale);
    let v_step = grid_step(v_units_per_mm, 8.0);
    let height_units = frame_h * v_units_per_mm;
    if height_units.is_nan() || height_units < MIN_FRAME_HEIGHT {
        return Err(SheetError::NoHeight { height: height_units, unit: units.length_symbol() });
    }
    let bottoms = pages
        .iter()
        .map(|&range| {
            let points = alignment.flatten(range, 0.05 * v_units_per_mm);
            let (lo, hi) = points
                .iter()
                .map(|p| p[1])
                .fold((f64::INFINITY, f64::NEG_INFINITY), |(l, u), y| (l.min(y), u.max(y)));
            let (lo, hi) = if lo.is_finite() { (lo, hi) } else { (0.0, 1.0) };
            ((0.5 * (lo + hi) - 0.5 * height_units) / v_step).floor() * v_step
        })
        .collect();
    Ok(Layout {
        pages,
        h_units_per_mm,
        v_units_per_mm,
        scale_text: (scale_text(units, h_scale), scale_text(units, v_scale)),
        frame: (MARGIN + SIDE_LABELS, MARGIN + TOP, frame_w, frame_h),
        bottoms,
    })
}

/// A round grid interval with at least `min_mm` of paper between lines, at
/// any scale (beyond the usual intervals, 1, 2 or 5 times a power of ten):
/// a sheet never carries more lines than its frame has room for.
pub(super) fn grid_step(units_per_mm: f64, min_mm: f64) -> f64 {
    let steps = [
        0.1, 0.2, 0.5, 1.0, 2.0, 5.0, 10.0, 20.0, 25.0, 50.0, 100.0, 200.0, 250.0, 500.0, 1000.0, 2000.0,
        5000.0, 10000.0,
    ];
    let wanted = units_per_mm * min_mm;
    if let Some(step) = steps.iter().copied().find(|&s| s >= wanted) {
        return step;
    }
    if !wanted.is_finite() {
        return f64::MAX;
    }
    let decade = 10f64.powf(wanted.log10().floor());
    [1.0, 2.0, 5.0, 10.0].iter().map(|m| m * decade).find(|&s| s >= wanted).unwrap_or(10.0 * decade)
}

/// Every sheet of the profile laid out into its tree.
///
/// # Errors
/// [`SheetError`] as for [`layout`].
pub fn sheet_trees(analysis: &Analysis, options: &SheetOptions) -> Result<Vec<SheetTree>, SheetError> {
    let layout = layout(analysis, options)?;
    Ok((1..=layout.pages.len()).map(|n| compose::sheet(analysis, options, &layout, n)).collect())
}

/// Every sheet of the profile as SVG text (mm units).
///
/// # Errors
/// [`SheetError`] as for [`layout`].
pub fn sheet_svgs(analysis: &Analysis, options: &SheetOptions) -> Result<Vec<String>, SheetError> {
    Ok(sheet_trees(analysis, options)?.iter().map(SheetTree::to_svg).collect())
}
