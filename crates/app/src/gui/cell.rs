//! An editable text cell that never lets a bad entry reach the model: the
//! typed text stays in a buffer, marked invalid with the reason, until it
//! parses.

use egui::{Color32, RichText, WidgetInfo};

use super::view::{CellBuffer, CellId, ViewState};

/// Shows a text cell with accessible label `label`. Shows the user's buffer
/// while editing (or while refused), else `current`. Returns the text when the
/// user commits an edit (Enter or leaving the cell).
pub fn edit_cell(
    ui: &mut egui::Ui,
    view: &mut ViewState,
    id: CellId,
    current: &str,
    width: f32,
    label: &str,
) -> Option<String> {
    let buffer = view.cells.get(&id).cloned();
    let mut text = buffer.as_ref().map_or_else(|| current.to_owned(), |b| b.text.clone());
    let error = buffer.as_ref().and_then(|b| b.error.clone());
    let mut edit = egui::TextEdit::singleline(&mut text).desired_width(width).id_salt(id);
    if error.is_some() {
        edit =
            edit.text_color(Color32::from_rgb(230, 60, 50)).background_color(ui.visuals().extreme_bg_color);
    }
    // The cell and its mark share one grid cell, so the columns stay aligned
    // whatever the cell shows.
    let mark_reason = error.clone();
    let inner = ui.horizontal(|ui| {
        let response = ui.add_sized([width, ui.spacing().interact_size.y], edit);
        if let Some(reason) = &mark_reason {
            ui.label(RichText::new("⚠ invalid").color(Color32::from_rgb(230, 60, 50)))
                .on_hover_text(format!("{reason}\n(the model keeps {current})"));
        }
        response
    });
    let response = inner.inner;
    let label_text = label.to_owned();
    let shown = text.clone();
    response.widget_info(|| {
        let mut info = WidgetInfo::text_edit(true, &shown, &shown, "");
        info.label = Some(label_text.clone());
        info
    });
    if response.changed() {
        view.cells.insert(id, CellBuffer { text: text.clone(), error: None });
    }
    let mut committed = None;
    if response.lost_focus()
        && let Some(buffer) = view.cells.get(&id)
    {
        if buffer.text.trim() == current.trim() && buffer.error.is_none() {
            view.cells.remove(&id);
        } else {
            committed = Some(buffer.text.clone());
        }
    }
    if let Some(reason) = error {
        response.on_hover_text(reason);
    }
    committed
}

/// Records the outcome of parsing a committed cell: clears the buffer on
/// success, keeps the text with the reason on failure.
pub fn settle<T>(view: &mut ViewState, id: CellId, text: &str, parsed: Result<T, String>) -> Option<T> {
    match parsed {
        Ok(value) => {
            view.cells.remove(&id);
            Some(value)
        }
        Err(reason) => {
            view.cells.insert(id, CellBuffer { text: text.to_owned(), error: Some(reason) });
            None
        }
    }
}

/// Parses a finite number.
pub fn parse_number(text: &str) -> Result<f64, String> {
    let value: f64 = text.trim().parse().map_err(|_| format!("'{}' is not a number", text.trim()))?;
    if value.is_finite() { Ok(value) } else { Err(format!("'{}' is not a finite number", text.trim())) }
}

/// Parses a length that must not be negative.
pub fn parse_length(text: &str) -> Result<f64, String> {
    let value = if text.trim().is_empty() { 0.0 } else { parse_number(text)? };
    if value < 0.0 { Err(format!("length {value} is negative")) } else { Ok(value) }
}
