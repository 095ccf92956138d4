//! The criteria ranges: stretches of road whose design speed or lighting
//! differ from the project's. Add, edit and delete, one undo step each.

use egui::RichText;
use gradewright_geometry::{CriteriaRange, ranges_problem};

use super::View;
use crate::gui::cell::{Cells, parse_number};
use crate::gui::command::Edit;
use crate::gui::theme::Palette;

/// Editable columns of the table.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
enum Column {
    /// Where it begins.
    From,
    /// Where it ends.
    To,
    /// Its design speed.
    Speed,
}

/// The table's own state.
#[derive(Debug)]
pub struct RangesPanel {
    cells: Cells<(usize, Column)>,
    refused: super::Refusal,
}

impl Default for RangesPanel {
    fn default() -> Self {
        Self { cells: Cells::new("criteria-ranges"), refused: super::Refusal::default() }
    }
}

impl RangesPanel {
    /// Forgets the old project's cells.
    pub fn reset(&mut self) {
        self.cells.clear();
        self.refused.clear();
    }

    /// The table: from, to (plan stations), design speed, headlight check;
    /// delete; add after the last range (or mid-profile).
    pub fn ui(&mut self, ui: &mut egui::Ui, view: &mut View<'_>) {
        let doc = view.doc;
        let palette = Palette::of(ui);
        let project = doc.project();
        let units = project.units;
        let at = project.stationing();
        let list = project.criteria_ranges.clone();
        let mut changed: Option<Vec<CriteriaRange>> = None;
        ui.label(
            RichText::new(
                "Where the design speed or the lighting differ: outside every range the criteria above apply; a curve \
                 across a change is judged under the stricter.",
            )
            .weak(),
        );
        egui::Grid::new("ranges-grid").striped(true).spacing([6.0, 3.0]).show(ui, |ui| {
            if !list.is_empty() {
                for h in ["", "From", "To", &format!("Speed ({})", units.speed_symbol()), "Headlights", ""] {
                    ui.label(RichText::new(h).strong());
                }
                ui.end_row();
            }
            for (i, r) in list.iter().enumerate() {
                ui.label(format!("{}", i + 1));
                let mut set = |f: &mut dyn FnMut(&mut CriteriaRange)| {
                    let mut next = changed.clone().unwrap_or_else(|| list.clone());
                    if let Some(slot) = next.get_mut(i) {
                        f(slot);
                    }
                    changed = Some(next);
                };
                for (column, value, name) in [(Column::From, r.from, "from"), (Column::To, r.to, "to")] {
                    let id = (i, column);
                    let shown = at.label_std(value);
                    if let Some(text) =
                        self.cells.edit(ui, id, &shown, 80.0, &format!("Range {} {name}", i + 1))
                        && let Some(v) =
                            self.cells.settle(id, &text, at.parse(&text).map_err(|e| e.to_string()))
                    {
                        set(&mut |r| if column == Column::From { r.from = v } else { r.to = v });
                    }
                }
                let id = (i, Column::Speed);
                let shown = r.design_speed.map_or_else(String::new, |v| gradewright_geometry::trimmed(v, 2));
                if let Some(text) =
                    self.cells.edit(ui, id, &shown, 44.0, &format!("Range {} design speed", i + 1))
                {
                    let parsed =
                        if text.trim().is_empty() { Ok(None) } else { parse_number(&text).map(Some) };
                    if let Some(v) = self.cells.settle(id, &text, parsed) {
                        set(&mut |r| r.design_speed = v);
                    }
                }
                let mut lights = r.headlight_check.unwrap_or(project.criteria.headlight_check);
                let before = lights;
                ui.checkbox(&mut lights, "")
                    .on_hover_text("Headlight check in this range (off: a lit section)");
                if lights != before {
                    set(&mut |r| r.headlight_check = Some(lights));
                }
                if super::delete_button(ui, "Delete this range", &format!("Delete criteria range {}", i + 1))
                {
                    let mut next = list.clone();
                    if i < next.len() {
                        next.remove(i);
                    }
                    self.cells.clear();
                    changed = Some(next);
                }
                ui.end_row();
            }
        });
        if ui
            .button("Add criteria range")
            .on_hover_text("After the last range, or over the middle of the profile")
            .clicked()
        {
            let start = project.pvis.first().map_or(0.0, |p| p.station.0);
            let end = project.pvis.last().map_or(0.0, |p| p.station.0);
            let from = list.last().map_or(start + (end - start) / 3.0, |r| r.to);
            let to = (from + (end - start) / 3.0).min(end.max(from + 1.0));
            let mut next = list.clone();
            next.push(CriteriaRange {
                from,
                to,
                design_speed: project.criteria.design_speed,
                ..CriteriaRange::default()
            });
            changed = Some(next);
        }
        self.refused.ui(ui, palette);
        if let Some(mut next) = changed {
            next.sort_by(|a, b| a.from.total_cmp(&b.from));
            let problem = ranges_problem(&next);
            if self.refused.settle(view, problem, "criteria range", Edit::SetRanges(next)) {
                self.cells.clear();
            }
        }
    }
}
