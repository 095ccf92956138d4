//! LandXML 1.2 (the open standard, namespace [`NAMESPACE`]): a design
//! profile as `Alignments/Alignment/Profile/ProfAlign` with `PVI`,
//! `ParaCurve` and `UnsymParaCurve`, and the existing ground as `ProfSurf`
//! (`PntList2D`).
//!
//! A project read from a LandXML file keeps the file's text
//! ([`gradewright_document::Kept`]); writing it as LandXML again writes that
//! text back with only what Gradewright edits replaced (the design
//! profile's elements, the ground line's points, the design speed), so the
//! plan geometry, station equations, features, other profiles and
//! everything else in the file survive.
//!
//! Stations are internal stations (the alignment's `staStart` plus the
//! distance along it, no station equations applied), written as plain
//! decimals in the file's linear unit. Element and attribute names are the
//! schema's own (LandXML-1.2.xsd, kept in the repository's test data).

mod keep;
mod parse;
mod pick;
mod read;
mod text;
mod write;

pub use read::{
    Choice, LandXmlGround, LandXmlProfile, Selection, landxml_choices, read_landxml, read_landxml_ground,
};
pub use write::{Stamp, write_landxml};

/// The LandXML 1.2 namespace.
pub const NAMESPACE: &str = "http://www.landxml.org/schema/LandXML-1.2";

/// Whether `path` names a LandXML file (extension `.xml` or `.landxml`).
pub fn is_landxml_path(path: &std::path::Path) -> bool {
    path.extension().is_some_and(|e| e.eq_ignore_ascii_case("xml") || e.eq_ignore_ascii_case("landxml"))
}
