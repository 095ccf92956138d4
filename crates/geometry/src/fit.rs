//! "Lengthen to clear": the shortest curve length, rounded up to an
//! increment, that meets every criterion that applies to a curve — minimum
//! K, the exact sight-distance length, sag comfort when on, the minimum
//! length, and the sight distance actually available over the profile —
//! without overlapping its neighbours.

use crate::tolerance::{above, below};
use crate::visibility::{Direction, SightProfile, grid_between};
use crate::{
    Alignment, ControlPoint, ControlStatus, CriterionId, CurveGeometry, CurveKind, Increment,
    MAX_SIGHT_STATIONS, Profile, ResolvedCriteria, Undercrossing, check_controls, undercrossing,
};

/// What happened to one curve.
#[derive(Clone, Debug, PartialEq)]
pub struct FitOutcome {
    /// The PVI (0-based).
    pub index: usize,
    /// Length before.
    pub old_length: f64,
    /// Length after (equal to `old_length` when nothing changed).
    pub new_length: f64,
    /// Whether the curve now meets every criterion.
    pub cleared: bool,
    /// What was done or why not, with the numbers.
    pub message: String,
}

/// Lengthens each curve at `targets` (PVI indices) to the shortest length, a
/// multiple of `increment`, that clears it; curves are taken in station order
/// and each fit sees the ones before it. A curve that cannot clear without
/// overlapping a neighbour is left as it was, and the outcome says by how much
/// it falls short. A length that would make the profile miss a control
/// point it met is never taken: the curve is left as it was and the outcome
/// names the point. Returns the new profile and one outcome per target.
pub fn lengthen_to_clear(
    profile: &Profile,
    criteria: &ResolvedCriteria,
    controls: &[ControlPoint],
    targets: &[usize],
    increment: f64,
) -> (Profile, Vec<FitOutcome>) {
    let mut profile = profile.clone();
    let mut targets: Vec<usize> = targets.to_vec();
    targets.sort_unstable();
    targets.dedup();
    let increment = Increment::new(increment);
    let run = Run::new(&profile, criteria, controls);
    let mut outcomes = Vec::new();
    for index in targets {
        let outcome = fit_one(&mut profile, &run, index, increment);
        outcomes.push(outcome);
    }
    (profile, outcomes)
}

/// What every fit of one run shares. A curve's length changes neither the
/// grades nor the PVIs, so what they decide is found once, and each fit
/// looks only at the stretch its curve can reach: the run is linear in the
/// number of curves, not quadratic.
struct Run<'a> {
    criteria: &'a ResolvedCriteria,
    controls: &'a [ControlPoint],
    /// Whether the profile had no problem when the run began (a fit keeps
    /// it so: a length that makes one is never taken).
    clean: bool,
    /// The furthest from a curve an eye can be held up by it ([`reach`]).
    reach: f64,
    /// How far beyond the eyes the road is looked at: the cap, or the
    /// longest braking stretch when that is longer. `None` when no bound
    /// exists (a grade too steep to stop on): the whole profile is used.
    beyond: Option<f64>,
    /// Where the whole profile starts and ends: the sight stations are its
    /// grid even when only part of it is built.
    span: (f64, f64),
}

impl<'a> Run<'a> {
    fn new(profile: &Profile, criteria: &'a ResolvedCriteria, controls: &'a [ControlPoint]) -> Self {
        // The farthest any criteria in force looks (a faster range's).
        let steepest = profile.steepest_grade_percent();
        let zones = std::iter::once(criteria).chain(criteria.ranges.iter().map(|r| &r.criteria));
        let (cap, ahead) = zones.fold((0.0_f64, 0.0_f64), |(cap, ahead), c| {
            (cap.max(c.get(CriterionId::SightCap)), ahead.max(c.sight_requirement().look_ahead(steepest)))
        });
        let beyond = (ahead.is_finite() && cap.is_finite()).then(|| cap.max(ahead));
        Self {
            criteria,
            controls,
            clean: profile.problems().is_empty(),
            reach: reach(profile, criteria),
            beyond,
            span: (profile.start().map_or(f64::NAN, |s| s.0), profile.end().map_or(f64::NAN, |s| s.0)),
        }
    }
}

