//! The profile as the designer enters it: an ordered list of PVIs, each with an
//! optional vertical curve, plus validation that reports every problem at once.

use serde::{Deserialize, Serialize};

use crate::tolerance::past;
use crate::{FindingCode, Station, Units};

/// The vertical curve at a PVI.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize, Default)]
#[serde(deny_unknown_fields)]
pub enum VerticalCurve {
    /// A plain grade break (or the first/last PVI). Written `NoCurve` (a
    /// file never needs it: the field is left out); `None` still reads.
    #[default]
    #[serde(rename = "NoCurve", alias = "None")]
    None,
    /// An equal-tangent parabola of total length `length`, centred on the PVI.
    Symmetric {
        /// Horizontal length PVC→PVT.
        length: f64,
    },
    /// An unequal-tangent parabola: `length_in` before the PVI, `length_out` after.
    Unequal {
        /// Horizontal length PVC→PVI.
        length_in: f64,
        /// Horizontal length PVI→PVT.
        length_out: f64,
    },
}

impl VerticalCurve {
    /// Builds a curve from its two half lengths: both zero is no curve, both equal
    /// is symmetric, otherwise unequal-tangent.
    pub fn from_lengths(length_in: f64, length_out: f64) -> Self {
        if length_in == 0.0 && length_out == 0.0 {
            Self::None
        } else if crate::tolerance::nearly_equal(length_in, length_out) {
            Self::Symmetric { length: length_in + length_out }
        } else {
            Self::Unequal { length_in, length_out }
        }
    }

    /// Whether there is no curve at all (for leaving the field out of files).
    pub fn is_none(&self) -> bool {
        matches!(self, Self::None)
    }

    /// Length before the PVI (PVC→PVI).
    pub fn length_in(self) -> f64 {
        match self {
            Self::None => 0.0,
            Self::Symmetric { length } => length / 2.0,
            Self::Unequal { length_in, .. } => length_in,
        }
    }

    /// Length after the PVI (PVI→PVT).
    pub fn length_out(self) -> f64 {
        match self {
            Self::None => 0.0,
            Self::Symmetric { length } => length / 2.0,
            Self::Unequal { length_out, .. } => length_out,
        }
    }

    /// Total horizontal length PVC→PVT.
    pub fn length(self) -> f64 {
        match self {
            Self::None => 0.0,
            Self::Symmetric { length } => length,
            Self::Unequal { length_in, length_out } => length_in + length_out,
        }
    }

    /// Whether this is a real curve (any length above zero).
    pub fn is_curve(self) -> bool {
        self.length_in() > 0.0 || self.length_out() > 0.0
    }

    /// The same curve type scaled to a new total length (unequal curves keep
    /// their in/out ratio).
    #[must_use]
    pub fn with_length(self, total: f64) -> Self {
        match self {
            Self::None | Self::Symmetric { .. } => {
                if total > 0.0 {
                    Self::Symmetric { length: total }
                } else {
                    Self::None
                }
            }
            Self::Unequal { length_in, length_out } => {
                let old = length_in + length_out;
                if old > 0.0 && total > 0.0 {
                    Self::Unequal { length_in: total * length_in / old, length_out: total * length_out / old }
                } else {
                    Self::None
                }
            }
        }
    }
}

/// A point of vertical intersection: where two grade lines meet.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Pvi {
    /// Station of the PVI.
    pub station: Station,
    /// Elevation of the PVI (the grade lines' intersection, not the curve).
    pub elevation: f64,
    /// The vertical curve at this PVI (left out of files when there is none).
    #[serde(default, skip_serializing_if = "VerticalCurve::is_none")]
    pub curve: VerticalCurve,
}

impl Pvi {
    /// A PVI with no curve.
    pub fn new(station: f64, elevation: f64) -> Self {
        Self { station: Station(station), elevation, curve: VerticalCurve::None }
    }

    /// The grade (decimal fraction, + rising) of the tangent from this PVI to
    /// `next`.
    pub fn grade_to(&self, next: &Pvi) -> f64 {
        (next.elevation - self.elevation) / (next.station - self.station)
    }

    /// Station of the curve's start (PVC); the PVI's station when there is
    /// no curve.
    pub fn pvc(&self) -> f64 {
        self.station.0 - self.curve.length_in()
    }

