//! Control points: elevations the profile must meet, stay above or stay
//! below at a station, and the findings when it does not.

use serde::{Deserialize, Serialize};

use crate::tolerance::{above, below};
use crate::{Alignment, Finding, FindingCode, Station, Units};

/// What a control point asks of the profile.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize)]
pub enum ControlKind {
    /// Meet the elevation within ± the tolerance (a tie-in, an existing
    /// intersection).
    Fixed,
    /// Stay at or above the elevation (cover over a culvert, a flood level).
    Minimum,
    /// Stay at or below the elevation (under a structure or an overhead
    /// line: the underside minus the clearance).
    Maximum,
}

impl ControlKind {
    /// Every kind, in menu order.
    pub const ALL: [Self; 3] = [Self::Fixed, Self::Minimum, Self::Maximum];

    /// The word used in files: `fixed`, `min`, `max`.
    pub fn key(self) -> &'static str {
        match self {
            Self::Fixed => "fixed",
            Self::Minimum => "min",
            Self::Maximum => "max",
        }
    }

    /// The kind a file word names (also `minimum`, `maximum`; any case).
    pub fn from_key(text: &str) -> Option<Self> {
        match text.trim().to_ascii_lowercase().as_str() {
            "fixed" => Some(Self::Fixed),
            "min" | "minimum" => Some(Self::Minimum),
            "max" | "maximum" => Some(Self::Maximum),
            _ => None,
        }
    }

    /// A short label for screens.
    pub fn label(self) -> &'static str {
        match self {
            Self::Fixed => "Fixed",
            Self::Minimum => "Minimum",
            Self::Maximum => "Maximum",
        }
    }
}

/// An elevation the profile must meet (fixed), stay above (minimum) or stay
/// below (maximum) at a station.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ControlPoint {
    /// What it is (a tie-in, a culvert, a bridge).
    #[serde(default)]
    pub name: String,
    /// Station.
    pub station: f64,
    /// What it asks of the profile.
    pub kind: ControlKind,
    /// The elevation.
    pub elevation: f64,
    /// For a fixed point, the allowed deviation either way (≥ 0).
    #[serde(default)]
    pub tolerance: f64,
    /// For a maximum point under a structure: the vertical clearance taken
    /// off its underside (the underside is `elevation + clearance`). When
    /// set (> 0) on a sag, the sight distance under the structure is
    /// checked too.
    #[serde(default, skip_serializing_if = "is_zero")]
    pub clearance: f64,
}

#[allow(clippy::trivially_copy_pass_by_ref)] // serde's signature
fn is_zero(v: &f64) -> bool {
    *v == 0.0
}

impl ControlPoint {
    /// What makes this point unusable, if anything: a station, elevation,
    /// tolerance or clearance that is not a finite number within ±1e7 (the
    /// range Gradewright accepts), or a negative tolerance or clearance.
    pub fn problem(&self) -> Option<&'static str> {
        let within = crate::tolerance::within_limit;
        if !(within(self.station) && within(self.elevation)) {
            return Some("station and elevation must be finite numbers within ±1e7");
        }
        if !(within(self.tolerance) && self.tolerance >= 0.0) {
            return Some("the tolerance must be a finite number of 0 or more");
        }
        if !(within(self.clearance) && self.clearance >= 0.0) {
            return Some("the clearance must be a finite number of 0 or more");
        }
        None
    }

    /// The name, or `control N` (1-based) when it has none.
    pub fn title(&self, index: usize) -> String {
        if self.name.trim().is_empty() { format!("control {}", index + 1) } else { self.name.clone() }
    }

    /// By how much the profile elevation `profile` misses this point (> 0)
    /// or 0 when it is met. The comparisons allow round-off only
    /// ([`crate::tolerance::PASS_RELATIVE`]).
    pub fn miss(&self, profile: f64) -> f64 {
        let tolerance = self.tolerance.abs();
        match self.kind {
            ControlKind::Fixed => {
                let off = (profile - self.elevation).abs();
                if above(off, tolerance) { off - tolerance } else { 0.0 }
            }
            ControlKind::Minimum => {
                if below(profile, self.elevation) {
                    self.elevation - profile
                } else {
                    0.0
                }
            }
            ControlKind::Maximum => {
                if above(profile, self.elevation) {
                    profile - self.elevation
                } else {
                    0.0
                }
            }
        }
    }
}

