//! The profile against the ground: cut and fill depths, the grade points
//! (where the profile crosses the ground) and the largest cut and fill,
//! solved exactly on each piece where both are polynomials.

use super::Ground;
use crate::{Alignment, Segment};

/// Cut or fill at one station: how far the profile is below (cut) or above
/// (fill) the ground. One of the two is zero.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Depth {
    /// Station.
    pub station: f64,
    /// Ground elevation.
    pub ground: f64,
    /// Profile elevation.
    pub profile: f64,
    /// Ground above the profile (≥ 0).
    pub cut: f64,
    /// Profile above the ground (≥ 0).
    pub fill: f64,
}

impl Depth {
    pub(crate) fn new(station: f64, ground: f64, profile: f64) -> Self {
        let d = ground - profile;
        // `+ 0.0` turns a negative zero into zero (never "-0.000").
        Self { station, ground, profile, cut: d.max(0.0) + 0.0, fill: (-d).max(0.0) + 0.0 }
    }
}

/// Cut or fill at `station`; `None` where there is no ground or no profile.
pub fn depth_at(alignment: &Alignment, ground: &Ground, station: f64) -> Option<Depth> {
    let g = ground.elevation_at(station)?;
    let y = alignment.sample(crate::Station(station)).ok()?.elevation;
    Some(Depth::new(station, g, y))
}

/// One stretch on which both the profile and the ground are polynomials:
/// the difference d(s) = ground − profile is quadratic on it.
#[derive(Clone, Copy, Debug)]
struct Piece {
    start: f64,
    end: f64,
    segment: Segment,
    /// Ground elevation at `start` and its slope (decimal).
    ground: f64,
    slope: f64,
}

impl Piece {
    /// d(s) = ground − profile.
    fn difference(&self, s: f64) -> f64 {
        self.ground + self.slope * (s - self.start) - self.segment.elevation_at(s)
    }
}

/// The stretch where the ground and the profile overlap, if any.
fn overlap(alignment: &Alignment, ground: &Ground) -> Option<(f64, f64)> {
    let (g0, g1) = ground.range()?;
    let (lo, hi) = (g0.max(alignment.start().0), g1.min(alignment.end().0));
    (lo < hi).then_some((lo, hi))
}

/// Every piece between stations `lo` and `hi` (inside the overlap), in
/// station order. A piece starts at `lo`, a ground point or a segment end,
/// so a stretch that starts at a ground point gives the very pieces a scan
/// of the whole overlap gives there.
fn pieces(alignment: &Alignment, ground: &Ground, (lo, hi): (f64, f64), mut visit: impl FnMut(&Piece)) {
    let segments = alignment.segments();
    if ground.len() < 2 || lo >= hi || lo.is_nan() || hi.is_nan() {
        return;
    }
    let mut gi = ground.partition_point(|p| p.station <= lo).clamp(1, ground.len() - 1);
    let mut si = segments.partition_point(|seg| seg.end <= lo).min(segments.len().saturating_sub(1));
    let mut s = lo;
    while s < hi {
        let (Some(a), Some(b), Some(seg)) = (ground.get(gi - 1), ground.get(gi), segments.get(si)) else {
            break;
        };
        let end = b.station.min(seg.end).min(hi);
        if end > s {
            let slope = (b.elevation - a.elevation) / (b.station - a.station);
            let g = a.elevation + slope * (s - a.station);
            visit(&Piece { start: s, end, segment: *seg, ground: g, slope });
        }
        if b.station <= end && gi + 1 < ground.len() {
            gi += 1;
        }
        if seg.end <= end && si + 1 < segments.len() {
            si += 1;
        }
        if end <= s {
            break;
        }
        s = end;
    }
}

/// The largest cut and the largest fill along the profile, each with its
/// station; `None` for either when there is none (or no ground).
#[derive(Clone, Copy, Debug, Default, PartialEq)]
pub struct CutFillSummary {
    /// Largest cut: (station, depth).
    pub cut: Option<(f64, f64)>,
    /// Largest fill: (station, depth).
    pub fill: Option<(f64, f64)>,
}

impl CutFillSummary {
    /// Takes `d` = ground − profile at `s` into account (the first of equal
    /// depths is kept).
    fn consider(&mut self, s: f64, d: f64) {
        if d > 0.0 && self.cut.is_none_or(|(_, c)| d > c) {
            self.cut = Some((s, d));
        }
        if d < 0.0 && self.fill.is_none_or(|(_, f)| -d > f) {
            self.fill = Some((s, -d));
        }
    }

    fn merge(&mut self, other: &Self) {
        if let Some((s, d)) = other.cut {
            self.consider(s, d);
        }
        if let Some((s, f)) = other.fill {
            self.consider(s, -f);
        }
    }
}

