//! Station tables: elevation and grade at chosen stations, as CSV.

use std::io::Write;

use gradewright_geometry::{Alignment, Earthwork, Ground, Station, format_station};

/// The header of a station table.
pub const TABLE_HEADER: [&str; 4] = ["station", "station_label", "elevation", "grade_percent"];

/// The columns a station table gains after [`TABLE_HEADER`] when the
/// project has ground (depths ≥ 0; empty where there is no ground).
pub const GROUND_COLUMNS: [&str; 3] = ["ground_elevation", "cut", "fill"];

/// The header of an earthwork table.
pub const EARTHWORK_HEADER: [&str; 6] =
    ["station", "cut_area", "fill_area", "cut_volume", "fill_volume", "mass"];

/// Stations every `interval` from the first PVI (first + k·interval), plus both
/// ends and every PVC, PVI and PVT, sorted, without duplicates.
pub fn interval_stations(alignment: &Alignment, interval: f64) -> Vec<f64> {
    let start = alignment.start().0;
    let end = alignment.end().0;
    let mut stations: Vec<f64> = alignment.key_stations().iter().map(|(s, _)| s.0).collect();
    if interval.is_finite() && interval > 0.0 {
        let steps = ((end - start) / interval).floor();
        // Bounded by the caller's interval check; 10 million rows at the most.
        let steps = steps.clamp(0.0, 1.0e7);
        #[allow(clippy::cast_possible_truncation, clippy::cast_sign_loss)]
        for k in 0..=(steps as u64) {
            #[allow(clippy::cast_precision_loss)]
            let s = start + k as f64 * interval;
            if s <= end {
                stations.push(s);
            }
        }
    }
    stations.push(start);
    stations.push(end);
    stations.sort_by(f64::total_cmp);
    let scale = (end - start).abs().max(1.0) * 1e-12;
    stations.dedup_by(|a, b| (*a - *b).abs() <= scale);
    stations
}

/// [`number`], written into `buffer` (cleared first): no allocation per
/// number once the buffer has grown.
pub(crate) fn number_into(buffer: &mut String, value: f64, decimals: Option<usize>) {
    use std::fmt::Write as _;
    buffer.clear();
    let value = if value == 0.0 { 0.0 } else { value }; // no "-0"
    // A whole number prints as the integer it is (what `{}` writes for it),
    // without the float formatter.
    let whole = value.fract() == 0.0 && value.abs() < 1e15;
    #[allow(clippy::cast_possible_truncation)]
    let _ = match decimals {
        None if whole => write!(buffer, "{}", value as i64),
        None => write!(buffer, "{value}"),
        Some(_) => write!(buffer, "{}", number(value, decimals)),
    };
}

pub(crate) fn number(value: f64, decimals: Option<usize>) -> String {
    let value = if value == 0.0 { 0.0 } else { value }; // no "-0"
    match decimals {
        Some(d) => {
            let text = format!("{value:.d$}");
            // "-0.00" after rounding reads as zero.
            if text.trim_start_matches('-').chars().all(|c| c == '0' || c == '.') {
                text.trim_start_matches('-').to_owned()
            } else {
                text
            }
        }
        None => format!("{value}"),
    }
}

/// Writes one row per station, in the order given: the station as a plain
/// number, its label in station notation, elevation, grade in percent.
/// When `ground` has points, [`GROUND_COLUMNS`] follow: the ground
/// elevation and the cut and fill depths, empty where there is no ground.
/// Numbers are written in the shortest form that reads back to the same f64,
/// or with `decimals` decimals.
///
/// # Errors
/// An out-of-range station (nothing more is written after it) or an I/O error.
pub fn write_station_table(
    out: impl Write,
    alignment: &Alignment,
    ground: &Ground,
    stations: &[f64],
    decimals: Option<usize>,
) -> Result<(), TableError> {
    let units = alignment.units();
    let mut csv = csv::Writer::from_writer(out);
    let with_ground = ground.range().is_some();
    if with_ground {
        csv.write_record(TABLE_HEADER.iter().chain(&GROUND_COLUMNS))?;
    } else {
        csv.write_record(TABLE_HEADER)?;
    }
    let mut cursor = alignment.cursor();
    let mut row: Vec<String> = Vec::with_capacity(7);
    for &s in stations {
        let sample = cursor.sample(Station(s))?;
        if !(sample.elevation.is_finite() && sample.grade_percent.is_finite()) {
            return Err(TableError::NotFinite { station: s });
        }
        let label_decimals = decimals.unwrap_or(units.station_decimals());
        row.clear();
        row.extend([
            number(s, decimals),
            format_station(s, units, label_decimals),
            number(sample.elevation, decimals),
            number(sample.grade_percent, decimals),
        ]);
        if with_ground {
            match ground.elevation_at(s) {
                Some(g) => row.extend([
                    number(g, decimals),
                    number((g - sample.elevation).max(0.0), decimals),
                    number((sample.elevation - g).max(0.0), decimals),
                ]),
                None => row.extend([String::new(), String::new(), String::new()]),
            }
        }
        csv.write_record(&row)?;
    }
    csv.flush().map_err(|e| TableError::Io(e.to_string()))?;
    Ok(())
}

