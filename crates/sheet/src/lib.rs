//! Gradewright exchange formats: PVI tables and station tables as CSV.
//! Depends on the geometry crate only; every writer takes any `impl Write`.

mod pvi_csv;
mod table;

pub use pvi_csv::{CsvError, PviTable, read_pvi_csv, write_pvi_csv};
pub use table::{
    SIGHT_HEADER, TABLE_HEADER, TableError, interval_stations, write_sight_table, write_station_table,
};
