//! One analysis of a project, built once and used by every front end: the
//! command line, the editor and the sheet.

use std::sync::Arc;

use std::collections::HashMap;

use crate::visibility::{Shortfall, SightProfile};
use crate::{
    Alignment, CheckReport, ControlPoint, ControlStatus, CriteriaError, CurveCheck, CurveGeometry,
    CutFillSummary, Design, Earthwork, EarthworkError, Finding, FindingCode, Ground, Profile, ProfileProblem,
    Pvi, ResolvedCriteria, Severity, check_controls, compute_sight, control_findings, interior_curves,
    structural_findings,
};

/// Everything computed from a project: the validated alignment (when the
/// profile has no problems), every curve (also when curves overlap), the
/// criteria in force (or why there are none), the findings and per-curve
/// figures, and the sight distance along the profile.
#[derive(Clone, Debug)]
pub struct Analysis {
    /// The profile analysed.
    pub profile: Profile,
    /// The existing ground line, in station order (empty when there is
    /// none); shared with the project, never copied.
    pub ground: Ground,
    /// The control points.
    pub controls: Vec<ControlPoint>,
    /// How the profile meets each control point (empty when the profile
    /// cannot be evaluated).
    pub control_status: Vec<ControlStatus>,
    /// The largest cut and fill, when there is ground.
    pub cut_fill: CutFillSummary,
    /// The earthwork estimate, when the project sets a section and has
    /// ground (or why there is none).
    pub earthwork: Option<Result<Earthwork, EarthworkError>>,
    /// Problems that stop the profile being evaluated.
    pub problems: Vec<ProfileProblem>,
    /// The evaluated profile, when it has no problems.
    pub alignment: Option<Arc<Alignment>>,
    /// Every interior curve, when the stations are usable.
    pub curves: Vec<CurveGeometry>,
    /// The criteria in force, or why there are none.
    pub criteria: Result<ResolvedCriteria, CriteriaError>,
    /// Findings and per-curve requirements (its `sight` is always `None`:
    /// the sight distance is [`Analysis::sight`], shared).
    pub report: CheckReport,
    /// Available and required sight distance along the profile, when the
    /// profile and the criteria allow it.
    pub sight: Option<Arc<SightProfile>>,
    /// The design analysed (kept to tell what a later edit changed).
    source: Option<Design>,
    /// The scan of the profile over the ground (kept for the next edit).
    site: Option<Arc<crate::ground::SiteScan>>,
    /// What looks wrong in the survey, and the ground it was read from
    /// (kept while the ground is the same).
    ground_review: Option<(Ground, Arc<Vec<crate::GroundWarning>>)>,
    /// The indices of the findings that name each PVI.
    by_pvi: Vec<Vec<usize>>,
    /// Each sight shortfall with the finding made of it (for the next edit).
    sight_notes: Arc<Vec<(Shortfall, Finding)>>,
    /// Each curve's check and the findings its own check made (for the next
    /// edit).
    curve_notes: Arc<Vec<(CurveCheck, Vec<Finding>)>>,
}

impl Default for Analysis {
    /// The analysis of nothing: no profile, no criteria, no site.
    fn default() -> Self {
        Self {
            profile: Profile::default(),
            ground: Ground::default(),
            controls: Vec::new(),
            control_status: Vec::new(),
            cut_fill: CutFillSummary::default(),
            earthwork: None,
            problems: Vec::new(),
            alignment: None,
            curves: Vec::new(),
            criteria: Err(CriteriaError::NoDesignSpeed),
            report: CheckReport::default(),
            sight: None,
            source: None,
            site: None,
            ground_review: None,
            by_pvi: Vec::new(),
            sight_notes: Arc::default(),
            curve_notes: Arc::default(),
        }
    }
}

/// Whether a problem still lets every curve be computed (curves that
/// overlap or do not fit are design failures, not unusable input).
pub fn is_design_problem(problem: &ProfileProblem) -> bool {
    matches!(
        problem,
        ProfileProblem::Overlap { .. }
            | ProfileProblem::CurveExceedsTangent { .. }
            | ProfileProblem::CurveAtEnd { .. }
    )
}

/// The report of a profile whose criteria are not usable: its structural
/// problems, and a note saying the design checks are off and why.
pub fn unchecked_report(profile: &Profile, why: &CriteriaError) -> CheckReport {
    let mut findings = structural_findings(profile);
    findings.push(Finding::new(
        FindingCode::CriteriaIncomplete,
        (profile.start().unwrap_or_default(), profile.end().unwrap_or_default()),
        None,
        format!("Design checks are off: {why}"),
    ));
    CheckReport { findings, curves: Vec::new(), sight: None }
}

