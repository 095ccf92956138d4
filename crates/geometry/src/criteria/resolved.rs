//! The criteria in force: each value computed from the design speed by the
//! published method (with its rule and source) or the user's own, and what
//! the checks ask of them.

use super::CriterionId;
use crate::grades::{Area, RoadClass, Terrain, max_grade};
use crate::{Units, sight};

/// A criterion's value in force, and where it came from.
#[derive(Clone, Debug, PartialEq)]
pub struct Resolved {
    /// The value, in the project's units.
    pub value: f64,
    /// Whether the user entered it.
    pub overridden: bool,
    /// How it was obtained (formula and source), for reports.
    pub rule: String,
}

/// Every criterion resolved for one unit system and design speed.
#[derive(Clone, Debug, PartialEq)]
pub struct ResolvedCriteria {
    /// Unit system.
    pub units: Units,
    /// Design speed, km/h or mph.
    pub design_speed: f64,
    /// Terrain class.
    pub terrain: Terrain,
    /// Functional class.
    pub road_class: RoadClass,
    /// Rural or urban.
    pub area: Area,
    /// Whether the sag comfort length is checked on an unlit road too.
    pub sag_comfort: bool,
    /// Whether headlight sight distance is checked.
    pub headlight_check: bool,
    /// Whether the required SSD follows the grade.
    pub grade_adjusted_ssd: bool,
    /// Each criterion in force, in the order of [`CriterionId::ALL`].
    pub(super) values: Vec<Resolved>,
    /// The criteria ranges in force along the road, in station order (the
    /// values above are the project's, outside every range).
    pub ranges: Vec<super::ranges::ResolvedRange>,
}

impl ResolvedCriteria {
    /// The resolved entry of one criterion.
    pub fn entry(&self, id: CriterionId) -> Option<&Resolved> {
        self.values.get(id.index())
    }

    /// The value of one criterion (NaN if it was not resolved).
    pub fn get(&self, id: CriterionId) -> f64 {
        self.entry(id).map_or(f64::NAN, |r| r.value)
    }

    /// Whether the criterion was entered by the user (not computed).
    pub fn is_overridden(&self, id: CriterionId) -> bool {
        self.entry(id).is_some_and(|e| e.overridden)
    }

    /// Crest constant C for the eye and object heights in force: the
    /// published rounded constant when neither height is overridden, else the
    /// general formula.
    pub fn crest_constant(&self) -> f64 {
        if self.is_overridden(CriterionId::EyeHeight) || self.is_overridden(CriterionId::ObjectHeight) {
            sight::crest_constant(self.get(CriterionId::EyeHeight), self.get(CriterionId::ObjectHeight))
        } else {
            sight::published_crest_constant(self.units)
        }
    }

    /// Headlight terms (base, slope) for the headlight height and angle in
    /// force: the published rounded terms unless one is overridden.
    pub fn headlight_terms(&self) -> (f64, f64) {
        if self.is_overridden(CriterionId::HeadlightHeight) || self.is_overridden(CriterionId::HeadlightAngle)
        {
            sight::headlight_terms(
                self.get(CriterionId::HeadlightHeight),
                self.get(CriterionId::HeadlightAngle),
            )
        } else {
            sight::published_headlight_terms(self.units)
        }
    }

    /// The sag rule in force: headlight sight distance on an unlit road,
    /// comfort on a lit one.
    pub fn sag_rule(&self) -> SagRule {
        if self.headlight_check { SagRule::Headlight } else { SagRule::Comfort }
    }

    /// Whether sag curves are checked for comfort (always on a lit road).
    pub fn checks_sag_comfort(&self) -> bool {
        self.sag_comfort || self.sag_rule() == SagRule::Comfort
    }

    /// Sag comfort length for a grade change `a_percent`: L = A·V²/D with the
    /// published divisor at the default acceleration, else A·v²/(100·a).
    pub fn sag_comfort_length(&self, a_percent: f64) -> f64 {
        let v = self.design_speed;
        if self.is_overridden(CriterionId::ComfortAcceleration) {
            sight::sag_comfort_length(self.units, a_percent, v, self.get(CriterionId::ComfortAcceleration))
        } else {
            a_percent * v * v / sight::published_comfort_divisor(self.units)
        }
    }

