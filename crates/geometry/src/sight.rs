//! Stopping sight distance and the curve lengths it calls for.
//!
//! All grades here are percent (A) or decimal (G, for grade-adjusted SSD), as
//! noted; S and L in the project's length unit; V in km/h or mph.
//!
//! Sources (full list in `docs/sources.md`): AASHTO, *A Policy on Geometric
//! Design of Highways and Streets* (the Green Book), 2018, ch. 3: SSD on the
//! level (eq. 3-2) and on grades (eq. 3-3), crest lengths (eq. 3-41 to 3-44),
//! sag headlight lengths (eq. 3-46 to 3-49), the comfort length (eq. 3-50),
//! the undercrossing lengths (eq. 3-51, 3-52) — equation numbers from memory;
//! US default values as quoted in the TxDOT *Roadway Design Manual* (2020),
//! §4.11.1 (t = 2.5 s, a = 11.2 ft/s², eye 3.5 ft, object 2.0 ft); the metric
//! coefficients (0.278, 0.039, 658, 120 + 3.5S, 395) are the Green Book's
//! metric ones (from memory).

use crate::Units;

/// Default perception–reaction time, s (Green Book 2018 §3.2.2; TxDOT RDM §4.11.1).
pub const REACTION_TIME_S: f64 = 2.5;

/// Default deceleration: 3.4 m/s² or 11.2 ft/s² (Green Book 2018 §3.2.2,
/// metric from memory; TxDOT RDM §4.11.1).
pub fn default_deceleration(units: Units) -> f64 {
    match units {
        Units::Metric => 3.4,
        Units::UsCustomary => 11.2,
    }
}

/// Default driver eye height: 1.08 m or 3.5 ft (TxDOT RDM 4.11.1).
pub fn default_eye_height(units: Units) -> f64 {
    match units {
        Units::Metric => 1.08,
        Units::UsCustomary => 3.5,
    }
}

/// Default object height for stopping: 0.60 m or 2.0 ft (TxDOT RDM 4.11.1).
pub fn default_object_height(units: Units) -> f64 {
    match units {
        Units::Metric => 0.60,
        Units::UsCustomary => 2.0,
    }
}

/// Default headlight height: 0.60 m or 2.0 ft (Green Book 2018 §3.4.6.3,
/// headlight sight distance; from memory).
pub fn default_headlight_height(units: Units) -> f64 {
    default_object_height(units)
}

/// Default upward divergence of the headlight beam, degrees (Green Book 2018
/// §3.4.6.3; from memory).
pub const HEADLIGHT_ANGLE_DEG: f64 = 1.0;

/// Default vertical acceleration for sag comfort: 1 ft/s² (0.3048 m/s²), the
/// value behind AASHTO's L = AV²/46.5 and L = AV²/395.
pub fn default_comfort_acceleration(units: Units) -> f64 {
    match units {
        Units::Metric => 0.3048,
        Units::UsCustomary => 1.0,
    }
}

/// Stopping sight distance on the level, unrounded:
/// SSD = 1.47·V·t + 1.075·V²/a (US) or 0.278·V·t + 0.039·V²/a (metric).
pub fn stopping_sight_distance(units: Units, speed: f64, reaction_s: f64, decel: f64) -> f64 {
    match units {
        Units::UsCustomary => 1.47 * speed * reaction_s + 1.075 * speed * speed / decel,
        Units::Metric => 0.278 * speed * reaction_s + 0.039 * speed * speed / decel,
    }
}

/// Reaction distance 1.47·V·t (US) or 0.278·V·t (metric).
pub fn reaction_distance(units: Units, speed: f64, reaction_s: f64) -> f64 {
    let k = match units {
        Units::UsCustomary => 1.47,
        Units::Metric => 0.278,
    };
    k * speed * reaction_s
}

