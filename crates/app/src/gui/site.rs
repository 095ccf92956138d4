//! The site in the editor: importing the existing ground and the control
//! points (menu, dialog or a file dropped on the window), each import one
//! undo step.

use std::path::{Path, PathBuf};

use gradewright_geometry::Ground;

use super::app::{GradewrightApp, Notice};
use super::command::{Action, Edit};

/// Whether the header of the CSV file at `path` (its first line that is
/// not a comment) names one of `columns`.
fn header_names(path: &Path, columns: &[&str]) -> bool {
    use std::io::Read as _;
    // The first line is enough: read no more than the start of the file.
    let mut bytes = Vec::new();
    if std::fs::File::open(path).and_then(|f| f.take(4096).read_to_end(&mut bytes)).is_err() {
        return false;
    }
    let head = String::from_utf8_lossy(&bytes).to_ascii_lowercase();
    head.lines().find(|l| !l.trim().is_empty() && !l.starts_with('#')).is_some_and(|l| {
        l.split([',', ';', '\t']).any(|cell| columns.contains(&cell.trim().trim_start_matches('\u{feff}')))
    })
}

/// What a dropped CSV file holds, by its header: control points when it
/// names a `kind` column.
fn is_controls_file(path: &Path) -> bool {
    header_names(path, &["kind"])
}

/// A PVI table, by its header: it names the curve lengths.
pub(super) fn is_pvi_table(path: &Path) -> bool {
    header_names(path, &["curve_length", "length_in", "length_out"])
}

/// Opens `path` and reads it with `read`; either error as one line.
fn read_table<T>(
    path: &Path,
    read: impl FnOnce(std::io::BufReader<std::fs::File>) -> Result<T, gradewright_exchange::ReadError>,
) -> Result<T, String> {
    let file = gradewright_exchange::open_file(path).map_err(|e| e.to_string())?;
    read(file).map_err(|e| e.to_string())
}

impl GradewrightApp {
    fn say(&mut self, error: bool, text: String) {
        self.notice = Some(Notice { error, text });
    }

    /// Replaces the ground by the CSV file at `path`, or by the ground line
    /// of a LandXML file (`.xml`, converted to the project's units), as one
    /// undo step; on failure the project is untouched and the error names
    /// file, line and field.
    pub fn import_ground(&mut self, path: &Path) -> bool {
        let (units, foot) = (self.project().units, self.project().foot);
        let read = if gradewright_exchange::is_landxml_path(path) {
            read_table(path, |f| {
                gradewright_exchange::read_landxml_ground(
                    f,
                    path,
                    &gradewright_exchange::Selection::default(),
                    units,
                    foot,
                )
                .map(|g| {
                    let notes = g.notes.into_iter().filter(|n| !n.contains("lengths in"));
                    let mut warnings: Vec<String> =
                        vec![format!("ground line '{}' of alignment '{}'", g.surface, g.alignment)];
                    warnings.extend(notes);
                    gradewright_exchange::GroundTable { points: g.points, warnings }
                })
            })
        } else {
            read_table(path, |f| gradewright_exchange::read_ground_csv(f, path, units))
        };
        match read {
            Ok(table) => {
                let count = table.points.len();
                let warnings = table.warnings.join("; ");
                let changed = self.apply_edit(Edit::SetGround(Ground::new(table.points)));
                let mut text = format!("Imported {count} ground point(s) from {}", path.display());
                if !changed {
                    text.push_str(" (the same ground as before)");
                }
                if !warnings.is_empty() {
                    text.push_str(&format!(" — {warnings}"));
                }
                self.say(false, text);
                true
            }
            Err(e) => {
                self.say(true, format!("Could not import the ground: {e}"));
                false
            }
        }
    }

    /// Replaces the control points by the CSV file at `path` (one undo step).
    pub fn import_controls(&mut self, path: &Path) -> bool {
        let units = self.project().units;
        let read = read_table(path, |f| gradewright_exchange::read_controls_csv(f, path, units));
        match read {
            Ok(points) => {
                let count = points.len();
                self.apply_edit(Edit::SetControls(points));
                self.say(false, format!("Imported {count} control point(s) from {}", path.display()));
                true
            }
            Err(e) => {
                self.say(true, format!("Could not import the control points: {e}"));
                false
            }
        }
    }

    /// Runs a site action (import by path or by dialog, a dropped file).
    pub(super) fn site_action(&mut self, action: Action) {
        let pick = |title: &str| -> Option<PathBuf> {
            rfd::FileDialog::new()
                .set_title(title)
                .add_filter("CSV table", &["csv", "txt"])
                .add_filter("LandXML ground line", &["xml"])
                .pick_file()
        };
        match action {
            Action::ImportGround(Some(path)) => {
                self.import_ground(&path);
            }
            Action::ExportLandXml(Some(path)) => {
                self.export_landxml(&path);
            }
            Action::ExportLandXml(None) => {
                let name = format!(
                    "{}.xml",
                    if self.project().name.is_empty() { "profile" } else { &self.project().name }
                );
                match rfd::FileDialog::new()
                    .add_filter("LandXML 1.2", &["xml"])
                    .set_file_name(name)
                    .save_file()
                {
                    Some(path) => {
                        self.export_landxml(&path);
                    }
                    None => self.say(false, "No file chosen".to_owned()),
                }
            }
            Action::ImportControls(Some(path)) => {
                self.import_controls(&path);
            }
            Action::ImportGround(None) => match pick("Import existing ground (station, elevation)") {
                Some(path) => {
                    self.import_ground(&path);
                }
                None => self.say(false, "No file chosen".to_owned()),
            },
            Action::ImportControls(None) => {
                match pick("Import control points (station, kind, elevation, tolerance, name)") {
                    Some(path) => {
                        self.import_controls(&path);
                    }
                    None => self.say(false, "No file chosen".to_owned()),
                }
            }
            Action::Dropped(path) => {
                let ext = path.extension().map(|e| e.to_string_lossy().to_ascii_lowercase());
                match ext.as_deref() {
                    Some("csv" | "txt") if is_pvi_table(&path) => self.push(Action::Open(Some(path))),
                    Some("csv" | "txt") if is_controls_file(&path) => {
                        self.import_controls(&path);
                    }
                    Some("csv" | "txt") => {
                        self.import_ground(&path);
                    }
                    Some("ron" | "xml") => self.push(Action::Open(Some(path))),
                    _ => self.say(
                        true,
                        format!(
                            "{}: drop a project (.ron), a LandXML file (.xml), a ground table or a control-points table (.csv)",
                            path.display()
                        ),
                    ),
                }
            }
            _ => {}
        }
    }

    /// Queues the files dropped on the window this frame.
    pub fn read_dropped_files(&mut self, ctx: &egui::Context) {
        let dropped: Vec<PathBuf> =
            ctx.input(|i| i.raw.dropped_files.iter().map(|f| f.path().to_path_buf()).collect());
        for path in dropped {
            self.push(Action::Dropped(path));
        }
    }
}
