//! The sight distance along the profile: computed whole or a stretch at a
//! time, and each stretch where it falls short made a finding.

use super::blame::{Limit, blocking_pvi};
use super::label;
use crate::visibility::{Direction, Road, SightProfile, sight_profile, stations_every};
use crate::{Alignment, CriterionId, CurveKind, Finding, FindingCode, Profile, ResolvedCriteria, Station};

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
    Some(sight_in_force(alignment, criteria, &stations, |_| {}))
}

/// The sight distance at `stations` (sorted) under the criteria in force
/// at each eye: the project's setup and requirement, or, with criteria
/// ranges, each run of stations under its own (the headlight check and the
/// SSD of its design speed), every run looking as far as the farthest cap
/// so that one cap reads the whole profile. `adjust` changes each setup
/// (the fit looks at daylight or headlights only).
pub fn sight_in_force(
    alignment: &Alignment,
    criteria: &ResolvedCriteria,
    stations: &[f64],
    adjust: impl Fn(&mut crate::visibility::SightSetup),
) -> SightProfile {
    if !criteria.has_ranges() {
        let mut setup = criteria.sight_setup();
        adjust(&mut setup);
        return sight_profile(alignment, &setup, criteria.sight_requirement(), stations);
    }
    let cap = criteria
        .ranges
        .iter()
        .map(|r| r.criteria.get(CriterionId::SightCap))
        .fold(criteria.get(CriterionId::SightCap), f64::max);
    let zone_of = |s: f64| criteria.at(s).1.map(|r| r.index);
    let mut samples = Vec::with_capacity(stations.len());
    let mut k = 0;
    while let Some(&first) = stations.get(k) {
        let zone = zone_of(first);
        let run = stations.get(k..).unwrap_or(&[]).iter().take_while(|&&s| zone_of(s) == zone).count().max(1);
        let (c, _) = criteria.at(first);
        let mut setup = c.sight_setup();
        setup.cap = cap;
        adjust(&mut setup);
        let part = stations.get(k..k + run).unwrap_or(&[]);
        samples.extend(sight_profile(alignment, &setup, c.sight_requirement(), part).samples);
        k += run;
    }
    SightProfile { samples, cap }
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
    on_each_stretch(profile, criteria, pvis_each, |sight, _, _| each(sight))
}

/// [`sight_by_stretch`], handing over with each stretch's samples the road
/// they were computed on and the index of its first PVI in `profile`.
pub(super) fn on_each_stretch<E>(
    profile: &Profile,
    criteria: &ResolvedCriteria,
    pvis_each: usize,
    mut each: impl FnMut(&SightProfile, &Alignment, usize) -> Result<(), E>,
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
        let (offset, part) =
            profile.part_at(stretch.from - beyond, stretch.to + beyond, stretch.first..=stretch.last);
        let Ok(alignment) = Alignment::new(&part) else { return Ok(Streamed::Problems) };
        let sight = if criteria.has_ranges() {
            sight_in_force(&alignment, criteria, &stations, |_| {})
        } else {
            sight_profile(&alignment, &setup, requirement, &stations)
        };
        each(&sight, &alignment, offset)?;
    }
    Ok(Streamed::Done)
}

/// Shortfalls from which their findings are made on every core (below it a
/// thread costs more than it saves).
const PARALLEL_SHORTFALLS: usize = 2_000;

/// What a shortfall is charged to, found on the road around its worst eye:
/// whether the headlight governs there, and the PVI (and its words) whose
/// curve limits the sight.
#[derive(Clone, Debug, PartialEq)]
pub(super) struct Blame {
    headlight: bool,
    pvi: Option<usize>,
    words: String,
    /// The criteria range the worst eye was judged under, in words.
    judged: Option<String>,
}

/// Words shortfalls into findings on one built road: the whole profile's,
/// or a stretch's part whose first PVI is PVI `offset` of the whole.
pub(super) struct Wording<'a> {
    alignment: &'a Alignment,
    roads: [Road; 2],
    setup: crate::visibility::SightSetup,
    criteria: &'a ResolvedCriteria,
    offset: usize,
}

impl<'a> Wording<'a> {
    pub(super) fn new(alignment: &'a Alignment, criteria: &'a ResolvedCriteria, offset: usize) -> Self {
        Self {
            alignment,
            roads: [Road::new(alignment, Direction::Forward), Road::new(alignment, Direction::Backward)],
            setup: criteria.sight_setup(),
            criteria,
            offset,
        }
    }

