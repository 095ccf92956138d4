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
    let max = criteria.get(CriterionId::MaxGrade);
    let min = criteria.get(CriterionId::MinGrade);
    let first = starts.start;
    let pvis = profile.pvis.get(first..(starts.end.saturating_add(1)).min(profile.pvis.len())).unwrap_or(&[]);
    for (k, pair) in pvis.windows(2).enumerate() {
        let i = first + k;
        let [a, b] = pair else { continue };
        let grade = a.grade_to(b) * 100.0;
        let span = || format!("{} to {}", label(at, a.station), label(at, b.station));
        let mut push = |code, message| {
            findings.push(Finding::new(code, (a.station, b.station), Some(i), message));
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
