//! The PVI table: editable station, elevation and curve lengths, and the
//! derived grades, A, K, minimum K, required length and status.

use egui::RichText;
use gradewright_geometry::{Pvi, Severity, Station, VerticalCurve, format_station, parse_station};

use super::app::GradewrightApp;
use super::cell::{edit_cell, parse_length, parse_number, settle};
use super::command::{Action, Edit};
use super::theme::Palette;
use super::view::{CellId, PviColumn};

/// The status text and colour of a severity (symbol and word, not colour alone).
pub fn status_text(worst: Option<Severity>, palette: Palette) -> RichText {
    match worst {
        Some(Severity::Fail) => RichText::new("✖ fail").color(palette.fail).strong(),
        Some(Severity::Warn) => RichText::new("⚠ warn").color(palette.warn),
        Some(Severity::Info) => RichText::new("ℹ info").color(palette.text),
        None => RichText::new("✔ ok").color(palette.ok),
    }
}

fn optional(value: Option<f64>, decimals: usize) -> String {
    value.filter(|v| v.is_finite()).map_or_else(|| "—".to_owned(), |v| format!("{v:.decimals$}"))
}

/// The PVI table.
#[allow(clippy::too_many_lines)]
pub fn table_ui(app: &mut GradewrightApp, ui: &mut egui::Ui) {
    let palette = Palette::of(ui);
    let units = app.project().units;
    let len = units.length_symbol();
    let ks = units.k_symbol();
    let n = app.project().pvis.len();
    ui.horizontal(|ui| {
        ui.heading("PVIs");
        ui.label(
            RichText::new(format!(
                "{n} PVIs · stations like {} or plain numbers · Enter to apply",
                format_station(1234.5, units, units.station_decimals())
            ))
            .weak(),
        );
        if ui.button("Insert after selected").on_hover_text("Insert").clicked() {
            app.push(Action::InsertAfterSelected);
        }
        if ui
            .add_enabled(app.view.selected.is_some() && n > 2, egui::Button::new("Delete selected"))
            .on_hover_text("Delete")
            .clicked()
        {
            app.push(Action::DeleteSelected);
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
        "g1 back".to_owned(),
        "g2 ahead".to_owned(),
        "A".to_owned(),
        format!("K ({ks})"),
        "K min".to_owned(),
        format!("L req ({len})"),
        "Status".to_owned(),
    ];
    if let Some(i) = app.view.scroll_to_row.take() {
        app.view.table_scroll = Some(row_height * i.saturating_sub(2) as f32);
    }
    let mut area = egui::ScrollArea::both().id_salt("pvi-rows").auto_shrink([false, false]);
    if let Some(offset) = app.view.table_scroll.take() {
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
                    row_ui(app, ui, i, palette);
                    ui.end_row();
                }
            });
    });
}

