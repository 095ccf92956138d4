//! Available sight distance along the whole profile, in both directions.
//!
//! * Daylight (crest) sight distance: the longest distance ahead over which an
//!   object of height h2 on the road stays visible from an eye h1 above the
//!   road, over the actual profile. The object at distance t is visible when
//!   the line eye→object clears the road everywhere between: with
//!   φ(u) = (y(u) − E)/u the road's angle from the eye and
//!   ψ(t) = φ(t) + h2/t the object's, it is visible while ψ(t) ≥ max φ(u), u < t.
//! * Headlight (sag, night) sight distance: the distance ahead at which the
//!   beam, H above the road and tilted up by β from the grade the vehicle is
//!   on, meets the road surface.
//!
//! Both are solved exactly on each piece of constant y″ (on a piece y is a
//! quadratic, so each condition is a quadratic in t): no sampling, so the
//! results match the closed-form AASHTO length formulas. Beyond the ends the
//! end tangents are taken to continue (common practice for tie-ins).
//!
//! The walk passes whole blocks of pieces when their highest and lowest
//! points show that nothing in them can stop the beam or hide the object
//! (with [`crate::tolerance::BLOCK_ROOM`] to spare), and makes the running
//! maximum exact again before it goes on piece by piece: every result is
//! the piece-by-piece walk's, bit for bit ([`Road::piece_by_piece`]).

use crate::{Alignment, Segment, Units, sight};

/// Which way the vehicle travels.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Direction {
    /// Towards increasing stations.
    Forward,
    /// Towards decreasing stations.
    Backward,
}

/// Heights and angle for sight distance, in the project's units.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct SightSetup {
    /// Driver eye height h1.
    pub eye_height: f64,
    /// Object height h2.
    pub object_height: f64,
    /// Headlight height H.
    pub headlight_height: f64,
    /// Upward divergence of the beam β, degrees.
    pub headlight_angle_deg: f64,
    /// Whether daylight (crest) sight distance counts.
    pub daylight: bool,
    /// Whether headlight sight distance counts (off for lit roads).
    pub headlights: bool,
    /// Distances are not looked for beyond this.
    pub cap: f64,
}

/// The road seen by a vehicle travelling one way: pieces in travel order,
/// with the last one running on without end.
#[derive(Clone, Debug)]
pub struct Road {
    pieces: Vec<Segment>,
    /// The pieces summed up [`BLOCK`] at a time (the last, endless one
    /// left out), so an eye can pass a block whole when nothing in it can
    /// stop the beam or hide the object.
    blocks: Vec<Block>,
}

/// Pieces per [`Block`].
const BLOCK: usize = 2;

/// Blocks passed whose bounds are kept for [`Road::restore`].
const PASSED: usize = 64;

/// [`BLOCK`] consecutive pieces of a road: where they run and how high and
/// low the road gets on them.
#[derive(Clone, Copy, Debug)]
struct Block {
    start: f64,
    end: f64,
    high: f64,
    low: f64,
}

impl Block {
    fn of(pieces: &[Segment]) -> Option<Self> {
        let (first, last) = (pieces.first()?, pieces.last()?);
        let (mut low, mut high) = (f64::INFINITY, f64::NEG_INFINITY);
        for piece in pieces {
            let mut points = [piece.elevation, piece.elevation_at(piece.end), f64::NAN];
            if piece.rate != 0.0 {
                let level = piece.start - piece.grade / piece.rate;
                if level > piece.start && level < piece.end {
                    points[2] = piece.elevation_at(level);
                }
            }
            for y in points.into_iter().filter(|y| !y.is_nan()) {
                low = low.min(y);
                high = high.max(y);
            }
        }
        let room = crate::tolerance::BLOCK_ROOM * (1.0 + high.abs().max(low.abs()));
        Some(Self { start: first.start, end: last.end, high: high + room, low: low - room })
    }
}

