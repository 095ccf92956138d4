//! Checks of a profile against resolved criteria: a list of structured findings.

use crate::tolerance::{above, below};
use crate::visibility::{Direction, Road, SightProfile, sight_profile, stations_every};
use crate::{
    Alignment, CriterionId, CurveGeometry, CurveKind, Finding, FindingCode, Profile, ProfileProblem,
    ResolvedCriteria, SagRule, Severity, Station, Units, interior_curves, sight,
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

/// The most stations the sight distance is computed at (a 500 km profile at
/// 1 m, or a step too small for the profile, is refused rather than run for
/// minutes).
pub const MAX_SIGHT_STATIONS: f64 = 5.0e6;

/// Available and required sight distance of `alignment` at the criteria's
/// step; `None` when that would take more than [`MAX_SIGHT_STATIONS`].
pub fn compute_sight(alignment: &Alignment, criteria: &ResolvedCriteria) -> Option<SightProfile> {
    let step = criteria.get(CriterionId::SightStep);
    let count = (alignment.end() - alignment.start()) / step;
    if count.is_nan() || count > MAX_SIGHT_STATIONS {
        return None;
    }
    let stations = stations_every(alignment, step);
    Some(sight_profile(alignment, &criteria.sight_setup(), criteria.sight_requirement(), &stations))
}

/// PVIs per stretch when a long profile's sight distance is computed one
/// stretch at a time ([`sight_by_stretch`]).
pub const PVIS_PER_STRETCH: usize = 2048;

/// What [`sight_by_stretch`] did.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Streamed {
    /// Every station was handed over.
    Done,
    /// Nothing was: the stations would pass [`MAX_SIGHT_STATIONS`].
    TooManyStations,
    /// Nothing was: the profile has problems ([`Profile::problems`]).
    Problems,
}

/// [`compute_sight`] for a profile too long to hold at once: the samples, in
/// station order, handed to `each` one stretch of `pvis_each` PVIs at a time.
/// Each stretch is built from the PVIs around it ([`Profile::part`]), wide
/// enough for every eye in it to look as far as the cap and to brake as far
/// as the longest requirement the grades allow, so the samples are the
/// whole profile's, bit for bit, in memory that does not grow with it.
///
/// # Errors
/// The first error `each` returns (nothing more is computed).
pub fn sight_by_stretch<E>(
    profile: &Profile,
    criteria: &ResolvedCriteria,
    pvis_each: usize,
    mut each: impl FnMut(&SightProfile) -> Result<(), E>,
) -> Result<Streamed, E> {
    if !profile.problems().is_empty() {
        return Ok(Streamed::Problems);
    }
    let (Some(start), Some(end)) = (profile.start(), profile.end()) else { return Ok(Streamed::Problems) };
    let (start, end) = (start.0, end.0);
    let step = criteria.get(CriterionId::SightStep);
    let count = (end - start) / step;
    if count.is_nan() || count > MAX_SIGHT_STATIONS {
        return Ok(Streamed::TooManyStations);
    }
    let setup = criteria.sight_setup();
    let requirement = criteria.sight_requirement();
    let steepest = profile.steepest_grade_percent();
    // How far around its eyes a stretch must be built: the cap, or the
    // longest braking stretch; without a bound, the whole profile at once.
    let beyond = setup.cap.max(requirement.look_ahead(steepest)) + step;
    let pvis_each = if beyond.is_finite() { pvis_each } else { profile.pvis.len() };
    for stretch in profile.stretches(pvis_each) {
        let stations: Vec<f64> = crate::visibility::grid_between(start, end, step, stretch.from, stretch.to)
            .into_iter()
            .filter(|&s| stretch.holds(s))
            .collect();
        if stations.is_empty() {
            continue;
        }
        let part = profile.part(stretch.from - beyond, stretch.to + beyond, stretch.first..=stretch.last);
        let Ok(alignment) = Alignment::new(&part) else { return Ok(Streamed::Problems) };
        each(&sight_profile(&alignment, &setup, requirement, &stations))?;
    }
    Ok(Streamed::Done)
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
            None => check_curve(&curve, criteria, &mut report.findings),
        };
        made.curves.push(start..report.findings.len());
        report.curves.push(check);
    }
    check_grades(profile, criteria, &mut report.findings);
    if problems.is_empty()
        && let Ok(alignment) = Alignment::new(profile)
    {
        match &sight {
            Some(sight) => {
                made.shortfalls = check_sight(&alignment, criteria, sight, reuse.sight, &mut report.findings);
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

fn label(units: Units, station: Station) -> String {
    station.label(units, units.station_decimals())
}

fn problem_finding(profile: &Profile, problem: &ProfileProblem) -> Finding {
    let units = profile.units;
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
    let at = pvi.map_or(String::new(), |_| format!(" (at {})", label(units, station)));
    Finding::new(problem.code(), (start, end), pvi, format!("{problem}{at}"))
}

/// Checks one curve against the curve criteria (K, sight-distance length,
/// comfort, minimum length, drainage), adding its findings to `findings`.
/// The `ok` of the result reflects these findings only.
pub fn check_curve(
    curve: &CurveGeometry,
    criteria: &ResolvedCriteria,
    findings: &mut Vec<Finding>,
) -> CurveCheck {
    let before = findings.len();
    let mut check = check_curve_inner(curve, criteria, findings);
    check.ok = !findings.iter().skip(before).any(Finding::fails);
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
    let where_ = format!("PVI {} ({})", curve.index + 1, label(units, curve.pvi));
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
                label(units, station)
            ),
        );
    }
    check
}

