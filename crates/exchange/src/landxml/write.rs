//! Writing a project's design profile and ground line as LandXML 1.2.

use std::io::Write;

use gradewright_document::Project;
use gradewright_geometry::{Foot, Units, VerticalCurve, trimmed};

use super::NAMESPACE;

/// The `date` and `time` the `LandXML` element must carry.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Stamp {
    /// `YYYY-MM-DD` (xs:date).
    pub date: String,
    /// `hh:mm:ss` (xs:time).
    pub time: String,
}

impl Stamp {
    /// The current time in UTC (`Z` suffixed).
    pub fn now() -> Self {
        let seconds =
            std::time::SystemTime::now().duration_since(std::time::UNIX_EPOCH).map_or(0, |d| d.as_secs());
        let days = i64::try_from(seconds / 86_400).unwrap_or(0);
        let rest = seconds % 86_400;
        let (y, m, d) = civil_from_days(days);
        Self {
            date: format!("{y:04}-{m:02}-{d:02}"),
            time: format!("{:02}:{:02}:{:02}Z", rest / 3600, rest % 3600 / 60, rest % 60),
        }
    }
}

/// The proleptic Gregorian date of `days` since 1970-01-01 (H. Hinnant's
/// `civil_from_days` algorithm, "chrono-Compatible Low-Level Date
/// Algorithms", from memory).
fn civil_from_days(days: i64) -> (i64, i64, i64) {
    let z = days + 719_468;
    let era = z.div_euclid(146_097);
    let doe = z.rem_euclid(146_097);
    let yoe = (doe - doe / 1460 + doe / 36_524 - doe / 146_096) / 365;
    let doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
    let mp = (5 * doy + 2) / 153;
    let d = doy - (153 * mp + 2) / 5 + 1;
    let m = if mp < 10 { mp + 3 } else { mp - 9 };
    let y = yoe + era * 400 + i64::from(m <= 2);
    (y, m, d)
}

/// The name of the design profile a project is written as.
pub const PROFILE_NAME: &str = "Proposed";
/// The name of the ground line a project is written as.
pub const GROUND_NAME: &str = "Existing ground";

/// A number as LandXML text: at most six decimals (a micrometre or a
/// millionth of a foot), no trailing zeros, never `-0`.
pub(super) fn number(value: f64) -> String {
    trimmed(value, 6)
}

/// `text` escaped for an attribute value.
pub(super) fn escape(text: &str) -> String {
    let mut out = String::with_capacity(text.len());
    for c in text.chars() {
        match c {
            '&' => out.push_str("&amp;"),
            '<' => out.push_str("&lt;"),
            '>' => out.push_str("&gt;"),
            '"' => out.push_str("&quot;"),
            '\'' => out.push_str("&apos;"),
            // What XML cannot hold is replaced visibly, never dropped silently.
            c if c.is_control() || matches!(c, '\u{fffe}' | '\u{ffff}') => out.push('\u{fffd}'),
            c => out.push(c),
        }
    }
    out
}

