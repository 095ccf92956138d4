//! Checks of a profile against resolved criteria: a list of structured
//! findings. The report and the run of every check are here; each kind of
//! check has its own file: the curves ([`curve`]), the sight distance along
//! the profile ([`sight`]) and the curve to blame for a shortfall
//! ([`blame`]), and the tangent grades ([`grades`]).

mod blame;
mod curve;
mod grades;
mod sight;
mod streamed;

pub use curve::{check_curve, check_curve_in_force};
pub use sight::{
    MAX_SIGHT_STATIONS, PVIS_PER_STRETCH, Streamed, compute_sight, sight_by_stretch, sight_in_force,
};
pub use streamed::StreamedCheck;

use crate::visibility::SightProfile;
use crate::{
    Alignment, CriterionId, CurveGeometry, CurveKind, Finding, FindingCode, Profile, ProfileProblem,
    ResolvedCriteria, Severity, Station, interior_curves,
};

/// A curve with what the criteria ask of it.
#[derive(Clone, Debug, PartialEq)]
pub struct CurveCheck {
    /// The curve.
    pub curve: CurveGeometry,
    /// The minimum K for this kind of curve (`None` when no curve is needed,
    /// and for a grade break allowed to go without one).
    pub k_required: Option<f64>,
    /// Equal-tangent length for stopping sight distance by the exact formula
    /// (S < L or S > L); zero when no sight formula applies (a lit sag).
    pub sight_length: f64,
    /// Equal-tangent sag comfort length, when comfort is checked on a sag.
    pub comfort_length: Option<f64>,
    /// Minimum length rule.
    pub min_length: f64,
    /// The governing minimum *total* length at this curve's l1:l2 ratio: the
    /// largest of K·A, the sight-distance length and the comfort length, each
    /// times [`CurveGeometry::ratio_factor`], and the minimum-length rule.
    /// Zero for a grade break allowed to go without a curve.
    pub length_required: f64,
    /// Whether no failure was found on this curve.
    pub ok: bool,
}

/// All findings of a profile, plus the per-curve figures.
#[derive(Clone, Debug, PartialEq, Default)]
pub struct CheckReport {
    /// Findings, in station order within each kind of check.
    pub findings: Vec<Finding>,
    /// One entry per interior PVI, in order (empty when stations are unusable).
    pub curves: Vec<CurveCheck>,
    /// Available and required sight distance along the profile (when the
    /// profile can be evaluated).
    pub sight: Option<SightProfile>,
}

impl CheckReport {
    /// Whether any finding is a failure.
    pub fn has_failures(&self) -> bool {
        self.findings.iter().any(Finding::fails)
    }

    /// The PVIs whose curves fail a criterion (curve checks or sight
    /// distance), for "lengthen to clear".
    pub fn failing_curves(&self) -> Vec<usize> {
        self.curves
            .iter()
            .filter(|c| !c.ok && c.curve.kind != CurveKind::None)
            .map(|c| c.curve.index)
            .collect()
    }

    /// The worst severity on PVI `index`, if any finding names it.
    pub fn worst_at(&self, index: usize) -> Option<Severity> {
        self.findings.iter().filter(|f| f.pvi == Some(index)).map(Finding::severity).max()
    }
}

/// The structural problems of `profile` as failure findings (what
/// [`check_profile`] reports first), for use when no criteria are available.
pub fn structural_findings(profile: &Profile) -> Vec<Finding> {
    group_repeats(profile.problems().iter().map(|p| problem_finding(profile, p)).collect())
}

/// How many findings of one code are listed one by one before the rest are
/// counted in the first.
const REPEATS_LISTED: usize = 3;

