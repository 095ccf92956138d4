//! The site on screen: cut and fill hatching and the control-point symbols
//! over the plot, the control-point table, the ground and earthwork panel
//! and the mass-haul strip.

use egui::{RichText, Shape as Paint, Stroke};
use egui_plot::{Legend, Line, LineStyle, Plot, PlotPoint, PlotPoints, PlotTransform};
use gradewright_draw::{Role, Shape};
use gradewright_geometry::{
    ControlKind, ControlPoint, ControlStatus, Section, area_symbol, format_station, parse_station,
    volume_symbol,
};

use super::app::GradewrightApp;
use super::cell::{edit_cell, parse_number, settle};
use super::command::{Action, Edit};
use super::theme::Palette;
use super::view::{CellId, ControlColumn, SectionField};

/// Half the size of a control-point symbol, points.
const SYMBOL: f32 = 7.0;

/// Paints what egui_plot has no item for, from the scene the plot drew:
/// the hatching (cut solid, fill dotted) and the control-point symbols.
pub fn paint_site(app: &GradewrightApp, ui: &egui::Ui, transform: &PlotTransform, palette: Palette) {
    let Some(drawn) = app.view.plot_scene.as_ref() else { return };
    let scene = &drawn.scene;
    let painter = ui.painter().with_clip_rect(*transform.frame());
    let at = |s: f64, y: f64| transform.position_from_point(&PlotPoint::new(s, y));
    let mut shapes = Vec::with_capacity(scene.hatches.len() + 8);
    for h in &scene.hatches {
        let (a, b) = (at(h.station, h.profile), at(h.station, h.ground));
        match h.role {
            Role::Cut => shapes.push(Paint::line_segment([a, b], Stroke::new(1.0, palette.cut))),
            _ => shapes.extend(Paint::dotted_line(&[a, b], palette.fill, 4.0, 1.1)),
        }
    }
    for m in scene.markers.iter().filter(|m| matches!(m.role, Role::Control | Role::MissedControl)) {
        let colour = if m.role == Role::MissedControl { palette.fail } else { palette.control };
        symbol(&mut shapes, at(m.at[0], m.at[1]), m.shape, SYMBOL, colour, ui.visuals().extreme_bg_color);
    }
    painter.extend(shapes);
}

/// A control-point symbol centred on its point `p`: a diamond (fixed), or
/// a bar at the elevation with a triangle on the side the profile must
/// stay, pointing at the bar (minimum: below; maximum: above).
fn symbol(
    shapes: &mut Vec<Paint>,
    p: egui::Pos2,
    shape: Shape,
    r: f32,
    colour: egui::Color32,
    fill: egui::Color32,
) {
    let stroke = Stroke::new(2.0, colour);
    match shape {
        Shape::Diamond => shapes.push(Paint::convex_polygon(
            vec![
                p + egui::vec2(0.0, -r),
                p + egui::vec2(r, 0.0),
                p + egui::vec2(0.0, r),
                p + egui::vec2(-r, 0.0),
            ],
            fill,
            stroke,
        )),
        Shape::Floor | Shape::Ceiling => {
            let side = if shape == Shape::Floor { 1.0 } else { -1.0 };
            shapes.push(Paint::line_segment(
                [p + egui::vec2(-1.3 * r, 0.0), p + egui::vec2(1.3 * r, 0.0)],
                stroke,
            ));
            shapes.push(Paint::convex_polygon(
                vec![p, p + egui::vec2(0.8 * r, side * 1.3 * r), p + egui::vec2(-0.8 * r, side * 1.3 * r)],
                fill,
                stroke,
            ));
        }
        _ => {}
    }
}

