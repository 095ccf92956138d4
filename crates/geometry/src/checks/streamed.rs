//! The check of a profile too long to hold its report at once: the curves
//! and findings of [`crate::Analysis::of`], curve for curve and finding for
//! finding and in the same order, handed over one at a time.
//!
//! A first pass counts the findings and marks the PVIs a failure names (a
//! byte per PVI); each hand-over computes its items again. Curves and grades
//! are checked one at a time; the sight distance a stretch at a time
//! ([`super::sight::on_each_stretch`]), its shortfalls carried from one
//! stretch into the next and charged to their curve on the stretch that
//! holds their worst eye. Memory does not grow with the findings.

use super::grades::check_grades_of;
use super::sight::{Blame, Wording, on_each_stretch};
use super::{CurveCheck, Streamed};
use crate::analysis::{SiteParts, ground_findings, site_parts};
use crate::visibility::{Direction, Shortfall, SightProfile};
use crate::{
    ControlStatus, CurveGeometry, CurveKind, CutFillSummary, Design, Earthwork, EarthworkError, Finding,
    FindingCode, Profile, ResolvedCriteria,
};

/// Tangents whose grade findings are made together (a bounded buffer).
const GRADES_AT_ONCE: usize = 4096;

/// A check handed over one item at a time (see the module docs).
pub struct StreamedCheck<'a> {
    design: &'a Design,
    profile: Profile,
    criteria: ResolvedCriteria,
    pvis_each: usize,
    /// Whether a failure of the profile's checks names each PVI.
    failing: Vec<bool>,
    count: usize,
    failures: usize,
    site: Option<SiteParts>,
    review: Vec<crate::GroundWarning>,
}

impl<'a> StreamedCheck<'a> {
    /// The first pass over `design`, the sight distance computed
    /// `pvis_each` PVIs at a time; `None` when the profile has problems,
    /// the criteria cannot be resolved or the sight distance would take
    /// too many stations (the whole [`crate::Analysis`] reports those).
    pub fn new(design: &'a Design, pvis_each: usize) -> Option<Self> {
        let profile = design.profile();
        let criteria = design.criteria_in_force().ok()?;
        if !profile.problems().is_empty() {
            return None;
        }
        let n = profile.pvis.len();
        let mut check = Self {
            design,
            profile,
            criteria,
            pvis_each,
            failing: vec![false; n],
            count: 0,
            failures: 0,
            site: None,
            review: Vec::new(),
        };
        let (mut failing, mut count, mut failures) = (vec![false; n], 0, 0);
        let streamed = check.profile_findings(&mut |f: &Finding| {
            count += 1;
            if f.fails() {
                failures += 1;
                if let Some(slot) = f.pvi.and_then(|i| failing.get_mut(i)) {
                    *slot = true;
                }
            }
            Ok::<(), std::convert::Infallible>(())
        });
        if !matches!(streamed, Ok(Streamed::Done)) {
            return None;
        }
        if !design.controls.is_empty() || design.ground.range().is_some() {
            let alignment = crate::Alignment::new(&check.profile).ok()?;
            let parts = site_parts(design, &alignment, Some(&check.criteria), None, None);
            count += parts.control_findings.len() + parts.under_findings.len();
            failures +=
                parts.control_findings.iter().chain(&parts.under_findings).filter(|f| f.fails()).count();
            check.site = Some(parts);
        }
        check.review = design.ground.review(design.units);
        count += check.review.len();
        check.failing = failing;
        check.count = count;
        check.failures = failures;
        Some(check)
    }

    /// How many findings there are.
    pub fn len(&self) -> usize {
        self.count
    }

    /// Whether there are none.
    pub fn is_empty(&self) -> bool {
        self.count == 0
    }

    /// Whether any finding is a failure.
    pub fn has_failures(&self) -> bool {
        self.failures > 0
    }

    /// How many findings are failures.
    pub fn failures(&self) -> usize {
        self.failures
    }

    /// The PVIs whose curves fail a criterion, as
    /// [`super::CheckReport::failing_curves`] gives them.
    pub fn failing_curves(&self) -> Vec<usize> {
        self.interior_curves()
            .filter(|c| c.kind != CurveKind::None && self.fails_at(c.index))
            .map(|c| c.index)
            .collect()
    }

