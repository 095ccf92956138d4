//! The existing ground as CSV: station and elevation per row, station
//! notation or plain numbers, with or without a header, comma, semicolon or
//! tab delimited (detected), a UTF-8 byte-order mark and CRLF tolerated.

use std::io::Read;
use std::path::Path;

use gradewright_geometry::{GroundPoint, Stationing, excerpt, parse_station};

use crate::ReadError;
use crate::note::{Note, NoteKind};

/// A ground profile as read: its points in station order, and what was
/// put right on the way (rows sorted, exact repeats dropped).
#[derive(Clone, Debug, PartialEq, Default)]
pub struct GroundTable {
    /// The points, in increasing station order, no station twice.
    pub points: Vec<GroundPoint>,
    /// Notes for the user about rows that were sorted or dropped.
    pub warnings: Vec<Note>,
}

/// The text of a table file (a UTF-8 byte-order mark left out), or the
/// located error of a file that cannot be read or is not UTF-8.
pub(crate) fn read_text(mut reader: impl Read, origin: &Path) -> Result<String, ReadError> {
    let mut bytes = Vec::new();
    reader.read_to_end(&mut bytes).map_err(|e| ReadError::io(origin, e))?;
    let body = bytes.strip_prefix(b"\xEF\xBB\xBF".as_slice()).unwrap_or(&bytes);
    match std::str::from_utf8(body) {
        Ok(text) => Ok(text.to_owned()),
        Err(e) => {
            let line =
                body.get(..e.valid_up_to()).map_or(0, |b| b.iter().filter(|&&c| c == b'\n').count()) + 1;
            Err(ReadError::new(origin, line as u64, "record", "the file is not UTF-8 text"))
        }
    }
}

/// The records of table `text`: no header assumed, rows of any length,
/// fields trimmed, `#` comments, the delimiter detected (a tab or a
/// semicolon if the first data line has one, else a comma).
pub(crate) fn records(text: &str) -> csv::Reader<&[u8]> {
    let first = text.lines().map(str::trim).find(|l| !l.is_empty() && !l.starts_with('#')).unwrap_or("");
    let delimiter = if first.contains('\t') {
        b'\t'
    } else if first.contains(';') {
        b';'
    } else {
        b','
    };
    csv::ReaderBuilder::new()
        .has_headers(false)
        .flexible(true)
        .trim(csv::Trim::All)
        .comment(Some(b'#'))
        .delimiter(delimiter)
        .from_reader(text.as_bytes())
}

/// Reads a ground profile. A first row whose station does not read as a
/// station is the header, which must name `station` and `elevation` (other
/// columns are ignored); without a header the first two columns are taken.
///
/// # Errors
/// The first [`ReadError`] met, naming file, line and field: a value that is
/// not a finite number, a station given twice with different elevations
/// (both lines named), fewer than two points.
pub fn read_ground_csv(
    reader: impl Read,
    origin: &Path,
    at: Stationing<'_>,
) -> Result<GroundTable, ReadError> {
    let units = at.units;
    let err = |line: u64, field: &str, message: String| ReadError::new(origin, line, field, message);
    let text = read_text(reader, origin)?;
    let mut csv = records(&text);
    let mut columns: Option<(usize, usize)> = None;
    let mut names = ("station".to_owned(), "elevation".to_owned());
    let mut rows: Vec<(GroundPoint, u64)> = Vec::new();
    for (k, record) in csv.records().enumerate() {
        let record =
            record.map_err(|e| err(e.position().map_or(0, csv::Position::line), "record", e.to_string()))?;
        let line = record.position().map_or(0, csv::Position::line);
        if record.iter().all(str::is_empty) {
            continue;
        }
        if k == 0 && parse_station(record.get(0).unwrap_or(""), units).is_err() {
            let header: Vec<String> = record.iter().map(str::to_ascii_lowercase).collect();
            let find = |name: &str| header.iter().position(|h| h == name);
            let (Some(s), Some(e)) = (find("station"), find("elevation")) else {
                return Err(err(
                    line,
                    "header",
                    format!(
                        "'{}' is neither a station nor a header naming 'station' and 'elevation'",
                        excerpt(record.get(0).unwrap_or(""))
                    ),
                ));
            };
            columns = Some((s, e));
            names = (header[s].clone(), header[e].clone());
            continue;
        }
        let (s, e) = *columns.get_or_insert((0, 1));
        let cell = |i: usize| record.get(i).unwrap_or("");
        if record.len() <= s.max(e) {
            return Err(err(
                line,
                "record",
                format!("{} field(s); station and elevation are needed", record.len()),
            ));
        }
        let station = at.parse(cell(s)).map_err(|x| err(line, &names.0, x.to_string()))?;
        let text = cell(e);
        let elevation: f64 =
            text.parse().map_err(|_| err(line, &names.1, format!("'{}' is not a number", excerpt(text))))?;
        if !elevation.is_finite() {
            return Err(err(line, &names.1, format!("'{}' is not a finite number", excerpt(text))));
        }
        rows.push((GroundPoint { station, elevation }, line));
    }
    order_ground(rows, origin, (&names.0, &names.1))
}