/// How the profile meets one control point.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum ControlStatus {
    /// Met; the profile elevation there.
    Met(f64),
    /// Missed: the profile elevation and the amount missed by (> 0).
    Missed(f64, f64),
    /// Not on the profile (before the first or after the last PVI).
    Outside,
    /// Its station, elevation or tolerance is not a usable number.
    Invalid,
}

/// The status of every control point against `alignment`, in order.
pub fn check_controls(alignment: &Alignment, controls: &[ControlPoint]) -> Vec<ControlStatus> {
    controls
        .iter()
        .map(|c| {
            if c.problem().is_some() {
                return ControlStatus::Invalid;
            }
            match alignment.sample(Station(c.station)) {
                Err(_) => ControlStatus::Outside,
                Ok(s) => match c.miss(s.elevation) {
                    m if m > 0.0 => ControlStatus::Missed(s.elevation, m),
                    _ => ControlStatus::Met(s.elevation),
                },
            }
        })
        .collect()
}

/// A failing finding for each missed control point (code `control.fixed`,
/// `control.min`, `control.max`), with the amount missed by; a warning for
/// a point off the profile (`control.outside`) and a failure for one that
/// is not a usable number (`control.invalid`). Met points give none.
/// Stations are worded as plan stations of `stationing`.
pub fn control_findings(
    stationing: crate::Stationing<'_>,
    controls: &[ControlPoint],
    status: &[ControlStatus],
) -> Vec<Finding> {
    let units = stationing.units;
    let len = units.length_symbol();
    let mut findings = Vec::new();
    for (i, (c, st)) in controls.iter().zip(status).enumerate() {
        let at = stationing.label_std(c.station);
        let name = c.title(i);
        let finding =
            |code, message| Finding::new(code, (Station(c.station), Station(c.station)), None, message);
        match *st {
            ControlStatus::Met(_) => {}
            ControlStatus::Outside => findings.push(finding(
                FindingCode::ControlOutside,
                format!("{name} at {at} is outside the profile: not checked"),
            )),
            ControlStatus::Invalid => findings.push(finding(
                FindingCode::ControlInvalid,
                format!("{name}: {}", c.problem().unwrap_or("not a usable control point")),
            )),
            ControlStatus::Missed(y, miss) => {
                let (code, message) = match c.kind {
                    ControlKind::Fixed => {
                        // The whole difference first, then what is beyond
                        // the tolerance (the miss): "0.030 below, 0.010
                        // beyond the tolerance", never the miss alone as if
                        // it were the difference.
                        let side = if y > c.elevation { "above" } else { "below" };
                        let off = (y - c.elevation).abs();
                        (
                            FindingCode::ControlFixed,
                            format!(
                                "{name} at {at}: the profile {y:.3} is {off:.3} {len} {side} the fixed elevation \
                                 {:.3}, {miss:.3} {len} beyond the tolerance ± {:.3}",
                                c.elevation,
                                c.tolerance.abs()
                            ),
                        )
                    }
                    ControlKind::Minimum => (
                        FindingCode::ControlMin,
                        format!(
                            "{name} at {at}: the profile is {miss:.3} {len} below the minimum {:.3} \
                             (profile {y:.3})",
                            c.elevation
                        ),
                    ),
                    ControlKind::Maximum => (
                        FindingCode::ControlMax,
                        format!(
                            "{name} at {at}: the profile is {miss:.3} {len} above the maximum {:.3} \
                             (profile {y:.3})",
                            c.elevation
                        ),
                    ),
                };
                findings.push(finding(code, message));
            }
        }
    }
    findings
}

/// Truck driver's eye and taillight heights for sight under a structure:
/// 2.4 m and 0.6 m, or 8 ft and 2 ft (Green Book 2018 §3.4.6.4, from
/// memory).
pub fn undercrossing_heights(units: Units) -> (f64, f64) {
    match units {
        Units::Metric => (2.4, 0.6),
        Units::UsCustomary => (8.0, 2.0),
    }
}

