//! The drawing model: what to draw of a profile, in profile coordinates
//! (station, elevation), each item tagged by its role and never by a colour.
//! The sheet maps roles to print styles; a screen maps them to its theme.

use gradewright_geometry::{Analysis, CurveKind, Units, format_station};

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
}

/// The scene of `analysis` between stations `range`, its curves flattened to
/// `tolerance` (elevation units).
#[allow(clippy::too_many_lines)]
pub fn profile_scene(analysis: &Analysis, range: (f64, f64), tolerance: f64) -> Scene {
    let mut scene = Scene::default();
    let pvis = &analysis.profile.pvis;
    let units: Units = analysis.profile.units;
    let len = units.length_symbol();
    let label = |s: f64| format_station(s, units, units.station_decimals());
    let within = |s: f64| s >= range.0 && s <= range.1;
    if analysis.ground.len() >= 2 {
        // The ground in range and one point beyond each end, so it reaches the edges.
        let g = &analysis.ground;
        let first = g.partition_point(|p| p.station < range.0).saturating_sub(1);
        let last = (g.partition_point(|p| p.station <= range.1) + 1).min(g.len());
        scene.lines.push(Polyline {
            role: Role::Ground,
            points: g.get(first..last).unwrap_or(&[]).iter().map(|p| [p.station, p.elevation]).collect(),
        });
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
        for f in analysis.report.findings.iter().filter(|f| f.code.starts_with("sight.")) {
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
        let mut lines = vec![if c.length() > 0.0 {
            if c.ratio_factor() > 1.0 {
                format!("L = {:.2} {len} ({:.2} + {:.2})", c.length(), c.length_in, c.length_out)
            } else {
                format!("L = {:.2} {len}", c.length())
            }
        } else {
            "no curve".to_owned()
        }];
        if let Some(k) = c.k() {
            lines.push(format!("K = {k:.1}  A = {:.3} %", c.a_percent()));
        }
        scene.labels.push(Label {
            role: Role::CurveLabel,
            at: [c.pvi.0, y],
            lines,
            side: Side::Below,
            priority: 2,
        });
        if let Some(check) = check.filter(|k| !k.ok) {
            let reason = analysis
                .findings_at(c.index)
                .find(|f| f.severity == gradewright_geometry::Severity::Fail)
                .map_or("fails", |f| f.code);
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
            scene.labels.push(Label {
                role: Role::HighLow,
                at: [s.0, e],
                lines: vec![format!("{} {}", if up { "HP" } else { "LP" }, label(s.0)), format!("EL {e:.3}")],
                side: if up { Side::Above } else { Side::Below },
                priority: 3,
            });
        }
    }
    for w in pvis.windows(2) {
        let [a, b] = w else { continue };
        let mid = 0.5 * (a.station.0 + b.station.0);
        let grade = (b.elevation - a.elevation) / (b.station - a.station) * 100.0;
        if !within(mid) || !grade.is_finite() {
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
