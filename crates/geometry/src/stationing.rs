//! Station equations: where the stationing a person reads (the plan
//! station) jumps, while the geometry runs on along the internal distance.
//!
//! A station equation at internal station `I` says that the station just
//! behind it, `back`, is the same point as the station `ahead` (LandXML 1.2
//! `StaEquation`: `staInternal`, `staBack`, `staAhead`; common practice).
//! Before the first equation the plan station is the internal station (the
//! alignment's start plus the distance along it); after an equation at `I`
//! it is `ahead + (internal − I)`. When `ahead > back` the equation is
//! *short*: plan stations between them do not exist (a gap). When
//! `ahead < back` it is *long*: plan stations from `ahead` to `back` occur
//! twice, and a typed station there must say which (`17+00 (2)`: the second
//! time the road passes it).
//!
//! Everything is computed along the internal station; [`Stationing`] turns
//! an internal station into the plan label people read and a typed plan
//! station back into the internal one.

use std::sync::Arc;

use serde::{Deserialize, Serialize};

use crate::{StationError, Units, format_station, parse_station, tolerance};

/// One station equation.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct StationEquation {
    /// Where it is: the internal station (the alignment's start plus the
    /// distance along it).
    pub internal: f64,
    /// The plan station behind it.
    pub back: f64,
    /// The plan station ahead of it: the same point.
    pub ahead: f64,
}

impl StationEquation {
    /// The plan station the road reaches at `internal` coming from the
    /// equation before it (`None`: from the start, where plan and internal
    /// stations are one): what the equation there must state as its back
    /// station.
    pub fn reached(previous: Option<&Self>, internal: f64) -> f64 {
        previous.map_or(internal, |p| p.ahead + (internal - p.internal))
    }
}

/// A road's station equations, in internal-station order (shared: copies
/// of a design do not copy them).
#[derive(Clone, Debug, Default, PartialEq, Serialize, Deserialize)]
#[serde(transparent)]
pub struct Equations(Arc<[StationEquation]>);

impl Equations {
    /// The equations given, as they are (see [`Equations::problem`]).
    pub fn new(equations: Vec<StationEquation>) -> Self {
        Self(equations.into())
    }

    /// Whether there are none.
    pub fn is_empty(&self) -> bool {
        self.0.is_empty()
    }

    /// The equations.
    pub fn as_slice(&self) -> &[StationEquation] {
        &self.0
    }

    /// What makes these equations unusable, if anything: the 0-based index
    /// of the first bad one and why. Each must be finite and within the
    /// station range, after the one before it, and its back station must be
    /// the plan station the road reaches there (within
    /// [`tolerance::EQUATION_BACK`]).
    pub fn problem(&self) -> Option<(usize, String)> {
        let mut previous: Option<StationEquation> = None;
        for (k, e) in self.0.iter().enumerate() {
            if ![e.internal, e.back, e.ahead].iter().all(|v| tolerance::within_limit(*v)) {
                return Some((k, "a station is not a finite number within ±10,000,000".to_owned()));
            }
            let reached = match previous {
                None => e.internal,
                Some(p) => {
                    if e.internal <= p.internal {
                        return Some((
                            k,
                            format!(
                                "internal station {} is not after the previous equation's ({})",
                                crate::trimmed(e.internal, 6),
                                crate::trimmed(p.internal, 6)
                            ),
                        ));
                    }
                    StationEquation::reached(Some(&p), e.internal)
                }
            };
            if (reached - e.back).abs() > tolerance::EQUATION_BACK {
                return Some((
                    k,
                    format!(
                        "back station {} is not the station the road reaches there ({})",
                        crate::trimmed(e.back, 6),
                        crate::trimmed(reached, 6)
                    ),
                ));
            }
            previous = Some(*e);
        }
        None
    }

    /// `list` sorted by internal station with every back station set to the
    /// plan station the road reaches there (so an edit of one equation
    /// keeps the others true).
    pub fn settled(mut list: Vec<StationEquation>) -> Self {
        list.sort_by(|a, b| a.internal.total_cmp(&b.internal));
        let mut previous: Option<StationEquation> = None;
        for e in &mut list {
            e.back = StationEquation::reached(previous.as_ref(), e.internal);
            previous = Some(*e);
        }
        Self::new(list)
    }

    /// The stationing of these equations in `units`.
    pub fn stationing(&self, units: Units) -> Stationing<'_> {
        Stationing { units, equations: &self.0 }
    }
}

