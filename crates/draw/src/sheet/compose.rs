//! One sheet laid out into its tree: the paper, the grid, the profile (the
//! scene's hatching, lines and markers), the labels placed apart, and the
//! blocks under and beside it ([`super::blocks`]).

use gradewright_geometry::tolerance::{run_end, station_hair};
use gradewright_geometry::{Analysis, Stationing};

use super::tree::{Element, Part, PartKind, SheetTree, mm};
use super::{ACCENT, LABEL_SPACING, Layout, MARGIN, SMALL, SheetOptions, TEXT, grid_step};
use crate::place::{Rect, place_labels};
use crate::scene::{Detail, Label, Role, Scene, Shape, Side, profile_scene};

/// Where one sheet maps the profile onto paper: its station range, the
/// frame, the scales and the elevation at the frame's bottom.
#[derive(Clone, Copy, Debug)]
pub(super) struct Page {
    /// The stations it shows.
    pub range: (f64, f64),
    /// Its number (1-based) and the number of sheets.
    pub number: (usize, usize),
    /// The profile frame: left, top, width, height, mm.
    pub frame: (f64, f64, f64, f64),
    /// Stations and elevation units per mm.
    pub units_per_mm: (f64, f64),
    /// The elevation at the frame's bottom edge.
    pub bottom: f64,
    /// The interval of the station grid's labelled lines.
    pub major: f64,
}

impl Page {
    /// Paper x of station `s`.
    pub fn x(&self, s: f64) -> f64 {
        self.frame.0 + (s - self.range.0) / self.units_per_mm.0
    }

    /// Paper y of elevation `e`.
    pub fn y(&self, e: f64) -> f64 {
        self.frame.1 + self.frame.3 - (e - self.bottom) / self.units_per_mm.1
    }

    /// The major stations of the range, in order: even plan stations,
    /// restarting ahead of each station equation of `at` (internal
    /// stations).
    pub fn major_stations(&self, at: Stationing<'_>) -> Vec<f64> {
        if !at.is_plain() {
            return at.even(self.range.0, self.range.1, self.major);
        }
        let mut out = Vec::new();
        let mut s = (self.range.0 / self.major).ceil() * self.major;
        while s <= run_end(self.range.1, self.major) {
            out.push(s);
            s += self.major;
        }
        out
    }
}

/// Sheet `number` (1-based) of `layout` laid out into its tree.
pub(super) fn sheet(
    analysis: &Analysis,
    options: &SheetOptions,
    layout: &Layout,
    number: usize,
) -> SheetTree {
    let count = layout.pages.len();
    let range = layout.pages.get(number - 1).copied().unwrap_or_default();
    let page = Page {
        range,
        number: (number, count),
        frame: layout.frame,
        units_per_mm: (layout.h_units_per_mm, layout.v_units_per_mm),
        bottom: layout.bottoms.get(number - 1).copied().unwrap_or(0.0),
        major: grid_step(layout.h_units_per_mm, 25.0),
    };
    let (w, h) = (options.size.width_mm, options.size.height_mm);
    // The scene: lines first, then markers, then labels placed apart.
    // Half-millimetre columns; a hatch stroke every 2.5 mm.
    let (_, _, fw, _) = page.frame;
    #[allow(clippy::cast_possible_truncation, clippy::cast_sign_loss)]
    let detail = Detail {
        tolerance: 0.05 * page.units_per_mm.1,
        columns: (fw * 2.0).max(1.0) as usize,
        hatch_every: 5.0,
    };
    let scene = profile_scene(analysis, range, detail);
    let (labels, dropped) = labels(analysis, &scene, &page);
    let part = |kind, elements| Part { kind, elements };
    let mut parts = vec![
        part(PartKind::Paper, paper(w, h, &page)),
        part(PartKind::Grid, grid(analysis, layout, &page)),
        part(PartKind::Profile, vec![profile(&scene, &page)]),
        part(PartKind::Profile, equation_marks(&scene, &page)),
        part(PartKind::Labels, labels),
    ];
    let bands = super::blocks::bands(analysis, &page);
    let rows = bands.1;
    parts.push(part(PartKind::Bands, bands.0));
    if options.sight_band {
        parts.push(part(PartKind::SightBand, super::blocks::sight_band(analysis, &page, rows)));
    }
    parts.push(part(PartKind::MatchLines, super::blocks::match_lines(analysis, &page)));
    parts.push(part(PartKind::Findings, super::blocks::findings(analysis, (w, h), &page, dropped)));
    parts.push(part(
        PartKind::TitleBlock,
        super::blocks::title_block(analysis, options, layout, (w, h), page.number),
    ));
    parts.push(part(PartKind::Caution, vec![super::blocks::caution(h)]));
    SheetTree { width: w, height: h, parts }
}

