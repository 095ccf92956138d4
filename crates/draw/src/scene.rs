//! The drawing model: what to draw of a profile, in profile coordinates
//! (station, elevation), each item tagged by its role and never by a colour.
//! The sheet maps roles to print styles; a screen maps them to its theme.

use gradewright_geometry::{Analysis, ControlKind, ControlStatus, CurveKind, Units};

/// What a drawn item is, for the front end to style.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
pub enum Role {
    /// The proposed profile, with its true curves.
    Profile,
    /// A grade line between two PVIs.
    GradeLine,
    /// A curve that fails a check.
    FailingCurve,
    /// A stretch where the sight distance falls short.
    Shortfall,
    /// A PVI.
    Pvi,
    /// A PVC or PVT.
    CurveEnd,
    /// A high or low point.
    HighLow,
    /// A grade label.
    GradeLabel,
    /// A PVI's name, station and elevation.
    PviLabel,
    /// A curve's length and K.
    CurveLabel,
    /// The reason a curve fails.
    FailLabel,
    /// The existing ground line.
    Ground,
    /// A curve of a profile that cannot be evaluated (curves overlap or do
    /// not fit), drawn on its own.
    InvalidCurve,
    /// Cut: the ground above the profile (hatched solid).
    Cut,
    /// Fill: the profile above the ground (hatched dotted).
    Fill,
    /// A control point the profile meets.
    Control,
    /// A control point the profile misses.
    MissedControl,
    /// A control point's name and elevation.
    ControlLabel,
    /// A station equation: a line across the profile and its mark.
    Equation,
    /// A stretch under a criteria range (shaded, its speed labelled).
    CriteriaRange,
}

/// A polyline.
#[derive(Clone, Debug, PartialEq)]
pub struct Polyline {
    /// What it is.
    pub role: Role,
    /// Points (station, elevation).
    pub points: Vec<[f64; 2]>,
}

/// Marker shapes (every role has its own, so nothing relies on colour).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Shape {
    /// A circle.
    Circle,
    /// A short vertical tick.
    Tick,
    /// A triangle pointing up (high point) or down (low point).
    Triangle {
        /// Whether it points up.
        up: bool,
    },
    /// A cross (failure).
    Cross,
    /// A diamond: a fixed elevation to meet.
    Diamond,
    /// A bar with a triangle under it pointing up: stay at or above.
    Floor,
    /// A bar with a triangle over it pointing down: stay at or below.
    Ceiling,
}

impl Shape {
    /// The symbol of a control point of `kind`.
    pub fn of_control(kind: ControlKind) -> Self {
        match kind {
            ControlKind::Fixed => Self::Diamond,
            ControlKind::Minimum => Self::Floor,
            ControlKind::Maximum => Self::Ceiling,
        }
    }
}

/// One stroke of the cut and fill shading: a vertical line from the profile
/// to the ground at one station.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Hatch {
    /// [`Role::Cut`] or [`Role::Fill`].
    pub role: Role,
    /// Station.
    pub station: f64,
    /// Profile elevation.
    pub profile: f64,
    /// Ground elevation.
    pub ground: f64,
}

/// A marker at a point.
#[derive(Clone, Debug, PartialEq)]
pub struct Marker {
    /// What it is.
    pub role: Role,
    /// Where (station, elevation).
    pub at: [f64; 2],
    /// Its shape.
    pub shape: Shape,
}

/// Where a label sits relative to its point.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Side {
    /// Above the point.
    Above,
    /// Below the point.
    Below,
}

/// A text label anchored at a point, with a priority (0 = most important;
/// the least important are dropped first when there is no room).
#[derive(Clone, Debug, PartialEq)]
pub struct Label {
    /// What it is.
    pub role: Role,
    /// The point it belongs to (station, elevation).
    pub at: [f64; 2],
    /// Lines of text, top first.
    pub lines: Vec<String>,
    /// Above or below the point.
    pub side: Side,
    /// 0 is most important.
    pub priority: u8,
}

/// Everything to draw of a profile between two stations.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct Scene {
    /// Lines, in drawing order.
    pub lines: Vec<Polyline>,
    /// Markers.
    pub markers: Vec<Marker>,
    /// Labels.
    pub labels: Vec<Label>,
    /// Cut and fill shading, in station order.
    pub hatches: Vec<Hatch>,
    /// The station equations in the range: where (internal station) and
    /// their mark, "back = ahead" ([`Role::Equation`]), drawn across the
    /// whole height.
    pub equations: Vec<(f64, String)>,
    /// The criteria ranges in the range: from and to (internal stations)
    /// and their words ("60 km/h, criteria range 1"), [`Role::CriteriaRange`].
    pub ranges: Vec<(f64, f64, String)>,
    /// Where the design speed changes in the range: the station and the
    /// speed in force ahead of it ("Design speed 60 km/h ahead").
    pub speed_changes: Vec<(f64, String)>,
}

