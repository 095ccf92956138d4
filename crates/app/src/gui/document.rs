//! The document the editor works on: the project, the state it was last
//! saved in, the undo history, a revision counter and the one analysis of
//! it. It changes only by applying an [`Edit`] (a drag is a run of edits
//! that ends as one undo step), and the analysis is refreshed then, never
//! per frame.

use gradewright_document::Project;
use gradewright_geometry::{Analysis, VerticalCurve};

use super::command::Edit;
use super::history::History;

/// What a drag may change: both coordinates, or only one.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum DragLock {
    /// Station and elevation.
    Free,
    /// Elevation only: the station stays (Shift held).
    Vertical,
    /// Station only: the elevation stays (Ctrl held).
    Horizontal,
}

/// A PVI being dragged: which, and the project as it was when the drag
/// began (the drag's one undo step, and its lock's reference).
#[derive(Clone, Debug)]
pub struct Drag {
    /// The PVI.
    pub index: usize,
    origin: Project,
}

/// What applying an edit did.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Applied {
    /// Nothing changed (the edit left the project as it was).
    Unchanged,
    /// The project changed.
    Changed,
    /// The project changed, and this PVI is the one to select (an
    /// insertion, a deletion).
    Select(usize),
    /// The edit is refused, and why.
    Refused(&'static str),
}

/// The project being edited, its history and its analysis.
pub struct Document {
    project: Project,
    saved: Option<Project>,
    history: History,
    revision: u64,
    analysis: Analysis,
    drag: Option<Drag>,
    /// Whether the last edit renamed the project (typing a name is one step).
    renaming: bool,
    /// The increment Lengthen to clear and new curves round lengths up to.
    increment: f64,
}

impl Document {
    /// A document of `project`; `clean` says whether it counts as saved
    /// (opened or new) or holds work that still needs saving (recovered).
    pub fn new(project: Project, clean: bool) -> Self {
        let analysis = Analysis::of(&project.design());
        let increment = project.units.curve_length_increment();
        Self {
            saved: clean.then(|| project.clone()),
            project,
            history: History::default(),
            revision: 0,
            analysis,
            drag: None,
            renaming: false,
            increment,
        }
    }

    /// The project as it stands.
    pub fn project(&self) -> &Project {
        &self.project
    }

    /// The analysis of the project (alignment, curves, criteria, findings,
    /// sight distance), refreshed on every change.
    pub fn analysis(&self) -> &Analysis {
        &self.analysis
    }

    /// A counter that changes whenever the project does.
    pub fn revision(&self) -> u64 {
        self.revision
    }

    /// Whether there are changes not saved to a file.
    pub fn is_dirty(&self) -> bool {
        self.saved.as_ref() != Some(&self.project)
    }

    /// Whether there is something to undo or redo.
    pub fn can_undo_redo(&self) -> (bool, bool) {
        (self.history.can_undo(), self.history.can_redo())
    }

    /// The PVI being dragged, if any.
    pub fn dragging(&self) -> Option<usize> {
        self.drag.as_ref().map(|d| d.index)
    }

    /// The increment Lengthen to clear and new curves round lengths up to.
    pub fn increment(&self) -> f64 {
        self.increment
    }

    /// Sets the increment (not saved with the project).
    pub fn set_increment(&mut self, increment: f64) {
        if increment.is_finite() && increment > 0.0 {
            self.increment = increment;
        }
    }

    fn changed(&mut self) {
        self.revision += 1;
        self.analysis.refresh(&self.project.design());
    }

    /// Another project in the document (opened, new, recovered): the history
    /// starts afresh. `clean` as for [`Document::new`].
    pub fn replace(&mut self, project: Project, clean: bool) {
        self.increment = project.units.curve_length_increment();
        self.saved = clean.then(|| project.clone());
        self.project = project;
        self.history.clear();
        self.drag = None;
        self.renaming = false;
        self.changed();
    }

    /// The project as it stands is saved.
    pub fn mark_saved(&mut self) {
        self.saved = Some(self.project.clone());
    }

