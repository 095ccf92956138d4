//! The profile plot: tangents and true parabolas, PVI handles that drag,
//! PVC/PVT and high/low marks, grade labels, failing curves flagged; its
//! toolbar and its context menu. What it draws is the drawing crate's scene
//! ([`super::plot_scene`]); the toolbar and the menu issue the same commands
//! as the keys.

use egui::{Pos2, RichText};
use egui_plot::{Legend, Plot, PlotBounds, PlotPoint, PlotTransform};
use gradewright_document::Project;
use gradewright_geometry::{Analysis, Station};

use super::plot_scene::{PlotScene, draw_items, paint_site};
use crate::gui::command::{Action, Edit, UiCommand};
use crate::gui::document::{Document, DragLock};
use crate::gui::theme::Palette;

/// How close (in points) the pointer must be to grab a PVI handle.
const GRAB_RADIUS: f32 = 12.0;

/// The id group that links the station axes of the plot and its strips.
pub const STATION_AXIS: &str = "station-axis";

/// A strip under the profile, `height` points tall with at least `least`:
/// it shares the profile's station axis and pans and zooms along it only,
/// from 0 up, its values labelled `y_label`.
pub fn strip(
    id: &str,
    height: f32,
    least: f32,
    project: &gradewright_document::Project,
    y_label: String,
) -> Plot<'static> {
    let (units, equations) = (project.units, project.equations.clone());
    let grid = station_grid(equations.clone(), units);
    Plot::new(id)
        .height(height.max(least))
        .link_axis(egui::Id::unique(STATION_AXIS), [true, false])
        .allow_drag([true, false])
        .allow_zoom([true, false])
        .allow_scroll([true, false])
        .include_y(0.0)
        .x_axis_formatter(move |mark, _| equations.stationing(units).label(mark.value, 0))
        .x_grid_spacer(grid)
        .y_axis_label(y_label)
        .legend(Legend::default().position(egui_plot::Corner::RightTop))
}

/// What the plot should show on the next frame.
#[derive(Clone, Copy, Debug, PartialEq)]
enum ViewRequest {
    /// The whole profile.
    Fit,
    /// A station range and elevation range.
    Range {
        /// Stations.
        x: (f64, f64),
        /// Elevations.
        y: (f64, f64),
    },
}

/// The plot's own state.
#[derive(Debug)]
pub struct PlotPanel {
    /// Vertical exaggeration (10 = 10:1).
    pub exaggeration: f32,
    view_request: Option<ViewRequest>,
    /// Last frame's transform (for hit-testing before the plot is shown).
    last_transform: Option<PlotTransform>,
    /// The revision last checked to be in view.
    checked_revision: u64,
    /// Where (station, elevation) the context menu was opened.
    context: Option<[f64; 2]>,
    /// What the plot drew last frame (reused while nothing changed).
    pub(super) scene: Option<PlotScene>,
}

impl Default for PlotPanel {
    fn default() -> Self {
        Self {
            exaggeration: 10.0,
            view_request: None,
            last_transform: None,
            checked_revision: 0,
            context: None,
            scene: None,
        }
    }
}

impl PlotPanel {
    /// Forgets the old project's view.
    pub fn reset(&mut self) {
        self.context = None;
        self.request_fit();
    }

    /// Shows the whole profile on the next frame.
    pub fn request_fit(&mut self) {
        self.view_request = Some(ViewRequest::Fit);
    }

    /// Brings PVI `index` and its curve into view on the next frame.
    pub fn request_focus(&mut self, project: &Project, analysis: &Analysis, index: usize) {
        let Some(pvi) = project.pvis.get(index) else { return };
        let curve = analysis.curves.iter().find(|c| c.index == index);
        let (mut x0, mut x1) = match curve {
            Some(c) if c.length() > 0.0 => (c.pvc.0, c.pvt.0),
            _ => (pvi.station.0, pvi.station.0),
        };
        let span = (x1 - x0).max(project.units.station_length() * 0.1);
        x0 -= span;
        x1 += span;
        let ys: Vec<f64> = project
            .pvis
            .iter()
            .filter(|p| p.station.0 >= x0 && p.station.0 <= x1)
            .map(|p| p.elevation)
            .chain(std::iter::once(pvi.elevation))
            .collect();
        let y0 = ys.iter().copied().fold(f64::INFINITY, f64::min);
        let y1 = ys.iter().copied().fold(f64::NEG_INFINITY, f64::max);
        self.view_request = Some(ViewRequest::Range { x: (x0, x1), y: (y0 - 2.0, y1 + 2.0) });
    }