/// Braking distance on a grade `grade` (decimal, + uphill): V²/(30(a/32.2 + G))
/// (US) or V²/(254(a/9.81 + G)) (metric) (Green Book 2018 eq. 3-3; from
/// memory). Infinity when the grade is so steep downhill that the vehicle
/// cannot stop.
pub fn braking_distance(units: Units, speed: f64, decel: f64, grade: f64) -> f64 {
    let k = match units {
        Units::UsCustomary => 30.0,
        Units::Metric => 254.0,
    };
    let friction = decel / units.gravity() + grade;
    if friction <= 0.0 {
        return f64::INFINITY;
    }
    speed * speed / (k * friction)
}

/// Stopping sight distance on a grade (`grade` decimal, + uphill), unrounded:
/// SSD = 1.47Vt + V²/(30(a/32.2 + G)) (US) or 0.278Vt + V²/(254(a/9.81 + G)).
/// Downgrades (G < 0) need more distance. Returns infinity when the grade is so
/// steep downhill that the vehicle cannot stop.
pub fn stopping_sight_distance_on_grade(
    units: Units,
    speed: f64,
    reaction_s: f64,
    decel: f64,
    grade: f64,
) -> f64 {
    reaction_distance(units, speed, reaction_s) + braking_distance(units, speed, decel, grade)
}

/// Rounds a computed sight distance up to the next 5 m or 5 ft, as the design
/// tables do (reproduces AASHTO Table 3-1; derived from its entries).
pub fn round_design_distance(distance: f64) -> f64 {
    crate::tolerance::ceil_to(distance, 5.0)
}

/// Rounds a computed K up to a whole number after rounding to one decimal,
/// as the AASHTO K tables do (plain ceiling gives 53 for 52.01 at 100 km/h).
pub fn round_design_k(k: f64) -> f64 {
    let tenth = (k * 10.0).round() / 10.0;
    crate::tolerance::ceil_to(tenth, 1.0)
}

/// The crest constant C in L = A·S²/C for eye height `h1` and object height
/// `h2`: C = 100(√(2h1) + √(2h2))² (Green Book 2018 eq. 3-41; from memory).
pub fn crest_constant(h1: f64, h2: f64) -> f64 {
    let root = (2.0 * h1).sqrt() + (2.0 * h2).sqrt();
    100.0 * root * root
}

/// The published rounded crest constant for the default heights: 2158 (US,
/// Green Book 2018 eq. 3-43) and 658 (metric; from memory). With it K
/// reproduces the Green Book's tables (at 45 mph, 2158.3 gives K = 60 where
/// Table 3-34 says 61; 2158 gives 61). Used when neither height is overridden.
pub fn published_crest_constant(units: Units) -> f64 {
    match units {
        Units::UsCustomary => 2158.0,
        Units::Metric => 658.0,
    }
}

/// The headlight terms (base, slope) of the sag denominator base + slope·S,
/// from L = A·S²/(200(H + S·tan β)) (Green Book 2018 eq. 3-46; from memory).
pub fn headlight_terms(height: f64, angle_deg: f64) -> (f64, f64) {
    (200.0 * height, 200.0 * angle_deg.to_radians().tan())
}

/// The published rounded headlight terms for the default H and β: 400 + 3.5S
/// (US, Green Book 2018 eq. 3-48) and 120 + 3.5S (metric; from memory). Used
/// when neither the headlight height nor the angle is overridden.
pub fn published_headlight_terms(units: Units) -> (f64, f64) {
    match units {
        Units::UsCustomary => (400.0, 3.5),
        Units::Metric => (120.0, 3.5),
    }
}

/// Which case of a sight-distance length formula applies.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum SightCase {
    /// Sight distance shorter than the curve (S < L).
    ShorterThanCurve,
    /// Sight distance longer than the curve (S > L).
    LongerThanCurve,
}

/// A required curve length and the case of the formula that gave it.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct RequiredLength {
    /// Minimum length (never negative).
    pub length: f64,
    /// The case used.
    pub case: SightCase,
}

