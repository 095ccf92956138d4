//! Printing check results as text or JSON.

use gradewright_document::Project;
use gradewright_geometry::{
    Analysis, ControlKind, ControlStatus, CriterionId, CurveCheck, CutFillSummary, Earthwork, EarthworkError,
    Finding, ResolvedCriteria, StreamedCheck, area_symbol, volume_symbol,
};
use serde::Serialize;

#[derive(Serialize)]
struct JsonReport<'a> {
    units: &'static str,
    design_speed: f64,
    ssd_required: f64,
    curves: Vec<JsonCurve>,
    findings: Vec<JsonFinding<'a>>,
    controls: Vec<JsonControl<'a>>,
    ground: Option<JsonGround>,
    earthwork: Option<JsonEarthwork>,
}

#[derive(Serialize)]
struct JsonControl<'a> {
    name: &'a str,
    station: f64,
    kind: &'static str,
    elevation: f64,
    /// Fixed points only.
    tolerance: Option<f64>,
    /// Maximum points under a structure only.
    clearance: Option<f64>,
    /// The profile elevation at the point (none when it was not checked).
    profile: Option<f64>,
    /// By how much it is missed (0 when met).
    miss: Option<f64>,
    /// `met`, `missed`, `outside` (not on the profile), `invalid` or
    /// `not-checked` (the profile has problems).
    status: &'static str,
}

#[derive(Serialize)]
struct JsonDepth {
    station: f64,
    depth: f64,
}

#[derive(Serialize)]
struct JsonGround {
    points: usize,
    start: f64,
    end: f64,
    largest_cut: Option<JsonDepth>,
    largest_fill: Option<JsonDepth>,
}

#[derive(Serialize)]
struct JsonEarthwork {
    /// The stations the estimate covers (where the ground covers the profile).
    start: Option<f64>,
    end: Option<f64>,
    width: f64,
    cut_slope: f64,
    fill_slope: f64,
    shrinkage_percent: f64,
    /// Bank measure.
    cut: Option<f64>,
    fill: Option<f64>,
    /// Compacted measure: cut · (1 − shrinkage) − fill.
    net: Option<f64>,
    area_unit: &'static str,
    volume_unit: &'static str,
    /// Why there is no estimate, when there is none.
    error: Option<String>,
}

#[derive(Serialize)]
struct JsonCurve {
    pvi_station: f64,
    pvi_elevation: f64,
    kind: &'static str,
    g1: f64,
    g2: f64,
    a: f64,
    length: f64,
    length_in: f64,
    length_out: f64,
    k: Option<f64>,
    k_overall: Option<f64>,
    k_required: Option<f64>,
    length_required: f64,
    pvc_station: f64,
    pvc_elevation: f64,
    pvt_station: f64,
    pvt_elevation: f64,
    turning_station: Option<f64>,
    turning_elevation: Option<f64>,
    ok: bool,
}

#[derive(Serialize)]
struct JsonFinding<'a> {
    severity: &'static str,
    code: &'static str,
    station_start: f64,
    station_end: f64,
    message: &'a str,
}

/// The control points of `analysis` with their status.
fn json_controls(analysis: &Analysis) -> Vec<JsonControl<'_>> {
    analysis
        .controls
        .iter()
        .enumerate()
        .map(|(i, c)| {
            let (profile, miss, status) = match analysis.control_status.get(i) {
                Some(ControlStatus::Met(y)) => (Some(*y), Some(0.0), "met"),
                Some(ControlStatus::Missed(y, m)) => (Some(*y), Some(*m), "missed"),
                Some(ControlStatus::Outside) => (None, None, "outside"),
                Some(ControlStatus::Invalid) => (None, None, "invalid"),
                None => (None, None, "not-checked"),
            };
            JsonControl {
                name: &c.name,
                station: c.station,
                kind: c.kind.key(),
                elevation: c.elevation,
                tolerance: (c.kind == ControlKind::Fixed).then_some(c.tolerance),
                clearance: (c.kind == ControlKind::Maximum && c.clearance > 0.0).then_some(c.clearance),
                profile,
                miss,
                status,
            }
        })
        .collect()
}