impl From<Vec<StationEquation>> for Equations {
    fn from(equations: Vec<StationEquation>) -> Self {
        Self::new(equations)
    }
}

/// How internal stations are read and written as plan stations: the units'
/// notation and the road's station equations.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Stationing<'a> {
    /// The notation (`1+234.567` or `12+34.56`).
    pub units: Units,
    /// The equations, in internal-station order.
    pub equations: &'a [StationEquation],
}

/// Where a plan station lies.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct PlanStation {
    /// The plan station.
    pub value: f64,
    /// Which stretch between equations (0 before the first).
    pub region: usize,
    /// When the plan station occurs more than once (a long equation):
    /// which time this is, from 1, and how many times it occurs.
    pub occurrence: Option<(usize, usize)>,
}

impl<'a> Stationing<'a> {
    /// Stationing without equations: the plan station is the internal one.
    pub fn plain(units: Units) -> Self {
        Self { units, equations: &[] }
    }

    /// Whether the road has no equation.
    pub fn is_plain(&self) -> bool {
        self.equations.is_empty()
    }

    /// The internal stations each region spans (the first and last open).
    fn region_span(&self, region: usize) -> (f64, f64) {
        let start = match region.checked_sub(1) {
            None => f64::NEG_INFINITY,
            Some(k) => self.equations.get(k).map_or(f64::INFINITY, |e| e.internal),
        };
        let end = self.equations.get(region).map_or(f64::INFINITY, |e| e.internal);
        (start, end)
    }

    /// The plan station of `internal` in `region`.
    fn plan_in(&self, internal: f64, region: usize) -> f64 {
        match region.checked_sub(1).and_then(|k| self.equations.get(k)) {
            None => internal,
            Some(e) => e.ahead + (internal - e.internal),
        }
    }

    /// The region holding `internal` (at an equation, the one ahead).
    fn region_of(&self, internal: f64) -> usize {
        self.equations.partition_point(|e| e.internal <= internal)
    }

    /// The internal stations where the plan station `plan` lies, in order
    /// (one where the plan station is unique, none in a gap, several in the
    /// overlap of a long equation); an equation's own point counts once.
    pub fn internals(&self, plan: f64) -> Vec<f64> {
        let mut out: Vec<f64> = Vec::new();
        for region in 0..=self.equations.len() {
            let (start, end) = self.region_span(region);
            let offset = self.plan_in(0.0, region);
            let internal = plan - offset;
            let slack = tolerance::station_hair(plan);
            if internal >= start - slack && internal <= end + slack {
                let internal = internal.clamp(start, end);
                if !out.last().is_some_and(|last| (last - internal).abs() <= slack) {
                    out.push(internal);
                }
            }
        }
        out
    }

    /// The plan station of an internal station.
    pub fn plan(&self, internal: f64) -> PlanStation {
        let region = self.region_of(internal);
        let value = self.plan_in(internal, region);
        let occurrence = if self.is_plain() {
            None
        } else {
            let all = self.internals(value);
            let slack = tolerance::station_hair(internal);
            let at = all.iter().position(|i| (i - internal).abs() <= slack);
            (all.len() > 1).then(|| (at.unwrap_or(0) + 1, all.len()))
        };
        PlanStation { value, region, occurrence }
    }

    /// The plan station of `internal` as people read it: station notation
    /// with `decimals` decimals, and the occurrence (`17+00.00 (2)`) where
    /// the plan station occurs more than once.
    pub fn label(&self, internal: f64, decimals: usize) -> String {
        let plan = self.plan(internal);
        let text = format_station(plan.value, self.units, decimals);
        match plan.occurrence {
            Some((k, _)) => format!("{text} ({k})"),
            None => text,
        }
    }

    /// The labels a table gives the row of `internal`: at a station
    /// equation one for each side (its back station, then its ahead station:
    /// the same point), elsewhere its [`Stationing::label`].
    pub fn sides(&self, internal: f64, decimals: usize) -> Vec<String> {
        match self.equations.iter().find(|e| tolerance::same_station(e.internal, internal)) {
            Some(e) => vec![
                format_station(e.back, self.units, decimals),
                format_station(e.ahead, self.units, decimals),
            ],
            None => vec![self.label(internal, decimals)],
        }
    }

    /// [`Stationing::label`] with the units' usual decimals.
    pub fn label_std(&self, internal: f64) -> String {
        self.label(internal, self.units.station_decimals())
    }