/// The same problem repeated is one finding with a count and the first few
/// stations, so a file with two million bad rows gives a short report.
fn group_repeats(findings: Vec<Finding>) -> Vec<Finding> {
    let mut counts: std::collections::HashMap<FindingCode, usize> = std::collections::HashMap::new();
    for f in &findings {
        *counts.entry(f.code).or_default() += 1;
    }
    if counts.values().all(|&n| n <= REPEATS_LISTED) {
        return findings;
    }
    let mut out: Vec<Finding> = Vec::new();
    let mut firsts: std::collections::HashMap<FindingCode, (usize, Vec<String>)> =
        std::collections::HashMap::new();
    for f in findings {
        let n = counts.get(&f.code).copied().unwrap_or(0);
        if n <= REPEATS_LISTED {
            out.push(f);
            continue;
        }
        match firsts.get_mut(&f.code) {
            Some((_, stations)) => {
                if stations.len() < REPEATS_LISTED {
                    stations.push(format!("{:.3}", f.station_start.0));
                }
            }
            None => {
                firsts.insert(f.code, (out.len(), vec![format!("{:.3}", f.station_start.0)]));
                out.push(f);
            }
        }
    }
    for (code, (at, stations)) in firsts {
        let n = counts.get(&code).copied().unwrap_or(0);
        if let Some(f) = out.get_mut(at) {
            f.message = format!(
                "{} — the same problem {n} times in all (first at stations {}, …)",
                f.message,
                stations.join(", ")
            );
        }
    }
    out
}

/// Checks `profile` against `criteria`: structural problems (as failures), then
/// every curve, every tangent grade, and the available sight distance at every
/// station in both directions.
pub fn check_profile(profile: &Profile, criteria: &ResolvedCriteria) -> CheckReport {
    let sight = Alignment::new(profile).ok().and_then(|a| compute_sight(&a, criteria));
    check_profile_with_sight(profile, criteria, sight)
}

/// As [`check_profile`], with the sight distance already computed (the editor
/// recomputes only the stretch a change can affect).
pub fn check_profile_with_sight(
    profile: &Profile,
    criteria: &ResolvedCriteria,
    sight: Option<SightProfile>,
) -> CheckReport {
    check_profile_reusing(profile, criteria, sight, Reuse::default()).0
}

/// What a check made of each part, for the next check to reuse: the range
/// of findings each curve's own check made (in the order of the report's
/// curves), and each sight shortfall with its finding.
#[derive(Clone, Debug, Default)]
pub(crate) struct Made {
    /// Findings of each curve.
    pub curves: Vec<std::ops::Range<usize>>,
    /// Each shortfall and the finding made of it.
    pub shortfalls: Vec<(crate::visibility::Shortfall, Finding)>,
}

/// What an earlier check of the same criteria can vouch for: a curve's
/// check and findings (when its geometry is unchanged), a shortfall's finding.
#[derive(Clone, Copy, Default)]
pub(crate) struct Reuse<'a> {
    /// By curve.
    pub curve: Option<CurveReuse<'a>>,
    /// By shortfall.
    pub sight: Option<SightReuse<'a>>,
    /// Keep nothing for a later check (a one-shot analysis): [`Made`] comes
    /// back empty, and no finding is copied for it.
    pub forget: bool,
}

/// The check and findings an earlier check made of a curve with exactly
/// this geometry, or `None`.
pub(crate) type CurveReuse<'a> = &'a dyn Fn(&CurveGeometry) -> Option<(CurveCheck, Vec<Finding>)>;

/// What an earlier check said about a shortfall it can vouch for (one whose
/// sight lines an edit cannot have touched), or `None`.
pub(crate) type SightReuse<'a> = &'a dyn Fn(&crate::visibility::Shortfall) -> Option<Finding>;

