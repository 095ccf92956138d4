//! Printing check results as text or JSON.

use std::fmt::Write as _;

use gradewright_document::Project;
use gradewright_geometry::{CheckReport, CriterionId, ResolvedCriteria};
use serde::Serialize;

#[derive(Serialize)]
struct JsonReport<'a> {
    units: &'static str,
    design_speed: f64,
    ssd_required: f64,
    curves: Vec<JsonCurve>,
    findings: Vec<JsonFinding<'a>>,
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

/// The check report as one JSON object (see the README for its fields).
pub fn json(project: &Project, criteria: &ResolvedCriteria, checks: &CheckReport) -> anyhow::Result<String> {
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
    };
    let mut text = serde_json::to_string_pretty(&report)?;
    text.push('\n');
    Ok(text)
}

/// The check report as text for a terminal.
pub fn text(
    project: &Project,
    criteria: &ResolvedCriteria,
    analysis: &gradewright_geometry::Analysis,
) -> String {
    let checks = &analysis.report;
    let units = project.units;
    let len = units.length_symbol();
    let mut out = String::new();
    let _ = writeln!(
        out,
        "{}: {} PVIs, {units}, design speed {} {}",
        if project.name.is_empty() { "profile" } else { &project.name },
        project.pvis.len(),
        gradewright_geometry::trimmed(criteria.design_speed, 2),
        units.speed_symbol()
    );
    for id in CriterionId::ALL {
        if let Some(entry) = criteria.entry(id) {
            let _ = writeln!(
                out,
                "  {:<30} {:>9.2} {:<5} {}",
                id.label(),
                entry.value,
                id.quantity().symbol(units),
                entry.rule
            );
        }
    }
    let _ = writeln!(out, "\nCurves:");
    let _ = writeln!(
        out,
        "  {:>4} {:>12} {:<5} {:>8} {:>8} {:>7} {:>9} {:>8} {:>8} {:>8} {:>9}  status",
        "PVI", "station", "kind", "g1 %", "g2 %", "A %", "L", "K L/A", "K gov", "K min", "L req"
    );
    for c in &checks.curves {
        let g = &c.curve;
        let opt = |v: Option<f64>| v.map_or("-".to_owned(), |v| format!("{v:.1}"));
        let _ = writeln!(
            out,
            "  {:>4} {:>12} {:<5} {:>+8.3} {:>+8.3} {:>7.3} {:>9.2} {:>8} {:>8} {:>8} {:>9.2}  {}",
            g.index + 1,
            g.pvi.label(units, units.station_decimals()),
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
        );
    }
    site_text(&mut out, analysis);
    let _ = writeln!(out, "\nFindings ({}):", checks.findings.len());
    if checks.findings.is_empty() {
        let _ = writeln!(out, "  none");
    }
    for f in &checks.findings {
        let _ = writeln!(out, "  [{}] {}: {}", f.severity().key().to_uppercase(), f.code, f.message);
    }
    let _ = writeln!(
        out,
        "\nK L/A = length over A; K gov = K of the sharper branch (equal to L/A on an equal-tangent curve), \
         which the checks use. L req = the total length the criteria ask for at the curve's back:ahead ratio."
    );
    let _ = writeln!(
        out,
        "\nLengths in {len}. Results need checking by a licensed engineer; local codes and agency standards govern."
    );
    out
}

/// The control points, the ground and the earthwork estimate, when the
/// project has them.
fn site_text(out: &mut String, analysis: &gradewright_geometry::Analysis) {
    use gradewright_geometry::{ControlKind, ControlStatus, format_station, volume_symbol};
    let units = analysis.profile.units;
    let len = units.length_symbol();
    let label = |s: f64| format_station(s, units, units.station_decimals());
    if !analysis.controls.is_empty() {
        let _ = writeln!(out, "\nControl points ({}):", analysis.controls.len());
        for (i, c) in analysis.controls.iter().enumerate() {
            let limit = match c.kind {
                ControlKind::Fixed => format!("fixed {:.3} ± {:.3}", c.elevation, c.tolerance),
                ControlKind::Minimum => format!("min {:.3}", c.elevation),
                ControlKind::Maximum => format!("max {:.3}", c.elevation),
            };
            let status = match analysis.control_status.get(i) {
                Some(ControlStatus::Met(y)) => format!("profile {y:.3}  met"),
                Some(ControlStatus::Missed(y, miss)) => format!("profile {y:.3}  MISSED by {miss:.3} {len}"),
                Some(ControlStatus::Outside) => "outside the profile: not checked".to_owned(),
                Some(ControlStatus::Invalid) => "not a usable number".to_owned(),
                None => "not checked (the profile has problems)".to_owned(),
            };
            let _ = writeln!(out, "  {:<28} {:>12} {:<24} {status}", c.title(i), label(c.station), limit);
        }
    }
    if let Some((a, b)) = analysis.ground.range() {
        let _ = writeln!(out, "\nGround: {} points, {} to {}", analysis.ground.len(), label(a), label(b));
        if let Some((s, d)) = analysis.cut_fill.cut {
            let _ = writeln!(out, "  largest cut  {d:.3} {len} at {}", label(s));
        }
        if let Some((s, d)) = analysis.cut_fill.fill {
            let _ = writeln!(out, "  largest fill {d:.3} {len} at {}", label(s));
        }
        match &analysis.earthwork {
            Some(Ok(e)) => {
                let vol = volume_symbol(units);
                let _ = writeln!(
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
                );
            }
            Some(Err(e)) => {
                let _ = writeln!(out, "  earthwork: {e}");
            }
            None => {}
        }
    }
}
