//! The tangent grades: steeper than the maximum, flatter than the minimum
//! for drainage.

use super::label;
use crate::tolerance::{above, below};
use crate::{CriterionId, Finding, FindingCode, Profile, ResolvedCriteria};

pub(super) fn check_grades(profile: &Profile, criteria: &ResolvedCriteria, findings: &mut Vec<Finding>) {
    check_grades_of(profile, criteria, 0..profile.pvis.len(), findings);
}

/// [`check_grades`] on the tangents that start at the PVIs of `starts`.
pub(crate) fn check_grades_of(
    profile: &Profile,
    criteria: &ResolvedCriteria,
    starts: std::ops::Range<usize>,
    findings: &mut Vec<Finding>,
) {
    let at = profile.stationing();
    let first = starts.start;
    let pvis = profile.pvis.get(first..(starts.end.saturating_add(1)).min(profile.pvis.len())).unwrap_or(&[]);
    for (k, pair) in pvis.windows(2).enumerate() {
        let i = first + k;
        let [a, b] = pair else { continue };
        let grade = a.grade_to(b) * 100.0;
        // The criteria in force along the tangent; across a criteria range's
        // edge, the stricter maximum grade (common practice).
        let (zone, range) = if criteria.has_ranges() {
            criteria
                .over(a.station.0, b.station.0)
                .into_iter()
                .min_by(|x, y| x.0.get(CriterionId::MaxGrade).total_cmp(&y.0.get(CriterionId::MaxGrade)))
                .unwrap_or((criteria, None))
        } else {
            (criteria, None)
        };
        let max = zone.get(CriterionId::MaxGrade);
        let min = zone.get(CriterionId::MinGrade);
        let judged = range.map_or_else(String::new, |r| format!(" [judged under {}]", r.words(at)));
        let span = || format!("{} to {}", label(at, a.station), label(at, b.station));
        let mut push = |code, message: String| {
            findings.push(Finding::new(code, (a.station, b.station), Some(i), format!("{message}{judged}")));
        };
        if above(grade.abs(), max) {
            push(
                FindingCode::GradeMax,
                format!("Grade {grade:+.3} % from {} is steeper than the maximum {max:.2} %", span()),
            );
        } else if below(grade.abs(), min) {
            push(
                FindingCode::GradeMin,
                format!(
                    "Grade {grade:+.3} % from {} is flatter than the minimum {min:.2} % for drainage",
                    span()
                ),
            );
        }
    }
}
