//! The profile plot: tangents and true parabolas, PVI handles that drag,
//! PVC/PVT and high/low marks, grade labels, failing curves flagged.

use egui::{Align2, Pos2, RichText};
use egui_plot::{
    Legend, Line, LineStyle, MarkerShape, Plot, PlotBounds, PlotPoint, PlotPoints, Points, Text,
};
use gradewright_geometry::{CurveKind, Station, format_station};

use super::app::GradewrightApp;
use super::command::Action;
use super::derived::curve_polyline;
use super::theme::Palette;
use super::view::ViewRequest;

/// How close (in points) the pointer must be to grab a PVI handle.
const GRAB_RADIUS: f32 = 12.0;

/// Text size of the plot's labels, points (readable at any exaggeration).
const LABEL_SIZE: f32 = 14.0;

/// The PVI nearest to `pointer` within the grab radius, by last frame's transform.
fn hit_test(app: &GradewrightApp, pointer: Option<Pos2>) -> Option<usize> {
    let transform = app.view.last_transform.as_ref()?;
    let pointer = pointer?;
    if !transform.frame().contains(pointer) {
        return None;
    }
    app.project()
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
pub fn plot_toolbar_ui(app: &mut GradewrightApp, ui: &mut egui::Ui) {
    ui.horizontal_wrapped(|ui| {
        ui.label("Vertical exaggeration");
        ui.add(egui::DragValue::new(&mut app.view.exaggeration).range(1.0..=50.0).speed(0.2).suffix(" : 1"));
        ui.separator();
        // Snapping is a setting of the project (saved with it).
        let mut snap = app.project().snap;
        ui.checkbox(&mut snap.on, "Snap to")
            .on_hover_text("Dragged and inserted PVIs land on these increments");
        let len = app.project().units.length_symbol();
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
        if snap != app.project().snap {
            let mut project = app.project().clone();
            project.snap = snap;
            app.push(Action::edit(super::command::Edit::Replace(Box::new(project))));
        }
        ui.separator();
        if ui.button("Fit to profile").on_hover_text("F").clicked() {
            app.push(Action::FitView);
        }
        if ui
            .add_enabled(app.view.selected.is_some(), egui::Button::new("Zoom to selection"))
            .on_hover_text("Z")
            .clicked()
        {
            app.push(Action::ZoomToSelection);
        }
        ui.separator();
        ui.label("Lengthen to clear:");
        let selected = app.view.selected.is_some();
        if ui
            .add_enabled(selected, egui::Button::new("Selected curve"))
            .on_hover_text("Shortest length, rounded up to the increment, that meets every criterion (L)")
            .clicked()
        {
            app.push(Action::LengthenSelected);
        }
        if ui.button("All failing").on_hover_text("Every failing curve, one undo step (Shift+L)").clicked() {
            app.push(Action::LengthenAll);
        }
        ui.label("in steps of");
        ui.add(
            egui::DragValue::new(&mut app.view.lengthen_increment)
                .range(0.1..=1000.0)
                .speed(0.5)
                .suffix(format!(" {len}")),
        );
    });
    ui.label(
        RichText::new("Drag a PVI to move it (hold Shift: up and down only · Ctrl: along the station only) · double-click a tangent to add a PVI · right-click for more · scroll pans, Ctrl+scroll zooms")
            .weak()
            .small(),
    );
}

/// The profile plot.
#[allow(clippy::too_many_lines)]
pub fn plot_ui(app: &mut GradewrightApp, ui: &mut egui::Ui, height: f32) {
    let units = app.project().units;
    let len = units.length_symbol();
    let palette = Palette::of(ui);
    let pointer =
        ui.input(|i| if i.pointer.primary_down() { i.pointer.press_origin() } else { i.pointer.hover_pos() });
    let hit = hit_test(app, pointer);
    let hovering_handle = hit.is_some() || app.view.dragging.is_some();
    if hovering_handle {
        ui.ctx().set_cursor_icon(egui::CursorIcon::Grab);
    }
    let alignment = app.derived().alignment.clone();
    let station_decimals = units.station_decimals();
    let dragging = app.view.dragging.is_some();
    let plot = Plot::new("profile-plot")
        .height(height.max(120.0))
        .link_axis(egui::Id::unique(super::sight_ui::STATION_AXIS), [true, false])
        .data_aspect(app.view.exaggeration)
        .allow_drag(!hovering_handle)
        .allow_double_click_reset(false)
        .x_axis_label("Station")
        .y_axis_label(format!("Elevation ({len})"))
        .x_axis_formatter(move |mark, _| format_station(mark.value, units, 0))
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
            let station = format_station(p.x, units, station_decimals);
            let on_profile = alignment.as_ref().and_then(|a| a.sample(Station(p.x)).ok());
            Some(match on_profile {
                Some(s) => format!(
                    "{station}\nprofile {:.3} {len}\ngrade {:+.3} %\npointer {:.3} {len}",
                    s.elevation, s.grade_percent, p.y
                ),
                None => format!("{station}\npointer {:.3} {len}", p.y),
            })
        });
    let response = plot.show(ui, |pui| {
        let requested = app.view.view_request.is_some();
        if requested {
            // The view asked for is the view in force: nothing to bring back.
            app.view.checked_revision = app.revision();
        }
        if let Some(request) = app.view.view_request.take() {
            let bounds = match request {
                ViewRequest::Fit => fit_bounds(app),
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
            app.begin_drag(i);
            app.view.dragging = Some(i);
        }
        if let Some(i) = app.view.dragging {
            if let Some(pos) = resp.interact_pointer_pos() {
                let p = pui.plot_from_screen(pos);
                let modifiers = pui.ctx().input(|input| input.modifiers);
                let lock = if modifiers.shift {
                    super::app::DragLock::Vertical
                } else if modifiers.command || modifiers.ctrl {
                    super::app::DragLock::Horizontal
                } else {
                    super::app::DragLock::Free
                };
                app.drag_locked(i, p.x, p.y, lock);
            }
            if resp.drag_stopped() {
                app.end_drag();
                app.view.dragging = None;
            }
        }
        if resp.clicked() {
            app.view.selected = hit;
        }
        // After an edit that moved the whole profile out of sight, bring it back.
        if !requested && app.view.dragging.is_none() && app.view.checked_revision != app.revision() {
            app.view.checked_revision = app.revision();
            let bounds = pui.plot_bounds();
            let pvis = &app.project().pvis;
            let inside = pvis.iter().any(|p| {
                p.station.0 >= bounds.min()[0]
                    && p.station.0 <= bounds.max()[0]
                    && p.elevation >= bounds.min()[1]
                    && p.elevation <= bounds.max()[1]
            });
            if !inside
                && !pvis.is_empty()
                && let Some(b) = fit_bounds(app)
            {
                pui.set_plot_bounds(b);
            }
        }
        if resp.double_clicked()
            && hit.is_none()
            && let Some(pos) = resp.interact_pointer_pos()
        {
            let station = pui.plot_from_screen(pos).x;
            app.insert_at(station);
        }
        if resp.secondary_clicked() {
            app.view.context_station = resp.interact_pointer_pos().map(|p| pui.plot_from_screen(p).x);
            if let Some(i) = hit {
                app.view.selected = Some(i);
            }
        }
        draw_items(app, pui, palette);
    });
    app.view.last_transform = Some(response.transform);
    response.response.context_menu(|ui| {
        if let Some(station) = app.view.context_station
            && ui
                .button(format!("Insert PVI at {}", format_station(station, units, station_decimals)))
                .clicked()
        {
            app.insert_at(station);
            ui.close();
        }
        let selected = app.view.selected;
        if ui.add_enabled(selected.is_some(), egui::Button::new("Delete selected PVI")).clicked() {
            app.push(Action::DeleteSelected);
            ui.close();
        }
        if let Some(i) = selected
            && ui.button(format!("Zoom to PVI {}", i + 1)).clicked()
        {
            app.push(Action::Focus(i));
            ui.close();
        }
        if let Some(i) = selected
            && app
                .project()
                .pvis
                .get(i)
                .is_some_and(|p| matches!(p.curve, gradewright_geometry::VerticalCurve::Unequal { .. }))
            && ui.button(format!("Make curve at PVI {} symmetric", i + 1)).clicked()
        {
            app.push(Action::MakeSymmetric(i));
            ui.close();
        }
        if ui.button("Fit to profile").clicked() {
            app.push(Action::FitView);
            ui.close();
        }
    });
    // A drag whose release was not seen by the plot still ends.
    if app.view.dragging.is_some() && !ui.input(|i| i.pointer.primary_down()) {
        app.end_drag();
        app.view.dragging = None;
    }
}

