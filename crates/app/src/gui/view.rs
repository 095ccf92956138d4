//! Runtime-only view state: never saved in the project file.

use std::collections::HashMap;

use egui_plot::PlotTransform;
use gradewright_document::Project;

/// What the plot should show on the next frame.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum ViewRequest {
    /// The whole profile.
    Fit,
    /// A station range and elevation range.
    Range {
        /// Stations.
        x: (f64, f64),
        /// Elevations.
        y: (f64, f64),
    },
}

/// A text cell being edited: its text, and why it was refused if it was.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct CellBuffer {
    /// What the user typed.
    pub text: String,
    /// Why the text was refused.
    pub error: Option<String>,
}

/// Which text cell.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
pub enum CellId {
    /// A PVI table cell: row and column.
    Pvi(usize, PviColumn),
    /// The design speed.
    DesignSpeed,
    /// A criterion value.
    Criterion(gradewright_geometry::CriterionId),
    /// The station snap increment.
    SnapStation,
    /// The elevation snap increment.
    SnapElevation,
    /// A control-point table cell: row and column.
    Control(usize, ControlColumn),
    /// An earthwork section value.
    Section(SectionField),
}

/// Which page the side panel shows under the findings.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
pub enum SidePage {
    /// The design criteria.
    #[default]
    Criteria,
    /// The control points, the ground and the earthwork.
    Site,
}

/// Editable columns of the control-point table.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
pub enum ControlColumn {
    /// Name.
    Name,
    /// Station.
    Station,
    /// Elevation.
    Elevation,
    /// Tolerance of a fixed point.
    Tolerance,
    /// Clearance of a maximum point under a structure.
    Clearance,
}

/// Editable values of the earthwork section.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
pub enum SectionField {
    /// Roadway width.
    Width,
    /// Cut slope.
    CutSlope,
    /// Fill slope.
    FillSlope,
    /// Shrinkage percent.
    Shrinkage,
}

/// Editable columns of the PVI table.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
pub enum PviColumn {
    /// Station.
    Station,
    /// Elevation.
    Elevation,
    /// Total curve length.
    Length,
    /// Length before the PVI.
    LengthIn,
    /// Length after the PVI.
    LengthOut,
    /// Grade from the previous PVI (typed: moves this PVI's elevation).
    GradeBack,
    /// Grade to the next PVI (typed: moves the next PVI's elevation).
    GradeAhead,
    /// K (typed: sets the curve length to K·A).
    K,
}

/// View state of the editor.
#[derive(Clone, Debug)]
pub struct ViewState {
    /// Selected PVI.
    pub selected: Option<usize>,
    /// Vertical exaggeration of the plot (10 = 10:1).
    pub exaggeration: f32,
    /// About & cautions window open.
    pub show_about: bool,
    /// Pending change of the plot view.
    pub view_request: Option<ViewRequest>,
    /// Cells being edited.
    pub cells: HashMap<CellId, CellBuffer>,
    /// Last frame's plot transform (for hit-testing before the plot is shown).
    pub last_transform: Option<PlotTransform>,
    /// PVI being dragged in the plot.
    pub dragging: Option<usize>,
    /// Plot station where the context menu was opened.
    pub context_station: Option<f64>,
    /// Path typed in the path dialog (works without a file dialog).
    pub path_text: String,
    /// Whether the path dialog is open.
    pub show_path_dialog: bool,
    /// A PVI table being opened, waiting for the user to say its units.
    pub pvi_table_units: Option<std::path::PathBuf>,
    /// A LandXML file holding several design profiles or ground lines, and
    /// the choices it offers (the chooser window is open while set).
    pub landxml_choice: Option<(std::path::PathBuf, Vec<gradewright_exchange::Selection>)>,
    /// Whether the sight-distance strip is shown under the profile.
    pub show_sight_strip: bool,
    /// "Lengthen to clear" rounds lengths up to this increment.
    pub lengthen_increment: f64,
    /// A table row to scroll into view on the next frame.
    pub scroll_to_row: Option<usize>,
    /// A table scroll offset to apply on the next frame.
    pub table_scroll: Option<f32>,
    /// The project revision the plot last checked is in view.
    pub checked_revision: u64,
    /// Whether the table shows the PVC, PVT and high/low point columns.
    pub show_curve_points: bool,
    /// Whether the export window is open.
    pub show_export: bool,
    /// Whether the tables-only export window is open.
    pub show_tables_export: bool,
    /// The export window's preview.
    pub preview: super::export_ui::Preview,
    /// What the plot drew last frame (reused while nothing changed).
    pub plot_scene: Option<super::plot_ui::PlotScene>,
    /// Elevation under the pointer when the plot's context menu opened.
    pub context_elevation: Option<f64>,
    /// Whether the mass-haul strip is shown under the profile.
    pub show_mass_strip: bool,
    /// The side panel's page.
    pub side_page: SidePage,
}

impl Default for ViewState {
    fn default() -> Self {
        Self {
            selected: None,
            exaggeration: 10.0,
            show_about: false,
            view_request: None,
            cells: HashMap::new(),
            last_transform: None,
            dragging: None,
            context_station: None,
            path_text: String::new(),
            show_path_dialog: false,
            landxml_choice: None,
            pvi_table_units: None,
            show_sight_strip: true,
            lengthen_increment: 5.0,
            scroll_to_row: None,
            table_scroll: None,
            checked_revision: 0,
            show_curve_points: true,
            show_export: false,
            show_tables_export: false,
            preview: super::export_ui::Preview::default(),
            plot_scene: None,
            context_elevation: None,
            show_mass_strip: true,
            side_page: SidePage::Criteria,
        }
    }
}

impl ViewState {
    /// Shows the whole profile on the next frame.
    pub fn request_fit(&mut self) {
        self.view_request = Some(ViewRequest::Fit);
    }

    /// Brings PVI `index` and its curve into view on the next frame.
    pub fn request_focus(
        &mut self,
        project: &Project,
        analysis: &gradewright_geometry::Analysis,
        index: usize,
    ) {
        let Some(pvi) = project.pvis.get(index) else { return };
        self.scroll_to_row = Some(index);
        let curve = analysis.curves.iter().find(|c| c.index == index);
        let (mut x0, mut x1) = match curve {
            Some(c) if c.length() > 0.0 => (c.pvc.0, c.pvt.0),
            _ => (pvi.station.0, pvi.station.0),
        };
        let span = (x1 - x0).max(project.units.station_length() * 0.1);
        x0 -= span;
        x1 += span;
        let ys: Vec<f64> = project
            .pvis
            .iter()
            .filter(|p| p.station.0 >= x0 && p.station.0 <= x1)
            .map(|p| p.elevation)
            .chain(std::iter::once(pvi.elevation))
            .collect();
        let y0 = ys.iter().copied().fold(f64::INFINITY, f64::min);
        let y1 = ys.iter().copied().fold(f64::NEG_INFINITY, f64::max);
        self.view_request = Some(ViewRequest::Range { x: (x0, x1), y: (y0 - 2.0, y1 + 2.0) });
    }

    /// Forgets everything tied to the old project.
    pub fn reset_for_new_project(&mut self) {
        self.selected = None;
        self.cells.clear();
        self.dragging = None;
        self.request_fit();
    }
}
