//! The profile plot: tangents and true parabolas, PVI handles that drag,
//! PVC/PVT and high/low marks, grade labels, failing curves flagged.

use std::collections::HashMap;

use egui::{Align2, Pos2, RichText};
use egui_plot::{
    Legend, Line, LineStyle, MarkerShape, Plot, PlotBounds, PlotPoint, PlotPoints, Points, Text,
};
use gradewright_draw::{
    Detail, Label, Placement, Rect, Role, Scene, Shape, Side, Spacing, place_labels, profile_scene_with,
};
use gradewright_geometry::{Station, format_station};

use super::app::GradewrightApp;
use super::command::Action;
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
    let alignment = app.analysis().alignment.clone();
    let ground = app.project().ground.clone();
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
                Some(s) => {
                    let depth = super::site_ui::hover_depth(&ground, s.elevation, p.x, len)
                        .map_or_else(String::new, |d| format!("\n{d}"));
                    format!(
                        "{station}\nprofile {:.3} {len}\ngrade {:+.3} %{depth}\npointer {:.3} {len}",
                        s.elevation, s.grade_percent, p.y
                    )
                }
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
            let at = resp.interact_pointer_pos().map(|p| pui.plot_from_screen(p));
            app.view.context_station = at.map(|p| p.x);
            app.view.context_elevation = at.map(|p| p.y);
            if let Some(i) = hit {
                app.view.selected = Some(i);
            }
        }
        draw_items(app, pui, palette);
    });
    super::site_ui::paint_site(app, ui, &response.transform, palette);
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
        if let Some(station) = app.view.context_station
            && ui
                .button(format!("Add control point at {}", format_station(station, units, station_decimals)))
                .on_hover_text(
                    "A minimum control point at the pointer's elevation; change its kind in Control points",
                )
                .clicked()
        {
            let elevation = app.view.context_elevation;
            super::site_ui::add_control(app, station, elevation);
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

/// What the plot draws for one revision and view: the scene (decided in the
/// drawing crate) and its labels placed in screen points.
#[derive(Clone, Debug)]
pub struct PlotScene {
    key: (u64, [u64; 4], [u32; 4], Option<usize>),
    pub(super) scene: Scene,
    placement: Placement,
    line_height: Vec<f32>,
    /// The ground the scene's ground line was decimated from.
    ground: gradewright_geometry::Ground,
}

/// Text size of labels by priority (the most important a little larger).
fn label_size(label: &Label) -> f32 {
    if label.priority <= 1 { LABEL_SIZE } else { LABEL_SIZE - 1.0 }
}

/// Labels on screen: 8 points from their point, stepping 16 points up to
/// five times; 3 points kept clear each side of the profile.
const LABEL_SPACING: Spacing = Spacing { gap: 8.0, step: 16.0, tries: 6, line_clearance: 3.0, piece: 6.0 };

/// The scene for the view in force, rebuilt only when the project, the view
/// or the plot's size changed.
fn plot_scene(app: &GradewrightApp, pui: &egui_plot::PlotUi<'_>, cached: Option<PlotScene>) -> PlotScene {
    let transform = *pui.transform();
    let bounds = transform.bounds();
    let frame = *transform.frame();
    let key = (
        app.revision(),
        [bounds.min()[0], bounds.min()[1], bounds.max()[0], bounds.max()[1]].map(f64::to_bits),
        [frame.min.x, frame.min.y, frame.max.x, frame.max.y].map(f32::to_bits),
        app.view.dragging,
    );
    let mut kept_ground = None;
    if let Some(c) = cached {
        if c.key == key {
            return c;
        }
        // The ground line is decimated afresh only when the ground or the
        // view changed (not on every drag frame).
        if c.key.1 == key.1 && c.key.2 == key.2 && c.ground.shares(&app.analysis().ground) {
            kept_ground = c.scene.lines.into_iter().find(|l| l.role == Role::Ground).map(|l| l.points);
        }
    }
    // The profile in view, to half a screen point of chord error.
    let dy = 1.0 / transform.dpos_dvalue_y().abs().max(1e-12);
    #[allow(clippy::cast_possible_truncation, clippy::cast_sign_loss)]
    let detail = Detail { tolerance: 0.5 * dy, columns: frame.width().max(1.0) as usize, hatch_every: 7.0 };
    let scene = profile_scene_with(app.analysis(), (bounds.min()[0], bounds.max()[0]), detail, kept_ground);
    let (sizes, line_height): (Vec<[f64; 2]>, Vec<f32>) = pui.ctx().fonts_mut(|fonts| {
        // Labels use few distinct characters: ask the fonts once for each
        // (a table for ASCII, a map for the rest).
        let mut ascii: HashMap<u32, [f32; 128]> = HashMap::new();
        let mut widths: HashMap<(char, u32), f32> = HashMap::new();
        let mut rows: HashMap<u32, f32> = HashMap::new();
        scene
            .labels
            .iter()
            .map(|label| {
                let size = label_size(label);
                let font = egui::FontId::proportional(size);
                let row = *rows.entry(size.to_bits()).or_insert_with(|| fonts.row_height(&font));
                let table = ascii.entry(size.to_bits()).or_insert_with(|| {
                    let mut t = [0.0; 128];
                    for (c, w) in (0u8..128).zip(t.iter_mut()) {
                        *w = fonts.glyph_width(&font, char::from(c));
                    }
                    t
                });
                let mut width: f32 = 0.0;
                for l in &label.lines {
                    let mut w = 0.0;
                    for c in l.chars() {
                        w += match table.get(c as usize) {
                            Some(&known) => known,
                            None => *widths
                                .entry((c, size.to_bits()))
                                .or_insert_with(|| fonts.glyph_width(&font, c)),
                        };
                    }
                    width = width.max(w);
                }
                #[allow(clippy::cast_precision_loss)]
                let height = row * label.lines.len() as f32;
                ([f64::from(width + 4.0), f64::from(height)], row)
            })
            .unzip()
    });
    let to_screen = |a: [f64; 2]| {
        let p = transform.position_from_point(&PlotPoint::new(a[0], a[1]));
        [f64::from(p.x), f64::from(p.y)]
    };
    let kept_clear: Vec<Vec<[f64; 2]>> = scene
        .lines
        .iter()
        .filter(|l| matches!(l.role, Role::Profile | Role::InvalidCurve))
        .map(|l| l.points.iter().map(|&p| to_screen(p)).collect())
        .collect();
    let lines: Vec<&[[f64; 2]]> = kept_clear.iter().map(Vec::as_slice).collect();
    let screen = Rect {
        x0: f64::from(frame.min.x),
        y0: f64::from(frame.min.y),
        x1: f64::from(frame.max.x),
        y1: f64::from(frame.max.y),
    };
    // The drag readout is drawn over the plot: labels keep clear of it.
    let blocked: Vec<Rect> = drag_readout(app)
        .map(|(at, text)| {
            let (width, rows) = pui.ctx().fonts_mut(|fonts| {
                let font = egui::FontId::proportional(LABEL_SIZE);
                let width = text
                    .lines()
                    .map(|l| l.chars().map(|c| fonts.glyph_width(&font, c)).sum::<f32>())
                    .fold(0.0, f32::max);
                #[allow(clippy::cast_precision_loss)]
                let rows = fonts.row_height(&font) * text.lines().count() as f32;
                (f64::from(width), f64::from(rows))
            });
            let [x, y] = to_screen(at);
            let offset = f64::from(READOUT_OFFSET);
            Rect { x0: x + offset, y0: y + offset, x1: x + offset + width + 4.0, y1: y + offset + rows }
        })
        .into_iter()
        .collect();
    let placement = place_labels(&scene.labels, &sizes, to_screen, screen, (&lines, &blocked), LABEL_SPACING);
    PlotScene { key, scene, placement, line_height, ground: app.analysis().ground.clone() }
}

/// The legend name and look of a line role.
fn line_style(role: Role, palette: Palette) -> (&'static str, egui::Color32, f32, LineStyle) {
    match role {
        Role::Ground => ("Existing ground", palette.ground, 1.5, LineStyle::Solid),
        Role::GradeLine => ("Grade lines", palette.grade_line, 1.0, LineStyle::dashed_loose()),
        Role::Shortfall => ("Sight falls short", palette.shortfall, 7.0, LineStyle::Solid),
        Role::InvalidCurve => ("Profile (invalid)", palette.fail, 2.0, LineStyle::Solid),
        Role::FailingCurve => ("Failing curve", palette.fail, 4.0, LineStyle::dashed_dense()),
        _ => ("Profile", palette.profile, 2.0, LineStyle::Solid),
    }
}

/// The legend name, look and size of a marker.
fn marker_style(
    role: Role,
    shape: Shape,
    palette: Palette,
) -> (&'static str, MarkerShape, egui::Color32, f32) {
    let shape = match shape {
        Shape::Circle => MarkerShape::Circle,
        Shape::Tick => MarkerShape::Square,
        Shape::Triangle { up: true } => MarkerShape::Up,
        Shape::Triangle { up: false } => MarkerShape::Down,
        Shape::Cross => MarkerShape::Cross,
        Shape::Diamond | Shape::Floor | Shape::Ceiling => MarkerShape::Diamond,
    };
    match role {
        Role::Pvi => ("PVI", shape, palette.handle, 5.0),
        Role::CurveEnd => ("PVC / PVT", shape, palette.marks, 3.0),
        Role::HighLow => ("High / low point", shape, palette.marks, 5.0),
        _ => ("Failing curve", shape, palette.fail, 9.0),
    }
}

fn draw_items(app: &mut GradewrightApp, pui: &mut egui_plot::PlotUi<'_>, palette: Palette) {
    let cached = app.view.plot_scene.take();
    let drawn = plot_scene(app, pui, cached);
    let transform = *pui.transform();
    let scene = &drawn.scene;
    for line in &scene.lines {
        if line.points.len() < 2 {
            continue;
        }
        let (name, colour, width, style) = line_style(line.role, palette);
        pui.line(
            Line::new(name, PlotPoints::from(line.points.clone())).color(colour).width(width).style(style),
        );
    }
    // Legend entries for what is painted over the plot (the hatching and
    // the control symbols), so the legend names them too.
    // (A one-point line: it draws nothing but gets its legend entry.)
    let first =
        |role: Role| scene.hatches.iter().find(|h| h.role == role).map(|h| vec![[h.station, h.profile]]);
    for (role, name, colour, style) in [
        (Role::Cut, "Cut (solid)", palette.cut, LineStyle::Solid),
        (Role::Fill, "Fill (dotted)", palette.fill, LineStyle::dotted_dense()),
    ] {
        if let Some(at) = first(role) {
            pui.line(Line::new(name, PlotPoints::from(at)).color(colour).style(style));
        }
    }
    if let Some(m) = scene.markers.iter().find(|m| matches!(m.role, Role::Control | Role::MissedControl)) {
        pui.line(Line::new("Control points", PlotPoints::from(vec![m.at])).color(palette.control));
    }
    // Markers grouped by role and shape: one plot item each.
    let mut groups: Vec<(Role, Shape, Vec<[f64; 2]>)> = Vec::new();
    for m in scene.markers.iter().filter(|m| !matches!(m.role, Role::Control | Role::MissedControl)) {
        match groups.iter_mut().find(|g| g.0 == m.role && g.1 == m.shape) {
            Some(g) => g.2.push(m.at),
            None => groups.push((m.role, m.shape, vec![m.at])),
        }
    }
    for (role, shape, at) in groups {
        let (name, shape, colour, radius) = marker_style(role, shape, palette);
        pui.points(Points::new(name, PlotPoints::from(at)).shape(shape).radius(radius).color(colour));
    }
    let to_plot = |x: f64, y: f64| {
        #[allow(clippy::cast_possible_truncation)]
        let pos = Pos2::new(x as f32, y as f32);
        transform.value_from_position(pos)
    };
    for (placed, label) in drawn.placement.placed.iter().map(|p| (p, &scene.labels[p.label])) {
        let colour = if label.role == Role::FailLabel { palette.fail } else { palette.text };
        let (rect, [x, y]) = (placed.rect, placed.anchor);
        if placed.leader {
            let end = match label.side {
                Side::Above => rect.y1,
                Side::Below => rect.y0,
            };
            let (a, b) = (to_plot(x, y), to_plot(x, end));
            pui.line(Line::new("", vec![[a.x, a.y], [b.x, b.y]]).color(palette.grade_line).width(0.7));
        }
        let row = f64::from(drawn.line_height.get(placed.label).copied().unwrap_or(LABEL_SIZE));
        for (k, text) in label.lines.iter().enumerate() {
            #[allow(clippy::cast_precision_loss)]
            let at = to_plot(x, rect.y0 + row * k as f64);
            let mut rich = RichText::new(text).size(label_size(label)).color(colour);
            if k == 0 && label.priority <= 1 {
                // The colour goes on the text itself: strong text would
                // otherwise take the theme's strong colour.
                rich = rich.strong();
            }
            pui.text(Text::new("", at, rich).anchor(Align2::CENTER_TOP).color(colour));
        }
    }
    app.view.plot_scene = Some(drawn);
    draw_overlays(app, pui, palette);
}

/// How far (points) the drag readout sits right of and below the PVI.
const READOUT_OFFSET: f32 = 18.0;

/// The readout beside a PVI being dragged: where it is and the grades it
/// makes.
fn drag_readout(app: &GradewrightApp) -> Option<([f64; 2], String)> {
    let project = app.project();
    let units = project.units;
    let i = app.view.dragging?;
    let p = project.pvis.get(i)?;
    let profile = &app.analysis().profile;
    let g1 = i.checked_sub(1).and_then(|j| profile.tangent_grade_percent(j));
    let g2 = profile.tangent_grade_percent(i);
    let pct = |g: Option<f64>| g.map_or_else(|| "—".to_owned(), |g| format!("{g:+.3} %"));
    let text = format!(
        "{}\nel. {:.3} {}\ng1 {} · g2 {}",
        format_station(p.station.0, units, units.station_decimals()),
        p.elevation,
        units.length_symbol(),
        pct(g1),
        pct(g2)
    );
    Some(([p.station.0, p.elevation], text))
}

/// What belongs to the editor alone: the readout beside a dragged PVI and
/// the ring round the selected one.
fn draw_overlays(app: &GradewrightApp, pui: &mut egui_plot::PlotUi<'_>, palette: Palette) {
    let project = app.project();
    let dy = 1.0 / pui.transform().dpos_dvalue_y().abs().max(1e-12);
    let up = |points: f64| points * dy;
    let dx = 1.0 / pui.transform().dpos_dvalue_x().abs().max(1e-12);
    let right = |points: f64| points * dx;
    // While dragging: where the PVI is and the grades it makes, by the pointer.
    if let Some((at, text)) = drag_readout(app) {
        pui.text(
            Text::new(
                "",
                PlotPoint::new(at[0] + right(READOUT_OFFSET.into()), at[1] - up(READOUT_OFFSET.into())),
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
    }
}
