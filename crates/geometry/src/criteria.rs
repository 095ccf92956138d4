//! Design criteria: what the user enters, each value either computed from the
//! design speed by the published method or overridden.

use serde::{Deserialize, Serialize};

use crate::grades::{Area, RoadClass, Terrain, max_grade};
use crate::{Units, sight};

/// A criterion's value: computed by the published method, or the user's own.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize, Default)]
pub enum Setting {
    /// Computed from the design speed and the other criteria.
    #[default]
    Computed,
    /// Entered by the user.
    Override(f64),
}

/// The criteria of a project, as saved in its file.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(default, deny_unknown_fields)]
pub struct Criteria {
    /// Design speed in km/h or mph; `None` until the user sets one.
    pub design_speed: Option<f64>,
    /// Terrain, for the default maximum grade.
    pub terrain: Terrain,
    /// Functional class, for the default maximum grade.
    pub road_class: RoadClass,
    /// Rural or urban, for the default maximum grade.
    pub area: Area,
    /// Whether the sag comfort length is also checked on an unlit road (off by
    /// default: headlight sight distance normally governs; on a lit road the
    /// comfort rule is the sag rule).
    pub sag_comfort: bool,
    /// Whether headlight sight distance is checked; off means the road is
    /// continuously lit, and sags are then designed for comfort.
    pub headlight_check: bool,
    /// Whether the required SSD at each station uses the grade the vehicle is
    /// on (downgrades need more) instead of the level design SSD.
    pub grade_adjusted_ssd: bool,
    /// Perception–reaction time, s.
    pub reaction_time: Setting,
    /// Braking deceleration.
    pub deceleration: Setting,
    /// Driver eye height h1.
    pub eye_height: Setting,
    /// Object height h2.
    pub object_height: Setting,
    /// Headlight height H.
    pub headlight_height: Setting,
    /// Upward divergence of the headlight beam, degrees.
    pub headlight_angle: Setting,
    /// Design stopping sight distance.
    pub stopping_sight_distance: Setting,
    /// Minimum K on crests.
    pub crest_k: Setting,
    /// Minimum K on sags.
    pub sag_k: Setting,
    /// Vertical acceleration limit for sag comfort.
    pub comfort_acceleration: Setting,
    /// Minimum curve length.
    pub min_curve_length: Setting,
    /// Largest algebraic difference of grades left without a curve, percent.
    pub max_bare_break: Setting,
    /// Maximum grade, percent.
    pub max_grade: Setting,
    /// Minimum grade for drainage, percent.
    pub min_grade: Setting,
    /// K above which a curve's level point needs a drainage review.
    pub drainage_k: Setting,
    /// Station step of the sight-distance computation.
    pub sight_step: Setting,
    /// Longest sight distance looked for.
    pub sight_cap: Setting,
}

impl Default for Criteria {
    fn default() -> Self {
        Self {
            design_speed: None,
            terrain: Terrain::default(),
            road_class: RoadClass::default(),
            area: Area::default(),
            sag_comfort: false,
            headlight_check: true,
            grade_adjusted_ssd: false,
            reaction_time: Setting::Computed,
            deceleration: Setting::Computed,
            eye_height: Setting::Computed,
            object_height: Setting::Computed,
            headlight_height: Setting::Computed,
            headlight_angle: Setting::Computed,
            stopping_sight_distance: Setting::Computed,
            crest_k: Setting::Computed,
            sag_k: Setting::Computed,
            comfort_acceleration: Setting::Computed,
            min_curve_length: Setting::Computed,
            max_bare_break: Setting::Computed,
            max_grade: Setting::Computed,
            min_grade: Setting::Computed,
            drainage_k: Setting::Computed,
            sight_step: Setting::Computed,
            sight_cap: Setting::Computed,
        }
    }
}

/// One criterion that can be computed or overridden.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, PartialOrd, Ord)]
#[allow(missing_docs)]
pub enum CriterionId {
    ReactionTime,
    Deceleration,
    EyeHeight,
    ObjectHeight,
    HeadlightHeight,
    HeadlightAngle,
    StoppingSightDistance,
    CrestK,
    SagK,
    ComfortAcceleration,
    MinCurveLength,
    MaxBareBreak,
    MaxGrade,
    MinGrade,
    DrainageK,
    SightStep,
    SightCap,
}

/// What a criterion is measured in.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Quantity {
    /// Seconds.
    Seconds,
    /// m/s² or ft/s².
    Acceleration,
    /// m or ft.
    Length,
    /// Degrees.
    Degrees,
    /// m/% or ft/%.
    K,
    /// Percent grade.
    Percent,
}

