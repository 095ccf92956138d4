//! Unit systems. A project is either metric or US customary, never both.

use serde::{Deserialize, Serialize};

/// The unit system of a project: every length, station and elevation in it is in
/// this system's length unit, and the design speed in its speed unit.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize, Deserialize, Default)]
pub enum Units {
    /// Metres, km/h, stations of 1000 m written `1+234.567`.
    #[default]
    Metric,
    /// Feet, mph, stations of 100 ft written `12+34.56`. Which foot (the
    /// international foot or the US survey foot) is recorded apart, as a
    /// [`Foot`]; values are never converted between the two feet.
    UsCustomary,
}

/// Which foot a US customary project's lengths are in. The two differ by
/// 2 parts per million; a profile keeps the numbers its source gave and
/// records the foot, so that a file exchanged with other tools says the
/// same foot it was read in. Only conversions to metres use it.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize, Deserialize, Default)]
pub enum Foot {
    /// The international foot, exactly 0.3048 m (the only US foot since the
    /// start of 2023: NIST and NOAA, "Deprecation of the United States (U.S.)
    /// Survey Foot", Federal Register 85 FR 62698, 5 October 2020, from memory).
    #[default]
    International,
    /// The US survey foot, exactly 1200/3937 m (retired at the end of 2022,
    /// still met in older survey data).
    UsSurvey,
}

impl Foot {
    /// Metres in one foot of this kind (0.3048, or 1200/3937).
    pub fn metres(self) -> f64 {
        match self {
            Self::International => 0.3048,
            Self::UsSurvey => 1200.0 / 3937.0,
        }
    }

    /// Whether this is the default (international) foot.
    pub fn is_default(&self) -> bool {
        *self == Self::default()
    }
}

/// The factor that turns a length in `from` (with its foot) into a length in
/// `to` (with its foot): 1 when the systems and feet agree.
pub fn length_factor(from: Units, from_foot: Foot, to: Units, to_foot: Foot) -> f64 {
    let metres = |units: Units, foot: Foot| match units {
        Units::Metric => 1.0,
        Units::UsCustomary => foot.metres(),
    };
    let (a, b) = (metres(from, from_foot), metres(to, to_foot));
    if a.to_bits() == b.to_bits() { 1.0 } else { a / b }
}

/// `value` to `decimals` places without trailing zeros ("80", "49.71",
/// "0.3"); a value that rounds to zero is "0", never "-0".
pub fn trimmed(value: f64, decimals: usize) -> String {
    let text = format!("{value:.decimals$}");
    let text = if text.contains('.') { text.trim_end_matches('0').trim_end_matches('.') } else { &text };
    if text == "-0" { "0".to_owned() } else { text.to_owned() }
}

/// `value` as a message shows it: plainly with up to six decimals, or in
/// exponent form when it is huge or tiny (never 309 digits for 1e308).
pub fn shown(value: f64) -> String {
    let magnitude = value.abs();
    if value.is_finite() && (magnitude >= 1.0e9 || (magnitude > 0.0 && magnitude < 1.0e-6)) {
        format!("{value:e}")
    } else {
        trimmed(value, 6)
    }
}

/// Kilometres in a mile: exactly 1.609344 (the international mile, 5280
/// international feet).
pub const KM_PER_MILE: f64 = 1.609_344;

/// The factor that turns a speed in `from`'s unit (km/h or mph) into a
/// speed in `to`'s: 1 when they agree.
pub fn speed_factor(from: Units, to: Units) -> f64 {
    match (from, to) {
        (Units::Metric, Units::UsCustomary) => 1.0 / KM_PER_MILE,
        (Units::UsCustomary, Units::Metric) => KM_PER_MILE,
        _ => 1.0,
    }
}

impl Units {
    /// Length of one full station in the project's length unit (1000 m or 100 ft).
    pub fn station_length(self) -> f64 {
        match self {
            Self::Metric => 1000.0,
            Self::UsCustomary => 100.0,
        }
    }

    /// Digits after the `+` in station notation before the decimal point.
    pub fn station_digits(self) -> usize {
        match self {
            Self::Metric => 3,
            Self::UsCustomary => 2,
        }
    }

    /// Decimals usually shown for stations (3 for m, 2 for ft; common practice).
    pub fn station_decimals(self) -> usize {
        match self {
            Self::Metric => 3,
            Self::UsCustomary => 2,
        }
    }

    /// The default station interval of tables and the earthwork estimate:
    /// 20 m or 50 ft (common practice).
    pub fn table_interval(self) -> f64 {
        match self {
            Self::Metric => 20.0,
            Self::UsCustomary => 50.0,
        }
    }