/// How finely a scene is drawn: the chord error of curves (elevation
/// units) and how many device columns (screen points, or paper units)
/// span the station range, which sets the ground's decimation and the
/// spacing of the cut and fill hatching.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Detail {
    /// Largest chord error of a drawn curve, in elevation units.
    pub tolerance: f64,
    /// Device columns across the range.
    pub columns: usize,
    /// Columns between two hatch strokes.
    pub hatch_every: f64,
}

/// The scene of `analysis` between stations `range`, drawn to `detail`.
pub fn profile_scene(analysis: &Analysis, range: (f64, f64), detail: Detail) -> Scene {
    profile_scene_with(analysis, range, detail, None)
}

/// [`profile_scene`], given the decimated ground line when the caller kept
/// it from a scene of the same ground, range and detail (a drag changes the
/// profile, never the ground).
#[allow(clippy::too_many_lines)]
pub fn profile_scene_with(
    analysis: &Analysis,
    range: (f64, f64),
    detail: Detail,
    ground_line: Option<Vec<[f64; 2]>>,
) -> Scene {
    let tolerance = detail.tolerance;
    let mut scene = Scene::default();
    let keep = level_of_detail(analysis, range, detail);
    let pvis = &analysis.profile.pvis;
    let units: Units = analysis.profile.units;
    let len = units.length_symbol();
    let stationing = analysis.profile.stationing();
    let label = |s: f64| stationing.label_std(s);
    let within = |s: f64| s >= range.0 && s <= range.1;
    scene.equations = stationing.marks().into_iter().filter(|(s, _)| within(*s)).collect();
    if let Ok(criteria) = &analysis.criteria {
        let speed = |c: &gradewright_geometry::ResolvedCriteria| {
            format!("{} {}", gradewright_geometry::trimmed(c.design_speed, 2), units.speed_symbol())
        };
        let start = pvis.first().map_or(f64::NEG_INFINITY, |p| p.station.0);
        let end = pvis.last().map_or(f64::INFINITY, |p| p.station.0);
        for r in &criteria.ranges {
            if r.to >= range.0 && r.from <= range.1 {
                scene.ranges.push((
                    r.from,
                    r.to,
                    format!("{}, criteria range {}", speed(&r.criteria), r.index + 1),
                ));
            }
            for s in [r.from, r.to] {
                let ahead = criteria.at(s).0;
                let behind = criteria.behind(s).0;
                if within(s)
                    && s > start
                    && s < end
                    && ahead.design_speed.to_bits() != behind.design_speed.to_bits()
                    && !scene
                        .speed_changes
                        .iter()
                        .any(|(x, _)| gradewright_geometry::tolerance::same_station(*x, s))
                {
                    scene.speed_changes.push((s, format!("Design speed {} ahead", speed(ahead))));
                }
            }
        }
    }
    if analysis.ground.len() >= 2 {
        // Decimated for drawing only (spikes kept), reaching both edges.
        let points = ground_line.unwrap_or_else(|| analysis.ground.decimated(range, detail.columns));
        scene.lines.push(Polyline { role: Role::Ground, points });
        if let Some(alignment) = analysis.alignment.as_ref() {
            scene.hatches = hatches(alignment, &analysis.ground, range, detail);
        }
    }
    scene.lines.push(Polyline {
        role: Role::GradeLine,
        points: pvis.iter().map(|p| [p.station.0, p.elevation]).collect(),
    });
    // The check of each PVI's curve, by PVI index.
    let mut checks: Vec<Option<&gradewright_geometry::CurveCheck>> = vec![None; pvis.len()];
    for check in &analysis.report.curves {
        if let Some(slot) = checks.get_mut(check.curve.index) {
            *slot = Some(check);
        }
    }
    let fails = |i: usize| checks.get(i).copied().flatten().is_some_and(|c| !c.ok);
    let in_view = |c: &gradewright_geometry::CurveGeometry| c.pvt.0 >= range.0 && c.pvc.0 <= range.1;
    let flatten_curve = |c: &gradewright_geometry::CurveGeometry| {
        let segments: Vec<_> = c.segments().into_iter().flatten().collect();
        gradewright_geometry::flatten_segments(&segments, range, tolerance)
    };
    if let Some(alignment) = analysis.alignment.as_ref() {
        for f in analysis.report.findings.iter().filter(|f| f.code.is_sight_shortfall()) {
            let (a, b) = (f.station_start.0.max(range.0), f.station_end.0.min(range.1));
            if b > a {
                scene
                    .lines
                    .push(Polyline { role: Role::Shortfall, points: alignment.flatten((a, b), tolerance) });
            }
        }
        scene.lines.push(Polyline { role: Role::Profile, points: alignment.flatten(range, tolerance) });
    } else {
        // Curves that overlap or do not fit: each drawn on its own, so the
        // designer sees where they clash.
        for c in analysis.curves.iter().filter(|c| c.length() > 0.0 && in_view(c)) {
            scene.lines.push(Polyline { role: Role::InvalidCurve, points: flatten_curve(c) });
        }
    }
    for c in analysis.curves.iter().filter(|c| c.length() > 0.0 && fails(c.index) && in_view(c)) {
        scene.lines.push(Polyline { role: Role::FailingCurve, points: flatten_curve(c) });
    }
    for c in analysis.curves.iter().filter(|c| c.length() > 0.0) {
        for (name, s, e) in [("PVC", c.pvc.0, c.pvc_elevation), ("PVT", c.pvt.0, c.pvt_elevation)] {
            if !within(s) {
                continue;
            }
            scene.markers.push(Marker { role: Role::CurveEnd, at: [s, e], shape: Shape::Tick });
            if !keep(4) {
                continue;
            }
            scene.labels.push(Label {
                role: Role::CurveLabel,
                at: [s, e],
                lines: vec![format!("{name} {}", label(s))],
                side: Side::Below,
                priority: 4,
            });
        }
    }
    for (i, p) in pvis.iter().enumerate() {
        if !within(p.station.0) {
            continue;
        }
        scene.markers.push(Marker { role: Role::Pvi, at: [p.station.0, p.elevation], shape: Shape::Circle });
        scene.labels.push(Label {
            role: Role::PviLabel,
            at: [p.station.0, p.elevation],
            lines: vec![format!("PVI {}", i + 1), label(p.station.0), format!("EL {:.3}", p.elevation)],
            side: Side::Above,
            priority: 1,
        });
    }
    for c in &analysis.curves {
        if !within(c.pvi.0) || c.kind == CurveKind::None {
            continue;
        }
        let check = checks.get(c.index).copied().flatten();
        let y = c.pvi_elevation + c.offset_at_pvi;
        let mut lines = if !keep(2) {
            Vec::new()
        } else if c.length() > 0.0 {
            vec![if c.ratio_factor() > 1.0 {
                format!("L = {:.2} {len} ({:.2} + {:.2})", c.length(), c.length_in, c.length_out)
            } else {
                format!("L = {:.2} {len}", c.length())
            }]
        } else {
            vec!["no curve".to_owned()]
        };
        if let Some(k) = c.k().filter(|_| keep(2)) {
            lines.push(format!("K = {k:.1}  A = {:.3} %", c.a_percent()));
        }
        if !lines.is_empty() {
            scene.labels.push(Label {
                role: Role::CurveLabel,
                at: [c.pvi.0, y],
                lines,
                side: Side::Below,
                priority: 2,
            });
        }
        if let Some(check) = check.filter(|k| !k.ok) {
            let reason =
                analysis.findings_at(c.index).find(|f| f.fails()).map_or("fails", |f| f.code.as_str());
            let mut text = vec![format!("× FAILS: {reason}")];
            if let (Some(k), Some(min)) = (c.k(), check.k_required)
                && gradewright_geometry::tolerance::below(k, min)
            {
                text.push(format!("K {k:.1} < {min:.0}; needs L ≥ {:.1} {len}", check.length_required));
            }
            scene.markers.push(Marker { role: Role::FailLabel, at: [c.pvi.0, y], shape: Shape::Cross });
            scene.labels.push(Label {
                role: Role::FailLabel,
                at: [c.pvi.0, y],
                lines: text,
                side: Side::Below,
                priority: 0,
            });
        }
        if let Some((s, e)) = c.turning
            && within(s.0)
        {
            let up = c.kind == CurveKind::Crest;
            scene.markers.push(Marker { role: Role::HighLow, at: [s.0, e], shape: Shape::Triangle { up } });
            if !keep(3) {
                continue;
            }
            scene.labels.push(Label {
                role: Role::HighLow,
                at: [s.0, e],
                lines: vec![format!("{} {}", if up { "HP" } else { "LP" }, label(s.0)), format!("EL {e:.3}")],
                side: if up { Side::Above } else { Side::Below },
                priority: 3,
            });
        }
    }
    controls(analysis, &mut scene, within);
    for w in pvis.windows(2) {
        let [a, b] = w else { continue };
        let mid = 0.5 * (a.station.0 + b.station.0);
        let grade = a.grade_to(b) * 100.0;
        if !within(mid) || !grade.is_finite() || !keep(2) {
            continue;
        }
        scene.labels.push(Label {
            role: Role::GradeLabel,
            at: [mid, 0.5 * (a.elevation + b.elevation)],
            lines: vec![format!("{grade:+.3} %")],
            side: Side::Above,
            priority: 2,
        });
    }
    scene
}