impl Analysis {
    /// Analyses `design` with its own criteria.
    pub fn of(design: &Design) -> Self {
        Self::after(design, None)
    }

    /// Analyses `design`, reusing the sight distance of `previous` (the
    /// analysis of the design before an edit) outside the stretch the edit
    /// can affect. The result equals [`Analysis::of`] (see the tests).
    pub fn after(design: &Design, previous: Option<Self>) -> Self {
        Self::after_keeping(design, previous, true)
    }

    /// Analyses `design` once, for a front end that will not edit it (the
    /// command line): the same analysis as [`Analysis::of`], without what
    /// is kept to speed up the next edit (the findings are not copied; a
    /// long failing profile needs a third of the memory). A later
    /// [`Analysis::refresh`] is correct, only not faster.
    pub fn once(design: &Design) -> Self {
        Self::after_keeping(design, None, false)
    }

    fn after_keeping(design: &Design, mut previous: Option<Self>, keep: bool) -> Self {
        let profile = design.profile();
        let criteria = design.criteria_in_force();
        let alignment = Alignment::new(&profile).ok().map(Arc::new);
        let previous_site = previous.as_ref().and_then(|p| p.site.clone());
        let previous_earthwork = previous.as_mut().and_then(|p| p.earthwork.take());
        let previous_review = previous.as_ref().and_then(|p| p.ground_review.clone());
        let notes = previous.as_ref().map(|p| p.sight_notes.clone());
        // Curve checks depend on the curve's geometry and the criteria only.
        let curve_notes = previous
            .as_ref()
            .filter(|p| p.criteria.as_ref().ok() == criteria.as_ref().ok() && p.criteria.is_ok())
            // Their words name plan stations: new equations, new words.
            .filter(|p| p.source.as_ref().is_some_and(|s| s.equations == design.equations))
            .map(|p| p.curve_notes.clone());
        // On a long profile checked afresh, the curves are checked on a core
        // of their own while the sight distance is computed (the same checks,
        // handed to the report as reused ones).
        let fresh = curve_notes.is_none() && profile.pvis.len() >= PARALLEL_CURVES;
        let (sight, changed, checked) = std::thread::scope(|scope| {
            let job = match &criteria {
                Ok(c) if fresh => Some(scope.spawn(|| check_curves(&profile, c))),
                _ => None,
            };
            let (sight, changed) = match (&alignment, &criteria) {
                (Some(a), Ok(c)) => sight_after(design, previous.take(), a, c),
                _ => (None, None),
            };
            (sight, changed, job.and_then(|j| j.join().ok()))
        });
        let curve_notes = curve_notes.or_else(|| checked.map(Arc::new));
        // A shortfall whose sight lines stay clear of the changed stretch
        // gets the finding it had: the road it sees is the same.
        let reuse = match (changed, notes.as_deref(), &criteria) {
            (Some((lo, hi)), Some(notes), Ok(c)) if !notes.is_empty() => {
                let reach =
                    c.get(crate::CriterionId::SightCap).max(c.get(crate::CriterionId::StoppingSightDistance));
                let index: HashMap<[u64; 6], &Finding> =
                    notes.iter().map(|(s, f)| (shortfall_key(s), f)).collect();
                let clear = move |s: &Shortfall| s.end + 2.0 * reach < lo || s.start - 2.0 * reach > hi;
                Some((index, clear))
            }
            _ => None,
        };
        let lookup = reuse.as_ref().map(|(index, clear)| {
            move |s: &Shortfall| {
                if clear(s) { index.get(&shortfall_key(s)).map(|f| (*f).clone()) } else { None }
            }
        });
        let sight_fn: Option<crate::checks::SightReuse<'_>> =
            lookup.as_ref().map(|f| f as crate::checks::SightReuse<'_>);
        let curve_lookup = curve_notes.as_deref().map(|notes| {
            move |c: &CurveGeometry| {
                let (check, found) = c.index.checked_sub(1).and_then(|k| notes.get(k))?;
                (check.curve == *c).then(|| (check.clone(), found.clone()))
            }
        });
        let curve_fn: Option<crate::checks::CurveReuse<'_>> =
            curve_lookup.as_ref().map(|f| f as crate::checks::CurveReuse<'_>);
        let reuse = crate::checks::Reuse { curve: curve_fn, sight: sight_fn, forget: !keep };
        let mut analysis = Self::assemble_reusing(profile, criteria, alignment, sight, reuse);
        analysis.add_site(design, previous_site.as_deref(), previous_earthwork.as_ref());
        analysis.review_ground(design, previous_review);
        analysis.source = Some(design.clone());
        analysis
    }

    /// Replaces `self` by the analysis of `design` (the same design after
    /// an edit), reusing what the edit cannot have changed.
    pub fn refresh(&mut self, design: &Design) {
        let previous = std::mem::take(self);
        *self = Self::after(design, Some(previous));
    }

    /// Analyses `profile` against `criteria` (or reports why there are none).
    pub fn with_criteria(profile: Profile, criteria: Result<ResolvedCriteria, CriteriaError>) -> Self {
        let alignment = Alignment::new(&profile).ok().map(Arc::new);
        let sight = match (&alignment, &criteria) {
            (Some(a), Ok(c)) => compute_sight(a, c),
            _ => None,
        };
        Self::assemble(profile, criteria, alignment, sight)
    }

    fn assemble(
        profile: Profile,
        criteria: Result<ResolvedCriteria, CriteriaError>,
        alignment: Option<Arc<Alignment>>,
        sight: Option<SightProfile>,
    ) -> Self {
        Self::assemble_reusing(profile, criteria, alignment, sight, crate::checks::Reuse::default())
    }

    fn assemble_reusing(
        profile: Profile,
        criteria: Result<ResolvedCriteria, CriteriaError>,
        alignment: Option<Arc<Alignment>>,
        sight: Option<SightProfile>,
        reuse: crate::checks::Reuse<'_>,
    ) -> Self {
        let problems = profile.problems();
        let usable = problems.iter().all(is_design_problem);
        let curves = if usable { interior_curves(&profile.pvis) } else { Vec::new() };
        let reuse_forget = reuse.forget;
        let (mut report, made) = match &criteria {
            Ok(c) => crate::checks::check_profile_reusing(&profile, c, sight, reuse),
            Err(e) => (unchecked_report(&profile, e), crate::checks::Made::default()),
        };
        let spans = made.curves;
        // The checks' curves are one per interior PVI, in order (index k + 1).
        let curve_notes = Arc::new(if !reuse_forget && spans.len() == report.curves.len() {
            report
                .curves
                .iter()
                .zip(&spans)
                .map(|(c, span)| (c.clone(), report.findings.get(span.clone()).unwrap_or(&[]).to_vec()))
                .collect()
        } else {
            Vec::new()
        });
        let sight = report.sight.take().map(Arc::new);
        let sight_notes = Arc::new(made.shortfalls);
        let mut by_pvi = vec![Vec::new(); profile.pvis.len()];
        for (k, f) in report.findings.iter().enumerate() {
            if let Some(list) = f.pvi.and_then(|i| by_pvi.get_mut(i)) {
                list.push(k);
            }
        }
        Self {
            by_pvi,
            sight_notes,
            curve_notes,
            profile,
            problems,
            alignment,
            curves,
            criteria,
            report,
            sight,
            ..Self::default()
        }
    }

    /// Adds what the design's site gives: the ground (shared), the control
    /// points and their findings, the largest cut and fill, the earthwork.
    fn add_site(
        &mut self,
        design: &Design,
        previous: Option<&crate::ground::SiteScan>,
        previous_earthwork: Option<&Result<Earthwork, EarthworkError>>,
    ) {
        self.ground = design.ground.clone();
        self.controls.clone_from(&design.controls);
        let Some(alignment) = self.alignment.clone() else { return };
        let parts = site_parts(design, &alignment, self.criteria.as_ref().ok(), previous, previous_earthwork);
        self.control_status = parts.control_status;
        self.report.findings.extend(parts.control_findings);
        for (pvi, needed) in parts.needed {
            if let Some(check) = self.report.curves.iter_mut().find(|c| c.curve.index == pvi) {
                check.length_required = check.length_required.max(needed);
            }
        }
        for f in parts.under_findings {
            if let Some(list) = f.pvi.and_then(|i| self.by_pvi.get_mut(i)) {
                list.push(self.report.findings.len());
            }
            if let Some(check) = self.report.curves.iter_mut().find(|c| Some(c.curve.index) == f.pvi) {
                check.ok = false;
            }
            self.report.findings.push(f);
        }
        if let Some(scan) = parts.scan {
            self.cut_fill = scan.summary;
            self.earthwork = parts.earthwork;
            self.site = Some(Arc::new(scan));
        }
    }

    /// Reviews the survey (kept from `previous` while the ground is the
    /// same shared line): a warning finding for each point that looks like
    /// no data or jumps, and each long gap.
    fn review_ground(&mut self, design: &Design, previous: Option<(Ground, Arc<Vec<crate::GroundWarning>>)>) {
        let review = match previous {
            Some((ground, review)) if ground.shares(&self.ground) => review,
            _ => Arc::new(self.ground.review(design.units)),
        };
        self.report.findings.extend(ground_findings(&review, design.equations.stationing(design.units)));
        self.ground_review = Some((self.ground.clone(), review));
    }

    /// Whether any finding is a failure.
    pub fn has_failures(&self) -> bool {
        self.report.has_failures()
    }

    /// The sight distance along the profile, when it could be computed.
    pub fn sight(&self) -> Option<&SightProfile> {
        self.sight.as_deref()
    }

    /// Findings that name PVI `index`.
    pub fn findings_at(&self, index: usize) -> impl Iterator<Item = &Finding> {
        self.by_pvi.get(index).into_iter().flatten().filter_map(|&k| self.report.findings.get(k))
    }

    /// The worst severity of the findings that name PVI `index`.
    pub fn worst_at(&self, index: usize) -> Option<Severity> {
        self.findings_at(index).map(Finding::severity).max()
    }

    /// A short reason a curve fails, for labels: `K 18.0 < 26` or the first
    /// failing finding's code; empty when it does not fail.
    pub fn fail_summary(&self, index: usize) -> String {
        let Some(check) = self.report.curves.iter().find(|c| c.curve.index == index) else {
            return String::new();
        };
        match (check.curve.k(), check.k_required) {
            (Some(k), Some(min)) if crate::tolerance::below(k, min) => format!("K {k:.1} < {min:.0}"),
            _ => self
                .findings_at(index)
                .find(|f| f.fails())
                .map_or_else(String::new, |f| f.code.as_str().to_owned()),
        }
    }
}

/// The sight distance of `design`, recomputed only where an edit since
/// `previous` can have changed it.
/// Interior PVIs from which a fresh analysis checks the curves beside the
/// sight distance, on another core (below it a thread costs more than it saves).
const PARALLEL_CURVES: usize = 2_000;

/// Every interior curve of `profile` checked against `criteria`, with the
/// findings of each (as [`Analysis`] keeps them for reuse).
fn check_curves(profile: &Profile, criteria: &ResolvedCriteria) -> Vec<(crate::CurveCheck, Vec<Finding>)> {
    interior_curves(&profile.pvis)
        .iter()
        .map(|curve| {
            let mut found = Vec::new();
            let check =
                crate::checks::check_curve_in_force(curve, criteria, profile.stationing(), &mut found);
            (check, found)
        })
        .collect()
}

fn sight_after(
    design: &Design,
    previous: Option<Analysis>,
    alignment: &Alignment,
    criteria: &ResolvedCriteria,
) -> (Option<SightProfile>, Option<(f64, f64)>) {
    let full = || (compute_sight(alignment, criteria), None);
    let Some(prev) = previous else { return full() };
    // With criteria ranges the sight distance is computed afresh (their
    // setups differ along the road).
    if criteria.has_ranges() {
        return full();
    }
    let Some(old) = prev.source.as_ref() else { return full() };
    let new = design;
    let same_frame = old.units == new.units
        && old.criteria == new.criteria
        && old.ranges == new.ranges
        && old.equations == new.equations
        && old.pvis.len() == new.pvis.len()
        && old.pvis.first().map(|p| p.station) == new.pvis.first().map(|p| p.station)
        && old.pvis.last().map(|p| p.station) == new.pvis.last().map(|p| p.station);
    if !same_frame {
        return full();
    }
    let changed: Vec<usize> = (0..new.pvis.len()).filter(|&i| old.pvis.get(i) != new.pvis.get(i)).collect();
    let unshare = |s: Arc<SightProfile>| Arc::try_unwrap(s).unwrap_or_else(|shared| (*shared).clone());
    let (Some(&first), Some(&last)) = (changed.first(), changed.last()) else {
        // Nothing on the road changed: every finding stands.
        return match prev.sight {
            Some(s) => (Some(unshare(s)), Some((f64::INFINITY, f64::NEG_INFINITY))),
            None => full(),
        };
    };
    // Moving PVIs first..=last changes the road from the start of the curve at
    // PVI first − 1 to the end of the curve at PVI last + 1, in the old and the
    // new profile alike.
    let extent = |pvis: &[Pvi]| {
        let lo = first.checked_sub(1).and_then(|i| pvis.get(i)).map_or(f64::NEG_INFINITY, Pvi::pvc);
        let hi = pvis.get(last + 1).map_or(f64::INFINITY, Pvi::pvt);
        (lo, hi)
    };
    let (a, b) = (extent(&old.pvis), extent(&new.pvis));
    let Some(shared) = prev.sight else { return full() };
    let mut sight = unshare(shared);
    let (lo, hi) = (a.0.min(b.0), a.1.max(b.1));
    sight.update_after_change(alignment, &criteria.sight_setup(), criteria.sight_requirement(), lo, hi);
    (Some(sight), Some((lo, hi)))
}

/// A shortfall as a key: every field, to the bit.
fn shortfall_key(s: &Shortfall) -> [u64; 6] {
    let direction = match s.direction {
        crate::visibility::Direction::Forward => 0,
        crate::visibility::Direction::Backward => 1,
    };
    [
        direction,
        s.start.to_bits(),
        s.end.to_bits(),
        s.worst.to_bits(),
        s.available.to_bits(),
        s.required.to_bits(),
    ]
}

/// What the site (control points, ground and section) adds to an analysis
/// of a profile without problems.
pub(crate) struct SiteParts {
    /// How the profile meets each control point.
    pub control_status: Vec<ControlStatus>,
    /// The control points' findings.
    pub control_findings: Vec<Finding>,
    /// The length each curve needs to see under a structure: (PVI, length).
    pub needed: Vec<(usize, f64)>,
    /// The findings of sight under structures (each fails its curve).
    pub under_findings: Vec<Finding>,
    /// The scan of the profile over the ground, when there is ground.
    pub scan: Option<crate::ground::SiteScan>,
    /// The earthwork estimate, when there is ground and a section.
    pub earthwork: Option<Result<Earthwork, EarthworkError>>,
}

/// The site's part of the analysis of `design` on `alignment` (reusing
/// what `previous` scanned and estimated).
pub(crate) fn site_parts(
    design: &Design,
    alignment: &Alignment,
    criteria: Option<&ResolvedCriteria>,
    previous: Option<&crate::ground::SiteScan>,
    previous_earthwork: Option<&Result<Earthwork, EarthworkError>>,
) -> SiteParts {
    let control_status = check_controls(alignment, &design.controls);
    let control_findings = control_findings(alignment.stationing(), &design.controls, &control_status);
    let (needed, under_findings) = match criteria {
        // Sight under a structure is a criterion of the curve: its length
        // is part of what the curve needs.
        Some(criteria) => (
            crate::controls::undercrossings(alignment, &design.controls, criteria)
                .into_iter()
                .filter(|u| u.needed.is_finite())
                .map(|u| (u.pvi, u.needed))
                .collect(),
            crate::controls::undercrossing_findings(alignment, &design.controls, criteria),
        ),
        None => (Vec::new(), Vec::new()),
    };
    let (scan, earthwork) = if design.ground.range().is_some() {
        let scan = crate::ground::SiteScan::new(alignment, &design.ground, previous);
        let earthwork = design.section.as_ref().map(|section| {
            let before = previous_earthwork.and_then(|e| e.as_ref().ok());
            crate::Earthwork::after(
                before,
                alignment,
                &design.ground,
                section,
                design.interval(),
                &scan.grade_points,
            )
        });
        (Some(scan), earthwork)
    } else {
        (None, None)
    };
    SiteParts { control_status, control_findings, needed, under_findings, scan, earthwork }
}

/// A warning finding for each point of the survey that looks wrong.
pub(crate) fn ground_findings<'a>(
    review: &'a [crate::GroundWarning],
    at: crate::Stationing<'a>,
) -> impl Iterator<Item = Finding> + 'a {
    review
        .iter()
        .map(move |w| Finding::new(FindingCode::GroundSuspicious, w.stations(), None, w.describe(at)))
}