/// Shared case selection: try S < L with L = A·S²/D; if that L is shorter than
/// S, use S > L with L = 2S − D/A (the case test of Green Book 2018 §3.4.6;
/// common practice).
fn by_cases(a_percent: f64, sight: f64, denominator: f64) -> RequiredLength {
    if a_percent <= 0.0 || sight <= 0.0 {
        return RequiredLength { length: 0.0, case: SightCase::LongerThanCurve };
    }
    let long = a_percent * sight * sight / denominator;
    if long >= sight {
        RequiredLength { length: long, case: SightCase::ShorterThanCurve }
    } else {
        let short = 2.0 * sight - denominator / a_percent;
        RequiredLength { length: short.max(0.0), case: SightCase::LongerThanCurve }
    }
}

/// Crest length for sight distance `sight` over a grade change `a_percent`, with
/// crest constant `c` ([`crest_constant`]): L = A·S²/C when S < L, else
/// L = 2S − C/A.
pub fn crest_length(a_percent: f64, sight: f64, c: f64) -> RequiredLength {
    by_cases(a_percent, sight, c)
}

/// Sag length for headlight sight distance: L = A·S²/(base + slope·S) when
/// S < L, else L = 2S − (base + slope·S)/A ([`headlight_terms`]).
pub fn sag_headlight_length(a_percent: f64, sight: f64, terms: (f64, f64)) -> RequiredLength {
    by_cases(a_percent, sight, terms.0 + terms.1 * sight)
}

/// Sag length for rider comfort: L = A·v²/(100·a_v), v the design speed in
/// m/s or ft/s and a_v the vertical acceleration (derived from y″ = v²·r).
pub fn sag_comfort_length(units: Units, a_percent: f64, speed: f64, accel: f64) -> f64 {
    let v = speed * units.speed_to_length_per_second();
    a_percent * v * v / (100.0 * accel)
}

/// The published comfort divisor D in L = A·V²/D for the default 1 ft/s²:
/// 46.5 (US, Green Book 2018 eq. 3-50) and 395 (metric; from memory). Used
/// when the comfort acceleration is not overridden.
pub fn published_comfort_divisor(units: Units) -> f64 {
    match units {
        Units::UsCustomary => 46.5,
        Units::Metric => 395.0,
    }
}

/// Sag length under an overhead structure of vertical clearance `clearance`,
/// for a truck driver's eye at `h1` and an object at `h2` (8 ft/2 ft or
/// 2.4 m/0.6 m, from memory): L = A·S²/(800(C − (h1 + h2)/2)) when S < L,
/// else L = 2S − 800(C − (h1 + h2)/2)/A (Green Book 2018 eq. 3-51, 3-52;
/// Mannering & Washburn ch. 3; from memory).
pub fn sag_undercrossing_length(
    a_percent: f64,
    sight: f64,
    clearance: f64,
    h1: f64,
    h2: f64,
) -> RequiredLength {
    by_cases(a_percent, sight, 800.0 * (clearance - (h1 + h2) / 2.0))
}

/// Minimum length for appearance, L ≥ 3V (ft, V in mph) or L ≥ 0.6V (m, V in
/// km/h): the Green Book's own rule (2018 §3.4.6.2; from memory).
pub fn appearance_min_length(units: Units, speed: f64) -> f64 {
    match units {
        Units::UsCustomary => 3.0 * speed,
        Units::Metric => 0.6 * speed,
    }
}

/// The K above which a curve's level point needs a drainage review on curbed
/// roads: 167 ft/% or 51 m/% (Green Book 2018 §3.4.6.2, drainage of curbed
/// pavements: a grade of 0.30 % within 50 ft of the level point; from
/// memory; 167 = 50/0.30, derived).
pub fn drainage_k(units: Units) -> f64 {
    match units {
        Units::UsCustomary => 167.0,
        Units::Metric => 51.0,
    }
}

/// The smallest grade for gutter drainage on curbed roads, percent (TxDOT
/// Hydraulic Design Manual ch. 10).
pub const MIN_GUTTER_GRADE_PERCENT: f64 = 0.30;