/// Device columns per PVI below which labels of a priority are not made
/// at all (they could not be placed legibly): curve and grade labels (2),
/// high and low points (3), PVC and PVT stations (4). PVI labels and
/// failures are always made.
const LABEL_SPACING_COLUMNS: [f64; 5] = [0.0, 0.0, 24.0, 40.0, 56.0];

/// Which label priorities this view has room for, by the PVIs in view per
/// device column.
fn level_of_detail(analysis: &Analysis, range: (f64, f64), detail: Detail) -> impl Fn(u8) -> bool {
    let pvis = &analysis.profile.pvis;
    let first = pvis.partition_point(|p| p.station.0 < range.0);
    let last = pvis.partition_point(|p| p.station.0 <= range.1);
    #[allow(clippy::cast_precision_loss)]
    let spacing = detail.columns as f64 / last.saturating_sub(first).max(1) as f64;
    move |priority: u8| {
        LABEL_SPACING_COLUMNS.get(usize::from(priority)).is_none_or(|&needed| spacing >= needed)
    }
}

/// The cut and fill hatching in `range`: a stroke every
/// `detail.hatch_every` columns, at stations on a fixed grid so the strokes
/// stay put while the view pans.
fn hatches(
    alignment: &gradewright_geometry::Alignment,
    ground: &gradewright_geometry::Ground,
    range: (f64, f64),
    detail: Detail,
) -> Vec<Hatch> {
    let Some((g0, g1)) = ground.range() else { return Vec::new() };
    #[allow(clippy::cast_precision_loss)]
    let spacing = (range.1 - range.0) / detail.columns.max(1) as f64 * detail.hatch_every.max(1.0);
    if !(spacing.is_finite() && spacing > 0.0) {
        return Vec::new();
    }
    let (lo, hi) = (range.0.max(g0).max(alignment.start().0), range.1.min(g1).min(alignment.end().0));
    let mut out = Vec::new();
    let mut s = (lo / spacing).ceil() * spacing;
    // Stations in order: walk the ground and the profile.
    let (mut walk, mut cursor) = (ground.walker(), alignment.cursor());
    while s <= hi && out.len() < 20_000 {
        if let (Some(g), Ok(p)) = (walk.elevation_at(s), cursor.sample(gradewright_geometry::Station(s)))
            && (g - p.elevation).abs() > 0.0
        {
            let role = if g > p.elevation { Role::Cut } else { Role::Fill };
            out.push(Hatch { role, station: s, profile: p.elevation, ground: g });
        }
        s += spacing;
    }
    out
}