    /// Station of the curve's end (PVT); the PVI's station when there is no
    /// curve.
    pub fn pvt(&self) -> f64 {
        self.station.0 + self.curve.length_out()
    }

    /// A PVI with a symmetric curve of total length `length` (0 = no curve).
    pub fn with_curve(station: f64, elevation: f64, length: f64) -> Self {
        Self {
            station: Station(station),
            elevation,
            curve: VerticalCurve::from_lengths(length / 2.0, length / 2.0),
        }
    }
}

/// A vertical profile: PVIs in station order, in one unit system.
#[derive(Clone, Debug, PartialEq, Default)]
pub struct Profile {
    /// Unit system of every station, elevation and length.
    pub units: Units,
    /// The PVIs, first to last.
    pub pvis: Vec<Pvi>,
    /// The station equations: how its internal stations read as plan
    /// stations (none: the same).
    pub equations: crate::Equations,
}

/// What is wrong with a profile, naming the PVI (0-based index) concerned.
#[derive(Clone, Debug, PartialEq, thiserror::Error)]
pub enum ProfileProblem {
    /// A profile needs at least two PVIs.
    #[error("the profile has {count} PVI(s); at least two are needed")]
    TooFewPvis {
        /// How many there are.
        count: usize,
    },
    /// A number is NaN or infinite.
    #[error("PVI {}: {field} is not a finite number", .index + 1)]
    NotFinite {
        /// The PVI.
        index: usize,
        /// Which value.
        field: &'static str,
    },
    /// A number is finite but far outside any road (beyond ±[`Profile::LIMIT`]).
    #[error("PVI {}: {field} {value:e} is outside ±{limit:e}, the range Gradewright accepts", .index + 1)]
    OutOfRange {
        /// The PVI.
        index: usize,
        /// Which value.
        field: &'static str,
        /// Its value.
        value: f64,
        /// The limit.
        limit: f64,
    },
    /// A curve length is negative.
    #[error("PVI {}: {field} is negative ({value})", .index + 1)]
    NegativeLength {
        /// The PVI.
        index: usize,
        /// Which length.
        field: &'static str,
        /// Its value.
        value: f64,
    },
    /// Stations must strictly increase.
    #[error("PVI {}: station {station} is not after the previous PVI's station {previous}", .index + 1)]
    StationOrder {
        /// The PVI.
        index: usize,
        /// Its station.
        station: f64,
        /// The previous PVI's station.
        previous: f64,
    },
    /// The first and last PVI cannot carry a curve.
    #[error("PVI {}: the first and last PVI cannot carry a vertical curve", .index + 1)]
    CurveAtEnd {
        /// The PVI.
        index: usize,
    },
    /// A curve half is longer than its tangent.
    #[error("PVI {}: the curve's {side} part ({length}) is longer than its tangent ({available})", .index + 1)]
    CurveExceedsTangent {
        /// The PVI.
        index: usize,
        /// `"back"` (before the PVI) or `"ahead"` (after it).
        side: &'static str,
        /// That part's length.
        length: f64,
        /// The tangent's length.
        available: f64,
    },
    /// An unequal-tangent curve with one part of zero length.
    #[error("PVI {}: both parts of an unequal-tangent curve must be longer than zero", .index + 1)]
    ZeroCurvePart {
        /// The PVI.
        index: usize,
    },
    /// Two curves overlap: the PVT of one is past the PVC of the next.
    #[error("PVI {} and PVI {}: curves overlap by {overlap} (PVT {pvt} is past PVC {pvc})", .index + 1, .index + 2)]
    Overlap {
        /// The first of the two PVIs.
        index: usize,
        /// PVT station of the first curve.
        pvt: f64,
        /// PVC station of the next curve.
        pvc: f64,
        /// How much they overlap.
        overlap: f64,
    },
}

impl ProfileProblem {
    /// The finding code reports give it (`curve.overlap`, …).
    pub fn code(&self) -> FindingCode {
        match self {
            Self::TooFewPvis { .. } => FindingCode::ProfileTooFewPvis,
            Self::NotFinite { .. } => FindingCode::ProfileNotFinite,
            Self::OutOfRange { .. } => FindingCode::ProfileOutOfRange,
            Self::NegativeLength { .. } => FindingCode::ProfileNegativeLength,
            Self::StationOrder { .. } => FindingCode::ProfileStationOrder,
            Self::CurveAtEnd { .. } => FindingCode::ProfileCurveAtEnd,
            Self::CurveExceedsTangent { .. } => FindingCode::CurveExceedsTangent,
            Self::ZeroCurvePart { .. } => FindingCode::CurveZeroPart,
            Self::Overlap { .. } => FindingCode::CurveOverlap,
        }
    }

