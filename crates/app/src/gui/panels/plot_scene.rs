//! What the plot draws, from the drawing crate's scene: lines, markers and
//! labels placed apart in screen points (cached per revision, view and
//! size), the cut and fill hatching and the control-point symbols painted
//! over the plot, the readout beside a dragged PVI and the selection ring.

use std::collections::HashMap;

use egui::{Align2, Pos2, RichText, Shape as Paint, Stroke};
use egui_plot::{Line, LineStyle, MarkerShape, PlotPoint, PlotPoints, PlotTransform, Points, Text};
use gradewright_draw::{
    Detail, Label, Placement, Rect, Role, Scene, Shape, Side, Spacing, place_labels, profile_scene_with,
};
use gradewright_geometry::tolerance::LENGTH_FLOOR;

use crate::gui::document::Document;
use crate::gui::theme::Palette;

/// Text size of the plot's labels, points (readable at any exaggeration).
const LABEL_SIZE: f32 = 14.0;

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
fn plot_scene(doc: &Document, pui: &egui_plot::PlotUi<'_>, cached: Option<PlotScene>) -> PlotScene {
    let transform = *pui.transform();
    let bounds = transform.bounds();
    let frame = *transform.frame();
    let key = (
        doc.revision(),
        [bounds.min()[0], bounds.min()[1], bounds.max()[0], bounds.max()[1]].map(f64::to_bits),
        [frame.min.x, frame.min.y, frame.max.x, frame.max.y].map(f32::to_bits),
        doc.dragging(),
    );
    let mut kept_ground = None;
    if let Some(c) = cached {
        if c.key == key {
            return c;
        }
        // The ground line is decimated afresh only when the ground or the
        // view changed (not on every drag frame).
        if c.key.1 == key.1 && c.key.2 == key.2 && c.ground.shares(&doc.analysis().ground) {
            kept_ground = c.scene.lines.into_iter().find(|l| l.role == Role::Ground).map(|l| l.points);
        }
    }
    // The profile in view, to half a screen point of chord error.
    let dy = 1.0 / transform.dpos_dvalue_y().abs().max(LENGTH_FLOOR);
    #[allow(clippy::cast_possible_truncation, clippy::cast_sign_loss)]
    let detail = Detail { tolerance: 0.5 * dy, columns: frame.width().max(1.0) as usize, hatch_every: 7.0 };
    let scene = profile_scene_with(doc.analysis(), (bounds.min()[0], bounds.max()[0]), detail, kept_ground);
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
    let blocked: Vec<Rect> = drag_readout(doc)
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
    PlotScene { key, scene, placement, line_height, ground: doc.analysis().ground.clone() }
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

/// Draws the scene of `doc` for the view in force (reusing `cached` when
/// nothing changed), the drag readout and the selection; returns the scene
/// drawn, for the next frame.
pub(super) fn draw_items(
    pui: &mut egui_plot::PlotUi<'_>,
    doc: &Document,
    selected: Option<usize>,
    cached: Option<PlotScene>,
    palette: Palette,
) -> PlotScene {
    let drawn = plot_scene(doc, pui, cached);
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
    draw_overlays(doc, selected, pui, palette);
    drawn
}

/// How far (points) the drag readout sits right of and below the PVI.
const READOUT_OFFSET: f32 = 18.0;

/// The readout beside a PVI being dragged: where it is and the grades it
/// makes.
fn drag_readout(doc: &Document) -> Option<([f64; 2], String)> {
    let project = doc.project();
    let units = project.units;
    let i = doc.dragging()?;
    let p = project.pvis.get(i)?;
    let profile = &doc.analysis().profile;
    let g1 = i.checked_sub(1).and_then(|j| profile.tangent_grade_percent(j));
    let g2 = profile.tangent_grade_percent(i);
    let pct = |g: Option<f64>| g.map_or_else(|| "—".to_owned(), |g| format!("{g:+.3} %"));
    let text = format!(
        "{}\nel. {:.3} {}\ng1 {} · g2 {}",
        doc.project().stationing().label(p.station.0, units.station_decimals()),
        p.elevation,
        units.length_symbol(),
        pct(g1),
        pct(g2)
    );
    Some(([p.station.0, p.elevation], text))
}

/// What belongs to the editor alone: the readout beside a dragged PVI and
/// the ring round the selected one.
fn draw_overlays(doc: &Document, selected: Option<usize>, pui: &mut egui_plot::PlotUi<'_>, palette: Palette) {
    let project = doc.project();
    let dy = 1.0 / pui.transform().dpos_dvalue_y().abs().max(LENGTH_FLOOR);
    let up = |points: f64| points * dy;
    let dx = 1.0 / pui.transform().dpos_dvalue_x().abs().max(LENGTH_FLOOR);
    let right = |points: f64| points * dx;
    // While dragging: where the PVI is and the grades it makes, by the pointer.
    if let Some((at, text)) = drag_readout(doc) {
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
    if let Some(i) = selected
        && doc.dragging() != Some(i)
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

/// Half the size of a control-point symbol, points.
const SYMBOL: f32 = 7.0;

/// Paints what egui_plot has no item for, from the scene the plot drew:
/// the hatching (cut solid, fill dotted) and the control-point symbols.
pub(super) fn paint_site(drawn: &PlotScene, ui: &egui::Ui, transform: &PlotTransform, palette: Palette) {
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
    let frame = *transform.frame();
    // Criteria ranges: shaded over the plot's height, their speed at the top.
    for (from, to, text) in &scene.ranges {
        let (a, b) = (at(*from, 0.0).x.max(frame.left()), at(*to, 0.0).x.min(frame.right()));
        if b <= a {
            continue;
        }
        let band = egui::Rect::from_x_y_ranges(a..=b, frame.top()..=frame.bottom());
        shapes.push(Paint::rect_filled(band, 0.0, palette.control.gamma_multiply(0.14)));
        for x in [a, b] {
            shapes.extend(Paint::dotted_line(
                &[egui::pos2(x, frame.top()), egui::pos2(x, frame.bottom())],
                palette.control,
                5.0,
                1.0,
            ));
        }
        let galley =
            ui.painter().layout_no_wrap(text.clone(), egui::FontId::proportional(12.0), palette.control);
        shapes.push(Paint::galley(egui::pos2(a + 4.0, frame.bottom() - 18.0), galley, palette.control));
    }
    // Station equations: a dashed line across the plot and its mark.
    for (s, text) in &scene.equations {
        let x = at(*s, 0.0).x;
        let (top, bottom) = (egui::pos2(x, frame.top()), egui::pos2(x, frame.bottom()));
        shapes.extend(Paint::dashed_line(&[top, bottom], Stroke::new(1.2, palette.text), 6.0, 4.0));
        let galley = ui.painter().layout_no_wrap(
            format!("Station equation {text}"),
            egui::FontId::proportional(12.0),
            palette.text,
        );
        let at = egui::pos2(x + 4.0, frame.top() + 4.0);
        shapes.push(Paint::rect_filled(
            egui::Rect::from_min_size(at, galley.size()).expand(2.0),
            2.0,
            ui.visuals().extreme_bg_color,
        ));
        shapes.push(Paint::galley(at, galley, palette.text));
    }
    painter.extend(shapes);
}

/// A control-point symbol centred on its point `p`: a diamond (fixed), or
/// a bar at the elevation with a triangle on the side the profile must
/// stay, pointing at the bar (minimum: below; maximum: above).
pub(super) fn symbol(
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