/// Appends a grade point unless it is (within a hair) the last one.
fn push_point(out: &mut Vec<f64>, s: f64) {
    if out.last().is_none_or(|&last| s > last + crate::tolerance::STATION_HAIR) {
        out.push(s);
    }
}

/// Grade points and the largest cut and fill of one stretch, in one pass.
fn scan(alignment: &Alignment, ground: &Ground, range: (f64, f64)) -> (Vec<f64>, CutFillSummary) {
    let mut points: Vec<f64> = Vec::new();
    let mut summary = CutFillSummary::default();
    pieces(alignment, ground, range, |p| {
        let (d0, d1) = (p.difference(p.start), p.difference(p.end));
        summary.consider(p.start, d0);
        summary.consider(p.end, d1);
        // d(t) = d0 + b·t + c·t², t = s − start.
        let b = p.slope - p.segment.grade_at(p.start);
        let c = -0.5 * p.segment.rate;
        let length = p.end - p.start;
        if c == 0.0 {
            // A straight difference crosses zero at most once, only where
            // the ends differ in sign (or it ends on zero).
            if b != 0.0 && d0 * d1 < 0.0 {
                push_point(&mut points, p.start - d0 / b);
            }
        } else {
            // d′ = b + 2c·t = 0: the largest depth inside a curved piece.
            let t = -b / (2.0 * c);
            if t > 0.0 && t < length {
                summary.consider(p.start + t, p.difference(p.start + t));
            }
            if let Some(roots) = crate::quadratic::roots(d0, b, c) {
                for t in roots {
                    if t > 0.0 && t < length {
                        push_point(&mut points, p.start + t);
                    }
                }
            }
        }
        if d1 == 0.0 {
            push_point(&mut points, p.end);
        }
    });
    (points, summary)
}

/// Ground points per block of a [`SiteScan`] (and of the earthwork's
/// sections, which are reused by the same blocks).
pub(crate) const BLOCK: usize = 2048;

/// What one block of ground points gave, and the profile pieces it was
/// computed from (to tell whether an edit touched it).
#[derive(Clone, Debug, PartialEq)]
struct Block {
    range: (f64, f64),
    segments: Vec<Segment>,
    points: Vec<f64>,
    summary: CutFillSummary,
}

/// The grade points and the largest cut and fill of a profile over its
/// ground, computed by blocks of ground points so that after an edit only
/// the blocks whose profile pieces changed are computed again. The result
/// is the same, to the bit, as a scan from scratch (see the tests).
#[derive(Clone, Debug, Default, PartialEq)]
pub struct SiteScan {
    ground: Ground,
    blocks: Vec<Block>,
    /// Where the profile crosses the ground, in station order.
    pub grade_points: Vec<f64>,
    /// The largest cut and fill.
    pub summary: CutFillSummary,
}

impl SiteScan {
    /// Scans `alignment` over `ground`, reusing the blocks of `previous`
    /// (a scan of the same ground before an edit) that the edit left alone.
    pub fn new(alignment: &Alignment, ground: &Ground, previous: Option<&Self>) -> Self {
        let mut out = Self { ground: ground.clone(), ..Self::default() };
        let Some((lo, hi)) = overlap(alignment, ground) else { return out };
        let previous = previous.filter(|p| p.ground.shares(ground));
        let segments = alignment.segments();
        let mut k = 0;
        while k + 1 < ground.len() {
            let last = (k + BLOCK).min(ground.len() - 1);
            let (Some(a), Some(b)) = (ground.get(k), ground.get(last)) else { break };
            let range = (a.station.max(lo), b.station.min(hi));
            k = last;
            if range.0 >= range.1 {
                continue;
            }
            let first_seg = segments.partition_point(|seg| seg.end <= range.0);
            let end_seg = segments.partition_point(|seg| seg.start < range.1);
            let used = segments.get(first_seg..end_seg.max(first_seg)).unwrap_or(&[]);
            let reused = previous.and_then(|p| {
                let i = p.blocks.partition_point(|b| b.range.0 < range.0);
                p.blocks.get(i).filter(|b| b.range == range && b.segments == used)
            });
            let block = match reused {
                Some(b) => b.clone(),
                None => {
                    let (points, summary) = scan(alignment, ground, range);
                    Block { range, segments: used.to_vec(), points, summary }
                }
            };
            for &s in &block.points {
                push_point(&mut out.grade_points, s);
            }
            out.summary.merge(&block.summary);
            out.blocks.push(block);
        }
        out
    }
}

/// The stations strictly inside the overlap of profile and ground where
/// the profile crosses the ground (grade points), in order, found exactly
/// on each piece (d is at most quadratic there).
pub fn grade_points(alignment: &Alignment, ground: &Ground) -> Vec<f64> {
    SiteScan::new(alignment, ground, None).grade_points
}

