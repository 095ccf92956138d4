//! The hand-over tables: stations, curves, findings and earthwork as CSV
//! (RFC 4180, by the `csv` crate), with the unit in every column's name and
//! numbers rounded as the [`Rounding`] says (as a plan shows them, unless
//! the user chose otherwise).

use std::io::Write;

use gradewright_document::TableDecimals;
use gradewright_geometry::{Alignment, Analysis, Ground, Severity, Station, Units};

use crate::TableError;
use crate::table::number;

fn unit(units: Units) -> &'static str {
    match units {
        Units::Metric => "m",
        Units::UsCustomary => "ft",
    }
}

/// What kind of number a column holds (each is rounded its own way).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Quantity {
    /// A station, or a length along the road (curve lengths).
    Station,
    /// An elevation, or a depth of cut or fill.
    Elevation,
    /// A grade or a grade difference, in percent.
    Grade,
    /// A rate of vertical curvature K.
    K,
    /// An end area or a volume (and the mass ordinate).
    Quantity,
}

/// The decimals each kind of number is written with; `None` is unrounded
/// (the shortest text that reads back to the same number).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct Rounding {
    station: Option<usize>,
    elevation: Option<usize>,
    grade: Option<usize>,
    k: Option<usize>,
    quantity: Option<usize>,
}

impl Rounding {
    /// Unrounded.
    pub const EXACT: Self = Self { station: None, elevation: None, grade: None, k: None, quantity: None };

    /// The rounding `choice` asks for in `units`: as a plan shows numbers
    /// (stations and elevations to 0.001 m or 0.01 ft, grades to 0.001 %, K
    /// to 0.1, areas and volumes to 0.1; common practice), every number to
    /// N decimals (at most [`TableDecimals::MAX`]), or unrounded.
    pub fn of(choice: TableDecimals, units: Units) -> Self {
        match choice {
            TableDecimals::Plan => {
                let length = Some(match units {
                    Units::Metric => 3,
                    Units::UsCustomary => 2,
                });
                Self { station: length, elevation: length, grade: Some(3), k: Some(1), quantity: Some(1) }
            }
            TableDecimals::Fixed(n) => {
                let n = Some(usize::from(n.min(TableDecimals::MAX)));
                Self { station: n, elevation: n, grade: n, k: n, quantity: n }
            }
            TableDecimals::Exact => Self::EXACT,
        }
    }

    /// The decimals of `quantity` (`None`: unrounded).
    pub fn decimals(self, quantity: Quantity) -> Option<usize> {
        match quantity {
            Quantity::Station => self.station,
            Quantity::Elevation => self.elevation,
            Quantity::Grade => self.grade,
            Quantity::K => self.k,
            Quantity::Quantity => self.quantity,
        }
    }

    /// `value`, a `quantity`, as written.
    pub fn text(self, value: f64, quantity: Quantity) -> String {
        number(value, self.decimals(quantity))
    }

    /// `value` as written, or an error at `station` when it is not finite.
    pub(crate) fn finite(self, value: f64, quantity: Quantity, station: f64) -> Result<String, TableError> {
        if value.is_finite() {
            Ok(self.text(value, quantity))
        } else {
            Err(TableError::NotFinite { station })
        }
    }

    /// `value` as written, empty when absent or not finite.
    fn optional(self, value: Option<f64>, quantity: Quantity) -> String {
        value.filter(|v| v.is_finite()).map_or_else(String::new, |v| self.text(v, quantity))
    }
}

