//! Gradewright exchange formats: PVI tables, station tables and the
//! hand-over tables (stations, curves, findings) as CSV.
//! Depends on the geometry crate only; every writer takes any `impl Write`.

mod controls_csv;
mod ground_csv;
mod hand_over;
mod pvi_csv;
mod table;

pub use controls_csv::{CONTROLS_HEADER, read_controls_csv};
pub use ground_csv::{GroundTable, read_ground_csv};
pub use hand_over::{curves_header, write_curves_csv, write_findings_csv, write_stations_csv};
pub use pvi_csv::{CsvError, PviTable, read_pvi_csv, write_pvi_csv};
pub use table::{
    EARTHWORK_HEADER, GROUND_COLUMNS, SIGHT_HEADER, TABLE_HEADER, TableError, interval_stations,
    write_earthwork_csv, write_sight_table, write_station_table,
};
