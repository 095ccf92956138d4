//! The site: the control-point table, the ground and earthwork panel and
//! the mass-haul strip (the hatching and the control symbols over the plot
//! are the plot's, [`super::plot_scene`]).

use egui::RichText;
use egui_plot::{Line, LineStyle, PlotPoints};
use gradewright_draw::Shape;
use gradewright_geometry::{
    ControlKind, ControlPoint, ControlStatus, Section, SectionField, area_symbol, volume_symbol,
};

use super::View;
use super::plot::strip;
use super::plot_scene::symbol;
use crate::gui::cell::{Cells, parse_length, parse_number};
use crate::gui::command::{Action, Edit};
use crate::gui::document::Document;
use crate::gui::theme::Palette;

/// Editable columns of the control-point table.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
enum ControlColumn {
    /// Name.
    Name,
    /// Station.
    Station,
    /// Elevation.
    Elevation,
    /// Tolerance of a fixed point.
    Tolerance,
    /// Clearance of a maximum point under a structure.
    Clearance,
}

/// A cell of the site panel.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
enum Cell {
    /// A control-point table cell: row and column.
    Control(usize, ControlColumn),
    /// An earthwork section value.
    Section(SectionField),
}

/// The site panel's own state.
#[derive(Debug)]
pub struct SitePanel {
    cells: Cells<Cell>,
    /// Whether the mass-haul strip is shown under the profile.
    pub mass_shown: bool,
}

impl Default for SitePanel {
    fn default() -> Self {
        Self { cells: Cells::new("site"), mass_shown: true }
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

impl SitePanel {
    /// Forgets the old project's cells.
    pub fn reset(&mut self) {
        self.cells.clear();
    }

    /// The control-point table: name, station, kind, elevation, tolerance and
    /// whether the profile meets it; add and delete. Every change is one undo
    /// step.
    #[allow(clippy::too_many_lines)]
    pub fn controls_ui(&mut self, ui: &mut egui::Ui, view: &mut View<'_>) {
        let doc = view.doc;
        let palette = Palette::of(ui);
        let units = doc.project().units;
        let len = units.length_symbol();
        let controls = doc.project().controls.clone();
        let status = doc.analysis().control_status.clone();
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
            let id = Cell::Control(i, ControlColumn::Name);
            if let Some(text) = self.cells.edit(ui, id, &c.name, 84.0, &format!("Control {} name", i + 1)) {
                self.cells.forget(id);
                set(&mut |p| p.name = text.trim().to_owned());
            }
            let id = Cell::Control(i, ControlColumn::Station);
            let shown = doc.project().stationing().label(c.station, units.station_decimals());
            if let Some(text) =
                self.cells.edit(ui, id, &shown, 72.0, &format!("Control {} station", i + 1))
                && let Some(s) =
                    self.cells.settle(id, &text, doc.project().stationing().parse(&text).map_err(|e| e.to_string()))
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
            let id = Cell::Control(i, ControlColumn::Elevation);
            if let Some(text) = self.cells.edit(
                ui,
                id,
                &format!("{:.3}", c.elevation),
                64.0,
                &format!("Control {} elevation", i + 1),
            ) && let Some(v) = self.cells.settle(id, &text, parse_number(&text))
            {
                set(&mut |p| p.elevation = v);
            }
            if c.kind == ControlKind::Fixed {
                let id = Cell::Control(i, ControlColumn::Tolerance);
                if let Some(v) = self.length_cell(ui, id, c.tolerance, &format!("Control {} tolerance", i + 1)) {
                    set(&mut |p| p.tolerance = v);
                }
            } else if c.kind == ControlKind::Maximum {
                // Under a structure: the clearance taken off the underside
                // (0: no sight check under it).
                let id = Cell::Control(i, ControlColumn::Clearance);
                if let Some(v) = self.length_cell(ui, id, c.clearance, &format!("Control {} clearance", i + 1)) {
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
                self.cells.retain(|k| !matches!(k, Cell::Control(..)));
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
            && let Some(station) = view.station_to_add()
        {
            view.push(Action::AddControl { station, elevation: None });
        }
        if let Some(next) = changed {
            view.edit(Edit::SetControls(next));
        }
    }

    /// A small cell for a length of 0 or more (empty is 0); the value when a
    /// valid one is committed.
    fn length_cell(&mut self, ui: &mut egui::Ui, id: Cell, value: f64, label: &str) -> Option<f64> {
        self.cells.value(ui, id, (&format!("{value:.3}"), 44.0, label), parse_length)
    }

    /// The ground and earthwork panel: the ground's extent, the largest cut
    /// and fill, the level typical section and the totals.
    #[allow(clippy::too_many_lines)]
    pub fn earthwork_ui(&mut self, ui: &mut egui::Ui, view: &mut View<'_>) {
        let doc = view.doc;
        let palette = Palette::of(ui);
        let units = doc.project().units;
        let len = units.length_symbol();
        let label = |s: f64| doc.project().stationing().label(s, units.station_decimals());
        let ground = doc.project().ground.clone();
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
        let summary = doc.analysis().cut_fill;
        match summary.cut {
            Some((s, d)) => ui.label(format!("Largest cut: {d:.3} {len} at {}", label(s))),
            None => ui.label("No cut"),
        };
        match summary.fill {
            Some((s, d)) => ui.label(format!("Largest fill: {d:.3} {len} at {}", label(s))),
            None => ui.label("No fill"),
        };
        ui.separator();
        let section = doc.project().section;
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
        view.edit(Edit::SetSection(next));
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
                let id = Cell::Section(field);
                if let Some(text) = self.cells.edit(ui, id, &format!("{value}"), 70.0, &name) {
                    let mut probe = section;
                    let parsed = parse_number(&text).and_then(|v| {
                        *probe.value_mut(field) = v;
                        probe.validate().map(|()| probe).map_err(|e| e.to_string())
                    });
                    if let Some(p) = self.cells.settle(id, &text, parsed) {
                        next = p;
                    }
                }
                ui.end_row();
            }
        });
        if next != section {
            view.edit(Edit::SetSection(Some(next)));
        }
        let vol = volume_symbol(units);
        match &doc.analysis().earthwork {
            Some(Ok(e)) => {
                let net = e.net();
                ui.label(format!(
                    "From {} to {} (where the ground covers the profile)",
                    doc.project().stationing().label(e.range.0, units.station_decimals()),
                    doc.project().stationing().label(e.range.1, units.station_decimals())
                ));
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
                    "{} sections (interval, every ground point, grade points, PVC, PVI, PVT); areas in {}",
                    e.len(),
                    area_symbol(units)
                ));
            }
            Some(Err(e)) => {
                ui.label(RichText::new(format!("No estimate: {e}")).color(palette.warn));
            }
            None => {}
        }
    }
}