    /// Last frame's transform, once the plot has been shown.
    pub fn last_transform(&self) -> Option<&PlotTransform> {
        self.last_transform.as_ref()
    }

    /// The stations in view (everything before the plot is first shown).
    pub fn x_range(&self) -> (f64, f64) {
        self.last_transform
            .as_ref()
            .map_or((f64::NEG_INFINITY, f64::INFINITY), |t| (t.bounds().min()[0], t.bounds().max()[0]))
    }

    /// The PVI nearest to `pointer` within the grab radius, by last frame's
    /// transform.
    fn hit_test(&self, project: &Project, pointer: Option<Pos2>) -> Option<usize> {
        let transform = self.last_transform.as_ref()?;
        let pointer = pointer?;
        if !transform.frame().contains(pointer) {
            return None;
        }
        project
            .pvis
            .iter()
            .enumerate()
            .map(|(i, p)| {
                let at = transform.position_from_point(&PlotPoint::new(p.station.0, p.elevation));
                (i, at.distance(pointer))
            })
            .filter(|(_, d)| *d <= GRAB_RADIUS)
            .min_by(|a, b| a.1.total_cmp(&b.1))
            .map(|(i, _)| i)
    }

    /// The controls above the plot.
    pub fn toolbar_ui(
        &mut self,
        ui: &mut egui::Ui,
        doc: &mut Document,
        selected: Option<usize>,
        queue: &mut Vec<Action>,
    ) {
        ui.horizontal_wrapped(|ui| {
            ui.label("Vertical exaggeration");
            ui.add(egui::DragValue::new(&mut self.exaggeration).range(1.0..=50.0).speed(0.2).suffix(" : 1"));
            ui.separator();
            // Snapping is a setting of the project (saved with it).
            let mut snap = doc.project().snap;
            ui.checkbox(&mut snap.on, "Snap to")
                .on_hover_text("Dragged and inserted PVIs land on these increments");
            let len = doc.project().units.length_symbol();
            ui.add(
                egui::DragValue::new(&mut snap.station)
                    .range(0.001..=1000.0)
                    .speed(0.1)
                    .suffix(format!(" {len}")),
            );
            ui.label("stations,");
            ui.add(
                egui::DragValue::new(&mut snap.elevation)
                    .range(0.001..=100.0)
                    .speed(0.01)
                    .suffix(format!(" {len}")),
            );
            ui.label("elevations");
            if snap != doc.project().snap {
                queue.push(Action::edit(Edit::SetSnap(snap)));
            }
            ui.separator();
            tool_button(ui, queue, "Fit to profile", UiCommand::Fit, true);
            tool_button(ui, queue, "Zoom to selection", UiCommand::ZoomToSelection, selected.is_some());
            ui.separator();
            ui.label("Lengthen to clear:");
            tool_button(ui, queue, "Selected curve", UiCommand::LengthenSelected, selected.is_some())
                .on_hover_text(
                    "Shortest length, rounded up to the increment, that meets every criterion (L)",
                );
            tool_button(ui, queue, "All failing", UiCommand::LengthenAll, true)
                .on_hover_text("Every failing curve, one undo step (Shift+L)");
            ui.label("in steps of");
            let mut increment = doc.increment();
            ui.add(
                egui::DragValue::new(&mut increment).range(0.1..=1000.0).speed(0.5).suffix(format!(" {len}")),
            );
            doc.set_increment(increment);
        });
        ui.label(
            RichText::new("Drag a PVI to move it (hold Shift: up and down only · Ctrl: along the station only) · double-click a tangent to add a PVI · right-click for more · scroll pans, Ctrl+scroll zooms")
                .weak()
                .small(),
        );
    }