impl Quantity {
    /// Unit symbol in `units`.
    pub fn symbol(self, units: Units) -> &'static str {
        match self {
            Self::Seconds => "s",
            Self::Acceleration => units.acceleration_symbol(),
            Self::Length => units.length_symbol(),
            Self::Degrees => "°",
            Self::K => units.k_symbol(),
            Self::Percent => "%",
        }
    }
}

impl CriterionId {
    /// Every criterion, in the order they are resolved and shown.
    pub const ALL: [Self; 17] = [
        Self::ReactionTime,
        Self::Deceleration,
        Self::EyeHeight,
        Self::ObjectHeight,
        Self::HeadlightHeight,
        Self::HeadlightAngle,
        Self::StoppingSightDistance,
        Self::CrestK,
        Self::SagK,
        Self::ComfortAcceleration,
        Self::MinCurveLength,
        Self::MaxBareBreak,
        Self::MaxGrade,
        Self::MinGrade,
        Self::DrainageK,
        Self::SightStep,
        Self::SightCap,
    ];

    /// Short label for tables and forms.
    pub fn label(self) -> &'static str {
        match self {
            Self::ReactionTime => "Perception–reaction time",
            Self::Deceleration => "Deceleration",
            Self::EyeHeight => "Eye height h1",
            Self::ObjectHeight => "Object height h2",
            Self::HeadlightHeight => "Headlight height",
            Self::HeadlightAngle => "Headlight beam angle",
            Self::StoppingSightDistance => "Stopping sight distance",
            Self::CrestK => "Minimum crest K",
            Self::SagK => "Minimum sag K",
            Self::ComfortAcceleration => "Comfort acceleration",
            Self::MinCurveLength => "Minimum curve length",
            Self::MaxBareBreak => "Largest break without a curve",
            Self::MaxGrade => "Maximum grade",
            Self::MinGrade => "Minimum grade",
            Self::DrainageK => "Drainage review K",
            Self::SightStep => "Sight-distance step",
            Self::SightCap => "Sight-distance cap",
        }
    }

    /// What the value is measured in.
    pub fn quantity(self) -> Quantity {
        match self {
            Self::ReactionTime => Quantity::Seconds,
            Self::Deceleration | Self::ComfortAcceleration => Quantity::Acceleration,
            Self::EyeHeight
            | Self::ObjectHeight
            | Self::HeadlightHeight
            | Self::StoppingSightDistance
            | Self::MinCurveLength
            | Self::SightStep
            | Self::SightCap => Quantity::Length,
            Self::HeadlightAngle => Quantity::Degrees,
            Self::CrestK | Self::SagK | Self::DrainageK => Quantity::K,
            Self::MaxGrade | Self::MinGrade | Self::MaxBareBreak => Quantity::Percent,
        }
    }

    fn index(self) -> usize {
        self as usize
    }
}

impl Criteria {
    /// The setting of one criterion.
    pub fn setting(&self, id: CriterionId) -> Setting {
        match id {
            CriterionId::ReactionTime => self.reaction_time,
            CriterionId::Deceleration => self.deceleration,
            CriterionId::EyeHeight => self.eye_height,
            CriterionId::ObjectHeight => self.object_height,
            CriterionId::HeadlightHeight => self.headlight_height,
            CriterionId::HeadlightAngle => self.headlight_angle,
            CriterionId::StoppingSightDistance => self.stopping_sight_distance,
            CriterionId::CrestK => self.crest_k,
            CriterionId::SagK => self.sag_k,
            CriterionId::ComfortAcceleration => self.comfort_acceleration,
            CriterionId::MinCurveLength => self.min_curve_length,
            CriterionId::MaxBareBreak => self.max_bare_break,
            CriterionId::MaxGrade => self.max_grade,
            CriterionId::MinGrade => self.min_grade,
            CriterionId::DrainageK => self.drainage_k,
            CriterionId::SightStep => self.sight_step,
            CriterionId::SightCap => self.sight_cap,
        }
    }