/// The mass-haul strip under the profile: the mass ordinate on the
/// profile's station axis, over the stations `x_range` the plot shows
/// (thinned to the strip's width: a section at every ground point of a
/// dense survey is far more than a screen shows).
pub fn mass_strip_ui(ui: &mut egui::Ui, doc: &Document, x_range: (f64, f64)) {
    let palette = Palette::of(ui);
    let units = doc.project().units;
    let vol = volume_symbol(units);
    let Some(Ok(estimate)) = doc.analysis().earthwork.as_ref() else {
        if doc.project().ground.range().is_some() {
            ui.label(
                RichText::new("Mass haul: tick Estimate earthwork (right) to see it").color(palette.warn),
            );
        }
        return;
    };
    #[allow(clippy::cast_possible_truncation, clippy::cast_sign_loss)]
    let columns = ui.available_width().max(100.0) as usize;
    let points = estimate.mass_line(x_range, columns);
    let (first, last) = estimate.range;
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
    strip("mass-strip", ui.available_height(), 70.0, doc.project(), format!("Mass ({vol})"))
        .label_formatter(move |hover| {
            let x = match hover {
                egui_plot::HoverPosition::NearDataPoint { position, .. }
                | egui_plot::HoverPosition::Elsewhere { position } => position.x,
            };
            let i = lookup.partition_point(|p| p[0] < x).min(lookup.len().saturating_sub(1));
            let p = lookup.get(i)?;
            Some(format!("{}\nmass {:+.1} {vol}", doc.project().stationing().label(p[0], decimals), p[1]))
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