fn label(at: crate::Stationing<'_>, s: f64) -> String {
    at.label_std(s)
}

/// The control points a change of the curve at `index` can move: those
/// between its neighbouring PVIs (no other elevation changes).
fn controls_near(profile: &Profile, controls: &[ControlPoint], index: usize) -> Vec<usize> {
    let at = |i: usize| profile.pvis.get(i).map(|p| p.station.0);
    let (Some(lo), Some(hi)) = (index.checked_sub(1).and_then(at), at(index + 1)) else { return Vec::new() };
    (0..controls.len())
        .filter(|&i| controls.get(i).is_some_and(|c| c.station >= lo && c.station <= hi))
        .collect()
}

/// The status of the control points `near` (indices into all of them),
/// from the stretch of the profile around `index` that holds them.
fn near_status(profile: &Profile, run: &Run<'_>, index: usize, near: &[usize]) -> Option<Vec<ControlStatus>> {
    let points: Vec<ControlPoint> = near.iter().filter_map(|&i| run.controls.get(i).cloned()).collect();
    let lo = points.iter().map(|c| c.station).fold(f64::INFINITY, f64::min);
    let hi = points.iter().map(|c| c.station).fold(f64::NEG_INFINITY, f64::max);
    let alignment = Alignment::new(&profile.part(lo, hi, index.saturating_sub(1)..=index + 1)).ok()?;
    Some(check_controls(&alignment, &points))
}

/// Which of the control points `near` the profile meets.
fn met_controls(profile: &Profile, run: &Run<'_>, index: usize, near: &[usize]) -> Vec<bool> {
    if near.is_empty() {
        return Vec::new();
    }
    near_status(profile, run, index, near).map_or_else(
        || vec![false; near.len()],
        |status| status.iter().map(|s| matches!(s, ControlStatus::Met(_))).collect(),
    )
}

/// The first control point met before (`met`, one per point `near`) that
/// `profile` misses, with the amount: its index among all control points.
fn broken_control(
    profile: &Profile,
    run: &Run<'_>,
    index: usize,
    near: &[usize],
    met: &[bool],
) -> Option<(usize, f64)> {
    if !met.contains(&true) {
        return None;
    }
    let status = near_status(profile, run, index, near)?;
    status.iter().zip(met).zip(near).find_map(|((s, &was), &i)| match s {
        ControlStatus::Missed(_, miss) if was => Some((i, *miss)),
        _ => None,
    })
}

