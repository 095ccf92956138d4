//! The crate's number policy: every tolerance that decides a comparison,
//! named once and used by classification, checks, the fit, the readers,
//! the tables, the sheet, the editor's status cells and the plot alike.
//!
//! * A value meets a requirement ([`meets`]) when it is within
//!   [`PASS_RELATIVE`] of it: values typed to the decimal must not fail by
//!   round-off. [`below`] and [`above`] are the two ways to miss.
//! * A grade change smaller than [`GRADE_CHANGE_PERCENT`] is no grade change:
//!   three PVIs on one straight grade differ by round-off (A ≈ 1e-13 %), and
//!   that must never make a crest or a sag.
//! * Two values are equal ([`nearly_equal`]) within [`EQUAL_RELATIVE`].
//! * Two stations are one station ([`same_station`]) within
//!   [`STATION_HAIR`]; [`station_hair`] is that hair at a magnitude.
//! * Rounding up to a design increment ([`ceil_to`]) first takes off
//!   [`ROUNDING_HAIR`] of a step, so an exact multiple stays put.
//! * An iteration has settled ([`settled`]) when a step changes its value by
//!   less than [`PASS_RELATIVE`] of it.

/// The largest magnitude accepted for a station, an elevation or a length,
/// in the project's unit (10 000 km, or 10 million ft): anything beyond is a
/// mistake, and would lose every digit that matters.
pub const COORDINATE_LIMIT: f64 = 1.0e7;

/// Whether `value` is a finite number within ±[`COORDINATE_LIMIT`].
pub fn within_limit(value: f64) -> bool {
    value.is_finite() && value.abs() <= COORDINATE_LIMIT
}

/// An algebraic difference of grades at or below this (percent) is no grade
/// change: no crest, no sag, no curve needed.
pub const GRADE_CHANGE_PERCENT: f64 = 1e-6;

/// Relative allowance with which a value meets a minimum (or a maximum),
/// with the same amount absolute near zero.
pub const PASS_RELATIVE: f64 = 1e-9;

/// Relative difference below which two values are the same.
pub const EQUAL_RELATIVE: f64 = 1e-9;

/// Two stations closer than this (in length units) are one station: extra
/// stations of a table (grade points, curve ends) that fall on one already
/// there are not repeated. Relative to a magnitude ([`station_hair`]) it
/// is also the room kept between a PVI and its neighbour, and the slack of
/// a station range.
pub const STATION_HAIR: f64 = 1e-6;

/// Fraction of a step taken off before rounding up to it (and added to the
/// end of a run of steps, so round-off never drops the last one).
pub const ROUNDING_HAIR: f64 = 1e-9;

/// Room (relative to the elevations) a block of road pieces must leave
/// before the sight-distance walk passes it whole: a block is passed only
/// when the exact walk, piece by piece, could not have stopped in it, even
/// allowing for rounding.
pub const BLOCK_ROOM: f64 = 1e-9;

/// A quadratic whose square term, over the interval looked at, is at most
/// this fraction of the whole is solved as the straight line it is
/// ([`crate::quadratic`]).
pub const QUADRATIC_FLAT: f64 = 1e-14;

/// The least positive size a length is floored to before it divides
/// (a chord error, a grid cell, a step) or is looked beyond (the beam is
/// looked for from this distance in front of the lamp, not at it).
pub const LENGTH_FLOOR: f64 = 1e-9;

/// How far (as a fraction of the length) the length a file gives a
/// circular vertical curve may differ from the length of its parabola,
/// L = A·R, before the reader reports it: the arc and its horizontal
/// projection differ by far less, so more is a file whose length and
/// radius disagree (or are rounded coarsely).
pub const CIRCULAR_LENGTH_AGREEMENT: f64 = 0.005;

/// How far (in length units) a station equation's stated back station may
/// lie from the plan station the road reaches there before the equation is
/// refused: a millimetre's order, the rounding of a survey's stations.
pub const EQUATION_BACK: f64 = 0.005;

/// What a requirement asks of a value.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Bound {
    /// At least this much (a minimum K, the sight distance needed).
    AtLeast(f64),
    /// At most this much (a maximum grade, the room a curve has).
    AtMost(f64),
}

/// Whether `value` meets `bound`, allowing round-off only
/// ([`PASS_RELATIVE`], relative, with the same amount absolute near zero).
/// Every pass or fail in Gradewright is decided here. (Only a value
/// clearly on the wrong side misses; the inputs are validated finite
/// before anything is checked.)
pub fn meets(value: f64, bound: Bound) -> bool {
    let misses = match bound {
        Bound::AtLeast(required) => value < required * (1.0 - PASS_RELATIVE) - PASS_RELATIVE,
        Bound::AtMost(allowed) => value > allowed * (1.0 + PASS_RELATIVE) + PASS_RELATIVE,
    };
    !misses
}