    /// The profile plot, `height` points tall. Returns whether a drag moved
    /// a PVI this frame.
    pub fn ui(
        &mut self,
        ui: &mut egui::Ui,
        height: f32,
        doc: &mut Document,
        selected: &mut Option<usize>,
        queue: &mut Vec<Action>,
    ) -> bool {
        let units = doc.project().units;
        let len = units.length_symbol();
        let palette = Palette::of(ui);
        let pointer =
            ui.input(
                |i| if i.pointer.primary_down() { i.pointer.press_origin() } else { i.pointer.hover_pos() },
            );
        let hit = self.hit_test(doc.project(), pointer);
        let hovering_handle = hit.is_some() || doc.dragging().is_some();
        if hovering_handle {
            ui.ctx().set_cursor_icon(egui::CursorIcon::Grab);
        }
        let alignment = doc.analysis().alignment.clone();
        let ground = doc.project().ground.clone();
        let station_decimals = units.station_decimals();
        let (axis_equations, hover_equations) =
            (doc.project().equations.clone(), doc.project().equations.clone());
        let dragging = doc.dragging().is_some();
        let plot = Plot::new("profile-plot")
            .height(height.max(120.0))
            .link_axis(egui::Id::unique(STATION_AXIS), [true, false])
            .data_aspect(self.exaggeration)
            .allow_drag(!hovering_handle)
            .allow_double_click_reset(false)
            .x_axis_label("Station")
            .y_axis_label(format!("Elevation ({len})"))
            .x_grid_spacer(station_grid(axis_equations.clone(), units))
            .x_axis_formatter(move |mark, _| axis_equations.stationing(units).label(mark.value, 0))
            .legend(Legend::default().position(egui_plot::Corner::RightBottom))
            .label_formatter(move |hover| {
                // While dragging, the readout beside the PVI says it all.
                if dragging {
                    return None;
                }
                let p = match hover {
                    egui_plot::HoverPosition::NearDataPoint { position, .. }
                    | egui_plot::HoverPosition::Elsewhere { position } => *position,
                };
                let station = hover_equations.stationing(units).label(p.x, station_decimals);
                let on_profile = alignment.as_ref().and_then(|a| a.sample(Station(p.x)).ok());
                Some(match on_profile {
                    Some(s) => {
                        let depth = super::site::hover_depth(&ground, s.elevation, p.x, len)
                            .map_or_else(String::new, |d| format!("\n{d}"));
                        format!(
                            "{station}\nprofile {:.3} {len}\ngrade {:+.3} %{depth}\npointer {:.3} {len}",
                            s.elevation, s.grade_percent, p.y
                        )
                    }
                    None => format!("{station}\npointer {:.3} {len}", p.y),
                })
            });
        let mut moved = false;
        let response = plot.show(ui, |pui| {
            let requested = self.view_request.is_some();
            if requested {
                // The view asked for is the view in force: nothing to bring back.
                self.checked_revision = doc.revision();
            }
            if let Some(request) = self.view_request.take() {
                let bounds = match request {
                    ViewRequest::Fit => fit_bounds(doc.project()),
                    ViewRequest::Range { x, y } => Some(PlotBounds::from_min_max([x.0, y.0], [x.1, y.1])),
                };
                if let Some(bounds) = bounds {
                    pui.set_plot_bounds(bounds);
                }
            }
            let resp = pui.response().clone();
            if resp.drag_started()
                && let Some(i) = hit
            {
                *selected = Some(i);
                doc.begin_drag(i);
            }
            if let Some(i) = doc.dragging() {
                if let Some(pos) = resp.interact_pointer_pos() {
                    let p = pui.plot_from_screen(pos);
                    let modifiers = pui.ctx().input(|input| input.modifiers);
                    let lock = if modifiers.shift {
                        DragLock::Vertical
                    } else if modifiers.command || modifiers.ctrl {
                        DragLock::Horizontal
                    } else {
                        DragLock::Free
                    };
                    moved |= doc.drag_to(i, p.x, p.y, lock);
                }
                if resp.drag_stopped() {
                    doc.end_drag();
                }
            }
            if resp.clicked() {
                queue.push(Action::Select(hit));
            }
            // After an edit that moved the whole profile out of sight, bring it back.
            if !requested && doc.dragging().is_none() && self.checked_revision != doc.revision() {
                self.checked_revision = doc.revision();
                let bounds = pui.plot_bounds();
                let pvis = &doc.project().pvis;
                let inside = pvis.iter().any(|p| {
                    p.station.0 >= bounds.min()[0]
                        && p.station.0 <= bounds.max()[0]
                        && p.elevation >= bounds.min()[1]
                        && p.elevation <= bounds.max()[1]
                });
                if !inside
                    && !pvis.is_empty()
                    && let Some(b) = fit_bounds(doc.project())
                {
                    pui.set_plot_bounds(b);
                }
            }
            if resp.double_clicked()
                && hit.is_none()
                && let Some(pos) = resp.interact_pointer_pos()
            {
                queue.push(Action::InsertAt(pui.plot_from_screen(pos).x));
            }
            if resp.secondary_clicked() {
                self.context =
                    resp.interact_pointer_pos().map(|p| pui.plot_from_screen(p)).map(|p| [p.x, p.y]);
                if let Some(i) = hit {
                    *selected = Some(i);
                }
            }
            let cached = self.scene.take();
            self.scene = Some(draw_items(pui, doc, *selected, cached, palette));
        });
        if let Some(scene) = &self.scene {
            paint_site(scene, ui, &response.transform, palette);
        }
        self.last_transform = Some(response.transform);
        response.response.context_menu(|ui| self.context_menu_ui(ui, doc.project(), *selected, queue));
        // A drag whose release was not seen by the plot still ends.
        if doc.dragging().is_some() && !ui.input(|i| i.pointer.primary_down()) {
            doc.end_drag();
        }
        moved
    }