impl Road {
    /// The road for `direction`. Backward, stations are negated (s → −s).
    pub fn new(alignment: &Alignment, direction: Direction) -> Self {
        let segments = alignment.segments();
        let mut pieces: Vec<Segment> = match direction {
            Direction::Forward => segments.to_vec(),
            Direction::Backward => segments
                .iter()
                .rev()
                .map(|seg| Segment {
                    start: -seg.end,
                    end: -seg.start,
                    elevation: seg.elevation_at(seg.end),
                    grade: -seg.grade_at(seg.end),
                    rate: seg.rate,
                })
                .collect(),
        };
        if let Some(last) = pieces.last().copied() {
            pieces.push(Segment {
                start: last.end,
                end: f64::INFINITY,
                elevation: last.elevation_at(last.end),
                grade: last.grade_at(last.end),
                rate: 0.0,
            });
        }
        let finite = pieces.len().saturating_sub(1);
        let blocks = pieces.get(..finite).unwrap_or(&[]).chunks_exact(BLOCK).filter_map(Block::of).collect();
        Self { pieces, blocks }
    }

    /// The same road walked piece by piece only, never a block at a time:
    /// slower, and the yardstick the blocked walk is held to, bit for bit.
    #[must_use]
    pub fn piece_by_piece(mut self) -> Self {
        self.blocks.clear();
        self
    }

    /// The index of the piece holding road station `s` (the first when before).
    fn piece_index(&self, s: f64) -> usize {
        let i = self.pieces.partition_point(|p| p.end <= s);
        i.min(self.pieces.len().saturating_sub(1))
    }

    /// [`Self::piece_index`], found by walking from `hint` (the answer for a
    /// nearby station): the same index, without a search per station.
    fn piece_index_near(&self, hint: usize, s: f64) -> usize {
        let last = self.pieces.len().saturating_sub(1);
        let mut i = hint.min(last);
        while i < last && self.pieces.get(i).is_some_and(|p| p.end <= s) {
            i += 1;
        }
        while i > 0 && self.pieces.get(i - 1).is_some_and(|p| p.end > s) {
            i -= 1;
        }
        i
    }

    /// Road elevation at road station `s`, end tangents extended (for tests
    /// and reference methods).
    pub fn elevation(&self, s: f64) -> f64 {
        let first = self.pieces.first();
        match first {
            Some(p) if s < p.start => p.elevation + p.grade * (s - p.start),
            _ => self.pieces.get(self.piece_index(s)).map_or(f64::NAN, |p| p.elevation_at(s)),
        }
    }

    /// Decimal grade in the direction of travel at road station `s`, end
    /// tangents extended.
    pub fn grade(&self, s: f64) -> f64 {
        let first = self.pieces.first();
        match first {
            Some(p) if s < p.start => p.grade,
            _ => self.pieces.get(self.piece_index(s)).map_or(f64::NAN, |p| p.grade_at(s)),
        }
    }

    /// Daylight sight distance from road station `s`, up to `setup.cap`.
    pub fn daylight(&self, s: f64, setup: &SightSetup) -> f64 {
        self.daylight_and_horizon(s, setup).0
    }

    /// Daylight sight distance from road station `s` and the road station of
    /// the point that hides the object there (the horizon: where the line of
    /// sight touches the road; `None` when the distance reaches the cap).
    pub fn daylight_and_horizon(&self, s: f64, setup: &SightSetup) -> (f64, Option<f64>) {
        self.daylight_from(self.piece_index(s), s, setup)
    }