/// As [`check_profile_with_sight`], taking what `reuse` vouches for (the
/// same a fresh check would make). Also says what it made of each part.
pub(crate) fn check_profile_reusing(
    profile: &Profile,
    criteria: &ResolvedCriteria,
    sight: Option<SightProfile>,
    reuse: Reuse<'_>,
) -> (CheckReport, Made) {
    let mut report = CheckReport::default();
    let mut made = Made::default();
    let problems = profile.problems();
    let usable = problems.iter().all(|problem| {
        matches!(
            problem,
            ProfileProblem::Overlap { .. }
                | ProfileProblem::CurveExceedsTangent { .. }
                | ProfileProblem::CurveAtEnd { .. }
        )
    });
    report.findings = group_repeats(problems.iter().map(|p| problem_finding(profile, p)).collect());
    if !usable {
        return (report, made);
    }
    for curve in interior_curves(&profile.pvis) {
        let start = report.findings.len();
        let check = match reuse.curve.and_then(|r| r(&curve)) {
            Some((check, found)) => {
                report.findings.extend(found);
                check
            }
            None => curve::check_curve_in_force(&curve, criteria, profile.stationing(), &mut report.findings),
        };
        made.curves.push(start..report.findings.len());
        report.curves.push(check);
    }
    grades::check_grades(profile, criteria, &mut report.findings);
    if problems.is_empty()
        && let Ok(alignment) = Alignment::new(profile)
    {
        match &sight {
            Some(sight) => {
                made.shortfalls =
                    sight::check_sight(&alignment, criteria, sight, reuse, &mut report.findings);
            }
            // A check that did not run must not pass.
            None => report.findings.push(Finding::new(
                FindingCode::SightNotComputed,
                (alignment.start(), alignment.end()),
                None,
                format!(
                    "Sight distance was not checked: more than {MAX_SIGHT_STATIONS} stations at a step of {} {}; \
                     use a larger sight-distance step",
                    criteria.get(CriterionId::SightStep),
                    criteria.units.length_symbol()
                ),
            )),
        }
    }
    for note in criteria.speed_notes() {
        report.findings.push(Finding::new(
            FindingCode::CriteriaSpeedOffTable,
            (profile.start().unwrap_or_default(), profile.end().unwrap_or_default()),
            None,
            note,
        ));
    }
    report.sight = sight;
    // One pass over the findings (not one per curve: that was quadratic).
    let mut failing = vec![false; profile.pvis.len()];
    for f in report.findings.iter().filter(|f| f.fails()) {
        if let Some(slot) = f.pvi.and_then(|i| failing.get_mut(i)) {
            *slot = true;
        }
    }
    for check in &mut report.curves {
        check.ok = !failing.get(check.curve.index).copied().unwrap_or(false);
    }
    (report, made)
}

pub(super) fn label(at: crate::Stationing<'_>, station: Station) -> String {
    at.label_std(station.0)
}

fn problem_finding(profile: &Profile, problem: &ProfileProblem) -> Finding {
    let pvi = problem.pvi_index();
    let station = pvi
        .and_then(|i| profile.pvis.get(i))
        .map(|p| p.station)
        .filter(|s| s.0.is_finite())
        .unwrap_or(Station(0.0));
    let (start, end) = match problem {
        ProfileProblem::Overlap { pvt, pvc, .. } => (Station(*pvc), Station(*pvt)),
        _ => (station, station),
    };
    let at = pvi.map_or(String::new(), |_| format!(" (at {})", label(profile.stationing(), station)));
    Finding::new(problem.code(), (start, end), pvi, format!("{problem}{at}"))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::{Pvi, Units};

    #[test]
    fn a_repeated_problem_is_one_finding_with_a_count() {
        let pvis = (0..20_000).map(|_| Pvi::new(0.0, 100.0)).collect();
        let profile = Profile::new(Units::Metric, pvis);
        let findings = structural_findings(&profile);
        assert_eq!(findings.len(), 1, "{:?}", findings.first());
        let message = findings.first().map(|f| f.message.as_str()).unwrap_or("");
        assert!(message.contains("19999 times in all"), "{message}");
    }

    #[test]
    fn absurd_values_are_problems_not_nan() {
        let profile = Profile::new(Units::Metric, vec![Pvi::new(0.0, 1e308), Pvi::new(100.0, -1e308)]);
        let problems = profile.problems();
        assert_eq!(problems.len(), 2);
        assert!(problems.iter().all(|p| p.code() == FindingCode::ProfileOutOfRange), "{problems:?}");
        assert!(Alignment::new(&profile).is_err());
    }
}