    /// The plot's context menu: the same commands as the menus and keys.
    fn context_menu_ui(
        &self,
        ui: &mut egui::Ui,
        project: &Project,
        selected: Option<usize>,
        queue: &mut Vec<Action>,
    ) {
        let mut items: Vec<(String, Action, bool)> = Vec::new();
        if let Some([station, elevation]) = self.context {
            let at = project.stationing().label_std(station);
            items.push((format!("Insert PVI at {at}"), Action::InsertAt(station), true));
            let add = Action::AddControl { station, elevation: Some(elevation) };
            items.push((format!("Add control point at {at}"), add, true));
        }
        items.push((UiCommand::Delete.label().to_owned(), UiCommand::Delete.action(), selected.is_some()));
        if let Some(i) = selected {
            items.push((format!("Zoom to PVI {}", i + 1), Action::Focus(i), true));
            let unequal = |p: &gradewright_geometry::Pvi| {
                matches!(p.curve, gradewright_geometry::VerticalCurve::Unequal { .. })
            };
            if project.pvis.get(i).is_some_and(unequal) {
                items.push((
                    format!("Make curve at PVI {} symmetric", i + 1),
                    Action::MakeSymmetric(i),
                    true,
                ));
            }
        }
        items.push((UiCommand::Fit.label().to_owned(), UiCommand::Fit.action(), true));
        for (label, action, enabled) in items {
            if ui.add_enabled(enabled, egui::Button::new(label)).clicked() {
                queue.push(action);
                ui.close();
            }
        }
    }
}

/// A toolbar button that issues `command`, as its menu entry and key do.
fn tool_button(
    ui: &mut egui::Ui,
    queue: &mut Vec<Action>,
    label: &str,
    command: UiCommand,
    enabled: bool,
) -> egui::Response {
    let mut response = ui.add_enabled(enabled, egui::Button::new(label));
    if let Some(shortcut) = command.shortcut() {
        response = response.on_hover_text(ui.ctx().format_shortcut(&shortcut));
    }
    if response.clicked() {
        queue.push(command.action());
    }
    response
}

fn fit_bounds(project: &Project) -> Option<PlotBounds> {
    let pvis = &project.pvis;
    let mut xs = pvis.iter().map(|p| p.station.0).chain(project.ground.iter().map(|g| g.station));
    let first = xs.next()?;
    let (x0, x1) = xs.fold((first, first), |(a, b), x| (a.min(x), b.max(x)));
    let ys = pvis.iter().map(|p| p.elevation).chain(project.ground.iter().map(|g| g.elevation));
    let (y0, y1) = ys.fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), y| (a.min(y), b.max(y)));
    let dx = (x1 - x0).max(1.0) * 0.04;
    let dy = (y1 - y0).max(1.0) * 0.15;
    Some(PlotBounds::from_min_max([x0 - dx, y0 - dy], [x1 + dx, y1 + dy]))
}

/// The station axis's grid: egui_plot's own (powers of ten), except that
/// with station equations the lines fall on even plan stations, restarting
/// ahead of each equation (as the sheet's grid does).
pub fn station_grid(
    equations: gradewright_geometry::Equations,
    units: gradewright_geometry::Units,
) -> impl Fn(egui_plot::GridInput) -> Vec<egui_plot::GridMark> {
    let base = egui_plot::log_grid_spacer(10);
    move |input: egui_plot::GridInput| {
        let (from, to) = input.bounds;
        let marks = base(input);
        if equations.is_empty() {
            return marks;
        }
        let mut steps: Vec<f64> = marks.iter().map(|m| m.step_size).collect();
        steps.sort_by(|a, b| b.total_cmp(a));
        steps.dedup();
        let at = equations.stationing(units);
        let mut out: Vec<egui_plot::GridMark> = Vec::new();
        // Largest step first: a station is marked once, with the largest
        // step it falls on.
        for step in steps {
            for value in at.even(from, to, step) {
                let taken = out.iter().any(|m| gradewright_geometry::tolerance::same_station(m.value, value));
                if !taken {
                    out.push(egui_plot::GridMark { value, step_size: step });
                }
            }
        }
        out
    }
}
