//! The existing ground line, and what a designer reads off it against the
//! profile: cut and fill depths, the grade points (where the profile crosses
//! the ground) and the largest cut and fill.
//!
//! The ground is linear between its points. Outside its first and last point
//! there is no ground: no depth is given there, never an extrapolated one.
//! The points are shared behind an [`Arc`], so copying a project (an undo
//! step, a drag frame) never copies a large ground line.

mod review;
mod scan;

pub use review::GroundWarning;
pub(crate) use scan::BLOCK;
pub use scan::{CutFillSummary, Depth, SiteScan, cut_fill_summary, depth_at, grade_points};

use std::ops::Deref;
use std::sync::Arc;

use serde::{Deserialize, Deserializer, Serialize, Serializer};

/// A point of the existing ground line.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct GroundPoint {
    /// Station.
    pub station: f64,
    /// Ground elevation.
    pub elevation: f64,
}

/// The existing ground line: points in increasing station order, shared.
#[derive(Clone, Debug, Default)]
pub struct Ground(Arc<[GroundPoint]>);

impl Ground {
    /// A ground line of `points` (in increasing station order).
    pub fn new(points: Vec<GroundPoint>) -> Self {
        Self(points.into())
    }

    /// Whether `other` is the very same shared line (not only equal points).
    pub fn shares(&self, other: &Self) -> bool {
        Arc::ptr_eq(&self.0, &other.0)
    }

    /// First and last station, when there are at least two points.
    pub fn range(&self) -> Option<(f64, f64)> {
        match (self.first(), self.last()) {
            (Some(a), Some(b)) if self.len() >= 2 => Some((a.station, b.station)),
            _ => None,
        }
    }

    /// The first point whose station and order are unusable, as
    /// `(index, why)`: not finite, or not after the point before.
    pub fn problem(&self) -> Option<(usize, &'static str)> {
        for (i, p) in self.iter().enumerate() {
            if !p.station.is_finite() || !p.elevation.is_finite() {
                return Some((i, "station and elevation must be finite numbers"));
            }
            if !crate::tolerance::within_limit(p.station) || !crate::tolerance::within_limit(p.elevation) {
                return Some((
                    i,
                    "station and elevation must lie within ±1e7, the range Gradewright accepts",
                ));
            }
            if i > 0 && self.get(i - 1).is_some_and(|q| q.station >= p.station) {
                return Some((i, "stations must increase"));
            }
        }
        None
    }

    /// Ground elevation at `station` by linear interpolation; `None` outside
    /// the ground (or with fewer than two points).
    pub fn elevation_at(&self, station: f64) -> Option<f64> {
        let (first, last) = self.range()?;
        if !(station >= first && station <= last) {
            return None;
        }
        let i = self.partition_point(|p| p.station <= station).clamp(1, self.len() - 1);
        let (a, b) = (self.get(i - 1)?, self.get(i)?);
        let t = (station - a.station) / (b.station - a.station);
        Some(a.elevation + t * (b.elevation - a.elevation))
    }

    /// The ground for drawing between stations `range`, at most about two
    /// points per column when `columns` columns span the range: in each
    /// column the lowest and the highest point, in station order, so a spike
    /// stays visible. A line short enough is returned whole. One
    /// point beyond each end of the range is kept so the line reaches the
    /// edges. For drawing only: never compute with the result.
    pub fn decimated(&self, range: (f64, f64), columns: usize) -> Vec<[f64; 2]> {
        crate::decimate::lowest_and_highest(&self.0, |p| p.station, |p| p.elevation, range, columns)
    }
}

/// Ground elevations at stations in increasing order, in amortised O(1)
/// each (a station behind is still answered, by a search).
#[derive(Clone, Debug)]
pub struct GroundWalker<'a> {
    ground: &'a Ground,
    index: usize,
}

impl GroundWalker<'_> {
    /// As [`Ground::elevation_at`].
    pub fn elevation_at(&mut self, station: f64) -> Option<f64> {
        let (first, last) = self.ground.range()?;
        if !(station >= first && station <= last) {
            return None;
        }
        let points = &self.ground.0;
        let ahead = |i: usize| points.get(i).is_some_and(|p| p.station <= station);
        if self.index == 0 || !ahead(self.index - 1) {
            self.index = points.partition_point(|p| p.station <= station);
        } else if ahead(self.index + 8) {
            // Far ahead: gallop (8, 16, 32, … points), then search the last
            // stride, so the walk touches only the memory near its path.
            let mut stride = 8;
            while ahead(self.index + 2 * stride) {
                stride *= 2;
            }
            let end = (self.index + 2 * stride + 1).min(points.len());
            let window = points.get(self.index + stride..end).unwrap_or(&[]);
            self.index += stride + window.partition_point(|p| p.station <= station);
        } else {
            while self.index < points.len() && ahead(self.index) {
                self.index += 1;
            }
        }
        let i = self.index.clamp(1, points.len() - 1);
        let (a, b) = (points.get(i - 1)?, points.get(i)?);
        let t = (station - a.station) / (b.station - a.station);
        Some(a.elevation + t * (b.elevation - a.elevation))
    }
}

