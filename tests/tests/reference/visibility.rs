//! Available sight distance along the profile against the closed-form
//! AASHTO length formulas inverted for S (Green Book 2018 eq. 3-41 to 3-49; equation numbers from memory), symmetry, and a
//! brute-force ray-marching reference.

use gradewright_acceptance::alignment;
use gradewright_geometry::visibility::{
    Direction, Requirement, Road, SightSetup, reference_daylight, reference_headlight, sight_profile,
    sight_profile_on, stations_every,
};
use gradewright_geometry::{Alignment, Profile, Pvi, Units, synthetic::rolling_profile};
use proptest::prelude::*;

fn setup(cap: f64, headlights: bool) -> SightSetup {
    // AASHTO metric heights (TxDOT RDM 4.11.1 / from memory for metric).
    SightSetup {
        eye_height: 1.08,
        object_height: 0.60,
        headlight_height: 0.60,
        headlight_angle_deg: 1.0,
        daylight: true,
        headlights,
        cap,
    }
}

/// A single symmetric curve at station 1000 between 1 km tangents.
fn single_curve(g1: f64, g2: f64, length: f64) -> Alignment {
    alignment(
        Units::Metric,
        &[
            (0.0, 100.0, 0.0),
            (1000.0, 100.0 + g1 * 10.0, length),
            (2000.0, 100.0 + g1 * 10.0 + g2 * 10.0, 0.0),
        ],
    )
}

fn minimum(a: &Alignment, s: &SightSetup, use_headlight: bool) -> f64 {
    let road = Road::new(a, Direction::Forward);
    let mut least = f64::INFINITY;
    let mut x = 400.0;
    while x <= 1600.0 {
        let d = if use_headlight { road.headlight(x, s) } else { road.daylight(x, s) };
        least = least.min(d);
        x += 0.25;
    }
    least
}

/// Crest, S < L: L = A·S²/C with C = 100(√(2h1) + √(2h2))² (Green Book 2018
/// eq. 3-41; from memory),
/// so S = √(L·C/A).
#[test]
fn crest_minimum_matches_inverted_formula_s_less_than_l() {
    let c = 100.0 * ((2.0f64 * 1.08).sqrt() + (2.0f64 * 0.6).sqrt()).powi(2);
    let (a, l) = (5.0, 300.0);
    let expected = (l * c / a).sqrt();
    assert!(expected < l);
    let got = minimum(&single_curve(3.0, -2.0, l), &setup(1000.0, false), false);
    assert!((got - expected).abs() / expected < 0.005, "{got} vs {expected}");
}

/// Crest, S > L: L = 2S − C/A (Green Book 2018 eq. 3-42, general form; from
/// memory), so S = (L + C/A)/2.
#[test]
fn crest_minimum_matches_inverted_formula_s_greater_than_l() {
    let c = 100.0 * ((2.0f64 * 1.08).sqrt() + (2.0f64 * 0.6).sqrt()).powi(2);
    let (a, l) = (5.0, 100.0);
    let expected = (l + c / a) / 2.0;
    assert!(expected > l);
    let got = minimum(&single_curve(3.0, -2.0, l), &setup(1000.0, false), false);
    assert!((got - expected).abs() / expected < 0.005, "{got} vs {expected}");
}

/// Sag headlight, S < L: L = A·S²/(200(H + S·tanβ)) (Green Book 2018 eq. 3-46;
/// from memory), solved for S as a quadratic.
#[test]
fn sag_headlight_minimum_matches_inverted_formula_s_less_than_l() {
    let (a, l, h, tb) = (5.0, 300.0, 0.6, 1f64.to_radians().tan());
    let k = 200.0 * tb * l;
    let expected = (k + (k * k + 800.0 * a * h * l).sqrt()) / (2.0 * a);
    assert!(expected < l);
    let got = minimum(&single_curve(-2.0, 3.0, l), &setup(1000.0, true), true);
    assert!((got - expected).abs() / expected < 0.005, "{got} vs {expected}");
}