    /// The field of the PVI that is at fault, as the PVI table names it.
    pub fn field(&self) -> &'static str {
        match self {
            Self::TooFewPvis { .. } => "pvis",
            Self::NotFinite { field, .. } | Self::OutOfRange { field, .. } => match *field {
                "station" => "station",
                "elevation" => "elevation",
                _ => "curve_length",
            },
            Self::StationOrder { .. } => "station",
            Self::NegativeLength { .. }
            | Self::CurveAtEnd { .. }
            | Self::ZeroCurvePart { .. }
            | Self::CurveExceedsTangent { .. }
            | Self::Overlap { .. } => "curve_length",
        }
    }

    /// The first PVI concerned, if any.
    pub fn pvi_index(&self) -> Option<usize> {
        match self {
            Self::TooFewPvis { .. } => None,
            Self::NotFinite { index, .. }
            | Self::OutOfRange { index, .. }
            | Self::NegativeLength { index, .. }
            | Self::StationOrder { index, .. }
            | Self::CurveAtEnd { index }
            | Self::ZeroCurvePart { index }
            | Self::CurveExceedsTangent { index, .. }
            | Self::Overlap { index, .. } => Some(*index),
        }
    }
}

impl Profile {
    /// The largest magnitude accepted for a station, an elevation or a curve
    /// length, in the project's unit (10 000 km or 10 million ft): anything
    /// beyond is a mistake, and would lose every digit that matters.
    pub const LIMIT: f64 = crate::tolerance::COORDINATE_LIMIT;

    /// A profile from PVIs.
    pub fn new(units: Units, pvis: Vec<Pvi>) -> Self {
        Self { units, pvis, equations: crate::Equations::default() }
    }

    /// The profile with these station equations.
    #[must_use]
    pub fn with_equations(mut self, equations: crate::Equations) -> Self {
        self.equations = equations;
        self
    }

