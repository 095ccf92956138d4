//! The sections of the estimate, computed block by block of the ground's
//! points (the blocks of [`crate::ground::SiteScan`]): a section at every
//! whole multiple of the interval, both ends of the range, every grade
//! point, every point of the ground and every PVC, PVI and PVT. A block
//! whose profile pieces, range and extra stations are those of the estimate
//! before an edit is kept as it was, so a drag recomputes only the blocks
//! it moves.

use std::sync::Arc;

use super::{Earthwork, EarthworkError, RowKind, Section, volume_factor};
use crate::curve::Segment;
use crate::ground::{BLOCK, Ground, grade_points};
use crate::tolerance::STATION_HAIR;
use crate::{Alignment, KeyPoint};

/// Most stations an estimate holds.
const MAX_ROWS: f64 = 1.0e7;

/// What an estimate's blocks were computed for: they can be kept only for
/// the same ground, section, interval and range.
#[derive(Clone, Debug, Default, PartialEq)]
pub(super) struct Basis {
    ground: Ground,
    section: Option<Section>,
    interval: f64,
    range: (f64, f64),
}

/// The sections of one block of ground points.
#[derive(Clone, Debug, PartialEq)]
pub(super) struct Sections {
    /// The stations the block answers for: [from, to), the last block's
    /// end included.
    range: (f64, f64),
    /// The profile pieces over the range (to tell whether an edit touched it).
    segments: Vec<Segment>,
    /// The sections other than ground points in the range.
    others: Vec<(f64, RowKind)>,
    /// Each section's station, in order.
    pub(super) stations: Vec<f64>,
    /// Why each is there.
    pub(super) kinds: Vec<RowKind>,
    /// Ground minus profile at each (cut > 0, fill < 0; 0 at a grade point).
    pub(super) depths: Vec<f64>,
    /// The mass ordinate at each, from the block's first section (0 there).
    pub(super) mass: Vec<f64>,
    /// The cut and fill between the block's first and last sections.
    cut: f64,
    fill: f64,
    /// The end areas (cut, fill) of the first and the last section.
    first_areas: (f64, f64),
    last_areas: (f64, f64),
}

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
    earthwork_at(alignment, ground, section, interval, &grade_points(alignment, ground))
}

/// [`earthwork`] with the grade points already found (by a
/// [`crate::ground::SiteScan`]).
///
/// # Errors
/// As [`earthwork`].
pub fn earthwork_at(
    alignment: &Alignment,
    ground: &Ground,
    section: &Section,
    interval: f64,
    grade_points: &[f64],
) -> Result<Earthwork, EarthworkError> {
    Earthwork::after(None, alignment, ground, section, interval, grade_points)
}

