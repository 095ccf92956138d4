//! Gradewright geometry: the vertical profile of a road, modelled exactly.
//!
//! * [`Profile`] / [`Pvi`] / [`VerticalCurve`]: the profile as entered, with
//!   [`Profile::problems`] listing everything that is wrong with it at once.
//! * [`Alignment`]: a validated profile evaluated at any station.
//! * [`CurveGeometry`]: PVC, PVT, K, external, high/low point of one curve.
//! * [`Criteria`] → [`ResolvedCriteria`]: design criteria computed from the
//!   design speed by the published method, or overridden.
//! * [`check_profile`]: structured findings.
//! * [`Design`]: what an [`Analysis`] is made of (a project file, in the
//!   document crate, holds it with its name and settings).
//! * [`format_station`] / [`parse_station`]: `12+34.56` and `1+234.567`.
//!
//! This crate has no GUI dependency and never will.

mod alignment;
mod analysis;
mod checks;
mod controls;
mod criteria;
mod curve;
pub mod decimate;
mod design;
mod earthwork;
mod finding;
mod fit;
mod grades;
pub mod ground;
mod increment;
mod limits;
mod profile;
pub mod quadratic;
pub mod sight;
mod station;
mod stationing;
pub mod stretch;
pub mod synthetic;
pub mod tolerance;
mod units;
pub mod visibility;

pub use alignment::{Alignment, Cursor, KeyPoint, OutOfRange, Sample, flatten_segments, interior_curves};
pub use analysis::{Analysis, is_design_problem, unchecked_report};
pub use checks::{
    CheckReport, CurveCheck, MAX_SIGHT_STATIONS, PVIS_PER_STRETCH, Streamed, StreamedCheck, check_curve,
    check_curve_in_force, check_profile, check_profile_with_sight, compute_sight, sight_by_stretch,
    sight_in_force, structural_findings,
};
pub use controls::{
    ControlKind, ControlPoint, ControlStatus, Undercrossing, check_controls, control_findings, undercrossing,
    undercrossings,
};
pub use criteria::{
    Criteria, CriteriaError, CriteriaRange, CriterionId, Quantity, Resolved, ResolvedCriteria, ResolvedRange,
    SagRule, Setting, ranges_problem,
};
pub use curve::{CurveGeometry, CurveKind, Segment};
pub use design::Design;
pub use earthwork::{
    Earthwork, EarthworkError, EarthworkRow, RowKind, Section, SectionField, area_symbol, earthwork,
    earthwork_at, volume_symbol,
};
pub use finding::{Finding, FindingCode, Severity};
pub use fit::{FitOutcome, default_curve_length, lengthen_to_clear};
pub use grades::{Area, RoadClass, Terrain, max_grade};
pub use ground::{
    CutFillSummary, Depth, Ground, GroundPoint, GroundWarning, cut_fill_summary, depth_at, grade_points,
};
pub use increment::Increment;
pub use limits::InsertError;
pub use profile::{Profile, ProfileProblem, Pvi, VerticalCurve};
pub use station::{Station, StationError, even_stations, excerpt, format_station, parse_station, visible};
pub use stationing::{Equations, PlanStation, StationEquation, Stationing};
pub use stretch::Stretch;
pub use units::{Foot, KM_PER_MILE, Units, length_factor, shown, speed_factor, trimmed};