/// The symbol of `kind` as a small widget (for the table).
fn symbol_ui(ui: &mut egui::Ui, kind: ControlKind, colour: egui::Color32) -> egui::Response {
    let (rect, response) = ui.allocate_exact_size(egui::vec2(22.0, 18.0), egui::Sense::hover());
    let centre = match kind {
        ControlKind::Fixed => rect.center(),
        ControlKind::Minimum => rect.center() - egui::vec2(0.0, 4.0),
        ControlKind::Maximum => rect.center() + egui::vec2(0.0, 4.0),
    };
    let mut shapes = Vec::new();
    symbol(&mut shapes, centre, Shape::of_control(kind), 5.0, colour, ui.visuals().extreme_bg_color);
    ui.painter().extend(shapes);
    response
}

/// The hover readout's line for the ground at `station`: ground elevation
/// and cut or fill depth; `None` where there is no ground.
pub fn hover_depth(
    app_ground: &gradewright_geometry::Ground,
    profile: f64,
    station: f64,
    len: &str,
) -> Option<String> {
    let g = app_ground.elevation_at(station)?;
    let d = g - profile;
    Some(if d > 0.0 {
        format!("ground {g:.3} {len}\ncut {d:.3} {len}")
    } else {
        format!("ground {g:.3} {len}\nfill {:.3} {len}", -d)
    })
}

fn status_text(status: Option<&ControlStatus>, control: &ControlPoint, len: &str) -> (String, bool) {
    match status {
        Some(ControlStatus::Met(y)) => (format!("✔ met (profile {y:.3})"), false),
        Some(ControlStatus::Missed(y, miss)) => {
            let side = if *y < control.elevation { "below" } else { "above" };
            (format!("✖ {miss:.3} {len} {side}"), true)
        }
        Some(ControlStatus::Outside) => ("outside the profile".to_owned(), true),
        Some(ControlStatus::Invalid) => ("✖ not a number".to_owned(), true),
        None => ("not checked".to_owned(), false),
    }
}

