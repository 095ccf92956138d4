//! Editing rules shared by every front end: how far a PVI may move, and where a
//! new PVI may go.

use crate::{Alignment, Profile, Pvi, Station};

impl Profile {
    /// The station range PVI `index` may move in without passing a neighbour or
    /// making its curve overlap a neighbour's (or leave its tangent). For the
    /// first and last PVI only the inner side is limited. `None` when the
    /// PVI does not exist or the range is empty (the profile already overlaps).
    pub fn station_limits(&self, index: usize) -> Option<(f64, f64)> {
        let pvi = self.pvis.get(index)?;
        let low = match index.checked_sub(1).and_then(|i| self.pvis.get(i)) {
            Some(prev) => prev.pvt() + pvi.curve.length_in(),
            None => f64::NEG_INFINITY,
        };
        let high = match self.pvis.get(index + 1) {
            Some(next) => next.pvc() - pvi.curve.length_out(),
            None => f64::INFINITY,
        };
        // A PVI never sits exactly on its neighbour: keep a hair of room.
        let room = crate::tolerance::station_hair(low.abs().min(high.abs()).min(1e12));
        let (low, high) = (
            if index > 0 { low + room } else { low },
            if index + 1 < self.pvis.len() { high - room } else { high },
        );
        (low <= high).then_some((low, high))
    }

    /// Moves PVI `index` towards (`station`, `elevation`), clamping the station to
    /// [`Profile::station_limits`] (it stays put when the range is empty).
    /// Returns the PVI as placed.
    pub fn move_pvi_clamped(&self, index: usize, station: f64, elevation: f64) -> Option<Pvi> {
        let pvi = *self.pvis.get(index)?;
        let station = match self.station_limits(index) {
            Some((low, high)) if station.is_finite() => station.clamp(low, high),
            _ => pvi.station.0,
        };
        let elevation = if elevation.is_finite() { elevation } else { pvi.elevation };
        Some(Pvi { station: Station(station), elevation, ..pvi })
    }
}

/// Why a PVI cannot be inserted at a station.
#[derive(Clone, Debug, PartialEq, thiserror::Error)]
pub enum InsertError {
    /// The station is outside the profile.
    #[error("station {0} is outside the profile")]
    Outside(f64),
    /// The station lies on a vertical curve.
    #[error("station {station} lies on the curve at PVI {}; insert on a tangent", .pvi + 1)]
    OnCurve {
        /// The station asked for.
        station: f64,
        /// The PVI whose curve it is on.
        pvi: usize,
    },
    /// The station is (almost) that of an existing PVI.
    #[error("station {station} is at PVI {}", .pvi + 1)]
    AtPvi {
        /// The station asked for.
        station: f64,
        /// The PVI there.
        pvi: usize,
    },
}

impl Alignment {
    /// A new PVI on the tangent at `station` (on the profile, so the profile's
    /// shape is unchanged until it is moved) and the index it goes at.
    ///
    /// # Errors
    /// [`InsertError`] when the station is outside, on a curve, or at a PVI.
    pub fn insertion(&self, station: f64) -> Result<(usize, Pvi), InsertError> {
        // Closer than a hair of the profile's length is at the PVI.
        let tolerance = crate::tolerance::station_hair(self.end() - self.start());
        if !(station > self.start().0 && station < self.end().0) {
            if let Some(i) = self.pvis().iter().position(|p| (p.station.0 - station).abs() <= tolerance) {
                return Err(InsertError::AtPvi { station, pvi: i });
            }
            return Err(InsertError::Outside(station));
        }
        if let Some(i) = self.pvis().iter().position(|p| (p.station.0 - station).abs() <= tolerance) {
            return Err(InsertError::AtPvi { station, pvi: i });
        }
        if let Some(c) =
            self.curves().iter().find(|c| c.length() > 0.0 && station > c.pvc.0 && station < c.pvt.0)
        {
            return Err(InsertError::OnCurve { station, pvi: c.index });
        }
        let index = self.pvis().partition_point(|p| p.station.0 < station);
        let sample = self.sample(Station(station)).map_err(|_| InsertError::Outside(station))?;
        Ok((index, Pvi::new(station, sample.elevation)))
    }
}