    /// [`Self::daylight_and_horizon`] with the piece holding `s` known.
    fn daylight_from(&self, start: usize, s: f64, setup: &SightSetup) -> (f64, Option<f64>) {
        let Some(here) = self.pieces.get(start) else { return (0.0, None) };
        let eye = here.elevation_at(s) + setup.eye_height;
        let h2 = setup.object_height;
        let mut running = f64::NEG_INFINITY;
        let mut running_at = f64::NAN;
        let mut tried = usize::MAX;
        let mut i = start;
        while let Some(piece) = self.pieces.get(i) {
            // Once there is a line of sight, whole blocks are passed while
            // the object on them stays above every line of sight they could
            // make (found from their highest and lowest points). If that
            // carries past the cap, nothing hides the object; if a block
            // might hide it, the running maximum is made exact over the
            // blocks passed and the walk goes on piece by piece.
            if tried != i && i.is_multiple_of(BLOCK) && running > f64::NEG_INFINITY {
                tried = i;
                let mut before = [f64::NAN; PASSED];
                let first = i / BLOCK;
                let passed = self.pass_blocks(first, s, eye, running, setup, &mut before);
                if passed == usize::MAX {
                    return (setup.cap, None);
                }
                if passed > first {
                    (running, running_at) =
                        self.restore(first, passed, s, eye, (running, running_at), &before);
                    i = passed * BLOCK;
                }
                continue;
            }
            i += 1;
            let p = (piece.start - s).max(0.0);
            let q = (piece.end - s).min(setup.cap);
            if q <= p {
                if piece.end - s >= setup.cap {
                    break;
                }
                continue;
            }
            let view = View::of(piece, s, eye);
            let View { a, g, c } = view;
            let phi = |t: f64| view.phi(t);
            let cuts = view.cuts(p, q);
            // φ at each cut, computed once (a part's end is the next one's start).
            let mut phi_lo = phi(p);
            for w in cuts.windows(2) {
                let [lo, hi] = [w[0], w[1]];
                if hi <= lo {
                    continue;
                }
                let phi_hi = phi(hi);
                let mid = 0.5 * (lo + hi);
                // φ′(mid) > 0, multiplied through by mid² > 0 (no division).
                let rising = c * mid * mid > a;
                let (level, level_at) =
                    if !rising && phi_lo > running { (phi_lo, lo) } else { (running, running_at) };
                if level > f64::NEG_INFINITY
                    && let Some(t) = first_negative(a + h2, g - level, c, lo, hi)
                {
                    return (t, Some(s + level_at));
                }
                for (value, at) in [(phi_lo, lo), (phi_hi, hi)] {
                    if value > running {
                        running = value;
                        running_at = at;
                    }
                }
                phi_lo = phi_hi;
            }
            if piece.end - s >= setup.cap {
                break;
            }
        }
        (setup.cap, None)
    }

    /// From block `first` on, the blocks an eye at road station `s` (at
    /// elevation `eye`, the line of sight so far at most `running`) sees the
    /// object over without a doubt: the index of the first block it may not
    /// (`first` when none), or `usize::MAX` when the sure blocks reach the cap.
    /// `before[k]` is left holding a bound on the line of sight before
    /// block `first + k` (for the first [`PASSED`] blocks passed).
    fn pass_blocks(
        &self,
        first: usize,
        s: f64,
        eye: f64,
        running: f64,
        setup: &SightSetup,
        before: &mut [f64; PASSED],
    ) -> usize {
        // The line of sight the block can make at the steepest (its highest
        // point at the nearer end if above the eye, else at the farther),
        // when the object stays above it over the whole block.
        let sure = |block: &Block, upper: f64| -> Option<f64> {
            let (p, q) = (block.start - s, block.end - s);
            if p <= 0.0 {
                return None;
            }
            let d = block.high - eye;
            let level = upper.max(if d >= 0.0 { d / p } else { d / q });
            let lift = block.low + setup.object_height - eye;
            (lift >= level * p && lift >= level * q.min(setup.cap)).then_some(level)
        };
        let mut upper = running;
        let mut j = first;
        while let Some(block) = self.blocks.get(j) {
            if block.start - s >= setup.cap {
                return usize::MAX;
            }
            let Some(level) = sure(block, upper) else { return j };
            if let Some(slot) = before.get_mut(j - first) {
                *slot = upper;
            }
            if block.end - s >= setup.cap {
                return usize::MAX;
            }
            upper = level;
            j += 1;
        }
        j
    }

