//! A survey read with a reviewer's eye: points that look like no-data
//! values, points that jump far beyond their neighbours, and gaps much
//! longer than the survey's own spacing. Each is a warning, never a
//! refusal: the designer decides, but is told where.

use super::Ground;
use crate::{Station, Units};

/// Elevations surveying software writes for "no data" (common practice).
const NO_DATA: [f64; 8] = [-9999.0, -999.0, -99999.0, 9999.0, 99999.0, -32768.0, -32767.0, -999.99];

/// A point is a jump when it stands this many times the survey's typical
/// departure from the line through its neighbours off that line…
const JUMP_TIMES: f64 = 50.0;

/// …and at least this far off it (m; the foot figure is this over 0.3048).
const JUMP_LEAST_M: f64 = 3.0;

/// A gap is this many times the survey's median spacing…
const GAP_TIMES: f64 = 5.0;

/// …and at least this long (m; the foot figure is this over 0.3048).
const GAP_LEAST_M: f64 = 25.0;

/// What looks wrong in a survey.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum GroundWarning {
    /// An elevation that is a common no-data value.
    NoData {
        /// Where.
        station: f64,
        /// The value.
        elevation: f64,
    },
    /// A point far off the line through its neighbours.
    Jump {
        /// Where.
        station: f64,
        /// Its elevation.
        elevation: f64,
        /// How far off the line through its neighbours (signed: + above).
        off: f64,
    },
    /// A stretch with no point, much longer than the usual spacing.
    Gap {
        /// Its first station.
        from: f64,
        /// Its last station.
        to: f64,
        /// The survey's usual (median) spacing.
        usual: f64,
    },
}

impl GroundWarning {
    /// The warning in words, stations as plan stations of `at`.
    pub fn describe(&self, at: crate::Stationing<'_>) -> String {
        let label = |s: f64| at.label_std(s);
        let len = at.units.length_symbol();
        match *self {
            Self::NoData { station, elevation } => format!(
                "ground point at {} has elevation {elevation}, a value surveys use for no data: check it \
                 (depths near it are wrong if it is not real)",
                label(station)
            ),
            Self::Jump { station, elevation, off } => format!(
                "ground point at {} (elevation {elevation:.3}) is {:.3} {len} {} the line through its \
                 neighbours, far beyond the rest of the survey: check it",
                label(station),
                off.abs(),
                if off > 0.0 { "above" } else { "below" }
            ),
            Self::Gap { from, to, usual } => format!(
                "the ground has no point from {} to {} ({:.1} {len}, where points are usually {usual:.1} {len} \
                 apart): depths across the gap are interpolated in a straight line",
                label(from),
                label(to),
                to - from
            ),
        }
    }

    /// Where it is.
    pub fn stations(&self) -> (Station, Station) {
        match *self {
            Self::NoData { station, .. } | Self::Jump { station, .. } => (Station(station), Station(station)),
            Self::Gap { from, to, .. } => (Station(from), Station(to)),
        }
    }
}

/// The median of `values` (which are reordered); NaN when there are none.
fn median(values: &mut [f64]) -> f64 {
    if values.is_empty() {
        return f64::NAN;
    }
    let middle = values.len() / 2;
    let (_, m, _) = values.select_nth_unstable_by(middle, f64::total_cmp);
    *m
}

