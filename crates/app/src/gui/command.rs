//! Everything the user can do, as values: collected during the UI pass and
//! applied in one place afterwards. One list of commands feeds the menus and
//! the keyboard shortcuts.

use std::path::PathBuf;

use egui::{Key, KeyboardShortcut, Modifiers};
use gradewright_document::{ExportSettings, Project, Snap};
use gradewright_geometry::{ControlPoint, Criteria, Ground, Pvi, Section, Units};

/// A change to the project. Every edit is one undo step.
#[derive(Clone, Debug, PartialEq)]
pub enum Edit {
    /// Replace PVI `index`.
    SetPvi {
        /// Which PVI.
        index: usize,
        /// Its new value.
        pvi: Pvi,
    },
    /// Insert a PVI before position `index`.
    Insert {
        /// Where it goes.
        index: usize,
        /// The new PVI.
        pvi: Pvi,
    },
    /// Delete PVI `index` (refused when only two are left).
    Delete {
        /// Which PVI.
        index: usize,
    },
    /// Replace the criteria.
    SetCriteria(Box<Criteria>),
    /// Rename the project.
    SetName(String),
    /// Replace the existing ground (an import).
    SetGround(Ground),
    /// Replace the control points.
    SetControls(Vec<ControlPoint>),
    /// Replace the station equations.
    SetEquations(gradewright_geometry::Equations),
    /// Replace the criteria ranges.
    SetRanges(Vec<gradewright_geometry::CriteriaRange>),
    /// Set or clear the earthwork section.
    SetSection(Option<Section>),
    /// Change how PVIs snap (kept with the project).
    SetSnap(Snap),
    /// Change the export choices (kept with the project).
    SetExport(Box<ExportSettings>),
    /// Replace the whole project (keeps undo).
    Replace(Box<Project>),
}

impl Action {
    /// An edit as an action.
    pub fn edit(edit: Edit) -> Self {
        Self::Edit(Box::new(edit))
    }
}

/// An action of the application.
#[derive(Clone, Debug, PartialEq)]
pub enum Action {
    /// Apply an edit.
    Edit(Box<Edit>),
    /// Start a new empty project.
    New(Units),
    /// Open a file (`None`: ask with a dialog).
    Open(Option<PathBuf>),
    /// Import an existing-ground CSV or LandXML ground line (`None`: ask
    /// with a dialog).
    ImportGround(Option<PathBuf>),
    /// Import the ground line a selection picks from a LandXML file
    /// holding several.
    ImportGroundFrom(PathBuf, gradewright_exchange::Selection),
    /// Import a control-points CSV (`None`: ask with a dialog).
    ImportControls(Option<PathBuf>),
    /// Open the design profile (and ground line) a selection picks from a
    /// LandXML file holding several.
    OpenLandXml(PathBuf, gradewright_exchange::Selection),
    /// Open a PVI table (CSV) in the units the user chose.
    OpenPviTable(PathBuf, Units),
    /// Export the design profile and the ground as LandXML (`None`: ask with a dialog).
    ExportLandXml(Option<PathBuf>),
    /// Write the sheet and tables as the export choices say.
    ExportSheet,
    /// Write only the hand-over tables.
    ExportTables,
    /// Open the export window.
    ShowExport,
    /// Open the tables-only export window.
    ShowTablesExport,
    /// Open the window that opens or saves by a typed path.
    ShowPathDialog,
    /// A file dropped on the window: open or import it by what it holds.
    Dropped(PathBuf),
    /// Save to the current file (asks for one if there is none).
    Save,
    /// Save to another file (`None`: ask with a dialog).
    SaveAs(Option<PathBuf>),
    /// Undo the last edit.
    Undo,
    /// Redo.
    Redo,
    /// Fit the view to the whole profile.
    FitView,
    /// Select a PVI and bring its curve into view.
    Focus(usize),
    /// Select a PVI (or none); the view stays as it is.
    Select(Option<usize>),
    /// Bring the selected PVI and its curve into view.
    ZoomToSelection,
    /// Make the unequal-tangent curve at a PVI symmetric, keeping its length.
    MakeSymmetric(usize),
    /// Delete the selected PVI.
    DeleteSelected,
    /// Insert a PVI in the middle of the tangent after the selected PVI.
    InsertAfterSelected,
    /// Insert a PVI on the profile at a station (refused on a curve).
    InsertAt(f64),
    /// Add a minimum control point at a station, at an elevation (or on
    /// the profile).
    AddControl {
        /// Where.
        station: f64,
        /// The elevation, when not the profile's.
        elevation: Option<f64>,
    },
    /// Select the previous PVI.
    SelectPrevious,
    /// Select the next PVI.
    SelectNext,
    /// Lengthen the selected curve to clear every criterion.
    LengthenSelected,
    /// Lengthen every failing curve to clear every criterion.
    LengthenAll,
    /// Show or hide the About & cautions window.
    ToggleAbout,
    /// Close the window.
    Quit,
}

