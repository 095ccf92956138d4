//! Station tables: elevation and grade at chosen stations, as CSV.

use std::io::Write;

use gradewright_geometry::{Alignment, Ground, Profile, Station};

/// The header of a station table.
pub const TABLE_HEADER: [&str; 4] = ["station", "station_label", "elevation", "grade_percent"];

/// The columns a station table gains after [`TABLE_HEADER`] when the
/// project has ground (depths ≥ 0; empty where there is no ground).
pub const GROUND_COLUMNS: [&str; 3] = ["ground_elevation", "cut", "fill"];

/// Stations on every whole multiple of `interval` (plan stationing: 12+50,
/// 13+00, … on a road starting at 12+34.56, restarting on even stations
/// ahead of each station equation), plus both ends, every PVC, PVI and PVT
/// and every station equation, sorted, without duplicates (internal
/// stations).
pub fn interval_stations(alignment: &Alignment, interval: f64) -> Vec<f64> {
    let start = alignment.start().0;
    let end = alignment.end().0;
    let at = alignment.stationing();
    let mut stations: Vec<f64> = alignment.key_stations().iter().map(|(s, _)| s.0).collect();
    stations.extend(at.even(start, end, interval).into_iter().filter(|&s| s >= start && s <= end));
    stations.extend(at.equations.iter().map(|e| e.internal).filter(|&s| s >= start && s <= end));
    stations.push(start);
    stations.push(end);
    stations.sort_by(f64::total_cmp);
    stations.dedup_by(|a, b| gradewright_geometry::tolerance::same_station(*a, *b));
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
    let mut table = StationTable::new(out, ground)?;
    table.rows(alignment, ground, stations, decimals)?;
    table.finish()
}

/// The table [`interval_stations`] and [`write_station_table`] make of a
/// whole profile, made one stretch of `pvis_each` PVIs at a time
/// ([`Profile::stretches`]): the same rows, bit for bit, in memory that does
/// not grow with the profile. The profile must have no problem.
///
/// # Errors
/// A profile with a problem, a value that is not finite, or an I/O error.
pub fn write_interval_table(
    out: impl Write,
    profile: &Profile,
    ground: &Ground,
    interval: f64,
    decimals: Option<usize>,
    pvis_each: usize,
) -> Result<(), TableError> {
    let (Some(start), Some(end)) = (profile.start(), profile.end()) else {
        return Err(TableError::Invalid);
    };
    let (start, end) = (start.0, end.0);
    let mut table = StationTable::new(out, ground)?;
    let mut kept: Option<f64> = None;
    let mut stations = Vec::new();
    for stretch in profile.stretches(pvis_each) {
        let part = profile.part(stretch.from, stretch.to, stretch.first..=stretch.last);
        let alignment = Alignment::new(&part).map_err(|_| TableError::Invalid)?;
        stations.clear();
        stations.extend(alignment.key_stations().iter().map(|(s, _)| s.0));
        // The even stations of this stretch, from one interval before it so
        // rounding never skips one.
        let from = (stretch.from - interval).max(start);
        let to = if stretch.closes { end } else { stretch.to.min(end) };
        let at = profile.stationing();
        stations.extend(at.even(from, to, interval).into_iter().filter(|&s| s >= start && s <= end));
        stations.extend(at.equations.iter().map(|e| e.internal).filter(|&s| s >= start && s <= end));
        stations.extend([start, end]);
        stations.retain(|&s| stretch.holds(s));
        stations.sort_by(f64::total_cmp);
        // Duplicates go as in the whole table: each station against the last
        // one kept, across stretches too.
        stations.retain(|&s| {
            let repeat = kept.is_some_and(|k| gradewright_geometry::tolerance::same_station(s, k));
            if !repeat {
                kept = Some(s);
            }
            !repeat
        });
        table.rows(&alignment, ground, &stations, decimals)?;
    }
    table.finish()
}

/// A station table written a block of stations at a time: the header, then
/// the rows of each block as [`write_station_table`] writes them.
pub struct StationTable<W: Write> {
    csv: csv::Writer<W>,
    with_ground: bool,
    row: Vec<String>,
}

impl<W: Write> StationTable<W> {
    /// Starts the table: writes the header, with [`GROUND_COLUMNS`] when
    /// `ground` has points.
    ///
    /// # Errors
    /// An I/O error of `out`.
    pub fn new(out: W, ground: &Ground) -> Result<Self, TableError> {
        let mut csv = csv::Writer::from_writer(out);
        let with_ground = ground.range().is_some();
        if with_ground {
            csv.write_record(TABLE_HEADER.iter().chain(&GROUND_COLUMNS))?;
        } else {
            csv.write_record(TABLE_HEADER)?;
        }
        Ok(Self { csv, with_ground, row: Vec::with_capacity(7) })
    }

