//! Gradewright drawing: what to draw of a profile, decided once in a scene
//! tagged by role ([`scene`]), and the profile sheet built from it
//! ([`sheet`]) as SVG, rasterised to PNG and converted to PDF ([`render`]).
//!
//! No GUI dependency: the editor and the sheet only translate the scene.

pub mod place;
pub mod render;
pub mod scene;
pub mod sheet;

pub use place::{Placed, Placement, Rect, Spacing, place_labels};
pub use render::{RenderError, pdf, png, raster};
pub use scene::{
    Detail, Hatch, Label, Marker, Polyline, Role, Scene, Shape, Side, profile_scene, profile_scene_with,
};
pub use sheet::{
    CAUTION, Layout, SheetError, SheetOptions, SheetSize, SheetTree, TitleBlock, layout, sheet_svgs,
    sheet_trees,
};
