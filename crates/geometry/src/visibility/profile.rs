//! Sight distance along a whole profile: available and required at every
//! station, both directions, on every core; kept up to date after an edit.

use super::{Direction, Requirement, Road, SightSetup};
use crate::Alignment;

/// Available and required sight distance at one station.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct SightSample {
    /// The station.
    pub station: f64,
    /// Available distance travelling forward (governing: daylight and headlight).
    pub forward: f64,
    /// Available distance travelling backward.
    pub backward: f64,
    /// Required stopping sight distance travelling forward.
    pub required_forward: f64,
    /// Required stopping sight distance travelling backward.
    pub required_backward: f64,
}

/// Sight distance along a whole profile.
#[derive(Clone, Debug, PartialEq)]
pub struct SightProfile {
    /// One sample per station, in station order.
    pub samples: Vec<SightSample>,
    /// The longest distance looked for: an available distance equal to it
    /// means "at least this much", not a measured distance.
    pub cap: f64,
}

/// Stations every `step` from the start, plus the end.
pub fn stations_every(alignment: &Alignment, step: f64) -> Vec<f64> {
    let (start, end) = (alignment.start().0, alignment.end().0);
    if step.is_nan() || step <= 0.0 || step.is_infinite() {
        return vec![start, end];
    }
    let n = ((end - start) / step).floor().clamp(0.0, 5.0e7);
    #[allow(clippy::cast_possible_truncation, clippy::cast_sign_loss)]
    let n = n as u64;
    #[allow(clippy::cast_precision_loss)]
    let mut stations: Vec<f64> = (0..=n).map(|k| start + k as f64 * step).filter(|s| *s <= end).collect();
    if stations.last().is_none_or(|s| end - s > crate::tolerance::ROUNDING_HAIR * step) {
        stations.push(end);
    }
    stations
}

/// The stations of [`stations_every`] for a profile running from `start` to
/// `end` that lie between `lo` and `hi`, made without listing the rest (at
/// most [`crate::MAX_SIGHT_STATIONS`]): the grid of a whole profile, when
/// only part of it is built.
pub fn grid_between(start: f64, end: f64, step: f64, lo: f64, hi: f64) -> Vec<f64> {
    if step.is_nan() || step <= 0.0 || step.is_infinite() {
        return [start, end].into_iter().filter(|s| *s >= lo && *s <= hi).collect();
    }
    let first = ((lo.max(start) - start) / step).ceil().max(0.0);
    let last = ((hi.min(end) - start) / step).floor().min(first + crate::MAX_SIGHT_STATIONS);
    let mut stations = Vec::new();
    let mut k = first;
    while k <= last {
        let s = start + k * step;
        if s <= end {
            stations.push(s);
        }
        k += 1.0;
    }
    if end >= lo
        && end <= hi
        && stations.last().is_none_or(|s| end - s > crate::tolerance::ROUNDING_HAIR * step)
    {
        stations.push(end);
    }
    stations
}

/// Computes available and required sight distance at `stations` (sorted),
/// on every core the machine has when there are enough stations to share.
/// Each station is computed on its own, so the result is the same, bit for
/// bit, as [`sight_profile_on`] with one thread.
pub fn sight_profile(
    alignment: &Alignment,
    setup: &SightSetup,
    requirement: Requirement,
    stations: &[f64],
) -> SightProfile {
    sight_profile_on(alignment, setup, requirement, stations, cores())
}

/// The cores this process may use, asked of the system once (the answer
/// can take reading files, and a fit computes sight distance thousands of
/// times).
pub(crate) fn cores() -> usize {
    static CORES: std::sync::OnceLock<usize> = std::sync::OnceLock::new();
    *CORES.get_or_init(|| std::thread::available_parallelism().map_or(1, std::num::NonZeroUsize::get))
}

/// [`sight_profile`] on at most `threads` threads (1: on the calling thread
/// only). Stations are shared out in contiguous blocks, one per thread.
pub fn sight_profile_on(
    alignment: &Alignment,
    setup: &SightSetup,
    requirement: Requirement,
    stations: &[f64],
    threads: usize,
) -> SightProfile {
    let roads = [Road::new(alignment, Direction::Forward), Road::new(alignment, Direction::Backward)];
    let threads = threads.clamp(1, MAX_THREADS).min(stations.len() / PARALLEL_STATIONS).max(1);
    let mut samples = vec![
        SightSample {
            station: f64::NAN,
            forward: f64::NAN,
            backward: f64::NAN,
            required_forward: f64::NAN,
            required_backward: f64::NAN,
        };
        stations.len()
    ];
    let fill = |out: &mut [SightSample], stations: &[f64]| {
        let [forward, backward] = &roads;
        let (mut ahead, mut behind) = (0, usize::MAX);
        for (sample, &s) in out.iter_mut().zip(stations) {
            *sample = SightSample {
                station: s,
                forward: forward.governing_near(&mut ahead, s, setup),
                backward: backward.governing_near(&mut behind, -s, setup),
                required_forward: requirement.on_road(forward, s),
                required_backward: requirement.on_road(backward, -s),
            };
        }
    };
    if threads == 1 {
        fill(&mut samples, stations);
    } else {
        let block = stations.len().div_ceil(threads);
        std::thread::scope(|scope| {
            let mut jobs = samples.chunks_mut(block).zip(stations.chunks(block));
            // The calling thread takes the first block itself.
            let first = jobs.next();
            for (out, part) in jobs {
                scope.spawn(move || fill(out, part));
            }
            if let Some((out, part)) = first {
                fill(out, part);
            }
        });
    }
    SightProfile { samples, cap: setup.cap }
}

