//! The station-equation table: where the plan stationing jumps (back =
//! ahead) at an internal station. Add, edit and delete, one undo step each;
//! the back station is the one the road reaches there, kept in step.

use egui::RichText;
use gradewright_geometry::{Equations, StationEquation, format_station, parse_station};

use super::View;
use crate::gui::cell::Cells;
use crate::gui::command::Edit;
use crate::gui::theme::Palette;

/// Editable columns of the table.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
enum Column {
    /// The internal station (distance along the alignment from its start
    /// station).
    Internal,
    /// The plan station ahead.
    Ahead,
}

/// The table's own state: the cells being typed.
#[derive(Debug)]
pub struct EquationsPanel {
    cells: Cells<(usize, Column)>,
    refused: super::Refusal,
}

impl Default for EquationsPanel {
    fn default() -> Self {
        Self { cells: Cells::new("equations"), refused: super::Refusal::default() }
    }
}

impl EquationsPanel {
    /// Forgets the old project's cells.
    pub fn reset(&mut self) {
        self.cells.clear();
        self.refused.clear();
    }

    /// The table: internal station, back (the road's), ahead; delete; add
    /// at the selected PVI (or mid-profile).
    pub fn ui(&mut self, ui: &mut egui::Ui, view: &mut View<'_>) {
        let doc = view.doc;
        let palette = Palette::of(ui);
        let units = doc.project().units;
        let len = units.length_symbol();
        let decimals = units.station_decimals();
        let list: Vec<StationEquation> = doc.project().equations.as_slice().to_vec();
        let mut changed: Option<Vec<StationEquation>> = None;
        if list.is_empty() {
            ui.label(
                "No station equations: plan stations are the internal stations. Add one where the \
                 stationing jumps (back = ahead).",
            );
        } else {
            ui.label(
                RichText::new("Stations shown and typed everywhere are plan stations; the geometry runs along the internal station.")
                    .weak(),
            );
        }
        egui::Grid::new("equations-grid").striped(true).spacing([6.0, 3.0]).show(ui, |ui| {
            if !list.is_empty() {
                for h in ["", "Internal", "Back", "= Ahead", ""] {
                    ui.label(RichText::new(h).strong());
                }
                ui.end_row();
            }
            for (i, e) in list.iter().enumerate() {
                ui.label(format!("{}", i + 1));
                let id = (i, Column::Internal);
                let shown = format_station(e.internal, units, decimals);
                if let Some(text) =
                    self.cells.edit(ui, id, &shown, 80.0, &format!("Equation {} internal station", i + 1))
                    && let Some(v) =
                        self.cells.settle(id, &text, parse_station(&text, units).map_err(|x| x.to_string()))
                {
                    let mut next = list.clone();
                    if let Some(slot) = next.get_mut(i) {
                        slot.internal = v;
                    }
                    changed = Some(next);
                }
                ui.label(format_station(e.back, units, decimals));
                let id = (i, Column::Ahead);
                let shown = format_station(e.ahead, units, decimals);
                if let Some(text) =
                    self.cells.edit(ui, id, &shown, 80.0, &format!("Equation {} ahead station", i + 1))
                    && let Some(v) =
                        self.cells.settle(id, &text, parse_station(&text, units).map_err(|x| x.to_string()))
                {
                    let mut next = list.clone();
                    if let Some(slot) = next.get_mut(i) {
                        slot.ahead = v;
                    }
                    changed = Some(next);
                }
                if super::delete_button(
                    ui,
                    "Delete this station equation",
                    &format!("Delete station equation {}", i + 1),
                ) {
                    let mut next = list.clone();
                    if i < next.len() {
                        next.remove(i);
                    }
                    self.cells.clear();
                    changed = Some(next);
                }
                ui.end_row();
                let gap = e.ahead - e.back;
                let what = if gap > 0.0 {
                    format!("short by {gap:.3} {len}: these plan stations do not exist")
                } else if gap < 0.0 {
                    format!(
                        "long by {:.3} {len}: these plan stations occur twice, typed with (1) or (2)",
                        -gap
                    )
                } else {
                    "no jump".to_owned()
                };
                ui.label("");
                ui.label(RichText::new(what).color(palette.warn));
                ui.end_row();
            }
        });
        if ui
            .button("Add station equation")
            .on_hover_text("At the selected PVI (or mid-profile); then type its ahead station")
            .clicked()
            && let Some(internal) = view.station_to_add()
        {
            let plan = doc.project().stationing().plan(internal).value;
            let mut next = list.clone();
            next.push(StationEquation { internal, back: plan, ahead: plan });
            changed = Some(next);
        }
        self.refused.ui(ui, palette);
        if let Some(next) = changed {
            let next = Equations::settled(next);
            let problem = next.problem();
            if self.refused.settle(view, problem, "station equation", Edit::SetEquations(next)) {
                self.cells.clear();
            }
        }
    }
}