/// What limits the sight of one eye: the daylight distance's horizon (road
/// station), or the headlight distance when the beam governs.
#[derive(Clone, Copy)]
enum Limit {
    Horizon(Option<f64>),
    Beam(f64),
}

/// The PVI whose curve (or bare grade break) blocks the sight line of an eye
/// at profile station `eye` looking `direction`: for daylight, the curve the
/// line of sight touches (at the horizon); for headlights, the last sag
/// between the eye and where the beam meets the road. Falls back to the
/// nearest PVI.
fn blocking_pvi(alignment: &Alignment, direction: Direction, eye: f64, limit: Limit) -> Option<usize> {
    let to_profile = |u: f64| match direction {
        Direction::Forward => u,
        Direction::Backward => -u,
    };
    let at = to_profile(eye);
    let curves = alignment.curves();
    let span = |c: &CurveGeometry| {
        let slack = crate::tolerance::station_hair(c.pvi.0);
        (c.pvc.0 - slack, c.pvt.0 + slack)
    };
    // The curves are in station order and do not overlap (sight distance is
    // only checked on a profile without problems), so the few that can hold
    // the point are found by binary search, not by a scan per shortfall
    // (that made `check` quadratic in the number of PVIs).
    let touching = |lo: f64, hi: f64| {
        let from = curves.partition_point(|c| span(c).1 < lo);
        curves.get(from..).unwrap_or(&[]).iter().take_while(move |c| span(c).0 <= hi)
    };
    let found = match limit {
        Limit::Beam(distance) => {
            let hit = to_profile(at + distance);
            touching(eye.min(hit), eye.max(hit))
                .filter(|c| c.kind == CurveKind::Sag)
                .min_by(|x, y| (x.pvi.0 - hit).abs().total_cmp(&(y.pvi.0 - hit).abs()))
        }
        Limit::Horizon(horizon) => {
            horizon.map(to_profile).and_then(|u| touching(u, u).find(|c| c.kind == CurveKind::Crest))
        }
    };
    found.map(|c| c.index).or_else(|| nearest_pvi(alignment.pvis(), eye))
}

/// The PVI nearest `station` (the first of two as near), by binary search.
fn nearest_pvi(pvis: &[crate::Pvi], station: f64) -> Option<usize> {
    let i = pvis.partition_point(|p| p.station.0 < station);
    let distance = |k: usize| pvis.get(k).map(|p| (p.station.0 - station).abs());
    match (i.checked_sub(1).and_then(distance), distance(i)) {
        (Some(before), Some(after)) => Some(if before <= after { i - 1 } else { i }),
        (Some(_), None) => Some(i - 1),
        (None, Some(_)) => Some(i),
        (None, None) => None,
    }
}

/// Shortfalls from which their findings are made on every core (below it a
/// thread costs more than it saves).
const PARALLEL_SHORTFALLS: usize = 2_000;

