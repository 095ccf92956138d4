//! One vertical curve: the parabola between PVC and PVT at an interior PVI.
//!
//! Grades are percent at the interface and decimal inside the formulas.
//! Equal-tangent curve (length L, grades g1 → g2, x from the PVC):
//!
//! * PVC = PVI − L/2, elev_PVC = elev_PVI − g1·L/200; PVT = PVI + L/2,
//!   elev_PVT = elev_PVI + g2·L/200
//! * y(x) = y_PVC + g1·x/100 + (g2 − g1)·x²/(200·L); grade g(x) = g1 + (g2 − g1)·x/L
//! * r = (g2 − g1)/L (% per unit length) is the constant y″; K = L/A with
//!   A = |g2 − g1|; external E = A·L/800
//! * turning (high/low) point at x = g1·L/(g1 − g2), only when g1·g2 < 0
//!
//! Unequal-tangent curve (l1 before the PVI, l2 after, L = l1 + l2): two
//! parabolas joined at the point under the PVI (the CVC) where the grade is
//! g_c = (l1·g1 + l2·g2)/L and the offset from the PVI is
//! e = l1·l2·(g2 − g1)/(2L); r1 = l2(g2 − g1)/(l1·L), r2 = l1(g2 − g1)/(l2·L).
//!
//! Sources: the equal-tangent relations are those of F. L. Mannering and
//! S. S. Washburn, *Principles of Highway Engineering and Traffic Analysis*,
//! ch. 3 (vertical curve fundamentals; equation numbers from memory); the
//! unequal-tangent relations are derived from them (two parabolas meeting
//! under the PVI with a common tangent). See `docs/sources.md`.
//!
//! A grade change of at most [`crate::tolerance::GRADE_CHANGE_PERCENT`] is no
//! grade change ([`CurveKind::None`]).

use crate::tolerance::{is_grade_change, nearly_equal};
use crate::{Pvi, Station};

/// Whether a grade change is a crest, a sag, or none at all.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
pub enum CurveKind {
    /// Grade decreases (g2 < g1): the road goes over a hill.
    Crest,
    /// Grade increases (g2 > g1): the road goes through a dip.
    Sag,
    /// No grade change: no curve is needed.
    None,
}

impl CurveKind {
    /// `"crest"`, `"sag"` or `"none"`.
    pub fn key(self) -> &'static str {
        match self {
            Self::Crest => "crest",
            Self::Sag => "sag",
            Self::None => "none",
        }
    }
}

/// A piece of the profile on which y″ is constant: a tangent (rate 0) or one
/// parabolic branch. Elevation y(s) = y0 + g0·(s − s0) + c·(s − s0)²/2.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Segment {
    /// First station of the piece.
    pub start: f64,
    /// Last station of the piece.
    pub end: f64,
    /// Elevation at `start`.
    pub elevation: f64,
    /// Grade at `start`, decimal (0.02 = 2 %).
    pub grade: f64,
    /// Second derivative y″, decimal grade per unit length.
    pub rate: f64,
}

impl Segment {
    /// Elevation at station `s` (not range-checked).
    #[inline]
    pub fn elevation_at(&self, s: f64) -> f64 {
        let dx = s - self.start;
        self.elevation + dx * (self.grade + 0.5 * self.rate * dx)
    }

    /// Decimal grade at station `s` (not range-checked).
    #[inline]
    pub fn grade_at(&self, s: f64) -> f64 {
        self.grade + self.rate * (s - self.start)
    }

    /// The station in this piece where the grade is zero, strictly inside it or
    /// at one end, if the piece is curved.
    pub fn level_point(&self) -> Option<f64> {
        if self.rate == 0.0 {
            return None;
        }
        let s = self.start - self.grade / self.rate;
        (s >= self.start && s <= self.end).then_some(s)
    }
}

/// Everything a designer reads off one vertical curve.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct CurveGeometry {
    /// 0-based index of the PVI in the profile.
    pub index: usize,
    /// PVI station.
    pub pvi: Station,
    /// PVI elevation.
    pub pvi_elevation: f64,
    /// Grade in (back tangent), percent.
    pub grade_in_percent: f64,
    /// Grade out (forward tangent), percent.
    pub grade_out_percent: f64,
    /// Length PVC→PVI.
    pub length_in: f64,
    /// Length PVI→PVT.
    pub length_out: f64,
    /// Crest, sag or none.
    pub kind: CurveKind,
    /// PVC (BVC) station.
    pub pvc: Station,
    /// PVC elevation.
    pub pvc_elevation: f64,
    /// PVT (EVC) station.
    pub pvt: Station,
    /// PVT elevation.
    pub pvt_elevation: f64,
    /// Signed vertical offset from the PVI to the curve (negative on a crest);
    /// its magnitude is the external E.
    pub offset_at_pvi: f64,
    /// High or low point (station, elevation) when it lies on the curve.
    pub turning: Option<(Station, f64)>,
}