    /// Mutable access to one criterion's setting.
    pub fn setting_mut(&mut self, id: CriterionId) -> &mut Setting {
        match id {
            CriterionId::ReactionTime => &mut self.reaction_time,
            CriterionId::Deceleration => &mut self.deceleration,
            CriterionId::EyeHeight => &mut self.eye_height,
            CriterionId::ObjectHeight => &mut self.object_height,
            CriterionId::HeadlightHeight => &mut self.headlight_height,
            CriterionId::HeadlightAngle => &mut self.headlight_angle,
            CriterionId::StoppingSightDistance => &mut self.stopping_sight_distance,
            CriterionId::CrestK => &mut self.crest_k,
            CriterionId::SagK => &mut self.sag_k,
            CriterionId::ComfortAcceleration => &mut self.comfort_acceleration,
            CriterionId::MinCurveLength => &mut self.min_curve_length,
            CriterionId::MaxBareBreak => &mut self.max_bare_break,
            CriterionId::MaxGrade => &mut self.max_grade,
            CriterionId::MinGrade => &mut self.min_grade,
            CriterionId::DrainageK => &mut self.drainage_k,
            CriterionId::SightStep => &mut self.sight_step,
            CriterionId::SightCap => &mut self.sight_cap,
        }
    }

    /// Resolves every criterion for `units`: computed values by the published
    /// method, overrides as given.
    ///
    /// # Errors
    /// [`CriteriaError`] when there is no usable design speed or an override is
    /// not a positive finite number (zero is allowed for the minimum grade and
    /// minimum length).
    pub fn resolve(&self, units: Units) -> Result<ResolvedCriteria, CriteriaError> {
        let speed = self.design_speed.ok_or(CriteriaError::NoDesignSpeed)?;
        if !speed.is_finite() || speed <= 0.0 || speed > 400.0 {
            return Err(CriteriaError::BadDesignSpeed(speed));
        }
        let mut out = ResolvedCriteria {
            units,
            design_speed: speed,
            terrain: self.terrain,
            road_class: self.road_class,
            area: self.area,
            sag_comfort: self.sag_comfort,
            headlight_check: self.headlight_check,
            grade_adjusted_ssd: self.grade_adjusted_ssd,
            values: Vec::with_capacity(CriterionId::ALL.len()),
        };
        for id in CriterionId::ALL {
            let (computed, rule) = out.computed(id);
            let resolved = match self.setting(id) {
                Setting::Computed => Resolved { value: computed, overridden: false, rule },
                Setting::Override(value) => {
                    let zero_ok = matches!(
                        id,
                        CriterionId::MinGrade | CriterionId::MinCurveLength | CriterionId::MaxBareBreak
                    );
                    if !value.is_finite() || value < 0.0 || (value == 0.0 && !zero_ok) {
                        return Err(CriteriaError::BadOverride { criterion: id.label(), value });
                    }
                    Resolved { value, overridden: true, rule: "entered by the user".to_owned() }
                }
            };
            out.values.push(resolved);
        }
        Ok(out)
    }
}

/// Why criteria could not be resolved.
#[derive(Clone, Debug, PartialEq, thiserror::Error)]
pub enum CriteriaError {
    /// No design speed was set.
    #[error("no design speed is set")]
    NoDesignSpeed,
    /// The design speed is not usable.
    #[error("design speed {0} is not a positive speed")]
    BadDesignSpeed(f64),
    /// An override is not usable.
    #[error("{criterion}: {value} is not a usable value")]
    BadOverride {
        /// Which criterion.
        criterion: &'static str,
        /// The value given.
        value: f64,
    },
}

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
    values: Vec<Resolved>,
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

    /// Warnings about the design speed: outside the published SSD and K
    /// tables, or between their rows (the values are then computed by
    /// formula).
    pub fn speed_notes(&self) -> Vec<String> {
        let unit = self.units.speed_symbol();
        let (low, high, step) = match self.units {
            Units::UsCustomary => (15.0, 80.0, 5.0),
            Units::Metric => (20.0, 130.0, 10.0),
        };
        let v = self.design_speed;
        let mut notes = Vec::new();
        if crate::tolerance::below(v, low) || crate::tolerance::above(v, high) {
            notes.push(format!(
                "Design speed {v} {unit} is outside the published SSD and K tables ({low}–{high} {unit}, \
                 Green Book 2018 Tables 3-1, 3-34, 3-36); SSD and K are computed by formula beyond them"
            ));
        } else {
            let row = (v / step).round() * step;
            if !crate::tolerance::nearly_equal(v, row) {
                notes.push(format!(
                    "Design speed {v} {unit} lies between the rows of the published SSD and K tables \
                     (every {step} {unit}); SSD and K are computed by formula, not read from a row"
                ));
            }
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
    fn computed(&self, id: CriterionId) -> (f64, String) {
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