impl Ground {
    /// What looks wrong in the survey, in station order by kind: no-data
    /// values, jumps, gaps. Lengths in `units` (the thresholds are given in
    /// metres and converted).
    pub fn review(&self, units: Units) -> Vec<GroundWarning> {
        let per_metre = match units {
            Units::Metric => 1.0,
            Units::UsCustomary => 1.0 / crate::Foot::International.metres(),
        };
        let points: &[super::GroundPoint] = self;
        let mut out: Vec<GroundWarning> = points
            .iter()
            .filter(|p| NO_DATA.iter().any(|v| v.to_bits() == p.elevation.to_bits()))
            .map(|p| GroundWarning::NoData { station: p.station, elevation: p.elevation })
            .collect();
        // The rest of the review reads the points that are data.
        let points: Vec<super::GroundPoint> = points
            .iter()
            .filter(|p| !NO_DATA.iter().any(|v| v.to_bits() == p.elevation.to_bits()))
            .copied()
            .collect();
        if points.len() < 3 {
            return out;
        }
        // How far each interior point stands off the line through its
        // neighbours, and the survey's typical figure for it.
        let offs: Vec<f64> = points
            .windows(3)
            .map(|w| match w {
                [a, b, c] => {
                    let t = (b.station - a.station) / (c.station - a.station);
                    b.elevation - (a.elevation + t * (c.elevation - a.elevation))
                }
                _ => 0.0,
            })
            .collect();
        let typical = median(&mut offs.iter().map(|d| d.abs()).collect::<Vec<_>>());
        let least = JUMP_LEAST_M * per_metre;
        for (k, &off) in offs.iter().enumerate() {
            let Some(p) = points.get(k + 1) else { continue };
            // A spike pulls its neighbours' lines too: only the point that
            // stands off the most among them is the jump.
            let before = k.checked_sub(1).and_then(|j| offs.get(j)).map_or(0.0, |d| d.abs());
            let after = offs.get(k + 1).map_or(0.0, |d| d.abs());
            let peak = off.abs() > before && off.abs() >= after;
            if peak && off.abs() > least && off.abs() > JUMP_TIMES * typical {
                out.push(GroundWarning::Jump { station: p.station, elevation: p.elevation, off });
            }
        }
        let usual = median(&mut points.windows(2).map(|w| w[1].station - w[0].station).collect::<Vec<_>>());
        let gap = (GAP_TIMES * usual).max(GAP_LEAST_M * per_metre);
        for w in points.windows(2) {
            if let [a, b] = w
                && b.station - a.station > gap
            {
                out.push(GroundWarning::Gap { from: a.station, to: b.station, usual });
            }
        }
        out
    }
}

#[cfg(test)]
mod tests {
    use super::super::tests::ground;
    use super::*;

    #[test]
    fn a_no_data_value_a_spike_and_a_gap_are_named() {
        let mut points: Vec<(f64, f64)> =
            (0..=40).map(|i| (f64::from(i) * 10.0, 100.0 + f64::from(i) * 0.05)).collect();
        points[5].1 = -9999.0;
        points[20].1 += 7.45;
        points.retain(|p| !(p.0 > 300.0 && p.0 < 390.0));
        let warnings = ground(&points).review(Units::Metric);
        assert!(
            warnings.contains(&GroundWarning::NoData { station: 50.0, elevation: -9999.0 }),
            "{warnings:?}"
        );
        assert!(
            warnings.iter().any(|w| matches!(w, GroundWarning::Jump { station, off, .. } if (*station - 200.0).abs() < 1e-9 && (*off - 7.45).abs() < 1e-9)),
            "{warnings:?}"
        );
        assert!(
            warnings.contains(&GroundWarning::Gap { from: 300.0, to: 390.0, usual: 10.0 }),
            "{warnings:?}"
        );
        assert_eq!(warnings.len(), 3, "the neighbours of the bad points are not blamed: {warnings:?}");
        let text = warnings
            .iter()
            .map(|w| w.describe(crate::Stationing::plain(Units::Metric)))
            .collect::<Vec<_>>()
            .join("\n");
        assert!(text.contains("0+050.000 has elevation -9999") && text.contains("interpolated"), "{text}");
        // A smooth survey says nothing.
        let smooth: Vec<(f64, f64)> =
            (0..=200).map(|i| (f64::from(i), 50.0 + (f64::from(i) / 9.0).sin())).collect();
        assert!(ground(&smooth).review(Units::Metric).is_empty());
    }
}