impl Earthwork {
    /// [`earthwork_at`], keeping the blocks of `previous` (the estimate
    /// before an edit) that the edit left alone. The result equals an
    /// estimate from scratch (see the tests).
    ///
    /// # Errors
    /// As [`earthwork`].
    pub fn after(
        previous: Option<&Self>,
        alignment: &Alignment,
        ground: &Ground,
        section: &Section,
        interval: f64,
        grade_points: &[f64],
    ) -> Result<Self, EarthworkError> {
        section.validate()?;
        let (g0, g1) = ground.range().ok_or(EarthworkError::NoOverlap)?;
        let (lo, hi) = (g0.max(alignment.start().0), g1.min(alignment.end().0));
        if lo >= hi || lo.is_nan() || hi.is_nan() {
            return Err(EarthworkError::NoOverlap);
        }
        if !(interval.is_finite() && interval > 0.0) || (hi - lo) / interval > MAX_ROWS {
            return Err(EarthworkError::Interval(interval));
        }
        let basis = Basis { ground: ground.clone(), section: Some(*section), interval, range: (lo, hi) };
        let previous = previous.filter(|p| p.basis == basis);
        let others = section_stations(alignment, lo, hi, interval, grade_points);
        let segments = alignment.segments();
        let mut blocks: Vec<Arc<Sections>> = Vec::with_capacity(ground.len() / BLOCK + 1);
        let mut k = 0;
        while k + 1 < ground.len() {
            let last = (k + BLOCK).min(ground.len() - 1);
            let (Some(a), Some(b)) = (ground.get(k), ground.get(last)) else { break };
            k = last;
            let range = (a.station.max(lo), b.station.min(hi));
            if range.0 >= range.1 {
                continue;
            }
            let closes = range.1 >= hi;
            let used = {
                let first = segments.partition_point(|seg| seg.end <= range.0);
                let end = segments.partition_point(|seg| seg.start < range.1);
                segments.get(first..end.max(first)).unwrap_or(&[])
            };
            let mine = {
                let first = others.partition_point(|(s, _)| *s < range.0);
                let end = others.partition_point(|(s, _)| if closes { *s <= range.1 } else { *s < range.1 });
                others.get(first..end.max(first)).unwrap_or(&[])
            };
            let kept = previous.and_then(|p| {
                let i = p.blocks.partition_point(|b| b.range.0 < range.0);
                p.blocks
                    .get(i)
                    .filter(|b| b.range == range && b.segments == used && b.others == mine)
                    .cloned()
            });
            let block = match kept {
                Some(b) => b,
                None => Arc::new(Sections::new(alignment, ground, section, (lo, hi), range, used, mine)),
            };
            blocks.push(block);
        }
        // The blocks joined: the volume across each join, the totals and the
        // mass ordinate at each block's start, in order.
        let shrink = 1.0 - section.shrinkage_percent / 100.0;
        let factor = volume_factor(alignment.units());
        let (mut cut, mut fill, mut mass) = (0.0, 0.0, 0.0);
        let mut joins = Vec::with_capacity(blocks.len());
        let mut offsets = Vec::with_capacity(blocks.len());
        let mut before: Option<&Sections> = None;
        for block in &blocks {
            let join = match (before, block.stations.first()) {
                (Some(b), Some(&s)) => {
                    let length = s - b.stations.last().copied().unwrap_or(s);
                    let (ca, fa) = block.first_areas;
                    let (pa, pf) = b.last_areas;
                    (length * (pa + ca) / 2.0 * factor, length * (pf + fa) / 2.0 * factor)
                }
                _ => (0.0, 0.0),
            };
            cut += join.0;
            fill += join.1;
            mass += join.0 * shrink - join.1;
            joins.push(join);
            offsets.push(mass);
            cut += block.cut;
            fill += block.fill;
            mass += block.mass.last().copied().unwrap_or(0.0);
            before = Some(block);
        }
        Ok(Self {
            units: alignment.units(),
            section: *section,
            cut,
            fill,
            range: (lo, hi),
            basis,
            blocks,
            joins,
            offsets,
        })
    }
}

