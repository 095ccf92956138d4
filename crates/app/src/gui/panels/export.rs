//! File, Export sheet and tables…: the choices (saved with the project), a
//! live preview of the very sheet that will be written, and the export.

use std::path::{Path, PathBuf};

use egui::RichText;
use gradewright_document::{ExportSettings, TableDecimals};

use crate::export::{Field, PlanError};
use crate::gui::command::{Action, Edit};
use crate::gui::document::Document;

/// The export windows' own state.
#[derive(Debug, Default)]
pub struct ExportPanel {
    /// Whether the export window is open.
    pub open: bool,
    /// Whether the tables-only export window is open.
    pub tables_open: bool,
    /// The export window's preview.
    preview: Preview,
}

/// The label the editor gives an export field.
fn label_of(field: Field) -> &'static str {
    match field {
        Field::Sheet => "Sheet size",
        Field::Dpi => "PNG resolution",
        Field::HScale => "Horizontal scale",
        Field::VScale => "Vertical scale",
        Field::Overlap => "Overlap between sheets",
        Field::Interval => "Stations table every",
        Field::Decimals => "Numbers in the tables",
        Field::Png | Field::Svg | Field::Pdf => "Write to",
        Field::Tables => "Tables folder",
        Field::LandXml => "LandXML file",
        Field::Output => "File",
    }
}

/// An export plan's error in the editor's words, naming the field.
pub fn plan_words(e: &PlanError) -> String {
    match e {
        PlanError::Nothing => "nothing to export: tick PDF, PNG, SVG or Tables".to_owned(),
        PlanError::Value { field, problem } => format!("{}: {problem}", label_of(*field)),
        PlanError::Path { field, path, problem } => {
            format!("{} {}: {problem}", label_of(*field), path.display())
        }
    }
}

/// The preview shown, and what it was drawn from.
#[derive(Clone, Default)]
pub struct Preview {
    /// Project revision and settings it shows.
    key: Option<(u64, String)>,
    /// The texture.
    texture: Option<egui::TextureHandle>,
    /// Why there is none.
    error: Option<String>,
    /// How many sheets the export makes.
    pub sheets: usize,
}

impl std::fmt::Debug for Preview {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.debug_struct("Preview")
            .field("sheets", &self.sheets)
            .field("error", &self.error)
            .finish_non_exhaustive()
    }
}

/// The export request for the project's settings.
pub fn request(settings: &ExportSettings, base: &std::path::Path) -> crate::export::Request {
    let with = |ext: &str| base.with_extension(ext);
    crate::export::Request {
        png: settings.png.then(|| with("png")),
        svg: settings.svg.then(|| with("svg")),
        pdf: settings.pdf.then(|| with("pdf")),
        csv_dir: settings.tables.then(|| {
            let mut dir = base.as_os_str().to_owned();
            dir.push("-tables");
            PathBuf::from(dir)
        }),
        landxml: None,
        sheet: settings.sheet.clone(),
        dpi: settings.dpi,
        h_scale: settings.h_scale,
        v_scale: settings.v_scale,
        overlap: settings.overlap,
        interval: settings.interval,
        decimals: settings.decimals,
        title: gradewright_draw::TitleBlock {
            project: String::new(),
            road: settings.road.clone(),
            designer: settings.designer.clone(),
            checker: settings.checker.clone(),
            date: settings.date.clone(),
            revision: settings.revision.clone(),
        },
        sight_band: settings.sight_band,
    }
}

/// Keeps changed export choices with the project (one undoable edit).
fn keep_settings(doc: &Document, queue: &mut Vec<Action>, settings: ExportSettings) {
    if settings != doc.project().export {
        queue.push(Action::edit(Edit::SetExport(Box::new(settings))));
    }
}

