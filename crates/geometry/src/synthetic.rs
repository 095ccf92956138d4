//! Synthetic profiles for benchmarks and tests (not design data).

use crate::{Profile, Pvi, Units};

/// A rolling profile of `pvis` PVIs spread evenly over `length`, with grades
/// alternating up and down between about 1 % and 4 % (a fixed pseudo-random
/// sequence, so every run sees the same profile), and a symmetric curve at
/// every interior PVI filling 60 % of the shorter neighbouring half-tangent.
pub fn rolling_profile(units: Units, pvis: usize, length: f64) -> Profile {
    let n = pvis.max(2);
    #[allow(clippy::cast_precision_loss)]
    let spacing = length / (n - 1) as f64;
    let mut state: u64 = 0x9E37_79B9_7F4A_7C15;
    let mut next = || {
        // xorshift64: deterministic, dependency-free.
        state ^= state << 13;
        state ^= state >> 7;
        state ^= state << 17;
        #[allow(clippy::cast_precision_loss)]
        let unit = (state >> 11) as f64 / (1u64 << 53) as f64;
        unit
    };
    let mut list = Vec::with_capacity(n);
    let mut elevation = 100.0;
    for i in 0..n {
        #[allow(clippy::cast_precision_loss)]
        let station = i as f64 * spacing;
        list.push(Pvi::new(station, elevation));
        let sign = if i % 2 == 0 { 1.0 } else { -1.0 };
        elevation += sign * (1.0 + 3.0 * next()) / 100.0 * spacing;
    }
    for i in 1..n - 1 {
        let length = 0.6 * spacing;
        if let Some(p) = list.get_mut(i) {
            *p = Pvi::with_curve(p.station.0, p.elevation, length);
        }
    }
    Profile::new(units, list)
}