/// Puts ground points read from `origin` (each with its file line) in
/// station order: unsorted points are sorted with a warning, a repeated
/// point is dropped with a warning, and one station with two elevations is
/// an error naming both lines (`field` names the station field). Fewer than
/// two points is an error.
pub(crate) fn order_ground(
    mut rows: Vec<(GroundPoint, u64)>,
    origin: &Path,
    (field, elevation_field): (&str, &str),
) -> Result<GroundTable, ReadError> {
    let err = |line: u64, field: &str, message: String| ReadError::new(origin, line, field, message);
    // What a project can hold, checked here so nothing is imported that
    // cannot be read back: numbers within ±1e7, and -0 the station 0.
    for (point, line) in &mut rows {
        for (value, name) in [(point.station, field), (point.elevation, elevation_field)] {
            if !gradewright_geometry::tolerance::within_limit(value) {
                return Err(err(
                    *line,
                    name,
                    format!("{value:e} is outside ±1e7, the range Gradewright accepts"),
                ));
            }
        }
        point.station += 0.0;
    }
    let mut table = GroundTable::default();
    if rows.windows(2).any(|w| w[1].0.station < w[0].0.station) {
        rows.sort_by(|a, b| a.0.station.total_cmp(&b.0.station));
        table.warnings.push(Note { path: origin.to_owned(), kind: NoteKind::Sorted });
    }
    let mut dropped = 0;
    for (k, (point, line)) in rows.iter().enumerate() {
        if let Some((prev, prev_line)) = k.checked_sub(1).and_then(|j| rows.get(j))
            && prev.station.to_bits() == point.station.to_bits()
        {
            if prev.elevation.to_bits() != point.elevation.to_bits() {
                return Err(err(
                    *line,
                    field,
                    format!(
                        "station {} is also on line {prev_line} with elevation {} (here {})",
                        point.station, prev.elevation, point.elevation
                    ),
                ));
            }
            dropped += 1;
            continue;
        }
        table.points.push(*point);
    }
    if dropped > 0 {
        table
            .warnings
            .push(Note { path: origin.to_owned(), kind: NoteKind::RepeatsDropped { count: dropped } });
    }
    if table.points.len() < 2 {
        let line = rows.last().map_or(1, |r| r.1);
        return Err(err(
            line,
            "record",
            format!("{} ground point(s); at least two are needed", table.points.len()),
        ));
    }
    Ok(table)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn read(text: &[u8]) -> Result<GroundTable, ReadError> {
        read_ground_csv(text, Path::new("ground.csv"), Stationing::plain(gradewright_geometry::Units::Metric))
    }

    fn stations(t: &GroundTable) -> Vec<(f64, f64)> {
        t.points.iter().map(|p| (p.station, p.elevation)).collect()
    }

    #[test]
    fn every_variant_reads_the_same_points() {
        let expected = vec![(0.0, 210.5), (20.0, 211.25), (1040.0, 215.0)];
        for text in [
            "station,elevation\n0,210.5\n20,211.25\n1040,215\n".as_bytes(),
            b"0,210.5\n20,211.25\n1040,215\n",
            b"0+000,210.5\n0+020,211.25\n1+040,215\n",
            b"\xEF\xBB\xBFStation;Elevation\r\n0;210.5\r\n20;211.25\r\n1+040;215\r\n",
            b"station\televation\tcode\n0\t210.5\tTOE\n20\t211.25\tTOE\n1040\t215\t\n",
            b"# surveyed 2026\nelevation,station\n210.5,0\n211.25,20\n215,1040\n",
        ] {
            let t = read(text).unwrap_or_else(|e| panic!("{e}: {}", String::from_utf8_lossy(text)));
            assert_eq!(stations(&t), expected, "{}", String::from_utf8_lossy(text));
            assert!(t.warnings.is_empty());
        }
    }

    #[test]
    fn unsorted_rows_are_sorted_with_a_warning_and_repeats_dropped() {
        let t = read(b"20,211\n0,210\n40,212\n20,211\n").unwrap_or_else(|e| panic!("{e}"));
        assert_eq!(stations(&t), vec![(0.0, 210.0), (20.0, 211.0), (40.0, 212.0)]);
        assert_eq!(t.warnings.len(), 2, "{:?}", t.warnings);
        assert_eq!(t.warnings.first().map(|n| &n.kind), Some(&NoteKind::Sorted));
        assert_eq!(t.warnings.get(1).map(|n| &n.kind), Some(&NoteKind::RepeatsDropped { count: 1 }));
    }

    #[test]
    fn bad_rows_name_the_file_line_and_field() {
        for (text, line, field, says) in [
            ("0,210\n20,211\n0,212\n", 3, "station", "also on line 1"),
            ("station,elevation\n0,210\n20,NaN\n", 3, "elevation", "finite"),
            ("station,elevation\n0,210\n20,inf\n", 3, "elevation", "finite"),
            ("0,210\n20,abc\n", 2, "elevation", "not a number"),
            ("0,210\nxyz,211\n", 2, "station", ""),
            ("0,210\n20\n", 2, "record", "1 field(s)"),
            ("chainage,level\n0,210\n", 1, "header", "'station' and 'elevation'"),
            ("station,elevation\n0,210\n", 2, "record", "at least two"),
            ("", 1, "record", "0 ground point(s)"),
        ] {
            let e = read(text.as_bytes()).err().unwrap_or_else(|| panic!("accepted {text:?}"));
            assert_eq!((e.line, e.field.as_str()), (line, field), "{e} for {text:?}");
            assert!(e.message.contains(says), "{e} for {text:?}");
            assert!(e.to_string().starts_with("ground.csv:"), "{e}");
        }
        let e = read(b"0,210\n20,\xFF211\n").err().unwrap_or_else(|| panic!("accepted bad UTF-8"));
        assert_eq!((e.line, e.field.as_str()), (2, "record"), "{e}");
    }
}
