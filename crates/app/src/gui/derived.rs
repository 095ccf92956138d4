//! Everything the screen shows that follows from the project, computed once
//! per change (never per frame) by the geometry crate.

use std::sync::Arc;

use gradewright_geometry::{
    Alignment, CheckReport, CriteriaError, CurveGeometry, Finding, Profile, ProfileProblem, Project,
    ResolvedCriteria, Segment, Severity, check_profile, interior_curves, structural_findings,
};

/// Largest chord error allowed when a parabola is drawn as a polyline, in the
/// project's length unit (0.5 mm or 0.5 thousandths of a foot).
const DRAW_TOLERANCE: f64 = 0.0005;

/// Derived data for one revision of the project.
#[derive(Clone, Debug)]
pub struct Derived {
    /// Problems that stop the profile being evaluated.
    pub problems: Vec<ProfileProblem>,
    /// The evaluated profile, when it has no problems.
    pub alignment: Option<Arc<Alignment>>,
    /// Every interior curve (also when curves overlap), if stations are usable.
    pub curves: Vec<CurveGeometry>,
    /// The criteria in force, or why there are none.
    pub criteria: Result<ResolvedCriteria, CriteriaError>,
    /// Findings and per-curve requirements.
    pub report: CheckReport,
    /// The profile as a polyline (tangents and finely sampled curves).
    pub line: Vec<[f64; 2]>,
    /// The grade lines through the PVIs.
    pub grade_line: Vec<[f64; 2]>,
}

impl Derived {
    /// Computes everything for `project`.
    pub fn compute(project: &Project) -> Self {
        let profile: Profile = project.profile();
        let problems = profile.problems();
        let alignment = Alignment::new(&profile).ok().map(Arc::new);
        let usable = problems.iter().all(|p| {
            matches!(
                p,
                ProfileProblem::Overlap { .. }
                    | ProfileProblem::CurveExceedsTangent { .. }
                    | ProfileProblem::CurveAtEnd { .. }
            )
        });
        let curves = if usable { interior_curves(&profile.pvis) } else { Vec::new() };
        let criteria = project.criteria.resolve(project.units);
        let report = match &criteria {
            Ok(c) => check_profile(&profile, c),
            Err(e) => {
                let mut findings = structural_findings(&profile);
                findings.push(Finding {
                    severity: Severity::Info,
                    code: "criteria.incomplete",
                    station_start: profile.start().unwrap_or_default(),
                    station_end: profile.end().unwrap_or_default(),
                    pvi: None,
                    message: format!("Design checks are off: {e}"),
                });
                CheckReport { findings, curves: Vec::new() }
            }
        };
        let grade_line = profile.pvis.iter().map(|p| [p.station.0, p.elevation]).collect();
        let line = match &alignment {
            Some(a) => polyline(a.segments()),
            None => Vec::new(),
        };
        Self { problems, alignment, curves, criteria, report, line, grade_line }
    }

    /// A short reason a curve fails, for labels: `K 18.0 < 26` or the first
    /// failing finding's code.
    pub fn fail_summary(&self, index: usize) -> String {
        let Some(check) = self.report.curves.iter().find(|c| c.curve.index == index) else {
            return String::new();
        };
        match (check.curve.k(), check.k_required) {
            (Some(k), Some(min)) if k < min => format!("K {k:.1} < {min:.0}"),
            _ => self
                .findings_at(index)
                .find(|f| f.severity == Severity::Fail)
                .map_or_else(String::new, |f| f.code.to_owned()),
        }
    }

    /// Findings that name PVI `index`.
    pub fn findings_at(&self, index: usize) -> impl Iterator<Item = &Finding> {
        self.report.findings.iter().filter(move |f| f.pvi == Some(index))
    }
}

/// Samples pieces so that no chord strays more than [`DRAW_TOLERANCE`] from
/// the parabola: n = L·√(|y″|/(8·tol)) chords per piece (chord error of a
/// parabola is |y″|·h²/8).
pub fn polyline(segments: &[Segment]) -> Vec<[f64; 2]> {
    let mut points = Vec::new();
    for seg in segments {
        let length = seg.end - seg.start;
        let chords = if seg.rate == 0.0 {
            1.0
        } else {
            (length * (seg.rate.abs() / (8.0 * DRAW_TOLERANCE)).sqrt()).ceil().clamp(2.0, 4000.0)
        };
        #[allow(clippy::cast_possible_truncation, clippy::cast_sign_loss)]
        let n = chords as usize;
        for i in 0..=n {
            if i == 0 && !points.is_empty() {
                continue;
            }
            #[allow(clippy::cast_precision_loss)]
            let s = seg.start + length * i as f64 / n as f64;
            points.push([s, seg.elevation_at(s)]);
        }
    }
    points
}

/// The parabola of one curve on its own (to draw curves of a profile whose
/// curves overlap, and to highlight one curve).
pub fn curve_polyline(curve: &CurveGeometry) -> Vec<[f64; 2]> {
    let segments: Vec<Segment> = curve.segments().into_iter().flatten().collect();
    polyline(&segments)
}