/// The most threads one sight computation uses.
const MAX_THREADS: usize = 16;

/// A stretch where available sight distance falls short, one direction.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Shortfall {
    /// Direction of travel.
    pub direction: Direction,
    /// First failing station.
    pub start: f64,
    /// Last failing station.
    pub end: f64,
    /// Station with the largest shortfall.
    pub worst: f64,
    /// Available distance there.
    pub available: f64,
    /// Required distance there.
    pub required: f64,
}

/// Stations per thread below which a computation stays on one thread (a
/// thread costs more than it saves).
const PARALLEL_STATIONS: usize = 1_500;

impl SightProfile {
    /// After the road changed only between stations `lo` and `hi`: an eye
    /// travelling forward sees that stretch only from [lo − cap, hi], one
    /// travelling backward only from [lo, hi + cap]; only those are
    /// recomputed, each in its own direction (required distances follow).
    pub fn update_after_change(
        &mut self,
        alignment: &Alignment,
        setup: &SightSetup,
        requirement: Requirement,
        lo: f64,
        hi: f64,
    ) {
        let roads = [Road::new(alignment, Direction::Forward), Road::new(alignment, Direction::Backward)];
        // The braking stretch of a grade-adjusted requirement reaches as far
        // as the requirement itself, which may pass the cap.
        let reach = self
            .samples
            .iter()
            .flat_map(|s| [s.required_forward, s.required_backward])
            .filter(|d| d.is_finite())
            .fold(setup.cap, f64::max);
        let reach = match requirement {
            Requirement::Design(_) => setup.cap,
            Requirement::GradeAdjusted { .. } => reach.max(requirement.largest(100.0).min(1e12)),
        };
        let from = self.samples.partition_point(|s| s.station < lo - reach);
        let to = self.samples.partition_point(|s| s.station <= hi + reach);
        let Some(window) = self.samples.get_mut(from..to) else { return };
        let [ahead, behind] = &roads;
        // The backward values of each station, computed from the stations
        // alone (so they can be computed beside the forward ones).
        let backward = |stations: &[f64]| -> Vec<(Option<f64>, Option<f64>)> {
            let mut hint = usize::MAX;
            stations
                .iter()
                .map(|&s| {
                    if s < lo {
                        return (None, None);
                    }
                    let seen = (s <= hi + setup.cap).then(|| behind.governing_near(&mut hint, -s, setup));
                    (seen, Some(requirement.on_road(behind, -s)))
                })
                .collect()
        };
        let stations: Vec<f64> = window.iter().map(|s| s.station).collect();
        let forward = |window: &mut [SightSample]| {
            let mut hint = 0;
            for sample in window.iter_mut() {
                let s = sample.station;
                if s <= hi {
                    if s >= lo - setup.cap {
                        sample.forward = ahead.governing_near(&mut hint, s, setup);
                    }
                    sample.required_forward = requirement.on_road(ahead, s);
                }
            }
        };
        // Both cores when there is enough to share: the two directions are
        // independent and each is computed exactly as on one core.
        let behind_values = if stations.len() >= PARALLEL_STATIONS {
            std::thread::scope(|scope| {
                let job = scope.spawn(|| backward(&stations));
                forward(window);
                job.join().unwrap_or_else(|_| backward(&stations))
            })
        } else {
            forward(window);
            backward(&stations)
        };
        for (sample, (seen, required)) in window.iter_mut().zip(behind_values) {
            if let Some(d) = seen {
                sample.backward = d;
            }
            if let Some(r) = required {
                sample.required_backward = r;
            }
        }
    }

    /// Whether an available distance is the cap (nothing hid the object or
    /// stopped the beam within it), not a measured distance.
    pub fn reaches_cap(&self, available: f64) -> bool {
        !crate::tolerance::below(available, self.cap)
    }

    /// Every run of consecutive stations where the available distance falls
    /// short of the required ([`crate::tolerance::below`]), per direction,
    /// with the worst station of each.
    pub fn shortfalls(&self) -> Vec<Shortfall> {
        let mut out = Vec::new();
        for direction in [Direction::Forward, Direction::Backward] {
            let mut current: Option<Shortfall> = None;
            for s in &self.samples {
                let (available, required) = match direction {
                    Direction::Forward => (s.forward, s.required_forward),
                    Direction::Backward => (s.backward, s.required_backward),
                };
                if crate::tolerance::below(available, required) {
                    let short = required - available;
                    match &mut current {
                        Some(run) => {
                            run.end = s.station;
                            if short > run.required - run.available {
                                run.worst = s.station;
                                run.available = available;
                                run.required = required;
                            }
                        }
                        None => {
                            current = Some(Shortfall {
                                direction,
                                start: s.station,
                                end: s.station,
                                worst: s.station,
                                available,
                                required,
                            });
                        }
                    }
                } else if let Some(run) = current.take() {
                    out.push(run);
                }
            }
            out.extend(current);
        }
        out
    }
}