/// Sag headlight, S > L: L = 2S − 200(H + S·tanβ)/A (Green Book 2018
/// eq. 3-47, general form; from memory), so S = (L·A + 200H)/(2A − 200·tanβ).
#[test]
fn sag_headlight_minimum_matches_inverted_formula_s_greater_than_l() {
    let (a, l, h, tb) = (5.0, 60.0, 0.6, 1f64.to_radians().tan());
    let expected = (l * a + 200.0 * h) / (2.0 * a - 200.0 * tb);
    assert!(expected > l);
    let got = minimum(&single_curve(-2.0, 3.0, l), &setup(1000.0, true), true);
    assert!((got - expected).abs() / expected < 0.005, "{got} vs {expected}");
}

/// Flat and constant-grade profiles offer the cap everywhere (common practice:
/// nothing hides the road and the beam never meets it).
#[test]
fn flat_and_constant_grade_give_the_cap() {
    for rise in [0.0, 40.0, -40.0] {
        let a = alignment(
            Units::Metric,
            &[(0.0, 100.0, 0.0), (500.0, 100.0 + rise / 2.0, 0.0), (1000.0, 100.0 + rise, 0.0)],
        );
        let stations = stations_every(&a, 10.0);
        let p = sight_profile(&a, &setup(400.0, true), Requirement::Design(130.0), &stations);
        for s in &p.samples {
            assert!((s.forward - 400.0).abs() < 1e-9 && (s.backward - 400.0).abs() < 1e-9, "{s:?}");
        }
    }
}

/// Mirroring the profile (s → L − s) swaps the directions (common practice).
#[test]
fn mirrored_profile_swaps_directions() {
    let pvis = [(0.0, 100.0, 0.0), (300.0, 109.0, 150.0), (700.0, 101.0, 220.0), (1000.0, 106.0, 0.0)];
    let a = alignment(Units::Metric, &pvis);
    let mirrored: Vec<(f64, f64, f64)> = pvis.iter().rev().map(|&(s, e, l)| (1000.0 - s, e, l)).collect();
    let b = alignment(Units::Metric, &mirrored);
    let s = setup(500.0, true);
    let stations = stations_every(&a, 5.0);
    let back: Vec<f64> = stations.iter().map(|x| 1000.0 - x).rev().collect();
    let pa = sight_profile(&a, &s, Requirement::Design(130.0), &stations);
    let pb = sight_profile(&b, &s, Requirement::Design(130.0), &back);
    for (x, y) in pa.samples.iter().zip(pb.samples.iter().rev()) {
        assert!((x.forward - y.backward).abs() < 1e-6, "{x:?} {y:?}");
        assert!((x.backward - y.forward).abs() < 1e-6, "{x:?} {y:?}");
    }
}

fn random_profile() -> impl Strategy<Value = Alignment> {
    (3usize..8, proptest::collection::vec((80.0f64..400.0, -6.0f64..6.0, 0.1f64..0.9), 8)).prop_map(
        |(n, legs)| {
            let mut pvis = vec![Pvi::new(0.0, 100.0)];
            for &(dx, g, _) in legs.iter().take(n - 1) {
                let last = pvis[pvis.len() - 1];
                pvis.push(Pvi::new(last.station.0 + dx, last.elevation + g / 100.0 * dx));
            }
            for i in 1..pvis.len() - 1 {
                let room = (pvis[i].station - pvis[i - 1].station).min(pvis[i + 1].station - pvis[i].station);
                pvis[i] = Pvi::with_curve(pvis[i].station.0, pvis[i].elevation, room * legs[i].2);
            }
            Alignment::new(&Profile::new(Units::Metric, pvis)).unwrap_or_else(|e| panic!("{e:?}"))
        },
    )
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 48, ..ProptestConfig::default() })]

    /// Fast exact method vs the brute-force reference, at random stations, both
    /// directions: within 0.2 m + 0.5 % (the grid step is 0.05 m).
    #[test]
    fn fast_method_matches_brute_force(a in random_profile(), picks in proptest::collection::vec(0.0f64..1.0, 6)) {
        let s = setup(300.0, true);
        for direction in [Direction::Forward, Direction::Backward] {
            let road = Road::new(&a, direction);
            for &f in &picks {
                let x = a.start().0 + f * (a.end() - a.start());
                let at = if direction == Direction::Forward { x } else { -x };
                let fast = road.daylight(at, &s);
                let slow = reference_daylight(&road, at, &s, 0.05);
                prop_assert!((fast - slow).abs() <= 0.2 + 0.005 * slow, "daylight {direction:?} at {x}: {fast} vs {slow}");
                let fast = road.headlight(at, &s);
                let slow = reference_headlight(&road, at, &s, 0.05);
                prop_assert!((fast - slow).abs() <= 0.2 + 0.005 * slow, "headlight {direction:?} at {x}: {fast} vs {slow}");
            }
        }
    }
}

