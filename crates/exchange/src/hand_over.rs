//! The hand-over tables: stations, curves and findings as CSV (RFC 4180, by
//! the `csv` crate), with the unit in every length column's name.

use std::io::Write;

use gradewright_geometry::{Alignment, Analysis, Ground, Severity, Station, Units, format_station};

use crate::TableError;
use crate::table::number;

fn unit(units: Units) -> &'static str {
    match units {
        Units::Metric => "m",
        Units::UsCustomary => "ft",
    }
}

fn finite(value: f64, station: f64) -> Result<String, TableError> {
    if value.is_finite() { Ok(number(value, None)) } else { Err(TableError::NotFinite { station }) }
}

/// `stations.csv`: station, label, proposed elevation and grade at every
/// station of `stations` (e.g. [`crate::interval_stations`]); with ground,
/// the ground elevation and the cut and fill depths follow (empty where
/// there is no ground).
///
/// # Errors
/// [`TableError`] for a station outside the profile or an I/O error.
pub fn write_stations_csv(
    out: impl Write,
    alignment: &Alignment,
    ground: &Ground,
    stations: &[f64],
) -> Result<(), TableError> {
    let units = alignment.units();
    let u = unit(units);
    let mut csv = csv::Writer::from_writer(out);
    let mut header = vec![
        format!("station_{u}"),
        "station_label".to_owned(),
        format!("elevation_{u}"),
        "grade_percent".to_owned(),
    ];
    let with_ground = ground.range().is_some();
    if with_ground {
        header.extend([format!("ground_elevation_{u}"), format!("cut_{u}"), format!("fill_{u}")]);
    }
    csv.write_record(&header)?;
    let mut cursor = alignment.cursor();
    let mut row = Vec::with_capacity(header.len());
    for &s in stations {
        let sample = cursor.sample(Station(s))?;
        row.clear();
        row.extend([
            finite(s, s)?,
            format_station(s, units, units.station_decimals()),
            finite(sample.elevation, s)?,
            finite(sample.grade_percent, s)?,
        ]);
        if with_ground {
            match ground.elevation_at(s) {
                Some(g) => row.extend([
                    finite(g, s)?,
                    finite((g - sample.elevation).max(0.0), s)?,
                    finite((sample.elevation - g).max(0.0), s)?,
                ]),
                None => row.extend([String::new(), String::new(), String::new()]),
            }
        }
        csv.write_record(&row)?;
    }
    csv.flush()?;
    Ok(())
}

/// The header of `curves.csv` for `units`.
pub fn curves_header(units: Units) -> Vec<String> {
    let u = unit(units);
    [
        "pvi".to_owned(),
        format!("station_{u}"),
        "station_label".to_owned(),
        format!("elevation_{u}"),
        "grade_back_percent".to_owned(),
        "grade_ahead_percent".to_owned(),
        "kind".to_owned(),
        format!("length_{u}"),
        format!("length_back_{u}"),
        format!("length_ahead_{u}"),
        "a_percent".to_owned(),
        format!("k_{u}_per_percent"),
        format!("k_overall_{u}_per_percent"),
        format!("k_min_{u}_per_percent"),
        format!("length_required_{u}"),
        format!("pvc_station_{u}"),
        format!("pvc_elevation_{u}"),
        format!("pvt_station_{u}"),
        format!("pvt_elevation_{u}"),
        format!("high_low_station_{u}"),
        format!("high_low_elevation_{u}"),
        "status".to_owned(),
    ]
    .to_vec()
}

/// `curves.csv`: every PVI with its grades, curve and what the criteria ask.
///
/// # Errors
/// An I/O error of `out`.
pub fn write_curves_csv(out: impl Write, analysis: &Analysis) -> Result<(), TableError> {
    let units = analysis.profile.units;
    let mut csv = csv::Writer::from_writer(out);
    csv.write_record(curves_header(units))?;
    let pvis = &analysis.profile.pvis;
    let opt = |v: Option<f64>| v.filter(|v| v.is_finite()).map_or_else(String::new, |v| number(v, None));
    for (i, p) in pvis.iter().enumerate() {
        let back = i.checked_sub(1).and_then(|j| analysis.profile.tangent_grade_percent(j));
        let ahead = analysis.profile.tangent_grade_percent(i);
        let check = analysis.report.curves.iter().find(|c| c.curve.index == i);
        let c = check.map(|c| c.curve);
        let status = match analysis.worst_at(i) {
            Some(Severity::Fail) => "fail",
            Some(Severity::Warn) => "warn",
            Some(Severity::Info) => "info",
            None => "ok",
        };
        let real = c.filter(|c| c.length() > 0.0);
        csv.write_record([
            (i + 1).to_string(),
            number(p.station.0, None),
            format_station(p.station.0, units, units.station_decimals()),
            number(p.elevation, None),
            opt(back),
            opt(ahead),
            c.map_or(String::new(), |c| c.kind.key().to_owned()),
            number(p.curve.length(), None),
            number(p.curve.length_in(), None),
            number(p.curve.length_out(), None),
            opt(c.map(|c| c.a_percent())),
            opt(c.and_then(|c| c.k())),
            opt(c.and_then(|c| c.k_overall())),
            opt(check.and_then(|c| c.k_required)),
            opt(check.map(|c| c.length_required)),
            opt(real.map(|c| c.pvc.0)),
            opt(real.map(|c| c.pvc_elevation)),
            opt(real.map(|c| c.pvt.0)),
            opt(real.map(|c| c.pvt_elevation)),
            opt(real.and_then(|c| c.turning.map(|t| t.0.0))),
            opt(real.and_then(|c| c.turning.map(|t| t.1))),
            status.to_owned(),
        ])?;
    }
    csv.flush()?;
    Ok(())
}

/// `findings.csv`: every check result.
///
/// # Errors
/// An I/O error of `out`.
pub fn write_findings_csv(out: impl Write, analysis: &Analysis) -> Result<(), TableError> {
    let u = unit(analysis.profile.units);
    let mut csv = csv::Writer::from_writer(out);
    csv.write_record([
        "severity".to_owned(),
        "code".to_owned(),
        format!("station_start_{u}"),
        format!("station_end_{u}"),
        "pvi".to_owned(),
        "message".to_owned(),
    ])?;
    for f in &analysis.report.findings {
        csv.write_record([
            f.severity().key().to_owned(),
            f.code.as_str().to_owned(),
            number(f.station_start.0, None),
            number(f.station_end.0, None),
            f.pvi.map_or(String::new(), |i| (i + 1).to_string()),
            f.message.clone(),
        ])?;
    }
    csv.flush()?;
    Ok(())
}