/// A path field in a grid row, showing `default` until the user types one.
fn path_ui(ui: &mut egui::Ui, label: &str, value: &mut String, default: &std::path::Path, hint: &str) {
    let target = ui.label(label);
    let mut path = if value.is_empty() { default.display().to_string() } else { value.clone() };
    if ui
        .add(egui::TextEdit::singleline(&mut path).desired_width(420.0))
        .labelled_by(target.id)
        .on_hover_text(hint)
        .changed()
    {
        *value = path;
    }
    ui.end_row();
}

/// The interval of `stations.csv`, typed (empty: the default).
fn interval_ui(ui: &mut egui::Ui, settings: &mut ExportSettings, units: gradewright_geometry::Units) {
    let name = ui.label("Stations table every");
    let mut text = settings.interval.map_or_else(String::new, |v| format!("{v}"));
    let hint = match units {
        gradewright_geometry::Units::Metric => "20 m (empty: 20)",
        gradewright_geometry::Units::UsCustomary => "50 ft (empty: 50)",
    };
    if ui
        .add(egui::TextEdit::singleline(&mut text).hint_text(hint).desired_width(160.0))
        .labelled_by(name.id)
        .on_hover_text("Plus every PVC, PVI and PVT")
        .changed()
    {
        settings.interval = text.trim().parse::<f64>().ok().filter(|v| v.is_finite() && *v > 0.0);
    }
    ui.end_row();
}

/// How the tables round their numbers: as on a plan (the default), a fixed
/// number of decimals, or exact.
fn decimals_ui(ui: &mut egui::Ui, settings: &mut ExportSettings, units: gradewright_geometry::Units) {
    let name = ui.label("Numbers in the tables");
    let plan = match units {
        gradewright_geometry::Units::Metric => "As on a plan: 0.001 m, 0.001 %, K and quantities 0.1",
        gradewright_geometry::Units::UsCustomary => "As on a plan: 0.01 ft, 0.001 %, K and quantities 0.1",
    };
    let shown = match settings.decimals {
        TableDecimals::Plan => plan.to_owned(),
        TableDecimals::Fixed(n) => format!("{n} decimals for every number"),
        TableDecimals::Exact => "Exact: unrounded".to_owned(),
    };
    ui.horizontal(|ui| {
        let combo = egui::ComboBox::from_id_salt("table-decimals").selected_text(shown).width(340.0).show_ui(
            ui,
            |ui| {
                ui.selectable_value(&mut settings.decimals, TableDecimals::Plan, plan);
                let fixed = matches!(settings.decimals, TableDecimals::Fixed(_));
                if ui.selectable_label(fixed, "A fixed number of decimals").clicked() && !fixed {
                    settings.decimals = TableDecimals::Fixed(3);
                }
                ui.selectable_value(&mut settings.decimals, TableDecimals::Exact, "Exact: unrounded");
            },
        );
        let _ = combo.response.labelled_by(name.id).on_hover_text(
            "Stations, lengths and elevations; grades; K; areas and volumes. \
             Exact writes the shortest text that reads back to the same number.",
        );
        if let TableDecimals::Fixed(n) = &mut settings.decimals {
            let _ = ui.add(egui::DragValue::new(n).range(0..=TableDecimals::MAX).suffix(" decimals"));
        }
    });
    ui.end_row();
}

impl ExportPanel {
    /// Both export windows, for one frame: `paths` are where the sheet and
    /// the tables go by default.
    pub fn windows_ui(
        &mut self,
        ctx: &egui::Context,
        doc: &Document,
        paths: (&Path, &Path),
        queue: &mut Vec<Action>,
    ) {
        self.sheet_ui(ctx, doc, paths.0, queue);
        self.tables_ui(ctx, doc, paths.1, queue);
    }