    /// How the profile meets each control point.
    pub fn control_status(&self) -> &[ControlStatus] {
        self.site.as_ref().map_or(&[], |s| &s.control_status)
    }

    /// The largest cut and fill.
    pub fn cut_fill(&self) -> CutFillSummary {
        self.site.as_ref().and_then(|s| s.scan.as_ref()).map(|s| s.summary).unwrap_or_default()
    }

    /// The earthwork estimate, when the project sets a section and has ground.
    pub fn earthwork(&self) -> Option<&Result<Earthwork, EarthworkError>> {
        self.site.as_ref().and_then(|s| s.earthwork.as_ref())
    }

    /// Every curve's check, in order.
    ///
    /// # Errors
    /// The first error `each` returns.
    pub fn curves<E>(&self, mut each: impl FnMut(&CurveCheck) -> Result<(), E>) -> Result<(), E> {
        let mut scratch = Vec::new();
        for curve in self.interior_curves() {
            scratch.clear();
            let mut check = super::curve::check_curve_in_force(
                &curve,
                &self.criteria,
                self.profile.stationing(),
                &mut scratch,
            );
            check.ok = !self.fails_at(curve.index);
            if let Some(site) = &self.site {
                for &(pvi, needed) in &site.needed {
                    if pvi == curve.index {
                        check.length_required = check.length_required.max(needed);
                    }
                }
            }
            each(&check)?;
        }
        Ok(())
    }

    /// Every finding, in the report's order.
    ///
    /// # Errors
    /// The first error `each` returns.
    pub fn findings<E>(&self, mut each: impl FnMut(&Finding) -> Result<(), E>) -> Result<(), E> {
        self.profile_findings(&mut each)?;
        if let Some(site) = &self.site {
            site.control_findings.iter().chain(&site.under_findings).try_for_each(&mut each)?;
        }
        ground_findings(&self.review, self.design.equations.stationing(self.design.units))
            .try_for_each(|f| each(&f))
    }

    fn fails_at(&self, index: usize) -> bool {
        self.failing.get(index).copied().unwrap_or(false)
            || self.site.as_ref().is_some_and(|s| s.under_findings.iter().any(|f| f.pvi == Some(index)))
    }

    fn interior_curves(&self) -> impl Iterator<Item = CurveGeometry> + '_ {
        self.profile.pvis.windows(3).enumerate().filter_map(|(i, w)| match w {
            [a, b, c] => Some(CurveGeometry::new(i + 1, a, b, c)),
            _ => None,
        })
    }

    /// The findings of the profile's own checks (curves, grades, sight
    /// distance, the design speed), in order.
    fn profile_findings<E>(&self, each: &mut impl FnMut(&Finding) -> Result<(), E>) -> Result<Streamed, E> {
        let mut scratch = Vec::new();
        for curve in self.interior_curves() {
            scratch.clear();
            super::curve::check_curve_in_force(
                &curve,
                &self.criteria,
                self.profile.stationing(),
                &mut scratch,
            );
            scratch.iter().try_for_each(&mut *each)?;
        }
        let tangents = self.profile.pvis.len().saturating_sub(1);
        for from in (0..tangents).step_by(GRADES_AT_ONCE) {
            scratch.clear();
            check_grades_of(
                &self.profile,
                &self.criteria,
                from..(from + GRADES_AT_ONCE).min(tangents),
                &mut scratch,
            );
            scratch.iter().try_for_each(&mut *each)?;
        }
        let streamed = self.sight_findings(each)?;
        if streamed != Streamed::Done {
            return Ok(streamed);
        }
        let (start, end) = (self.profile.start().unwrap_or_default(), self.profile.end().unwrap_or_default());
        for note in self.criteria.speed_notes() {
            each(&Finding::new(FindingCode::CriteriaSpeedOffTable, (start, end), None, note))?;
        }
        Ok(Streamed::Done)
    }

    /// The sight shortfalls' findings: forward ones as they close, then the
    /// backward ones (kept, with what they are charged to, until then).
    fn sight_findings<E>(&self, each: &mut impl FnMut(&Finding) -> Result<(), E>) -> Result<Streamed, E> {
        let units = self.profile.stationing();
        let mut runs: [Option<(Shortfall, Option<Blame>)>; 2] = [None, None];
        let mut backward: Vec<(Shortfall, Blame)> = Vec::new();
        let streamed =
            on_each_stretch(&self.profile, &self.criteria, self.pvis_each, |sight, alignment, offset| {
                let wording = Wording::new(alignment, &self.criteria, offset);
                for (k, direction) in [Direction::Forward, Direction::Backward].into_iter().enumerate() {
                    let Some(run) = runs.get_mut(k) else { continue };
                    for closed in follow(run, sight, direction) {
                        let blame = closed.1.unwrap_or_else(|| wording.blame(&closed.0));
                        match direction {
                            Direction::Forward => each(&Wording::finding(units, &closed.0, &blame))?,
                            Direction::Backward => backward.push((closed.0, blame)),
                        }
                    }
                    // A run still open is charged on the stretch that holds its
                    // worst eye, while that stretch's road is at hand.
                    if let Some((short, blame @ None)) = run {
                        *blame = Some(wording.blame(short));
                    }
                }
                Ok(())
            })?;
        if streamed != Streamed::Done {
            return Ok(streamed);
        }
        let [forward, last_backward] = runs;
        for (short, blame) in forward.into_iter().filter_map(|(s, b)| Some((s, b?))) {
            each(&Wording::finding(units, &short, &blame))?;
        }
        backward.extend(last_backward.into_iter().filter_map(|(s, b)| Some((s, b?))));
        for (short, blame) in backward {
            each(&Wording::finding(units, &short, &blame))?;
        }
        Ok(Streamed::Done)
    }
}

