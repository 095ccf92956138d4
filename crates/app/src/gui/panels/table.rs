//! The PVI table: editable station, elevation and curve lengths, and the
//! derived grades, A, K, minimum K, required length and status.

use egui::RichText;
use gradewright_geometry::{CriteriaError, Pvi, Severity, Station, VerticalCurve};

use super::View;
use crate::gui::cell::{Cells, parse_length, parse_number};
use crate::gui::command::{Action, Edit, UiCommand};
use crate::gui::theme::Palette;

/// Editable columns of the PVI table.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
pub enum PviColumn {
    /// Station.
    Station,
    /// Elevation.
    Elevation,
    /// Total curve length.
    Length,
    /// Length before the PVI.
    LengthIn,
    /// Length after the PVI.
    LengthOut,
    /// Grade from the previous PVI (typed: moves this PVI's elevation).
    GradeBack,
    /// Grade to the next PVI (typed: moves the next PVI's elevation).
    GradeAhead,
    /// K (typed: sets the curve length to K·A).
    K,
}

/// The PVI table's own state.
#[derive(Debug)]
pub struct TablePanel {
    /// Cells being edited: row and column.
    cells: Cells<(usize, PviColumn)>,
    /// Whether the PVC, PVT and high/low point columns are shown.
    pub show_curve_points: bool,
    /// A row to scroll into view on the next frame.
    scroll_to_row: Option<usize>,
}

impl Default for TablePanel {
    fn default() -> Self {
        Self { cells: Cells::new("pvi-table"), show_curve_points: true, scroll_to_row: None }
    }
}

/// The status text and colour of a severity (symbol and word, not colour alone).
pub fn status_text(worst: Option<Severity>, palette: Palette) -> RichText {
    match worst {
        Some(Severity::Fail) => RichText::new("✖ fail").color(palette.fail).strong(),
        Some(Severity::Warn) => RichText::new("⚠ warn").color(palette.warn),
        Some(Severity::Info) => RichText::new("ℹ info").color(palette.text),
        None => RichText::new("✔ ok").color(palette.ok),
    }
}

/// What "not checked" says of why, in a word or two (the full reason is
/// the findings panel's and the hover's).
pub fn unchecked_words(why: &CriteriaError) -> &'static str {
    match why {
        CriteriaError::NoDesignSpeed => "no design speed",
        CriteriaError::BadDesignSpeed { .. } => "design speed off the tables",
        CriteriaError::CoarseStep { .. } => "sight step too coarse",
        CriteriaError::BadOverride { .. } => "a criterion unusable",
        CriteriaError::InRange { .. } | CriteriaError::BadRange { .. } => "a criteria range unusable",
    }
}

/// The status of a row whose design checks did not run: never "ok".
fn unchecked_text(why: &CriteriaError, palette: Palette) -> RichText {
    RichText::new(format!("○ not checked: {}", unchecked_words(why))).color(palette.warn)
}

fn optional(value: Option<f64>, decimals: usize) -> String {
    value.filter(|v| v.is_finite()).map_or_else(|| "—".to_owned(), |v| format!("{v:.decimals$}"))
}

impl TablePanel {
    /// Forgets the old project's cells.
    pub fn reset(&mut self) {
        self.cells.clear();
        self.scroll_to_row = None;
    }

    /// Scrolls row `index` into view on the next frame.
    pub fn scroll_to(&mut self, index: usize) {
        self.scroll_to_row = Some(index);
    }

