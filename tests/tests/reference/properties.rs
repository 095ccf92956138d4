//! Property tests on random valid profiles (common practice for curve code):
//! continuity at every PVC and PVT, grade = d(elevation)/dx, y″ = r, K·A = L.

use gradewright_geometry::{Alignment, Profile, Pvi, Station, Units};
use proptest::prelude::*;

/// Random valid profiles: 3–12 PVIs, spacing 50–500, grades within ±8 %,
/// symmetric curves taking 0–90 % of the room their tangents leave.
fn profiles() -> impl Strategy<Value = Profile> {
    (3usize..12)
        .prop_flat_map(|n| {
            (
                proptest::collection::vec(50.0f64..500.0, n - 1),
                proptest::collection::vec(-8.0f64..8.0, n - 1),
                proptest::collection::vec(0.0f64..0.9, n),
            )
        })
        .prop_map(|(spacing, grades, fill)| {
            let mut pvis = vec![Pvi::new(1000.0, 200.0)];
            for (dx, g) in spacing.iter().zip(&grades) {
                let last = pvis[pvis.len() - 1];
                pvis.push(Pvi::new(last.station.0 + dx, last.elevation + g / 100.0 * dx));
            }
            let n = pvis.len();
            for i in 1..n - 1 {
                let back = (pvis[i].station - pvis[i - 1].station) / 2.0;
                let ahead = (pvis[i + 1].station - pvis[i].station) / 2.0;
                let half = back.min(ahead) * fill[i];
                pvis[i] = Pvi::with_curve(pvis[i].station.0, pvis[i].elevation, 2.0 * half);
            }
            Profile::new(Units::Metric, pvis)
        })
}