    /// The default increment curve lengths are rounded up to (Lengthen to
    /// clear, a new PVI's curve): 5 m or 10 ft (common practice).
    pub fn curve_length_increment(self) -> f64 {
        match self {
            Self::Metric => 5.0,
            Self::UsCustomary => 10.0,
        }
    }

    /// Symbol of the length unit: `m` or `ft`.
    pub fn length_symbol(self) -> &'static str {
        match self {
            Self::Metric => "m",
            Self::UsCustomary => "ft",
        }
    }

    /// The design speeds the published SSD and K tables cover (Green Book
    /// 2018 Tables 3-1, 3-34, 3-36: 20–130 km/h, 15–80 mph, from memory),
    /// and their row spacing (10 km/h, 5 mph). Gradewright checks only
    /// design speeds within them.
    pub fn design_speed_table(self) -> (f64, f64, f64) {
        match self {
            Self::Metric => (20.0, 130.0, 10.0),
            Self::UsCustomary => (15.0, 80.0, 5.0),
        }
    }

    /// The coarsest sight-distance step: 10 m or 30 ft (a stretch that falls
    /// short can be a few metres long, and a coarser step could miss it;
    /// common practice).
    pub fn max_sight_step(self) -> f64 {
        match self {
            Self::Metric => 10.0,
            Self::UsCustomary => 30.0,
        }
    }

    /// Symbol of the speed unit: `km/h` or `mph`.
    pub fn speed_symbol(self) -> &'static str {
        match self {
            Self::Metric => "km/h",
            Self::UsCustomary => "mph",
        }
    }

    /// Symbol of acceleration: `m/s²` or `ft/s²`.
    pub fn acceleration_symbol(self) -> &'static str {
        match self {
            Self::Metric => "m/s²",
            Self::UsCustomary => "ft/s²",
        }
    }

    /// Symbol of K (length per percent of grade change): `m/%` or `ft/%`.
    pub fn k_symbol(self) -> &'static str {
        match self {
            Self::Metric => "m/%",
            Self::UsCustomary => "ft/%",
        }
    }

    /// The short name used on the command line and in JSON: `metric` or `us`.
    pub fn key(self) -> &'static str {
        match self {
            Self::Metric => "metric",
            Self::UsCustomary => "us",
        }
    }

    /// Parses the short name (`metric`/`m`/`si` or `us`/`ft`/`imperial`), case-insensitive.
    pub fn from_key(text: &str) -> Option<Self> {
        match text.trim().to_ascii_lowercase().as_str() {
            "metric" | "m" | "si" => Some(Self::Metric),
            "us" | "ft" | "us-customary" | "imperial" => Some(Self::UsCustomary),
            _ => None,
        }
    }

    /// Standard gravity in this system's length unit per s² (9.81 m/s², 32.2 ft/s²,
    /// the values in the AASHTO grade-adjusted stopping sight distance formula).
    pub fn gravity(self) -> f64 {
        match self {
            Self::Metric => 9.81,
            Self::UsCustomary => 32.2,
        }
    }

    /// Metres or feet per second in one km/h or mph (1/3.6 or 5280/3600).
    pub fn speed_to_length_per_second(self) -> f64 {
        match self {
            Self::Metric => 1.0 / 3.6,
            Self::UsCustomary => 5280.0 / 3600.0,
        }
    }
}

impl std::fmt::Display for Units {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(match self {
            Self::Metric => "metric (m, km/h)",
            Self::UsCustomary => "US customary (ft, mph)",
        })
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn messages_show_huge_and_tiny_numbers_short() {
        assert_eq!(shown(1e308), "1e308");
        assert_eq!(shown(1e-9), "1e-9");
        assert_eq!(shown(-12.5), "-12.5");
        assert_eq!(shown(0.0), "0");
    }

    #[test]
    fn trimmed_numbers_drop_trailing_zeros_only() {
        assert_eq!(trimmed(80.0, 2), "80");
        assert_eq!(trimmed(80.0 / KM_PER_MILE, 2), "49.71");
        assert_eq!(trimmed(0.1 + 0.2, 6), "0.3");
        assert_eq!(trimmed(-0.000_000_1, 6), "0");
        assert_eq!(trimmed(1200.0, 0), "1200");
        assert_eq!(trimmed(215.125, 6), "215.125");
    }

    #[test]
    fn speeds_convert_by_the_international_mile() {
        assert!((50.0 * speed_factor(Units::UsCustomary, Units::Metric) - 80.4672).abs() < 1e-12);
        assert!((speed_factor(Units::Metric, Units::UsCustomary) * KM_PER_MILE - 1.0).abs() < 1e-15);
        assert_eq!(speed_factor(Units::Metric, Units::Metric).to_bits(), 1.0_f64.to_bits());
    }
}
