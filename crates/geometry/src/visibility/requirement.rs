//! What stopping sight distance an eye needs: the design SSD, or the SSD for
//! the grade it brakes on.

use super::Road;
use crate::{Units, sight};

/// What the required stopping sight distance is at each station.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Requirement {
    /// The design SSD everywhere.
    Design(f64),
    /// The SSD for the grade the vehicle brakes on: SSD = reaction distance +
    /// braking distance, the braking distance V²/(254(a/g + G)) (metric) or
    /// V²/(30(a/g + G)) (US) with G the average grade over the braking
    /// distance itself (Green Book 2018 eq. 3-3, "SSD on grades"; from
    /// memory), found by fixed-point iteration in the direction of travel. It
    /// never asks for less than `floor`, the design SSD on the level (rounded
    /// as the tables are), so a level road needs exactly the design SSD and an
    /// upgrade earns no credit.
    GradeAdjusted {
        /// Units of the formula.
        units: Units,
        /// Design speed.
        speed: f64,
        /// Perception–reaction time, s.
        reaction_s: f64,
        /// Deceleration.
        decel: f64,
        /// The least distance ever required: the design SSD.
        floor: f64,
    },
}

/// Iterations of the braking-distance fixed point before it is taken as it is.
const BRAKING_ITERATIONS: usize = 100;

impl Requirement {
    /// The required distance for an eye at road station `s` of `road`.
    pub fn on_road(self, road: &Road, s: f64) -> f64 {
        match self {
            Self::Design(d) => d,
            Self::GradeAdjusted { units, speed, reaction_s, decel, floor } => {
                let reaction = sight::reaction_distance(units, speed, reaction_s);
                let braking = |grade: f64| sight::braking_distance(units, speed, decel, grade);
                let from = s + reaction;
                let mut distance = braking(road.grade(from));
                for _ in 0..BRAKING_ITERATIONS {
                    if !distance.is_finite() || distance <= 0.0 {
                        break;
                    }
                    let average = (road.elevation(from + distance) - road.elevation(from)) / distance;
                    let next = braking(average);
                    let settled = crate::tolerance::settled(next, distance);
                    distance = next;
                    if settled {
                        break;
                    }
                }
                (reaction + distance).max(floor)
            }
        }
    }

    /// How far ahead of an eye working out this requirement can look on
    /// grades no steeper than `max_grade_percent`: [`Self::largest`], or
    /// infinity when a downgrade that steep leaves no finite braking distance
    /// (the fixed point's iterates then have no bound).
    pub fn look_ahead(self, max_grade_percent: f64) -> f64 {
        match self {
            Self::Design(d) => d,
            Self::GradeAdjusted { units, speed, decel, .. } => {
                let grade = -max_grade_percent.abs() / 100.0;
                let braking = sight::braking_distance(units, speed, decel, grade);
                if braking.is_finite() && braking > 0.0 {
                    self.largest(max_grade_percent)
                } else {
                    f64::INFINITY
                }
            }
        }
    }

    /// The largest distance this can require on grades no steeper than
    /// `max_grade_percent` (for how far to look around a curve).
    pub fn largest(self, max_grade_percent: f64) -> f64 {
        match self {
            Self::Design(d) => d,
            Self::GradeAdjusted { units, speed, reaction_s, decel, floor } => {
                let grade = -max_grade_percent.abs() / 100.0;
                (sight::reaction_distance(units, speed, reaction_s)
                    + sight::braking_distance(units, speed, decel, grade))
                .max(floor)
            }
        }
    }
}