/// The control-point table: name, station, kind, elevation, tolerance and
/// whether the profile meets it; add and delete. Every change is one undo
/// step.
pub fn controls_ui(app: &mut GradewrightApp, ui: &mut egui::Ui) {
    let palette = Palette::of(ui);
    let units = app.project().units;
    let len = units.length_symbol();
    let controls = app.project().controls.clone();
    let status = app.analysis().control_status.clone();
    let mut changed: Option<Vec<ControlPoint>> = None;
    if controls.is_empty() {
        ui.label(
            "No control points. Add one here, right-click the plot, or use File, Import control points…",
        );
    }
    egui::Grid::new("controls-grid").striped(true).spacing([6.0, 3.0]).show(ui, |ui| {
        if !controls.is_empty() {
            for h in ["", "Name", "Station", "Kind", "Elevation", "± / clear.", ""] {
                ui.label(RichText::new(h).strong());
            }
            ui.end_row();
        }
        for (i, c) in controls.iter().enumerate() {
            let bad = matches!(status.get(i), Some(ControlStatus::Missed(..) | ControlStatus::Invalid));
            symbol_ui(ui, c.kind, if bad { palette.fail } else { palette.control }).on_hover_text(
                match c.kind {
                    ControlKind::Fixed => "Fixed: meet the elevation within ± the tolerance",
                    ControlKind::Minimum => "Minimum: stay at or above (cover, flood level)",
                    ControlKind::Maximum => {
                        "Maximum: stay at or below (underside minus clearance); give the clearance to check the sight \
                         distance under the structure on a sag"
                    }
                },
            );
            let mut set = |f: &mut dyn FnMut(&mut ControlPoint)| {
                let mut next = changed.clone().unwrap_or_else(|| controls.clone());
                if let Some(slot) = next.get_mut(i) {
                    f(slot);
                }
                changed = Some(next);
            };
            let id = CellId::Control(i, ControlColumn::Name);
            if let Some(text) =
                edit_cell(ui, &mut app.view, id, &c.name, 84.0, &format!("Control {} name", i + 1))
            {
                app.view.cells.remove(&id);
                set(&mut |p| p.name = text.trim().to_owned());
            }
            let id = CellId::Control(i, ControlColumn::Station);
            let shown = format_station(c.station, units, units.station_decimals());
            if let Some(text) =
                edit_cell(ui, &mut app.view, id, &shown, 72.0, &format!("Control {} station", i + 1))
                && let Some(s) =
                    settle(&mut app.view, id, &text, parse_station(&text, units).map_err(|e| e.to_string()))
            {
                set(&mut |p| p.station = s);
            }
            let mut kind = c.kind;
            let combo = egui::ComboBox::from_id_salt(("control-kind", i))
                .width(72.0)
                .selected_text(kind.label())
                .show_ui(ui, |ui| {
                    for k in ControlKind::ALL {
                        ui.selectable_value(&mut kind, k, k.label());
                    }
                });
            let name = format!("Control {} kind", i + 1);
            combo.response.widget_info(|| {
                let mut info = egui::WidgetInfo::labeled(egui::Role::ComboBox, true, kind.label());
                info.label = Some(name.clone());
                info
            });
            if kind != c.kind {
                set(&mut |p| {
                    p.kind = kind;
                    if kind != ControlKind::Fixed {
                        p.tolerance = 0.0;
                    }
                });
            }
            let id = CellId::Control(i, ControlColumn::Elevation);
            if let Some(text) = edit_cell(
                ui,
                &mut app.view,
                id,
                &format!("{:.3}", c.elevation),
                64.0,
                &format!("Control {} elevation", i + 1),
            ) && let Some(v) = settle(&mut app.view, id, &text, parse_number(&text))
            {
                set(&mut |p| p.elevation = v);
            }
            if c.kind == ControlKind::Fixed {
                let id = CellId::Control(i, ControlColumn::Tolerance);
                if let Some(v) = length_cell(ui, &mut app.view, id, c.tolerance, &format!("Control {} tolerance", i + 1)) {
                    set(&mut |p| p.tolerance = v);
                }
            } else if c.kind == ControlKind::Maximum {
                // Under a structure: the clearance taken off the underside
                // (0: no sight check under it).
                let id = CellId::Control(i, ControlColumn::Clearance);
                if let Some(v) = length_cell(ui, &mut app.view, id, c.clearance, &format!("Control {} clearance", i + 1)) {
                    set(&mut |p| p.clearance = v);
                }
            } else {
                ui.label("—");
            }
            if ui.small_button("🗑").on_hover_text("Delete this control point").clicked() {
                let mut next = changed.clone().unwrap_or_else(|| controls.clone());
                if i < next.len() {
                    next.remove(i);
                }
                app.view.cells.retain(|k, _| !matches!(k, CellId::Control(..)));
                changed = Some(next);
            }
            ui.end_row();
            // What the profile does there, on a line of its own.
            let (text, bad) = status_text(status.get(i), c, len);
            ui.label("");
            ui.label(RichText::new(text).color(if bad { palette.fail } else { palette.ok }));
            ui.end_row();
        }
    });
    if ui
        .button("Add control point")
        .on_hover_text("At the selected PVI (or mid-profile), on the profile")
        .clicked()
    {
        let station = app
            .view
            .selected
            .and_then(|i| app.project().pvis.get(i))
            .map(|p| p.station.0)
            .or_else(|| app.analysis().alignment.as_ref().map(|a| 0.5 * (a.start().0 + a.end().0)));
        if let Some(s) = station {
            add_control(app, s, None);
        }
    }
    if let Some(next) = changed {
        app.push(Action::edit(Edit::SetControls(next)));
    }
}

/// A small cell for a length of 0 or more (empty is 0); the value when a
/// valid one is committed.
fn length_cell(
    ui: &mut egui::Ui,
    view: &mut super::view::ViewState,
    id: CellId,
    value: f64,
    label: &str,
) -> Option<f64> {
    let text = edit_cell(ui, view, id, &format!("{value:.3}"), 44.0, label)?;
    settle(view, id, &text, super::cell::parse_length(&text))
}