fn fit_bounds(app: &GradewrightApp) -> Option<PlotBounds> {
    let pvis = &app.project().pvis;
    let mut xs = pvis.iter().map(|p| p.station.0).chain(app.project().ground.iter().map(|g| g.station));
    let first = xs.next()?;
    let (x0, x1) = xs.fold((first, first), |(a, b), x| (a.min(x), b.max(x)));
    let ys = pvis.iter().map(|p| p.elevation).chain(app.project().ground.iter().map(|g| g.elevation));
    let (y0, y1) = ys.fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), y| (a.min(y), b.max(y)));
    let dx = (x1 - x0).max(1.0) * 0.04;
    let dy = (y1 - y0).max(1.0) * 0.15;
    Some(PlotBounds::from_min_max([x0 - dx, y0 - dy], [x1 + dx, y1 + dy]))
}

#[allow(clippy::too_many_lines)]
fn draw_items(app: &GradewrightApp, pui: &mut egui_plot::PlotUi<'_>, palette: Palette) {
    let project = app.project();
    let derived = app.derived();
    let units = project.units;
    // Screen offsets in plot units, for labels above and below points.
    let dy = 1.0 / pui.transform().dpos_dvalue_y().abs().max(1e-12);
    let up = |points: f64| points * dy;
    let dx = 1.0 / pui.transform().dpos_dvalue_x().abs().max(1e-12);
    let right = |points: f64| points * dx;
    // Labels only where they can be read: in view and not crowded.
    let bounds = pui.plot_bounds();
    let (x_min, x_max) = (bounds.min()[0], bounds.max()[0]);
    let points_per_unit = pui.transform().dpos_dvalue_x().abs();
    let visible = |x: f64| x >= x_min && x <= x_max;
    let spacing = |i: usize| {
        let gap = |j: usize, k: usize| match (project.pvis.get(j), project.pvis.get(k)) {
            (Some(a), Some(b)) => (b.station - a.station) * points_per_unit,
            _ => f64::INFINITY,
        };
        gap(i.wrapping_sub(1), i).min(gap(i, i + 1))
    };

    if !project.ground.is_empty() {
        let ground: Vec<[f64; 2]> = project.ground.iter().map(|g| [g.station, g.elevation]).collect();
        pui.line(Line::new("Existing ground", PlotPoints::from(ground)).color(palette.ground).width(1.5));
    }
    pui.line(
        Line::new("Grade lines", PlotPoints::from(derived.grade_line.clone()))
            .color(palette.grade_line)
            .style(LineStyle::dashed_loose())
            .width(1.0),
    );
    // The profile in view, to half a screen point of chord error.
    let view_line = derived
        .alignment
        .as_ref()
        .map(|a| super::derived::polyline_within(a.segments(), (x_min, x_max), 0.5 * dy))
        .unwrap_or_default();
    if derived.alignment.is_none() {
        // Curves that overlap: draw each on its own so the designer sees them.
        for c in &derived.curves {
            pui.line(
                Line::new("Profile (invalid)", PlotPoints::from(curve_polyline(c)))
                    .color(palette.fail)
                    .width(2.0),
            );
        }
    }
    // Stretches where the sight distance falls short, along the profile.
    for f in derived.report.findings.iter().filter(|f| f.code.starts_with("sight.")) {
        let (a, b) = (f.station_start.0.min(f.station_end.0), f.station_start.0.max(f.station_end.0));
        if b < x_min || a > x_max {
            continue;
        }
        let Some(alignment) = derived.alignment.as_ref() else { break };
        let at = |x: f64| alignment.sample(gradewright_geometry::Station(x)).ok().map(|p| [x, p.elevation]);
        let range = view_line.partition_point(|p| p[0] <= a)..view_line.partition_point(|p| p[0] < b);
        let inner = view_line.get(range).unwrap_or(&[]);
        let stretch: Vec<[f64; 2]> = at(a).into_iter().chain(inner.iter().copied()).chain(at(b)).collect();
        if stretch.len() >= 2 {
            pui.line(
                Line::new("Sight falls short", PlotPoints::from(stretch)).color(palette.shortfall).width(7.0),
            );
        }
    }
    if !view_line.is_empty() {
        pui.line(Line::new("Profile", PlotPoints::from(view_line)).color(palette.profile).width(2.0));
    }
    let failing: Vec<usize> = derived.report.curves.iter().filter(|c| !c.ok).map(|c| c.curve.index).collect();
    for c in derived
        .curves
        .iter()
        .filter(|c| failing.contains(&c.index) && c.length() > 0.0 && c.pvt.0 >= x_min && c.pvc.0 <= x_max)
    {
        pui.line(
            Line::new("Failing curve", PlotPoints::from(curve_polyline(c)))
                .color(palette.fail)
                .width(4.0)
                .style(LineStyle::dashed_dense()),
        );
    }
    // PVC and PVT marks.
    let ends: Vec<[f64; 2]> = derived
        .curves
        .iter()
        .filter(|c| c.length() > 0.0)
        .flat_map(|c| [[c.pvc.0, c.pvc_elevation], [c.pvt.0, c.pvt_elevation]])
        .collect();
    pui.points(
        Points::new("PVC / PVT", PlotPoints::from(ends))
            .shape(MarkerShape::Square)
            .radius(3.0)
            .color(palette.marks),
    );
    // High and low points.
    for c in &derived.curves {
        if let Some((s, e)) = c.turning
            && visible(s.0)
            && spacing(c.index) >= 45.0
        {
            // The label goes to the right of the mark: clear of the PVI's own
            // label above it and of the selection ring, whose label is on the left.
            let (shape, label) = match c.kind {
                CurveKind::Crest => (MarkerShape::Up, "HP"),
                _ => (MarkerShape::Down, "LP"),
            };
            let (anchor, offset) = (Align2::LEFT_CENTER, 0.0);
            pui.points(
                Points::new("High / low point", vec![[s.0, e]]).shape(shape).radius(5.0).color(palette.marks),
            );
            pui.text(
                Text::new(
                    "",
                    PlotPoint::new(s.0 + right(14.0), e + offset),
                    RichText::new(label).size(LABEL_SIZE).color(palette.marks),
                )
                .anchor(anchor)
                .color(palette.marks),
            );
        }
    }
    // Grade labels at the middle of each grade line.
    for pair in project.pvis.windows(2) {
        let [a, b] = pair else { continue };
        let grade = (b.elevation - a.elevation) / (b.station - a.station) * 100.0;
        if !grade.is_finite() {
            continue;
        }
        let x = 0.5 * (a.station.0 + b.station.0);
        if !visible(x) || (b.station - a.station) * points_per_unit < 70.0 {
            continue;
        }
        let y = 0.5 * (a.elevation + b.elevation) - up(10.0);
        pui.text(
            Text::new("", PlotPoint::new(x, y), RichText::new(format!("{grade:+.2} %")).size(LABEL_SIZE))
                .anchor(Align2::CENTER_TOP)
                .color(palette.text),
        );
    }
    // PVI handles and labels.
    let handles: Vec<[f64; 2]> = project.pvis.iter().map(|p| [p.station.0, p.elevation]).collect();
    pui.points(
        Points::new("PVI", PlotPoints::from(handles))
            .shape(MarkerShape::Circle)
            .radius(5.0)
            .color(palette.handle),
    );
    for (i, p) in project.pvis.iter().enumerate() {
        let fails = failing.contains(&i);
        if !visible(p.station.0) || (!fails && spacing(i) < 45.0) {
            continue;
        }
        let (text, color) = if fails {
            (format!("✖ PVI {} {}", i + 1, derived.fail_summary(i)), palette.fail)
        } else {
            (format!("PVI {}", i + 1), palette.text)
        };
        // The colour goes on the text itself: strong text would otherwise
        // take the theme's strong colour, whatever the plot item says.
        pui.text(
            Text::new(
                "",
                PlotPoint::new(p.station.0, p.elevation + up(12.0)),
                RichText::new(text).strong().size(LABEL_SIZE).color(color),
            )
            .anchor(Align2::CENTER_BOTTOM)
            .color(color),
        );
        if failing.contains(&i) {
            pui.points(
                Points::new("Failing curve", vec![[p.station.0, p.elevation]])
                    .shape(MarkerShape::Cross)
                    .radius(9.0)
                    .color(palette.fail),
            );
        }
    }
    // While dragging: where the PVI is and the grades it makes, by the pointer.
    if let Some(i) = app.view.dragging
        && let Some(p) = project.pvis.get(i)
    {
        let grade = |a: &gradewright_geometry::Pvi, b: &gradewright_geometry::Pvi| {
            (b.elevation - a.elevation) / (b.station - a.station) * 100.0
        };
        let g1 = i.checked_sub(1).and_then(|j| project.pvis.get(j)).map(|a| grade(a, p));
        let g2 = project.pvis.get(i + 1).map(|b| grade(p, b));
        let pct = |g: Option<f64>| g.map_or_else(|| "—".to_owned(), |g| format!("{g:+.3} %"));
        let text = format!(
            "{}\nel. {:.3} {}\ng1 {} · g2 {}",
            format_station(p.station.0, units, units.station_decimals()),
            p.elevation,
            units.length_symbol(),
            pct(g1),
            pct(g2)
        );
        pui.text(
            Text::new(
                "",
                PlotPoint::new(p.station.0 + right(18.0), p.elevation - up(18.0)),
                RichText::new(text).size(LABEL_SIZE).strong().color(palette.selected),
            )
            .anchor(Align2::LEFT_TOP)
            .color(palette.selected),
        );
    }
    if let Some(i) = app.view.selected
        && app.view.dragging != Some(i)
        && let Some(p) = project.pvis.get(i)
    {
        pui.points(
            Points::new("Selected PVI", vec![[p.station.0, p.elevation]])
                .shape(MarkerShape::Circle)
                .filled(false)
                .radius(10.0)
                .color(palette.selected),
        );
        let label = format!(
            "{}  el. {:.3} {}",
            format_station(p.station.0, units, units.station_decimals()),
            p.elevation,
            units.length_symbol()
        );
        // Left of the ring, not under it: high and low point labels are on the right.
        pui.text(
            Text::new(
                "",
                PlotPoint::new(p.station.0 - right(14.0), p.elevation),
                RichText::new(label).size(LABEL_SIZE).color(palette.selected),
            )
            .anchor(Align2::RIGHT_CENTER)
            .color(palette.selected),
        );
    }
}
