//! One analysis of a project, built once and used by every front end: the
//! command line, the editor and the sheet.

use crate::{
    Alignment, CheckReport, CriteriaError, CurveGeometry, Finding, Profile, ProfileProblem, Project,
    ResolvedCriteria, Severity, check_profile, interior_curves, structural_findings,
};

/// Everything computed from a project: the validated alignment (when the
/// profile has no problems), every curve (also when curves overlap), the
/// criteria in force (or why there are none), the findings and per-curve
/// figures, and the sight distance along the profile.
#[derive(Clone, Debug)]
pub struct Analysis {
    /// The profile analysed.
    pub profile: Profile,
    /// Problems that stop the profile being evaluated.
    pub problems: Vec<ProfileProblem>,
    /// The evaluated profile, when it has no problems.
    pub alignment: Option<Alignment>,
    /// Every interior curve, when the stations are usable.
    pub curves: Vec<CurveGeometry>,
    /// The criteria in force, or why there are none.
    pub criteria: Result<ResolvedCriteria, CriteriaError>,
    /// Findings, per-curve requirements and the sight distance.
    pub report: CheckReport,
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
    findings.push(Finding {
        severity: Severity::Info,
        code: "criteria.incomplete",
        station_start: profile.start().unwrap_or_default(),
        station_end: profile.end().unwrap_or_default(),
        pvi: None,
        message: format!("Design checks are off: {why}"),
    });
    CheckReport { findings, curves: Vec::new(), sight: None }
}

impl Analysis {
    /// Analyses `project` with its own criteria.
    pub fn of(project: &Project) -> Self {
        let criteria = project.criteria.resolve(project.units);
        Self::with_criteria(project.profile(), criteria)
    }

    /// Analyses `profile` against `criteria` (or reports why there are none).
    pub fn with_criteria(profile: Profile, criteria: Result<ResolvedCriteria, CriteriaError>) -> Self {
        let problems = profile.problems();
        let alignment = Alignment::new(&profile).ok();
        let usable = problems.iter().all(is_design_problem);
        let curves = if usable { interior_curves(&profile.pvis) } else { Vec::new() };
        let report = match &criteria {
            Ok(c) => check_profile(&profile, c),
            Err(e) => unchecked_report(&profile, e),
        };
        Self { profile, problems, alignment, curves, criteria, report }
    }

    /// Whether any finding is a failure.
    pub fn has_failures(&self) -> bool {
        self.report.has_failures()
    }
}