/// Random profiles whose curves leave no tangent at all: every tangent is
/// shared between the curve at each end, split at a random fraction, so the
/// curves touch (their PVT and PVC equal but for round-off), unequal-tangent
/// unless the split is even; the first and last curves fill their outer
/// tangents to the end PVI. Stations with decimals, so the round-off is real.
fn touching_profiles() -> impl Strategy<Value = Profile> {
    (3usize..10)
        .prop_flat_map(|n| {
            (
                proptest::collection::vec(40.0f64..400.0, n - 1),
                proptest::collection::vec(-7.0f64..7.0, n - 1),
                proptest::collection::vec(0.15f64..0.85, n - 1),
            )
        })
        .prop_map(|(spacing, grades, split)| {
            let mut stations = vec![1000.3];
            let mut elevations = vec![200.7];
            for (dx, g) in spacing.iter().zip(&grades) {
                let (s, y) = (stations[stations.len() - 1], elevations[elevations.len() - 1]);
                stations.push(s + dx + 0.1);
                elevations.push(y + g / 100.0 * (dx + 0.1));
            }
            let n = stations.len();
            let mut pvis: Vec<Pvi> = (0..n).map(|i| Pvi::new(stations[i], elevations[i])).collect();
            for i in 1..n - 1 {
                // The share of tangent i − 1 (back) and of tangent i (ahead).
                let back_share = if i == 1 { 1.0 } else { 1.0 - split[i - 1] };
                let ahead_share = if i == n - 2 { 1.0 } else { split[i] };
                let back = (stations[i] - stations[i - 1]) * back_share;
                let ahead = (stations[i + 1] - stations[i]) * ahead_share;
                pvis[i].curve = gradewright_geometry::VerticalCurve::from_lengths(back, ahead);
            }
            Profile::new(Units::Metric, pvis)
        })
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 256, ..ProptestConfig::default() })]

    /// Curves that exactly touch, or exactly fill their tangent, are a valid
    /// profile whatever the round-off (they do not overlap), continuous where
    /// they meet.
    #[test]
    fn touching_and_unequal_curves_are_valid_and_continuous(profile in touching_profiles()) {
        let problems = profile.problems();
        prop_assert!(problems.is_empty(), "{problems:?}");
        let a = Alignment::new(&profile).map_err(|e| TestCaseError::fail(format!("{e:?}")))?;
        for pair in a.curves().windows(2) {
            let [c, d] = pair else { continue };
            // Where one curve hands over to the next: the same elevation and
            // grade from both sides (the tangent between them has no length).
            let at = 0.5 * (c.pvt.0 + d.pvc.0);
            let meet = a.sample(Station(at)).map_err(|e| TestCaseError::fail(e.to_string()))?;
            prop_assert!((meet.elevation - c.pvt_elevation).abs() < 1e-6, "{} vs {}", meet.elevation, c.pvt_elevation);
            prop_assert!((meet.elevation - d.pvc_elevation).abs() < 1e-6);
            prop_assert!((c.grade_out_percent - d.grade_in_percent).abs() < 1e-9, "one tangent between them");
        }
        let (start, end) = (a.start().0, a.end().0);
        for k in 0..=200 {
            let s = (start + (end - start) * f64::from(k) / 200.0).min(end);
            let p = a.sample(Station(s)).map_err(|e| TestCaseError::fail(e.to_string()))?;
            prop_assert!(p.elevation.is_finite() && p.grade_percent.is_finite());
        }
    }

    #[test]
    fn continuous_at_pvc_and_pvt(profile in profiles()) {
        let a = Alignment::new(&profile).map_err(|e| TestCaseError::fail(format!("{e:?}")))?;
        let eps = 1e-7;
        // A bare grade break (no curve) has a grade step by definition.
        for c in a.curves().iter().filter(|c| c.length() > 0.0) {
            for s in [c.pvc.0, c.pvt.0] {
                let lo = a.sample(Station(s - eps)).map_err(|e| TestCaseError::fail(e.to_string()))?;
                let hi = a.sample(Station(s + eps)).map_err(|e| TestCaseError::fail(e.to_string()))?;
                prop_assert!((lo.elevation - hi.elevation).abs() < 1e-6, "elevation jump at {s}");
                // Within the curve the grade moves by r per unit length: allow 2·eps·|r|.
                let (r, _) = c.rates_percent();
                let allowed = 2.0 * eps * r.abs() + 1e-6;
                prop_assert!((lo.grade_percent - hi.grade_percent).abs() < allowed, "grade jump at {s}");
            }
            // The curve meets its tangents at the PVC and PVT elevations.
            let pvc = a.sample(c.pvc).map_err(|e| TestCaseError::fail(e.to_string()))?;
            prop_assert!((pvc.elevation - c.pvc_elevation).abs() < 1e-9);
            let pvt = a.sample(c.pvt).map_err(|e| TestCaseError::fail(e.to_string()))?;
            prop_assert!((pvt.elevation - c.pvt_elevation).abs() < 1e-9);
        }
    }

    #[test]
    fn grade_is_the_derivative_and_curvature_is_r(profile in profiles(), t in 0.01f64..0.99) {
        let a = Alignment::new(&profile).map_err(|e| TestCaseError::fail(format!("{e:?}")))?;
        let h = 1e-3;
        for c in a.curves().iter().filter(|c| c.length() > 1.0) {
            let s = c.pvc.0 + t * c.length();
            let at = |x: f64| a.sample(Station(x)).map(|p| (p.elevation, p.grade_percent));
            let (y_lo, g_lo) = at(s - h).map_err(|e| TestCaseError::fail(e.to_string()))?;
            let (_, g) = at(s).map_err(|e| TestCaseError::fail(e.to_string()))?;
            let (y_hi, g_hi) = at(s + h).map_err(|e| TestCaseError::fail(e.to_string()))?;
            let slope = (y_hi - y_lo) / (2.0 * h) * 100.0;
            prop_assert!((slope - g).abs() < 1e-5, "grade {g} vs finite difference {slope}");
            let (r, _) = c.rates_percent();
            let curvature = (g_hi - g_lo) / (2.0 * h);
            prop_assert!((curvature - r).abs() < 1e-6, "y'' {curvature} vs r {r}");
            if let Some(k) = c.k() {
                prop_assert!((k * c.a_percent() - c.length()).abs() < 1e-6 * c.length().max(1.0));
            }
        }
    }

    #[test]
    fn cursor_matches_random_access(profile in profiles(), n in 2usize..400) {
        let a = Alignment::new(&profile).map_err(|e| TestCaseError::fail(format!("{e:?}")))?;
        let (start, end) = (a.start().0, a.end().0);
        let mut cursor = a.cursor();
        for i in 0..=n {
            let s = start + (end - start) * (i as f64) / (n as f64);
            let s = s.min(end);
            let one = a.sample(Station(s)).map_err(|e| TestCaseError::fail(e.to_string()))?;
            let two = cursor.sample(Station(s)).map_err(|e| TestCaseError::fail(e.to_string()))?;
            prop_assert_eq!(one, two);
        }
    }
}