/// Adds a minimum control point at `station` (elevation: `elevation`, or
/// the profile's there), named after its position in the list.
pub fn add_control(app: &mut GradewrightApp, station: f64, elevation: Option<f64>) {
    let on_profile = app
        .analysis()
        .alignment
        .as_ref()
        .and_then(|a| a.sample(gradewright_geometry::Station(station)).ok())
        .map(|s| s.elevation);
    let Some(elevation) = elevation.or(on_profile) else { return };
    let mut next = app.project().controls.clone();
    next.push(ControlPoint {
        name: format!("Control {}", next.len() + 1),
        station,
        kind: ControlKind::Minimum,
        // Rounded down to the millimetre (or 0.001 ft): a minimum on the
        // profile stays met.
        elevation: (elevation * 1000.0).floor() / 1000.0,
        tolerance: 0.0,
        clearance: 0.0,
    });
    app.push(Action::edit(Edit::SetControls(next)));
}

/// The ground and earthwork panel: the ground's extent, the largest cut
/// and fill, the level typical section and the totals.
pub fn earthwork_ui(app: &mut GradewrightApp, ui: &mut egui::Ui) {
    let palette = Palette::of(ui);
    let units = app.project().units;
    let len = units.length_symbol();
    let label = |s: f64| format_station(s, units, units.station_decimals());
    let ground = app.project().ground.clone();
    match ground.range() {
        None => {
            ui.label(
                "No existing ground. File, Import ground… (or drop a station,elevation CSV on the window).",
            );
            return;
        }
        Some((a, b)) => {
            ui.label(format!("Ground: {} points, {} to {}", ground.len(), label(a), label(b)));
        }
    }
    let summary = app.analysis().cut_fill;
    match summary.cut {
        Some((s, d)) => ui.label(format!("Largest cut: {d:.3} {len} at {}", label(s))),
        None => ui.label("No cut"),
    };
    match summary.fill {
        Some((s, d)) => ui.label(format!("Largest fill: {d:.3} {len} at {}", label(s))),
        None => ui.label("No fill"),
    };
    ui.separator();
    let section = app.project().section;
    let mut on = section.is_some();
    if ui
        .checkbox(&mut on, "Estimate earthwork (level section)")
        .on_hover_text(
            "A centreline estimate for a level typical section: roadway width W at the profile, side slopes to a \
             ground taken level across. End area d·(W + s·d); volumes by average end areas.",
        )
        .changed()
    {
        let next = on.then(|| Section::default_for(units));
        app.push(Action::edit(Edit::SetSection(next)));
    }
    let Some(section) = section else { return };
    ui.label(
        RichText::new("Level typical section: the ground is taken level across each station")
            .small()
            .color(palette.warn),
    );
    let mut next = section;
    egui::Grid::new("section-grid").spacing([6.0, 3.0]).show(ui, |ui| {
        for (field, name, value, hint) in [
            (SectionField::Width, format!("Width W ({len})"), section.width, "Roadway width, both sides"),
            (
                SectionField::CutSlope,
                "Cut slope (H:1)".to_owned(),
                section.cut_slope,
                "Horizontal per unit rise",
            ),
            (
                SectionField::FillSlope,
                "Fill slope (H:1)".to_owned(),
                section.fill_slope,
                "Horizontal per unit rise",
            ),
            (
                SectionField::Shrinkage,
                "Shrinkage (%)".to_owned(),
                section.shrinkage_percent,
                "Of cut placed as fill",
            ),
        ] {
            ui.label(&name).on_hover_text(hint);
            let id = CellId::Section(field);
            if let Some(text) = edit_cell(ui, &mut app.view, id, &format!("{value}"), 70.0, &name) {
                let mut probe = section;
                let parsed = parse_number(&text).and_then(|v| {
                    match field {
                        SectionField::Width => probe.width = v,
                        SectionField::CutSlope => probe.cut_slope = v,
                        SectionField::FillSlope => probe.fill_slope = v,
                        SectionField::Shrinkage => probe.shrinkage_percent = v,
                    }
                    probe.validate().map(|()| probe).map_err(|e| e.to_string())
                });
                if let Some(p) = settle(&mut app.view, id, &text, parsed) {
                    next = p;
                }
            }
            ui.end_row();
        }
    });
    if next != section {
        app.push(Action::edit(Edit::SetSection(Some(next))));
    }
    let vol = volume_symbol(units);
    match &app.analysis().earthwork {
        Some(Ok(e)) => {
            let net = e.net();
            ui.label(format!("Cut {:.0} {vol} · Fill {:.0} {vol}", e.cut, e.fill));
            ui.label(
                RichText::new(format!(
                    "Net {:+.0} {vol} ({}) after {}% shrinkage",
                    net,
                    if net >= 0.0 { "waste" } else { "borrow" },
                    e.section.shrinkage_percent
                ))
                .strong(),
            )
            .on_hover_text(format!(
                "{} stations (interval, grade points, PVC, PVI, PVT); areas in {}",
                e.rows.len(),
                area_symbol(units)
            ));
        }
        Some(Err(e)) => {
            ui.label(RichText::new(format!("No estimate: {e}")).color(palette.warn));
        }
        None => {}
    }
}