    /// The exact running maximum of the road's angle (and where it is) after
    /// blocks `first..passed` were passed with only bounds on it: the
    /// blocks' own maxima are found from the last one back, until the bound
    /// on everything before (`before`, then `running` as it was before
    /// `first`) falls below the largest found. The first of equal maxima
    /// wins, as in the walk piece by piece.
    fn restore(
        &self,
        first: usize,
        passed: usize,
        s: f64,
        eye: f64,
        running: (f64, f64),
        before: &[f64; PASSED],
    ) -> (f64, f64) {
        let (mut best, mut best_at) = (f64::NEG_INFINITY, f64::NAN);
        for k in (first..passed).rev() {
            let (mut value, mut at) = (f64::NEG_INFINITY, f64::NAN);
            for piece in self.pieces.get(k * BLOCK..(k + 1) * BLOCK).unwrap_or(&[]) {
                raise_running(piece, s, eye, &mut value, &mut at);
            }
            if value >= best && value > f64::NEG_INFINITY {
                (best, best_at) = (value, at);
            }
            // Nothing before block k can reach `best` (a bound is kept for
            // the first PASSED blocks only).
            if before.get(k - first).is_some_and(|&bound| bound < best) {
                return (best, best_at);
            }
        }
        if running.0 >= best { running } else { (best, best_at) }
    }

    /// The governing available distance from road station `s`: the smaller of
    /// the daylight and headlight distances, of those `setup` asks for.
    pub fn governing(&self, s: f64, setup: &SightSetup) -> f64 {
        self.governing_near(&mut self.piece_index(s), s, setup)
    }

    /// [`Self::governing`], finding the piece holding `s` from `hint` (the
    /// piece of the station before, updated): stations taken in order cost
    /// no search each.
    fn governing_near(&self, hint: &mut usize, s: f64, setup: &SightSetup) -> f64 {
        let start = self.piece_index_near(*hint, s);
        *hint = start;
        let day = if setup.daylight { self.daylight_from(start, s, setup).0 } else { setup.cap };
        if setup.headlights { day.min(self.headlight_from(start, s, setup)) } else { day }
    }

    /// Headlight sight distance from road station `s`, up to `setup.cap`.
    pub fn headlight(&self, s: f64, setup: &SightSetup) -> f64 {
        self.headlight_from(self.piece_index(s), s, setup)
    }

    /// [`Self::headlight`] with the piece holding `s` known.
    fn headlight_from(&self, start: usize, s: f64, setup: &SightSetup) -> f64 {
        let Some(here) = self.pieces.get(start) else { return 0.0 };
        let base = here.elevation_at(s) + setup.headlight_height;
        let slope = here.grade_at(s) + setup.headlight_angle_deg.to_radians().tan();
        let mut i = start;
        while let Some(piece) = self.pieces.get(i) {
            // A whole block under the beam cannot stop it.
            if i.is_multiple_of(BLOCK)
                && let Some(block) = self.blocks.get(i / BLOCK)
                && block.start - s > 0.0
            {
                let (p, q) = (block.start - s, block.end - s);
                if block.high < (base + slope * p).min(base + slope * q) {
                    if q >= setup.cap {
                        return setup.cap;
                    }
                    i += BLOCK;
                    continue;
                }
            }
            i += 1;
            let p = (piece.start - s).max(0.0);
            let q = (piece.end - s).min(setup.cap);
            if q > p {
                // beam − road = −(a + b·t + c·t²); it meets the road where that reaches 0.
                let a = piece.elevation_at(s) - base;
                let b = piece.grade_at(s) - slope;
                let c = 0.5 * piece.rate;
                if let Some(t) = first_negative(-a, -b, -c, p.max(crate::tolerance::LENGTH_FLOOR), q) {
                    return t;
                }
            }
            if piece.end - s >= setup.cap {
                break;
            }
        }
        setup.cap
    }
}