/// Grade-adjusted requirement: on a steady −3 % grade at 50 km/h a vehicle
/// going down needs 65.8 m (derived from Green Book 2018 eq. 3-3,
/// 0.278Vt + V²/(254(a/9.81 + G)); from memory); one going up would need
/// 60.9 m, less than the design SSD of 65 m (Table 3-1), which is the floor.
#[test]
fn grade_adjusted_requirement_follows_the_direction_of_travel() {
    let a = alignment(Units::Metric, &[(0.0, 100.0, 0.0), (1000.0, 70.0, 0.0)]);
    let requirement = Requirement::GradeAdjusted {
        units: Units::Metric,
        speed: 50.0,
        reaction_s: 2.5,
        decel: 3.4,
        floor: 65.0,
    };
    let p = sight_profile(&a, &setup(400.0, true), requirement, &[250.0, 500.0]);
    for s in &p.samples {
        assert!((s.required_forward - 65.8).abs() < 0.05, "{s:?}");
        assert!((s.required_backward - 65.0).abs() < 1e-12, "{s:?}");
    }
}

/// Sharing the stations out over threads changes nothing, bit for bit, and
/// the piece found by walking from the previous station is the one a search
/// finds (every sample equals the station computed alone).
#[test]
fn threads_and_walking_do_not_change_the_result() {
    let a =
        Alignment::new(&rolling_profile(Units::Metric, 200, 20_000.0)).unwrap_or_else(|e| panic!("{e:?}"));
    let stations = stations_every(&a, 1.0);
    let s = setup(480.0, true);
    let requirement = Requirement::Design(160.0);
    let one = sight_profile_on(&a, &s, requirement, &stations, 1);
    for threads in [2, 3, 7] {
        assert_eq!(sight_profile_on(&a, &s, requirement, &stations, threads), one, "{threads} threads");
    }
    assert_eq!(sight_profile(&a, &s, requirement, &stations), one);
    let (ahead, behind) = (Road::new(&a, Direction::Forward), Road::new(&a, Direction::Backward));
    for sample in one.samples.iter().step_by(37) {
        assert_eq!(
            sample.forward.to_bits(),
            ahead.governing(sample.station, &s).to_bits(),
            "at {}",
            sample.station
        );
        assert_eq!(
            sample.backward.to_bits(),
            behind.governing(-sample.station, &s).to_bits(),
            "at {}",
            sample.station
        );
    }
    // Something is measured: on this rolling profile crests hide the object.
    assert!(one.samples.iter().filter(|x| !one.reaches_cap(x.forward)).count() > 1000);
}

