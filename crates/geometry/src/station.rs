//! Stations: positions along the alignment, and their `12+34.56` notation.
//!
//! A [`Station`] is a position; the difference of two stations is a plain length
//! (`f64`, in the project's length unit). Adding two stations does not compile.

use std::cmp::Ordering;
use std::ops::{Add, Sub};

use serde::{Deserialize, Serialize};

use crate::Units;

/// A position along the alignment, in the project's length unit (m or ft).
#[derive(Clone, Copy, Debug, PartialEq, PartialOrd, Default, Serialize, Deserialize)]
#[serde(transparent)]
pub struct Station(pub f64);

impl Station {
    /// The station as a plain number (distance in the project's length unit).
    pub fn value(self) -> f64 {
        self.0
    }

    /// Total order (NaN last), for sorting.
    pub fn total_cmp(&self, other: &Self) -> Ordering {
        self.0.total_cmp(&other.0)
    }

    /// Formats in station notation for `units` with `decimals` decimals.
    pub fn label(self, units: Units, decimals: usize) -> String {
        format_station(self.0, units, decimals)
    }
}

impl Sub for Station {
    type Output = f64;
    fn sub(self, rhs: Self) -> f64 {
        self.0 - rhs.0
    }
}

impl Add<f64> for Station {
    type Output = Station;
    fn add(self, rhs: f64) -> Station {
        Station(self.0 + rhs)
    }
}

impl Sub<f64> for Station {
    type Output = Station;
    fn sub(self, rhs: f64) -> Station {
        Station(self.0 - rhs)
    }
}

/// Why a station could not be read.
#[derive(Clone, Debug, PartialEq, thiserror::Error)]
pub enum StationError {
    /// Nothing was given.
    #[error("empty station")]
    Empty,
    /// The text is neither a number nor station notation.
    #[error("'{0}' is not a station (expected e.g. {1} or a plain number)")]
    Malformed(String, &'static str),
    /// The part after `+` is a full station or more.
    #[error("'{text}': the part after '+' must be less than {limit}")]
    OffsetTooLarge {
        /// The text as given.
        text: String,
        /// One station length.
        limit: f64,
    },
    /// The number is infinite or not a number.
    #[error("'{0}' is not a finite station")]
    NotFinite(String),
    /// The number is finite but beyond any road.
    #[error("station '{0}' is outside ±1e7, the range Gradewright accepts")]
    OutOfRange(String),
    /// The plan station lies in the gap of a short station equation.
    #[error(
        "station '{text}' does not exist: it lies in the gap of the station equation {back} back = {ahead} ahead"
    )]
    InGap {
        /// The text as given.
        text: String,
        /// The equation's back station.
        back: String,
        /// The equation's ahead station.
        ahead: String,
    },
    /// The plan station occurs more than once (a long station equation).
    #[error("station '{text}' occurs {} times (a station equation repeats it): say which, {}", choices.len(), choices.join(" or "))]
    Ambiguous {
        /// The text as given.
        text: String,
        /// Each place it occurs, labelled as it must be typed.
        choices: Vec<String>,
    },
    /// An occurrence was named that there is not.
    #[error("station '{text}': the station occurs {count} time(s) only")]
    NoSuchOccurrence {
        /// The text as given.
        text: String,
        /// How many times it occurs.
        count: usize,
    },
}

/// An example of the notation, for messages.
fn example(units: Units) -> &'static str {
    match units {
        Units::Metric => "1+234.567",
        Units::UsCustomary => "12+34.56",
    }
}

/// The stations on whole multiples of `interval` from `from` to `to` (both
/// included when on a multiple), in order: plan stationing, as tables and
/// cross-sections are stationed (12+50, 13+00, … on a road starting at
/// 12+34.56; common practice). Nothing for an interval that is not a
/// positive number; at most ten million stations.
pub fn even_stations(from: f64, to: f64, interval: f64) -> impl Iterator<Item = f64> {
    let usable = interval.is_finite() && interval > 0.0 && from.is_finite() && to.is_finite();
    let (first, last) = if usable {
        (
            (from / interval - crate::tolerance::ROUNDING_HAIR).ceil(),
            (to / interval + crate::tolerance::ROUNDING_HAIR).floor().min((from / interval).ceil() + 1.0e7),
        )
    } else {
        (1.0, 0.0)
    };
    #[allow(clippy::cast_possible_truncation)]
    let (first, last) = (first as i64, last as i64);
    #[allow(clippy::cast_precision_loss)]
    (first..=last).map(move |k| k as f64 * interval)
}

