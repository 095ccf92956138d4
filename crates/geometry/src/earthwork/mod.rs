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

mod blocks;

use serde::{Deserialize, Serialize};

pub use blocks::{earthwork, earthwork_at};

use crate::{KeyPoint, Units};

/// The widest roadway a section may have (in the project's unit).
const MAX_WIDTH: f64 = 1.0e4;

/// The flattest side slope a section may have (horizontal per unit rise).
const MAX_SLOPE: f64 = 1.0e3;

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
        // A section beyond any road (wider than 10 km, slopes flatter than
        // 1000:1) is a mistake, and its areas would overflow.
        if !(self.width.is_finite() && self.width > 0.0 && self.width <= MAX_WIDTH) {
            return field(SectionField::Width, "must be a number greater than 0 and at most 10000");
        }
        if !(self.cut_slope.is_finite() && (0.0..=MAX_SLOPE).contains(&self.cut_slope)) {
            return field(
                SectionField::CutSlope,
                "must be a number from 0 to 1000 (horizontal per unit rise)",
            );
        }
        if !(self.fill_slope.is_finite() && (0.0..=MAX_SLOPE).contains(&self.fill_slope)) {
            return field(
                SectionField::FillSlope,
                "must be a number from 0 to 1000 (horizontal per unit rise)",
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

/// The estimate: every station and the totals. Its sections are kept in
/// blocks of the ground's points, so that after an edit only the blocks the
/// edit touched are computed again ([`Earthwork::after`]); the rows are the
/// same, to the bit, as an estimate from scratch.
#[derive(Clone, Debug, PartialEq)]
pub struct Earthwork {
    /// Unit system (areas in m² or ft², volumes in m³ or yd³).
    pub units: Units,
    /// The section used.
    pub section: Section,
    /// Total cut (bank volume, before shrinkage).
    pub cut: f64,
    /// Total fill.
    pub fill: f64,
    /// The stations the estimate covers: where the ground and the profile
    /// overlap.
    pub range: (f64, f64),
    /// What the blocks were computed for (to tell whether they can be kept).
    basis: blocks::Basis,
    /// The sections, block by block.
    blocks: Vec<std::sync::Arc<blocks::Sections>>,
    /// The volumes (cut, fill) from the last row of the block before to the
    /// first row of each block ((0, 0) for the first).
    joins: Vec<(f64, f64)>,
    /// The mass ordinate at the first row of each block.
    offsets: Vec<f64>,
}

impl Earthwork {
    /// How many stations the estimate has.
    pub fn len(&self) -> usize {
        self.blocks.iter().map(|b| b.stations.len()).sum()
    }

    /// Whether the estimate has no station.
    pub fn is_empty(&self) -> bool {
        self.len() == 0
    }

    /// Every station of the estimate, in order, with its areas, the volumes
    /// of the interval ending at it and the mass ordinate.
    pub fn rows(&self) -> impl Iterator<Item = EarthworkRow> + '_ {
        let section = self.section;
        let factor = volume_factor(self.units);
        let mut previous: Option<(f64, f64, f64)> = None; // station, cut area, fill area
        self.blocks
            .iter()
            .zip(self.joins.iter().zip(&self.offsets))
            .flat_map(move |(block, (join, offset))| {
                (0..block.stations.len()).map(move |i| (block, *join, *offset, i))
            })
            .map(move |(block, join, offset, i)| {
                let station = block.stations.get(i).copied().unwrap_or(f64::NAN);
                let d = block.depths.get(i).copied().unwrap_or(0.0);
                // `+ 0.0` turns a negative zero into zero (never "-0.000").
                let (cut_depth, fill_depth) = (d.max(0.0) + 0.0, (-d).max(0.0) + 0.0);
                let (cut_area, fill_area) = (section.cut_area(cut_depth), section.fill_area(fill_depth));
                let (cut_volume, fill_volume) = match previous {
                    _ if i == 0 => join,
                    Some((s, ca, fa)) => {
                        let length = station - s;
                        (length * (ca + cut_area) / 2.0 * factor, length * (fa + fill_area) / 2.0 * factor)
                    }
                    None => (0.0, 0.0),
                };
                previous = Some((station, cut_area, fill_area));
                EarthworkRow {
                    station,
                    kind: block.kinds.get(i).copied().unwrap_or(RowKind::Interval),
                    cut_depth,
                    fill_depth,
                    cut_area,
                    fill_area,
                    cut_volume,
                    fill_volume,
                    mass: offset + block.mass.get(i).copied().unwrap_or(0.0),
                }
            })
    }

    /// The mass ordinate for drawing between stations `range`, thinned to
    /// about two points per column (the lowest and highest of each, so no
    /// peak of the mass haul is lost), with the last point before the range
    /// and the first past it. For drawing only.
    pub fn mass_line(&self, range: (f64, f64), columns: usize) -> Vec<[f64; 2]> {
        let range = (
            if range.0.is_finite() { range.0 } else { self.range.0 },
            if range.1.is_finite() { range.1 } else { self.range.1 },
        );
        let columns = columns.max(1);
        #[allow(clippy::cast_precision_loss)]
        let width = (range.1 - range.0) / columns as f64;
        let mut out: Vec<[f64; 2]> = Vec::with_capacity(2 * columns + 8);
        let mut before: Option<[f64; 2]> = None;
        let mut after: Option<[f64; 2]> = None;
        for (block, &offset) in self.blocks.iter().zip(&self.offsets) {
            let (stations, mass) = (&block.stations[..], &block.mass[..]);
            let Some(&last) = stations.last() else { continue };
            if last < range.0 {
                before = Some([last, offset + mass.last().copied().unwrap_or(0.0)]);
                continue;
            }
            let start = stations.partition_point(|&s| s < range.0);
            if start > 0 {
                before = Some([stations[start - 1], offset + mass[start - 1]]);
            }
            let end = stations.partition_point(|&s| s <= range.1);
            // Column by column over this block's stations in the range: the
            // lowest and the highest of each, by a tight walk of its slice.
            let mut i = start;
            while i < end {
                #[allow(clippy::cast_possible_truncation, clippy::cast_precision_loss)]
                let column = if width > 0.0 { ((stations[i] - range.0) / width).floor() } else { 0.0 };
                let edge = if width > 0.0 { range.0 + (column + 1.0) * width } else { f64::INFINITY };
                let j = i + stations.get(i..end).map_or(0, |rest| rest.partition_point(|&s| s < edge)).max(1);
                let run = &mass[i..j];
                let (mut low, mut high) = (0, 0);
                for (k, &m) in run.iter().enumerate() {
                    if m < run[low] {
                        low = k;
                    }
                    if m > run[high] {
                        high = k;
                    }
                }
                out.push([stations[i + low.min(high)], offset + run[low.min(high)]]);
                if low != high {
                    out.push([stations[i + low.max(high)], offset + run[low.max(high)]]);
                }
                i = j;
            }
            if end < stations.len() {
                after = Some([stations[end], offset + mass[end]]);
                break;
            }
        }
        if let Some(b) = before {
            out.insert(0, b);
        }
        out.extend(after);
        out
    }

    /// Net: cut · (1 − shrinkage) − fill (positive: waste; negative: borrow).
    pub fn net(&self) -> f64 {
        match (self.blocks.last(), self.offsets.last()) {
            (Some(b), Some(offset)) => offset + b.mass.last().copied().unwrap_or(0.0),
            _ => 0.0,
        }
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

#[cfg(test)]
mod tests {
    use super::*;
    use crate::{Alignment, Ground, GroundPoint, Profile, Pvi};

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
        let stations: Vec<f64> = e.rows().map(|r| r.station).collect();
        assert_eq!(stations, vec![0.0, 10.0, 20.0]);
        assert_eq!(e.rows().nth(1).map(|r| r.kind), Some(RowKind::GradePoint));
        assert!((e.cut - 60.0).abs() < 1e-9 && (e.fill - 65.0).abs() < 1e-9, "{} {}", e.cut, e.fill);
        // Mass with 10 % shrinkage: 60 × 0.9 − 65 = −11 (borrow).
        assert!((e.net() - (-11.0)).abs() < 1e-9, "{}", e.net());
        let row = e.rows().nth(1).expect("row");
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
        assert_eq!(e.len(), 3);
    }

    #[test]
    fn only_where_there_is_ground() {
        let road = level(Units::Metric, 100.0);
        let e = earthwork(&road, &ground(&[(40.0, 101.0), (60.0, 101.0)]), &SECTION, 20.0).expect("estimate");
        assert_eq!(e.rows().next().map(|r| r.station), Some(40.0));
        assert_eq!(e.rows().last().map(|r| r.station), Some(60.0));
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
        let spike = e.rows().find(|r| (r.station - 15.0).abs() < 1e-12).expect("a section at the spike");
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
        let stations: Vec<f64> = e.rows().map(|r| r.station).collect();
        assert_eq!(stations, vec![12.34, 20.0, 40.0, 60.0, 80.0, 100.0]);
    }

    /// A dense survey (12 001 points, several blocks): after a PVI is
    /// moved, the blocks away from it are kept (the very same sections) and
    /// the estimate equals one from scratch, row for row; its totals are
    /// the sums of its rows' volumes, and its mass ordinate the running sum
    /// Σ(cut · (1 − shrinkage) − fill) (each recomputed here independently).
    #[test]
    fn an_estimate_after_an_edit_keeps_the_blocks_it_did_not_touch() {
        let pvis = vec![
            Pvi::new(0.0, 100.0),
            Pvi::with_curve(300.0, 103.0, 120.0),
            Pvi::with_curve(700.0, 99.0, 160.0),
            Pvi::new(1200.0, 101.0),
        ];
        let road = Alignment::new(&Profile::new(Units::Metric, pvis.clone())).expect("valid");
        let g: Ground = (0..=12_000)
            .map(|i| {
                let s = f64::from(i) * 0.1;
                let y = road.sample(crate::Station(s)).map_or(0.0, |x| x.elevation) + 0.8 * (s / 37.0).sin();
                GroundPoint { station: s, elevation: y }
            })
            .collect::<Vec<_>>()
            .into();
        let points = crate::grade_points(&road, &g);
        let before = earthwork_at(&road, &g, &SECTION, 20.0, &points).expect("estimate");
        assert_eq!(before.blocks.len(), 6);
        let mut moved = pvis;
        moved[2].elevation += 0.4;
        let road2 = Alignment::new(&Profile::new(Units::Metric, moved)).expect("valid");
        let points2 = crate::grade_points(&road2, &g);
        let after = Earthwork::after(Some(&before), &road2, &g, &SECTION, 20.0, &points2).expect("estimate");
        let fresh = earthwork_at(&road2, &g, &SECTION, 20.0, &points2).expect("estimate");
        assert_eq!(after, fresh);
        let kept =
            after.blocks.iter().zip(&before.blocks).filter(|(a, b)| std::sync::Arc::ptr_eq(a, b)).count();
        // Raising PVI 3 (0+700) changes the road from the PVC of the curve
        // at PVI 2 (0+240) to the end: the block over 0–204.8 is kept.
        assert!(kept >= 1 && kept < after.blocks.len(), "{kept} of {} kept", after.blocks.len());
        let rows: Vec<EarthworkRow> = after.rows().collect();
        assert_eq!(rows.len(), after.len());
        assert!(rows.len() > 12_000, "a section at every ground point: {}", rows.len());
        assert!(rows.windows(2).all(|w| w[1].station - w[0].station > crate::tolerance::STATION_HAIR));
        let (mut cut, mut fill, mut mass) = (0.0, 0.0, 0.0);
        for w in rows.windows(2) {
            let length = w[1].station - w[0].station;
            let cv = length * (SECTION.cut_area(w[0].cut_depth) + SECTION.cut_area(w[1].cut_depth)) / 2.0;
            let fv = length * (SECTION.fill_area(w[0].fill_depth) + SECTION.fill_area(w[1].fill_depth)) / 2.0;
            assert!((cv - w[1].cut_volume).abs() < 1e-12 && (fv - w[1].fill_volume).abs() < 1e-12);
            cut += cv;
            fill += fv;
            mass += cv * 0.9 - fv;
            assert!((mass - w[1].mass).abs() < 1e-8, "mass at {}", w[1].station);
        }
        assert!((cut - after.cut).abs() < 1e-8 && (fill - after.fill).abs() < 1e-8);
        assert!((after.net() - mass).abs() < 1e-8);
        // Drawn: about two points per column (a column split by a block's
        // end gives two more), the highest and lowest mass among them, in
        // station order.
        let line = after.mass_line((f64::NEG_INFINITY, f64::INFINITY), 300);
        assert!(line.len() <= 2 * 300 + 2 + 2 * after.blocks.len(), "{}", line.len());
        assert!(line.windows(2).all(|w| w[0][0] < w[1][0]));
        let top = rows.iter().map(|r| r.mass).fold(f64::NEG_INFINITY, f64::max);
        let bottom = rows.iter().map(|r| r.mass).fold(f64::INFINITY, f64::min);
        assert!(line.iter().any(|p| p[1].to_bits() == top.to_bits()));
        assert!(line.iter().any(|p| p[1].to_bits() == bottom.to_bits()));
        let part = after.mass_line((500.0, 600.0), 50);
        assert!(part.first().is_some_and(|p| p[0] < 500.0) && part.last().is_some_and(|p| p[0] > 600.0));
    }
}
