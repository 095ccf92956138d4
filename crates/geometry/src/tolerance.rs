//! The crate's number policy: every tolerance that decides a comparison, named
//! once and used by classification, checks, the fit, the editor's status cells
//! and the plot alike.
//!
//! * A grade change smaller than [`GRADE_CHANGE_PERCENT`] is no grade change:
//!   three PVIs on one straight grade differ by round-off (A ≈ 1e-13 %), and
//!   that must never make a crest or a sag.
//! * A value passes a minimum when it is within [`PASS_RELATIVE`] of it
//!   ([`below`]): values typed to the decimal must not fail by round-off.
//! * Two curve parts are equal ([`same_length`]) within [`LENGTH_RELATIVE`].
//! * Rounding up to a design increment ([`ceil_to`]) first takes off
//!   [`ROUNDING_HAIR`] of a step, so an exact multiple stays put.

/// An algebraic difference of grades at or below this (percent) is no grade
/// change: no crest, no sag, no curve needed.
pub const GRADE_CHANGE_PERCENT: f64 = 1e-6;

/// Relative allowance with which a value meets a minimum (or a maximum).
pub const PASS_RELATIVE: f64 = 1e-9;

/// Relative difference below which two lengths are the same length.
pub const LENGTH_RELATIVE: f64 = 1e-9;

/// Two stations closer than this (in length units) are one station: extra
/// stations of a table (grade points, curve ends) that fall on one already
/// there are not repeated.
pub const STATION_HAIR: f64 = 1e-6;

/// Fraction of a step taken off before rounding up to it.
pub const ROUNDING_HAIR: f64 = 1e-9;

/// Room (relative to the elevations) a block of road pieces must leave
/// before the sight-distance walk passes it whole: a block is passed only
/// when the exact walk, piece by piece, could not have stopped in it, even
/// allowing for rounding.
pub const BLOCK_ROOM: f64 = 1e-9;

/// Whether `value` falls short of the minimum `required` by more than the
/// allowance [`PASS_RELATIVE`] (relative, with the same amount absolute near
/// zero).
pub fn below(value: f64, required: f64) -> bool {
    value < required * (1.0 - PASS_RELATIVE) - PASS_RELATIVE
}

/// Whether `value` exceeds the maximum `allowed` by more than the allowance.
pub fn above(value: f64, allowed: f64) -> bool {
    value > allowed * (1.0 + PASS_RELATIVE) + PASS_RELATIVE
}

/// Whether an algebraic difference of grades (percent, either sign) counts as
/// a grade change.
pub fn is_grade_change(a_percent: f64) -> bool {
    a_percent.abs() > GRADE_CHANGE_PERCENT
}

/// Whether two lengths are equal within [`LENGTH_RELATIVE`].
pub fn same_length(a: f64, b: f64) -> bool {
    (a - b).abs() <= LENGTH_RELATIVE * a.abs().max(b.abs())
}

/// `value` rounded up to a multiple of `step`; an exact multiple (within
/// [`ROUNDING_HAIR`] of a step) stays put.
pub fn ceil_to(value: f64, step: f64) -> f64 {
    (value / step - ROUNDING_HAIR).ceil() * step
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
    }

    #[test]
    fn rounding_up_keeps_exact_multiples() {
        assert!((ceil_to(185.0, 5.0) - 185.0).abs() < 1e-12);
        assert!((ceil_to(184.2, 5.0) - 185.0).abs() < 1e-12);
        assert!(same_length(100.0, 100.0 + 1e-10));
        assert!(!same_length(100.0, 100.001));
    }
}