    /// How its stations read as plan stations.
    pub fn stationing(&self) -> crate::Stationing<'_> {
        self.equations.stationing(self.units)
    }

    /// The grade of tangent `i` (from PVI `i` to PVI `i + 1`) in percent;
    /// `None` when there is no such tangent.
    pub fn tangent_grade_percent(&self, i: usize) -> Option<f64> {
        let (a, b) = (self.pvis.get(i)?, self.pvis.get(i + 1)?);
        Some(a.grade_to(b) * 100.0)
    }

    /// The free tangent between the curve at PVI `i` and the curve at PVI
    /// `i + 1`: from the first's PVT to the second's PVC (reversed when the
    /// curves overlap). `None` when there is no PVI `i + 1`.
    pub fn tangent(&self, i: usize) -> Option<(f64, f64)> {
        Some((self.pvis.get(i)?.pvt(), self.pvis.get(i + 1)?.pvc()))
    }

    /// The length of [`Profile::tangent`] `i`: the room left between the two
    /// curves (negative when they overlap).
    pub fn room(&self, i: usize) -> Option<f64> {
        self.tangent(i).map(|(pvt, pvc)| pvc - pvt)
    }

    /// The longest total length the curve at PVI `index` can have without
    /// passing its neighbours' curves, keeping an unequal curve's in/out
    /// ratio (a curve of none shares it equally). `None` for an end PVI.
    pub fn curve_room(&self, index: usize) -> Option<f64> {
        let (prev, pvi, next) =
            (self.pvis.get(index.checked_sub(1)?)?, self.pvis.get(index)?, self.pvis.get(index + 1)?);
        let back = pvi.station.0 - prev.pvt();
        let ahead = next.pvc() - pvi.station.0;
        let total = pvi.curve.length();
        let (share_in, share_out) = if total > 0.0 {
            (pvi.curve.length_in() / total, pvi.curve.length_out() / total)
        } else {
            (0.5, 0.5)
        };
        Some((back / share_in).min(ahead / share_out).max(0.0))
    }

    /// The steepest tangent grade, PVI to PVI, in percent (grades that are
    /// not finite numbers left out; 0 for fewer than two PVIs).
    pub fn steepest_grade_percent(&self) -> f64 {
        (0..self.pvis.len())
            .filter_map(|i| self.tangent_grade_percent(i))
            .map(f64::abs)
            .filter(|g| g.is_finite())
            .fold(0.0, f64::max)
    }

    /// Every problem that stops the profile from being evaluated, all at once.
    /// An empty list means [`crate::Alignment::new`] will succeed.
    pub fn problems(&self) -> Vec<ProfileProblem> {
        let mut problems = Vec::new();
        let n = self.pvis.len();
        if n < 2 {
            problems.push(ProfileProblem::TooFewPvis { count: n });
        }
        let mut finite = vec![true; n];
        for (index, pvi) in self.pvis.iter().enumerate() {
            // A symmetric curve is given (and named) by its whole length; an
            // unequal-tangent one by its two.
            let values = match pvi.curve {
                VerticalCurve::Unequal { length_in, length_out } => [
                    ("station", pvi.station.0),
                    ("elevation", pvi.elevation),
                    ("curve length in", length_in),
                    ("curve length out", length_out),
                ],
                _ => [
                    ("station", pvi.station.0),
                    ("elevation", pvi.elevation),
                    ("curve length", pvi.curve.length()),
                    ("curve length", 0.0),
                ],
            };
            for (field, value) in values {
                if !value.is_finite() {
                    problems.push(ProfileProblem::NotFinite { index, field });
                    finite[index] = false;
                } else if value.abs() > Self::LIMIT {
                    problems.push(ProfileProblem::OutOfRange { index, field, value, limit: Self::LIMIT });
                    finite[index] = false;
                } else if field.starts_with("curve") && value < 0.0 {
                    problems.push(ProfileProblem::NegativeLength { index, field, value });
                    finite[index] = false;
                }
            }
            if pvi.curve.is_curve() && (pvi.curve.length_in() == 0.0 || pvi.curve.length_out() == 0.0) {
                problems.push(ProfileProblem::ZeroCurvePart { index });
                finite[index] = false;
            }
            if (index == 0 || index + 1 == n) && pvi.curve.is_curve() {
                problems.push(ProfileProblem::CurveAtEnd { index });
            }
        }
        let mut ordered = true;
        for (index, pair) in self.pvis.windows(2).enumerate() {
            let [a, b] = pair else { continue };
            if finite[index] && finite[index + 1] && b.station.0 <= a.station.0 {
                ordered = false;
                problems.push(ProfileProblem::StationOrder {
                    index: index + 1,
                    station: b.station.0,
                    previous: a.station.0,
                });
            }
        }
        if !ordered || finite.iter().any(|f| !f) {
            return problems;
        }
        for (index, pvi) in self.pvis.iter().enumerate() {
            if index == 0 || index + 1 == n {
                continue;
            }
            let (Some(prev), Some(next)) = (self.pvis.get(index - 1), self.pvis.get(index + 1)) else {
                continue;
            };
            let back = pvi.station - prev.station;
            let ahead = next.station - pvi.station;
            // A curve may reach its neighbour's station (to round-off): only
            // a PVC before it, or a PVT past it, by more than the station
            // hair does not fit.
            if past(prev.station.0, pvi.pvc()) {
                problems.push(ProfileProblem::CurveExceedsTangent {
                    index,
                    side: "back",
                    length: pvi.curve.length_in(),
                    available: back,
                });
            }
            if past(pvi.pvt(), next.station.0) {
                problems.push(ProfileProblem::CurveExceedsTangent {
                    index,
                    side: "ahead",
                    length: pvi.curve.length_out(),
                    available: ahead,
                });
            }
        }
        for (index, pair) in self.pvis.windows(2).enumerate() {
            let [a, b] = pair else { continue };
            let (pvt, pvc) = (a.pvt(), b.pvc());
            // Only report an overlap between two real curves; a single curve that is
            // too long for its tangent was reported above. Curves that touch
            // (to round-off) do not overlap.
            if past(pvt, pvc) && a.curve.is_curve() && b.curve.is_curve() {
                problems.push(ProfileProblem::Overlap { index, pvt, pvc, overlap: pvt - pvc });
            }
        }
        problems
    }

    /// Station of the first PVI.
    pub fn start(&self) -> Option<Station> {
        self.pvis.first().map(|p| p.station)
    }

    /// Station of the last PVI.
    pub fn end(&self) -> Option<Station> {
        self.pvis.last().map(|p| p.station)
    }
}
