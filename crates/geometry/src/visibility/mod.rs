//! Available sight distance along the whole profile, in both directions.
//!
//! * Daylight (crest) sight distance: the longest distance ahead over which an
//!   object of height h2 on the road stays visible from an eye h1 above the
//!   road, over the actual profile. The object at distance t is visible when
//!   the line eye→object clears the road everywhere between: with
//!   φ(u) = (y(u) − E)/u the road's angle from the eye and
//!   ψ(t) = φ(t) + h2/t the object's, it is visible while ψ(t) ≥ max φ(u), u < t.
//! * Headlight (sag, night) sight distance: the distance ahead at which the
//!   beam, H above the road and tilted up by β from the grade the vehicle is
//!   on, meets the road surface.
//!
//! Both are solved exactly on each piece of constant y″ (on a piece y is a
//! quadratic, so each condition is a quadratic in t): no sampling, so the
//! results match the closed-form AASHTO length formulas. Beyond the ends the
//! end tangents are taken to continue (common practice for tie-ins).
//!
//! The walk passes whole blocks of pieces when their highest and lowest
//! points show that nothing in them can stop the beam or hide the object
//! (with [`crate::tolerance::BLOCK_ROOM`] to spare), and makes the running
//! maximum exact again before it goes on piece by piece: every result is
//! the piece-by-piece walk's, bit for bit ([`Road::piece_by_piece`]).

mod profile;
#[cfg(any(test, feature = "reference"))]
mod reference;
mod requirement;
mod road;

pub(crate) use profile::cores;
pub use profile::{
    Shortfall, SightProfile, SightSample, grid_between, sight_profile, sight_profile_on, stations_every,
};
#[cfg(any(test, feature = "reference"))]
pub use reference::{reference_daylight, reference_headlight};
pub use requirement::Requirement;
pub use road::Road;

/// Which way the vehicle travels.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Direction {
    /// Towards increasing stations.
    Forward,
    /// Towards decreasing stations.
    Backward,
}

/// Heights and angle for sight distance, in the project's units.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct SightSetup {
    /// Driver eye height h1.
    pub eye_height: f64,
    /// Object height h2.
    pub object_height: f64,
    /// Headlight height H.
    pub headlight_height: f64,
    /// Upward divergence of the beam β, degrees.
    pub headlight_angle_deg: f64,
    /// Whether daylight (crest) sight distance counts.
    pub daylight: bool,
    /// Whether headlight sight distance counts (off for lit roads).
    pub headlights: bool,
    /// Distances are not looked for beyond this.
    pub cap: f64,
}
