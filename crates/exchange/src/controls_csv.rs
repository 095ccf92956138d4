//! Control points as CSV: a header naming `station`, `kind` and
//! `elevation`, and optionally `tolerance` and `name`, in any order; kind
//! `fixed`, `min` or `max`. Comma, semicolon or tab delimited (detected); a
//! UTF-8 byte-order mark and CRLF tolerated.

use std::io::Read;
use std::path::Path;

use gradewright_geometry::{ControlKind, ControlPoint, Stationing, excerpt};

use crate::ReadError;
use crate::ground_csv::{read_text, records};

/// The header a controls file is written with.
pub const CONTROLS_HEADER: &str = "station,kind,elevation,tolerance,name";

/// Reads control points, in file order.
///
/// # Errors
/// The first [`ReadError`] met, naming file, line and field: a missing or
/// repeated column, a station or number that does not read or is not
/// finite, an unknown kind, a negative tolerance or one on a minimum or
/// maximum point, no rows.
pub fn read_controls_csv(
    reader: impl Read,
    origin: &Path,
    at: Stationing<'_>,
) -> Result<Vec<ControlPoint>, ReadError> {
    let err = |line: u64, field: &str, message: String| ReadError::new(origin, line, field, message);
    let text = read_text(reader, origin)?;
    let mut csv = records(&text);
    let mut columns: Option<[Option<usize>; 6]> = None;
    let mut controls = Vec::new();
    let mut last_line = 1;
    for record in csv.records() {
        let record =
            record.map_err(|e| err(e.position().map_or(0, csv::Position::line), "record", e.to_string()))?;
        let line = record.position().map_or(0, csv::Position::line);
        last_line = line;
        if record.iter().all(str::is_empty) {
            continue;
        }
        let Some(cols) = columns else {
            let header: Vec<String> = record.iter().map(str::to_ascii_lowercase).collect();
            let mut found = [None; 6];
            for (i, h) in header.iter().enumerate() {
                let Some(slot) = ["station", "kind", "elevation", "tolerance", "name", "clearance"]
                    .iter()
                    .position(|n| n == h)
                else {
                    return Err(err(
                        line,
                        "header",
                        format!("unknown column '{}'; the header is {CONTROLS_HEADER}", excerpt(h)),
                    ));
                };
                if found.get(slot).is_some_and(Option::is_some) {
                    return Err(err(line, "header", format!("column '{h}' appears twice")));
                }
                if let Some(s) = found.get_mut(slot) {
                    *s = Some(i);
                }
            }
            if found.iter().take(3).any(Option::is_none) {
                return Err(err(
                    line,
                    "header",
                    format!("the header must name station, kind and elevation ({CONTROLS_HEADER})"),
                ));
            }
            columns = Some(found);
            continue;
        };
        let cell = |c: Option<usize>| c.and_then(|i| record.get(i)).unwrap_or("");
        let [Some(s), Some(k), Some(e), t, n, cl] = cols else { continue };
        if record.len() <= s.max(k).max(e) {
            return Err(err(
                line,
                "record",
                format!("{} field(s); station, kind and elevation are needed", record.len()),
            ));
        }
        let station = at.parse(cell(Some(s))).map_err(|x| err(line, "station", x.to_string()))?;
        let kind_text = cell(Some(k));
        let kind = ControlKind::from_key(kind_text)
            .ok_or_else(|| err(line, "kind", format!("'{}' is not fixed, min or max", excerpt(kind_text))))?;
        let number = |field: &str, text: &str| -> Result<f64, ReadError> {
            let v: f64 =
                text.parse().map_err(|_| err(line, field, format!("'{}' is not a number", excerpt(text))))?;
            if !v.is_finite() {
                Err(err(line, field, format!("'{}' is not a finite number", excerpt(text))))
            } else if !gradewright_geometry::tolerance::within_limit(v) {
                Err(err(
                    line,
                    field,
                    format!("'{}' is outside ±1e7, the range Gradewright accepts", excerpt(text)),
                ))
            } else {
                Ok(v + 0.0)
            }
        };
        let elevation = number("elevation", cell(Some(e)))?;
        let tolerance = match cell(t) {
            "" => 0.0,
            text => number("tolerance", text)?,
        };
        if tolerance < 0.0 {
            return Err(err(
                line,
                "tolerance",
                format!("{tolerance} is negative; give the allowance either way"),
            ));
        }
        if tolerance > 0.0 && kind != ControlKind::Fixed {
            return Err(err(
                line,
                "tolerance",
                format!("a tolerance applies to fixed points only; a {} point is a limit", kind.key()),
            ));
        }
        let clearance = match cell(cl) {
            "" => 0.0,
            text => number("clearance", text)?,
        };
        if clearance < 0.0 || (clearance > 0.0 && kind != ControlKind::Maximum) {
            return Err(err(
                line,
                "clearance",
                format!("{clearance}: a clearance (≥ 0) belongs to a maximum point under a structure"),
            ));
        }
        controls.push(ControlPoint {
            name: cell(n).to_owned(),
            station,
            kind,
            elevation,
            tolerance,
            clearance,
        });
    }
    if columns.is_none() {
        return Err(err(last_line, "header", format!("no header; the header is {CONTROLS_HEADER}")));
    }
    if controls.is_empty() {
        return Err(err(last_line, "record", "no control points".to_owned()));
    }
    Ok(controls)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn read(text: &[u8]) -> Result<Vec<ControlPoint>, ReadError> {
        read_controls_csv(
            text,
            Path::new("controls.csv"),
            Stationing::plain(gradewright_geometry::Units::Metric),
        )
    }

    #[test]
    fn reads_every_kind_in_any_column_order() {
        for text in [
            "station,kind,elevation,tolerance,name\n0+120,fixed,101.25,0.05,Tie-in west\n640,min,99.8,,Culvert C1\n900,max,104.1,0,Rail bridge\n".as_bytes(),
            b"\xEF\xBB\xBFname;elevation;kind;station\r\nTie-in west;101.25;FIXED;120\r\nCulvert C1;99.8;minimum;640\r\nRail bridge;104.1;max;900\r\n",
        ] {
            let c = read(text).unwrap_or_else(|e| panic!("{e}"));
            let summary: Vec<(f64, ControlKind, f64, &str)> =
                c.iter().map(|p| (p.station, p.kind, p.elevation, p.name.as_str())).collect();
            assert_eq!(
                summary,
                vec![
                    (120.0, ControlKind::Fixed, 101.25, "Tie-in west"),
                    (640.0, ControlKind::Minimum, 99.8, "Culvert C1"),
                    (900.0, ControlKind::Maximum, 104.1, "Rail bridge"),
                ]
            );
        }
    }

    #[test]
    fn bad_rows_name_the_file_line_and_field() {
        for (text, line, field, says) in [
            ("station,kind,elevation\n0,above,1\n", 2, "kind", "fixed, min or max"),
            ("station,kind,elevation\n0,min,NaN\n", 2, "elevation", "finite"),
            ("station,kind,elevation\nx+y,min,1\n", 2, "station", ""),
            ("station,kind,elevation,tolerance\n0,fixed,1,-0.1\n", 2, "tolerance", "negative"),
            ("station,kind,elevation,tolerance\n0,min,1,0.1\n", 2, "tolerance", "fixed points only"),
            ("station,elevation\n0,1\n", 1, "header", "station, kind and elevation"),
            ("station,kind,elevation,offset\n0,min,1,2\n", 1, "header", "unknown column 'offset'"),
            ("station,kind,kind,elevation\n", 1, "header", "twice"),
            ("station,kind,elevation\n", 1, "record", "no control points"),
            ("station,kind,elevation\n0,min\n", 2, "record", "2 field(s)"),
        ] {
            let e = read(text.as_bytes()).err().unwrap_or_else(|| panic!("accepted {text:?}"));
            assert_eq!((e.line, e.field.as_str()), (line, field), "{e} for {text:?}");
            assert!(e.message.contains(says), "{e} for {text:?}");
        }
    }
}