/// Carries the open run of `direction` through one stretch's samples
/// exactly as [`SightProfile::shortfalls`] walks the whole profile; gives
/// the runs that closed (with what they were charged to, when their worst
/// eye was on an earlier stretch).
fn follow(
    run: &mut Option<(Shortfall, Option<Blame>)>,
    sight: &SightProfile,
    direction: Direction,
) -> Vec<(Shortfall, Option<Blame>)> {
    let mut closed = Vec::new();
    for s in &sight.samples {
        let (available, required) = match direction {
            Direction::Forward => (s.forward, s.required_forward),
            Direction::Backward => (s.backward, s.required_backward),
        };
        if crate::tolerance::below(available, required) {
            let short = required - available;
            match run {
                Some((open, blame)) => {
                    open.end = s.station;
                    if short > open.required - open.available {
                        open.worst = s.station;
                        open.available = available;
                        open.required = required;
                        *blame = None;
                    }
                }
                None => {
                    let start = s.station;
                    *run = Some((
                        Shortfall { direction, start, end: start, worst: start, available, required },
                        None,
                    ));
                }
            }
        } else if let Some(done) = run.take() {
            closed.push(done);
        }
    }
    closed
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::{Analysis, ControlKind, ControlPoint, GroundPoint, Section, Station, Units};

    /// A long failing profile with control points (one a structure over
    /// the road), ground and a section: taken a few PVIs at a time, the
    /// curves and findings are the whole analysis's, in order, and so are
    /// the count, the failures and the curves to lengthen.
    #[test]
    fn a_check_streamed_by_stretch_is_the_whole_analysis() {
        for (units, speed) in [(Units::Metric, 100.0), (Units::UsCustomary, 60.0)] {
            let length = if units == Units::Metric { 12_000.0 } else { 40_000.0 };
            let profile = crate::synthetic::rolling_profile(units, 400, length);
            let mut design = Design { units, pvis: profile.pvis, ..Design::default() };
            design.criteria.design_speed = Some(speed);
            let road = crate::Alignment::new(&design.profile()).unwrap_or_else(|e| panic!("{e:?}"));
            let at = |s: f64| road.sample(Station(s)).map_or(0.0, |x| x.elevation);
            let point = |s: f64, kind, rise: f64, clearance: f64| ControlPoint {
                name: String::new(),
                station: s,
                kind,
                elevation: at(s) + rise,
                tolerance: if kind == ControlKind::Fixed { 0.1 } else { 0.0 },
                clearance,
            };
            // A missed fixed point, and structures over the road every
            // few hundred metres (some over sags, whose sight under them
            // is a criterion of the curve).
            let sags: Vec<f64> = crate::interior_curves(&design.pvis)
                .into_iter()
                .filter(|c| c.kind == CurveKind::Sag)
                .map(|c| c.pvi.0)
                .step_by(25)
                .collect();
            design.controls =
                std::iter::once(point(length * 0.3, ControlKind::Fixed, 0.5, 0.0))
                    .chain(sags.iter().enumerate().map(|(k, &s)| {
                        point(s, ControlKind::Maximum, 0.2, if k % 2 == 0 { 1.0 } else { 2.2 })
                    }))
                    .collect();
            design.ground = (0..=400)
                .map(|i| {
                    let s = length * f64::from(i) / 400.0;
                    GroundPoint { station: s, elevation: at(s) + (s / 300.0).sin() }
                })
                .collect::<Vec<_>>()
                .into();
            design.section = Some(Section::default_for(units));
            // And the same road with criteria ranges (a slow lit one and a
            // fast one) and station equations (a short and a long one).
            let mut zoned = design.clone();
            zoned.ranges = vec![
                crate::CriteriaRange {
                    from: length * 0.2,
                    to: length * 0.45,
                    design_speed: Some(speed * 0.6),
                    headlight_check: Some(false),
                    ..crate::CriteriaRange::default()
                },
                crate::CriteriaRange {
                    from: length * 0.6,
                    to: length * 0.8,
                    design_speed: Some(speed + 10.0),
                    ..crate::CriteriaRange::default()
                },
            ];
            zoned.equations = crate::Equations::new(vec![
                crate::StationEquation {
                    internal: length * 0.25,
                    back: length * 0.25,
                    ahead: length * 0.25 + 37.0,
                },
                crate::StationEquation {
                    internal: length * 0.7,
                    back: length * 0.7 + 37.0,
                    ahead: length * 0.7 - 20.0,
                },
            ]);
            assert_eq!(zoned.equations.problem(), None);
            for design in [design, zoned] {
                let whole = Analysis::of(&design);
                assert!(whole.criteria.is_ok(), "{:?}", whole.criteria);
                if !design.ranges.is_empty() {
                    let said = |w: &str| whole.report.findings.iter().any(|f| f.message.contains(w));
                    assert!(said("judged under criteria range 1") && said("judged under criteria range 2"));
                }
                let has = |code| whole.report.findings.iter().any(|f| f.code == code);
                assert!(whole.report.findings.iter().filter(|f| f.code.is_sight_shortfall()).count() > 40);
                let codes: std::collections::BTreeSet<String> =
                    whole.report.findings.iter().map(|f| f.code.to_string()).collect();
                assert!(
                    has(FindingCode::ControlFixed) && has(FindingCode::ControlUndercrossing),
                    "{units:?} {codes:?}"
                );
                assert!(has(FindingCode::GradeMax) || has(FindingCode::CurveMinLength), "{units:?}");
                for each in [7, 64, 2048] {
                    let streamed = StreamedCheck::new(&design, each).unwrap_or_else(|| panic!("streamable"));
                    let mut curves = Vec::new();
                    streamed
                        .curves(|c| {
                            curves.push(c.clone());
                            Ok::<_, ()>(())
                        })
                        .unwrap_or_default();
                    assert_eq!(curves, whole.report.curves, "{units:?}, {each} PVIs a stretch");
                    let mut findings = Vec::new();
                    streamed
                        .findings(|f| {
                            findings.push(f.clone());
                            Ok::<_, ()>(())
                        })
                        .unwrap_or_default();
                    assert_eq!(findings, whole.report.findings, "{units:?}, {each} PVIs a stretch");
                    assert_eq!(streamed.len(), findings.len());
                    assert_eq!(streamed.has_failures(), whole.has_failures());
                    assert_eq!(
                        streamed.failures(),
                        whole.report.findings.iter().filter(|f| f.fails()).count()
                    );
                    assert_eq!(streamed.failing_curves(), whole.report.failing_curves());
                    assert_eq!(streamed.control_status(), &whole.control_status[..]);
                    assert_eq!(streamed.cut_fill(), whole.cut_fill);
                    assert_eq!(streamed.earthwork(), whole.earthwork.as_ref());
                }
            }
        }
    }

    /// What cannot be streamed says so, for the whole analysis to report.
    #[test]
    fn a_profile_with_problems_is_not_streamed() {
        let mut design = Design { units: Units::Metric, ..Design::default() };
        design.pvis = vec![crate::Pvi::new(0.0, 100.0), crate::Pvi::new(0.0, 101.0)];
        design.criteria.design_speed = Some(80.0);
        assert!(StreamedCheck::new(&design, 64).is_none());
    }
}