/// Whether `value` falls short of the minimum `required` ([`meets`] not).
pub fn below(value: f64, required: f64) -> bool {
    !meets(value, Bound::AtLeast(required))
}

/// Whether `value` exceeds the maximum `allowed` ([`meets`] not).
pub fn above(value: f64, allowed: f64) -> bool {
    !meets(value, Bound::AtMost(allowed))
}

/// Whether an algebraic difference of grades (percent, either sign) counts as
/// a grade change.
pub fn is_grade_change(a_percent: f64) -> bool {
    a_percent.abs() > GRADE_CHANGE_PERCENT
}

/// Whether two values are equal within [`EQUAL_RELATIVE`] of the larger.
pub fn nearly_equal(a: f64, b: f64) -> bool {
    (a - b).abs() <= EQUAL_RELATIVE * a.abs().max(b.abs())
}

/// Whether two stations are one station (within [`STATION_HAIR`]).
pub fn same_station(a: f64, b: f64) -> bool {
    (a - b).abs() <= STATION_HAIR
}

/// Whether station `a` lies past station `b` by more than [`STATION_HAIR`]:
/// curves that touch, or fill their tangent, to round-off are not past each
/// other.
pub fn past(a: f64, b: f64) -> bool {
    a > b + STATION_HAIR
}

/// The station hair at `magnitude`: [`STATION_HAIR`] relative to it, and
/// never less than [`STATION_HAIR`] itself.
pub fn station_hair(magnitude: f64) -> f64 {
    STATION_HAIR * magnitude.abs().max(1.0)
}

/// Whether an iterate has settled: `next` differs from `previous` by at
/// most [`PASS_RELATIVE`] of `previous`.
pub fn settled(next: f64, previous: f64) -> bool {
    (next - previous).abs() <= PASS_RELATIVE * previous
}

/// `value` rounded up to a multiple of `step`; an exact multiple (within
/// [`ROUNDING_HAIR`] of a step) stays put.
pub fn ceil_to(value: f64, step: f64) -> f64 {
    (value / step - ROUNDING_HAIR).ceil() * step
}

/// The end of a run of stations from a start to `end` in steps of `step`,
/// with [`ROUNDING_HAIR`] of a step to spare, so an end reached by adding
/// steps is not missed by round-off.
pub fn run_end(end: f64, step: f64) -> f64 {
    end + ROUNDING_HAIR * step.abs().max(1.0)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn round_off_is_no_grade_change() {
        // Grades of one straight line computed from different PVIs differ by
        // round-off of this order.
        assert!(!is_grade_change(1e-13));
        assert!(!is_grade_change(-1e-13));
        assert!(is_grade_change(0.01));
    }

    #[test]
    fn passing_allows_round_off_only() {
        assert!(!below(84.0 - 1e-12, 84.0));
        assert!(below(83.99, 84.0));
        assert!(!above(6.0 + 1e-12, 6.0));
        assert!(above(6.01, 6.0));
        assert!(meets(84.0, Bound::AtLeast(84.0)) && meets(84.0, Bound::AtMost(84.0)));
        assert!(!meets(84.01, Bound::AtMost(84.0)));
    }

    #[test]
    fn stations_and_values() {
        assert!(same_station(130.4, 130.399_999_999_999_98));
        assert!(!same_station(130.4, 130.401));
        assert!((station_hair(0.2) - STATION_HAIR).abs() < 1e-18);
        assert!((station_hair(-2000.0) - 2000.0 * STATION_HAIR).abs() < 1e-15);
        assert!(settled(100.0 + 1e-8, 100.0) && !settled(100.001, 100.0));
        // PVT 130.4 and PVC 130.39999999999998 touch; a micrometre more overlaps.
        assert!(!past(130.4, 130.399_999_999_999_98) && past(130.4 + 2e-6, 130.4));
        assert!(run_end(100.0, 20.0) > 100.0 && run_end(100.0, 20.0) < 100.0 + 1e-7);
    }

    #[test]
    fn rounding_up_keeps_exact_multiples() {
        assert!((ceil_to(185.0, 5.0) - 185.0).abs() < 1e-12);
        assert!((ceil_to(184.2, 5.0) - 185.0).abs() < 1e-12);
        assert!(nearly_equal(100.0, 100.0 + 1e-10));
        assert!(!nearly_equal(100.0, 100.001));
    }
}
