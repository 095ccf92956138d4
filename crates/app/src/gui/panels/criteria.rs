//! The design criteria: each value computed from the design speed or the
//! user's own, with a reset to the computed value.

use egui::RichText;
use gradewright_geometry::{Area, CriterionId, RoadClass, Setting, Terrain, trimmed};

use super::View;
use crate::gui::cell::{Cells, parse_number};
use crate::gui::command::Edit;
use crate::gui::theme::Palette;

/// A cell of the criteria panel.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
enum Cell {
    /// The design speed.
    DesignSpeed,
    /// A criterion's value.
    Criterion(CriterionId),
}

/// The criteria panel's own state: the cells being edited.
#[derive(Debug)]
pub struct CriteriaPanel {
    cells: Cells<Cell>,
}

impl Default for CriteriaPanel {
    fn default() -> Self {
        Self { cells: Cells::new("criteria") }
    }
}

impl CriteriaPanel {
    /// Forgets the old project's cells.
    pub fn reset(&mut self) {
        self.cells.clear();
    }

    /// The criteria panel.
    #[allow(clippy::too_many_lines)]
    pub fn ui(&mut self, ui: &mut egui::Ui, view: &mut View<'_>) {
        let doc = view.doc;
        let palette = Palette::of(ui);
        let units = doc.project().units;
        let criteria = doc.project().criteria.clone();
        egui::Grid::new("criteria").num_columns(4).spacing([8.0, 4.0]).striped(true).show(ui, |ui| {
            ui.label("Units");
            ui.label(units.to_string()).on_hover_text("Set when the project is created; never mixed");
            ui.label("");
            ui.label("");
            ui.end_row();

            ui.label("Design speed");
            let current = criteria.design_speed.map_or_else(String::new, |v| trimmed(v, 4));
            let id = Cell::DesignSpeed;
            if let Some(text) = self.cells.edit(ui, id, &current, 60.0, "Design speed value") {
                let (low, high, _) = units.design_speed_table();
                let parsed = parse_number(&text).and_then(|v| {
                    if (low..=high).contains(&v) {
                        Ok(v)
                    } else {
                        Err(format!(
                            "{} is outside {low}–{high} {}, the speeds of the published tables",
                            gradewright_geometry::shown(v),
                            units.speed_symbol()
                        ))
                    }
                });
                if let Some(v) = self.cells.settle(id, &text, parsed) {
                    let mut c = criteria.clone();
                    c.design_speed = Some(v);
                    view.edit(Edit::SetCriteria(Box::new(c)));
                }
            }
            ui.label(units.speed_symbol());
            ui.label("");
            ui.end_row();

            let label = ui.label("Terrain");
            let mut terrain = criteria.terrain;
            let combo =
                egui::ComboBox::from_id_salt("terrain").selected_text(terrain.label()).show_ui(ui, |ui| {
                    for t in Terrain::ALL {
                        ui.selectable_value(&mut terrain, t, t.label());
                    }
                });
            let _ = combo.response.labelled_by(label.id);
            if terrain != criteria.terrain {
                let mut c = criteria.clone();
                c.terrain = terrain;
                view.edit(Edit::SetCriteria(Box::new(c)));
            }
            ui.label("");
            ui.label("");
            ui.end_row();

            let label = ui.label("Road class").on_hover_text("Sets the default maximum grade");
            let mut class = criteria.road_class;
            let combo =
                egui::ComboBox::from_id_salt("road-class").selected_text(class.label()).show_ui(ui, |ui| {
                    for c in RoadClass::ALL {
                        ui.selectable_value(&mut class, c, c.label());
                    }
                });
            let _ = combo.response.labelled_by(label.id);
            let mut area = criteria.area;
            let combo = egui::ComboBox::from_id_salt("area").selected_text(area.label()).show_ui(ui, |ui| {
                for a in Area::ALL {
                    ui.selectable_value(&mut area, a, a.label());
                }
            });
            let _ = combo.response.on_hover_text("Rural or urban");
            if class != criteria.road_class || area != criteria.area {
                let mut c = criteria.clone();
                c.road_class = class;
                c.area = area;
                view.edit(Edit::SetCriteria(Box::new(c)));
            }
            ui.label("");
            ui.end_row();

            ui.label("Sag comfort check").on_hover_text(
                "Also check sags for comfort on an unlit road (on a lit road comfort is the sag rule)",
            );
            let mut comfort = criteria.sag_comfort;
            if ui.checkbox(&mut comfort, "on").changed() {
                let mut c = criteria.clone();
                c.sag_comfort = comfort;
                view.edit(Edit::SetCriteria(Box::new(c)));
            }
            ui.label("");
            ui.label("");
            ui.end_row();

            for (label, value, set) in [
                ("Headlight check", criteria.headlight_check, 0),
                ("Grade-adjusted SSD", criteria.grade_adjusted_ssd, 1),
            ] {
                ui.label(label).on_hover_text(if set == 0 {
                    "Headlight sight distance on sags. Switch off for a continuously lit road: the sag K and \
                 length then follow the comfort rule"
                } else {
                    "Required SSD at each station from the average grade over the braking distance, per \
                 direction (downgrades need more); never less than the design SSD"
                });
                let mut on = value;
                if ui.checkbox(&mut on, "on").changed() {
                    let mut c = criteria.clone();
                    if set == 0 {
                        c.headlight_check = on;
                    } else {
                        c.grade_adjusted_ssd = on;
                    }
                    view.edit(Edit::SetCriteria(Box::new(c)));
                }
                ui.label("");
                ui.label("");
                ui.end_row();
            }

            let resolved = doc.analysis().criteria.clone();
            if let Ok(r) = &resolved {
                ui.label("Sag rule in force").on_hover_text("Follows the headlight check");
                ui.label(RichText::new(r.sag_rule().label()).strong());
                ui.label("");
                ui.label("");
                ui.end_row();
            }
            for id in CriterionId::ALL {
                let entry = resolved.as_ref().ok().and_then(|r| r.entry(id).cloned());
                let setting = criteria.setting(id);
                ui.label(id.label()).on_hover_text(entry.as_ref().map_or("", |e| e.rule.as_str()).to_owned());
                let shown = match (setting, &entry) {
                    (Setting::Override(v), _) => format!("{v}"),
                    (Setting::Computed, Some(e)) => trim(e.value),
                    (Setting::Computed, None) => String::new(),
                };
                let cell = Cell::Criterion(id);
                if let Some(text) = self.cells.edit(ui, cell, &shown, 60.0, &format!("{} value", id.label()))
                {
                    let parsed = parse_number(&text)
                        .and_then(|v| if v < 0.0 { Err(format!("{v} is negative")) } else { Ok(v) });
                    if let Some(v) = self.cells.settle(cell, &text, parsed) {
                        let mut c = criteria.clone();
                        *c.setting_mut(id) = Setting::Override(v);
                        view.edit(Edit::SetCriteria(Box::new(c)));
                    }
                }
                ui.label(id.quantity().symbol(units));
                ui.horizontal(|ui| match setting {
                    Setting::Override(_) => {
                        ui.label(RichText::new("override").color(palette.warn));
                        if ui
                            .small_button("↺ computed")
                            .on_hover_text("Reset to the computed value")
                            .clicked()
                        {
                            let mut c = criteria.clone();
                            *c.setting_mut(id) = Setting::Computed;
                            self.cells.forget(cell);
                            view.edit(Edit::SetCriteria(Box::new(c)));
                        }
                    }
                    Setting::Computed => {
                        ui.label(RichText::new("computed").weak());
                    }
                });
                ui.end_row();
            }
        });
        if let Err(e) = &doc.analysis().criteria {
            ui.label(RichText::new(format!("⚠ Checks are off: {e}")).color(palette.warn));
        }
    }
}

/// A value without trailing zeros (for showing computed criteria).
fn trim(v: f64) -> String {
    trimmed(v, 4)
}