fn fit_one(profile: &mut Profile, run: &Run<'_>, index: usize, increment: Increment) -> FitOutcome {
    let (criteria, controls) = (run.criteria, run.controls);
    let units = profile.units;
    let len = units.length_symbol();
    let old_length = profile.pvis.get(index).map_or(0.0, |p| p.curve.length());
    let mut outcome =
        FitOutcome { index, old_length, new_length: old_length, cleared: false, message: String::new() };
    let name = format!("PVI {}", index + 1);
    let (Some(max_length), Some(original)) = (profile.curve_room(index), profile.pvis.get(index).copied())
    else {
        outcome.message = format!("{name}: the first and last PVI carry no curve");
        return outcome;
    };
    let Some(curve) = geometry_at(profile, index) else {
        outcome.message = format!("{name}: the profile has problems to fix first");
        return outcome;
    };
    if curve.kind == CurveKind::None {
        outcome.cleared = true;
        outcome.message = format!("{name}: no grade change, no curve needed");
        return outcome;
    }
    if let Some(reason) = sight_refused(profile, run, index) {
        outcome.message = format!("{name}: {reason}; unchanged");
        return outcome;
    }
    if clears(profile, run, index) {
        outcome.cleared = true;
        outcome.message = format!("{name}: already clears every criterion at {old_length:.2} {len}");
        return outcome;
    }
    // The curve criteria give a first length; the sight distance over the
    // actual profile may ask for more (neighbouring curves), and so may the
    // sight under a structure, which changes with the length (a longer sag
    // raises the road under it): each length is judged as it stands.
    // The required length is already the total for this curve's l1:l2 ratio.
    let mut scratch = Vec::new();
    let check = crate::checks::check_curve_in_force(&curve, criteria, profile.stationing(), &mut scratch);
    let asked = check.length_required.max(check.min_length);
    let needed = asked.max(old_length);
    let needs = increment.up(needed);
    let fits = increment.down(max_length);
    let at = label(profile.stationing(), original.station.0);
    if let Some(under) =
        undercrossing_conflict(profile, run, index, increment, (increment.up(asked), needs, fits))
    {
        outcome.message = format!("{name} ({at}): {under}; unchanged");
        return outcome;
    }
    let mut length = needs;
    let steps_limit = 400;
    let near = controls_near(profile, controls, index);
    let met = met_controls(profile, run, index, &near);
    for _ in 0..steps_limit {
        if above(length, max_length) {
            break;
        }
        set_length(profile, index, length);
        if let Some((c, miss)) = broken_control(profile, run, index, &near, &met) {
            if let Some(p) = profile.pvis.get_mut(index) {
                *p = original;
            }
            let title = controls.get(c).map_or_else(String::new, |p| p.title(c));
            outcome.message = format!(
                "{name}: a length of {} {len} would miss {title} by {miss:.3} {len}; unchanged \
                 (move the PVI or the grades instead)",
                increment.text(length)
            );
            return outcome;
        }
        if clears(profile, run, index) {
            outcome.new_length = length;
            outcome.cleared = true;
            outcome.message = format!("{name}: lengthened from {old_length:.2} {len} to {length:.2} {len}");
            return outcome;
        }
        length = increment.after(length);
    }
    if let Some(p) = profile.pvis.get_mut(index) {
        *p = original;
    }
    let what = |v: f64| format!("{} {len}", increment.text(v));
    outcome.message = if needs > max_length {
        format!(
            "{name} ({at}): needs {}, at most {} fits between its neighbours ({max_length:.2} {len} of room); unchanged",
            what(needs),
            what(fits)
        )
    } else {
        format!(
            "{name} ({at}): no length up to the {} that fits clears the sight distance \
             (neighbouring curves limit it); unchanged",
            what(fits)
        )
    };
    outcome
}

/// What sight under a structure asks of the curve at `index` when it is
/// `length` long: the first control point it is not met for, if any.
fn unmet_undercrossing(profile: &Profile, run: &Run<'_>, index: usize) -> Option<Undercrossing> {
    let curve = geometry_at(profile, index)?;
    controls_near(profile, run.controls, index).into_iter().find_map(|i| {
        let u = undercrossing(&curve, i, run.controls.get(i)?, run.criteria)?;
        (!u.met_by(curve.length())).then_some(u)
    })
}