    /// The PVI table.
    #[allow(clippy::too_many_lines)]
    pub fn ui(&mut self, ui: &mut egui::Ui, view: &mut View<'_>) {
        let doc = view.doc;
        let palette = Palette::of(ui);
        let units = doc.project().units;
        let len = units.length_symbol();
        let ks = units.k_symbol();
        let n = doc.project().pvis.len();
        ui.horizontal(|ui| {
            ui.heading("PVIs");
            ui.label(
                RichText::new(format!(
                    "{n} PVIs · stations like {} or plain numbers · Enter to apply",
                    doc.project().stationing().label(1234.5, units.station_decimals())
                ))
                .weak(),
            );
            ui.checkbox(&mut self.show_curve_points, "PVC, PVT, high/low columns");
            if ui.button("Insert after selected").on_hover_text("Insert").clicked() {
                view.push(UiCommand::Insert.action());
            }
            if ui
                .add_enabled(view.selected.is_some() && n > 2, egui::Button::new("Delete selected"))
                .on_hover_text("Delete")
                .clicked()
            {
                view.push(UiCommand::Delete.action());
            }
        });
        // Only the rows in view are built (a long profile has hundreds of PVIs).
        let row_height = ui.spacing().interact_size.y + 4.0;
        let headers = [
            "PVI".to_owned(),
            "Station".to_owned(),
            format!("Elevation ({len})"),
            format!("Curve L ({len})"),
            "L back".to_owned(),
            "L ahead".to_owned(),
            "Shape".to_owned(),
            "g1 back (%)".to_owned(),
            "g2 ahead (%)".to_owned(),
            "A".to_owned(),
            format!("K ({ks})"),
            String::new(),
            "K min".to_owned(),
            format!("L req ({len})"),
            "Status".to_owned(),
        ];
        let mut headers = headers.to_vec();
        let with_ground = doc.project().ground.range().is_some();
        if with_ground {
            headers.push(format!("Ground ({len})"));
            headers.push(format!("Cut/fill ({len})"));
        }
        if self.show_curve_points {
            for h in
                ["PVC station", "PVC elev.", "PVT station", "PVT elev.", "High/low station", "High/low elev."]
            {
                headers.push(h.to_owned());
            }
        }
        let mut area = egui::ScrollArea::both().id_salt("pvi-rows").auto_shrink([false, false]);
        if let Some(i) = self.scroll_to_row.take() {
            #[allow(clippy::cast_precision_loss)]
            let offset = row_height * i.saturating_sub(2) as f32;
            area = area.vertical_scroll_offset(offset);
        }
        area.show_rows(ui, row_height, n + 1, |ui, rows| {
            egui::Grid::new("pvi-table")
                .striped(true)
                .spacing([10.0, 4.0])
                .min_row_height(row_height - 4.0)
                .show(ui, |ui| {
                    for h in &headers {
                        ui.label(RichText::new(h).strong());
                    }
                    ui.end_row();
                    for i in rows.start.saturating_sub(1)..rows.end.saturating_sub(1).min(n) {
                        self.row_ui(ui, view, i, palette);
                        ui.end_row();
                    }
                });
        });
    }

