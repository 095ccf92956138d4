//! The sight-distance strip under the profile: available distance forward and
//! backward, the required distance, and the failing stretches shaded. It
//! shares the profile's station axis.

use egui::{Color32, RichText};
use egui_plot::{Line, LineStyle, PlotPoints, Polygon};
use gradewright_geometry::visibility::SightSample;

use super::plot::strip;
use crate::gui::document::Document;
use crate::gui::theme::Palette;

/// The strip's own state.
#[derive(Debug)]
pub struct SightStrip {
    /// Whether the strip is shown under the profile.
    pub shown: bool,
}

impl Default for SightStrip {
    fn default() -> Self {
        Self { shown: true }
    }
}

/// Keeps about two points per screen point: per bucket, the sample with the
/// smallest value (a dip in sight distance must never be smoothed away).
fn decimate(
    samples: &[SightSample],
    x: (f64, f64),
    buckets: usize,
    value: impl Fn(&SightSample) -> f64,
) -> Vec<[f64; 2]> {
    let start = samples.partition_point(|s| s.station < x.0).saturating_sub(1);
    let end = (samples.partition_point(|s| s.station <= x.1) + 1).min(samples.len());
    let Some(visible) = samples.get(start..end) else { return Vec::new() };
    if visible.len() <= 2 * buckets.max(1) {
        return visible.iter().map(|s| [s.station, value(s)]).collect();
    }
    let per = visible.len().div_ceil(buckets.max(1));
    visible
        .chunks(per)
        .filter_map(|chunk| {
            chunk.iter().min_by(|a, b| value(a).total_cmp(&value(b))).map(|s| [s.station, value(s)])
        })
        .collect()
}

impl SightStrip {
    /// The strip, over the stations `x_range` the plot shows.
    #[allow(clippy::too_many_lines)]
    pub fn ui(&self, ui: &mut egui::Ui, doc: &Document, x_range: (f64, f64)) {
        let palette = Palette::of(ui);
        let units = doc.project().units;
        let len = units.length_symbol();
        let Some(sight) = doc.analysis().sight.clone() else {
            // Say what stops it: the criteria, or the first problem of the profile.
            let analysis = doc.analysis();
            let reason = match (&analysis.criteria, analysis.problems.first()) {
                (Err(e), _) => format!("Sight distance is not shown: {e}"),
                (Ok(_), Some(problem)) => {
                    let more = analysis.problems.len() - 1;
                    let more =
                        if more > 0 { format!(" (and {more} more problem(s))") } else { String::new() };
                    format!("Sight distance is not shown until this is fixed: {problem}{more}")
                }
                (Ok(_), None) => {
                    "Sight distance was not computed: the sight-distance step is too small".to_owned()
                }
            };
            ui.label(RichText::new(reason).color(palette.warn));
            return;
        };
        #[allow(clippy::cast_possible_truncation, clippy::cast_sign_loss)]
        let buckets = ui.available_width().max(100.0) as usize;
        let forward = decimate(&sight.samples, x_range, buckets, |s| s.forward);
        let backward = decimate(&sight.samples, x_range, buckets, |s| s.backward);
        let required_f = decimate(&sight.samples, x_range, buckets, |s| s.required_forward);
        let required_b = decimate(&sight.samples, x_range, buckets, |s| s.required_backward);
        let same_required = sight
            .samples
            .iter()
            .all(|s| gradewright_geometry::tolerance::nearly_equal(s.required_forward, s.required_backward));
        let cap = sight.cap;
        let top = sight.samples.iter().map(|s| s.forward.max(s.backward)).fold(0.0, f64::max);
        let shortfalls: Vec<(f64, f64)> = doc
            .analysis()
            .report
            .findings
            .iter()
            .filter(|f| f.code.is_sight_shortfall())
            .map(|f| (f.station_start.0, f.station_end.0))
            .filter(|(a, b)| b.max(*a) >= x_range.0 && a.min(*b) <= x_range.1)
            .collect();
        let lookup = sight.clone();
        let equations = doc.project().equations.clone();
        let decimals = units.station_decimals();
        strip("sight-strip", ui.available_height(), 80.0, doc.project(), format!("Sight distance ({len})"))
            .include_y(top * 1.05)
            .label_formatter(move |hover| {
                let x = match hover {
                    egui_plot::HoverPosition::NearDataPoint { position, .. }
                    | egui_plot::HoverPosition::Elsewhere { position } => position.x,
                };
                let i = lookup
                    .samples
                    .partition_point(|s| s.station < x)
                    .min(lookup.samples.len().saturating_sub(1));
                let s = lookup.samples.get(i)?;
                let shown = |d: f64| {
                    if lookup.reaches_cap(d) {
                        format!("≥ {d:.1} {len} (the cap: not looked further)")
                    } else {
                        format!("{d:.1} {len}")
                    }
                };
                Some(format!(
                    "{}\nforward {} (needs {:.1})\nbackward {} (needs {:.1})",
                    equations.stationing(units).label(s.station, decimals),
                    shown(s.forward),
                    s.required_forward,
                    shown(s.backward),
                    s.required_backward
                ))
            })
            .show(ui, |pui| {
                for (a, b) in &shortfalls {
                    let (a, b) = if a < b { (*a, *b) } else { (*b, *a + 0.5) };
                    pui.polygon(
                        Polygon::new(
                            "Sight falls short",
                            PlotPoints::from(vec![[a, 0.0], [b, 0.0], [b, top], [a, top]]),
                        )
                        .fill_color(palette.shortfall)
                        .stroke(egui::Stroke::new(1.0, palette.fail)),
                    );
                }
                if let (Some(first), Some(last)) = (sight.samples.first(), sight.samples.last()) {
                    pui.line(
                        Line::new(
                            format!("Cap {cap:.0} {len}"),
                            PlotPoints::from(vec![[first.station, cap], [last.station, cap]]),
                        )
                        .color(palette.grade_line)
                        .style(LineStyle::dotted_dense())
                        .width(1.0),
                    );
                }
                pui.line(
                    Line::new("Available forward", PlotPoints::from(forward))
                        .color(palette.profile)
                        .width(1.5),
                );
                pui.line(
                    Line::new("Available backward", PlotPoints::from(backward))
                        .color(Color32::from_rgb(170, 110, 230))
                        .width(1.5),
                );
                if same_required {
                    pui.line(
                        Line::new("Required (SSD)", PlotPoints::from(required_f))
                            .color(palette.fail)
                            .width(1.5)
                            .style(LineStyle::Solid),
                    );
                } else {
                    pui.line(
                        Line::new("Required forward", PlotPoints::from(required_f))
                            .color(palette.fail)
                            .width(1.5)
                            .style(LineStyle::Solid),
                    );
                    pui.line(
                        Line::new("Required backward", PlotPoints::from(required_b))
                            .color(palette.warn)
                            .width(1.5)
                            .style(LineStyle::Solid),
                    );
                }
            });
    }
}