    /// Warnings about the design speed: between the rows of the published
    /// SSD and K tables (the values are then computed by formula).
    pub fn speed_notes(&self) -> Vec<String> {
        let unit = self.units.speed_symbol();
        let (low, high, step) = self.units.design_speed_table();
        let v = self.design_speed;
        let mut notes = Vec::new();
        // Speeds outside the tables are refused when the criteria are
        // resolved; between two rows the values are the formula's.
        let row = (v / step).round() * step;
        if !crate::tolerance::nearly_equal(v, row) {
            notes.push(format!(
                "Design speed {} {unit} lies between the rows of the published SSD and K tables \
                 ({low}–{high} {unit}, every {step} {unit}); SSD and K are computed by formula, not read from a row",
                crate::trimmed(v, 2)
            ));
        }
        notes
    }

    /// The largest sight distance any station can require on this profile's
    /// grades (no steeper than `max_grade_percent`).
    pub fn largest_requirement(&self, max_grade_percent: f64) -> f64 {
        self.sight_requirement().largest(max_grade_percent)
    }

    /// Heights, beam angle and cap for the sight-distance computation.
    pub fn sight_setup(&self) -> crate::visibility::SightSetup {
        crate::visibility::SightSetup {
            eye_height: self.get(CriterionId::EyeHeight),
            object_height: self.get(CriterionId::ObjectHeight),
            headlight_height: self.get(CriterionId::HeadlightHeight),
            headlight_angle_deg: self.get(CriterionId::HeadlightAngle),
            daylight: true,
            headlights: self.headlight_check,
            cap: self.get(CriterionId::SightCap),
        }
    }

    /// What stopping sight distance each station needs.
    pub fn sight_requirement(&self) -> crate::visibility::Requirement {
        if self.grade_adjusted_ssd {
            crate::visibility::Requirement::GradeAdjusted {
                units: self.units,
                speed: self.design_speed,
                reaction_s: self.get(CriterionId::ReactionTime),
                decel: self.get(CriterionId::Deceleration),
                floor: self.get(CriterionId::StoppingSightDistance),
            }
        } else {
            crate::visibility::Requirement::Design(self.get(CriterionId::StoppingSightDistance))
        }
    }