/// What sight under a structure asks of the sag curve it stands over: a
/// maximum control point with a clearance, on a sag curve.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Undercrossing {
    /// The control point (index into the project's).
    pub control: usize,
    /// The PVI whose sag curve it stands over.
    pub pvi: usize,
    /// The underside of the structure.
    pub underside: f64,
    /// The clearance between the profile and the underside there.
    pub clearance: f64,
    /// The total length the curve needs to see the stopping sight distance
    /// under it (at its own back:ahead ratio); infinite when the clearance
    /// leaves no sight line at all.
    pub needed: f64,
}

impl Undercrossing {
    /// Whether the curve, `length` long, is long enough.
    pub fn met_by(&self, length: f64) -> bool {
        !below(length, self.needed)
    }
}

/// For each maximum control point with a clearance that lies on a sag
/// curve: the length the curve needs to see the stopping sight distance
/// under the structure, L = A·S²/(800(C − (h1 + h2)/2)) when S < L, else
/// 2S − 800(C − (h1 + h2)/2)/A (Green Book 2018 eq. 3-51 and 3-52;
/// equation numbers from memory), with C the clearance between the
/// profile and the underside there, times the curve's ratio factor on an
/// unequal-tangent curve (as for every length requirement). The clearance
/// follows the curve: lengthening a sag raises the road under the
/// structure and shrinks it.
pub fn undercrossings(
    alignment: &Alignment,
    controls: &[ControlPoint],
    criteria: &crate::ResolvedCriteria,
) -> Vec<Undercrossing> {
    let mut out = Vec::new();
    for (i, c) in controls.iter().enumerate() {
        let on = alignment.curves().iter().find(|k| k.pvc.0 <= c.station && c.station <= k.pvt.0);
        if let Some(u) = on.and_then(|curve| undercrossing(curve, i, c, criteria)) {
            out.push(u);
        }
    }
    out
}

/// What sight under control point `c` (number `index`) asks of `curve`,
/// when it is a maximum with a clearance standing over this sag curve.
pub fn undercrossing(
    curve: &crate::CurveGeometry,
    index: usize,
    c: &ControlPoint,
    criteria: &crate::ResolvedCriteria,
) -> Option<Undercrossing> {
    let over = curve.kind == crate::CurveKind::Sag
        && curve.length() > 0.0
        && curve.pvc.0 <= c.station
        && c.station <= curve.pvt.0;
    if c.kind != ControlKind::Maximum || !(c.clearance > 0.0 && c.clearance.is_finite()) || !over {
        return None;
    }
    let (h1, h2) = undercrossing_heights(criteria.units);
    let ssd = criteria.get(crate::CriterionId::StoppingSightDistance);
    let road = curve.segments().into_iter().flatten().find(|s| s.start <= c.station && c.station <= s.end)?;
    let underside = c.elevation + c.clearance;
    let clearance = underside - road.elevation_at(c.station);
    let needed = if clearance <= (h1 + h2) / 2.0 {
        f64::INFINITY
    } else {
        let equal = crate::sight::sag_undercrossing_length(curve.a_percent(), ssd, clearance, h1, h2).length;
        equal * curve.ratio_factor()
    };
    Some(Undercrossing { control: index, pvi: curve.index, underside, clearance, needed })
}