/// Writes `project`'s design profile (and its ground line, if it has one)
/// as a LandXML 1.2 file valid against the schema: one `Alignment` named
/// after the project whose `staStart` and `length` span the PVIs, holding
/// one `Profile` with the ground as `ProfSurf` and the design as
/// `ProfAlign` (`PVI` where there is no curve, `ParaCurve` for a
/// symmetric curve, `UnsymParaCurve` for unequal tangents). Metric projects
/// are written in metres; US customary ones in the project's foot
/// (`foot` or `USSurveyFoot`). The design speed goes in a `Roadway`'s
/// `Speeds` (or a `Feature` of the alignment when its name holds spaces);
/// control points and the other criteria have no LandXML element and stay
/// in the project file.
///
/// # Errors
/// Any I/O error of `out`; `InvalidInput` for a project with no PVI.
pub fn write_landxml(mut out: impl Write, project: &Project, stamp: &Stamp) -> std::io::Result<()> {
    let (Some(first), Some(last)) = (project.pvis.first(), project.pvis.last()) else {
        return Err(std::io::Error::new(std::io::ErrorKind::InvalidInput, "the profile has no PVI to write"));
    };
    let name = if project.name.trim().is_empty() { "Alignment" } else { project.name.as_str() };
    let units = match (project.units, project.foot) {
        (Units::Metric, _) => concat!(
            r#"<Metric linearUnit="meter" elevationUnit="meter" areaUnit="squareMeter" volumeUnit="cubicMeter""#,
            r#" temperatureUnit="celsius" pressureUnit="milliBars"/>"#
        ),
        (Units::UsCustomary, foot) => match foot {
            Foot::International => concat!(
                r#"<Imperial linearUnit="foot" elevationUnit="feet" areaUnit="squareFoot" volumeUnit="cubicYard""#,
                r#" temperatureUnit="fahrenheit" pressureUnit="inHG"/>"#
            ),
            Foot::UsSurvey => concat!(
                r#"<Imperial linearUnit="USSurveyFoot" elevationUnit="feet" areaUnit="squareFoot" volumeUnit="cubicYard""#,
                r#" temperatureUnit="fahrenheit" pressureUnit="inHG"/>"#
            ),
        },
    };
    if let Some(text) = project.kept.as_ref().and_then(|kept| super::keep::written_back(project, kept)) {
        out.write_all(text.as_bytes())?;
        return out.flush();
    }
    let mut w = std::io::BufWriter::new(&mut out);
    writeln!(w, r#"<?xml version="1.0" encoding="UTF-8"?>"#)?;
    writeln!(
        w,
        r#"<LandXML xmlns="{NAMESPACE}" version="1.2" date="{}" time="{}">"#,
        escape(&stamp.date),
        escape(&stamp.time)
    )?;
    writeln!(w, "  <Units>{units}</Units>")?;
    writeln!(w, r#"  <Application name="Gradewright" version="{}"/>"#, env!("CARGO_PKG_VERSION"))?;
    writeln!(w, "  <Alignments>")?;
    writeln!(
        w,
        r#"    <Alignment name="{}" staStart="{}" length="{}">"#,
        escape(name),
        number(first.station.0),
        number((last.station.0 - first.station.0).max(0.0))
    )?;
    for e in project.equations.as_slice() {
        writeln!(w, "      {}", equation_element(e, ""))?;
    }
    writeln!(w, r#"      <Profile name="{}">"#, escape(name))?;
    if !project.ground.is_empty() {
        writeln!(w, r#"        <ProfSurf name="{GROUND_NAME}">"#)?;
        write!(w, "          <PntList2D>{}", point_list(&project.ground, "            "))?;
        writeln!(w, "</PntList2D>")?;
        writeln!(w, "        </ProfSurf>")?;
    }
    writeln!(w, r#"        <ProfAlign name="{PROFILE_NAME}">"#)?;
    for pvi in &project.pvis {
        writeln!(w, "          {}", pvi_element(pvi, ""))?;
    }
    writeln!(w, "        </ProfAlign>")?;
    writeln!(w, "      </Profile>")?;
    // The design speed: the standard's place is a Roadway referring to the
    // alignment by name; a name holding spaces cannot be referred to (the
    // reference is a list of names), so it goes in a Feature of the
    // alignment then.
    let speed = project.criteria.design_speed.filter(|v| v.is_finite() && *v > 0.0);
    let by_reference = !name.chars().any(char::is_whitespace);
    if let Some(v) = speed.filter(|_| !by_reference) {
        writeln!(w, r#"      <Feature name="Design criteria">"#)?;
        writeln!(w, r#"        <Property label="designSpeed" value="{}"/>"#, number(v))?;
        writeln!(w, "      </Feature>")?;
    }
    writeln!(w, "    </Alignment>")?;
    writeln!(w, "  </Alignments>")?;
    if let Some(v) = speed.filter(|_| by_reference) {
        writeln!(w, "  <Roadways>")?;
        writeln!(w, r#"    <Roadway name="{}" alignmentRefs="{}">"#, escape(name), escape(name))?;
        writeln!(
            w,
            r#"      <Speeds><DesignSpeed staStart="{}" staEnd="{}" speed="{}"/></Speeds>"#,
            number(first.station.0),
            number(last.station.0),
            number(v)
        )?;
        writeln!(w, "    </Roadway>")?;
        writeln!(w, "  </Roadways>")?;
    }
    writeln!(w, "</LandXML>")?;
    w.flush()
}

/// A station equation as its `StaEquation` element, names written with
/// `prefix`.
pub(super) fn equation_element(e: &gradewright_geometry::StationEquation, prefix: &str) -> String {
    format!(
        r#"<{prefix}StaEquation staInternal="{}" staBack="{}" staAhead="{}" staIncrement="increasing"/>"#,
        number(e.internal),
        number(e.back),
        number(e.ahead)
    )
}

/// One PVI as its LandXML element (`PVI`, `ParaCurve` or
/// `UnsymParaCurve`), its names written with `prefix` (`""` or `"lx:"`).
pub(super) fn pvi_element(pvi: &gradewright_geometry::Pvi, prefix: &str) -> String {
    let at = format!("{} {}", number(pvi.station.0), number(pvi.elevation));
    match pvi.curve {
        VerticalCurve::None => format!("<{prefix}PVI>{at}</{prefix}PVI>"),
        VerticalCurve::Symmetric { length } => {
            format!(r#"<{prefix}ParaCurve length="{}">{at}</{prefix}ParaCurve>"#, number(length))
        }
        VerticalCurve::Unequal { length_in, length_out } => format!(
            r#"<{prefix}UnsymParaCurve lengthIn="{}" lengthOut="{}">{at}</{prefix}UnsymParaCurve>"#,
            number(length_in),
            number(length_out)
        ),
    }
}

/// A ground line's points as the text of a `PntList2D`, four pairs a line,
/// continued lines starting with `indent`.
pub(super) fn point_list(points: &[gradewright_geometry::GroundPoint], indent: &str) -> String {
    let mut text = String::with_capacity(points.len() * 20);
    for (k, p) in points.iter().enumerate() {
        if k > 0 {
            if k % 4 == 0 {
                text.push('\n');
                text.push_str(indent);
            } else {
                text.push(' ');
            }
        }
        text.push_str(&number(p.station));
        text.push(' ');
        text.push_str(&number(p.elevation));
    }
    text
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn numbers_are_short_and_exact_to_six_decimals() {
        assert_eq!(number(1200.0), "1200");
        assert_eq!(number(0.1 + 0.2), "0.3");
        assert_eq!(number(-0.0000001), "0");
        assert_eq!(number(215.125), "215.125");
        assert_eq!(number(-3.5), "-3.5");
    }

    #[test]
    fn dates_follow_the_civil_calendar() {
        assert_eq!(civil_from_days(0), (1970, 1, 1));
        assert_eq!(civil_from_days(11_016), (2000, 2, 29));
        assert_eq!(civil_from_days(20_790), (2026, 12, 3));
    }

    #[test]
    fn attributes_are_escaped() {
        assert_eq!(escape(r#"Mill & "Brook" <east>"#), "Mill &amp; &quot;Brook&quot; &lt;east&gt;");
    }
}