/// One piece of road as an eye sees it: road − eye = a + g·t + c·t² at
/// distance t ahead, so the road's angle from the eye is φ(t) = a/t + g + c·t.
#[derive(Clone, Copy)]
struct View {
    a: f64,
    g: f64,
    c: f64,
}

impl View {
    fn of(piece: &Segment, s: f64, eye: f64) -> Self {
        Self { a: piece.elevation_at(s) - eye, g: piece.grade_at(s), c: 0.5 * piece.rate }
    }

    /// φ(t); none at the eye itself.
    fn phi(self, t: f64) -> f64 {
        if t > 0.0 { self.a / t + self.g + self.c * t } else { f64::NEG_INFINITY }
    }

    /// [p, q] split where φ turns (φ′ = −a/t² + c = 0), so φ is monotone
    /// between consecutive cuts (the last repeated when it does not turn).
    fn cuts(self, p: f64, q: f64) -> [f64; 3] {
        let turn = if self.a * self.c > 0.0 { (self.a / self.c).sqrt() } else { f64::NAN };
        if turn > p && turn < q { [p, turn, q] } else { [p, q, q] }
    }
}

/// Raises the running maximum of the road's angle from an eye at road
/// station `s` and elevation `eye` to the highest on `piece`, as the
/// piece-by-piece walk of [`Road::daylight_and_horizon`] does.
fn raise_running(piece: &Segment, s: f64, eye: f64, running: &mut f64, running_at: &mut f64) {
    let p = (piece.start - s).max(0.0);
    let q = piece.end - s;
    if q <= p {
        return;
    }
    let view = View::of(piece, s, eye);
    for (value, at) in view.cuts(p, q).map(|t| (view.phi(t), t)) {
        if value > *running {
            *running = value;
            *running_at = at;
        }
    }
}

/// Reference method, slow: ray marching on a grid of step `h`, tracking the
/// highest road angle seen from the eye; the object is hidden once its angle
/// falls below it. For tests and benchmarks of [`Road::daylight`].
pub fn reference_daylight(road: &Road, s: f64, setup: &SightSetup, h: f64) -> f64 {
    let eye = road.elevation(s) + setup.eye_height;
    let mut highest = f64::NEG_INFINITY;
    let mut k = 1.0;
    while k * h <= setup.cap {
        let t = k * h;
        let y = road.elevation(s + t);
        if (y + setup.object_height - eye) / t < highest {
            return t;
        }
        highest = highest.max((y - eye) / t);
        k += 1.0;
    }
    setup.cap
}

/// Reference method, slow: marches the beam on a grid of step `h` until the
/// road reaches it. For tests and benchmarks of [`Road::headlight`].
pub fn reference_headlight(road: &Road, s: f64, setup: &SightSetup, h: f64) -> f64 {
    let base = road.elevation(s) + setup.headlight_height;
    let grade = (road.elevation(s + 1e-4) - road.elevation(s - 1e-4)) / 2e-4;
    let slope = grade + setup.headlight_angle_deg.to_radians().tan();
    let mut k = 1.0;
    while k * h <= setup.cap {
        let t = k * h;
        if road.elevation(s + t) >= base + slope * t {
            return t;
        }
        k += 1.0;
    }
    setup.cap
}