/// The ground's extent and largest depths, and the earthwork totals.
fn json_site(
    analysis: &Analysis,
    section: Option<gradewright_geometry::Section>,
) -> (Option<JsonGround>, Option<JsonEarthwork>) {
    let units = analysis.profile.units;
    let depth = |d: Option<(f64, f64)>| d.map(|(station, depth)| JsonDepth { station, depth });
    let ground = analysis.ground.range().map(|(start, end)| JsonGround {
        points: analysis.ground.len(),
        start,
        end,
        largest_cut: depth(analysis.cut_fill.cut),
        largest_fill: depth(analysis.cut_fill.fill),
    });
    // The analysis estimates earthwork only for a project with a section.
    let earthwork = analysis.earthwork.as_ref().zip(section).map(|(result, section)| {
        let section = match result {
            Ok(e) => e.section,
            Err(_) => section,
        };
        let mut out = JsonEarthwork {
            start: None,
            end: None,
            width: section.width,
            cut_slope: section.cut_slope,
            fill_slope: section.fill_slope,
            shrinkage_percent: section.shrinkage_percent,
            cut: None,
            fill: None,
            net: None,
            area_unit: area_symbol(units),
            volume_unit: volume_symbol(units),
            error: None,
        };
        match result {
            Ok(e) => {
                out.start = Some(e.range.0);
                out.end = Some(e.range.1);
                out.cut = Some(e.cut);
                out.fill = Some(e.fill);
                out.net = Some(e.net());
            }
            Err(e) => out.error = Some(e.to_string()),
        }
        out
    });
    (ground, earthwork)
}

/// The check report as one JSON object (see the README for its fields).
pub fn json(project: &Project, criteria: &ResolvedCriteria, analysis: &Analysis) -> anyhow::Result<String> {
    let checks = &analysis.report;
    let (ground, earthwork) = json_site(analysis, project.section);
    let report = JsonReport {
        units: project.units.key(),
        design_speed: criteria.design_speed,
        ssd_required: criteria.get(CriterionId::StoppingSightDistance),
        curves: checks
            .curves
            .iter()
            .map(|c| {
                let g = &c.curve;
                JsonCurve {
                    pvi_station: g.pvi.0,
                    pvi_elevation: g.pvi_elevation,
                    kind: g.kind.key(),
                    g1: g.grade_in_percent,
                    g2: g.grade_out_percent,
                    a: g.a_percent(),
                    length: g.length(),
                    length_in: g.length_in,
                    length_out: g.length_out,
                    k: g.k(),
                    k_overall: g.k_overall(),
                    k_required: c.k_required,
                    length_required: c.length_required,
                    pvc_station: g.pvc.0,
                    pvc_elevation: g.pvc_elevation,
                    pvt_station: g.pvt.0,
                    pvt_elevation: g.pvt_elevation,
                    turning_station: g.turning.map(|t| t.0.0),
                    turning_elevation: g.turning.map(|t| t.1),
                    ok: c.ok,
                }
            })
            .collect(),
        findings: checks
            .findings
            .iter()
            .map(|f| JsonFinding {
                severity: f.severity().key(),
                code: f.code.as_str(),
                station_start: f.station_start.0,
                station_end: f.station_end.0,
                message: &f.message,
            })
            .collect(),
        controls: json_controls(analysis),
        ground,
        earthwork,
    };
    let mut text = serde_json::to_string_pretty(&report)?;
    text.push('\n');
    Ok(text)
}

/// What the text report needs of a check: the whole analysis, or a long
/// profile's check handed over one item at a time.
pub trait Checked {
    /// Every curve's check, in order.
    ///
    /// # Errors
    /// The first error `each` returns.
    fn curves(&self, each: &mut dyn FnMut(&CurveCheck) -> std::io::Result<()>) -> std::io::Result<()>;
    /// How many findings there are.
    fn count(&self) -> usize;
    /// Every finding, in order.
    ///
    /// # Errors
    /// The first error `each` returns.
    fn findings(&self, each: &mut dyn FnMut(&Finding) -> std::io::Result<()>) -> std::io::Result<()>;
    /// How the profile meets each control point.
    fn control_status(&self) -> &[ControlStatus];
    /// The largest cut and fill.
    fn cut_fill(&self) -> CutFillSummary;
    /// The earthwork estimate.
    fn earthwork(&self) -> Option<&Result<Earthwork, EarthworkError>>;
}

impl Checked for Analysis {
    fn curves(&self, each: &mut dyn FnMut(&CurveCheck) -> std::io::Result<()>) -> std::io::Result<()> {
        self.report.curves.iter().try_for_each(each)
    }
    fn count(&self) -> usize {
        self.report.findings.len()
    }
    fn findings(&self, each: &mut dyn FnMut(&Finding) -> std::io::Result<()>) -> std::io::Result<()> {
        self.report.findings.iter().try_for_each(each)
    }
    fn control_status(&self) -> &[ControlStatus] {
        &self.control_status
    }
    fn cut_fill(&self) -> CutFillSummary {
        self.cut_fill
    }
    fn earthwork(&self) -> Option<&Result<Earthwork, EarthworkError>> {
        self.earthwork.as_ref()
    }
}