/// The paper, its border, and the clip of the profile frame.
fn paper(w: f64, h: f64, page: &Page) -> Vec<Element> {
    let (fx, fy, fw, fh) = page.frame;
    vec![
        Element::new("rect").a("x", 0).a("y", 0).a("width", w).a("height", h).a("fill", "white"),
        Element::new("rect")
            .a("x", MARGIN / 2.0)
            .a("y", MARGIN / 2.0)
            .a("width", w - MARGIN)
            .a("height", h - MARGIN)
            .a("fill", "none")
            .a("stroke", "#000")
            .a("stroke-width", 0.5),
        Element::new("defs").holding(vec![
            Element::new("clipPath")
                .a("id", "frame")
                .holding(vec![Element::new("rect").a("x", fx).a("y", fy).a("width", fw).a("height", fh)]),
        ]),
    ]
}

/// The grid (stations major and minor, elevations), the frame and the axis
/// labels both sides.
fn grid(analysis: &Analysis, layout: &Layout, page: &Page) -> Vec<Element> {
    let units = analysis.profile.units;
    let (fx, fy, fw, fh) = page.frame;
    let (range, major) = (page.range, page.major);
    let minor = major / 5.0;
    let v_step = layout.elevation_step();
    let top = page.bottom + fh * page.units_per_mm.1;
    let at = analysis.profile.stationing();
    let mut lines = Vec::new();
    let mut line = |s: f64| {
        // Major where the plan station is a multiple of the major interval.
        let plan = at.plan(s).value;
        let is_major = ((plan / major).round() * major - plan).abs() < station_hair(major);
        let (colour, width) = if is_major { ("#888", 0.18) } else { ("#ccc", 0.06) };
        let x = mm(page.x(s));
        lines.push(
            Element::new("line")
                .a("x1", &x)
                .a("y1", mm(fy))
                .a("x2", &x)
                .a("y2", mm(fy + fh))
                .a("stroke", colour)
                .a("stroke-width", width),
        );
    };
    if at.is_plain() {
        let mut s = (range.0 / minor).ceil() * minor;
        while s <= run_end(range.1, minor) {
            line(s);
            s += minor;
        }
    } else {
        at.even(range.0, range.1, minor).into_iter().for_each(&mut line);
    }
    let elevations = || {
        let mut out = Vec::new();
        let mut e = page.bottom;
        while e <= run_end(top, v_step) {
            out.push(e);
            e += v_step;
        }
        out
    };
    for e in elevations() {
        let y = mm(page.y(e));
        lines.push(
            Element::new("line")
                .a("x1", mm(fx))
                .a("y1", &y)
                .a("x2", mm(fx + fw))
                .a("y2", &y)
                .a("stroke", "#bbb")
                .a("stroke-width", 0.1),
        );
    }
    let mut out = vec![
        Element::new("g").a("stroke", "#000").a("stroke-width", 0.08).a("fill", "none").holding(lines),
        Element::new("rect")
            .a("x", fx)
            .a("y", fy)
            .a("width", fw)
            .a("height", fh)
            .a("fill", "none")
            .a("stroke", "#000")
            .a("stroke-width", 0.35),
    ];
    let decimals = if v_step < 1.0 { 1 } else { 0 };
    for e in elevations() {
        let y = mm(page.y(e) + 0.8);
        for (x, anchor) in [(fx - 1.5, "end"), (fx + fw + 1.5, "start")] {
            out.push(
                Element::text(format!("{e:.decimals$}"))
                    .a("x", mm(x))
                    .a("y", &y)
                    .a("font-size", SMALL)
                    .a("text-anchor", anchor),
            );
        }
    }
    for s in page.major_stations(at) {
        out.push(
            Element::text(at.label(s, 0))
                .a("x", mm(page.x(s)))
                .a("y", mm(fy + fh + 4.0))
                .a("font-size", TEXT)
                .a("text-anchor", "middle"),
        );
    }
    let (ax, ay) = (mm(fx - 13.0), mm(fy + fh / 2.0));
    out.push(
        Element::text(format!("Elevation ({})", units.length_symbol()))
            .a("x", &ax)
            .a("y", &ay)
            .a("font-size", SMALL)
            .a("text-anchor", "middle")
            .a("transform", format!("rotate(-90 {ax} {ay})")),
    );
    out
}

/// A polyline as path data on paper.
fn path_data(points: &[[f64; 2]], page: &Page) -> String {
    let mut d = String::new();
    for (k, p) in points.iter().enumerate() {
        d.push_str(&format!("{}{},{} ", if k == 0 { "M" } else { "L" }, mm(page.x(p[0])), mm(page.y(p[1]))));
    }
    d
}