    /// The computed (published-method) value of `id`, given the criteria resolved
    /// before it, and the rule used.
    #[allow(clippy::too_many_lines)]
    pub(super) fn computed(&self, id: CriterionId) -> (f64, String) {
        let units = self.units;
        let v = self.design_speed;
        let len = units.length_symbol();
        let speed = units.speed_symbol();
        match id {
            CriterionId::ReactionTime => (
                sight::REACTION_TIME_S,
                "Green Book 2018 §3.2.2, brake reaction time (TxDOT RDM §4.11.1)".to_owned(),
            ),
            CriterionId::Deceleration => (
                sight::default_deceleration(units),
                "Green Book 2018 §3.2.2, deceleration rate (TxDOT RDM §4.11.1; metric from memory)"
                    .to_owned(),
            ),
            CriterionId::EyeHeight => (
                sight::default_eye_height(units),
                "Green Book 2018 §3.2.6, passenger-car driver eye height (TxDOT RDM §4.11.1)".to_owned(),
            ),
            CriterionId::ObjectHeight => (
                sight::default_object_height(units),
                "Green Book 2018 §3.2.6, object height for stopping (TxDOT RDM §4.11.1)".to_owned(),
            ),
            CriterionId::HeadlightHeight => (
                sight::default_headlight_height(units),
                "Green Book 2018 §3.4.6.3, headlight height (from memory)".to_owned(),
            ),
            CriterionId::HeadlightAngle => (
                sight::HEADLIGHT_ANGLE_DEG,
                "Green Book 2018 §3.4.6.3, upward divergence of the beam (from memory)".to_owned(),
            ),
            CriterionId::StoppingSightDistance => {
                let t = self.get(CriterionId::ReactionTime);
                let a = self.get(CriterionId::Deceleration);
                let raw = sight::stopping_sight_distance(units, v, t, a);
                let formula = match units {
                    Units::UsCustomary => "1.47·V·t + 1.075·V²/a",
                    Units::Metric => "0.278·V·t + 0.039·V²/a",
                };
                (
                    sight::round_design_distance(raw),
                    format!(
                        "SSD = {formula} = {raw:.1} {len}, rounded up to 5 {len} as Green Book 2018 Table 3-1 is \
                         (eq. 3-2)"
                    ),
                )
            }
            CriterionId::CrestK => {
                let s = self.get(CriterionId::StoppingSightDistance);
                let c = self.crest_constant();
                let raw = s * s / c;
                (
                    sight::round_design_k(raw),
                    format!("K = S²/{c:.0} = {raw:.2}, rounded up as Green Book 2018 Table 3-34 is"),
                )
            }
            CriterionId::SagK => match self.sag_rule() {
                SagRule::Headlight => {
                    let s = self.get(CriterionId::StoppingSightDistance);
                    let (base, slope) = self.headlight_terms();
                    let raw = s * s / (base + slope * s);
                    (
                        sight::round_design_k(raw),
                        format!(
                            "headlight rule (unlit road): K = S²/({base:.0} + {slope:.2}·S) = {raw:.2}, rounded \
                             up as Green Book 2018 Table 3-36 is"
                        ),
                    )
                }
                SagRule::Comfort => {
                    let raw = self.sag_comfort_length(1.0);
                    (
                        sight::round_design_k(raw),
                        format!(
                            "comfort rule (lit road, headlight check off): K = L/A for comfort = {raw:.2}, \
                             rounded up (Green Book 2018 §3.4.6.3, sags with fixed lighting, and eq. 3-50; \
                             from memory)"
                        ),
                    )
                }
            },
            CriterionId::ComfortAcceleration => (
                sight::default_comfort_acceleration(units),
                "Green Book 2018 §3.4.6.3, comfortable vertical acceleration 1 ft/s² (0.3 m/s²)".to_owned(),
            ),
            CriterionId::MinCurveLength => {
                let rule = match units {
                    Units::UsCustomary => "3·V",
                    Units::Metric => "0.6·V",
                };
                (
                    sight::appearance_min_length(units, v),
                    format!(
                        "L ≥ {rule}, the Green Book's minimum length for appearance (2018 §3.4.6.2; from memory)"
                    ),
                )
            }
            CriterionId::MaxBareBreak => {
                let (slow, limit) = match units {
                    Units::UsCustomary => (45.0, if v <= 45.0 { 1.0 } else { 0.5 }),
                    Units::Metric => (70.0, if v <= 70.0 { 1.0 } else { 0.5 }),
                };
                (
                    limit,
                    format!(
                        "a grade break without a curve up to 0.5 % (1.0 % at {slow} {speed} or less): agency \
                         practice varies (common practice, from memory; no published source confirmed)"
                    ),
                )
            }
            CriterionId::MaxGrade => max_grade(units, v, self.road_class, self.area, self.terrain),
            CriterionId::MinGrade => (
                sight::MIN_GUTTER_GRADE_PERCENT,
                "curbed-road gutter minimum (TxDOT Hydraulic Design Manual (2019) ch. 10)".to_owned(),
            ),
            CriterionId::DrainageK => (
                sight::drainage_k(units),
                "curbed-road drainage review above this K (Green Book 2018 §3.4.6.2; from memory)".to_owned(),
            ),
            CriterionId::SightStep => (
                match units {
                    Units::Metric => 1.0,
                    Units::UsCustomary => 5.0,
                },
                "one sample every 1 m or 5 ft (common practice)".to_owned(),
            ),
            CriterionId::SightCap => {
                let ssd = self.get(CriterionId::StoppingSightDistance);
                (
                    3.0 * ssd,
                    format!("3 × the design SSD ({ssd:.0} {len}); longer distances are not looked for"),
                )
            }
        }
    }
}

/// Which rule sets the sag requirement.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum SagRule {
    /// Headlight sight distance at night (an unlit road).
    Headlight,
    /// Rider comfort (a continuously lit road).
    Comfort,
}

impl SagRule {
    /// Display name.
    pub fn label(self) -> &'static str {
        match self {
            Self::Headlight => "headlight sight distance (unlit road)",
            Self::Comfort => "comfort (lit road)",
        }
    }
}