/// When sight under a structure is met by no length of the curve at
/// `index` from `from` (what the curve criteria ask, or its length now when
/// longer: the fit only lengthens) to `fits` (the longest that fits): what
/// the criteria ask (`asked`, at the increment), where sight under it is
/// met, and that no length meets both.
fn undercrossing_conflict(
    profile: &Profile,
    run: &Run<'_>,
    index: usize,
    increment: Increment,
    (asked, from, fits): (f64, f64, f64),
) -> Option<String> {
    // Only a structure over this curve can conflict (and the profile is
    // copied only then: a copy per curve made a long fit quadratic).
    if controls_near(profile, run.controls, index).is_empty() {
        return None;
    }
    let mut probe = profile.clone();
    set_length(&mut probe, index, asked.min(fits));
    let unmet = unmet_undercrossing(&probe, run, index)?;
    let control = run.controls.get(unmet.control)?;
    let len = profile.units.length_symbol();
    let title = run.controls.get(unmet.control).map_or_else(String::new, |c| c.title(unmet.control));
    // The lengths at the increment sight under it is met for.
    let mut met = Vec::new();
    let mut length = increment.up(increment.step());
    while !above(length, fits) && met.len() < 100_000 {
        set_length(&mut probe, index, length);
        let under = geometry_at(&probe, index)
            .and_then(|curve| undercrossing(&curve, unmet.control, control, run.criteria));
        // Where the structure is off the curve, the sight line under it is
        // not limited by the sag.
        if under.is_none_or(|u| u.met_by(length)) {
            met.push(length);
        }
        length = increment.after(length);
    }
    if met.iter().any(|&l| !below(l, from)) {
        // A length the curve criteria allow meets it too: stepping finds it.
        return None;
    }
    let at = increment.text(asked.min(fits));
    let need = if unmet.needed.is_finite() {
        format!("it needs {:.2} {len}", unmet.needed)
    } else {
        "the clearance leaves no sight line".to_owned()
    };
    let window = match (met.first(), met.last()) {
        (Some(&lo), Some(hi)) if lo <= increment.step() => {
            format!("sight under {title} is met only for L up to {} {len}", increment.text(*hi))
        }
        (Some(lo), Some(hi)) => format!(
            "sight under {title} is met only for L from {} to {} {len}",
            increment.text(*lo),
            increment.text(*hi)
        ),
        _ => format!("sight under {title} is met by no length that fits"),
    };
    let longer = if from > asked {
        format!(" (the curve is {} {len} now and is never shortened here)", increment.text(from))
    } else {
        String::new()
    };
    Some(format!(
        "the curve criteria need L ≥ {} {len}{longer}; {window} (at {at} {len} {need}): no length meets both; \
         move the PVI or raise the structure",
        increment.text(asked)
    ))
}

fn set_length(profile: &mut Profile, index: usize, length: f64) {
    if let Some(p) = profile.pvis.get_mut(index) {
        p.curve = p.curve.with_length(length);
    }
}

fn geometry_at(profile: &Profile, index: usize) -> Option<CurveGeometry> {
    let (a, b, c) =
        (profile.pvis.get(index.checked_sub(1)?)?, profile.pvis.get(index)?, profile.pvis.get(index + 1)?);
    Some(CurveGeometry::new(index, a, b, c))
}

/// How far from a curve an eye can still be held up by it: the largest
/// sight distance any station of the profile can require.
fn reach(profile: &Profile, criteria: &ResolvedCriteria) -> f64 {
    // The farthest of the criteria in force along the road.
    std::iter::once(criteria).chain(criteria.ranges.iter().map(|r| &r.criteria)).fold(0.0, |most, c| {
        let ssd = c.get(CriterionId::StoppingSightDistance);
        let largest = c.largest_requirement(profile.steepest_grade_percent());
        let cap = c.get(CriterionId::SightCap);
        most.max(if largest.is_finite() { largest.max(ssd).min(cap.max(ssd)) } else { cap.max(ssd) })
    })
}

/// The eye stations around the curve at `index` that can see onto it.
fn window(profile: &Profile, run: &Run<'_>, curve: &CurveGeometry) -> (f64, f64) {
    let length = (profile.pvis.get(curve.index + 1).map_or(curve.pvt.0, |p| p.station.0)
        - profile.pvis.get(curve.index.wrapping_sub(1)).map_or(curve.pvc.0, |p| p.station.0))
    .max(0.0);
    // The curve can grow to the neighbouring PVIs: look that far too.
    (curve.pvi.0 - length - run.reach, curve.pvi.0 + length + run.reach)
}

/// Why the sight distance around the curve at `index` would not be computed
/// (too many stations at the step in force), if so.
fn sight_refused(profile: &Profile, run: &Run<'_>, index: usize) -> Option<String> {
    let curve = geometry_at(profile, index)?;
    let (lo, hi) = window(profile, run, &curve);
    let step = run.criteria.get(CriterionId::SightStep);
    let count = (hi - lo) / step;
    (count.is_nan() || count > MAX_SIGHT_STATIONS).then(|| {
        format!(
            "the sight distance was not checked: a step of {step} {} would need more than {MAX_SIGHT_STATIONS} \
             stations",
            profile.units.length_symbol()
        )
    })
}