/// How each line role is printed: black and greys, one accent colour for
/// failures (which also carry × and text).
fn line_style(role: Role) -> Vec<(&'static str, &'static str)> {
    match role {
        Role::GradeLine => vec![("stroke", "#666"), ("stroke-width", "0.2"), ("stroke-dasharray", "2 1.2")],
        Role::Profile => vec![("stroke", "#000"), ("stroke-width", "0.5")],
        Role::FailingCurve => {
            vec![("stroke", ACCENT), ("stroke-width", "0.9"), ("stroke-dasharray", "1.6 0.8")]
        }
        Role::Shortfall => vec![("stroke", ACCENT), ("stroke-opacity", "0.35"), ("stroke-width", "2.2")],
        Role::Ground => vec![("stroke", "#555"), ("stroke-width", "0.25")],
        Role::InvalidCurve => vec![("stroke", ACCENT), ("stroke-width", "0.5")],
        _ => vec![("stroke", "#000"), ("stroke-width", "0.2")],
    }
}

/// The profile, clipped to the frame: cut hatched with solid strokes and
/// fill with dotted ones (told apart without colour), the lines, the
/// markers.
fn profile(scene: &Scene, page: &Page) -> Element {
    let mut out = Vec::new();
    for (role, style) in [
        (Role::Cut, vec![("stroke", "#888"), ("stroke-width", "0.15")]),
        (
            Role::Fill,
            vec![
                ("stroke", "#666"),
                ("stroke-width", "0.3"),
                ("stroke-dasharray", "0.01 0.7"),
                ("stroke-linecap", "round"),
            ],
        ),
    ] {
        let mut d = String::new();
        for hatch in scene.hatches.iter().filter(|h| h.role == role) {
            let x = mm(page.x(hatch.station));
            d.push_str(&format!("M{x},{} L{x},{} ", mm(page.y(hatch.profile)), mm(page.y(hatch.ground))));
        }
        if !d.is_empty() {
            let mut e = Element::new("path").a("class", format!("{role:?}")).a("d", d);
            for (name, value) in style {
                e = e.a(name, value);
            }
            out.push(e);
        }
    }
    for line in &scene.lines {
        let mut e =
            Element::new("path").a("class", format!("{:?}", line.role)).a("d", path_data(&line.points, page));
        for (name, value) in line_style(line.role) {
            e = e.a(name, value);
        }
        out.push(e);
    }
    for m in &scene.markers {
        out.push(marker(m.role, m.shape, page.x(m.at[0]), page.y(m.at[1])));
    }
    // Station equations: a dashed line across the frame (marked above it,
    // [`equation_marks`]).
    let (_, fy, _, fh) = page.frame;
    for (s, _) in &scene.equations {
        let x = page.x(*s);
        out.push(
            Element::new("line")
                .a("class", "Equation")
                .a("x1", mm(x))
                .a("y1", mm(fy))
                .a("x2", mm(x))
                .a("y2", mm(fy + fh))
                .a("stroke", "#000")
                .a("stroke-width", 0.3)
                .a("stroke-dasharray", "3 1.5"),
        );
    }
    Element::new("g")
        .a("clip-path", "url(#frame)")
        .a("fill", "none")
        .a("stroke-linejoin", "round")
        .holding(out)
}

/// Each station equation's mark, "back = ahead", above the frame over its
/// line (outside the profile, so it never covers the design), and each
/// change of the design speed: a dotted line across the frame and the
/// speed ahead of it along its foot.
fn equation_marks(scene: &Scene, page: &Page) -> Vec<Element> {
    let (_, fy, _, fh) = page.frame;
    let mut out: Vec<Element> = scene
        .equations
        .iter()
        .map(|(s, text)| {
            Element::text(format!("Station equation {text}"))
                .a("x", mm(page.x(*s)))
                .a("y", mm(fy - 1.5))
                .a("font-size", SMALL)
                .a("text-anchor", "middle")
                .a("font-weight", "bold")
        })
        .collect();
    for (s, text) in &scene.speed_changes {
        let x = page.x(*s);
        out.push(
            Element::new("line")
                .a("class", "CriteriaRange")
                .a("x1", mm(x))
                .a("y1", mm(fy))
                .a("x2", mm(x))
                .a("y2", mm(fy + fh))
                .a("stroke", "#000")
                .a("stroke-width", 0.25)
                .a("stroke-dasharray", "0.6 0.9"),
        );
        out.push(
            Element::text(text.clone())
                .a("x", mm(x + 1.0))
                .a("y", mm(fy + fh - 2.0))
                .a("font-size", SMALL)
                .a("font-weight", "bold"),
        );
    }
    out
}

