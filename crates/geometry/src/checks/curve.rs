//! The curve criteria: K, the exact sight-distance length, comfort, the
//! minimum length, a grade break left without a curve, drainage.

use super::CurveCheck;
use super::label;
use crate::tolerance::{above, below};
use crate::{
    CriterionId, CurveGeometry, CurveKind, Finding, FindingCode, ResolvedCriteria, SagRule, Stationing, sight,
};

/// Checks one curve against the curve criteria (K, sight-distance length,
/// comfort, minimum length, drainage), adding its findings to `findings`.
/// The `ok` of the result reflects these findings only.
/// Stations in its findings read as `at` says (the road's station
/// equations).
pub fn check_curve(
    curve: &CurveGeometry,
    criteria: &ResolvedCriteria,
    at: Stationing<'_>,
    findings: &mut Vec<Finding>,
) -> CurveCheck {
    let before = findings.len();
    let mut check = check_curve_inner(curve, criteria, at, findings);
    check.ok = !findings.iter().skip(before).any(Finding::fails);
    check
}

/// [`check_curve`] under the criteria in force over the curve (from its
/// PVC to its PVT; at its PVI when it has no length): where criteria ranges
/// differ along it, it is checked under each and judged under the stricter
/// — the one asking the longer curve (the PVI's on a tie; common practice).
/// A curve judged under a criteria range says so in its findings.
pub fn check_curve_in_force(
    curve: &CurveGeometry,
    criteria: &ResolvedCriteria,
    at: Stationing<'_>,
    findings: &mut Vec<Finding>,
) -> CurveCheck {
    if !criteria.has_ranges() {
        return check_curve(curve, criteria, at, findings);
    }
    let (a, b) = if curve.length() > 0.0 { (curve.pvc.0, curve.pvt.0) } else { (curve.pvi.0, curve.pvi.0) };
    // The PVI's criteria first, so a tie keeps them.
    let mut candidates = vec![criteria.at(curve.pvi.0)];
    for c in criteria.over(a, b) {
        if !candidates.iter().any(|x| x.1.map(|r| r.index) == c.1.map(|r| r.index)) {
            candidates.push(c);
        }
    }
    let mut best: Option<(CurveCheck, Vec<Finding>, Option<&crate::ResolvedRange>)> = None;
    for (c, range) in candidates {
        let mut found = Vec::new();
        let check = check_curve(curve, c, at, &mut found);
        let stricter = best.as_ref().is_none_or(|(b, _, _)| check.length_required > b.length_required);
        if stricter {
            best = Some((check, found, range));
        }
    }
    let Some((check, mut found, range)) = best else { return check_curve(curve, criteria, at, findings) };
    if let Some(r) = range {
        let words = r.words(at);
        for f in &mut found {
            f.message = format!("{} [judged under {words}]", f.message);
        }
    }
    findings.extend(found);
    check
}

/// What the criteria ask of a curve of this kind and A, as equal-tangent
/// lengths: (minimum K, sight-distance length and its formula, comfort length).
fn requirements(
    curve: &CurveGeometry,
    criteria: &ResolvedCriteria,
) -> (f64, FindingCode, f64, String, Option<f64>) {
    let a = curve.a_percent();
    let ssd = criteria.get(CriterionId::StoppingSightDistance);
    if curve.kind == CurveKind::Crest {
        let c = criteria.crest_constant();
        let r = sight::crest_length(a, ssd, c);
        let formula = match r.case {
            sight::SightCase::ShorterThanCurve => format!("L = A·S²/{c:.0}"),
            sight::SightCase::LongerThanCurve => format!("L = 2S − {c:.0}/A"),
        };
        return (criteria.get(CriterionId::CrestK), FindingCode::CrestSsdLength, r.length, formula, None);
    }
    let comfort = criteria.checks_sag_comfort().then(|| criteria.sag_comfort_length(a));
    match criteria.sag_rule() {
        SagRule::Headlight => {
            let (base, slope) = criteria.headlight_terms();
            let r = sight::sag_headlight_length(a, ssd, (base, slope));
            let formula = match r.case {
                sight::SightCase::ShorterThanCurve => format!("L = A·S²/({base:.0} + {slope:.2}S)"),
                sight::SightCase::LongerThanCurve => format!("L = 2S − ({base:.0} + {slope:.2}S)/A"),
            };
            (criteria.get(CriterionId::SagK), FindingCode::SagHeadlightLength, r.length, formula, comfort)
        }
        SagRule::Comfort => {
            (criteria.get(CriterionId::SagK), FindingCode::SagHeadlightLength, 0.0, String::new(), comfort)
        }
    }
}

