//! A centreline earthwork estimate for a level typical section.
//!
//! The section is level across: a roadway of width W at the profile
//! elevation, with side slopes of s horizontal per unit rise out to the
//! ground, which is taken as level across at its centreline elevation. For
//! a depth d of cut (or fill) at the centreline the end area is
//!
//! > A = d · (W + s · d)
//!
//! (the trapezoid of top width W + 2·s·d and bottom width W, derived from
//! the section's geometry), with s the cut or the fill slope.
//!
//! Volumes between consecutive stations are by the average-end-area method,
//! V = L · (A₁ + A₂) / 2 (Ghilani and Wolf, *Elementary Surveying: An
//! Introduction to Geomatics*, 13th ed., ch. 26, the average-end-area
//! formula; chapter from memory), in m³, or in yd³ for US customary
//! projects (V = L · (A₁ + A₂) / 54 with L in ft and A in ft², derived from
//! the same formula and 27 ft³ = 1 yd³). Extra stations go in at every grade
//! point (where the profile crosses the ground) and at every PVC, PVI and
//! PVT inside the range, so a change from cut to fill is never averaged
//! away. The mass ordinate is the running sum Σ(cut · (1 − shrinkage) −
//! fill) (the mass diagram of the same text, ch. 26).

use serde::{Deserialize, Serialize};

use crate::ground::{Ground, grade_points};
use crate::tolerance::STATION_HAIR;
use crate::{Alignment, KeyPoint, Units};

/// The level typical section of the estimate.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Section {
    /// Roadway width W (the whole formation, both sides).
    pub width: f64,
    /// Cut slope, horizontal run per unit rise.
    pub cut_slope: f64,
    /// Fill slope, horizontal run per unit rise.
    pub fill_slope: f64,
    /// Shrinkage, percent of the cut volume lost when placed as fill.
    #[serde(default)]
    pub shrinkage_percent: f64,
}

impl Section {
    /// A two-lane default: 10 m (or 32 ft) wide, 2:1 cut and fill slopes, no
    /// shrinkage (common practice; the designer enters their own).
    pub fn default_for(units: Units) -> Self {
        let width = match units {
            Units::Metric => 10.0,
            Units::UsCustomary => 32.0,
        };
        Self { width, cut_slope: 2.0, fill_slope: 2.0, shrinkage_percent: 0.0 }
    }

    /// The first unusable value, naming the field.
    ///
    /// # Errors
    /// [`EarthworkError::Field`] naming the field and why.
    pub fn validate(&self) -> Result<(), EarthworkError> {
        let field = |field: SectionField, why: &'static str| {
            Err(EarthworkError::Field { field, value: self.value(field), why })
        };
        if !(self.width.is_finite() && self.width > 0.0) {
            return field(SectionField::Width, "must be a number greater than 0");
        }
        if !(self.cut_slope.is_finite() && self.cut_slope >= 0.0) {
            return field(SectionField::CutSlope, "must be a number of 0 or more (horizontal per unit rise)");
        }
        if !(self.fill_slope.is_finite() && self.fill_slope >= 0.0) {
            return field(
                SectionField::FillSlope,
                "must be a number of 0 or more (horizontal per unit rise)",
            );
        }
        if !(self.shrinkage_percent.is_finite() && (0.0..100.0).contains(&self.shrinkage_percent)) {
            return field(SectionField::Shrinkage, "must be a percentage from 0 up to (not including) 100");
        }
        Ok(())
    }

    /// The value of `field`.
    pub fn value(&self, field: SectionField) -> f64 {
        match field {
            SectionField::Width => self.width,
            SectionField::CutSlope => self.cut_slope,
            SectionField::FillSlope => self.fill_slope,
            SectionField::Shrinkage => self.shrinkage_percent,
        }
    }

    /// The value of `field`, to set.
    pub fn value_mut(&mut self, field: SectionField) -> &mut f64 {
        match field {
            SectionField::Width => &mut self.width,
            SectionField::CutSlope => &mut self.cut_slope,
            SectionField::FillSlope => &mut self.fill_slope,
            SectionField::Shrinkage => &mut self.shrinkage_percent,
        }
    }

    /// End area of cut at depth `d` ≥ 0: d · (W + s_cut · d).
    pub fn cut_area(&self, d: f64) -> f64 {
        d * (self.width + self.cut_slope * d)
    }

    /// End area of fill at depth `h` ≥ 0: h · (W + s_fill · h).
    pub fn fill_area(&self, h: f64) -> f64 {
        h * (self.width + self.fill_slope * h)
    }
}