impl Checked for StreamedCheck<'_> {
    fn curves(&self, each: &mut dyn FnMut(&CurveCheck) -> std::io::Result<()>) -> std::io::Result<()> {
        StreamedCheck::curves(self, each)
    }
    fn count(&self) -> usize {
        self.len()
    }
    fn findings(&self, each: &mut dyn FnMut(&Finding) -> std::io::Result<()>) -> std::io::Result<()> {
        StreamedCheck::findings(self, each)
    }
    fn control_status(&self) -> &[ControlStatus] {
        StreamedCheck::control_status(self)
    }
    fn cut_fill(&self) -> CutFillSummary {
        StreamedCheck::cut_fill(self)
    }
    fn earthwork(&self) -> Option<&Result<Earthwork, EarthworkError>> {
        StreamedCheck::earthwork(self)
    }
}

/// The check report as text for a terminal.
///
/// # Errors
/// When writing to `out` fails.
pub fn text(
    out: &mut impl std::io::Write,
    project: &Project,
    criteria: &ResolvedCriteria,
    checked: &dyn Checked,
) -> std::io::Result<()> {
    let units = project.units;
    let len = units.length_symbol();
    writeln!(
        out,
        "{}: {} PVIs, {units}, design speed {} {}",
        if project.name.is_empty() { "profile" } else { &project.name },
        project.pvis.len(),
        gradewright_geometry::trimmed(criteria.design_speed, 2),
        units.speed_symbol()
    )?;
    let stationing = project.equations.stationing(units);
    if !criteria.ranges.is_empty() {
        writeln!(out, "  Criteria ranges (outside them the criteria below apply):")?;
        for r in &criteria.ranges {
            let c = &r.criteria;
            writeln!(
                out,
                "    {}{}, crest K {:.0}, sag K {:.0}, SSD {:.0} {len}",
                r.words(stationing),
                if c.headlight_check { "" } else { ", lit (no headlight check)" },
                c.get(gradewright_geometry::CriterionId::CrestK),
                c.get(gradewright_geometry::CriterionId::SagK),
                c.get(gradewright_geometry::CriterionId::StoppingSightDistance)
            )?;
        }
    }
    if !stationing.is_plain() {
        writeln!(out, "  Station equations (stations below are plan stations):")?;
        for (internal, mark) in stationing.marks() {
            writeln!(out, "    {mark} (internal station {})", gradewright_geometry::trimmed(internal, 3))?;
        }
    }
    for id in CriterionId::ALL {
        if let Some(entry) = criteria.entry(id) {
            writeln!(
                out,
                "  {:<30} {:>9.2} {:<5} {}",
                id.label(),
                entry.value,
                id.quantity().symbol(units),
                entry.rule
            )?;
        }
    }
    writeln!(out, "\nCurves:")?;
    writeln!(
        out,
        "  {:>4} {:>12} {:<5} {:>8} {:>8} {:>7} {:>9} {:>8} {:>8} {:>8} {:>9}  status",
        "PVI", "station", "kind", "g1 %", "g2 %", "A %", "L", "K L/A", "K gov", "K min", "L req"
    )?;
    checked.curves(&mut |c| {
        let g = &c.curve;
        let opt = |v: Option<f64>| v.map_or("-".to_owned(), |v| format!("{v:.1}"));
        writeln!(
            out,
            "  {:>4} {:>12} {:<5} {:>+8.3} {:>+8.3} {:>7.3} {:>9.2} {:>8} {:>8} {:>8} {:>9.2}  {}",
            g.index + 1,
            project.equations.stationing(units).label_std(g.pvi.0),
            g.kind.key(),
            g.grade_in_percent,
            g.grade_out_percent,
            g.a_percent(),
            g.length(),
            opt(g.k_overall()),
            opt(g.k()),
            opt(c.k_required),
            c.length_required,
            if c.ok { "ok" } else { "FAIL" }
        )
    })?;
    site_text(out, project, checked)?;
    writeln!(out, "\nFindings ({}):", checked.count())?;
    if checked.count() == 0 {
        writeln!(out, "  none")?;
    }
    checked.findings(&mut |f| {
        writeln!(out, "  [{}] {}: {}", f.severity().key().to_uppercase(), f.code, f.message)
    })?;
    writeln!(
        out,
        "\nK L/A = length over A; K gov = K of the sharper branch (equal to L/A on an equal-tangent curve), \
         which the checks use. L req = the total length the criteria ask for at the curve's back:ahead ratio."
    )?;
    writeln!(
        out,
        "\nLengths in {len}. Results need checking by a licensed engineer; local codes and agency standards govern."
    )?;
    Ok(())
}