/// Formats `value` in station notation: `1+234.567` (metric, 1000 m stations) or
/// `12+34.56` (US, 100 ft stations); negative stations get a leading `-`
/// (`-0+050.000`). Rounding is done once on the whole value, so a remainder never
/// reads `100.00`. Non-finite values and values too large to round exactly are
/// written as plain numbers.
pub fn format_station(value: f64, units: Units, decimals: usize) -> String {
    let decimals = decimals.min(9);
    let scale = 10_f64.powi(i32::try_from(decimals).unwrap_or(9));
    let scaled = (value.abs() * scale).round();
    if !value.is_finite() || scaled >= 2f64.powi(53) {
        return format!("{value}");
    }
    // Exact integer arithmetic on the rounded value (below 2^53, so exact in u64).
    #[allow(clippy::cast_possible_truncation, clippy::cast_sign_loss)]
    let total = scaled as u64;
    #[allow(clippy::cast_possible_truncation, clippy::cast_sign_loss)]
    let block = (units.station_length() * scale) as u64;
    let whole = total / block;
    let rest = total % block;
    let sign = if value < 0.0 && total != 0 { "-" } else { "" };
    #[allow(clippy::cast_precision_loss)]
    let rest_value = rest as f64 / scale;
    let width = units.station_digits() + if decimals > 0 { decimals + 1 } else { 0 };
    format!("{sign}{whole}+{rest_value:0width$.decimals$}")
}

/// The longest piece of a user's text quoted back in a message.
const EXCERPT_CHARS: usize = 40;

/// `text` as quoted in an error message: whole when short, else its first
/// characters and how long it was (a 10 MB cell is never echoed whole), with
/// every control or invisible formatting character written out (`\n`,
/// `\u{1b}`), so a quoted value can neither hide a character nor start a
/// line of its own.
pub fn excerpt(text: &str) -> String {
    let count = text.chars().count();
    let mut out = String::new();
    for c in text.chars().take(EXCERPT_CHARS) {
        match c {
            '\n' => out.push_str("\\n"),
            '\r' => out.push_str("\\r"),
            '\t' => out.push_str("\\t"),
            c if unprintable(c) => out.push_str(&format!("\\u{{{:x}}}", u32::from(c))),
            c => out.push(c),
        }
    }
    if count > EXCERPT_CHARS {
        out.push_str(&format!("… ({count} characters)"));
    }
    out
}

/// Whether `c` shows nothing of itself: a control character, a
/// non-character (U+FFFE, U+FFFF), or an invisible format character (zero
/// widths, direction marks, the byte-order mark).
fn unprintable(c: char) -> bool {
    c.is_control()
        || matches!(c, '\u{fffe}' | '\u{ffff}' | '\u{200b}'..='\u{200f}' | '\u{202a}'..='\u{202e}' | '\u{2060}'..='\u{2064}' | '\u{feff}')
}

/// `text` with every character a drawing or an XML file cannot hold (control
/// characters, U+FFFE, U+FFFF) replaced visibly by U+FFFD, and cut to at most
/// `max` characters with "…" (a name is never drawn a megabyte long).
pub fn visible(text: &str, max: usize) -> String {
    let count = text.chars().count();
    let mut out: String = text
        .chars()
        .take(if count > max { max.saturating_sub(1) } else { max })
        .map(|c| if c.is_control() || matches!(c, '\u{fffe}' | '\u{ffff}') { '\u{fffd}' } else { c })
        .collect();
    if count > max {
        out.push('…');
    }
    out
}