    /// Writes one row per station of `stations` (in the order given).
    ///
    /// # Errors
    /// An out-of-range station (nothing more is written after it), a value
    /// that is not finite, or an I/O error.
    pub fn rows(
        &mut self,
        alignment: &Alignment,
        ground: &Ground,
        stations: &[f64],
        decimals: Option<usize>,
    ) -> Result<(), TableError> {
        let units = alignment.units();
        let at = alignment.stationing();
        let mut cursor = alignment.cursor();
        let row = &mut self.row;
        let label_decimals = decimals.unwrap_or(units.station_decimals());
        for &s in stations {
            let sample = cursor.sample(Station(s))?;
            if !(sample.elevation.is_finite() && sample.grade_percent.is_finite()) {
                return Err(TableError::NotFinite { station: s });
            }
            // At a station equation, a row for each side.
            for label in at.sides(s, label_decimals) {
                row.clear();
                row.extend([
                    number(s, decimals),
                    label,
                    number(sample.elevation, decimals),
                    number(sample.grade_percent, decimals),
                ]);
                if self.with_ground {
                    match ground.elevation_at(s) {
                        Some(g) => row.extend([
                            number(g, decimals),
                            number((g - sample.elevation).max(0.0), decimals),
                            number((sample.elevation - g).max(0.0), decimals),
                        ]),
                        None => row.extend([String::new(), String::new(), String::new()]),
                    }
                }
                self.csv.write_record(&*row)?;
            }
        }
        Ok(())
    }

    /// Ends the table.
    ///
    /// # Errors
    /// An I/O error of the output.
    pub fn finish(mut self) -> Result<(), TableError> {
        self.csv.flush().map_err(TableError::Io)
    }
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
    #[error(transparent)]
    Io(#[from] std::io::Error),
    /// Writing a record failed (its I/O error underneath).
    #[error(transparent)]
    Csv(#[from] csv::Error),
    /// The profile has a problem (check it first).
    #[error("the profile has problems")]
    Invalid,
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

/// A sight-distance table, written a block of stations at a time (for a
/// profile computed one stretch at a time): the header, then one row per
/// station (forward = towards increasing stations), numbers unrounded. The
/// last column says which available distances are the cap, not a measured
/// distance (nothing limited the sight within it): `none`, `forward`,
/// `backward` or `both`. A road with station equations gets a
/// `station_label` column after `station` (the plan station); without, the
/// table is numbers only.
pub struct SightTable<'a, W: Write> {
    csv: csv::Writer<W>,
    field: String,
    labels: Option<gradewright_geometry::Stationing<'a>>,
}

impl<'a, W: Write> SightTable<'a, W> {
    /// Starts the table for a road stationed as `at` says: writes the header.
    ///
    /// # Errors
    /// An I/O error of `out`.
    pub fn new(out: W, at: gradewright_geometry::Stationing<'a>) -> Result<Self, TableError> {
        let mut csv = csv::Writer::from_writer(out);
        let labels = (!at.is_plain()).then_some(at);
        if labels.is_some() {
            let mut header: Vec<&str> = SIGHT_HEADER.to_vec();
            header.insert(1, "station_label");
            csv.write_record(header)?;
        } else {
            csv.write_record(SIGHT_HEADER)?;
        }
        Ok(Self { csv, field: String::new(), labels })
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
            for (k, value) in values.into_iter().enumerate() {
                number_into(&mut self.field, value, None);
                self.csv.write_field(&self.field)?;
                if let (0, Some(at)) = (k, self.labels) {
                    self.csv.write_field(at.label_std(value))?;
                }
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
        self.csv.flush().map_err(TableError::Io)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use gradewright_geometry::{GroundPoint, Units, synthetic::rolling_profile};

    /// The table made one stretch at a time is the whole profile's, byte
    /// for byte: with ground, at an interval that falls on PVIs and one that
    /// does not, with stretches of one PVI upwards.
    #[test]
    fn stretch_by_stretch_is_the_whole_table() {
        let profile = rolling_profile(Units::Metric, 60, 6_000.0);
        let alignment = Alignment::new(&profile).unwrap_or_else(|e| panic!("{e:?}"));
        let ground: Ground = (0..700)
            .map(|i| GroundPoint { station: f64::from(i) * 7.3 + 500.0, elevation: 100.0 + f64::from(i % 9) })
            .collect::<Vec<_>>()
            .into();
        for interval in [20.0, 7.77, 100.0 * 100.0 / 59.0] {
            for decimals in [None, Some(2)] {
                let mut whole = Vec::new();
                let stations = interval_stations(&alignment, interval);
                write_station_table(&mut whole, &alignment, &ground, &stations, decimals)
                    .unwrap_or_else(|e| panic!("{e}"));
                for each in [1, 2, 7, 1000] {
                    let mut parts = Vec::new();
                    write_interval_table(&mut parts, &profile, &ground, interval, decimals, each)
                        .unwrap_or_else(|e| panic!("{e}"));
                    assert!(parts == whole, "interval {interval}, {each} PVIs a stretch");
                }
                assert!(whole.len() > 5_000, "{}", whole.len());
            }
        }
    }
}
