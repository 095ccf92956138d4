//! The editor's panels. Each owns its state and its caches and is drawn from
//! the document, read only (the plot alone drags a PVI, as edits of the
//! document); what the user asks for goes to the action queue, applied after
//! the frame.

pub mod criteria;
pub mod equations;
pub mod export;
pub mod findings;
pub mod plot;
mod plot_scene;
pub mod ranges;
pub mod sight;
pub mod site;
pub mod table;

use egui::RichText;

use super::command::Action;
use super::document::Document;

/// Why a table's last change was refused (the model kept as it was), shown
/// under the table until the next change.
#[derive(Debug, Default)]
pub struct Refusal(Option<String>);

impl Refusal {
    /// Forgets it (another project is open).
    pub fn clear(&mut self) {
        self.0 = None;
    }

    /// Shows why, if a change was refused.
    pub fn ui(&self, ui: &mut egui::Ui, palette: super::theme::Palette) {
        if let Some(why) = &self.0 {
            ui.label(RichText::new(why).color(palette.fail));
        }
    }

    /// Queues `edit` when `problem` is `None`; else keeps the model and says
    /// why, naming entry `index` of `what` ("station equation 2").
    /// Whether it was refused.
    pub fn settle(
        &mut self,
        view: &mut View<'_>,
        problem: Option<(usize, String)>,
        what: &str,
        edit: super::command::Edit,
    ) -> bool {
        self.0 = problem.map(|(k, why)| format!("Not changed: {what} {} — {why}", k + 1));
        if self.0.is_none() {
            view.edit(edit);
        }
        self.0.is_some()
    }
}

/// A row's small delete button, hovered with `hover` and named `name` for
/// assistive technology (and the tests); whether it was clicked.
pub fn delete_button(ui: &mut egui::Ui, hover: &str, name: &str) -> bool {
    let delete = ui.small_button("🗑").on_hover_text(hover);
    delete.widget_info(|| egui::WidgetInfo::labeled(egui::Role::Button, true, name));
    delete.clicked()
}

/// What a panel is drawn with: the document (read only), the selected PVI,
/// and the queue its actions go to.
pub struct View<'a> {
    /// The document.
    pub doc: &'a Document,
    /// The selected PVI.
    pub selected: Option<usize>,
    /// Where the panel's actions go (applied after the frame).
    pub queue: &'a mut Vec<Action>,
}

impl View<'_> {
    /// Queues an action for the end of the frame.
    pub fn push(&mut self, action: Action) {
        self.queue.push(action);
    }

    /// Queues an edit (one undo step).
    pub fn edit(&mut self, edit: super::command::Edit) {
        self.queue.push(Action::edit(edit));
    }

    /// Where something added from a panel goes: the selected PVI's
    /// station, else the middle of the profile (`None` when it cannot be
    /// evaluated).
    pub fn station_to_add(&self) -> Option<f64> {
        self.selected
            .and_then(|i| self.doc.project().pvis.get(i))
            .map(|p| p.station.0)
            .or_else(|| self.doc.analysis().alignment.as_ref().map(|a| 0.5 * (a.start().0 + a.end().0)))
    }
}

/// Which page the side panel shows under the findings.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
pub enum SidePage {
    /// The design criteria.
    #[default]
    Criteria,
    /// The control points, the ground and the earthwork.
    Site,
}

/// Every panel of the editor.
#[derive(Default)]
pub struct Panels {
    /// The profile plot and its toolbar.
    pub plot: plot::PlotPanel,
    /// The PVI table.
    pub table: table::TablePanel,
    /// The sight-distance strip.
    pub sight: sight::SightStrip,
    /// The control points, the ground and earthwork, the mass-haul strip.
    pub site: site::SitePanel,
    /// The station equations.
    pub equations: equations::EquationsPanel,
    /// The criteria ranges.
    pub ranges: ranges::RangesPanel,
    /// The design criteria.
    pub criteria: criteria::CriteriaPanel,
    /// The export windows.
    pub export: export::ExportPanel,
    /// The side panel's page.
    pub side_page: SidePage,
}