/// Why a table could not be written.
#[derive(Debug, thiserror::Error)]
pub enum TableError {
    /// A station outside the profile.
    #[error(transparent)]
    OutOfRange(#[from] gradewright_geometry::OutOfRange),
    /// A value came out NaN or infinite (never written).
    #[error("the profile gives no finite elevation at station {station}")]
    NotFinite {
        /// Where.
        station: f64,
    },
    /// Writing failed.
    #[error("{0}")]
    Io(String),
}

impl From<csv::Error> for TableError {
    fn from(e: csv::Error) -> Self {
        Self::Io(e.to_string())
    }
}

/// Writes an earthwork estimate, one row per station of it (the extra
/// stations included): end areas, the volumes of the interval ending at the
/// row (0 on the first row) and the mass ordinate, unrounded.
///
/// # Errors
/// A value that is not finite, or an I/O error of `out`.
pub fn write_earthwork_csv(out: impl Write, earthwork: &Earthwork) -> Result<(), TableError> {
    let mut csv = csv::Writer::from_writer(out);
    csv.write_record(EARTHWORK_HEADER)?;
    for r in &earthwork.rows {
        let values = [r.station, r.cut_area, r.fill_area, r.cut_volume, r.fill_volume, r.mass];
        if !values.iter().all(|v| v.is_finite()) {
            return Err(TableError::NotFinite { station: r.station });
        }
        csv.write_record(values.map(|v| number(v, None)))?;
    }
    csv.flush().map_err(|e| TableError::Io(e.to_string()))?;
    Ok(())
}

/// The header of a sight-distance table.
pub const SIGHT_HEADER: [&str; 6] = [
    "station",
    "available_forward",
    "available_backward",
    "required_forward",
    "required_backward",
    "reaches_cap",
];

/// Writes available and required sight distance, one row per station
/// (forward = towards increasing stations), numbers unrounded. The last
/// column says which available distances are the cap, not a measured
/// distance (nothing limited the sight within it): `none`, `forward`,
/// `backward` or `both`.
///
/// # Errors
/// An I/O error of `out`.
pub fn write_sight_table(
    out: impl Write,
    sight: &gradewright_geometry::visibility::SightProfile,
) -> Result<(), TableError> {
    let mut table = SightTable::new(out)?;
    table.rows(sight)?;
    table.finish()
}

/// A sight-distance table written a block of stations at a time (for a
/// profile computed one stretch at a time): the header, then the rows of
/// each block as [`write_sight_table`] writes them.
pub struct SightTable<W: Write> {
    csv: csv::Writer<W>,
    field: String,
}

impl<W: Write> SightTable<W> {
    /// Starts the table: writes the header.
    ///
    /// # Errors
    /// An I/O error of `out`.
    pub fn new(out: W) -> Result<Self, TableError> {
        let mut csv = csv::Writer::from_writer(out);
        csv.write_record(SIGHT_HEADER)?;
        Ok(Self { csv, field: String::new() })
    }

    /// Writes one row per sample of `sight`.
    ///
    /// # Errors
    /// A value that is not finite (nothing of that row is written), or an I/O error.
    pub fn rows(&mut self, sight: &gradewright_geometry::visibility::SightProfile) -> Result<(), TableError> {
        for s in &sight.samples {
            let values = [s.station, s.forward, s.backward, s.required_forward, s.required_backward];
            if !values.iter().all(|v| v.is_finite()) {
                return Err(TableError::NotFinite { station: s.station });
            }
            for value in values {
                number_into(&mut self.field, value, None);
                self.csv.write_field(&self.field)?;
            }
            self.csv.write_field(match (sight.reaches_cap(s.forward), sight.reaches_cap(s.backward)) {
                (false, false) => "none",
                (true, false) => "forward",
                (false, true) => "backward",
                (true, true) => "both",
            })?;
            self.csv.write_record(None::<&[u8]>)?;
        }
        Ok(())
    }

    /// Ends the table.
    ///
    /// # Errors
    /// An I/O error of the output.
    pub fn finish(mut self) -> Result<(), TableError> {
        self.csv.flush().map_err(|e| TableError::Io(e.to_string()))
    }
}