/// Control points: their symbol (by kind, not by colour), and a label with
/// the name, the kind and elevation, and by how much a missed one is missed.
fn controls(analysis: &Analysis, scene: &mut Scene, within: impl Fn(f64) -> bool) {
    let len = analysis.profile.units.length_symbol();
    for (i, c) in analysis.controls.iter().enumerate() {
        if !within(c.station) || !c.elevation.is_finite() {
            continue;
        }
        let status = analysis.control_status.get(i).copied();
        let missed = matches!(status, Some(ControlStatus::Missed(..)));
        let at = [c.station, c.elevation];
        let role = if missed { Role::MissedControl } else { Role::Control };
        scene.markers.push(Marker { role, at, shape: Shape::of_control(c.kind) });
        let limit = match c.kind {
            ControlKind::Fixed if c.tolerance > 0.0 => {
                format!("fixed {:.3} ± {:.3}", c.elevation, c.tolerance)
            }
            ControlKind::Fixed => format!("fixed {:.3}", c.elevation),
            ControlKind::Minimum => format!("min {:.3}", c.elevation),
            ControlKind::Maximum if c.clearance > 0.0 => {
                format!("max {:.3} (underside {:.3})", c.elevation, c.elevation + c.clearance)
            }
            ControlKind::Maximum => format!("max {:.3}", c.elevation),
        };
        let mut lines = vec![c.title(i), limit];
        if let Some(ControlStatus::Missed(y, miss)) = status {
            let side = if y < c.elevation { "below" } else { "above" };
            lines.push(format!("× missed: {miss:.3} {len} {side}"));
        }
        scene.labels.push(Label {
            role: if missed { Role::FailLabel } else { Role::ControlLabel },
            at,
            lines,
            side: if c.kind == ControlKind::Maximum { Side::Above } else { Side::Below },
            priority: if missed { 0 } else { 1 },
        });
    }
}
