//! A validated profile, ready to evaluate at any station.

use crate::{CurveGeometry, Profile, ProfileProblem, Pvi, Segment, Station, Units};

/// Elevation and grade at one station.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Sample {
    /// Profile elevation.
    pub elevation: f64,
    /// Grade, percent. At a bare grade break, the grade ahead (except at the
    /// last PVI, where it is the grade behind).
    pub grade_percent: f64,
}

/// A station outside the profile.
#[derive(Clone, Copy, Debug, PartialEq, thiserror::Error)]
#[error("station {station} is outside the profile ({start} to {end})")]
pub struct OutOfRange {
    /// The station asked for.
    pub station: f64,
    /// First PVI station.
    pub start: f64,
    /// Last PVI station.
    pub end: f64,
}

/// What a station of [`Alignment::key_stations`] is.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum KeyPoint {
    /// A PVI (its curve elevation, not the PVI elevation, is the profile's).
    Pvi,
    /// Start of a vertical curve.
    Pvc,
    /// End of a vertical curve.
    Pvt,
}

/// A profile that passed validation: tangents and parabolic pieces end to end
/// from the first PVI to the last. Evaluation is O(log n) at a random station
/// and amortised O(1) per station through a [`Cursor`] on sorted stations.
#[derive(Clone, Debug)]
pub struct Alignment {
    units: Units,
    pvis: Vec<Pvi>,
    curves: Vec<CurveGeometry>,
    segments: Vec<Segment>,
    equations: crate::Equations,
}

impl Alignment {
    /// Validates `profile` and builds its pieces.
    ///
    /// # Errors
    /// Every [`ProfileProblem`] found, when there is any.
    pub fn new(profile: &Profile) -> Result<Self, Vec<ProfileProblem>> {
        let problems = profile.problems();
        if !problems.is_empty() {
            return Err(problems);
        }
        Ok(Self::build(profile.units, profile.pvis.clone(), profile.equations.clone()))
    }

    /// [`Self::new`], keeping the profile's PVIs instead of copying them
    /// (for a profile of millions of PVIs, read once and not needed again).
    ///
    /// # Errors
    /// Every [`ProfileProblem`] found, when there is any.
    pub fn from_profile(profile: Profile) -> Result<Self, Vec<ProfileProblem>> {
        let problems = profile.problems();
        if !problems.is_empty() {
            return Err(problems);
        }
        Ok(Self::build(profile.units, profile.pvis, profile.equations))
    }

    /// The pieces of PVIs already validated.
    fn build(units: Units, pvis: Vec<Pvi>, equations: crate::Equations) -> Self {
        let curves = interior_curves(&pvis);
        let mut segments = Vec::with_capacity(pvis.len() * 3);
        // Tangent from the end of the previous curve (or the first PVI) to the
        // start of the next curve (or the last PVI), then that curve's branches.
        let mut tangent_start = (pvis[0].station.0, pvis[0].elevation);
        for (i, pair) in pvis.windows(2).enumerate() {
            let [a, b] = pair else { continue };
            let grade = a.grade_to(b);
            let next_curve = curves.get(i); // the curve at PVI i + 1, if interior
            let tangent_end = match next_curve {
                Some(c) => c.pvc.0,
                None => b.station.0,
            };
            if tangent_end > tangent_start.0 || segments.is_empty() && next_curve.is_none() {
                segments.push(Segment {
                    start: tangent_start.0,
                    end: tangent_end,
                    elevation: a.elevation + grade * (tangent_start.0 - a.station.0),
                    grade,
                    rate: 0.0,
                });
            }
            if let Some(c) = next_curve {
                segments.extend(c.segments().into_iter().flatten());
                tangent_start = (c.pvt.0, c.pvt_elevation);
            }
        }
        Self { units, pvis, curves, segments, equations }
    }

    /// Unit system.
    pub fn units(&self) -> Units {
        self.units
    }