/// A value of the level typical section.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
pub enum SectionField {
    /// Roadway width.
    Width,
    /// Cut slope, horizontal per unit rise.
    CutSlope,
    /// Fill slope, horizontal per unit rise.
    FillSlope,
    /// Shrinkage of cut placed as fill, percent.
    Shrinkage,
}

impl SectionField {
    /// Every field, in the order a section is described.
    pub const ALL: [Self; 4] = [Self::Width, Self::CutSlope, Self::FillSlope, Self::Shrinkage];

    /// Its name in a sentence (`cut slope`).
    pub fn name(self) -> &'static str {
        match self {
            Self::Width => "width",
            Self::CutSlope => "cut slope",
            Self::FillSlope => "fill slope",
            Self::Shrinkage => "shrinkage",
        }
    }
}

/// Why there is no estimate.
#[derive(Clone, Debug, PartialEq, thiserror::Error)]
pub enum EarthworkError {
    /// A section value is unusable.
    #[error("{} {why}", .field.name())]
    Field {
        /// Which value.
        field: SectionField,
        /// The value given.
        value: f64,
        /// What it must be.
        why: &'static str,
    },
    /// The interval is unusable or gives too many rows.
    #[error("interval {0} must be a number greater than 0 giving at most 10 million stations")]
    Interval(f64),
    /// The ground and the profile do not overlap.
    #[error("the ground and the profile do not overlap: no earthwork to estimate")]
    NoOverlap,
}

/// Why a station is in the table.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum RowKind {
    /// A station of the regular interval, or an end of the range.
    Interval,
    /// Where the profile crosses the ground.
    GradePoint,
    /// A point of the ground line (a break of the ground).
    GroundPoint,
    /// A PVI, PVC or PVT.
    Key(KeyPoint),
}

/// One station of the estimate.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct EarthworkRow {
    /// Station.
    pub station: f64,
    /// Why it is here.
    pub kind: RowKind,
    /// Cut depth (≥ 0).
    pub cut_depth: f64,
    /// Fill depth (≥ 0).
    pub fill_depth: f64,
    /// End area of cut.
    pub cut_area: f64,
    /// End area of fill.
    pub fill_area: f64,
    /// Cut volume of the interval ending here (0 on the first row).
    pub cut_volume: f64,
    /// Fill volume of the interval ending here (0 on the first row).
    pub fill_volume: f64,
    /// Mass ordinate: Σ(cut · (1 − shrinkage) − fill) up to here.
    pub mass: f64,
}

/// The estimate: every station and the totals.
#[derive(Clone, Debug, PartialEq)]
pub struct Earthwork {
    /// Unit system (areas in m² or ft², volumes in m³ or yd³).
    pub units: Units,
    /// The section used.
    pub section: Section,
    /// Stations in order.
    pub rows: Vec<EarthworkRow>,
    /// Total cut (bank volume, before shrinkage).
    pub cut: f64,
    /// Total fill.
    pub fill: f64,
    /// The stations the estimate covers: where the ground and the profile
    /// overlap.
    pub range: (f64, f64),
}

impl Earthwork {
    /// Net: cut · (1 − shrinkage) − fill (positive: waste; negative: borrow).
    pub fn net(&self) -> f64 {
        self.rows.last().map_or(0.0, |r| r.mass)
    }
}

/// The area unit: `m²` or `ft²`.
pub fn area_symbol(units: Units) -> &'static str {
    match units {
        Units::Metric => "m²",
        Units::UsCustomary => "ft²",
    }
}

/// The volume unit of the estimate: `m³` or `yd³`.
pub fn volume_symbol(units: Units) -> &'static str {
    match units {
        Units::Metric => "m³",
        Units::UsCustomary => "yd³",
    }
}

/// Volume units per (length unit × area unit): 1, or 1/27 for yd³ from ft³.
fn volume_factor(units: Units) -> f64 {
    match units {
        Units::Metric => 1.0,
        Units::UsCustomary => 1.0 / 27.0,
    }
}