/// A failing `control.undercrossing` finding for each sag curve too short
/// to see the stopping sight distance under a structure ([`undercrossings`]).
pub fn undercrossing_findings(
    alignment: &Alignment,
    controls: &[ControlPoint],
    criteria: &crate::ResolvedCriteria,
) -> Vec<Finding> {
    let units = alignment.units();
    let len = units.length_symbol();
    let (h1, h2) = undercrossing_heights(units);
    let ssd = criteria.get(crate::CriterionId::StoppingSightDistance);
    let mut findings = Vec::new();
    for u in undercrossings(alignment, controls, criteria) {
        let (Some(c), Some(curve)) =
            (controls.get(u.control), alignment.curves().iter().find(|k| k.index == u.pvi))
        else {
            continue;
        };
        if u.met_by(curve.length()) {
            continue;
        }
        let at = alignment.stationing().label_std(c.station);
        let name = c.title(u.control);
        let (underside, clear) = (u.underside, u.clearance);
        let message = if u.needed.is_infinite() {
            format!(
                "{name} at {at}: {clear:.3} {len} between the profile and the underside {underside:.3} leaves no \
                 sight line under it for an eye at {h1} {len} and an object at {h2} {len}"
            )
        } else {
            format!(
                "{name} at {at}: the sag curve at PVI {} (L = {:.2} {len}) is shorter than the {:.2} {len} \
                 needed to see {ssd:.1} {len} under the structure (clearance {clear:.3} {len}, eye {h1}, \
                 object {h2}; L = A·S²/(800(C − (h1 + h2)/2)) or 2S − 800(C − (h1 + h2)/2)/A)",
                curve.index + 1,
                curve.length(),
                u.needed
            )
        };
        findings.push(Finding::new(
            FindingCode::ControlUndercrossing,
            (curve.pvc, curve.pvt),
            Some(curve.index),
            message,
        ));
    }
    findings
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::{Profile, Pvi, Severity};

    fn road() -> Alignment {
        // A straight 2 % grade from 100.0 at 0 to 102.0 at 100: y(50) = 101.0.
        Alignment::new(&Profile::new(Units::Metric, vec![Pvi::new(0.0, 100.0), Pvi::new(100.0, 102.0)]))
            .expect("valid")
    }

    fn control(kind: ControlKind, elevation: f64, tolerance: f64) -> ControlPoint {
        ControlPoint {
            name: "Culvert C1".to_owned(),
            station: 50.0,
            kind,
            elevation,
            tolerance,
            clearance: 0.0,
        }
    }

    fn status(c: &ControlPoint) -> ControlStatus {
        check_controls(&road(), std::slice::from_ref(c)).first().copied().unwrap_or(ControlStatus::Invalid)
    }

    /// The profile 101.000 at a fixed 101.030 ± 0.020: 0.030 below it,
    /// 0.010 beyond the tolerance (the finding gives both, in that order).
    #[test]
    fn a_missed_fixed_point_says_the_difference_and_the_excess() {
        let c = control(ControlKind::Fixed, 101.03, 0.02);
        let findings = control_findings(
            crate::Stationing::plain(Units::Metric),
            std::slice::from_ref(&c),
            &[status(&c)],
        );
        let message = findings.first().map(|f| f.message.clone()).unwrap_or_default();
        assert!(
            message.ends_with(
                "the profile 101.000 is 0.030 m below the fixed elevation 101.030, 0.010 m beyond the tolerance ± 0.020"
            ),
            "{message}"
        );
        let c = control(ControlKind::Fixed, 100.95, 0.02);
        let findings = control_findings(
            crate::Stationing::plain(Units::Metric),
            std::slice::from_ref(&c),
            &[status(&c)],
        );
        let message = findings.first().map(|f| f.message.clone()).unwrap_or_default();
        assert!(
            message.contains("is 0.050 m above the fixed elevation 100.950, 0.030 m beyond"),
            "{message}"
        );
    }

    #[test]
    fn each_limit_is_met_by_a_hair_and_missed_by_a_hair() {
        let hair = 1e-4;
        let met = |c: ControlPoint| matches!(status(&c), ControlStatus::Met(_));
        // Minimum 101.0 − hair is met; 101.0 + hair is missed by the hair.
        assert!(met(control(ControlKind::Minimum, 101.0 - hair, 0.0)));
        assert!(met(control(ControlKind::Minimum, 101.0, 0.0)));
        let ControlStatus::Missed(_, miss) = status(&control(ControlKind::Minimum, 101.0 + hair, 0.0)) else {
            panic!("missed")
        };
        assert!((miss - hair).abs() < 1e-9);
        // Maximum: the other side.
        assert!(met(control(ControlKind::Maximum, 101.0 + hair, 0.0)));
        assert!(!met(control(ControlKind::Maximum, 101.0 - hair, 0.0)));
        // Fixed 101.05 ± 0.05: met at the edge, missed a hair beyond either edge.
        assert!(met(control(ControlKind::Fixed, 101.05 - hair, 0.05)));
        assert!(met(control(ControlKind::Fixed, 100.95 + hair, 0.05)));
        assert!(!met(control(ControlKind::Fixed, 101.05 + hair, 0.05)));
        assert!(!met(control(ControlKind::Fixed, 100.95 - hair, 0.05)));
    }

    #[test]
    fn a_missed_point_is_a_failing_finding_with_the_amount() {
        let controls = vec![
            control(ControlKind::Minimum, 101.75, 0.0),
            control(ControlKind::Maximum, 102.0, 0.0),
            ControlPoint { station: 150.0, ..control(ControlKind::Fixed, 1.0, 0.0) },
        ];
        let st = check_controls(&road(), &controls);
        let findings = control_findings(crate::Stationing::plain(Units::Metric), &controls, &st);
        assert_eq!(findings.len(), 2, "{findings:?}");
        let first = findings.first().expect("one");
        assert_eq!((first.severity(), first.code), (Severity::Fail, FindingCode::ControlMin));
        assert!(first.message.contains("0.750 m below the minimum 101.750"), "{}", first.message);
        assert_eq!(
            findings.get(1).map(|f| (f.severity(), f.code)),
            Some((Severity::Warn, FindingCode::ControlOutside))
        );
    }

    #[test]
    fn kinds_read_from_file_words() {
        assert_eq!(ControlKind::from_key(" MIN "), Some(ControlKind::Minimum));
        assert_eq!(ControlKind::from_key("maximum"), Some(ControlKind::Maximum));
        assert_eq!(ControlKind::from_key("fixed"), Some(ControlKind::Fixed));
        assert_eq!(ControlKind::from_key("above"), None);
        for k in ControlKind::ALL {
            assert_eq!(ControlKind::from_key(k.key()), Some(k));
        }
    }

    /// Under a structure on a sag: A = 4 % (−2 % to +2 %), L = 100 m, the
    /// PVI at 100.0 so the road is at 100 + A·L/800 = 100.5 there; 80 km/h,
    /// SSD 130 m (Green Book 2018 Table 3-1). With the underside at 102.5
    /// (C = 2.0 m): S < L gives L = 4·130²/(800·(2.0 − 1.5)) = 169 m
    /// (hand-computed from eq. 3-51), longer than 100 m: fails. With the
    /// underside at 106.5 (C = 6.0 m): 4·130²/(800·4.5) = 18.8 m < S, so
    /// S > L: 2·130 − 800·4.5/4 = −640, nothing needed: met.
    #[test]
    fn sight_under_a_structure_on_a_sag() {
        let road = Alignment::new(&Profile::new(
            Units::Metric,
            vec![Pvi::new(0.0, 104.0), Pvi::with_curve(200.0, 100.0, 100.0), Pvi::new(400.0, 104.0)],
        ))
        .expect("valid");
        let criteria = crate::Criteria { design_speed: Some(80.0), ..crate::Criteria::default() }
            .resolve(Units::Metric)
            .expect("criteria");
        let bridge = |underside: f64| ControlPoint {
            name: "Rail bridge".to_owned(),
            station: 200.0,
            kind: ControlKind::Maximum,
            elevation: underside - 0.0,
            tolerance: 0.0,
            clearance: 0.0,
        };
        // The clearance taken off the underside: the control sits 5.0 below it.
        let with =
            |underside: f64| ControlPoint { elevation: underside - 5.0, clearance: 5.0, ..bridge(underside) };
        let found = undercrossing_findings(&road, &[with(102.5)], &criteria);
        let f = found.first().expect("a finding");
        assert_eq!((f.code, f.severity()), (FindingCode::ControlUndercrossing, Severity::Fail));
        assert!(f.message.contains("169.00 m"), "{}", f.message);
        assert!(undercrossing_findings(&road, &[with(106.5)], &criteria).is_empty());
        // Without a clearance there is no undercrossing check.
        assert!(undercrossing_findings(&road, &[bridge(102.5)], &criteria).is_empty());
    }
}