/// The control points, the ground and the earthwork estimate, when the
/// project has them.
fn site_text(out: &mut impl std::io::Write, project: &Project, checked: &dyn Checked) -> std::io::Result<()> {
    let units = project.units;
    let len = units.length_symbol();
    let at = project.equations.stationing(units);
    let label = |s: f64| at.label_std(s);
    if !project.controls.is_empty() {
        writeln!(out, "\nControl points ({}):", project.controls.len())?;
        for (i, c) in project.controls.iter().enumerate() {
            let limit = match c.kind {
                ControlKind::Fixed => format!("fixed {:.3} ± {:.3}", c.elevation, c.tolerance),
                ControlKind::Minimum => format!("min {:.3}", c.elevation),
                ControlKind::Maximum => format!("max {:.3}", c.elevation),
            };
            let status = match checked.control_status().get(i) {
                Some(ControlStatus::Met(y)) => format!("profile {y:.3}  met"),
                Some(ControlStatus::Missed(y, miss)) => format!("profile {y:.3}  MISSED by {miss:.3} {len}"),
                Some(ControlStatus::Outside) => "outside the profile: not checked".to_owned(),
                Some(ControlStatus::Invalid) => "not a usable number".to_owned(),
                None => "not checked (the profile has problems)".to_owned(),
            };
            writeln!(out, "  {:<28} {:>12} {:<24} {status}", c.title(i), label(c.station), limit)?;
        }
    }
    if let Some((a, b)) = project.ground.range() {
        writeln!(out, "\nGround: {} points, {} to {}", project.ground.len(), label(a), label(b))?;
        if let Some((s, d)) = checked.cut_fill().cut {
            writeln!(out, "  largest cut  {d:.3} {len} at {}", label(s))?;
        }
        if let Some((s, d)) = checked.cut_fill().fill {
            writeln!(out, "  largest fill {d:.3} {len} at {}", label(s))?;
        }
        match checked.earthwork() {
            Some(Ok(e)) => {
                let vol = volume_symbol(units);
                writeln!(
                    out,
                    "  earthwork from {} to {} (where the ground covers the profile), level section W {} {len}, cut slope {}:1, fill slope {}:1, shrinkage {} %: cut {:.1} {vol}, fill {:.1} {vol}, net {:+.1} {vol}",
                    label(e.range.0),
                    label(e.range.1),
                    e.section.width,
                    e.section.cut_slope,
                    e.section.fill_slope,
                    e.section.shrinkage_percent,
                    e.cut,
                    e.fill,
                    e.net()
                )?;
            }
            Some(Err(e)) => {
                writeln!(out, "  earthwork: {e}")?;
            }
            None => {}
        }
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The text report of a check streamed a few PVIs at a time is the whole
    /// analysis's, byte for byte: the demo (ground, control points, a
    /// section) and a long failing profile.
    #[test]
    fn the_streamed_report_is_the_whole_report() {
        let root = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("../../assets/alder-brook-road.ron");
        let demo = Project::load(&root).unwrap_or_else(|e| panic!("{e}"));
        let mut long = Project::new("Long", gradewright_geometry::Units::Metric);
        long.pvis = gradewright_geometry::synthetic::rolling_profile(long.units, 600, 18_000.0).pvis;
        long.criteria.design_speed = Some(100.0);
        for project in [demo, long] {
            let design = project.design();
            let criteria = design.criteria.resolve(design.units).unwrap_or_else(|e| panic!("{e}"));
            let whole = Analysis::of(&design);
            let (mut a, mut b) = (Vec::new(), Vec::new());
            text(&mut a, &project, &criteria, &whole).unwrap_or_else(|e| panic!("{e}"));
            for each in [5, 300] {
                let streamed = StreamedCheck::new(&design, each).unwrap_or_else(|| panic!("streamable"));
                b.clear();
                text(&mut b, &project, &criteria, &streamed).unwrap_or_else(|e| panic!("{e}"));
                assert!(a == b, "{}: the reports differ at {each} PVIs a stretch", project.name);
            }
            assert!(String::from_utf8_lossy(&a).contains("[FAIL]"), "{}", project.name);
        }
    }
}