impl Ground {
    /// A walker for elevations at increasing stations.
    pub fn walker(&self) -> GroundWalker<'_> {
        GroundWalker { ground: self, index: 0 }
    }
}

impl Deref for Ground {
    type Target = [GroundPoint];

    fn deref(&self) -> &[GroundPoint] {
        &self.0
    }
}

impl PartialEq for Ground {
    fn eq(&self, other: &Self) -> bool {
        self.shares(other) || *self.0 == *other.0
    }
}

impl From<Vec<GroundPoint>> for Ground {
    fn from(points: Vec<GroundPoint>) -> Self {
        Self::new(points)
    }
}

impl Serialize for Ground {
    fn serialize<S: Serializer>(&self, serializer: S) -> Result<S::Ok, S::Error> {
        self.0.serialize(serializer)
    }
}

impl<'de> Deserialize<'de> for Ground {
    fn deserialize<D: Deserializer<'de>>(deserializer: D) -> Result<Self, D::Error> {
        Vec::<GroundPoint>::deserialize(deserializer).map(Self::new)
    }
}

#[cfg(test)]
pub(crate) mod tests {
    use super::*;

    /// A ground line through `points` (station, elevation).
    pub(crate) fn ground(points: &[(f64, f64)]) -> Ground {
        Ground::new(points.iter().map(|&(station, elevation)| GroundPoint { station, elevation }).collect())
    }

    #[test]
    fn interpolates_inside_and_gives_nothing_outside() {
        let g = ground(&[(0.0, 100.0), (10.0, 102.0), (30.0, 101.0)]);
        assert_eq!(g.elevation_at(5.0), Some(101.0));
        assert_eq!(g.elevation_at(10.0), Some(102.0));
        assert_eq!(g.elevation_at(20.0), Some(101.5));
        assert_eq!(g.elevation_at(30.0), Some(101.0));
        assert_eq!(g.elevation_at(-0.001), None);
        assert_eq!(g.elevation_at(30.001), None);
        assert_eq!(ground(&[(0.0, 1.0)]).elevation_at(0.0), None);
    }

    #[test]
    fn decimation_keeps_spikes_and_is_only_for_drawing() {
        let mut points: Vec<(f64, f64)> = (0..100_000).map(|i| (f64::from(i) * 0.1, 50.0)).collect();
        if let Some(p) = points.get_mut(54_321) {
            p.1 = 80.0;
        }
        let g = ground(&points);
        let drawn = g.decimated((0.0, 10_000.0), 500);
        assert!(drawn.len() <= 2 * 500 + 8, "{}", drawn.len());
        assert!(drawn.iter().any(|p| (p[1] - 80.0).abs() < 1e-12), "the spike is drawn");
        assert!(drawn.windows(2).all(|w| matches!(w, [a, b] if a[0] < b[0])), "in station order");
        assert_eq!(g.len(), 100_000, "the ground itself is untouched");
    }

    #[test]
    fn copies_share_the_points() {
        let g = ground(&[(0.0, 1.0), (1.0, 2.0)]);
        let copy = g.clone();
        assert!(copy.shares(&g));
        assert_eq!(copy, g);
        assert!(!ground(&[(0.0, 1.0), (1.0, 2.0)]).shares(&g));
    }

    #[test]
    fn the_walker_agrees_with_a_search_at_every_station() {
        let points: Vec<(f64, f64)> =
            (0..5_000).map(|i| (f64::from(i) * 0.1, (f64::from(i) * 0.37).sin())).collect();
        let g = ground(&points);
        let mut walk = g.walker();
        // Small steps, a long jump, a step back, and beyond the end.
        let stations = [0.0, 0.05, 0.1, 0.35, 3.0, 3.04, 250.0, 250.01, 120.0, 121.0, 499.9, 500.0];
        for s in stations {
            assert_eq!(walk.elevation_at(s), g.elevation_at(s), "at {s}");
        }
    }
}