    #[allow(clippy::too_many_lines)]
    fn row_ui(&mut self, ui: &mut egui::Ui, view: &mut View<'_>, i: usize, palette: Palette) {
        let doc = view.doc;
        let units = doc.project().units;
        let pvis = &doc.project().pvis;
        let n = pvis.len();
        let Some(pvi) = pvis.get(i).copied() else { return };
        let prev = i.checked_sub(1).and_then(|j| pvis.get(j)).map(|p| p.station.0);
        let next = pvis.get(i + 1).map(|p| p.station.0);
        let interior = i > 0 && i + 1 < n;
        let selected = view.selected == Some(i);
        if ui.selectable_label(selected, format!("{}", i + 1)).clicked() {
            // Selecting never moves the view; Zoom to selection (Z) does.
            view.push(Action::Select(Some(i)));
            self.scroll_to_row = None;
        }
        let number = i + 1;
        // Station.
        let id = (i, PviColumn::Station);
        let current = doc.project().stationing().label(pvi.station.0, units.station_decimals());
        if let Some(text) = self.cells.edit(ui, id, &current, 90.0, &format!("PVI {number} station")) {
            let parsed = doc.project().stationing().parse(&text).map_err(|e| e.to_string()).and_then(|s| {
                let low_ok = prev.is_none_or(|p| s > p);
                let high_ok = next.is_none_or(|q| s < q);
                if low_ok && high_ok {
                    Ok(s)
                } else {
                    let fmt = |v: Option<f64>| {
                        v.map_or("the end".to_owned(), |v| {
                            doc.project().stationing().label(v, units.station_decimals())
                        })
                    };
                    Err(format!("station must lie between {} and {}", fmt(prev), fmt(next)))
                }
            });
            if let Some(s) = self.cells.settle(id, &text, parsed) {
                view.push(Action::edit(Edit::SetPvi { index: i, pvi: Pvi { station: Station(s), ..pvi } }));
            }
        }
        // Elevation.
        let id = (i, PviColumn::Elevation);
        if let Some(text) = self.cells.edit(
            ui,
            id,
            &format!("{:.3}", pvi.elevation),
            80.0,
            &format!("PVI {number} elevation"),
        ) && let Some(e) = self.cells.settle(id, &text, parse_number(&text))
        {
            view.push(Action::edit(Edit::SetPvi { index: i, pvi: Pvi { elevation: e, ..pvi } }));
        }
        // Curve lengths.
        if interior {
            let curve = pvi.curve;
            let id = (i, PviColumn::Length);
            let label = format!("PVI {number} curve length");
            if let Some(text) = self.cells.edit(ui, id, &format!("{:.2}", curve.length()), 70.0, &label)
                && let Some(l) = self.cells.settle(id, &text, parse_length(&text))
            {
                let curve = match curve {
                    VerticalCurve::Unequal { .. } => curve.with_length(l),
                    _ => VerticalCurve::from_lengths(l / 2.0, l / 2.0),
                };
                view.push(Action::edit(Edit::SetPvi { index: i, pvi: Pvi { curve, ..pvi } }));
            }
            for (column, name, value) in [
                (PviColumn::LengthIn, "length in", curve.length_in()),
                (PviColumn::LengthOut, "length out", curve.length_out()),
            ] {
                let id = (i, column);
                let label = format!("PVI {number} curve {name}");
                if let Some(text) = self.cells.edit(ui, id, &format!("{value:.2}"), 60.0, &label)
                    && let Some(l) = self.cells.settle(id, &text, parse_length(&text))
                {
                    let (l_in, l_out) = match (column, curve.is_curve()) {
                        (PviColumn::LengthIn, true) => (l, curve.length_out()),
                        (_, true) => (curve.length_in(), l),
                        _ => (l, l),
                    };
                    let curve = VerticalCurve::from_lengths(l_in, l_out);
                    view.push(Action::edit(Edit::SetPvi { index: i, pvi: Pvi { curve, ..pvi } }));
                }
            }
        } else {
            for _ in 0..3 {
                ui.label(RichText::new("—").weak()).on_hover_text("The first and last PVI carry no curve");
            }
        }
        // Derived columns; the grades and K may be typed too.
        let analysis = doc.analysis();
        let curve = analysis.curves.iter().find(|c| c.index == i).copied();
        let check = analysis.report.curves.iter().find(|c| c.curve.index == i).cloned();
        let grade_back = i.checked_sub(1).and_then(|j| analysis.profile.tangent_grade_percent(j));
        let grade_ahead = analysis.profile.tangent_grade_percent(i);
        let pvis = doc.project().pvis.clone();
        let previous = i.checked_sub(1).and_then(|j| pvis.get(j)).copied();
        let following = pvis.get(i + 1).copied();
        // Shape: symmetric or unequal, with a one-click way back to symmetric.
        match pvi.curve {
            VerticalCurve::Unequal { length_in, length_out } if interior => {
                ui.horizontal(|ui| {
                    ui.label(RichText::new("⚖ unequal").color(palette.warn)).on_hover_text(format!(
                        "Unequal tangents: {length_in:.2} back, {length_out:.2} ahead"
                    ));
                    if ui
                        .small_button("Make symmetric")
                        .on_hover_text(format!("PVI {number}: same total length, centred"))
                        .clicked()
                    {
                        view.push(Action::MakeSymmetric(i));
                    }
                });
            }
            VerticalCurve::Symmetric { .. } if interior => {
                ui.label("symmetric");
            }
            _ => {
                ui.label(RichText::new("—").weak());
            }
        }
        let pct =
            |v: Option<f64>| v.filter(|v| v.is_finite()).map_or_else(String::new, |v| format!("{v:+.3}"));
        // g1 back: typing it moves this PVI's elevation on the grade from the previous PVI.
        match previous {
            Some(a) => {
                let id = (i, PviColumn::GradeBack);
                if let Some(text) =
                    self.cells.edit(ui, id, &pct(grade_back), 60.0, &format!("PVI {number} grade back"))
                    && let Some(g) = self.cells.settle(
                        id,
                        &text,
                        parse_grade(&text, (a.station.0, a.elevation), doc.project().stationing()),
                    )
                {
                    let elevation = a.elevation + g / 100.0 * (pvi.station - a.station);
                    view.push(Action::edit(Edit::SetPvi { index: i, pvi: Pvi { elevation, ..pvi } }));
                }
            }
            None => {
                ui.label(RichText::new("—").weak());
            }
        }
        // g2 ahead: typing it moves the next PVI's elevation on the grade from this one.
        match following {
            Some(b) => {
                let id = (i, PviColumn::GradeAhead);
                if let Some(text) =
                    self.cells.edit(ui, id, &pct(grade_ahead), 60.0, &format!("PVI {number} grade ahead"))
                    && let Some(g) = self.cells.settle(
                        id,
                        &text,
                        parse_grade(&text, (pvi.station.0, pvi.elevation), doc.project().stationing()),
                    )
                {
                    let elevation = pvi.elevation + g / 100.0 * (b.station - pvi.station);
                    view.push(Action::edit(Edit::SetPvi { index: i + 1, pvi: Pvi { elevation, ..b } }));
                }
            }
            None => {
                ui.label(RichText::new("—").weak());
            }
        }
        ui.label(curve.map_or_else(|| "—".to_owned(), |c| format!("{:.3} %", c.a_percent())));
        let k = curve.and_then(|c| c.k());
        let k_min = check.as_ref().and_then(|c| c.k_required);
        // K: typing it sets the length to K·A (times the ratio factor when unequal).
        match curve.filter(|c| c.kind != gradewright_geometry::CurveKind::None) {
            Some(c) => {
                let id = (i, PviColumn::K);
                let failing =
                    matches!((k, k_min), (Some(k), Some(m)) if gradewright_geometry::tolerance::below(k, m));
                if failing {
                    ui.visuals_mut().override_text_color = Some(palette.fail);
                }
                let typed = self.cells.edit(ui, id, &optional(k, 1), 55.0, &format!("PVI {number} K"));
                ui.visuals_mut().override_text_color = None;
                if let Some(text) = typed {
                    let parsed = parse_number(&text)
                        .and_then(|k| if k > 0.0 { Ok(k) } else { Err(format!("K {k} is not positive")) });
                    if let Some(k) = self.cells.settle(id, &text, parsed) {
                        let length = k * c.a_percent() * c.ratio_factor();
                        let curve = if pvi.curve.is_curve() {
                            pvi.curve.with_length(length)
                        } else {
                            VerticalCurve::Symmetric { length }
                        };
                        view.push(Action::edit(Edit::SetPvi { index: i, pvi: Pvi { curve, ..pvi } }));
                    }
                }
                if c.ratio_factor() > 1.0 {
                    ui.label(RichText::new(format!("L/A {}", optional(c.k_overall(), 1))).weak().small())
                    .on_hover_text(
                        "Unequal tangents: K is that of the sharper branch (checked); L/A of the whole curve",
                    );
                } else {
                    ui.label("");
                }
            }
            None => {
                ui.label(RichText::new("—").weak());
                ui.label("");
            }
        }
        ui.label(optional(k_min, 0));
        ui.label(optional(check.as_ref().map(|c| c.length_required).filter(|l| *l > 0.0), 1))
            .on_hover_text("Total length the criteria ask for, at this curve's back:ahead ratio");
        let analysis = doc.analysis();
        let messages: Vec<String> =
            analysis.findings_at(i).map(|f| format!("[{}] {}", f.severity().key(), f.message)).collect();
        let worst = analysis.worst_at(i);
        // With the criteria off only the profile's own problems were looked
        // for: a row without one was not checked, not passed.
        let unchecked =
            analysis.criteria.as_ref().err().filter(|_| worst.is_none_or(|w| w <= Severity::Info));
        let status = match unchecked {
            Some(why) => ui.label(unchecked_text(why, palette)).on_hover_text(format!(
                "Not checked: {why}. Enter it under Criteria to check this row's curve and grades."
            )),
            None => ui.label(status_text(worst, palette)),
        };
        if !messages.is_empty() {
            status.on_hover_text(messages.join("\n"));
        }
        if doc.project().ground.range().is_some() {
            // At the PVI station, against the profile (the curve, not the PVI).
            let at = doc.project().pvis.get(i).map(|p| p.station.0);
            let depth = match (doc.analysis().alignment.as_ref(), at) {
                (Some(a), Some(s)) => gradewright_geometry::depth_at(a, &doc.project().ground, s),
                _ => None,
            };
            match depth {
                Some(d) => {
                    ui.label(format!("{:.3}", d.ground));
                    if d.cut > 0.0 {
                        ui.label(format!("cut {:.3}", d.cut));
                    } else {
                        ui.label(format!("fill {:.3}", d.fill));
                    }
                }
                None => {
                    ui.label(RichText::new("no ground").weak());
                    ui.label(RichText::new("—").weak());
                }
            }
        }
        if self.show_curve_points {
            let units = doc.project().units;
            let station = |s: f64| doc.project().stationing().label(s, units.station_decimals());
            match curve.filter(|c| c.length() > 0.0) {
                Some(c) => {
                    ui.label(station(c.pvc.0));
                    ui.label(format!("{:.3}", c.pvc_elevation));
                    ui.label(station(c.pvt.0));
                    ui.label(format!("{:.3}", c.pvt_elevation));
                    match c.turning {
                        Some((s, e)) => {
                            ui.label(station(s.0));
                            ui.label(format!("{e:.3}"));
                        }
                        None => {
                            ui.label(RichText::new("none on the curve").weak());
                            ui.label("");
                        }
                    }
                }
                None => {
                    for _ in 0..6 {
                        ui.label(RichText::new("—").weak());
                    }
                }
            }
        }
    }
}

/// A typed grade: a percentage (`+2.5`, `-1 %`), or a point the tangent must
/// pass through, `STATION = ELEVATION` (`1+050 = 221.3`), from the fixed PVI
/// at `from` (station, elevation).
fn parse_grade(
    text: &str,
    from: (f64, f64),
    at: gradewright_geometry::Stationing<'_>,
) -> Result<f64, String> {
    if let Some((station, elevation)) = text.split_once('=') {
        let station = at.parse(station).map_err(|e| e.to_string())?;
        let elevation = parse_number(elevation)?;
        if (station - from.0).abs() <= 0.0 {
            return Err("the point must lie at another station than the PVI".to_owned());
        }
        return Ok((elevation - from.1) / (station - from.0) * 100.0);
    }
    parse_number(text.trim().trim_end_matches('%'))
}