/// A marker of `shape` at paper (`x`, `y`): every role has its own shape, so
/// nothing relies on colour.
fn marker(role: Role, shape: Shape, x: f64, y: f64) -> Element {
    let p = |a: f64, b: f64| format!("{},{}", mm(a), mm(b));
    match shape {
        Shape::Circle => Element::new("circle")
            .a("cx", mm(x))
            .a("cy", mm(y))
            .a("r", 0.9)
            .a("fill", "white")
            .a("stroke", "#000")
            .a("stroke-width", 0.3),
        Shape::Tick => Element::new("line")
            .a("x1", mm(x))
            .a("y1", mm(y - 1.5))
            .a("x2", mm(x))
            .a("y2", mm(y + 1.5))
            .a("stroke", "#000")
            .a("stroke-width", 0.3),
        Shape::Triangle { up } => {
            let d = if up { -1.2 } else { 1.2 };
            Element::new("path")
                .a(
                    "d",
                    format!("M{} L{} L{} Z", p(x - 1.0, y - d * 0.2), p(x + 1.0, y - d * 0.2), p(x, y + d)),
                )
                .a("fill", "#444")
                .a("stroke", "none")
        }
        Shape::Diamond | Shape::Floor | Shape::Ceiling => {
            let colour = if role == Role::MissedControl { ACCENT } else { "#000" };
            let d = match shape {
                Shape::Diamond => {
                    format!("M{} L{} L{} L{} Z", p(x, y - 1.3), p(x + 1.3, y), p(x, y + 1.3), p(x - 1.3, y))
                }
                // A bar at the elevation with a triangle on the side the
                // profile must stay.
                _ => {
                    let side = if shape == Shape::Floor { 1.6 } else { -1.6 };
                    format!(
                        "M{} L{} M{} L{} L{} Z",
                        p(x - 1.6, y),
                        p(x + 1.6, y),
                        p(x, y),
                        p(x - 1.0, y + side),
                        p(x + 1.0, y + side)
                    )
                }
            };
            Element::new("path")
                .a("class", format!("{role:?}"))
                .a("d", d)
                .a("fill", "white")
                .a("stroke", colour)
                .a("stroke-width", 0.35)
        }
        Shape::Cross => Element::new("path")
            .a(
                "d",
                format!(
                    "M{} L{} M{} L{}",
                    p(x - 1.4, y - 1.4),
                    p(x + 1.4, y + 1.4),
                    p(x - 1.4, y + 1.4),
                    p(x + 1.4, y - 1.4)
                ),
            )
            .a("stroke", ACCENT)
            .a("stroke-width", 0.5),
    }
}

/// The labels, most important first: each tries its place, then steps away
/// from the line with a leader, and is dropped only when nothing fits.
/// Also says how many were dropped.
fn labels(analysis: &Analysis, scene: &Scene, page: &Page) -> (Vec<Element>, usize) {
    let (fx, fy, fw, fh) = page.frame;
    let points = analysis
        .alignment
        .as_ref()
        .map(|a| a.flatten(page.range, 0.05 * page.units_per_mm.1))
        .unwrap_or_default();
    let paper: Vec<[f64; 2]> = points.iter().map(|p| [page.x(p[0]), page.y(p[1])]).collect();
    let size_of = |label: &Label| if label.priority >= 3 { SMALL } else { TEXT };
    #[allow(clippy::cast_precision_loss)]
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
        |a| [page.x(a[0]), page.y(a[1])],
        Rect { x0: fx, y0: fy, x1: fx + fw, y1: fy + fh },
        (&[&paper], &[]),
        LABEL_SPACING,
    );
    let mut out = Vec::new();
    for placed in &placement.placed {
        let Some(label) = scene.labels.get(placed.label) else { continue };
        let (rect, [x, y]) = (placed.rect, placed.anchor);
        let size = size_of(label);
        let line_h = size * 1.2;
        let colour = if label.role == Role::FailLabel { ACCENT } else { "#000" };
        if placed.leader {
            let ly = match label.side {
                Side::Above => rect.y1,
                Side::Below => rect.y0,
            };
            out.push(
                Element::new("line")
                    .a("x1", mm(x))
                    .a("y1", mm(y))
                    .a("x2", mm(x))
                    .a("y2", mm(ly))
                    .a("stroke", "#777")
                    .a("stroke-width", 0.12),
            );
        }
        for (k, line) in label.lines.iter().enumerate() {
            let bold = k == 0 && label.priority <= 1;
            #[allow(clippy::cast_precision_loss)]
            let ty = rect.y0 + (k as f64 + 0.85) * line_h;
            out.push(
                Element::text(line.clone())
                    .a("class", format!("{:?}", label.role))
                    .a("x", mm(x))
                    .a("y", mm(ty))
                    .a("font-size", size)
                    .a("text-anchor", "middle")
                    .a("fill", colour)
                    .maybe("font-weight", bold.then_some("bold")),
            );
        }
    }
    (out, placement.dropped)
}
