//! Undo and redo as whole-project snapshots (projects are small); a drag is
//! merged into one step by recording the project as it was when the drag
//! began. History is never saved to files.

use std::collections::VecDeque;

use gradewright_document::Project;

/// How many steps are kept.
const LIMIT: usize = 500;

/// Undo and redo stacks.
#[derive(Clone, Debug, Default)]
pub struct History {
    /// Oldest first; the oldest is dropped from the front when full.
    undo: VecDeque<Project>,
    redo: Vec<Project>,
}

impl History {
    /// Records `before` as the state to return to, and forgets the redo stack.
    pub fn record(&mut self, before: Project) {
        if self.undo.back() == Some(&before) {
            return;
        }
        self.undo.push_back(before);
        while self.undo.len() > LIMIT {
            self.undo.pop_front();
        }
        self.redo.clear();
    }

    /// Steps back: returns the project to show, given the current one.
    pub fn undo(&mut self, current: Project) -> Option<Project> {
        let previous = self.undo.pop_back()?;
        self.redo.push(current);
        Some(previous)
    }

    /// Steps forward again.
    pub fn redo(&mut self, current: Project) -> Option<Project> {
        let next = self.redo.pop()?;
        self.undo.push_back(current);
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

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn keeps_the_newest_steps_when_full() {
        let mut history = History::default();
        for i in 0..(LIMIT + 25) {
            history.record(Project::new(format!("step {i}"), gradewright_geometry::Units::Metric));
        }
        assert_eq!(history.undo.len(), LIMIT);
        assert_eq!(history.undo.front().map(|p| p.name.clone()), Some("step 25".to_owned()));
        let current = Project::new("now", gradewright_geometry::Units::Metric);
        let back = history.undo(current).map(|p| p.name);
        assert_eq!(back, Some(format!("step {}", LIMIT + 24)));
    }
}