#[allow(clippy::too_many_lines)]
fn row_ui(app: &mut GradewrightApp, ui: &mut egui::Ui, i: usize, palette: Palette) {
    let units = app.project().units;
    let pvis = &app.project().pvis;
    let n = pvis.len();
    let Some(pvi) = pvis.get(i).copied() else { return };
    let prev = i.checked_sub(1).and_then(|j| pvis.get(j)).map(|p| p.station.0);
    let next = pvis.get(i + 1).map(|p| p.station.0);
    let interior = i > 0 && i + 1 < n;
    let selected = app.view.selected == Some(i);
    if ui.selectable_label(selected, format!("{}", i + 1)).clicked() {
        app.push(Action::Focus(i));
    }
    let number = i + 1;
    // Station.
    let id = CellId::Pvi(i, PviColumn::Station);
    let current = format_station(pvi.station.0, units, units.station_decimals());
    if let Some(text) = edit_cell(ui, &mut app.view, id, &current, 90.0, &format!("PVI {number} station")) {
        let parsed = parse_station(&text, units).map_err(|e| e.to_string()).and_then(|s| {
            let low_ok = prev.is_none_or(|p| s > p);
            let high_ok = next.is_none_or(|q| s < q);
            if low_ok && high_ok {
                Ok(s)
            } else {
                let fmt = |v: Option<f64>| {
                    v.map_or("the end".to_owned(), |v| format_station(v, units, units.station_decimals()))
                };
                Err(format!("station must lie between {} and {}", fmt(prev), fmt(next)))
            }
        });
        if let Some(s) = settle(&mut app.view, id, &text, parsed) {
            app.push(Action::edit(Edit::SetPvi { index: i, pvi: Pvi { station: Station(s), ..pvi } }));
        }
    }
    // Elevation.
    let id = CellId::Pvi(i, PviColumn::Elevation);
    if let Some(text) = edit_cell(
        ui,
        &mut app.view,
        id,
        &format!("{:.3}", pvi.elevation),
        80.0,
        &format!("PVI {number} elevation"),
    ) && let Some(e) = settle(&mut app.view, id, &text, parse_number(&text))
    {
        app.push(Action::edit(Edit::SetPvi { index: i, pvi: Pvi { elevation: e, ..pvi } }));
    }
    // Curve lengths.
    if interior {
        let curve = pvi.curve;
        let id = CellId::Pvi(i, PviColumn::Length);
        let label = format!("PVI {number} curve length");
        if let Some(text) = edit_cell(ui, &mut app.view, id, &format!("{:.2}", curve.length()), 70.0, &label)
            && let Some(l) = settle(&mut app.view, id, &text, parse_length(&text))
        {
            let curve = match curve {
                VerticalCurve::Unequal { .. } => curve.with_length(l),
                _ => VerticalCurve::from_lengths(l / 2.0, l / 2.0),
            };
            app.push(Action::edit(Edit::SetPvi { index: i, pvi: Pvi { curve, ..pvi } }));
        }
        for (column, name, value) in [
            (PviColumn::LengthIn, "length in", curve.length_in()),
            (PviColumn::LengthOut, "length out", curve.length_out()),
        ] {
            let id = CellId::Pvi(i, column);
            let label = format!("PVI {number} curve {name}");
            if let Some(text) = edit_cell(ui, &mut app.view, id, &format!("{value:.2}"), 60.0, &label)
                && let Some(l) = settle(&mut app.view, id, &text, parse_length(&text))
            {
                let (l_in, l_out) = match (column, curve.is_curve()) {
                    (PviColumn::LengthIn, true) => (l, curve.length_out()),
                    (_, true) => (curve.length_in(), l),
                    _ => (l, l),
                };
                let curve = VerticalCurve::from_lengths(l_in, l_out);
                app.push(Action::edit(Edit::SetPvi { index: i, pvi: Pvi { curve, ..pvi } }));
            }
        }
    } else {
        for _ in 0..3 {
            ui.label(RichText::new("—").weak()).on_hover_text("The first and last PVI carry no curve");
        }
    }
    // Derived columns.
    let derived = app.derived();
    let curve = derived.curves.iter().find(|c| c.index == i);
    let check = derived.report.curves.iter().find(|c| c.curve.index == i);
    let grade = |a: &Pvi, b: &Pvi| (b.elevation - a.elevation) / (b.station - a.station) * 100.0;
    let pvis = &app.project().pvis;
    let g_in = i.checked_sub(1).and_then(|j| pvis.get(j)).map(|a| grade(a, &pvi));
    let g_out = pvis.get(i + 1).map(|b| grade(&pvi, b));
    let pct =
        |v: Option<f64>| v.filter(|v| v.is_finite()).map_or_else(|| "—".to_owned(), |v| format!("{v:+.3} %"));
    ui.label(pct(g_in));
    ui.label(pct(g_out));
    ui.label(curve.map_or_else(|| "—".to_owned(), |c| format!("{:.3} %", c.a_percent())));
    let k = curve.and_then(gradewright_geometry::CurveGeometry::k);
    let k_min = check.and_then(|c| c.k_required);
    let k_text = RichText::new(optional(k, 1));
    // The checks' own comparison, so a K shown equal to its minimum is not red.
    let k_text = match (k, k_min) {
        (Some(k), Some(m)) if gradewright_geometry::tolerance::below(k, m) => {
            k_text.color(palette.fail).strong()
        }
        _ => k_text,
    };
    let k_cell = ui.label(k_text);
    if let Some(c) = curve.filter(|c| c.ratio_factor() > 1.0) {
        k_cell.on_hover_text(format!(
            "Unequal tangents: K of the sharper branch (checked); L/A = {}",
            optional(c.k_overall(), 1)
        ));
    }
    ui.label(optional(k_min, 0));
    ui.label(optional(check.map(|c| c.length_required).filter(|l| *l > 0.0), 1))
        .on_hover_text("Total length the criteria ask for, at this curve's back:ahead ratio");
    let messages: Vec<String> =
        derived.findings_at(i).map(|f| format!("[{}] {}", f.severity.key(), f.message)).collect();
    let worst = derived.report.worst_at(i);
    let status = ui.label(status_text(worst, palette));
    if !messages.is_empty() {
        status.on_hover_text(messages.join("\n"));
    }
}
