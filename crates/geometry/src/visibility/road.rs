//! The walk from an eye along the road as one direction of travel sees it:
//! daylight and headlight sight distance solved exactly on each piece.

use super::{Direction, SightSetup};
use crate::{Alignment, Segment};

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
    #[cfg(any(test, feature = "reference"))]
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
    pub(super) fn governing_near(&self, hint: &mut usize, s: f64, setup: &SightSetup) -> f64 {
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