/// A command that has a menu entry and a shortcut.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum UiCommand {
    /// New metric project.
    NewMetric,
    /// New US customary project.
    NewUs,
    /// Open…
    Open,
    /// Save.
    Save,
    /// Save As…
    SaveAs,
    /// Undo.
    Undo,
    /// Redo.
    Redo,
    /// Delete PVI.
    Delete,
    /// Insert PVI.
    Insert,
    /// Previous PVI.
    Previous,
    /// Next PVI.
    Next,
    /// Fit to profile.
    Fit,
    /// Zoom to the selected PVI.
    ZoomToSelection,
    /// Lengthen selected curve to clear.
    LengthenSelected,
    /// Lengthen all failing curves.
    LengthenAll,
    /// About & cautions.
    About,
    /// Quit.
    Quit,
}

impl UiCommand {
    /// Every command, in menu order.
    pub const ALL: [Self; 17] = [
        Self::NewMetric,
        Self::NewUs,
        Self::Open,
        Self::Save,
        Self::SaveAs,
        Self::Undo,
        Self::Redo,
        Self::Delete,
        Self::Insert,
        Self::Previous,
        Self::Next,
        Self::Fit,
        Self::ZoomToSelection,
        Self::LengthenSelected,
        Self::LengthenAll,
        Self::About,
        Self::Quit,
    ];

    /// Menu text.
    pub fn label(self) -> &'static str {
        match self {
            Self::NewMetric => "New metric project",
            Self::NewUs => "New US customary project",
            Self::Open => "Open…",
            Self::Save => "Save",
            Self::SaveAs => "Save As…",
            Self::Undo => "Undo",
            Self::Redo => "Redo",
            Self::Delete => "Delete selected PVI",
            Self::Insert => "Insert PVI after selected",
            Self::Previous => "Select previous PVI",
            Self::Next => "Select next PVI",
            Self::Fit => "Fit to profile",
            Self::ZoomToSelection => "Zoom to selection",
            Self::LengthenSelected => "Lengthen selected curve to clear",
            Self::LengthenAll => "Lengthen all failing curves to clear",
            Self::About => "About & cautions",
            Self::Quit => "Quit",
        }
    }

    /// Keyboard shortcut, if any.
    pub fn shortcut(self) -> Option<KeyboardShortcut> {
        let cmd = Modifiers::COMMAND;
        let shortcut = |m, k| Some(KeyboardShortcut::new(m, k));
        match self {
            Self::NewMetric => shortcut(cmd, Key::N),
            Self::NewUs => None,
            Self::Open => shortcut(cmd, Key::O),
            Self::Save => shortcut(cmd, Key::S),
            Self::SaveAs => shortcut(cmd | Modifiers::SHIFT, Key::S),
            Self::Undo => shortcut(cmd, Key::Z),
            Self::Redo => shortcut(cmd | Modifiers::SHIFT, Key::Z),
            Self::Delete => shortcut(Modifiers::NONE, Key::Delete),
            Self::Insert => shortcut(Modifiers::NONE, Key::Insert),
            Self::Previous => shortcut(Modifiers::NONE, Key::PageUp),
            Self::Next => shortcut(Modifiers::NONE, Key::PageDown),
            Self::Fit => shortcut(Modifiers::NONE, Key::F),
            Self::ZoomToSelection => shortcut(Modifiers::NONE, Key::Z),
            Self::LengthenSelected => shortcut(Modifiers::NONE, Key::L),
            Self::LengthenAll => shortcut(Modifiers::SHIFT, Key::L),
            Self::About => shortcut(Modifiers::NONE, Key::F1),
            Self::Quit => shortcut(cmd, Key::Q),
        }
    }

    /// Whether the shortcut needs the keyboard free of text fields (keys
    /// without Ctrl, which typing would trigger).
    pub fn is_plain_key(self) -> bool {
        self.shortcut().is_some_and(|s| !s.modifiers.command && !s.modifiers.ctrl)
    }

    /// The action it stands for.
    pub fn action(self) -> Action {
        match self {
            Self::NewMetric => Action::New(Units::Metric),
            Self::NewUs => Action::New(Units::UsCustomary),
            Self::Open => Action::Open(None),
            Self::Save => Action::Save,
            Self::SaveAs => Action::SaveAs(None),
            Self::Undo => Action::Undo,
            Self::Redo => Action::Redo,
            Self::Delete => Action::DeleteSelected,
            Self::Insert => Action::InsertAfterSelected,
            Self::Previous => Action::SelectPrevious,
            Self::Next => Action::SelectNext,
            Self::Fit => Action::FitView,
            Self::ZoomToSelection => Action::ZoomToSelection,
            Self::LengthenSelected => Action::LengthenSelected,
            Self::LengthenAll => Action::LengthenAll,
            Self::About => Action::ToggleAbout,
            Self::Quit => Action::Quit,
        }
    }
}

/// Ctrl+Y also redoes (a second shortcut for the same command).
pub const REDO_ALT: KeyboardShortcut = KeyboardShortcut::new(Modifiers::COMMAND, Key::Y);