    /// What limits the sight at the shortfall's worst eye (on this road,
    /// which must hold that eye and all it looks at).
    pub(super) fn blame(&self, short: &crate::visibility::Shortfall) -> Blame {
        let (road, at) = match short.direction {
            Direction::Forward => (&self.roads[0], short.worst),
            Direction::Backward => (&self.roads[1], -short.worst),
        };
        // The setup the worst eye was judged under (a criteria range's
        // lighting), looking as far as the profile's sight was computed.
        let (zone, range) = self.criteria.at(short.worst);
        let zoned = range.map(|_| {
            let mut s = zone.sight_setup();
            s.cap = self.setup.cap.max(s.cap);
            s
        });
        let setup = zoned.as_ref().unwrap_or(&self.setup);
        let judged = range.map(|r| r.words(self.alignment.stationing()));
        let (day, horizon) = road.daylight_and_horizon(at, setup);
        let beam = if setup.headlights { road.headlight(at, setup) } else { f64::INFINITY };
        let headlight = beam < day;
        let limit = if headlight { Limit::Beam(beam) } else { Limit::Horizon(horizon) };
        let alignment = self.alignment;
        let local = blocking_pvi(alignment, short.direction, short.worst, limit);
        let words = local
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
                format!(
                    "; limited by {what} at PVI {} ({})",
                    i + self.offset + 1,
                    label(alignment.stationing(), p.station)
                )
            })
            .unwrap_or_default();
        Blame { headlight, pvi: local.map(|i| i + self.offset), words, judged }
    }

    /// The finding of a shortfall charged as `blame` says.
    pub(super) fn finding(
        at: crate::Stationing<'_>,
        short: &crate::visibility::Shortfall,
        blame: &Blame,
    ) -> Finding {
        let len = at.units.length_symbol();
        let way = match short.direction {
            Direction::Forward => "forward (increasing stations)",
            Direction::Backward => "backward (decreasing stations)",
        };
        let governs = if blame.headlight {
            "headlight sight distance (sag, at night)"
        } else {
            "daylight sight distance over the crest"
        };
        Finding::new(
            match short.direction {
                Direction::Forward => FindingCode::SightForward,
                Direction::Backward => FindingCode::SightBackward,
            },
            (Station(short.start), Station(short.end)),
            blame.pvi,
            format!(
                "Travelling {way}, the {governs} available from {} to {} is less than the {:.1} {len} needed; \
                 worst at {}: {:.1} {len} available{}{}",
                label(at, Station(short.start)),
                label(at, Station(short.end)),
                short.required,
                label(at, Station(short.worst)),
                short.available,
                blame.words,
                blame.judged.as_ref().map_or_else(String::new, |j| format!(" [judged under {j}]"))
            ),
        )
    }

    /// The finding of a shortfall whose worst eye is on this road.
    pub(super) fn word(&self, short: &crate::visibility::Shortfall) -> Finding {
        Self::finding(self.alignment.stationing(), short, &self.blame(short))
    }
}

pub(super) fn check_sight(
    alignment: &Alignment,
    criteria: &ResolvedCriteria,
    sight: &SightProfile,
    reuse: super::Reuse<'_>,
    findings: &mut Vec<Finding>,
) -> Vec<(crate::visibility::Shortfall, Finding)> {
    let (forget, reuse) = (reuse.forget, reuse.sight);
    let wording = Wording::new(alignment, criteria, 0);
    let fresh = |short: &crate::visibility::Shortfall| wording.word(short);
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
    if forget {
        findings.extend(made.into_iter().map(|(_, f)| f));
        return Vec::new();
    }
    findings.extend(made.iter().map(|(_, f)| f.clone()));
    made
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::Units;

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
        let made = check_sight(&alignment, &criteria, &sight, crate::checks::Reuse::default(), &mut together);
        let nothing = |_: &crate::visibility::Shortfall| None;
        let reuse = crate::checks::Reuse { sight: Some(&nothing), ..crate::checks::Reuse::default() };
        let one_by_one = check_sight(&alignment, &criteria, &sight, reuse, &mut alone);
        assert!(made.len() > PARALLEL_SHORTFALLS, "{}", made.len());
        assert_eq!(made, one_by_one);
        assert_eq!(together, alone);
        // Kept for nothing, the findings are the same.
        let mut once = Vec::new();
        let forget = crate::checks::Reuse { forget: true, ..crate::checks::Reuse::default() };
        assert!(check_sight(&alignment, &criteria, &sight, forget, &mut once).is_empty());
        assert_eq!(once, together);
    }
}
