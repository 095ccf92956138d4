//! What a check finds: a [`Finding`] with its [`FindingCode`], whose stable
//! text and severity are decided here, in one place, for every check.

use crate::Station;

/// How serious a finding is.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub enum Severity {
    /// For information.
    Info,
    /// Worth a look; not a failure of a criterion.
    Warn,
    /// A criterion is not met, or the profile is not buildable.
    Fail,
}

impl Severity {
    /// `"info"`, `"warn"` or `"fail"`.
    pub fn key(self) -> &'static str {
        match self {
            Self::Info => "info",
            Self::Warn => "warn",
            Self::Fail => "fail",
        }
    }
}

/// Generates [`FindingCode`] with its stable text and severity, so the three
/// can never disagree.
macro_rules! finding_codes {
    ($($(#[doc = $doc:literal])* $name:ident = $text:literal, $severity:ident;)*) => {
        /// What a finding is about: a stable code, written in reports as its
        /// [`FindingCode::as_str`] text (`crest.k-min`, …), with a fixed
        /// [`Severity`].
        #[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, PartialOrd, Ord)]
        pub enum FindingCode {
            $($(#[doc = $doc])* $name,)*
        }

        impl FindingCode {
            /// Every code, in the order of this list.
            pub const ALL: &'static [Self] = &[$(Self::$name,)*];

            /// The stable text reports carry (`crest.k-min`).
            pub fn as_str(self) -> &'static str {
                match self {
                    $(Self::$name => $text,)*
                }
            }

            /// How serious a finding of this code is.
            pub fn severity(self) -> Severity {
                match self {
                    $(Self::$name => Severity::$severity,)*
                }
            }
        }
    };
}

finding_codes! {
    /// Fewer than two PVIs.
    ProfileTooFewPvis = "profile.too-few-pvis", Fail;
    /// A value that is not a finite number.
    ProfileNotFinite = "profile.not-finite", Fail;
    /// A value beyond the range Gradewright accepts.
    ProfileOutOfRange = "profile.out-of-range", Fail;
    /// A negative curve length.
    ProfileNegativeLength = "profile.negative-length", Fail;
    /// Stations that do not increase.
    ProfileStationOrder = "profile.station-order", Fail;
    /// A curve on the first or last PVI.
    ProfileCurveAtEnd = "profile.curve-at-end", Fail;
    /// A curve part longer than its tangent.
    CurveExceedsTangent = "curve.exceeds-tangent", Fail;
    /// An unequal-tangent curve with a part of zero length.
    CurveZeroPart = "curve.zero-part", Fail;
    /// Two curves that overlap.
    CurveOverlap = "curve.overlap", Fail;
    /// A curve where the grade does not change.
    CurveNotNeeded = "curve.not-needed", Info;
    /// A curve shorter than the minimum length.
    CurveMinLength = "curve.min-length", Warn;
    /// A crest K below the minimum.
    CrestKMin = "crest.k-min", Fail;
    /// A sag K below the minimum.
    SagKMin = "sag.k-min", Fail;
    /// A crest shorter than the stopping-sight-distance length.
    CrestSsdLength = "crest.ssd-length", Fail;
    /// A sag shorter than the headlight sight-distance length.
    SagHeadlightLength = "sag.headlight-length", Fail;
    /// A sag shorter than the comfort length.
    SagComfortLength = "sag.comfort-length", Fail;
    /// A flat curve with a level point: drainage to review.
    DrainageFlatCurve = "drainage.flat-curve", Warn;
    /// A grade break too large to go without a curve.
    BreakNeedsCurve = "break.needs-curve", Fail;
    /// A grade break left without a curve, within the limit.
    BreakNoCurve = "break.no-curve", Info;
    /// Sight distance falling short, travelling forward.
    SightForward = "sight.forward", Fail;
    /// Sight distance falling short, travelling backward.
    SightBackward = "sight.backward", Fail;
    /// Sight distance that could not be computed (a check that did not run).
    SightNotComputed = "sight.not-computed", Fail;
    /// A grade steeper than the maximum.
    GradeMax = "grade.max", Fail;
    /// A grade flatter than the drainage minimum.
    GradeMin = "grade.min", Warn;
    /// A fixed control point missed.
    ControlFixed = "control.fixed", Fail;
    /// A minimum control point missed.
    ControlMin = "control.min", Fail;
    /// A maximum control point missed.
    ControlMax = "control.max", Fail;
    /// A control point off the profile.
    ControlOutside = "control.outside", Warn;
    /// A control point that is not a usable number.
    ControlInvalid = "control.invalid", Fail;
    /// A sag too short to see under a structure.
    ControlUndercrossing = "control.undercrossing", Fail;
    /// A ground point that looks like no data or jumps, or a long gap in
    /// the survey.
    GroundSuspicious = "ground.suspicious", Warn;
    /// A design speed off the tables.
    CriteriaSpeedOffTable = "criteria.speed-off-table", Warn;
    /// No usable criteria: the design checks are off.
    CriteriaIncomplete = "criteria.incomplete", Info;
}

impl FindingCode {
    /// Whether the finding is a stretch where the sight distance falls short
    /// (either direction).
    pub fn is_sight_shortfall(self) -> bool {
        matches!(self, Self::SightForward | Self::SightBackward)
    }
}

impl std::fmt::Display for FindingCode {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(self.as_str())
    }
}

/// One check result.
#[derive(Clone, Debug, PartialEq)]
pub struct Finding {
    /// What it is about (its severity follows from it).
    pub code: FindingCode,
    /// First station concerned.
    pub station_start: Station,
    /// Last station concerned.
    pub station_end: Station,
    /// The PVI concerned, 0-based, if any.
    pub pvi: Option<usize>,
    /// What is wrong, with the numbers and the rule used.
    pub message: String,
}

impl Finding {
    /// A finding of `code` over `stations` (first and last), naming `pvi`.
    pub fn new(code: FindingCode, stations: (Station, Station), pvi: Option<usize>, message: String) -> Self {
        Self { code, station_start: stations.0, station_end: stations.1, pvi, message }
    }

    /// How serious it is (its code's severity).
    pub fn severity(&self) -> Severity {
        self.code.severity()
    }

    /// Whether it is a failure.
    pub fn fails(&self) -> bool {
        self.severity() == Severity::Fail
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_code_has_its_own_text_of_topic_and_name() {
        let mut seen = std::collections::HashSet::new();
        for code in FindingCode::ALL {
            let text = code.as_str();
            assert!(seen.insert(text), "{text} twice");
            let (topic, name) = text.split_once('.').unwrap_or(("", ""));
            assert!(!topic.is_empty() && !name.is_empty(), "{text}");
            assert!(text.chars().all(|c| c.is_ascii_lowercase() || c == '.' || c == '-'), "{text}");
        }
        assert_eq!(FindingCode::CrestKMin.to_string(), "crest.k-min");
        assert_eq!(FindingCode::GradeMin.severity(), Severity::Warn);
        assert!(FindingCode::SightBackward.is_sight_shortfall());
        assert!(!FindingCode::SightNotComputed.is_sight_shortfall());
    }
}