impl Sections {
    /// The sections over stations `range` of the estimate over `estimate`:
    /// the ground's own points there and `others`, merged in station order;
    /// a station within the hair of the one before is left out, as is one
    /// within the hair of the next block's first point.
    fn new(
        alignment: &Alignment,
        ground: &Ground,
        section: &Section,
        estimate: (f64, f64),
        range: (f64, f64),
        segments: &[Segment],
        others: &[(f64, RowKind)],
    ) -> Self {
        let hi = range.1;
        let closes = hi >= estimate.1;
        // The ground's points in the block and strictly inside the
        // estimate's range (its ends are sections of the interval), each
        // with its own elevation.
        let inside: &[crate::GroundPoint] = {
            let first = ground.partition_point(|p| p.station < range.0 || p.station <= estimate.0);
            let end = ground.partition_point(|p| p.station < hi);
            ground.get(first..end.max(first)).unwrap_or(&[])
        };
        let n = others.len() + inside.len();
        let mut out = Self {
            range,
            segments: segments.to_vec(),
            others: others.to_vec(),
            stations: Vec::with_capacity(n),
            kinds: Vec::with_capacity(n),
            depths: Vec::with_capacity(n),
            mass: Vec::with_capacity(n),
            cut: 0.0,
            fill: 0.0,
            first_areas: (0.0, 0.0),
            last_areas: (0.0, 0.0),
        };
        let shrink = 1.0 - section.shrinkage_percent / 100.0;
        let factor = volume_factor(alignment.units());
        let mut cursor = alignment.cursor();
        let mut walker = ground.walker();
        let mut add = |out: &mut Self, s: f64, kind: RowKind, g: Option<f64>| {
            if out.stations.last().is_some_and(|last| s - last <= STATION_HAIR)
                || (!closes && hi - s <= STATION_HAIR)
            {
                return;
            }
            let Some(g) = g.or_else(|| walker.elevation_at(s)) else { return };
            let Ok(sample) = cursor.sample(crate::Station(s)) else { return };
            // A grade point is on the ground: its depth is zero by definition.
            let d = if kind == RowKind::GradePoint { 0.0 } else { g - sample.elevation };
            let (cd, fd) = (d.max(0.0) + 0.0, (-d).max(0.0) + 0.0);
            let areas = (section.cut_area(cd), section.fill_area(fd));
            let m = match out.stations.last() {
                Some(&prev) => {
                    let length = s - prev;
                    let (pa, pf) = out.last_areas;
                    let (cv, fv) =
                        (length * (pa + areas.0) / 2.0 * factor, length * (pf + areas.1) / 2.0 * factor);
                    out.cut += cv;
                    out.fill += fv;
                    out.mass.last().copied().unwrap_or(0.0) + (cv * shrink - fv)
                }
                None => {
                    out.first_areas = areas;
                    0.0
                }
            };
            out.last_areas = areas;
            out.stations.push(s);
            out.kinds.push(kind);
            out.depths.push(d);
            out.mass.push(m);
        };
        // Two lists in station order merged: the few stations of the
        // interval, grade points and key points, and the many ground points.
        // On a tie the interval and grade points come before a ground point,
        // a ground point before a key point (the later one is then within
        // the hair and left out).
        let (mut a, mut b) = (0, 0);
        loop {
            let other = others.get(a);
            let point = inside.get(b);
            let take_other = match (other, point) {
                (Some(&(s, kind)), Some(p)) => match s.total_cmp(&p.station) {
                    std::cmp::Ordering::Less => true,
                    std::cmp::Ordering::Equal => !matches!(kind, RowKind::Key(_)),
                    std::cmp::Ordering::Greater => false,
                },
                (Some(_), None) => true,
                (None, Some(_)) => false,
                (None, None) => break,
            };
            if take_other {
                if let Some(&(s, kind)) = other {
                    add(&mut out, s, kind, None);
                }
                a += 1;
            } else {
                if let Some(p) = point {
                    add(&mut out, p.station, RowKind::GroundPoint, Some(p.elevation));
                }
                b += 1;
            }
        }
        out
    }
}

/// The sections other than the ground's points, in station order: the even
/// stations of `interval` with both ends, the grade points, and the PVCs,
/// PVIs and PVTs inside the range, the first of these lists first on a tie.
fn section_stations(
    alignment: &Alignment,
    lo: f64,
    hi: f64,
    interval: f64,
    grade_points: &[f64],
) -> Vec<(f64, RowKind)> {
    let mut regular: Vec<f64> = vec![lo];
    regular.extend(crate::even_stations(lo, hi, interval).filter(|&s| s > lo && s < hi));
    regular.push(hi);
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
    let grades = grade_points.iter().copied().filter(|&s| s >= lo && s <= hi);
    let mut out: Vec<(f64, RowKind)> = regular
        .iter()
        .map(|&s| (s, RowKind::Interval))
        .chain(grades.map(|s| (s, RowKind::GradePoint)))
        .chain(keys.iter().map(|&(s, k)| (s, RowKind::Key(k))))
        .collect();
    // Stable: on a tie the earlier list stays first.
    out.sort_by(|x, y| x.0.total_cmp(&y.0));
    out
}