/// The largest cut and fill, found exactly: at piece ends or where d′ = 0
/// inside a curved piece.
pub fn cut_fill_summary(alignment: &Alignment, ground: &Ground) -> CutFillSummary {
    SiteScan::new(alignment, ground, None).summary
}

#[cfg(test)]
mod tests {
    use super::super::tests::ground;
    use super::*;
    use crate::{Profile, Pvi, Units};

    fn flat_road(elevation: f64, length: f64) -> Alignment {
        let pvis = vec![Pvi::new(0.0, elevation), Pvi::new(length, elevation)];
        Alignment::new(&Profile::new(Units::Metric, pvis)).expect("valid")
    }

    #[test]
    fn depths_split_into_cut_and_fill() {
        // Hand-computed: a level road at 101.0 over ground rising 100 → 102.
        let road = flat_road(101.0, 40.0);
        let g = ground(&[(0.0, 100.0), (20.0, 102.0)]);
        let at = |s| depth_at(&road, &g, s).expect("ground here");
        assert!((at(5.0).fill - 0.5).abs() < 1e-12 && at(5.0).cut == 0.0);
        assert!((at(15.0).cut - 0.5).abs() < 1e-12 && at(15.0).fill == 0.0);
        assert!(depth_at(&road, &g, 30.0).is_none(), "no ground past 20: no depth");
        let crossings = grade_points(&road, &g);
        assert_eq!(crossings.len(), 1);
        assert!((crossings.first().copied().unwrap_or_default() - 10.0).abs() < 1e-12);
        let summary = cut_fill_summary(&road, &g);
        assert_eq!(summary.cut, Some((20.0, 1.0)));
        assert_eq!(summary.fill, Some((0.0, 1.0)));
    }

    #[test]
    fn finds_two_crossings_of_a_curve_inside_one_ground_piece() {
        // Crest: PVIs (0, 100), (100, 105), (200, 100), L = 200, so
        // r = (−0.05 − 0.05)/200 and y = 100 + 0.05 s − 0.00025 s².
        // Level ground at 102: s² − 200 s + 8000 = 0, s = 100 ∓ √2000
        // (hand-computed: 55.279 and 144.721).
        let pvis = vec![Pvi::new(0.0, 100.0), Pvi::with_curve(100.0, 105.0, 200.0), Pvi::new(200.0, 100.0)];
        let road = Alignment::new(&Profile::new(Units::Metric, pvis)).expect("valid");
        let g = ground(&[(0.0, 102.0), (200.0, 102.0)]);
        let found = grade_points(&road, &g);
        let root = 2000f64.sqrt();
        assert_eq!(found.len(), 2, "{found:?}");
        assert!((found.first().copied().unwrap_or_default() - (100.0 - root)).abs() < 1e-9, "{found:?}");
        assert!((found.get(1).copied().unwrap_or_default() - (100.0 + root)).abs() < 1e-9, "{found:?}");
        // Largest fill at the crest: y(100) = 102.5, fill 0.5.
        let summary = cut_fill_summary(&road, &g);
        let (s, f) = summary.fill.expect("fill");
        assert!((s - 100.0).abs() < 1e-9 && (f - 0.5).abs() < 1e-12, "{s} {f}");
        assert_eq!(summary.cut.map(|c| c.0), Some(0.0));
    }

    #[test]
    fn a_scan_after_an_edit_equals_a_scan_from_scratch() {
        let profile = crate::synthetic::rolling_profile(Units::Metric, 60, 6_000.0);
        let road = Alignment::new(&profile).expect("valid");
        let points: Vec<(f64, f64)> = (0..=60_000)
            .map(|i| {
                let s = f64::from(i) * 0.1;
                let y = road.sample(crate::Station(s)).map_or(0.0, |x| x.elevation) + 1.2 * (s / 90.0).sin();
                (s, y)
            })
            .collect();
        let g = ground(&points);
        let before = SiteScan::new(&road, &g, None);
        let one_scan = scan(&road, &g, overlap(&road, &g).expect("overlap"));
        assert_eq!(before.summary, one_scan.1, "blocks merge to the one-pass result");
        assert_eq!(before.grade_points, one_scan.0);
        let mut edited = profile.clone();
        if let Some(p) = edited.pvis.get_mut(30) {
            p.elevation += 1.7;
        }
        let road2 = Alignment::new(&edited).expect("valid");
        let after = SiteScan::new(&road2, &g, Some(&before));
        let fresh = SiteScan::new(&road2, &g, None);
        assert_eq!(after, fresh);
        assert_ne!(after.grade_points, before.grade_points);
        let reused = after.blocks.iter().zip(&before.blocks).filter(|(a, b)| a == b).count();
        assert!(
            reused * 10 >= after.blocks.len() * 8,
            "most blocks are reused: {reused} of {}",
            after.blocks.len()
        );
    }
}