/// The smallest t in [lo, hi] with c0 + c1·t + c2·t² < 0, if any.
fn first_negative(c0: f64, c1: f64, c2: f64, lo: f64, hi: f64) -> Option<f64> {
    let f = |t: f64| c0 + t * (c1 + c2 * t);
    if f(lo) < 0.0 {
        return Some(lo);
    }
    // No root to look for when f stays positive: with f(lo) ≥ 0 and
    // f(hi) > 0, f > 0 inside when it is concave or straight (c2 ≤ 0), or
    // when its vertex lies outside (lo, hi) (f monotone there).
    if f(hi) > 0.0 {
        let vertex_inside = c2 > 0.0 && {
            let vertex = -c1 / (2.0 * c2);
            vertex > lo && vertex < hi
        };
        if !vertex_inside {
            return None;
        }
    }
    let roots = crate::quadratic::roots_within(c0, c1, c2, hi)?;
    roots.into_iter().filter(|r| r.is_finite() && *r > lo && *r <= hi).find(|&r| c1 + 2.0 * c2 * r < 0.0)
}

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

/// What the required stopping sight distance is at each station.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Requirement {
    /// The design SSD everywhere.
    Design(f64),
    /// The SSD for the grade the vehicle brakes on: SSD = reaction distance +
    /// braking distance, the braking distance V²/(254(a/g + G)) (metric) or
    /// V²/(30(a/g + G)) (US) with G the average grade over the braking
    /// distance itself (Green Book 2018 eq. 3-3, "SSD on grades"; from
    /// memory), found by fixed-point iteration in the direction of travel. It
    /// never asks for less than `floor`, the design SSD on the level (rounded
    /// as the tables are), so a level road needs exactly the design SSD and an
    /// upgrade earns no credit.
    GradeAdjusted {
        /// Units of the formula.
        units: Units,
        /// Design speed.
        speed: f64,
        /// Perception–reaction time, s.
        reaction_s: f64,
        /// Deceleration.
        decel: f64,
        /// The least distance ever required: the design SSD.
        floor: f64,
    },
}

/// Iterations of the braking-distance fixed point before it is taken as it is.
const BRAKING_ITERATIONS: usize = 100;

impl Requirement {
    /// The required distance for an eye at road station `s` of `road`.
    pub fn on_road(self, road: &Road, s: f64) -> f64 {
        match self {
            Self::Design(d) => d,
            Self::GradeAdjusted { units, speed, reaction_s, decel, floor } => {
                let reaction = sight::reaction_distance(units, speed, reaction_s);
                let braking = |grade: f64| sight::braking_distance(units, speed, decel, grade);
                let from = s + reaction;
                let mut distance = braking(road.grade(from));
                for _ in 0..BRAKING_ITERATIONS {
                    if !distance.is_finite() || distance <= 0.0 {
                        break;
                    }
                    let average = (road.elevation(from + distance) - road.elevation(from)) / distance;
                    let next = braking(average);
                    let settled = crate::tolerance::settled(next, distance);
                    distance = next;
                    if settled {
                        break;
                    }
                }
                (reaction + distance).max(floor)
            }
        }
    }

    /// How far ahead of an eye working out this requirement can look on
    /// grades no steeper than `max_grade_percent`: [`Self::largest`], or
    /// infinity when a downgrade that steep leaves no finite braking distance
    /// (the fixed point's iterates then have no bound).
    pub fn look_ahead(self, max_grade_percent: f64) -> f64 {
        match self {
            Self::Design(d) => d,
            Self::GradeAdjusted { units, speed, decel, .. } => {
                let grade = -max_grade_percent.abs() / 100.0;
                let braking = sight::braking_distance(units, speed, decel, grade);
                if braking.is_finite() && braking > 0.0 {
                    self.largest(max_grade_percent)
                } else {
                    f64::INFINITY
                }
            }
        }
    }

    /// The largest distance this can require on grades no steeper than
    /// `max_grade_percent` (for how far to look around a curve).
    pub fn largest(self, max_grade_percent: f64) -> f64 {
        match self {
            Self::Design(d) => d,
            Self::GradeAdjusted { units, speed, reaction_s, decel, floor } => {
                let grade = -max_grade_percent.abs() / 100.0;
                (sight::reaction_distance(units, speed, reaction_s)
                    + sight::braking_distance(units, speed, decel, grade))
                .max(floor)
            }
        }
    }
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
