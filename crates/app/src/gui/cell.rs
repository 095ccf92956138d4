//! Editable text cells that never let a bad entry reach the model: the
//! typed text stays in the panel's buffer, marked invalid with the reason,
//! until it parses.

use std::collections::HashMap;
use std::hash::Hash;

use egui::{Color32, RichText, WidgetInfo};

/// A text cell being edited: its text, and why it was refused if it was.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct CellBuffer {
    /// What the user typed.
    pub text: String,
    /// Why the text was refused.
    pub error: Option<String>,
}

/// The cells of one panel being edited, by key.
#[derive(Clone, Debug)]
pub struct Cells<K> {
    /// Told apart from other panels' cells in egui's ids.
    name: &'static str,
    buffers: HashMap<K, CellBuffer>,
}

impl<K: Copy + Eq + Hash + std::fmt::Debug> Cells<K> {
    /// The cells of the panel `name`.
    pub fn new(name: &'static str) -> Self {
        Self { name, buffers: HashMap::new() }
    }

    /// Forgets every buffer (another project).
    pub fn clear(&mut self) {
        self.buffers.clear();
    }

    /// Forgets the buffer of `key` (the value it showed is gone).
    pub fn forget(&mut self, key: K) {
        self.buffers.remove(&key);
    }

    /// Forgets the buffers `keep` says no to.
    pub fn retain(&mut self, mut keep: impl FnMut(&K) -> bool) {
        self.buffers.retain(|k, _| keep(k));
    }

    /// Shows the cell `key` with accessible label `label`: the user's
    /// buffer while editing (or while refused), else `current`. Returns the
    /// text when the user commits an edit (Enter or leaving the cell).
    pub fn edit(
        &mut self,
        ui: &mut egui::Ui,
        key: K,
        current: &str,
        width: f32,
        label: &str,
    ) -> Option<String> {
        let buffer = self.buffers.get(&key).cloned();
        let mut text = buffer.as_ref().map_or_else(|| current.to_owned(), |b| b.text.clone());
        let error = buffer.as_ref().and_then(|b| b.error.clone());
        let mut edit = egui::TextEdit::singleline(&mut text).desired_width(width).id_salt((self.name, key));
        if error.is_some() {
            edit = edit
                .text_color(Color32::from_rgb(230, 60, 50))
                .background_color(ui.visuals().extreme_bg_color);
        }
        // The cell and its mark share one grid cell, so the columns stay
        // aligned whatever the cell shows.
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
            self.buffers.insert(key, CellBuffer { text: text.clone(), error: None });
        }
        let mut committed = None;
        if response.lost_focus()
            && let Some(buffer) = self.buffers.get(&key)
        {
            if buffer.text.trim() == current.trim() && buffer.error.is_none() {
                self.buffers.remove(&key);
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
    pub fn settle<T>(&mut self, key: K, text: &str, parsed: Result<T, String>) -> Option<T> {
        match parsed {
            Ok(value) => {
                self.buffers.remove(&key);
                Some(value)
            }
            Err(reason) => {
                self.buffers.insert(key, CellBuffer { text: text.to_owned(), error: Some(reason) });
                None
            }
        }
    }

    /// [`Cells::edit`] and [`Cells::settle`] together: the parsed value when
    /// the user commits one `parse` accepts.
    pub fn value<T>(
        &mut self,
        ui: &mut egui::Ui,
        key: K,
        (current, width, label): (&str, f32, &str),
        parse: impl FnOnce(&str) -> Result<T, String>,
    ) -> Option<T> {
        let text = self.edit(ui, key, current, width, label)?;
        let parsed = parse(&text);
        self.settle(key, &text, parsed)
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
