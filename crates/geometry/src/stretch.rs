//! A long profile taken one stretch at a time: what is computed at the
//! stations of a stretch depends only on the road a bounded distance around
//! it, so each stretch is built from the PVIs that cover it and its
//! surroundings. The pieces it gets are the whole profile's, bit for bit,
//! and memory does not grow with the length of the profile.

use crate::{Profile, Pvi, VerticalCurve};

impl Profile {
    /// The PVIs from which the road over [lo, hi] is built exactly as the
    /// whole profile builds it: at least those of `inner` (which keep their
    /// curves), and as many more on each side as it takes for the curves
    /// cut off at the ends to lie outside [lo, hi]. The end PVIs of the part
    /// lose their curves (a profile's end carries none), which changes the
    /// road only beyond them.
    pub fn part(&self, lo: f64, hi: f64, inner: std::ops::RangeInclusive<usize>) -> Profile {
        self.part_at(lo, hi, inner).1
    }

    /// [`Profile::part`] and the index in this profile of the part's first
    /// PVI (PVI `k` of the part is PVI `offset + k` here).
    pub fn part_at(&self, lo: f64, hi: f64, inner: std::ops::RangeInclusive<usize>) -> (usize, Profile) {
        let pvis = &self.pvis;
        let last = pvis.len().saturating_sub(1);
        let pvc = |i: usize| pvis.get(i).map_or(f64::NEG_INFINITY, Pvi::pvc);
        let pvt = |i: usize| pvis.get(i).map_or(f64::INFINITY, Pvi::pvt);
        let mut first = inner.start().saturating_sub(1).min(last);
        while first > 0 && pvc(first + 1) >= lo {
            first -= 1;
        }
        let mut end = inner.end().saturating_add(1).min(last).max(first);
        while end < last && pvt(end - 1) <= hi {
            end += 1;
        }
        let mut list = pvis.get(first..=end).unwrap_or(&[]).to_vec();
        for at in [0, list.len().saturating_sub(1)] {
            if let Some(p) = list.get_mut(at) {
                p.curve = VerticalCurve::None;
            }
        }
        (first, Profile::new(self.units, list).with_equations(self.equations.clone()))
    }

    /// The profile cut into stretches of `pvis_each` PVIs: for each, the
    /// first and last PVI and the stations [from, to) it answers for (the
    /// last one's `to` is the end of the profile, included). In order, with
    /// no gap and no overlap.
    pub fn stretches(&self, pvis_each: usize) -> Vec<Stretch> {
        let n = self.pvis.len();
        let each = pvis_each.max(1);
        let station = |i: usize| self.pvis.get(i).map_or(f64::NAN, |p| p.station.0);
        (0..n.saturating_sub(1))
            .step_by(each)
            .map(|first| {
                let last = (first + each).min(n - 1);
                Stretch { first, last, from: station(first), to: station(last), closes: last == n - 1 }
            })
            .collect()
    }
}

/// One stretch of a profile (see [`Profile::stretches`]).
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Stretch {
    /// Its first PVI.
    pub first: usize,
    /// Its last PVI (the next stretch's first).
    pub last: usize,
    /// The first station it answers for.
    pub from: f64,
    /// The station the next stretch starts at (not included), or the end of
    /// the profile for the last stretch (included).
    pub to: f64,
    /// Whether it is the last stretch.
    pub closes: bool,
}

impl Stretch {
    /// Whether station `s` is one this stretch answers for.
    pub fn holds(&self, s: f64) -> bool {
        s >= self.from && (s < self.to || self.closes && s <= self.to)
    }
}
