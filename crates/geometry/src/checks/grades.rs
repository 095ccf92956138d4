//! The tangent grades: steeper than the maximum, flatter than the minimum
//! for drainage.

use super::label;
use crate::tolerance::{above, below};
use crate::{CriterionId, Finding, FindingCode, Profile, ResolvedCriteria};

pub(super) fn check_grades(profile: &Profile, criteria: &ResolvedCriteria, findings: &mut Vec<Finding>) {
    let units = profile.units;
    let max = criteria.get(CriterionId::MaxGrade);
    let min = criteria.get(CriterionId::MinGrade);
    for (i, pair) in profile.pvis.windows(2).enumerate() {
        let [a, b] = pair else { continue };
        let grade = a.grade_to(b) * 100.0;
        let span = || format!("{} to {}", label(units, a.station), label(units, b.station));
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