#[cfg(test)]
mod tests {
    use super::*;

    /// After an edit of the station equations alone, every finding is worded
    /// with the new plan stations (none is reused with the old words).
    #[test]
    fn an_equation_edit_rewords_every_finding() {
        let mut design = Design {
            units: Units::Metric,
            pvis: vec![Pvi::new(0.0, 100.0), Pvi::with_curve(500.0, 120.0, 60.0), Pvi::new(1000.0, 100.0)],
            ..Design::default()
        };
        design.criteria.design_speed = Some(100.0);
        let before = Analysis::of(&design);
        assert!(before.report.findings.iter().any(|f| f.message.contains("0+500.000")));
        design.equations = crate::Equations::new(vec![crate::StationEquation {
            internal: 200.0,
            back: 200.0,
            ahead: 300.0,
        }]);
        let after = Analysis::after(&design, Some(before));
        assert_eq!(after.report.findings, Analysis::of(&design).report.findings);
        assert!(after.report.findings.iter().any(|f| f.message.contains("0+600.000")));
        assert!(!after.report.findings.iter().any(|f| f.message.contains("0+500.000")));
    }
    use crate::{Station, Units};

    /// A profile long enough for its curves to be checked beside the sight
    /// distance, on another core, gives the report the checks give on one
    /// thread, finding for finding; and an edit after it reuses those checks.
    #[test]
    fn curves_checked_beside_the_sight_distance_give_the_same_report() {
        let profile = crate::synthetic::rolling_profile(Units::Metric, PARALLEL_CURVES + 50, 200_000.0);
        let mut project = Design { units: Units::Metric, pvis: profile.pvis.clone(), ..Design::default() };
        project.criteria.design_speed = Some(90.0);
        let criteria = project.criteria.resolve(Units::Metric).unwrap_or_else(|e| panic!("{e}"));
        let analysis = Analysis::of(&project);
        let alone = crate::check_profile(&project.profile(), &criteria);
        assert_eq!(analysis.report.curves, alone.curves);
        assert_eq!(analysis.report.findings, alone.findings);
        assert!(analysis.report.findings.len() > PARALLEL_CURVES, "{}", analysis.report.findings.len());
        let mut moved = project.clone();
        if let Some(p) = moved.pvis.get_mut(700) {
            p.elevation += 0.8;
        }
        let after = Analysis::after(&moved, Some(analysis));
        let fresh = crate::check_profile(&moved.profile(), &criteria);
        assert_eq!(after.report.findings, fresh.findings);
        // Analysed once (nothing kept for an edit), the same report; and an
        // edit after it is still right.
        let once = Analysis::once(&moved);
        assert_eq!(once.report.curves, after.report.curves);
        assert_eq!(once.report.findings, after.report.findings);
        assert_eq!(once.sight(), after.sight());
        let again = Analysis::after(&project, Some(once));
        assert_eq!(again.report.findings, alone.findings);
    }