#[allow(clippy::too_many_lines)]
fn check_curve_inner(
    curve: &CurveGeometry,
    criteria: &ResolvedCriteria,
    at: Stationing<'_>,
    findings: &mut Vec<Finding>,
) -> CurveCheck {
    let units = criteria.units;
    let len = units.length_symbol();
    let ks = units.k_symbol();
    let a = curve.a_percent();
    let ssd = criteria.get(CriterionId::StoppingSightDistance);
    let min_length = criteria.get(CriterionId::MinCurveLength);
    let mut check = CurveCheck {
        curve: *curve,
        k_required: None,
        sight_length: 0.0,
        comfort_length: None,
        min_length,
        length_required: 0.0,
        ok: true,
    };
    let where_ = format!("PVI {} ({})", curve.index + 1, label(at, curve.pvi));
    let mut push = |code, message: String| {
        findings.push(Finding::new(code, (curve.pvc, curve.pvt), Some(curve.index), message));
    };
    let name = match curve.kind {
        CurveKind::Crest => "crest",
        CurveKind::Sag => "sag",
        CurveKind::None => {
            if curve.length() > 0.0 {
                push(
                    FindingCode::CurveNotNeeded,
                    format!(
                        "{where_}: no grade change, so the {:.3} {len} curve is not needed",
                        curve.length()
                    ),
                );
            }
            return check;
        }
    };
    let (k_min, sight_code, sight_length, formula, comfort) = requirements(curve, criteria);
    let factor = curve.ratio_factor();
    let total_for = |equivalent: f64| equivalent * factor;
    let governing = [k_min * a, sight_length, comfort.unwrap_or(0.0)].into_iter().fold(0.0, f64::max);
    // A grade break with no curve: allowed up to the criterion, judged then
    // by the sight distance along the profile only.
    if curve.length() == 0.0 {
        let limit = criteria.get(CriterionId::MaxBareBreak);
        if above(a, limit) {
            check.k_required = Some(k_min);
            check.sight_length = sight_length;
            check.comfort_length = comfort;
            check.length_required = governing.max(min_length);
            push(
                FindingCode::BreakNeedsCurve,
                format!(
                    "{where_}: a grade break of A = {a:.3} % with no curve is more than the largest break \
                     left without a curve ({limit:.2} %); a {name} curve needs L ≥ {:.2} {len} \
                     (K ≥ {k_min:.1} {ks})",
                    check.length_required
                ),
            );
        } else {
            push(
                FindingCode::BreakNoCurve,
                format!(
                    "{where_}: grade break of A = {a:.3} % left without a curve (allowed up to {limit:.2} %); \
                     its sight distance is checked along the profile"
                ),
            );
        }
        return check;
    }
    let k = curve.k().unwrap_or(0.0);
    let k_overall = curve.k_overall().unwrap_or(0.0);
    let length = curve.length();
    check.k_required = Some(k_min);
    check.sight_length = sight_length;
    check.comfort_length = comfort;
    check.length_required = total_for(governing).max(min_length);
    // How the curve is described: its total length and, when unequal, both K.
    let (shape, k_text) = if factor > 1.0 {
        (
            format!(
                "unequal-tangent {name} curve, L = {length:.2} {len} ({:.2} back + {:.2} ahead)",
                curve.length_in, curve.length_out
            ),
            format!("K = {k:.1} {ks} on its sharper branch (L/A = {k_overall:.1} {ks})"),
        )
    } else {
        (format!("{name} curve, L = {length:.2} {len}"), format!("K = L/A = {k:.1} {ks}"))
    };
    let needs = |equivalent: f64| {
        if factor > 1.0 {
            format!(
                "needs L ≥ {:.2} {len} in all at this {:.2}:{:.2} ratio (or {equivalent:.2} {len} made symmetric)",
                total_for(equivalent),
                curve.length_in,
                curve.length_out
            )
        } else {
            format!("needs L ≥ {equivalent:.2} {len}")
        }
    };
    let k_code = if curve.kind == CurveKind::Crest { FindingCode::CrestKMin } else { FindingCode::SagKMin };
    if below(k, k_min) {
        push(
            k_code,
            format!(
                "{where_}: {shape}: {k_text} is below the minimum {k_min:.1} {ks} (A = {a:.3} %); {}",
                needs(k_min * a)
            ),
        );
    }
    // The curve's equal-tangent equivalent (K·A) against the exact formulas.
    let equivalent = k * a;
    if sight_length > 0.0 && below(equivalent, sight_length) {
        let measured = if factor > 1.0 {
            format!("its sharper branch is as sharp as an equal-tangent {equivalent:.2} {len} curve")
        } else {
            format!("{length:.2} {len} is shorter than {sight_length:.2} {len}")
        };
        push(
            sight_code,
            format!(
                "{where_}: {shape}: {measured}, for SSD {ssd:.0} {len} ({formula}, A = {a:.3} %); {}",
                needs(sight_length)
            ),
        );
    }
    if let Some(comfort) = comfort
        && below(equivalent, comfort)
    {
        let accel = criteria.get(CriterionId::ComfortAcceleration);
        let why = match criteria.sag_rule() {
            SagRule::Comfort => "the sag rule of a lit road",
            SagRule::Headlight => "checked as asked",
        };
        push(
            FindingCode::SagComfortLength,
            format!(
                "{where_}: {shape}: shorter than the comfort length {comfort:.2} {len} ({why}; \
                 L = A·V²/D, a = {accel} {}); {}",
                units.acceleration_symbol(),
                needs(comfort)
            ),
        );
    }
    if below(length, min_length) {
        push(
            FindingCode::CurveMinLength,
            format!(
                "{where_}: curve length {length:.2} {len} is below the minimum length {min_length:.2} {len} ({})",
                criteria.entry(CriterionId::MinCurveLength).map_or("", |e| e.rule.as_str())
            ),
        );
    }
    let drainage = criteria.get(CriterionId::DrainageK);
    if let Some((station, elevation)) = curve.turning
        && above(k_overall, drainage)
    {
        push(
            FindingCode::DrainageFlatCurve,
            format!(
                "{where_}: K = {k_overall:.1} {ks} is above {drainage:.0} {ks} with a level point at {} \
                 (elevation {elevation:.3}); check drainage near the level point",
                label(at, station)
            ),
        );
    }
    check
}