/// A long profile computed one stretch of PVIs at a time gives the whole
/// profile's samples bit for bit, for the design SSD and for the
/// grade-adjusted requirement (which looks furthest ahead), with stretches
/// far shorter than the cap.
#[test]
fn stretch_by_stretch_is_the_whole_profile() {
    use gradewright_geometry::{Criteria, Streamed, compute_sight, sight_by_stretch};
    let profile = rolling_profile(Units::Metric, 300, 15_000.0);
    let a = Alignment::new(&profile).unwrap_or_else(|e| panic!("{e:?}"));
    for grade_adjusted in [false, true] {
        let criteria =
            Criteria { design_speed: Some(90.0), grade_adjusted_ssd: grade_adjusted, ..Criteria::default() }
                .resolve(Units::Metric)
                .unwrap_or_else(|e| panic!("{e}"));
        let whole = compute_sight(&a, &criteria).unwrap_or_else(|| panic!("stations"));
        for each in [1, 3, 40] {
            let mut samples = Vec::new();
            let done = sight_by_stretch(&profile, &criteria, each, |block| {
                samples.extend_from_slice(&block.samples);
                Ok::<(), ()>(())
            });
            assert_eq!(done, Ok(Streamed::Done));
            assert_eq!(samples.len(), whole.samples.len(), "{each} PVIs a stretch");
            for (x, y) in samples.iter().zip(&whole.samples) {
                assert_eq!(x, y, "{each} PVIs a stretch, grade adjusted: {grade_adjusted}");
            }
        }
    }
    let tiny = Criteria {
        design_speed: Some(90.0),
        sight_step: gradewright_geometry::Setting::Override(1e-4),
        ..Criteria::default()
    }
    .resolve(Units::Metric)
    .unwrap_or_else(|e| panic!("{e}"));
    assert_eq!(sight_by_stretch(&profile, &tiny, 40, |_| Ok::<(), ()>(())), Ok(Streamed::TooManyStations));
}

/// Passing whole blocks of road (when their highest and lowest points show
/// nothing in them can hide the object or stop the beam) changes no result,
/// bit for bit, against the walk piece by piece: daylight distance, its
/// horizon and headlight distance, both directions, every 0.7 m over a
/// sparse and a dense rolling profile and over random profiles, with long
/// and short caps.
#[test]
fn passing_blocks_changes_nothing() {
    let mut alignments: Vec<Alignment> = [(200, 20_000.0), (1001, 20_000.0), (3001, 9_000.0)]
        .into_iter()
        .map(|(n, l)| {
            Alignment::new(&rolling_profile(Units::Metric, n, l)).unwrap_or_else(|e| panic!("{e:?}"))
        })
        .collect();
    let mut runner = proptest::test_runner::TestRunner::deterministic();
    for _ in 0..40 {
        let tree = random_profile().new_tree(&mut runner).unwrap_or_else(|e| panic!("{e}"));
        alignments.push(proptest::strategy::ValueTree::current(&tree));
    }
    let mut compared = 0u64;
    for a in &alignments {
        for cap in [480.0, 150.0, 2000.0] {
            let s = setup(cap, true);
            for direction in [Direction::Forward, Direction::Backward] {
                let blocked = Road::new(a, direction);
                let plain = Road::new(a, direction).piece_by_piece();
                let (from, to) = (a.start().0, a.end().0.min(a.start().0 + 6000.0));
                let mut x = from;
                while x <= to {
                    let at = if direction == Direction::Forward { x } else { -x };
                    let (d1, h1) = blocked.daylight_and_horizon(at, &s);
                    let (d2, h2) = plain.daylight_and_horizon(at, &s);
                    assert_eq!(d1.to_bits(), d2.to_bits(), "daylight {direction:?} at {x}, cap {cap}");
                    assert_eq!(h1.map(f64::to_bits), h2.map(f64::to_bits), "horizon {direction:?} at {x}");
                    let (l1, l2) = (blocked.headlight(at, &s), plain.headlight(at, &s));
                    assert_eq!(l1.to_bits(), l2.to_bits(), "headlight {direction:?} at {x}, cap {cap}");
                    compared += 1;
                    x += 0.7;
                }
            }
        }
    }
    assert!(compared > 100_000, "{compared}");
}
