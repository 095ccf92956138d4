//! Checks of the main job against published references; each module is one
//! topic, and each check names its source beside it.

mod criteria_ranges;
mod criteria_tables;
mod curve_relations;
mod files;
mod landxml;
mod landxml_kept;
mod lengths;
mod properties;
mod station_equations;
mod trust;
mod visibility;
