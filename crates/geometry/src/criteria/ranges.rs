//! Design criteria that change along the road: a range of stations where
//! the design speed, terrain, road class and area, the lighting (headlight
//! check) or the sag comfort check differ from the project's.
//!
//! The rules (common practice): outside every range the project's criteria
//! apply; a curve is judged under the criteria in force over its whole
//! length — where it straddles a change, the stricter of them (the one
//! asking the longer curve); a tangent's grade under the stricter maximum
//! grade of the criteria it crosses; the stopping sight distance an eye
//! needs follows the criteria at the eye's station.

use serde::{Deserialize, Serialize};

use super::{Criteria, CriteriaError, ResolvedCriteria};
use crate::grades::{Area, RoadClass, Terrain};
use crate::{Stationing, Units, tolerance};

/// A stretch of road, from one internal station to another, whose criteria
/// differ from the project's in what it sets (`None`: the project's).
#[derive(Clone, Debug, Default, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct CriteriaRange {
    /// Where it begins (internal station).
    pub from: f64,
    /// Where it ends (internal station).
    pub to: f64,
    /// Design speed, km/h or mph.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub design_speed: Option<f64>,
    /// Terrain.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub terrain: Option<Terrain>,
    /// Functional class.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub road_class: Option<RoadClass>,
    /// Rural or urban.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub area: Option<Area>,
    /// Whether headlight sight distance is checked (off: a lit section).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub headlight_check: Option<bool>,
    /// Whether the sag comfort length is checked on an unlit road.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub sag_comfort: Option<bool>,
}

impl CriteriaRange {
    /// The project's criteria with this range's in their place.
    pub fn applied(&self, base: &Criteria) -> Criteria {
        let mut c = base.clone();
        if let Some(v) = self.design_speed {
            c.design_speed = Some(v);
        }
        if let Some(v) = self.terrain {
            c.terrain = v;
        }
        if let Some(v) = self.road_class {
            c.road_class = v;
        }
        if let Some(v) = self.area {
            c.area = v;
        }
        if let Some(v) = self.headlight_check {
            c.headlight_check = v;
        }
        if let Some(v) = self.sag_comfort {
            c.sag_comfort = v;
        }
        c
    }
}

/// What makes a list of ranges unusable: the 0-based index of the first bad
/// one and why. Each must run forward between finite stations within the
/// station range, and they must not overlap (in order of `from`).
pub fn ranges_problem(ranges: &[CriteriaRange]) -> Option<(usize, String)> {
    let mut previous: Option<&CriteriaRange> = None;
    for (k, r) in ranges.iter().enumerate() {
        if !(tolerance::within_limit(r.from) && tolerance::within_limit(r.to)) {
            return Some((k, "its stations must be finite numbers within ±10,000,000".to_owned()));
        }
        if r.to <= r.from {
            return Some((k, "it must end after it begins".to_owned()));
        }
        if let Some(p) = previous
            && r.from < p.to
        {
            return Some((k, "it begins before the previous range ends (ranges may not overlap)".to_owned()));
        }
        previous = Some(r);
    }
    None
}

/// A range with its criteria resolved.
#[derive(Clone, Debug, PartialEq)]
pub struct ResolvedRange {
    /// Which range (0-based, in the project's order).
    pub index: usize,
    /// Where it begins (internal station).
    pub from: f64,
    /// Where it ends (internal station).
    pub to: f64,
    /// Its criteria in force.
    pub criteria: ResolvedCriteria,
}

impl ResolvedRange {
    /// How a finding judged under this range says so:
    /// "criteria range 1, 1+000.000 to 2+000.000: 60 km/h".
    pub fn words(&self, at: Stationing<'_>) -> String {
        format!(
            "criteria range {}, {} to {}: {} {}",
            self.index + 1,
            at.label_std(self.from),
            at.label_std(self.to),
            crate::trimmed(self.criteria.design_speed, 2),
            self.criteria.units.speed_symbol()
        )
    }
}

impl Criteria {
    /// [`Criteria::resolve`], with each of `ranges` resolved over its
    /// stations ([`ResolvedCriteria::at`], [`ResolvedCriteria::over`]).
    ///
    /// # Errors
    /// As [`Criteria::resolve`] for the project's criteria; for a range's,
    /// [`CriteriaError::InRange`] naming it; unusable ranges
    /// ([`ranges_problem`]).
    pub fn resolve_with(
        &self,
        units: Units,
        ranges: &[CriteriaRange],
    ) -> Result<ResolvedCriteria, CriteriaError> {
        let mut base = self.resolve(units)?;
        if let Some((index, why)) = ranges_problem(ranges) {
            return Err(CriteriaError::BadRange { index, why });
        }
        for (index, r) in ranges.iter().enumerate() {
            let criteria = r
                .applied(self)
                .resolve(units)
                .map_err(|e| CriteriaError::InRange { index, error: Box::new(e) })?;
            base.ranges.push(ResolvedRange { index, from: r.from, to: r.to, criteria });
        }
        Ok(base)
    }
}

impl ResolvedCriteria {
    /// Whether any criteria range is in force.
    pub fn has_ranges(&self) -> bool {
        !self.ranges.is_empty()
    }

    /// The criteria in force at internal station `s`, and the range they
    /// come from (`None`: the project's). A range holds its `from` and not
    /// its `to`; the last station of the road's last range is its own.
    pub fn at(&self, s: f64) -> (&ResolvedCriteria, Option<&ResolvedRange>) {
        match self.ranges.iter().find(|r| s >= r.from && s < r.to) {
            Some(r) => (&r.criteria, Some(r)),
            None => (self, None),
        }
    }

    /// The criteria in force just behind internal station `s` (a range
    /// holds the stations after its `from` up to its `to`): with
    /// [`ResolvedCriteria::at`], whether something changes at `s`.
    pub fn behind(&self, s: f64) -> (&ResolvedCriteria, Option<&ResolvedRange>) {
        match self.ranges.iter().find(|r| s > r.from && s <= r.to) {
            Some(r) => (&r.criteria, Some(r)),
            None => (self, None),
        }
    }

    /// Every set of criteria in force somewhere over [a, b]: the one at `a`
    /// first, then the others in station order (each once).
    pub fn over(&self, a: f64, b: f64) -> Vec<(&ResolvedCriteria, Option<&ResolvedRange>)> {
        let mut out = vec![self.at(a)];
        let mut base_seen = out.first().is_some_and(|(_, r)| r.is_none());
        let mut cursor = a;
        for r in &self.ranges {
            if r.to <= a || r.from > b || (r.from >= b && b > a) {
                continue;
            }
            if r.from > cursor && !base_seen {
                out.push((self, None));
                base_seen = true;
            }
            if !out.iter().any(|(_, x)| x.is_some_and(|x| x.index == r.index)) {
                out.push((&r.criteria, Some(r)));
            }
            cursor = cursor.max(r.to);
        }
        if cursor < b && !base_seen {
            out.push((self, None));
        }
        out
    }
}
