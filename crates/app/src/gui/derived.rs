//! Everything the screen shows that follows from the project, computed once
//! per change (never per frame) by the geometry crate.

use std::sync::Arc;

use gradewright_geometry::visibility::SightProfile;
use gradewright_geometry::{
    Alignment, CheckReport, CriteriaError, CriterionId, CurveGeometry, Finding, Profile, ProfileProblem,
    Project, ResolvedCriteria, Segment, Severity, check_profile_with_sight, compute_sight, interior_curves,
    structural_findings,
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
    /// The project these were computed from.
    source: Project,
}

impl Derived {
    /// Computes everything for `project` from scratch.
    pub fn compute(project: &Project) -> Self {
        Self::compute_after(project, None)
    }

    /// Computes everything for `project`, reusing the sight distance of
    /// `previous` outside the stretch the change can affect: moving PVIs
    /// i..=j changes the profile between PVI i − 2 and PVI j + 2 (the curves of
    /// the neighbours change with their grades), so only eye stations within
    /// the sight cap of that stretch are recomputed.
    pub fn compute_after(project: &Project, previous: Option<&Self>) -> Self {
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
        let sight = match (&alignment, &criteria) {
            (Some(a), Ok(c)) => sight_after(project, previous, a, c),
            _ => None,
        };
        let report = match &criteria {
            Ok(c) => check_profile_with_sight(&profile, c, sight),
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
                CheckReport { findings, curves: Vec::new(), sight: None }
            }
        };
        let grade_line = profile.pvis.iter().map(|p| [p.station.0, p.elevation]).collect();
        let line = match &alignment {
            Some(a) => polyline(a.segments()),
            None => Vec::new(),
        };
        Self { problems, alignment, curves, criteria, report, line, grade_line, source: project.clone() }
    }

    /// The sight distance along the profile, when it could be computed.
    pub fn sight(&self) -> Option<&SightProfile> {
        self.report.sight.as_ref()
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

fn sight_after(
    project: &Project,
    previous: Option<&Derived>,
    alignment: &Alignment,
    criteria: &ResolvedCriteria,
) -> Option<SightProfile> {
    let full = || compute_sight(alignment, criteria);
    let Some(prev) = previous else { return full() };
    let (old, new) = (&prev.source, project);
    let same_frame = old.units == new.units
        && old.criteria == new.criteria
        && old.pvis.len() == new.pvis.len()
        && old.pvis.first().map(|p| p.station) == new.pvis.first().map(|p| p.station)
        && old.pvis.last().map(|p| p.station) == new.pvis.last().map(|p| p.station);
    let Some(mut sight) = prev.report.sight.clone().filter(|_| same_frame) else { return full() };
    let changed: Vec<usize> = (0..new.pvis.len()).filter(|&i| old.pvis.get(i) != new.pvis.get(i)).collect();
    let (Some(&first), Some(&last)) = (changed.first(), changed.last()) else { return Some(sight) };
    let station = |i: usize| new.pvis.get(i.min(new.pvis.len() - 1)).map_or(0.0, |p| p.station.0);
    let old_station = |i: usize| old.pvis.get(i.min(old.pvis.len() - 1)).map_or(0.0, |p| p.station.0);
    let cap = criteria.get(CriterionId::SightCap);
    let lo = station(first.saturating_sub(2)).min(old_station(first.saturating_sub(2))) - cap;
    let hi = station(last + 2).max(old_station(last + 2)) + cap;
    sight.update_range(alignment, &criteria.sight_setup(), criteria.sight_requirement(), lo, hi);
    Some(sight)
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