/// `stations.csv`: station, label, proposed elevation and grade at every
/// station of `stations` (e.g. [`crate::interval_stations`]); with ground,
/// the ground elevation and the cut and fill depths follow (empty where
/// there is no ground). Numbers as `rounding` says.
///
/// # Errors
/// [`TableError`] for a station outside the profile or an I/O error.
pub fn write_stations_csv(
    out: impl Write,
    alignment: &Alignment,
    ground: &Ground,
    stations: &[f64],
    rounding: Rounding,
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
    let at = alignment.stationing();
    for &s in stations {
        let sample = cursor.sample(Station(s))?;
        // At a station equation, a row for each side (the same point).
        for label in at.sides(s, units.station_decimals()) {
            row.clear();
            row.extend([
                rounding.finite(s, Quantity::Station, s)?,
                label,
                rounding.finite(sample.elevation, Quantity::Elevation, s)?,
                rounding.finite(sample.grade_percent, Quantity::Grade, s)?,
            ]);
            if with_ground {
                match ground.elevation_at(s) {
                    Some(g) => row.extend([
                        rounding.finite(g, Quantity::Elevation, s)?,
                        rounding.finite((g - sample.elevation).max(0.0), Quantity::Elevation, s)?,
                        rounding.finite((sample.elevation - g).max(0.0), Quantity::Elevation, s)?,
                    ]),
                    None => row.extend([String::new(), String::new(), String::new()]),
                }
            }
            csv.write_record(&row)?;
        }
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

/// `curves.csv`: every PVI with its grades, curve and what the criteria ask;
/// its status is `not-checked` where the checks did not run (criteria
/// incomplete) and the PVI has no problem of its own. Numbers as `rounding`
/// says.
///
/// # Errors
/// An I/O error of `out`.
pub fn write_curves_csv(out: impl Write, analysis: &Analysis, rounding: Rounding) -> Result<(), TableError> {
    use Quantity::{Elevation, Grade, K, Station};
    let units = analysis.profile.units;
    let mut csv = csv::Writer::from_writer(out);
    csv.write_record(curves_header(units))?;
    let pvis = &analysis.profile.pvis;
    let opt = |v: Option<f64>, q| rounding.optional(v, q);
    for (i, p) in pvis.iter().enumerate() {
        let back = i.checked_sub(1).and_then(|j| analysis.profile.tangent_grade_percent(j));
        let ahead = analysis.profile.tangent_grade_percent(i);
        let check = analysis.report.curves.iter().find(|c| c.curve.index == i);
        let c = check.map(|c| c.curve);
        let status = match analysis.worst_at(i) {
            Some(Severity::Fail) => "fail",
            Some(Severity::Warn) => "warn",
            _ if analysis.criteria.is_err() => "not-checked",
            Some(Severity::Info) => "info",
            None => "ok",
        };
        let real = c.filter(|c| c.length() > 0.0);
        csv.write_record([
            (i + 1).to_string(),
            rounding.text(p.station.0, Station),
            analysis.profile.stationing().label_std(p.station.0),
            rounding.text(p.elevation, Elevation),
            opt(back, Grade),
            opt(ahead, Grade),
            c.map_or(String::new(), |c| c.kind.key().to_owned()),
            rounding.text(p.curve.length(), Station),
            rounding.text(p.curve.length_in(), Station),
            rounding.text(p.curve.length_out(), Station),
            opt(c.map(|c| c.a_percent()), Grade),
            opt(c.and_then(|c| c.k()), K),
            opt(c.and_then(|c| c.k_overall()), K),
            opt(check.and_then(|c| c.k_required), K),
            opt(check.map(|c| c.length_required), Station),
            opt(real.map(|c| c.pvc.0), Station),
            opt(real.map(|c| c.pvc_elevation), Elevation),
            opt(real.map(|c| c.pvt.0), Station),
            opt(real.map(|c| c.pvt_elevation), Elevation),
            opt(real.and_then(|c| c.turning.map(|t| t.0.0)), Station),
            opt(real.and_then(|c| c.turning.map(|t| t.1)), Elevation),
            status.to_owned(),
        ])?;
    }
    csv.flush()?;
    Ok(())
}

/// `findings.csv`: every check result (stations as `rounding` says; the
/// message as the check worded it).
///
/// # Errors
/// An I/O error of `out`.
pub fn write_findings_csv(
    out: impl Write,
    analysis: &Analysis,
    rounding: Rounding,
) -> Result<(), TableError> {
    let u = unit(analysis.profile.units);
    let mut csv = csv::Writer::from_writer(out);
    csv.write_record([
        "severity".to_owned(),
        "code".to_owned(),
        format!("station_start_{u}"),
        format!("station_end_{u}"),
        "station_start_label".to_owned(),
        "station_end_label".to_owned(),
        "pvi".to_owned(),
        "message".to_owned(),
    ])?;
    let at = analysis.profile.stationing();
    for f in &analysis.report.findings {
        csv.write_record([
            f.severity().key().to_owned(),
            f.code.as_str().to_owned(),
            rounding.text(f.station_start.0, Quantity::Station),
            rounding.text(f.station_end.0, Quantity::Station),
            at.label_std(f.station_start.0),
            at.label_std(f.station_end.0),
            f.pvi.map_or(String::new(), |i| (i + 1).to_string()),
            f.message.clone(),
        ])?;
    }
    csv.flush()?;
    Ok(())
}

/// The header of `earthwork.csv` in `units`: the unit in every column (m²
/// and m³, or ft² and yd³); the mass ordinate is in compacted (fill)
/// measure, the cut having been reduced by the shrinkage.
pub fn earthwork_header(units: Units) -> [String; 7] {
    let (l, a, v) = match units {
        Units::Metric => ("m", "m2", "m3"),
        Units::UsCustomary => ("ft", "ft2", "yd3"),
    };
    [
        format!("station_{l}"),
        "station_label".to_owned(),
        format!("cut_area_{a}"),
        format!("fill_area_{a}"),
        format!("cut_volume_{v}"),
        format!("fill_volume_{v}"),
        format!("mass_compacted_{v}"),
    ]
}

/// `earthwork.csv`: one row per station of the estimate (the extra
/// stations included): end areas, the volumes of the interval ending at the
/// row (0 on the first row; cut in bank measure) and the mass ordinate (in
/// compacted measure). Numbers as `rounding` says; each station's label is
/// its plan station of `at`.
///
/// # Errors
/// A value that is not finite, or an I/O error of `out`.
pub fn write_earthwork_csv(
    out: impl Write,
    earthwork: &gradewright_geometry::Earthwork,
    at: gradewright_geometry::Stationing<'_>,
    rounding: Rounding,
) -> Result<(), TableError> {
    use Quantity::{Quantity as Q, Station};
    let mut csv = csv::Writer::from_writer(out);
    csv.write_record(earthwork_header(earthwork.units))?;
    for r in earthwork.rows() {
        let values = [
            (r.station, Station),
            (r.cut_area, Q),
            (r.fill_area, Q),
            (r.cut_volume, Q),
            (r.fill_volume, Q),
            (r.mass, Q),
        ];
        let mut row =
            values.iter().map(|&(v, q)| rounding.finite(v, q, r.station)).collect::<Result<Vec<_>, _>>()?;
        row.insert(1, at.label_std(r.station));
        csv.write_record(row)?;
    }
    csv.flush()?;
    Ok(())
}
