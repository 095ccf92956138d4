//! The PVI table as CSV: `station,elevation` plus either `curve_length`
//! (symmetric; 0 or empty = no curve) or `length_in,length_out`.

use std::io::{Read, Write};
use std::path::Path;

use gradewright_geometry::{Pvi, Station, Units, VerticalCurve, excerpt, format_station, parse_station};

use crate::ReadError;

enum Layout {
    Symmetric { length: usize },
    Unequal { length_in: usize, length_out: usize },
}

/// A PVI table as read, with the file line of every PVI (for messages).
#[derive(Clone, Debug, PartialEq, Default)]
pub struct PviTable {
    /// The PVIs, in file order.
    pub pvis: Vec<Pvi>,
    /// The 1-based line of each PVI in the file.
    pub lines: Vec<u64>,
}

/// Reads a PVI table. Stations may be plain numbers or station notation in
/// `units`. Every row must have every column; unknown columns are an error.
///
/// # Errors
/// The first [`ReadError`] met, naming file, line and column.
pub fn read_pvi_csv(reader: impl Read, origin: &Path, units: Units) -> Result<PviTable, ReadError> {
    let err = |line: u64, field: &str, message: String| ReadError::new(origin, line, field, message);
    let mut csv = csv::ReaderBuilder::new().trim(csv::Trim::All).comment(Some(b'#')).from_reader(reader);
    let headers = csv
        .headers()
        .map_err(|e| err(1, "header", e.to_string()))?
        .iter()
        .map(str::to_ascii_lowercase)
        .collect::<Vec<_>>();
    let find = |name: &str| headers.iter().position(|h| h == name);
    for (i, h) in headers.iter().enumerate() {
        if headers.iter().take(i).any(|earlier| earlier == h) {
            return Err(err(1, "header", format!("column '{}' appears twice", excerpt(h))));
        }
        if !["station", "elevation", "curve_length", "length_in", "length_out"].contains(&h.as_str()) {
            return Err(err(
                1,
                "header",
                format!(
                    "unknown column '{}' (expected station, elevation and curve_length, or length_in and length_out)",
                    excerpt(h)
                ),
            ));
        }
    }
    let (Some(station), Some(elevation)) = (find("station"), find("elevation")) else {
        return Err(err(1, "header", "the header needs columns 'station' and 'elevation'".to_owned()));
    };
    let layout = match (find("curve_length"), find("length_in"), find("length_out")) {
        (Some(length), None, None) => Layout::Symmetric { length },
        (None, Some(length_in), Some(length_out)) => Layout::Unequal { length_in, length_out },
        (None, None, None) => {
            return Err(err(
                1,
                "header",
                "the header needs 'curve_length' or both 'length_in' and 'length_out'".to_owned(),
            ));
        }
        _ => {
            return Err(err(
                1,
                "header",
                "use either 'curve_length' or 'length_in' and 'length_out', not a mix".to_owned(),
            ));
        }
    };
    let mut table = PviTable::default();
    for record in csv.records() {
        let record = record.map_err(|e| {
            let line = e.position().map_or(0, csv::Position::line);
            err(line, "record", e.to_string())
        })?;
        let line = record.position().map_or(0, csv::Position::line);
        let cell = |i: usize| record.get(i).unwrap_or("");
        let name = |i: usize| headers.get(i).map_or("?", String::as_str).to_owned();
        let number = |i: usize, empty_is_zero: bool| -> Result<f64, ReadError> {
            let text = cell(i);
            if text.is_empty() && empty_is_zero {
                return Ok(0.0);
            }
            let value: f64 = text
                .parse()
                .map_err(|_| err(line, &name(i), format!("'{}' is not a number", excerpt(text))))?;
            if !value.is_finite() {
                return Err(err(line, &name(i), format!("'{}' is not a finite number", excerpt(text))));
            }
            if empty_is_zero && value < 0.0 {
                return Err(err(line, &name(i), format!("length {value} is negative")));
            }
            Ok(value)
        };
        let sta = parse_station(cell(station), units).map_err(|e| err(line, "station", e.to_string()))?;
        let elev = number(elevation, false)?;
        let curve = match layout {
            Layout::Symmetric { length } => {
                let l = number(length, true)?;
                VerticalCurve::from_lengths(l / 2.0, l / 2.0)
            }
            Layout::Unequal { length_in, length_out } => {
                VerticalCurve::from_lengths(number(length_in, true)?, number(length_out, true)?)
            }
        };
        table.pvis.push(Pvi { station: Station(sta), elevation: elev, curve });
        table.lines.push(line);
    }
    Ok(table)
}

/// Writes a PVI table. Uses `curve_length` when every curve is symmetric,
/// otherwise `length_in,length_out`. Stations are written in station notation.
///
/// # Errors
/// Any I/O error of `out`.
pub fn write_pvi_csv(out: impl Write, pvis: &[Pvi], units: Units) -> std::io::Result<()> {
    let symmetric = pvis.iter().all(|p| !matches!(p.curve, VerticalCurve::Unequal { .. }));
    let mut csv = csv::Writer::from_writer(out);
    let map = |e: csv::Error| std::io::Error::other(e.to_string());
    if symmetric {
        csv.write_record(["station", "elevation", "curve_length"]).map_err(map)?;
    } else {
        csv.write_record(["station", "elevation", "length_in", "length_out"]).map_err(map)?;
    }
    for p in pvis {
        // Station notation when it reads back exactly, else the plain number.
        let label = format_station(p.station.0, units, units.station_decimals());
        let exact = parse_station(&label, units).is_ok_and(|v| v.to_bits() == p.station.0.to_bits());
        let station = if exact { label } else { format!("{}", p.station.0) };
        let mut row = vec![station, format!("{}", p.elevation)];
        if symmetric {
            row.push(format!("{}", p.curve.length()));
        } else {
            row.push(format!("{}", p.curve.length_in()));
            row.push(format!("{}", p.curve.length_out()));
        }
        csv.write_record(&row).map_err(map)?;
    }
    csv.flush()
}