/// Parses station notation (`12+34.56`, `1+234.567`, `-0+50`) or a plain number
/// (`1234.56`). Surrounding white space is ignored.
///
/// # Errors
/// [`StationError`] when the text is empty, malformed, not finite, or the part after
/// `+` is one full station or more.
pub fn parse_station(text: &str, units: Units) -> Result<f64, StationError> {
    let trimmed = text.trim();
    if trimmed.is_empty() {
        return Err(StationError::Empty);
    }
    let malformed = || StationError::Malformed(excerpt(trimmed), example(units));
    let Some((head, tail)) = trimmed.split_once('+') else {
        let value: f64 = trimmed.parse().map_err(|_| malformed())?;
        return checked(value, trimmed);
    };
    let (negative, digits) = match head.strip_prefix('-') {
        Some(rest) => (true, rest),
        None => (false, head),
    };
    let is_number = |s: &str| {
        !s.is_empty()
            && s.chars().all(|c| c.is_ascii_digit() || c == '.')
            && s.chars().filter(|&c| c == '.').count() <= 1
            && s.chars().any(|c| c.is_ascii_digit())
    };
    if digits.is_empty() || !digits.chars().all(|c| c.is_ascii_digit()) || !is_number(tail) {
        return Err(malformed());
    }
    let whole: f64 = digits.parse().map_err(|_| malformed())?;
    let offset: f64 = tail.parse().map_err(|_| malformed())?;
    if offset >= units.station_length() {
        return Err(StationError::OffsetTooLarge { text: excerpt(trimmed), limit: units.station_length() });
    }
    let magnitude = whole * units.station_length() + offset;
    checked(if negative { -magnitude } else { magnitude }, trimmed)
}

/// `value` read from `text` as a station: finite, within the range
/// Gradewright accepts, and `-0` read as 0 (one station, not two).
fn checked(value: f64, text: &str) -> Result<f64, StationError> {
    if !value.is_finite() {
        return Err(StationError::NotFinite(excerpt(text)));
    }
    if !crate::tolerance::within_limit(value) {
        return Err(StationError::OutOfRange(excerpt(text)));
    }
    Ok(value + 0.0)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn formats_both_systems() {
        assert_eq!(format_station(5650.0, Units::UsCustomary, 2), "56+50.00");
        assert_eq!(format_station(1234.5678, Units::Metric, 3), "1+234.568");
        assert_eq!(format_station(-50.0, Units::UsCustomary, 2), "-0+50.00");
        assert_eq!(format_station(5.0, Units::Metric, 0), "0+005");
        // Carry: 99.999 rounds to the next full station, never "0+100.00".
        assert_eq!(format_station(99.999, Units::UsCustomary, 2), "1+00.00");
        assert_eq!(format_station(-0.0001, Units::Metric, 3), "0+000.000");
    }

    #[test]
    fn parses_notation_and_numbers() {
        assert_eq!(parse_station("56+50.00", Units::UsCustomary), Ok(5650.0));
        assert_eq!(parse_station(" 1+234.5 ", Units::Metric), Ok(1234.5));
        assert_eq!(parse_station("-0+50", Units::UsCustomary), Ok(-50.0));
        assert_eq!(parse_station("-12.5", Units::Metric), Ok(-12.5));
        assert!(matches!(parse_station("1+1000", Units::Metric), Err(StationError::OffsetTooLarge { .. })));
        assert!(parse_station("1+2+3", Units::Metric).is_err());
        assert!(parse_station("a+10", Units::Metric).is_err());
        assert!(parse_station("", Units::Metric).is_err());
        assert!(parse_station("inf", Units::Metric).is_err());
        assert!(parse_station("1+-5", Units::Metric).is_err());
    }

    #[test]
    fn round_trips() {
        for units in [Units::Metric, Units::UsCustomary] {
            for &v in &[0.0, 12.345, 999.999, 1000.0, 5650.25, -1234.567, 20_000.0] {
                let text = format_station(v, units, 3);
                let back = parse_station(&text, units).map(|b| format_station(b, units, 3));
                assert_eq!(back.as_deref(), Ok(text.as_str()), "{v} {units:?}");
            }
        }
    }
}