    /// Dragging one PVI of a long profile whose curves all fall short: the
    /// analysis after each step (sight distance updated in place, the
    /// shortfall findings away from the edit reused, the site scan reused
    /// by blocks) equals a fresh analysis, finding for finding.
    #[test]
    fn an_analysis_after_edits_equals_a_fresh_one() {
        let profile = crate::synthetic::rolling_profile(Units::Metric, 80, 8_000.0);
        let mut project = Design { units: Units::Metric, pvis: profile.pvis, ..Design::default() };
        project.criteria.design_speed = Some(100.0);
        let road = Alignment::new(&project.profile()).expect("valid");
        project.ground = (0..=8_000)
            .map(|i| {
                let s = f64::from(i);
                let y = road.sample(Station(s)).map_or(0.0, |x| x.elevation) + (s / 70.0).sin();
                crate::GroundPoint { station: s, elevation: y }
            })
            .collect::<Vec<_>>()
            .into();
        project.section = Some(crate::Section::default_for(Units::Metric));
        let mut analysis = Analysis::of(&project);
        assert!(analysis.report.findings.iter().filter(|f| f.code.is_sight_shortfall()).count() > 20);
        for (index, rise) in [(40, 0.8), (40, 1.6), (41, -0.7), (10, 0.3), (40, 0.0)] {
            if let Some(p) = project.pvis.get_mut(index) {
                p.elevation += rise;
            }
            analysis.refresh(&project);
            let fresh = Analysis::of(&project);
            assert_eq!(analysis.report.findings, fresh.report.findings, "after moving PVI {}", index + 1);
            assert_eq!(analysis.sight(), fresh.sight());
            assert_eq!(analysis.cut_fill, fresh.cut_fill);
            assert_eq!(analysis.earthwork, fresh.earthwork);
        }
    }
}
