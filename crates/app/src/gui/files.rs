//! The editor's files: the file the project was opened from or saved to,
//! and the app's own files — the recent-files list and the recovery file
//! written by autosave.

use std::path::{Path, PathBuf};

use gradewright_document::{Project, write_atomic};

/// How often unsaved work is written to the recovery file, seconds.
const AUTOSAVE_SECONDS: f64 = 30.0;

/// How many recent files are remembered.
const RECENT_LIMIT: usize = 8;

/// The app's own folder: `$GRADEWRIGHT_CONFIG_DIR`, else
/// `$XDG_CONFIG_HOME/gradewright`, else `~/.config/gradewright`.
pub fn default_config_dir() -> Option<PathBuf> {
    if let Some(dir) = std::env::var_os("GRADEWRIGHT_CONFIG_DIR") {
        return Some(PathBuf::from(dir));
    }
    if let Some(dir) = std::env::var_os("XDG_CONFIG_HOME").filter(|d| !d.is_empty()) {
        return Some(PathBuf::from(dir).join("gradewright"));
    }
    std::env::var_os("HOME").map(|home| PathBuf::from(home).join(".config").join("gradewright"))
}

/// The app's files in one folder (or none at all, when there is no folder).
#[derive(Clone, Debug, Default)]
pub struct AppFiles {
    dir: Option<PathBuf>,
}

impl AppFiles {
    /// Files kept in `dir` (`None`: keep nothing).
    pub fn new(dir: Option<PathBuf>) -> Self {
        Self { dir }
    }

    fn path(&self, name: &str) -> Option<PathBuf> {
        self.dir.as_ref().map(|d| d.join(name))
    }

    /// The recovery file autosave writes.
    pub fn recovery_path(&self) -> Option<PathBuf> {
        self.path("recovery.ron")
    }

    /// Reads the recent-files list (missing or unreadable: empty).
    pub fn recent(&self) -> Vec<PathBuf> {
        let Some(path) = self.path("recent.txt") else { return Vec::new() };
        std::fs::read_to_string(path)
            .map(|t| t.lines().filter(|l| !l.trim().is_empty()).map(PathBuf::from).collect())
            .unwrap_or_default()
    }

    /// Puts `file` first in the recent-files list.
    ///
    /// # Errors
    /// A message when the list cannot be written.
    pub fn add_recent(&self, file: &Path) -> Result<Vec<PathBuf>, String> {
        let mut list = self.recent();
        let file = std::fs::canonicalize(file).unwrap_or_else(|_| file.to_owned());
        list.retain(|p| p != &file);
        list.insert(0, file);
        list.truncate(RECENT_LIMIT);
        if let Some(path) = self.path("recent.txt") {
            self.ensure_dir()?;
            let text: String = list.iter().map(|p| format!("{}\n", p.display())).collect();
            write_atomic(&path, text.as_bytes(), false).map_err(|e| e.to_string())?;
        }
        Ok(list)
    }

    fn ensure_dir(&self) -> Result<(), String> {
        match &self.dir {
            Some(d) => std::fs::create_dir_all(d).map_err(|e| format!("{}: {e}", d.display())),
            None => Ok(()),
        }
    }

    /// Writes the recovery file (atomically).
    ///
    /// # Errors
    /// A message naming the file.
    pub fn write_recovery(&self, project: &Project) -> Result<(), String> {
        let Some(path) = self.recovery_path() else { return Ok(()) };
        self.ensure_dir()?;
        let text = project.to_ron().map_err(|e| e.to_string())?;
        write_atomic(&path, text.as_bytes(), false).map_err(|e| e.to_string())
    }

    /// Reads the recovery file if there is one that loads.
    pub fn read_recovery(&self) -> Option<Project> {
        let path = self.recovery_path()?;
        if !path.exists() {
            return None;
        }
        Project::load(&path).ok()
    }

    /// Removes the recovery file (after a save, or when the user discards it).
    pub fn clear_recovery(&self) {
        if let Some(path) = self.recovery_path() {
            let _ = std::fs::remove_file(path);
        }
    }
}

/// The files of one editing session: where the project lives, the recent
/// files, and when unsaved work was last written to the recovery file.
#[derive(Debug, Default)]
pub struct Session {
    /// The app's own files.
    pub files: AppFiles,
    path: Option<PathBuf>,
    recent: Vec<PathBuf>,
    last_autosave: Option<f64>,
}

impl Session {
    /// A session keeping its own files in `files`, on the project at `path`.
    pub fn new(files: AppFiles, path: Option<PathBuf>) -> Self {
        let recent = files.recent();
        Self { files, path, recent, last_autosave: None }
    }

    /// The file the project was last opened from or saved to.
    pub fn path(&self) -> Option<&Path> {
        self.path.as_deref()
    }

    /// The project now lives at `path` (or nowhere yet).
    pub fn set_path(&mut self, path: Option<PathBuf>) {
        self.path = path;
    }

    /// Recent files, newest first.
    pub fn recent(&self) -> &[PathBuf] {
        &self.recent
    }

    /// Puts `path` first in the recent files (kept if the list cannot be
    /// written).
    pub fn note_recent(&mut self, path: &Path) {
        if let Ok(list) = self.files.add_recent(path) {
            self.recent = list;
        }
    }

    /// Whether the autosave interval has passed at `now` (seconds since
    /// start); when it has, the clock restarts.
    pub fn autosave_due(&mut self, now: f64) -> bool {
        let due = self.last_autosave.is_none_or(|t| now - t >= AUTOSAVE_SECONDS);
        if due {
            self.last_autosave = Some(now);
        }
        due
    }
}