/// Most stations an estimate holds.
const MAX_ROWS: f64 = 1.0e7;

/// The estimate over the stretch where `ground` and the profile overlap,
/// at every whole multiple of `interval` plus the range ends, the grade
/// points, every point of the ground, and the PVCs, PVIs and PVTs.
///
/// # Errors
/// [`EarthworkError`] for an unusable section or interval, or no overlap.
pub fn earthwork(
    alignment: &Alignment,
    ground: &Ground,
    section: &Section,
    interval: f64,
) -> Result<Earthwork, EarthworkError> {
    section.validate()?;
    let mut samples = crate::ground::GroundSamples::new(ground, None);
    earthwork_at(alignment, &mut samples, section, interval, &grade_points(alignment, ground))
}

/// [`earthwork`] with the grade points already found (by a
/// [`crate::ground::SiteScan`]).
///
/// # Errors
/// As [`earthwork`].
pub fn earthwork_at(
    alignment: &Alignment,
    ground: &mut crate::ground::GroundSamples,
    section: &Section,
    interval: f64,
    grade_points: &[f64],
) -> Result<Earthwork, EarthworkError> {
    section.validate()?;
    let (g0, g1) = ground.ground().range().ok_or(EarthworkError::NoOverlap)?;
    let start = alignment.start().0;
    let (lo, hi) = (g0.max(start), g1.min(alignment.end().0));
    if lo >= hi || lo.is_nan() || hi.is_nan() {
        return Err(EarthworkError::NoOverlap);
    }
    if !(interval.is_finite() && interval > 0.0) || (hi - lo) / interval > MAX_ROWS {
        return Err(EarthworkError::Interval(interval));
    }
    // Four lists already in station order — the even stations with both
    // ends, the grade points, the ground's own points (so no break of the
    // ground is averaged away; common practice), the PVCs, PVIs and PVTs —
    // merged, the first list first on a tie.
    let mut regular: Vec<f64> = vec![lo];
    regular.extend(crate::even_stations(lo, hi, interval).filter(|&s| s > lo && s < hi));
    regular.push(hi);
    let breaks: Vec<f64> = {
        let points = ground.ground();
        let from = points.partition_point(|p| p.station <= lo);
        let to = points.partition_point(|p| p.station < hi);
        points.get(from..to).unwrap_or(&[]).iter().map(|p| p.station).collect()
    };
    let mut keys: Vec<(f64, KeyPoint)> = Vec::with_capacity(3 * alignment.pvis().len());
    let mut curves = alignment.curves().iter().peekable();
    for (i, p) in alignment.pvis().iter().enumerate() {
        match curves.next_if(|c| c.index == i) {
            Some(c) if c.length() > 0.0 => {
                keys.extend([
                    (c.pvc.0, KeyPoint::Pvc),
                    (p.station.0, KeyPoint::Pvi),
                    (c.pvt.0, KeyPoint::Pvt),
                ]);
            }
            _ => keys.push((p.station.0, KeyPoint::Pvi)),
        }
    }
    keys.retain(|(s, _)| *s > lo && *s < hi);
    let mut stations: Vec<(f64, RowKind)> =
        Vec::with_capacity(regular.len() + grade_points.len() + breaks.len() + keys.len());
    let (mut a, mut b, mut c, mut d) = (0, 0, 0, 0);
    loop {
        let next = [
            regular.get(a).map(|&s| (s, RowKind::Interval)),
            grade_points.get(b).map(|&s| (s, RowKind::GradePoint)),
            breaks.get(d).map(|&s| (s, RowKind::GroundPoint)),
            keys.get(c).map(|&(s, k)| (s, RowKind::Key(k))),
        ];
        let Some((pick, item)) = next
            .iter()
            .enumerate()
            .filter_map(|(k, x)| x.map(|x| (k, x)))
            .min_by(|x, y| x.1.0.total_cmp(&y.1.0).then(x.0.cmp(&y.0)))
        else {
            break;
        };
        match pick {
            0 => a += 1,
            1 => b += 1,
            2 => d += 1,
            _ => c += 1,
        }
        if stations.last().is_none_or(|last| item.0 - last.0 > STATION_HAIR) {
            stations.push(item);
        }
    }

    let shrink = 1.0 - section.shrinkage_percent / 100.0;
    let factor = volume_factor(alignment.units());
    let mut rows: Vec<EarthworkRow> = Vec::with_capacity(stations.len());
    let (mut cut, mut fill, mut mass) = (0.0, 0.0, 0.0);
    // Stations in order: walk the profile; the ground under most stations
    // is remembered from the last estimate.
    let mut cursor = alignment.cursor();
    for (s, kind) in stations {
        let (Some(g), Ok(sample)) = (ground.elevation_at(s), cursor.sample(crate::Station(s))) else {
            continue;
        };
        let depth = crate::Depth::new(s, g, sample.elevation);
        // A grade point is on the ground: its depth is zero by definition.
        let (cd, fd) = if kind == RowKind::GradePoint { (0.0, 0.0) } else { (depth.cut, depth.fill) };
        let (ca, fa) = (section.cut_area(cd), section.fill_area(fd));
        let (cv, fv) = match rows.last() {
            Some(prev) => {
                let length = s - prev.station;
                (length * (prev.cut_area + ca) / 2.0 * factor, length * (prev.fill_area + fa) / 2.0 * factor)
            }
            None => (0.0, 0.0),
        };
        cut += cv;
        fill += fv;
        mass += cv * shrink - fv;
        rows.push(EarthworkRow {
            station: s,
            kind,
            cut_depth: cd,
            fill_depth: fd,
            cut_area: ca,
            fill_area: fa,
            cut_volume: cv,
            fill_volume: fv,
            mass,
        });
    }
    Ok(Earthwork { units: alignment.units(), section: *section, rows, cut, fill, range: (lo, hi) })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::{GroundPoint, Profile, Pvi};

    fn ground(points: &[(f64, f64)]) -> Ground {
        Ground::new(points.iter().map(|&(station, elevation)| GroundPoint { station, elevation }).collect())
    }

    fn level(units: Units, length: f64) -> Alignment {
        Alignment::new(&Profile::new(units, vec![Pvi::new(0.0, 100.0), Pvi::new(length, 100.0)]))
            .expect("valid")
    }

    const SECTION: Section =
        Section { width: 10.0, cut_slope: 2.0, fill_slope: 3.0, shrinkage_percent: 10.0 };

    #[test]
    fn end_areas_of_a_level_section() {
        // Hand-computed from A = d(W + s·d): 1.5 m of cut, W 10, 2:1 → 1.5 × 13 = 19.5 m².
        assert!((SECTION.cut_area(1.5) - 19.5).abs() < 1e-12);
        // 2 m of fill at 3:1 → 2 × 16 = 32 m².
        assert!((SECTION.fill_area(2.0) - 32.0).abs() < 1e-12);
    }

    #[test]
    fn a_grade_point_is_never_averaged_away() {
        // Level road at 100 over ground falling 101 → 99 over 20 m: cut 1 m
        // at 0, the grade point at 10, fill 1 m at 20. Hand-computed by
        // average end areas (Ghilani and Wolf, ch. 26):
        //   0–10: cut (12 + 0)/2 · 10 = 60 m³;  10–20: fill (0 + 13)/2 · 10 = 65 m³.
        // Averaging across the grade point would give 120 and 130: double.
        let e =
            earthwork(&level(Units::Metric, 20.0), &ground(&[(0.0, 101.0), (20.0, 99.0)]), &SECTION, 20.0)
                .expect("estimate");
        let stations: Vec<f64> = e.rows.iter().map(|r| r.station).collect();
        assert_eq!(stations, vec![0.0, 10.0, 20.0]);
        assert_eq!(e.rows.get(1).map(|r| r.kind), Some(RowKind::GradePoint));
        assert!((e.cut - 60.0).abs() < 1e-9 && (e.fill - 65.0).abs() < 1e-9, "{} {}", e.cut, e.fill);
        // Mass with 10 % shrinkage: 60 × 0.9 − 65 = −11 (borrow).
        assert!((e.net() - (-11.0)).abs() < 1e-9, "{}", e.net());
        let row = e.rows.get(1).expect("row");
        assert!((row.cut_volume - 60.0).abs() < 1e-9 && row.fill_volume == 0.0);
        assert!((row.mass - 54.0).abs() < 1e-9);
    }

    #[test]
    fn us_volumes_are_cubic_yards() {
        // 100 ft of uniform 2 ft cut, W 32 ft, 2:1: A = 2 × 36 = 72 ft²;
        // V = 100 × (72 + 72)/54 = 266.67 yd³ (derived from L(A1+A2)/2 and 27 ft³/yd³).
        let section = Section { width: 32.0, cut_slope: 2.0, fill_slope: 2.0, shrinkage_percent: 0.0 };
        let e = earthwork(
            &level(Units::UsCustomary, 100.0),
            &ground(&[(0.0, 102.0), (100.0, 102.0)]),
            &section,
            50.0,
        )
        .expect("estimate");
        assert!((e.cut - 100.0 * 144.0 / 54.0).abs() < 1e-9, "{}", e.cut);
        assert_eq!(e.rows.len(), 3);
    }

    #[test]
    fn only_where_there_is_ground() {
        let road = level(Units::Metric, 100.0);
        let e = earthwork(&road, &ground(&[(40.0, 101.0), (60.0, 101.0)]), &SECTION, 20.0).expect("estimate");
        assert_eq!(e.rows.first().map(|r| r.station), Some(40.0));
        assert_eq!(e.rows.last().map(|r| r.station), Some(60.0));
        assert_eq!(
            earthwork(&road, &ground(&[(200.0, 1.0), (300.0, 1.0)]), &SECTION, 20.0),
            Err(EarthworkError::NoOverlap)
        );
        let bad = Section { shrinkage_percent: 100.0, ..SECTION };
        assert!(matches!(
            earthwork(&road, &ground(&[(0.0, 1.0), (9.0, 1.0)]), &bad, 20.0),
            Err(EarthworkError::Field { field: SectionField::Shrinkage, .. })
        ));
        assert_eq!(
            earthwork(&road, &ground(&[(0.0, 1.0), (9.0, 1.0)]), &SECTION, 0.0),
            Err(EarthworkError::Interval(0.0))
        );
    }

    /// A break of the ground between two interval stations is a section of
    /// its own (common practice for a centreline estimate): a level road at
    /// 100 over ground 100 at 0 and 10, 102 at 15, 100 at 20 and 40. At 20 m
    /// only the stations 0, 20, 40 (all on the ground) would give no cut at
    /// all; with the ground's points, 2 m of cut at 15 (A = 2·(10 + 2·2) =
    /// 28 m²) and cut = 5·28/2 + 5·28/2 = 140 m³ (hand-computed by average
    /// end areas). The estimate says which stations it covers.
    #[test]
    fn every_break_of_the_ground_is_a_section() {
        let road = level(Units::Metric, 40.0);
        let g = ground(&[(0.0, 100.0), (10.0, 100.0), (15.0, 102.0), (20.0, 100.0), (40.0, 100.0)]);
        let e = earthwork(&road, &g, &SECTION, 20.0).expect("estimate");
        assert!((e.cut - 140.0).abs() < 1e-9, "{}", e.cut);
        let spike = e.rows.iter().find(|r| (r.station - 15.0).abs() < 1e-12).expect("a section at the spike");
        assert_eq!(spike.kind, RowKind::GroundPoint);
        assert!((spike.cut_area - 28.0).abs() < 1e-12);
        assert_eq!(e.range, (0.0, 40.0));
    }

    /// The interval stations are on whole multiples of the interval, as a
    /// plan is stationed (common practice): a road from 12.34 to 100 at 20
    /// has sections at 12.34, 20, 40, 60, 80, 100.
    #[test]
    fn interval_sections_are_on_even_stations() {
        let road = Alignment::new(&Profile::new(
            Units::Metric,
            vec![Pvi::new(12.34, 100.0), Pvi::new(100.0, 100.0)],
        ))
        .expect("valid");
        let e = earthwork(&road, &ground(&[(0.0, 101.0), (120.0, 101.0)]), &SECTION, 20.0).expect("estimate");
        let stations: Vec<f64> = e.rows.iter().map(|r| r.station).collect();
        assert_eq!(stations, vec![12.34, 20.0, 40.0, 60.0, 80.0, 100.0]);
    }
}