/// The mass-haul strip under the profile: the mass ordinate on the
/// profile's station axis.
pub fn mass_strip_ui(app: &mut GradewrightApp, ui: &mut egui::Ui) {
    let palette = Palette::of(ui);
    let units = app.project().units;
    let vol = volume_symbol(units);
    let Some(Ok(estimate)) = app.analysis().earthwork.as_ref() else {
        if app.project().ground.range().is_some() {
            ui.label(
                RichText::new("Mass haul: tick Estimate earthwork (right) to see it").color(palette.warn),
            );
        }
        return;
    };
    let points: Vec<[f64; 2]> = estimate.rows.iter().map(|r| [r.station, r.mass]).collect();
    let (first, last) = (points.first().map_or(0.0, |p| p[0]), points.last().map_or(0.0, |p| p[0]));
    // The totals beside the strip, not in a legend name: a name that
    // changes every frame is a new legend entry every frame.
    ui.label(
        RichText::new(format!(
            "Mass haul (level-section estimate, {vol}): cut {:.0} · fill {:.0} · net {:+.0}",
            estimate.cut,
            estimate.fill,
            estimate.net()
        ))
        .small(),
    );
    let lookup = points.clone();
    let decimals = units.station_decimals();
    Plot::new("mass-strip")
        .height(ui.available_height().max(70.0))
        .link_axis(egui::Id::unique(super::sight_ui::STATION_AXIS), [true, false])
        .allow_drag([true, false])
        .allow_zoom([true, false])
        .allow_scroll([true, false])
        .include_y(0.0)
        .x_axis_formatter(move |mark, _| format_station(mark.value, units, 0))
        .y_axis_label(format!("Mass ({vol})"))
        .legend(Legend::default().position(egui_plot::Corner::RightTop))
        .label_formatter(move |hover| {
            let x = match hover {
                egui_plot::HoverPosition::NearDataPoint { position, .. }
                | egui_plot::HoverPosition::Elsewhere { position } => position.x,
            };
            let i = lookup.partition_point(|p| p[0] < x).min(lookup.len().saturating_sub(1));
            let p = lookup.get(i)?;
            Some(format!("{}\nmass {:+.1} {vol}", format_station(p[0], units, decimals), p[1]))
        })
        .show(ui, |pui| {
            pui.line(
                Line::new("Balance", PlotPoints::from(vec![[first, 0.0], [last, 0.0]]))
                    .color(palette.grade_line)
                    .style(LineStyle::dashed_loose())
                    .width(1.0),
            );
            pui.line(Line::new("Mass ordinate", PlotPoints::from(points)).color(palette.profile).width(1.8));
        });
}
