//! Acceptance tests of Gradewright against published standards, handbook tables
//! and worked examples. The tests live in `tests/reference/`; this library only
//! holds small helpers they share.

use gradewright_geometry::{Alignment, Profile, Pvi, Units};

/// Builds an alignment from `(station, elevation, symmetric curve length)`,
/// panicking with the problems if the profile is invalid (tests only).
#[allow(clippy::expect_used)]
pub fn alignment(units: Units, pvis: &[(f64, f64, f64)]) -> Alignment {
    let pvis = pvis.iter().map(|&(s, e, l)| Pvi::with_curve(s, e, l)).collect();
    Alignment::new(&Profile::new(units, pvis)).expect("valid test profile")
}

/// Asserts `|actual − expected| ≤ tolerance`, with a message.
#[track_caller]
pub fn assert_close(actual: f64, expected: f64, tolerance: f64, what: &str) {
    assert!(
        (actual - expected).abs() <= tolerance,
        "{what}: got {actual}, expected {expected} ± {tolerance}"
    );
}