    /// The internal station of a typed plan station: station notation or a
    /// plain number, optionally followed by which occurrence (`17+00 (2)`)
    /// where the plan station occurs more than once.
    ///
    /// # Errors
    /// As [`parse_station`], and when the station lies in the gap of a short
    /// equation, occurs more than once and the text does not say which, or
    /// names an occurrence there is not.
    pub fn parse(&self, text: &str) -> Result<f64, StationError> {
        let trimmed = text.trim();
        let (station, which) = match trimmed.strip_suffix(')').and_then(|t| t.rsplit_once('(')) {
            Some((head, n)) => match n.trim().parse::<usize>() {
                Ok(n) => (head.trim_end(), Some(n)),
                Err(_) => return Err(StationError::Malformed(crate::excerpt(trimmed), self.example())),
            },
            None => (trimmed, None),
        };
        let plan = parse_station(station, self.units)?;
        if self.is_plain() {
            return match which {
                None | Some(1) => Ok(plan),
                Some(_) => Err(StationError::NoSuchOccurrence { text: crate::excerpt(trimmed), count: 1 }),
            };
        }
        let all = self.internals(plan);
        match (all.as_slice(), which) {
            ([], _) => {
                let gap = self.equations.iter().find(|e| e.back < plan && plan < e.ahead);
                Err(StationError::InGap {
                    text: crate::excerpt(trimmed),
                    back: gap.map_or(String::new(), |e| format_station(e.back, self.units, self.decimals())),
                    ahead: gap
                        .map_or(String::new(), |e| format_station(e.ahead, self.units, self.decimals())),
                })
            }
            ([one], None | Some(1)) => Ok(*one),
            (many, Some(n)) if n >= 1 && n <= many.len() => Ok(many.get(n - 1).copied().unwrap_or(plan)),
            (many, Some(_)) => {
                Err(StationError::NoSuchOccurrence { text: crate::excerpt(trimmed), count: many.len() })
            }
            (many, None) => Err(StationError::Ambiguous {
                text: crate::excerpt(trimmed),
                choices: many.iter().map(|i| self.label_std(*i)).collect(),
            }),
        }
    }

    fn decimals(&self) -> usize {
        self.units.station_decimals()
    }

    fn example(&self) -> &'static str {
        match self.units {
            Units::Metric => "1+234.567 (2)",
            Units::UsCustomary => "12+34.56 (2)",
        }
    }

    /// Each equation's internal station and its mark, "back = ahead"
    /// (`15+00.00 back = 16+00.00 ahead`).
    pub fn marks(&self) -> Vec<(f64, String)> {
        let d = self.decimals();
        self.equations
            .iter()
            .map(|e| {
                (
                    e.internal,
                    format!(
                        "{} back = {} ahead",
                        format_station(e.back, self.units, d),
                        format_station(e.ahead, self.units, d)
                    ),
                )
            })
            .collect()
    }

    /// The internal stations of the even plan stations (multiples of
    /// `interval`) from internal `from` to `to`: the grid restarts on even
    /// stations ahead of each equation (common practice). In order, each
    /// once.
    pub fn even(&self, from: f64, to: f64, interval: f64) -> Vec<f64> {
        let mut out = Vec::new();
        for region in 0..=self.equations.len() {
            let (start, end) = self.region_span(region);
            let (start, end) = (start.max(from), end.min(to));
            if start > end {
                continue;
            }
            let offset = self.plan_in(0.0, region);
            for plan in crate::even_stations(start + offset, end + offset, interval) {
                let internal = plan - offset;
                if !out
                    .last()
                    .is_some_and(|last: &f64| (last - internal).abs() <= tolerance::station_hair(internal))
                {
                    out.push(internal);
                }
            }
        }
        out
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn eq(internal: f64, back: f64, ahead: f64) -> StationEquation {
        StationEquation { internal, back, ahead }
    }

    #[test]
    fn problems_are_named() {
        assert_eq!(Equations::new(vec![eq(1500.0, 1500.0, 1600.0)]).problem(), None);
        let two = Equations::new(vec![eq(1500.0, 1500.0, 1600.0), eq(1400.0, 1500.0, 1600.0)]);
        assert!(two.problem().is_some_and(|(k, why)| k == 1 && why.contains("not after")));
        let back = Equations::new(vec![eq(1500.0, 1490.0, 1600.0)]);
        assert!(back.problem().is_some_and(|(k, why)| k == 0 && why.contains("1500")));
        let nan = Equations::new(vec![eq(f64::NAN, 1.0, 2.0)]);
        assert!(nan.problem().is_some());
    }
}