impl Panels {
    /// Forgets everything tied to the old project (another one is open).
    pub fn reset(&mut self) {
        self.table.reset();
        self.site.reset();
        self.equations.reset();
        self.ranges.reset();
        self.criteria.reset();
        self.plot.reset();
    }

    /// Lays the panels out in `ui` for one frame: the PVI table at the
    /// bottom, the findings and the criteria or site on the right, the plot
    /// and its strips in the middle. Returns whether a drag moved a PVI.
    pub fn show(
        &mut self,
        ui: &mut egui::Ui,
        doc: &mut Document,
        selected: &mut Option<usize>,
        queue: &mut Vec<Action>,
    ) -> bool {
        egui::Panel::bottom("pvi-table").resizable(true).default_size(250.0).min_size(120.0).show(ui, |ui| {
            self.table.ui(ui, &mut View { doc, selected: *selected, queue });
        });
        egui::Panel::right("side").resizable(true).default_size(430.0).min_size(300.0).show(ui, |ui| {
            let mut view = View { doc, selected: *selected, queue };
            ui.heading("Findings");
            findings::findings_ui(ui, &mut view);
            ui.separator();
            ui.horizontal(|ui| {
                ui.selectable_value(&mut self.side_page, SidePage::Criteria, "Design criteria");
                ui.selectable_value(&mut self.side_page, SidePage::Site, "Ground & controls");
            });
            egui::ScrollArea::vertical().id_salt("side-scroll").show(ui, |ui| match self.side_page {
                SidePage::Criteria => {
                    egui::CollapsingHeader::new(RichText::new("Design criteria").heading())
                        .default_open(true)
                        .show(ui, |ui| self.criteria.ui(ui, &mut view));
                    let count = view.doc.project().criteria_ranges.len();
                    egui::CollapsingHeader::new(
                        RichText::new(format!("Criteria by station range ({count})")).heading(),
                    )
                    .id_salt("criteria-ranges")
                    .default_open(count > 0)
                    .show(ui, |ui| self.ranges.ui(ui, &mut view));
                }
                SidePage::Site => {
                    egui::CollapsingHeader::new(RichText::new("Control points").heading())
                        .default_open(true)
                        .show(ui, |ui| self.site.controls_ui(ui, &mut view));
                    egui::CollapsingHeader::new(RichText::new("Ground and earthwork").heading())
                        .default_open(true)
                        .show(ui, |ui| self.site.earthwork_ui(ui, &mut view));
                    let count = view.doc.project().equations.as_slice().len();
                    egui::CollapsingHeader::new(
                        RichText::new(format!("Station equations ({count})")).heading(),
                    )
                    .id_salt("station-equations")
                    .default_open(count > 0)
                    .show(ui, |ui| self.equations.ui(ui, &mut view));
                }
            });
        });
        let mut moved = false;
        egui::CentralPanel::default().show(ui, |ui| {
            self.plot.toolbar_ui(ui, doc, *selected, queue);
            let mass = self.site.mass_shown && doc.project().ground.range().is_some();
            let share = if mass { 0.2 } else { 0.3 };
            let strip = |on: bool, ui: &egui::Ui| {
                if on { (ui.available_height() * share).clamp(80.0, 240.0) } else { 0.0 }
            };
            let (sight_h, mass_h) = (strip(self.sight.shown, ui), strip(mass, ui));
            moved = self.plot.ui(ui, ui.available_height() - sight_h - mass_h, doc, selected, queue);
            let range = self.plot.x_range();
            if self.sight.shown {
                ui.allocate_ui(egui::vec2(ui.available_width(), sight_h), |ui| self.sight.ui(ui, doc, range));
            }
            if mass {
                site::mass_strip_ui(ui, doc, range);
            }
        });
        moved
    }
}
