//! Gradewright exchange formats: PVI tables, station tables, ground lines,
//! control points and the hand-over tables (stations, curves, findings) as
//! CSV, and design profiles with their ground as LandXML 1.2.
//! Depends on the geometry crate only; every writer takes any `impl Write`,
//! and every reader reports one located error, [`ReadError`].

mod controls_csv;
mod error;
mod ground_csv;
mod hand_over;
pub mod landxml;
mod note;
mod pvi_csv;
mod table;

pub use controls_csv::{CONTROLS_HEADER, read_controls_csv};
pub use error::{Ambiguous, Choosing, ReadError, open_file};
pub use ground_csv::{GroundTable, read_ground_csv};
pub use hand_over::{
    Quantity, Rounding, curves_header, earthwork_header, write_curves_csv, write_earthwork_csv,
    write_findings_csv, write_stations_csv,
};
pub use landxml::{
    Choice, LandXmlGround, LandXmlProfile, Selection, Stamp, is_landxml_path, landxml_choices, read_landxml,
    read_landxml_ground, write_landxml,
};
pub use note::{FileLengths, Note, NoteKind};
pub use pvi_csv::{PviTable, read_pvi_csv, write_pvi_csv};
pub use table::{
    GROUND_COLUMNS, SIGHT_HEADER, SightTable, StationTable, TABLE_HEADER, TableError, interval_stations,
    write_interval_table, write_station_table,
};