/// Whether the curve at `index` meets the curve criteria (minimum length
/// included) and the available sight distance around it.
fn clears(profile: &Profile, run: &Run<'_>, index: usize) -> bool {
    let criteria = run.criteria;
    if !run.clean {
        return false;
    }
    let Some(curve) = geometry_at(profile, index) else { return false };
    let mut findings = Vec::new();
    let check = crate::checks::check_curve_in_force(&curve, criteria, profile.stationing(), &mut findings);
    if !check.ok
        || below(curve.length(), check.min_length)
        || unmet_undercrossing(profile, run, index).is_some()
    {
        return false;
    }
    let step = criteria.get(CriterionId::SightStep);
    // Eyes that can see onto the curve: up to the largest requirement before
    // it travelling forward, and after it travelling backward.
    let (lo, hi) = (curve.pvc.0 - run.reach, curve.pvt.0 + run.reach);
    // Only the stretch those eyes look at is built (they look `beyond` at
    // most; one step more to be safe). Its problems are the whole profile's
    // there, and the rest of the profile was clean.
    let local = match run.beyond {
        Some(beyond) => {
            profile.part(lo - beyond - step, hi + beyond + step, index.saturating_sub(1)..=index + 1)
        }
        None => profile.clone(),
    };
    let Ok(alignment) = Alignment::new(&local) else { return false };
    let stations = grid_between(run.span.0, run.span.1, step, lo, hi);
    // A crest limits daylight sight distance and a sag headlight sight
    // distance; only the kind this curve can cause counts against it.
    let kind = curve.kind;
    if kind == CurveKind::None {
        return true;
    }
    let only = move |setup: &mut crate::visibility::SightSetup| match kind {
        CurveKind::Crest => setup.headlights = false,
        _ => setup.daylight = false,
    };
    let mut setup = criteria.sight_setup();
    only(&mut setup);
    if !setup.daylight && !setup.headlights && !criteria.has_ranges() {
        return true;
    }
    let sight: SightProfile = crate::checks::sight_in_force(&alignment, criteria, &stations, only);
    sight.shortfalls().iter().all(|s| {
        // Only shortfalls looking onto this curve count against it.
        match s.direction {
            Direction::Forward => s.worst > curve.pvt.0,
            Direction::Backward => s.worst < curve.pvc.0,
        }
    })
}

/// The curve a new interior PVI at `index` starts with: the shortest length
/// that meets the curve criteria for the grades it makes (the minimum length
/// when the grades are equal), rounded up to `increment`, and no longer than
/// the room its neighbours leave. `None` when no curve fits or the PVI is an
/// end. The second value says which rule set the length.
pub fn default_curve_length(
    profile: &Profile,
    criteria: &ResolvedCriteria,
    index: usize,
    increment: f64,
) -> Option<(f64, &'static str)> {
    let mut probe = profile.clone();
    set_length(&mut probe, index, 0.0);
    let curve = geometry_at(&probe, index)?;
    let room = probe.curve_room(index)?;
    let increment = Increment::new(increment);
    let min_length = criteria.get(CriterionId::MinCurveLength);
    let (needed, rule) = if curve.kind == CurveKind::None {
        (min_length, "the minimum length")
    } else {
        let mut scratch = Vec::new();
        // As a curve (not a bare break), so K and the sight formulas apply.
        set_length(&mut probe, index, increment.step());
        let curve = geometry_at(&probe, index)?;
        let check = crate::checks::check_curve_in_force(&curve, criteria, probe.stationing(), &mut scratch);
        (check.length_required.max(min_length), "the shortest length that meets the criteria")
    };
    let length = increment.up(needed.max(increment.step()));
    (length <= room && length > 0.0).then_some((length, rule))
}