impl CurveGeometry {
    /// Builds the curve at `pvi` between its neighbours `prev` and `next`.
    /// The caller guarantees finite values and increasing stations; the curve
    /// itself may still overlap its neighbours (checks report that).
    pub fn new(index: usize, prev: &Pvi, pvi: &Pvi, next: &Pvi) -> Self {
        let (g1, g2) = (prev.grade_to(pvi), pvi.grade_to(next));
        let l1 = pvi.curve.length_in();
        let l2 = pvi.curve.length_out();
        let diff = g2 - g1;
        let kind = if !is_grade_change(diff * 100.0) {
            CurveKind::None
        } else if diff < 0.0 {
            CurveKind::Crest
        } else {
            CurveKind::Sag
        };
        let total = l1 + l2;
        let offset = if total > 0.0 { l1 * l2 * diff / (2.0 * total) } else { 0.0 };
        let mut curve = Self {
            index,
            pvi: pvi.station,
            pvi_elevation: pvi.elevation,
            grade_in_percent: g1 * 100.0,
            grade_out_percent: g2 * 100.0,
            length_in: l1,
            length_out: l2,
            kind,
            pvc: pvi.station - l1,
            pvc_elevation: pvi.elevation - g1 * l1,
            pvt: pvi.station + l2,
            pvt_elevation: pvi.elevation + g2 * l2,
            offset_at_pvi: offset,
            turning: None,
        };
        if g1 * g2 < 0.0 {
            curve.turning = curve
                .segments()
                .into_iter()
                .flatten()
                .find_map(|seg| seg.level_point().map(|s| (Station(s), seg.elevation_at(s))));
        }
        curve
    }

    /// Total length L = l1 + l2.
    pub fn length(&self) -> f64 {
        self.length_in + self.length_out
    }

    /// Whether l1 = l2 (within [`crate::tolerance::EQUAL_RELATIVE`]).
    pub fn is_symmetric(&self) -> bool {
        nearly_equal(self.length_in, self.length_out)
    }

    /// Algebraic difference of grades A = |g2 − g1|, percent.
    pub fn a_percent(&self) -> f64 {
        (self.grade_out_percent - self.grade_in_percent).abs()
    }

    /// External distance E = |offset at the PVI| (A·L/800 when symmetric).
    pub fn external(&self) -> f64 {
        self.offset_at_pvi.abs()
    }

    /// Rates of grade change r1, r2 of the two branches, percent per unit length
    /// (equal to (g2 − g1)/L on an equal-tangent curve). Zero for no curve.
    pub fn rates_percent(&self) -> (f64, f64) {
        let diff = self.grade_out_percent - self.grade_in_percent;
        let (l1, l2) = (self.length_in, self.length_out);
        let total = l1 + l2;
        if l1 <= 0.0 || l2 <= 0.0 {
            return (0.0, 0.0);
        }
        (l2 * diff / (l1 * total), l1 * diff / (l2 * total))
    }

    /// K, horizontal length per percent of grade change: L/A on an equal-tangent
    /// curve. On an unequal-tangent curve, the K of its sharper branch,
    /// 1/max(|r1|, |r2|), which is never larger than L/A (conservative for
    /// checks; [`Self::k_overall`] gives L/A). `None` when there is no grade
    /// change; zero for a bare grade break.
    pub fn k(&self) -> Option<f64> {
        let a = self.a_percent();
        if self.kind == CurveKind::None {
            return None;
        }
        if self.is_symmetric() || self.length() == 0.0 {
            return Some(self.length() / a);
        }
        let (r1, r2) = self.rates_percent();
        Some(1.0 / r1.abs().max(r2.abs()))
    }

    /// K = L/A of the whole curve, whatever its branches; `None` when there is
    /// no grade change.
    pub fn k_overall(&self) -> Option<f64> {
        (self.kind != CurveKind::None).then(|| self.length() / self.a_percent())
    }

    /// How much longer than an equal-tangent curve of the same sharpness an
    /// unequal-tangent curve of this l1:l2 ratio must be: max(l1/l2, l2/l1)
    /// (1 when symmetric or no curve). A requirement on the equal-tangent
    /// length L_eq = K·A calls for a total length L_eq × this factor at this
    /// ratio (derived from r1 = l2·(g2 − g1)/(l1·L), r2 = l1·(g2 − g1)/(l2·L)).
    pub fn ratio_factor(&self) -> f64 {
        let (l1, l2) = (self.length_in, self.length_out);
        if l1 <= 0.0 || l2 <= 0.0 || self.is_symmetric() { 1.0 } else { (l1 / l2).max(l2 / l1) }
    }

    /// The curve's one or two parabolic pieces (none for a bare grade break).
    pub fn segments(&self) -> [Option<Segment>; 2] {
        let g1 = self.grade_in_percent / 100.0;
        let (r1, r2) = self.rates_percent();
        if self.length() <= 0.0 {
            return [None, None];
        }
        let first = Segment {
            start: self.pvc.0,
            end: self.pvi.0,
            elevation: self.pvc_elevation,
            grade: g1,
            rate: r1 / 100.0,
        };
        let gc = first.grade_at(self.pvi.0);
        let second = Segment {
            start: self.pvi.0,
            end: self.pvt.0,
            elevation: self.pvi_elevation + self.offset_at_pvi,
            grade: gc,
            rate: r2 / 100.0,
        };
        [Some(first), Some(second)]
    }
}