    /// Applies an edit as one undo step.
    pub fn apply(&mut self, edit: Edit) -> Applied {
        let before = self.project.clone();
        let renaming = matches!(edit, Edit::SetName(_));
        let mut select = None;
        let pvis = &mut self.project.pvis;
        match edit {
            Edit::SetPvi { index, pvi } => match pvis.get_mut(index) {
                Some(slot) => *slot = pvi,
                None => return Applied::Unchanged,
            },
            Edit::Insert { index, pvi } => {
                if index > pvis.len() {
                    return Applied::Unchanged;
                }
                pvis.insert(index, pvi);
                select = Some(index);
            }
            Edit::Delete { index } => {
                if pvis.len() <= 2 || index >= pvis.len() {
                    return Applied::Refused("A profile keeps at least two PVIs");
                }
                pvis.remove(index);
                // The new first/last PVI carries no curve.
                let last = pvis.len() - 1;
                for end in [0, last] {
                    if let Some(p) = pvis.get_mut(end) {
                        p.curve = VerticalCurve::None;
                    }
                }
                select = Some(index.min(last));
            }
            Edit::SetCriteria(criteria) => self.project.criteria = *criteria,
            Edit::SetName(name) => self.project.name = name,
            Edit::SetGround(ground) => self.project.ground = ground,
            Edit::SetControls(controls) => self.project.controls = controls,
            Edit::SetEquations(equations) => self.project.equations = equations,
            Edit::SetRanges(ranges) => self.project.criteria_ranges = ranges,
            Edit::SetSection(section) => self.project.section = section,
            Edit::SetSnap(snap) => self.project.snap = snap,
            Edit::SetExport(export) => self.project.export = *export,
            Edit::Replace(project) => self.project = *project,
        }
        if self.project == before {
            return Applied::Unchanged;
        }
        // Typing a name letter by letter is one undo step.
        if !(renaming && self.renaming) {
            self.history.record(before);
        }
        self.renaming = renaming;
        self.changed();
        select.map_or(Applied::Changed, Applied::Select)
    }

    /// Steps back one edit. Returns whether anything changed.
    pub fn undo(&mut self) -> bool {
        self.renaming = false;
        match self.history.undo(self.project.clone()) {
            Some(p) => {
                self.project = p;
                self.changed();
                true
            }
            None => false,
        }
    }

    /// Steps forward again. Returns whether anything changed.
    pub fn redo(&mut self) -> bool {
        self.renaming = false;
        match self.history.redo(self.project.clone()) {
            Some(p) => {
                self.project = p;
                self.changed();
                true
            }
            None => false,
        }
    }

    /// Starts dragging PVI `index` (the whole drag becomes one undo step).
    pub fn begin_drag(&mut self, index: usize) {
        self.renaming = false;
        match &mut self.drag {
            Some(drag) => drag.index = index,
            None => self.drag = Some(Drag { index, origin: self.project.clone() }),
        }
    }

    /// Moves the dragged PVI towards a point (snapped as the project says),
    /// within its limits, keeping the station (vertical lock) or the
    /// elevation (horizontal lock) it had when the drag began. Returns
    /// whether it moved.
    pub fn drag_to(&mut self, index: usize, station: f64, elevation: f64, lock: DragLock) -> bool {
        let (mut station, mut elevation) = self.project.snap.apply(station, elevation);
        if let Some(origin) = self.drag.as_ref().and_then(|d| d.origin.pvis.get(index)) {
            match lock {
                DragLock::Free => {}
                DragLock::Vertical => station = origin.station.0,
                DragLock::Horizontal => elevation = origin.elevation,
            }
        }
        let Some(pvi) = self.analysis.profile.move_pvi_clamped(index, station, elevation) else {
            return false;
        };
        match self.project.pvis.get_mut(index) {
            Some(slot) if *slot != pvi => {
                *slot = pvi;
                self.changed();
                true
            }
            _ => false,
        }
    }

    /// Ends a drag: records one undo step if anything moved.
    pub fn end_drag(&mut self) {
        if let Some(drag) = self.drag.take()
            && drag.origin != self.project
        {
            self.history.record(drag.origin);
        }
    }
}
