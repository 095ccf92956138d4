//! Which PVI a sight shortfall is charged to: the curve that blocks the
//! line of sight or stops the beam, not the nearest PVI.

use crate::visibility::Direction;
use crate::{Alignment, CurveGeometry, CurveKind};

/// What limits the sight of one eye: the daylight distance's horizon (road
/// station), or the headlight distance when the beam governs.
#[derive(Clone, Copy)]
pub(super) enum Limit {
    Horizon(Option<f64>),
    Beam(f64),
}

/// The PVI whose curve (or bare grade break) blocks the sight line of an eye
/// at profile station `eye` looking `direction`: for daylight, the curve the
/// line of sight touches (at the horizon); for headlights, the last sag
/// between the eye and where the beam meets the road. Falls back to the
/// nearest PVI.
pub(super) fn blocking_pvi(
    alignment: &Alignment,
    direction: Direction,
    eye: f64,
    limit: Limit,
) -> Option<usize> {
    let to_profile = |u: f64| match direction {
        Direction::Forward => u,
        Direction::Backward => -u,
    };
    let at = to_profile(eye);
    let curves = alignment.curves();
    let span = |c: &CurveGeometry| {
        let slack = crate::tolerance::station_hair(c.pvi.0);
        (c.pvc.0 - slack, c.pvt.0 + slack)
    };
    // The curves are in station order and do not overlap (sight distance is
    // only checked on a profile without problems), so the few that can hold
    // the point are found by binary search, not by a scan per shortfall
    // (that made `check` quadratic in the number of PVIs).
    let touching = |lo: f64, hi: f64| {
        let from = curves.partition_point(|c| span(c).1 < lo);
        curves.get(from..).unwrap_or(&[]).iter().take_while(move |c| span(c).0 <= hi)
    };
    let found = match limit {
        Limit::Beam(distance) => {
            let hit = to_profile(at + distance);
            touching(eye.min(hit), eye.max(hit))
                .filter(|c| c.kind == CurveKind::Sag)
                .min_by(|x, y| (x.pvi.0 - hit).abs().total_cmp(&(y.pvi.0 - hit).abs()))
        }
        Limit::Horizon(horizon) => {
            horizon.map(to_profile).and_then(|u| touching(u, u).find(|c| c.kind == CurveKind::Crest))
        }
    };
    found.map(|c| c.index).or_else(|| nearest_pvi(alignment.pvis(), eye))
}

/// The PVI nearest `station` (the first of two as near), by binary search.
fn nearest_pvi(pvis: &[crate::Pvi], station: f64) -> Option<usize> {
    let i = pvis.partition_point(|p| p.station.0 < station);
    let distance = |k: usize| pvis.get(k).map(|p| (p.station.0 - station).abs());
    match (i.checked_sub(1).and_then(distance), distance(i)) {
        (Some(before), Some(after)) => Some(if before <= after { i - 1 } else { i }),
        (Some(_), None) => Some(i - 1),
        (None, Some(_)) => Some(i),
        (None, None) => None,
    }
}
