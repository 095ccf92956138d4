//! File, Export sheet and tables…: the choices (saved with the project), a
//! live preview of the very sheet that will be written, and the export.

use std::path::PathBuf;

use egui::RichText;
use gradewright_document::ExportSettings;

use super::app::{GradewrightApp, Notice};
use super::command::{Action, Edit};

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

impl GradewrightApp {
    /// Where the export goes: the settings' path, else beside the project file.
    pub fn export_base(&self) -> PathBuf {
        let settings = &self.project().export;
        if !settings.path.trim().is_empty() {
            return PathBuf::from(settings.path.trim());
        }
        match self.path() {
            Some(p) => p.with_extension(""),
            None => std::env::current_dir().unwrap_or_default().join("profile"),
        }
    }

    /// Where File, Export tables… writes: the settings' folder, else
    /// `NAME-tables` beside the project file.
    pub fn tables_dir(&self) -> PathBuf {
        let settings = &self.project().export;
        if !settings.tables_path.trim().is_empty() {
            return PathBuf::from(settings.tables_path.trim());
        }
        let mut dir = self.export_base().into_os_string();
        dir.push("-tables");
        PathBuf::from(dir)
    }

    /// Writes only the tables (stations, curves, findings) to
    /// [`GradewrightApp::tables_dir`]; the outcome is shown in the status line.
    pub fn export_tables_now(&mut self) -> bool {
        let dir = self.tables_dir();
        let mut request = request(&self.project().export, &dir);
        (request.png, request.svg, request.pdf) = (None, None, None);
        request.csv_dir = Some(dir.clone());
        self.write_export(&request, &dir)
    }

    /// Exports as the settings say; the outcome is shown in the status line.
    pub fn export_now(&mut self) -> bool {
        let base = self.export_base();
        let request = request(&self.project().export, &base);
        self.write_export(&request, &base)
    }

    fn write_export(&mut self, request: &crate::export::Request, base: &std::path::Path) -> bool {
        let result = crate::export::plan(request).and_then(|plan| {
            let analysis = self.analysis();
            if let Some(problem) = analysis.problems.first() {
                anyhow::bail!("the profile has problems to fix first: {problem}");
            }
            let files = crate::export::render(&plan, request, analysis, self.project())?;
            crate::export::write_all(&files)?;
            Ok(files.len())
        });
        match result {
            Ok(n) => {
                self.notice = Some(Notice {
                    error: false,
                    text: format!("Exported {n} file(s) to {}", base.display()),
                });
                true
            }
            Err(e) => {
                self.notice = Some(Notice { error: true, text: format!("Export failed: {e:#}") });
                false
            }
        }
    }
}

/// Keeps changed export choices with the project (one undoable edit).
fn keep_settings(app: &mut GradewrightApp, settings: ExportSettings) {
    if settings != app.project().export {
        let mut project = app.project().clone();
        project.export = settings;
        app.push(Action::edit(Edit::Replace(Box::new(project))));
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

/// File, Export tables…: the three hand-over tables on their own.
pub fn tables_ui(app: &mut GradewrightApp, ctx: &egui::Context) {
    let mut open = app.view.show_tables_export;
    if !open {
        return;
    }
    let mut settings = app.project().export.clone();
    let mut export = false;
    egui::Window::new("Export tables").open(&mut open).default_width(560.0).show(ctx, |ui| {
        ui.label("Three CSV files (RFC 4180, units in the column names) that open in a spreadsheet:");
        ui.label("  stations.csv — station, elevation and grade at the interval and at every PVC, PVI, PVT");
        ui.label("  curves.csv — every PVI and its curve: grades, L, A, K, minimum K, required L, status");
        ui.label("  findings.csv — every check result: severity, code, stations, message");
        egui::Grid::new("tables-grid").num_columns(2).spacing([8.0, 4.0]).show(ui, |ui| {
            interval_ui(ui, &mut settings, app.project().units);
            let default = app.tables_dir();
            path_ui(
                ui,
                "Folder",
                &mut settings.tables_path,
                &default,
                "Made if it does not exist (its parent must)",
            );
        });
        ui.horizontal(|ui| {
            if ui.button("Write tables").clicked() {
                export = true;
            }
            ui.label(
                RichText::new("Results must be checked by a licensed engineer; local codes govern.").weak(),
            );
        });
    });
    keep_settings(app, settings);
    if export {
        app.export_tables_now();
    }
    app.view.show_tables_export = open;
}

/// The export window.
#[allow(clippy::too_many_lines)]
pub fn export_ui(app: &mut GradewrightApp, ctx: &egui::Context) {
    let mut open = app.view.show_export;
    if !open {
        return;
    }
    let mut settings = app.project().export.clone();
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
            let units = app.project().units;
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
                let _ = ui.add(egui::TextEdit::singleline(value).desired_width(260.0)).labelled_by(name.id);
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
            let default = app.export_base();
            path_ui(
                ui,
                "Write to",
                &mut settings.path,
                &default,
                "Each format adds its extension; the tables go in NAME-tables/",
            );
        });
        // The preview: sheet 1, drawn from the same SVG the export writes.
        let key = (app.revision(), format!("{settings:?}"));
        if app.view.preview.key.as_ref() != Some(&key) {
            let analysis = app.analysis();
            let req = request(&settings, &app.export_base());
            let drawn = crate::export::plan(&req).and_then(|plan| {
                let options = crate::export::sheet_options(&plan, &req, app.project());
                let svgs = gradewright_draw::sheet_svgs(analysis, &options)?;
                let first = svgs.first().ok_or_else(|| anyhow::anyhow!("no sheet"))?;
                let (w, h, pixels) = gradewright_draw::raster(first, 40.0)?;
                Ok((svgs.len(), w, h, pixels))
            });
            match drawn {
                Ok((sheets, w, h, pixels)) => {
                    #[allow(clippy::cast_possible_truncation)]
                    let image = egui::ColorImage::from_rgba_premultiplied([w as usize, h as usize], &pixels);
                    app.view.preview.texture =
                        Some(ctx.load_texture("sheet-preview", image, egui::TextureOptions::LINEAR));
                    app.view.preview.sheets = sheets;
                    app.view.preview.error = None;
                }
                Err(e) => {
                    app.view.preview.texture = None;
                    app.view.preview.error = Some(format!("{e:#}"));
                }
            }
            app.view.preview.key = Some(key);
        }
        ui.separator();
        match (&app.view.preview.texture, &app.view.preview.error) {
            (_, Some(e)) => {
                ui.label(RichText::new(format!("⚠ {e}")).color(ui.visuals().warn_fg_color));
            }
            (Some(texture), None) => {
                ui.label(format!("Preview of sheet 1 of {}", app.view.preview.sheets));
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
    keep_settings(app, settings);
    if export {
        app.export_now();
    }
    app.view.show_export = open;
}