    /// File, Export tables…: the three hand-over tables on their own.
    fn tables_ui(&mut self, ctx: &egui::Context, doc: &Document, default: &Path, queue: &mut Vec<Action>) {
        let mut open = self.tables_open;
        if !open {
            return;
        }
        let mut settings = doc.project().export.clone();
        let mut export = false;
        egui::Window::new("Export tables").open(&mut open).default_width(560.0).show(ctx, |ui| {
            ui.label("CSV files (RFC 4180, units in the column names) that open in a spreadsheet:");
            ui.label(
                "  stations.csv — station, elevation and grade at the interval and at every PVC, PVI, PVT",
            );
            ui.label(
                "  curves.csv — every PVI and its curve: grades, L, A, K, minimum K, required L, status",
            );
            ui.label("  findings.csv — every check result: severity, code, stations, message");
            if doc.project().section.is_some() {
                ui.label(
                    "  earthwork.csv — end areas, volumes and the mass ordinate (compacted measure) at every section",
                );
            }
            egui::Grid::new("tables-grid").num_columns(2).spacing([8.0, 4.0]).show(ui, |ui| {
                interval_ui(ui, &mut settings, doc.project().units);
                decimals_ui(ui, &mut settings, doc.project().units);
                path_ui(
                    ui,
                    "Folder",
                    &mut settings.tables_path,
                    default,
                    "Made if it does not exist (its parent must)",
                );
            });
            ui.horizontal(|ui| {
                if ui.button("Write tables").clicked() {
                    export = true;
                }
                ui.label(
                    RichText::new("Results must be checked by a licensed engineer; local codes govern.")
                        .weak(),
                );
            });
        });
        keep_settings(doc, queue, settings);
        if export {
            queue.push(Action::ExportTables);
        }
        self.tables_open = open;
    }

