//! Undo and redo as whole-project snapshots (projects are small); a drag is
//! merged into one step by recording the project as it was when the drag
//! began. History is never saved to files.

use gradewright_geometry::Project;

/// How many steps are kept.
const LIMIT: usize = 500;

/// Undo and redo stacks.
#[derive(Clone, Debug, Default)]
pub struct History {
    undo: Vec<Project>,
    redo: Vec<Project>,
}

impl History {
    /// Records `before` as the state to return to, and forgets the redo stack.
    pub fn record(&mut self, before: Project) {
        if self.undo.last() == Some(&before) {
            return;
        }
        self.undo.push(before);
        if self.undo.len() > LIMIT {
            self.undo.remove(0);
        }
        self.redo.clear();
    }

    /// Steps back: returns the project to show, given the current one.
    pub fn undo(&mut self, current: Project) -> Option<Project> {
        let previous = self.undo.pop()?;
        self.redo.push(current);
        Some(previous)
    }

    /// Steps forward again.
    pub fn redo(&mut self, current: Project) -> Option<Project> {
        let next = self.redo.pop()?;
        self.undo.push(current);
        Some(next)
    }

    /// Whether there is anything to undo.
    pub fn can_undo(&self) -> bool {
        !self.undo.is_empty()
    }

    /// Whether there is anything to redo.
    pub fn can_redo(&self) -> bool {
        !self.redo.is_empty()
    }

    /// Forgets everything (a new or opened project).
    pub fn clear(&mut self) {
        self.undo.clear();
        self.redo.clear();
    }
}
