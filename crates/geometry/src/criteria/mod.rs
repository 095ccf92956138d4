//! Design criteria: what the user enters, each value either computed from the
//! design speed by the published method or overridden.

mod ranges;
mod resolved;

pub use ranges::{CriteriaRange, ResolvedRange, ranges_problem};
pub use resolved::{Resolved, ResolvedCriteria, SagRule};

use serde::{Deserialize, Serialize};

use crate::Units;
use crate::grades::{Area, RoadClass, Terrain};

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
        // Only speeds the published tables cover are checked: beyond them
        // the method is not published (between rows it is, by formula, and
        // a warning says so).
        let (low, high, _) = units.design_speed_table();
        let inside = speed.is_finite()
            && !crate::tolerance::below(speed, low)
            && !crate::tolerance::above(speed, high);
        if !inside {
            return Err(CriteriaError::BadDesignSpeed { speed, low, high, unit: units.speed_symbol() });
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
            ranges: Vec::new(),
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
                    if id == CriterionId::SightStep && crate::tolerance::above(value, units.max_sight_step())
                    {
                        return Err(CriteriaError::CoarseStep {
                            step: value,
                            max: units.max_sight_step(),
                            unit: units.length_symbol(),
                        });
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
    /// A criteria range's own criteria are not usable.
    #[error("criteria range {}: {error}", .index + 1)]
    InRange {
        /// Which range (0-based).
        index: usize,
        /// Why.
        error: Box<CriteriaError>,
    },
    /// The criteria ranges are not usable (out of order, overlapping).
    #[error("criteria range {}: {why}", .index + 1)]
    BadRange {
        /// Which range (0-based).
        index: usize,
        /// Why.
        why: String,
    },
    /// The design speed is not one the published tables cover.
    #[error("design speed {} {unit} is outside {low}–{high} {unit}, the speeds of the published SSD and K tables (Green Book 2018 Tables 3-1, 3-34, 3-36)", crate::shown(*.speed))]
    BadDesignSpeed {
        /// The speed given.
        speed: f64,
        /// The tables' lowest speed.
        low: f64,
        /// Their highest.
        high: f64,
        /// `km/h` or `mph`.
        unit: &'static str,
    },
    /// The sight-distance step is coarser than a shortfall may be long.
    #[error("sight-distance step {} {unit} is coarser than {max} {unit}; a stretch that falls short could be missed", crate::shown(*.step))]
    CoarseStep {
        /// The step given.
        step: f64,
        /// The coarsest step.
        max: f64,
        /// `m` or `ft`.
        unit: &'static str,
    },
    /// An override is not usable.
    #[error("{criterion}: {} is not a usable value", crate::shown(*.value))]
    BadOverride {
        /// Which criterion.
        criterion: &'static str,
        /// The value given.
        value: f64,
    },
}
