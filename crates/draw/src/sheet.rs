//! The profile sheet: the scene laid out on paper at the chosen scales, split
//! over as many sheets as the profile needs, as SVG in millimetres.

use std::fmt::Write as _;

use gradewright_geometry::tolerance::{run_end, station_hair};
use gradewright_geometry::{Analysis, Severity, Station, Units, format_station};

use crate::place::{Rect, Spacing, place_labels};
use crate::scene::{Detail, Label, Role, Shape, Side, profile_scene};

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
    #[error("the profile would need {0} sheets at this scale (at most 200); choose a smaller scale")]
    TooManySheets(usize),
    /// The profile cannot be evaluated.
    #[error("the profile has problems to fix first: {0}")]
    Unusable(String),
}

/// Margins and bands, mm.
const MARGIN: f64 = 10.0;
const SIDE_LABELS: f64 = 20.0;
const TOP: f64 = 8.0;
const BOTTOM_BLOCK: f64 = 46.0;
const BAND_ROW: f64 = 16.0;
const AXIS_LABELS: f64 = 8.0;
const SIGHT_BAND: f64 = 34.0;
/// Text sizes, mm.
const TEXT: f64 = 2.4;
const SMALL: f64 = 2.0;
/// The one accent colour (failures); everything else is black and greys.
const ACCENT: &str = "#b3261e";
/// Labels on paper: 2.5 mm from their point, stepping 3.9 mm (a line of text
/// and a millimetre) up to five times; 0.4 mm kept clear each side of the line.
const LABEL_SPACING: Spacing =
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
    let sheet_length = frame_w * h_units_per_mm;
    if !(options.overlap.is_finite() && options.overlap >= 0.0 && options.overlap < sheet_length) {
        return Err(SheetError::Overlap(options.overlap));
    }
    let mut pages = Vec::new();
    let mut from = start;
    loop {
        pages.push((from, from + sheet_length));
        if !gradewright_geometry::tolerance::below(from + sheet_length, end) {
            break;
        }
        from += sheet_length - options.overlap;
        if pages.len() > 200 {
            return Err(SheetError::TooManySheets(pages.len()));
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

/// A round grid interval with at least `min_mm` of paper between lines.
fn grid_step(units_per_mm: f64, min_mm: f64) -> f64 {
    let steps = [
        0.1, 0.2, 0.5, 1.0, 2.0, 5.0, 10.0, 20.0, 25.0, 50.0, 100.0, 200.0, 250.0, 500.0, 1000.0, 2000.0,
        5000.0, 10000.0,
    ];
    steps.iter().copied().find(|s| s / units_per_mm >= min_mm).unwrap_or(10000.0)
}

fn esc(text: &str) -> String {
    text.replace('&', "&amp;").replace('<', "&lt;").replace('>', "&gt;").replace('"', "&quot;")
}

/// Every sheet of the profile as SVG text (mm units).
///
/// # Errors
/// [`SheetError`] as for [`layout`].
pub fn sheet_svgs(analysis: &Analysis, options: &SheetOptions) -> Result<Vec<String>, SheetError> {
    let layout = layout(analysis, options)?;
    let count = layout.pages.len();
    Ok(layout
        .pages
        .iter()
        .enumerate()
        .map(|(i, &range)| one_sheet(analysis, options, &layout, range, i + 1, count))
        .collect())
}

#[allow(clippy::too_many_lines)]
fn one_sheet(
    analysis: &Analysis,
    options: &SheetOptions,
    layout: &Layout,
    range: (f64, f64),
    number: usize,
    count: usize,
) -> String {
    let units = analysis.profile.units;
    let len = units.length_symbol();
    let (w, h) = (options.size.width_mm, options.size.height_mm);
    let (fx, fy, fw, fh) = layout.frame;
    let (hu, vu) = (layout.h_units_per_mm, layout.v_units_per_mm);
    // Elevation range: the profile on this sheet centred in the frame.
    let points = analysis.alignment.as_ref().map(|a| a.flatten(range, 0.05 * vu)).unwrap_or_default();
    let v_step = layout.elevation_step();
    let height_units = fh * vu;
    let bottom = layout.bottoms.get(number - 1).copied().unwrap_or(0.0);
    let px = |s: f64| fx + (s - range.0) / hu;
    let py = |e: f64| fy + fh - (e - bottom) / vu;
    let mut svg = String::new();
    let _ = write!(
        svg,
        r#"<svg xmlns="http://www.w3.org/2000/svg" width="{w}mm" height="{h}mm" viewBox="0 0 {w} {h}" font-family="Ubuntu, sans-serif">"#
    );
    let _ = write!(svg, r#"<rect x="0" y="0" width="{w}" height="{h}" fill="white"/>"#);
    let _ = write!(
        svg,
        r##"<rect x="{}" y="{}" width="{}" height="{}" fill="none" stroke="#000" stroke-width="0.5"/>"##,
        MARGIN / 2.0,
        MARGIN / 2.0,
        w - MARGIN,
        h - MARGIN
    );
    let _ = write!(
        svg,
        r#"<defs><clipPath id="frame"><rect x="{fx}" y="{fy}" width="{fw}" height="{fh}"/></clipPath></defs>"#
    );
    // Grid: stations (major labelled, minor light) and elevations both sides.
    let major = grid_step(hu, 25.0);
    let minor = major / 5.0;
    let mut s = (range.0 / minor).ceil() * minor;
    let _ = write!(svg, r##"<g stroke="#000" stroke-width="0.08" fill="none">"##);
    while s <= run_end(range.1, minor) {
        let is_major = ((s / major).round() * major - s).abs() < station_hair(major);
        let width = if is_major { 0.18 } else { 0.06 };
        let colour = if is_major { "#888" } else { "#ccc" };
        let _ = write!(
            svg,
            r#"<line x1="{x:.3}" y1="{fy:.3}" x2="{x:.3}" y2="{y2:.3}" stroke="{colour}" stroke-width="{width}"/>"#,
            x = px(s),
            y2 = fy + fh
        );
        s += minor;
    }
    let mut e = bottom;
    while e <= run_end(bottom + height_units, v_step) {
        let _ = write!(
            svg,
            r##"<line x1="{fx:.3}" y1="{y:.3}" x2="{x2:.3}" y2="{y:.3}" stroke="#bbb" stroke-width="0.1"/>"##,
            y = py(e),
            x2 = fx + fw
        );
        e += v_step;
    }
    let _ = write!(svg, "</g>");
    let _ = write!(
        svg,
        r##"<rect x="{fx}" y="{fy}" width="{fw}" height="{fh}" fill="none" stroke="#000" stroke-width="0.35"/>"##
    );
    let mut text = String::new();
    let mut e = bottom;
    let decimals = if v_step < 1.0 { 1 } else { 0 };
    while e <= run_end(bottom + height_units, v_step) {
        let y = py(e) + 0.8;
        let _ = write!(
            text,
            r#"<text x="{:.3}" y="{y:.3}" font-size="{SMALL}" text-anchor="end">{e:.decimals$}</text>"#,
            fx - 1.5
        );
        let _ = write!(
            text,
            r#"<text x="{:.3}" y="{y:.3}" font-size="{SMALL}" text-anchor="start">{e:.decimals$}</text>"#,
            fx + fw + 1.5
        );
        e += v_step;
    }
    let mut s = (range.0 / major).ceil() * major;
    while s <= run_end(range.1, major) {
        let _ = write!(
            text,
            r#"<text x="{:.3}" y="{:.3}" font-size="{TEXT}" text-anchor="middle">{}</text>"#,
            px(s),
            fy + fh + 4.0,
            format_station(s, units, 0)
        );
        s += major;
    }
    let _ = write!(
        text,
        r#"<text x="{:.3}" y="{:.3}" font-size="{SMALL}" text-anchor="middle" transform="rotate(-90 {:.3} {:.3})">Elevation ({len})</text>"#,
        fx - 13.0,
        fy + fh / 2.0,
        fx - 13.0,
        fy + fh / 2.0
    );
    svg.push_str(&text);
    // The scene: lines first, then markers, then labels placed apart.
    // Half-millimetre columns; a hatch stroke every 2.5 mm.
    #[allow(clippy::cast_possible_truncation, clippy::cast_sign_loss)]
    let detail = Detail { tolerance: 0.05 * vu, columns: (fw * 2.0).max(1.0) as usize, hatch_every: 5.0 };
    let scene = profile_scene(analysis, range, detail);
    let path = |pts: &[[f64; 2]]| {
        let mut d = String::new();
        for (k, p) in pts.iter().enumerate() {
            let _ = write!(d, "{}{:.3},{:.3} ", if k == 0 { "M" } else { "L" }, px(p[0]), py(p[1]));
        }
        d
    };
    let _ = write!(svg, r#"<g clip-path="url(#frame)" fill="none" stroke-linejoin="round">"#);
    // Cut hatched with solid strokes, fill with dotted ones: told apart
    // without colour.
    for (role, style) in [
        (Role::Cut, r##"stroke="#888" stroke-width="0.15""##),
        (
            Role::Fill,
            r##"stroke="#666" stroke-width="0.3" stroke-dasharray="0.01 0.7" stroke-linecap="round""##,
        ),
    ] {
        let mut d = String::new();
        for h in scene.hatches.iter().filter(|h| h.role == role) {
            let x = px(h.station);
            let _ = write!(d, "M{x:.3},{:.3} L{x:.3},{:.3} ", py(h.profile), py(h.ground));
        }
        if !d.is_empty() {
            let _ = write!(svg, r#"<path class="{role:?}" d="{d}" {style}/>"#);
        }
    }
    for line in &scene.lines {
        let style = match line.role {
            Role::GradeLine => r##"stroke="#666" stroke-width="0.2" stroke-dasharray="2 1.2""##.to_owned(),
            Role::Profile => r##"stroke="#000" stroke-width="0.5""##.to_owned(),
            Role::FailingCurve => {
                format!(r#"stroke="{ACCENT}" stroke-width="0.9" stroke-dasharray="1.6 0.8""#)
            }
            Role::Shortfall => format!(r#"stroke="{ACCENT}" stroke-opacity="0.35" stroke-width="2.2""#),
            Role::Ground => r##"stroke="#555" stroke-width="0.25""##.to_owned(),
            Role::InvalidCurve => format!(r#"stroke="{ACCENT}" stroke-width="0.5""#),
            _ => r##"stroke="#000" stroke-width="0.2""##.to_owned(),
        };
        let _ = write!(svg, r#"<path class="{:?}" d="{}" {style}/>"#, line.role, path(&line.points));
    }
    for m in &scene.markers {
        let (x, y) = (px(m.at[0]), py(m.at[1]));
        let _ = match m.shape {
            Shape::Circle => write!(
                svg,
                r##"<circle cx="{x:.3}" cy="{y:.3}" r="0.9" fill="white" stroke="#000" stroke-width="0.3"/>"##
            ),
            Shape::Tick => write!(
                svg,
                r##"<line x1="{x:.3}" y1="{:.3}" x2="{x:.3}" y2="{:.3}" stroke="#000" stroke-width="0.3"/>"##,
                y - 1.5,
                y + 1.5
            ),
            Shape::Triangle { up } => {
                let d = if up { -1.2 } else { 1.2 };
                write!(
                    svg,
                    r##"<path d="M{:.3},{:.3} L{:.3},{:.3} L{:.3},{:.3} Z" fill="#444" stroke="none"/>"##,
                    x - 1.0,
                    y - d * 0.2,
                    x + 1.0,
                    y - d * 0.2,
                    x,
                    y + d
                )
            }
            Shape::Diamond | Shape::Floor | Shape::Ceiling => {
                let colour = if m.role == Role::MissedControl { ACCENT } else { "#000" };
                let d = match m.shape {
                    Shape::Diamond => format!(
                        "M{x:.3},{:.3} L{:.3},{y:.3} L{x:.3},{:.3} L{:.3},{y:.3} Z",
                        y - 1.3,
                        x + 1.3,
                        y + 1.3,
                        x - 1.3
                    ),
                    // A bar at the elevation with a triangle on the side the
                    // profile must stay.
                    Shape::Floor => format!(
                        "M{:.3},{y:.3} L{:.3},{y:.3} M{x:.3},{y:.3} L{:.3},{:.3} L{:.3},{:.3} Z",
                        x - 1.6,
                        x + 1.6,
                        x - 1.0,
                        y + 1.6,
                        x + 1.0,
                        y + 1.6
                    ),
                    _ => format!(
                        "M{:.3},{y:.3} L{:.3},{y:.3} M{x:.3},{y:.3} L{:.3},{:.3} L{:.3},{:.3} Z",
                        x - 1.6,
                        x + 1.6,
                        x - 1.0,
                        y - 1.6,
                        x + 1.0,
                        y - 1.6
                    ),
                };
                write!(
                    svg,
                    r#"<path class="{:?}" d="{d}" fill="white" stroke="{colour}" stroke-width="0.35"/>"#,
                    m.role
                )
            }
            Shape::Cross => write!(
                svg,
                r#"<path d="M{:.3},{:.3} L{:.3},{:.3} M{:.3},{:.3} L{:.3},{:.3}" stroke="{ACCENT}" stroke-width="0.5"/>"#,
                x - 1.4,
                y - 1.4,
                x + 1.4,
                y + 1.4,
                x - 1.4,
                y + 1.4,
                x + 1.4,
                y - 1.4
            ),
        };
    }
    let _ = write!(svg, "</g>");
    // Labels: most important first; each tries its place, then steps away
    // from the line with a leader, and is dropped only when nothing fits.
    let paper: Vec<[f64; 2]> = points.iter().map(|p| [px(p[0]), py(p[1])]).collect();
    let size_of = |label: &Label| if label.priority >= 3 { SMALL } else { TEXT };
    let sizes: Vec<[f64; 2]> = scene
        .labels
        .iter()
        .map(|label| {
            let size = size_of(label);
            let chars = label.lines.iter().map(|l| l.chars().count()).max().unwrap_or(0);
            [chars as f64 * size * 0.52, label.lines.len() as f64 * size * 1.2]
        })
        .collect();
    let placement = place_labels(
        &scene.labels,
        &sizes,
        |a| [px(a[0]), py(a[1])],
        Rect { x0: fx, y0: fy, x1: fx + fw, y1: fy + fh },
        (&[&paper], &[]),
        LABEL_SPACING,
    );
    let dropped = placement.dropped;
    for placed in &placement.placed {
        let label = &scene.labels[placed.label];
        let (rect, [x, y]) = (placed.rect, placed.anchor);
        let size = size_of(label);
        let line_h = size * 1.2;
        let colour = if label.role == Role::FailLabel { ACCENT } else { "#000" };
        if placed.leader {
            let ly = match label.side {
                Side::Above => rect.y1,
                Side::Below => rect.y0,
            };
            let _ = write!(
                svg,
                r##"<line x1="{x:.3}" y1="{y:.3}" x2="{x:.3}" y2="{ly:.3}" stroke="#777" stroke-width="0.12"/>"##
            );
        }
        for (k, line) in label.lines.iter().enumerate() {
            let weight = if k == 0 && label.priority <= 1 { r#" font-weight="bold""# } else { "" };
            let _ = write!(
                svg,
                r#"<text class="{:?}" x="{x:.3}" y="{:.3}" font-size="{size}" text-anchor="middle" fill="{colour}"{weight}>{}</text>"#,
                label.role,
                rect.y0 + (k as f64 + 0.85) * line_h,
                esc(line)
            );
        }
    }
    // Bands at each major station: the proposed elevation, and with ground
    // the existing elevation and the cut or fill depth.
    let band_y = fy + fh + AXIS_LABELS;
    let with_ground = analysis.ground.range().is_some();
    let rows: &[(&str, &str)] = if with_ground {
        &[("Proposed", "elevation"), ("Existing", "ground"), ("Cut C /", "fill F")]
    } else {
        &[("Proposed", "elevation")]
    };
    for (k, (first, second)) in rows.iter().enumerate() {
        #[allow(clippy::cast_precision_loss)]
        let y0 = band_y + k as f64 * BAND_ROW;
        let _ = write!(
            svg,
            r##"<rect x="{fx}" y="{y0}" width="{fw}" height="{BAND_ROW}" fill="none" stroke="#000" stroke-width="0.3"/>"##
        );
        for (line, text) in [(0.0, first), (2.6, second)] {
            let _ = write!(
                svg,
                r#"<text x="{:.3}" y="{:.3}" font-size="{SMALL}" text-anchor="end">{text}</text>"#,
                fx - 1.5,
                y0 + BAND_ROW / 2.0 + line
            );
        }
    }
    if let Some(alignment) = analysis.alignment.as_ref() {
        let mut s = (range.0 / major).ceil() * major;
        while s <= run_end(range.1, major) {
            if let Ok(sample) = alignment.sample(Station(s)) {
                let ground = analysis.ground.elevation_at(s);
                let cells = [
                    ("BandElevation", Some(format!("{:.3}", sample.elevation))),
                    ("BandGround", ground.map(|g| format!("{g:.3}"))),
                    (
                        "BandCutFill",
                        ground.map(|g| {
                            let d = g - sample.elevation;
                            if d > 0.0 { format!("C {d:.3}") } else { format!("F {:.3}", (-d).max(0.0)) }
                        }),
                    ),
                ];
                for (k, (class, text)) in cells.iter().take(rows.len()).enumerate() {
                    let Some(text) = text else { continue };
                    #[allow(clippy::cast_precision_loss)]
                    let (x, y) = (px(s) + 0.8, band_y + (k as f64 + 1.0) * BAND_ROW - 1.5);
                    let _ = write!(
                        svg,
                        r#"<text class="{class}" x="{x:.3}" y="{y:.3}" font-size="{SMALL}" transform="rotate(-90 {x:.3} {y:.3})">{text}</text>"#
                    );
                }
            }
            s += major;
        }
    }
    // Sight-distance band.
    if options.sight_band
        && let Some(sight) = analysis.sight.as_deref()
    {
        #[allow(clippy::cast_precision_loss)]
        let top = band_y + rows.len() as f64 * BAND_ROW + 2.0;
        let height = SIGHT_BAND - 4.0;
        let cap = sight.cap.max(1.0);
        let sy = |d: f64| top + height - d.min(cap) / cap * height;
        let _ = write!(
            svg,
            r##"<rect x="{fx}" y="{top}" width="{fw}" height="{height}" fill="none" stroke="#000" stroke-width="0.3"/>"##
        );
        let _ = write!(
            svg,
            r#"<text x="{:.3}" y="{:.3}" font-size="{SMALL}" text-anchor="end">Sight ({len})</text>"#,
            fx - 1.5,
            top + height / 2.0
        );
        let _ = write!(
            svg,
            r#"<text x="{:.3}" y="{:.3}" font-size="{SMALL}" text-anchor="end">cap {cap:.0}</text>"#,
            fx - 1.5,
            top + 2.0
        );
        let pick = |f: &dyn Fn(&gradewright_geometry::visibility::SightSample) -> f64| {
            let mut d = String::new();
            let mut first = true;
            let stride = (sight.samples.len() / 4000).max(1);
            for sample in
                sight.samples.iter().filter(|s| s.station >= range.0 && s.station <= range.1).step_by(stride)
            {
                let _ = write!(
                    d,
                    "{}{:.3},{:.3} ",
                    if first { "M" } else { "L" },
                    px(sample.station),
                    sy(f(sample))
                );
                first = false;
            }
            d
        };
        let _ = write!(
            svg,
            r##"<path class="AvailableForward" d="{}" fill="none" stroke="#000" stroke-width="0.25"/>"##,
            pick(&|s| s.forward)
        );
        let _ = write!(
            svg,
            r##"<path class="AvailableBackward" d="{}" fill="none" stroke="#777" stroke-width="0.25" stroke-dasharray="1 0.6"/>"##,
            pick(&|s| s.backward)
        );
        let _ = write!(
            svg,
            r#"<path class="Required" d="{}" fill="none" stroke="{ACCENT}" stroke-width="0.3"/>"#,
            pick(&|s| s.required_forward.max(s.required_backward))
        );
    }
    // Match lines where the profile continues on another sheet.
    let end = analysis.alignment.as_ref().map_or(range.1, |a| a.end().0);
    let start = analysis.alignment.as_ref().map_or(range.0, |a| a.start().0);
    for (at, continues) in [(range.0, number > 1 && range.0 > start), (range.1.min(end), number < count)] {
        if continues {
            let x = px(at);
            let _ = write!(
                svg,
                r##"<line x1="{x:.3}" y1="{fy}" x2="{x:.3}" y2="{:.3}" stroke="#000" stroke-width="0.5" stroke-dasharray="4 1 1 1"/>"##,
                fy + fh
            );
            let _ = write!(
                svg,
                r#"<text x="{x:.3}" y="{:.3}" font-size="{SMALL}" text-anchor="middle" font-weight="bold">MATCH LINE {}</text>"#,
                fy - 1.5,
                format_station(at, units, units.station_decimals())
            );
        }
    }
    // Findings list and title block at the bottom.
    let block_y = h - MARGIN - BOTTOM_BLOCK + 4.0;
    let title_w = 150.0;
    let title_x = w - MARGIN - title_w;
    let list_w = title_x - MARGIN - 4.0;
    let _ = write!(
        svg,
        r##"<rect x="{MARGIN}" y="{block_y}" width="{list_w}" height="{:.3}" fill="none" stroke="#000" stroke-width="0.3"/>"##,
        BOTTOM_BLOCK - 8.0
    );
    let findings: Vec<_> = {
        let mut f: Vec<_> =
            analysis.report.findings.iter().filter(|f| f.severity() != Severity::Info).collect();
        f.sort_by(|a, b| b.severity().cmp(&a.severity()).then(a.station_start.total_cmp(&b.station_start)));
        f
    };
    let fails = findings.iter().filter(|f| f.severity() == Severity::Fail).count();
    let _ = write!(
        svg,
        r#"<text x="{:.3}" y="{:.3}" font-size="{TEXT}" font-weight="bold">Findings: {fails} fail, {} warn</text>"#,
        MARGIN + 2.0,
        block_y + 4.0,
        findings.len() - fails
    );
    let rows = 9;
    let chars = (list_w / (SMALL * 0.5)) as usize;
    for (k, f) in findings.iter().take(rows).enumerate() {
        let mark = if f.severity() == Severity::Fail { "× FAIL" } else { "! warn" };
        let colour = if f.severity() == Severity::Fail { ACCENT } else { "#000" };
        let mut line = format!("{mark}  {}  {}", f.code, f.message);
        if line.chars().count() > chars {
            line = line.chars().take(chars.saturating_sub(1)).collect::<String>() + "…";
        }
        let _ = write!(
            svg,
            r#"<text class="Finding" x="{:.3}" y="{:.3}" font-size="{SMALL}" fill="{colour}">{}</text>"#,
            MARGIN + 2.0,
            block_y + 8.0 + k as f64 * 2.9,
            esc(&line)
        );
    }
    if findings.len() > rows {
        let _ = write!(
            svg,
            r#"<text x="{:.3}" y="{:.3}" font-size="{SMALL}">… and {} more (see findings.csv)</text>"#,
            MARGIN + 2.0,
            block_y + 8.0 + rows as f64 * 2.9,
            findings.len() - rows
        );
    }
    if dropped > 0 {
        let _ = write!(
            svg,
            r#"<text class="DroppedNote" x="{:.3}" y="{:.3}" font-size="{SMALL}" text-anchor="end">{dropped} label(s) left out for lack of room; see the tables</text>"#,
            fx + fw,
            fy - 1.5
        );
    }
    // Title block: a grid of our own.
    let t = &options.title;
    let rows_tb: [(&str, String); 8] = [
        ("Project", t.project.clone()),
        ("Road / section", t.road.clone()),
        ("Designed", t.designer.clone()),
        ("Checked", t.checker.clone()),
        ("Date", t.date.clone()),
        ("Scales", format!("H {}   V {}", layout.scale_text.0, layout.scale_text.1)),
        ("Units", units.to_string()),
        (
            "Sheet",
            format!("{number} of {count}   Rev. {}", if t.revision.is_empty() { "—" } else { &t.revision }),
        ),
    ];
    let tb_h = BOTTOM_BLOCK - 8.0;
    let _ = write!(
        svg,
        r##"<rect x="{title_x:.3}" y="{block_y:.3}" width="{title_w}" height="{tb_h}" fill="none" stroke="#000" stroke-width="0.5"/>"##
    );
    let row_h = tb_h / rows_tb.len() as f64;
    for (k, (name, value)) in rows_tb.iter().enumerate() {
        let y = block_y + k as f64 * row_h;
        if k > 0 {
            let _ = write!(
                svg,
                r##"<line x1="{title_x:.3}" y1="{y:.3}" x2="{:.3}" y2="{y:.3}" stroke="#000" stroke-width="0.15"/>"##,
                title_x + title_w
            );
        }
        let _ = write!(
            svg,
            r##"<text x="{:.3}" y="{:.3}" font-size="{SMALL}" fill="#555">{name}</text>"##,
            title_x + 1.5,
            y + row_h * 0.7
        );
        let _ = write!(
            svg,
            r#"<text class="TitleField" x="{:.3}" y="{:.3}" font-size="{TEXT}">{}</text>"#,
            title_x + 30.0,
            y + row_h * 0.72,
            esc(value)
        );
    }
    let _ = write!(
        svg,
        r##"<line x1="{:.3}" y1="{block_y:.3}" x2="{:.3}" y2="{:.3}" stroke="#000" stroke-width="0.15"/>"##,
        title_x + 28.5,
        title_x + 28.5,
        block_y + tb_h
    );
    let _ = write!(
        svg,
        r##"<text x="{:.3}" y="{:.3}" font-size="{SMALL}" fill="#555" text-anchor="end">Gradewright vertical profile</text>"##,
        title_x + title_w,
        block_y - 1.0
    );
    // The cautions, on every sheet.
    let _ = write!(
        svg,
        r#"<text class="Caution" x="{:.3}" y="{:.3}" font-size="{TEXT}" font-weight="bold">CAUTION: {}</text>"#,
        MARGIN,
        h - MARGIN - 1.0,
        esc(CAUTION)
    );
    svg.push_str("</svg>\n");
    svg
}
