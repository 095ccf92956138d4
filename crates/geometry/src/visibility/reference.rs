//! The slow reference methods the exact walk is held to (tests and
//! benchmarks only: behind the `reference` feature).

use super::{Road, SightSetup};

/// Step of the central difference that gives the grade at the eye (length
/// units): the reference finds the grade from elevations alone.
const GRADE_STEP: f64 = 1e-4;

/// Reference method, slow: ray marching on a grid of step `h`, tracking the
/// highest road angle seen from the eye; the object is hidden once its angle
/// falls below it. For tests and benchmarks of [`Road::daylight`].
pub fn reference_daylight(road: &Road, s: f64, setup: &SightSetup, h: f64) -> f64 {
    let eye = road.elevation(s) + setup.eye_height;
    let mut highest = f64::NEG_INFINITY;
    let mut k = 1.0;
    while k * h <= setup.cap {
        let t = k * h;
        let y = road.elevation(s + t);
        if (y + setup.object_height - eye) / t < highest {
            return t;
        }
        highest = highest.max((y - eye) / t);
        k += 1.0;
    }
    setup.cap
}

/// Reference method, slow: marches the beam on a grid of step `h` until the
/// road reaches it. For tests and benchmarks of [`Road::headlight`].
pub fn reference_headlight(road: &Road, s: f64, setup: &SightSetup, h: f64) -> f64 {
    let base = road.elevation(s) + setup.headlight_height;
    let grade = (road.elevation(s + GRADE_STEP) - road.elevation(s - GRADE_STEP)) / (2.0 * GRADE_STEP);
    let slope = grade + setup.headlight_angle_deg.to_radians().tan();
    let mut k = 1.0;
    while k * h <= setup.cap {
        let t = k * h;
        if road.elevation(s + t) >= base + slope * t {
            return t;
        }
        k += 1.0;
    }
    setup.cap
}