    /// How its stations read as plan stations (its station equations).
    pub fn stationing(&self) -> crate::Stationing<'_> {
        self.equations.stationing(self.units)
    }

    /// Its station equations.
    pub fn equations(&self) -> &crate::Equations {
        &self.equations
    }

    /// The PVIs.
    pub fn pvis(&self) -> &[Pvi] {
        &self.pvis
    }

    /// The curve at every interior PVI, in order (`curves()[i]` is at PVI `i + 1`).
    pub fn curves(&self) -> &[CurveGeometry] {
        &self.curves
    }

    /// The constant-y″ pieces, in station order, end to end.
    pub fn segments(&self) -> &[Segment] {
        &self.segments
    }

    /// First PVI station.
    pub fn start(&self) -> Station {
        self.pvis.first().map_or(Station(0.0), |p| p.station)
    }

    /// Last PVI station.
    pub fn end(&self) -> Station {
        self.pvis.last().map_or(Station(0.0), |p| p.station)
    }

    /// `station` if it is on the profile, taken to the end it is within the
    /// station hair of (a station typed to fewer decimals than a converted
    /// end, 304.8006096 against 304.8006096012192, is that end).
    fn within(&self, station: f64) -> Result<f64, OutOfRange> {
        let (start, end) = (self.start().0, self.end().0);
        if station >= start && station <= end {
            Ok(station)
        } else if crate::tolerance::same_station(station, start) {
            Ok(start)
        } else if crate::tolerance::same_station(station, end) {
            Ok(end)
        } else {
            Err(OutOfRange { station, start, end })
        }
    }

    fn segment_index(&self, station: f64) -> usize {
        let i = self.segments.partition_point(|seg| seg.end <= station);
        i.min(self.segments.len().saturating_sub(1))
    }

    /// Elevation and grade at `station`, O(log n).
    ///
    /// # Errors
    /// [`OutOfRange`] for a station before the first or after the last PVI
    /// by more than the station hair.
    pub fn sample(&self, station: Station) -> Result<Sample, OutOfRange> {
        let s = self.within(station.0)?;
        Ok(self.sample_in(self.segment_index(s), s))
    }

    fn sample_in(&self, index: usize, s: f64) -> Sample {
        match self.segments.get(index) {
            Some(seg) => Sample { elevation: seg.elevation_at(s), grade_percent: seg.grade_at(s) * 100.0 },
            None => Sample { elevation: f64::NAN, grade_percent: f64::NAN },
        }
    }

    /// A cursor for evaluating many stations in increasing order.
    pub fn cursor(&self) -> Cursor<'_> {
        Cursor { alignment: self, index: 0 }
    }

    /// Every PVI, PVC and PVT station, in order (PVC/PVT only for real curves).
    pub fn key_stations(&self) -> Vec<(Station, KeyPoint)> {
        let mut keys: Vec<(Station, KeyPoint)> =
            self.pvis.iter().map(|p| (p.station, KeyPoint::Pvi)).collect();
        for c in &self.curves {
            if c.length() > 0.0 {
                keys.push((c.pvc, KeyPoint::Pvc));
                keys.push((c.pvt, KeyPoint::Pvt));
            }
        }
        keys.sort_by(|a, b| a.0.total_cmp(&b.0));
        keys
    }
}

impl Alignment {
    /// The profile between stations `range` as a polyline whose chords stray
    /// at most `tolerance` (in elevation units) from the true parabolas: a
    /// piece of length L and rate y″ gets n = L·√(|y″|/(8·tol)) chords (the
    /// chord error of a parabola is |y″|·h²/8). Tangents are one chord.
    pub fn flatten(&self, range: (f64, f64), tolerance: f64) -> Vec<[f64; 2]> {
        flatten_segments(&self.segments, range, tolerance)
    }
}

/// Most chords one parabolic piece is drawn with.
const MAX_CHORDS: f64 = 4000.0;

/// [`Alignment::flatten`] on any end-to-end pieces (also one curve's own).
pub fn flatten_segments(segments: &[Segment], range: (f64, f64), tolerance: f64) -> Vec<[f64; 2]> {
    let tolerance = tolerance.max(crate::tolerance::LENGTH_FLOOR);
    let first = segments.partition_point(|s| s.end < range.0);
    let mut points = Vec::new();
    for seg in segments.get(first..).unwrap_or(&[]) {
        if seg.start > range.1 {
            break;
        }
        let length = seg.end - seg.start;
        let chords = if seg.rate == 0.0 {
            1.0
        } else {
            (length * (seg.rate.abs() / (8.0 * tolerance)).sqrt()).ceil().clamp(2.0, MAX_CHORDS)
        };
        #[allow(clippy::cast_possible_truncation, clippy::cast_sign_loss)]
        let n = chords as usize;
        for i in 0..=n {
            if i == 0 && !points.is_empty() {
                continue;
            }
            #[allow(clippy::cast_precision_loss)]
            let s = seg.start + length * i as f64 / n as f64;
            points.push([s, seg.elevation_at(s)]);
        }
    }
    points
}

/// The curve geometry at every interior PVI. Needs finite values and strictly
/// increasing stations; curves may overlap (they are computed one by one).
pub fn interior_curves(pvis: &[Pvi]) -> Vec<CurveGeometry> {
    pvis.windows(3)
        .enumerate()
        .filter_map(|(i, w)| match w {
            [a, b, c] => Some(CurveGeometry::new(i + 1, a, b, c)),
            _ => None,
        })
        .collect()
}

/// Evaluates stations in increasing order in amortised O(1) each; a station
/// behind the cursor is still answered correctly (by a binary search).
#[derive(Clone, Debug)]
pub struct Cursor<'a> {
    alignment: &'a Alignment,
    index: usize,
}

impl Cursor<'_> {
    /// Elevation and grade at `station`.
    ///
    /// # Errors
    /// [`OutOfRange`] for a station outside the profile.
    #[inline]
    pub fn sample(&mut self, station: Station) -> Result<Sample, OutOfRange> {
        let s = self.alignment.within(station.0)?;
        let segments = &self.alignment.segments;
        match segments.get(self.index) {
            Some(seg) if s >= seg.start => {
                while self.index + 1 < segments.len()
                    && segments.get(self.index).is_some_and(|seg| seg.end <= s)
                {
                    self.index += 1;
                }
            }
            _ => self.index = self.alignment.segment_index(s),
        }
        Ok(self.alignment.sample_in(self.index, s))
    }
}
