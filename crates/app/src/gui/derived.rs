//! Everything the screen shows that follows from the project, computed once
//! per change (never per frame) by the geometry crate.

use std::sync::Arc;

use gradewright_geometry::visibility::SightProfile;
use gradewright_geometry::{
    Alignment, CheckReport, CriteriaError, CurveGeometry, Finding, Profile, ProfileProblem, Project,
    ResolvedCriteria, Segment, Severity, check_profile_with_sight, compute_sight, interior_curves,
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
    /// The grade lines through the PVIs.
    pub grade_line: Vec<[f64; 2]>,
    /// Available and required sight distance along the profile.
    pub sight: Option<Arc<SightProfile>>,
    /// The project these were computed from.
    source: Project,
}

impl Derived {
    /// Computes everything for `project` from scratch.
    pub fn compute(project: &Project) -> Self {
        Self::compute_after(project, None)
    }

    /// An empty placeholder (while the real one is being recomputed).
    fn placeholder(project: &Project) -> Self {
        Self {
            problems: Vec::new(),
            alignment: None,
            curves: Vec::new(),
            criteria: Err(CriteriaError::NoDesignSpeed),
            report: CheckReport::default(),
            grade_line: Vec::new(),
            sight: None,
            source: Project::new("", project.units),
        }
    }

    /// Replaces `self` by the data for `project`, reusing what it can.
    pub fn refresh(&mut self, project: &Project) {
        let previous = std::mem::replace(self, Self::placeholder(project));
        *self = Self::compute_after(project, Some(previous));
    }

    /// Computes everything for `project`, reusing the sight distance of
    /// `previous` outside the stretch the change can affect: moving PVIs
    /// i..=j changes the profile between PVI i − 2 and PVI j + 2 (the curves of
    /// the neighbours change with their grades), so only eye stations within
    /// the sight cap of that stretch are recomputed.
    pub fn compute_after(project: &Project, previous: Option<Self>) -> Self {
        let profile: Profile = project.profile();
        let problems = profile.problems();
        let alignment = Alignment::new(&profile).ok().map(Arc::new);
        let usable = problems.iter().all(gradewright_geometry::is_design_problem);
        let curves = if usable { interior_curves(&profile.pvis) } else { Vec::new() };
        let criteria = project.criteria.resolve(project.units);
        let sight = match (&alignment, &criteria) {
            (Some(a), Ok(c)) => sight_after(project, previous, a, c),
            _ => None,
        };
        let mut report = match &criteria {
            Ok(c) => check_profile_with_sight(&profile, c, sight),
            Err(e) => gradewright_geometry::unchecked_report(&profile, e),
        };
        let grade_line = profile.pvis.iter().map(|p| [p.station.0, p.elevation]).collect();
        let sight = report.sight.take().map(Arc::new);
        Self { problems, alignment, curves, criteria, report, grade_line, sight, source: project.clone() }
    }

    /// The sight distance along the profile, when it could be computed.
    pub fn sight(&self) -> Option<&SightProfile> {
        self.sight.as_deref()
    }

    /// A short reason a curve fails, for labels: `K 18.0 < 26` or the first
    /// failing finding's code.
    pub fn fail_summary(&self, index: usize) -> String {
        let Some(check) = self.report.curves.iter().find(|c| c.curve.index == index) else {
            return String::new();
        };
        match (check.curve.k(), check.k_required) {
            (Some(k), Some(min)) if gradewright_geometry::tolerance::below(k, min) => {
                format!("K {k:.1} < {min:.0}")
            }
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
    previous: Option<Derived>,
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
    if !same_frame {
        return full();
    }
    let changed: Vec<usize> = (0..new.pvis.len()).filter(|&i| old.pvis.get(i) != new.pvis.get(i)).collect();
    let (Some(&first), Some(&last)) = (changed.first(), changed.last()) else {
        return prev.sight.map(|s| Arc::try_unwrap(s).unwrap_or_else(|shared| (*shared).clone()));
    };
    // Moving PVIs first..=last changes the road from the start of the curve at
    // PVI first − 1 to the end of the curve at PVI last + 1, in the old and the
    // new profile alike.
    let extent = |pvis: &[gradewright_geometry::Pvi]| {
        let lo = first
            .checked_sub(1)
            .and_then(|i| pvis.get(i))
            .map_or(f64::NEG_INFINITY, |p| p.station.0 - p.curve.length_in());
        let hi = pvis.get(last + 1).map_or(f64::INFINITY, |p| p.station.0 + p.curve.length_out());
        (lo, hi)
    };
    let (a, b) = (extent(&old.pvis), extent(&new.pvis));
    let Some(shared) = prev.sight else { return full() };
    let mut sight = Arc::try_unwrap(shared).unwrap_or_else(|shared| (*shared).clone());
    sight.update_after_change(
        alignment,
        &criteria.sight_setup(),
        criteria.sight_requirement(),
        a.0.min(b.0),
        a.1.max(b.1),
    );
    Some(sight)
}

/// Samples pieces so that no chord strays more than [`DRAW_TOLERANCE`] from
/// the parabola ([`gradewright_geometry::flatten_segments`]).
pub fn polyline(segments: &[Segment]) -> Vec<[f64; 2]> {
    polyline_within(segments, (f64::NEG_INFINITY, f64::INFINITY), DRAW_TOLERANCE)
}

/// The pieces overlapping the stations `x`, to a chord error of at most
/// `tolerance` (the plot asks for half a screen point).
pub fn polyline_within(segments: &[Segment], x: (f64, f64), tolerance: f64) -> Vec<[f64; 2]> {
    gradewright_geometry::flatten_segments(segments, x, tolerance)
}

/// The parabola of one curve on its own (to draw curves of a profile whose
/// curves overlap, and to highlight one curve).
pub fn curve_polyline(curve: &CurveGeometry) -> Vec<[f64; 2]> {
    let segments: Vec<Segment> = curve.segments().into_iter().flatten().collect();
    polyline(&segments)
}
