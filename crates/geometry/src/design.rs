//! The design as the analysis reads it: the profile, the criteria it is held
//! to, and its site (ground, control points, the earthwork section). A
//! project file holds more (a name, the editor's and the export's
//! settings); this is what decides every result.

use crate::{ControlPoint, Criteria, Ground, Profile, Pvi, Section, Units};

/// What an [`crate::Analysis`] is made of.
#[derive(Clone, Debug, PartialEq, Default)]
pub struct Design {
    /// Unit system of every station, elevation and length.
    pub units: Units,
    /// Design criteria.
    pub criteria: Criteria,
    /// The proposed profile's PVIs, in station order.
    pub pvis: Vec<Pvi>,
    /// Existing ground line, in station order (shared, never copied).
    pub ground: Ground,
    /// Elevations the profile must meet, stay above or stay below.
    pub controls: Vec<ControlPoint>,
    /// The level typical section of the earthwork estimate, when one is set.
    pub section: Option<Section>,
    /// The station equations (none: plan stations are internal stations).
    pub equations: crate::Equations,
    /// Where the criteria differ from `criteria` along the road.
    pub ranges: Vec<crate::CriteriaRange>,
    /// Station interval of the earthwork estimate (and of the station
    /// table); `None` is [`Units::table_interval`].
    pub interval: Option<f64>,
}

impl Design {
    /// The profile (a copy of units and PVIs).
    pub fn profile(&self) -> Profile {
        Profile::new(self.units, self.pvis.clone()).with_equations(self.equations.clone())
    }

    /// The criteria in force along the road: the project's, with each
    /// criteria range resolved over its stations.
    ///
    /// # Errors
    /// As [`crate::Criteria::resolve_with`].
    pub fn criteria_in_force(&self) -> Result<crate::ResolvedCriteria, crate::CriteriaError> {
        self.criteria.resolve_with(self.units, &self.ranges)
    }

    /// The station interval in force.
    pub fn interval(&self) -> f64 {
        self.interval.unwrap_or(self.units.table_interval())
    }
}