fn check_sight(
    alignment: &Alignment,
    criteria: &ResolvedCriteria,
    sight: &SightProfile,
    reuse: Option<SightReuse<'_>>,
    findings: &mut Vec<Finding>,
) -> Vec<(crate::visibility::Shortfall, Finding)> {
    let units = criteria.units;
    let len = units.length_symbol();
    let setup = criteria.sight_setup();
    let roads = [Road::new(alignment, Direction::Forward), Road::new(alignment, Direction::Backward)];
    let fresh = |short: &crate::visibility::Shortfall| -> Finding {
        let (road, at, way) = match short.direction {
            Direction::Forward => (&roads[0], short.worst, "forward (increasing stations)"),
            Direction::Backward => (&roads[1], -short.worst, "backward (decreasing stations)"),
        };
        let (day, horizon) = road.daylight_and_horizon(at, &setup);
        let beam = if setup.headlights { road.headlight(at, &setup) } else { f64::INFINITY };
        let headlight = beam < day;
        let governs = if headlight {
            "headlight sight distance (sag, at night)"
        } else {
            "daylight sight distance over the crest"
        };
        let limit = if headlight { Limit::Beam(beam) } else { Limit::Horizon(horizon) };
        let pvi = blocking_pvi(alignment, short.direction, short.worst, limit);
        let blamed = pvi
            .and_then(|i| alignment.pvis().get(i).map(|p| (i, p)))
            .map(|(i, p)| {
                // `curves()[k]` is the curve at PVI k + 1: found directly,
                // not by a search per shortfall.
                let curve = i.checked_sub(1).and_then(|k| alignment.curves().get(k)).filter(|c| c.index == i);
                let what = match curve {
                    Some(c) if c.length() > 0.0 => format!("the {} curve", c.kind.key()),
                    Some(c) if c.kind != CurveKind::None => format!("the {} grade break", c.kind.key()),
                    _ => "the grade".to_owned(),
                };
                format!("; limited by {what} at PVI {} ({})", i + 1, label(units, p.station))
            })
            .unwrap_or_default();
        Finding::new(
            match short.direction {
                Direction::Forward => FindingCode::SightForward,
                Direction::Backward => FindingCode::SightBackward,
            },
            (Station(short.start), Station(short.end)),
            pvi,
            format!(
                "Travelling {way}, the {governs} available from {} to {} is less than the {:.1} {len} needed; \
                 worst at {}: {:.1} {len} available{blamed}",
                label(units, Station(short.start)),
                label(units, Station(short.end)),
                short.required,
                label(units, Station(short.worst)),
                short.available
            ),
        )
    };
    let shortfalls = sight.shortfalls();
    let made: Vec<(crate::visibility::Shortfall, Finding)> = match reuse {
        Some(reuse) => shortfalls
            .into_iter()
            .map(|short| {
                let finding = reuse(&short).unwrap_or_else(|| fresh(&short));
                (short, finding)
            })
            .collect(),
        // Checked afresh, each shortfall's finding stands alone: on every
        // core when there are many, in contiguous blocks, order kept.
        None => {
            let block =
                shortfalls.len().div_ceil(crate::visibility::cores().clamp(1, 16)).max(PARALLEL_SHORTFALLS);
            let make =
                |part: &[crate::visibility::Shortfall]| -> Vec<(crate::visibility::Shortfall, Finding)> {
                    part.iter().map(|short| (*short, fresh(short))).collect()
                };
            std::thread::scope(|scope| {
                let mut parts = shortfalls.chunks(block);
                let first = parts.next();
                let jobs: Vec<_> = parts.map(|part| (part, scope.spawn(move || make(part)))).collect();
                let mut made = first.map(make).unwrap_or_default();
                for (part, job) in jobs {
                    // A block whose thread failed is made again here: no
                    // finding may be lost.
                    made.extend(job.join().unwrap_or_else(|_| make(part)));
                }
                made
            })
        }
    };
    findings.extend(made.iter().map(|(_, f)| f.clone()));
    made
}

fn check_grades(profile: &Profile, criteria: &ResolvedCriteria, findings: &mut Vec<Finding>) {
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

#[cfg(test)]
mod tests {
    use super::*;
    use crate::Pvi;

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

    /// The findings of many shortfalls made on every core are those made one
    /// by one (the reuse path, given nothing to reuse), in the same order.
    #[test]
    fn shortfall_findings_made_on_every_core_are_those_made_one_by_one() {
        let profile = crate::synthetic::rolling_profile(Units::Metric, 4001, 80_000.0);
        let criteria = crate::Criteria { design_speed: Some(90.0), ..crate::Criteria::default() }
            .resolve(Units::Metric)
            .unwrap_or_else(|e| panic!("{e}"));
        let alignment = Alignment::new(&profile).unwrap_or_else(|e| panic!("{e:?}"));
        let sight = compute_sight(&alignment, &criteria).unwrap_or_else(|| panic!("stations"));
        let (mut together, mut alone) = (Vec::new(), Vec::new());
        let made = check_sight(&alignment, &criteria, &sight, None, &mut together);
        let nothing = |_: &crate::visibility::Shortfall| None;
        let one_by_one = check_sight(&alignment, &criteria, &sight, Some(&nothing), &mut alone);
        assert!(made.len() > PARALLEL_SHORTFALLS, "{}", made.len());
        assert_eq!(made, one_by_one);
        assert_eq!(together, alone);
    }
}