    /// The export window.
    #[allow(clippy::too_many_lines)]
    fn sheet_ui(&mut self, ctx: &egui::Context, doc: &Document, default: &Path, queue: &mut Vec<Action>) {
        let mut open = self.open;
        if !open {
            return;
        }
        let mut settings = doc.project().export.clone();
        let mut export = false;
        egui::Window::new("Export sheet and tables").open(&mut open).default_width(720.0).show(ctx, |ui| {
            egui::Grid::new("export-grid").num_columns(2).spacing([8.0, 4.0]).show(ui, |ui| {
                let label = ui.label("Sheet size");
                let combo = egui::ComboBox::from_id_salt("sheet-size")
                    .selected_text(settings.sheet.clone())
                    .show_ui(ui, |ui| {
                        for size in ["ansi-b", "ansi-d", "a3", "a1"] {
                            ui.selectable_value(&mut settings.sheet, size.to_owned(), size);
                        }
                    });
                let _ = combo.response.labelled_by(label.id);
                ui.end_row();
                let units = doc.project().units;
                let (h_hint, v_hint) = match units {
                    gradewright_geometry::Units::Metric => {
                        ("1:N, e.g. 1000 (empty: fits one sheet)", "1:N, e.g. 100 (empty: H/10)")
                    }
                    gradewright_geometry::Units::UsCustomary => {
                        ("1 in = N ft, e.g. 50 (empty: fits)", "1 in = N ft, e.g. 5 (empty: H/10)")
                    }
                };
                for (label, value, hint) in [
                    ("Horizontal scale", &mut settings.h_scale, h_hint),
                    ("Vertical scale", &mut settings.v_scale, v_hint),
                ] {
                    let name = ui.label(label);
                    let mut text = value.map_or_else(String::new, |v| format!("{v}"));
                    if ui
                        .add(egui::TextEdit::singleline(&mut text).hint_text(hint).desired_width(260.0))
                        .labelled_by(name.id)
                        .changed()
                    {
                        *value = text.trim().parse::<f64>().ok().filter(|v| v.is_finite() && *v > 0.0);
                    }
                    ui.end_row();
                }
                let name = ui.label("Overlap between sheets");
                let _ = ui
                    .add(
                        egui::DragValue::new(&mut settings.overlap)
                            .range(0.0..=10000.0)
                            .suffix(format!(" {}", units.length_symbol())),
                    )
                    .labelled_by(name.id);
                ui.end_row();
                interval_ui(ui, &mut settings, units);
                decimals_ui(ui, &mut settings, units);
                let name2 = ui.label("PNG resolution");
                let _ = ui
                    .add(egui::DragValue::new(&mut settings.dpi).range(10.0..=600.0).suffix(" dpi"))
                    .labelled_by(name2.id);
                ui.end_row();
                for (label, value) in [
                    ("Road / section", &mut settings.road),
                    ("Designed", &mut settings.designer),
                    ("Checked", &mut settings.checker),
                    ("Date", &mut settings.date),
                    ("Revision", &mut settings.revision),
                ] {
                    let name = ui.label(label);
                    let _ =
                        ui.add(egui::TextEdit::singleline(value).desired_width(260.0)).labelled_by(name.id);
                    ui.end_row();
                }
                ui.label("Formats");
                ui.horizontal(|ui| {
                    ui.checkbox(&mut settings.pdf, "PDF");
                    ui.checkbox(&mut settings.png, "PNG");
                    ui.checkbox(&mut settings.svg, "SVG");
                    ui.checkbox(&mut settings.tables, "Tables (CSV)");
                    ui.checkbox(&mut settings.sight_band, "Sight-distance band");
                });
                ui.end_row();
                path_ui(
                    ui,
                    "Write to",
                    &mut settings.path,
                    default,
                    "Each format adds its extension; the tables go in NAME-tables/",
                );
            });
            // The preview: sheet 1, drawn from the same SVG the export writes.
            let key = (doc.revision(), format!("{settings:?}"));
            if self.preview.key.as_ref() != Some(&key) {
                let analysis = doc.analysis();
                let req = request(&settings, default);
                let drawn = crate::export::plan(&req).map_err(|e| plan_words(&e)).and_then(|plan| {
                    let options = crate::export::sheet_options(&plan, &req, doc.project());
                    let svgs = gradewright_draw::sheet_svgs(analysis, &options).map_err(|e| e.to_string())?;
                    let first = svgs.first().ok_or_else(|| "no sheet".to_owned())?;
                    let (w, h, pixels) = gradewright_draw::raster(first, 40.0).map_err(|e| e.to_string())?;
                    Ok((svgs.len(), w, h, pixels))
                });
                match drawn {
                    Ok((sheets, w, h, pixels)) => {
                        #[allow(clippy::cast_possible_truncation)]
                        let image =
                            egui::ColorImage::from_rgba_premultiplied([w as usize, h as usize], &pixels);
                        self.preview.texture =
                            Some(ctx.load_texture("sheet-preview", image, egui::TextureOptions::LINEAR));
                        self.preview.sheets = sheets;
                        self.preview.error = None;
                    }
                    Err(e) => {
                        self.preview.texture = None;
                        self.preview.error = Some(e);
                    }
                }
                self.preview.key = Some(key);
            }
            ui.separator();
            match (&self.preview.texture, &self.preview.error) {
                (_, Some(e)) => {
                    ui.label(RichText::new(format!("⚠ {e}")).color(ui.visuals().warn_fg_color));
                }
                (Some(texture), None) => {
                    ui.label(format!("Preview of sheet 1 of {}", self.preview.sheets));
                    let size = texture.size_vec2();
                    let width = ui.available_width().min(700.0);
                    ui.add(
                        egui::Image::new(texture)
                            .fit_to_exact_size(egui::vec2(width, width * size.y / size.x.max(1.0))),
                    );
                }
                (None, None) => {}
            }
            ui.horizontal(|ui| {
                if ui.button("Export").clicked() {
                    export = true;
                }
                ui.label(
                    RichText::new(
                        "Every sheet carries the cautions: results must be checked by a licensed engineer.",
                    )
                    .weak(),
                );
            });
        });
        keep_settings(doc, queue, settings);
        if export {
            queue.push(Action::ExportSheet);
        }
        self.open = open;
    }
}
