//! Reading a design profile and a ground line from a LandXML 1.2 file.

use std::io::Read;
use std::path::Path;
use std::sync::Arc;

use gradewright_geometry::{Foot, GroundPoint, Pvi, Units};

use super::parse::{AlignmentNodes, Parsed, list, note};
use super::text::read_xml;
use crate::ReadError;
use crate::error::Choosing;
use crate::note::{Note, NoteKind};

/// Which alignment, design profile and ground line to read when a file holds
/// several. `None` takes the only one there is; when there are several, the
/// error lists their names.
#[derive(Clone, Debug, Default, PartialEq, Eq)]
pub struct Selection {
    /// An `Alignment@name`.
    pub alignment: Option<String>,
    /// A `ProfAlign@name` (or the name of the `Profile` holding it).
    pub profile: Option<String>,
    /// A `ProfSurf@name` (the ground line).
    pub surface: Option<String>,
}

/// A design profile read from a LandXML file, in the units it was read into.
#[derive(Clone, Debug, PartialEq, Default)]
pub struct LandXmlProfile {
    /// The units of every value below.
    pub units: Units,
    /// The foot of those values (the file's, unless converted).
    pub foot: Foot,
    /// The alignment read.
    pub alignment: String,
    /// The `ProfAlign` read.
    pub profile: String,
    /// The PVIs, in file order.
    pub pvis: Vec<Pvi>,
    /// The 1-based line of each PVI's element.
    pub lines: Vec<u64>,
    /// The `ProfSurf` read as the ground, if the alignment has one.
    pub surface: Option<String>,
    /// The ground points, in station order.
    pub ground: Vec<GroundPoint>,
    /// The design speed the file gives the alignment (km/h or mph, in the
    /// units read), if it gives one.
    pub design_speed: Option<f64>,
    /// The alignment's station equations (in the units read).
    pub equations: Vec<gradewright_geometry::StationEquation>,
    /// What the reader wants the user to know: the units it read, what it
    /// converted, and every element it skipped.
    pub notes: Vec<Note>,
    /// The file's text, when its values were read unconverted: kept with
    /// the project so that a LandXML export writes the file back with only
    /// the profile (and ground, design speed) changed.
    pub source: Option<Arc<str>>,
}

impl LandXmlProfile {
    /// A new project of this profile and ground, named after the alignment,
    /// in the units and foot read, with the file's design speed (the other
    /// criteria at their defaults: LandXML has no place for them).
    pub fn project(&self) -> gradewright_document::Project {
        let mut project = gradewright_document::Project::new(self.alignment.clone(), self.units);
        project.foot = self.foot;
        project.criteria.design_speed = self.design_speed;
        project.pvis.clone_from(&self.pvis);
        project.ground = self.ground.clone().into();
        project.equations = self.equations.clone().into();
        project.kept = self.source.as_ref().map(|text| gradewright_document::Kept {
            text: Arc::clone(text),
            alignment: self.alignment.clone(),
            profile: self.profile.clone(),
            surface: self.surface.clone(),
        });
        project
    }
}

/// A ground line read from a LandXML file's `ProfSurf`.
#[derive(Clone, Debug, PartialEq, Default)]
pub struct LandXmlGround {
    /// The alignment it belongs to.
    pub alignment: String,
    /// The `ProfSurf` read.
    pub surface: String,
    /// The points, in station order, in the units asked for.
    pub points: Vec<GroundPoint>,
    /// What the user should know (units, conversions, sorting, skipped parts).
    pub notes: Vec<Note>,
}

/// One design profile a file offers.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Choice {
    /// Its alignment.
    pub alignment: String,
    /// Its `ProfAlign` name.
    pub profile: String,
    /// The ground lines (`ProfSurf` names) of its alignment.
    pub surfaces: Vec<String>,
}

/// Reads the design profile `selection` picks (and its alignment's ground
/// line, if it has one) from a LandXML file. With `units` different from
/// the file's, every length is converted (international foot), and a note
/// says so; otherwise the values are kept as the file gives them, with the
/// file's foot.
///
/// # Errors
/// A [`ReadError`] naming the file, the line and the element or attribute:
/// the file cannot be read, is not well-formed XML, is not LandXML, has no
/// `Units`, a number does not parse, no design profile, or the choice of
/// alignment, profile or ground line is ambiguous (the names are listed).
pub fn read_landxml(
    reader: impl Read,
    origin: &Path,
    selection: &Selection,
    units: Option<Units>,
) -> Result<LandXmlProfile, ReadError> {
    let (text, encoding) = read_xml(reader, origin)?;
    let parsed = Parsed::parse(&text, origin)?;
    let mut notes = parsed.notes.clone();
    if let Some(encoding) = encoding {
        notes.insert(0, note(origin, NoteKind::Encoding { encoding }));
    }
    let alignments = parsed.alignments();
    let (alignment, index) = parsed.pick_profile(&alignments, selection)?;
    let target = units.filter(|u| *u != parsed.units.units).map(|u| (u, Foot::International));
    let (units, foot, scale) = parsed.target(target, &mut notes);
    let Some((profile, _, node)) = alignment.profiles.get(index) else {
        return Err(parsed.err(alignment.node, "ProfAlign", "no design profile"));
    };
    parsed.alignment_notes(alignment, &mut notes);
    let (pvis, lines) = parsed.pvis(*node, profile, scale, &mut notes)?;
    station_range_note(&parsed, alignment, &pvis, scale, &mut notes);
    let (surface, ground) = match parsed.pick_surface(alignment, selection, false)? {
        Some((name, node)) => (Some(name.clone()), parsed.ground(*node, name, scale, &mut notes)?),
        None => (None, Vec::new()),
    };
    let design_speed = parsed.design_speed(alignment, units, &mut notes)?;
    let equations = parsed.equations(alignment, scale)?;
    let converted = target.is_some() || parsed.units.scale.to_bits() != 1.0_f64.to_bits();
    // Found again by name when written back: only a file whose names pick
    // out this alignment and profile alone is kept.
    let unique = alignments.iter().filter(|a| a.name == alignment.name).count() == 1
        && alignment.profiles.iter().filter(|p| p.0 == *profile).count() == 1;
    let kept = !converted && unique;
    if alignment.node.children().any(|n| super::parse::is(n, "CoordGeom")) {
        notes.push(note(origin, NoteKind::HorizontalGeometry { alignment: alignment.name.clone(), kept }));
    }
    let source = kept.then(|| Arc::from(text.as_str()));
    Ok(LandXmlProfile {
        units,
        foot,
        alignment: alignment.name.clone(),
        profile: profile.clone(),
        pvis,
        lines,
        surface,
        ground,
        design_speed,
        equations,
        notes,
        source,
    })
}

/// A note when the PVIs lie outside the alignment's stations
/// (`staStart` to `staStart + length`): the file may use another station
/// space than its alignment says.
fn station_range_note(
    parsed: &Parsed<'_>,
    alignment: &AlignmentNodes<'_, '_>,
    pvis: &[Pvi],
    scale: f64,
    notes: &mut Vec<Note>,
) {
    let (Ok(start), Ok(length)) =
        (parsed.attribute(alignment.node, "staStart"), parsed.attribute(alignment.node, "length"))
    else {
        return;
    };
    let (start, end) = (start * scale, (start + length) * scale);
    let slack = gradewright_geometry::tolerance::station_hair(end);
    let outside = pvis.iter().filter(|p| p.station.0 < start - slack || p.station.0 > end + slack).count();
    if outside > 0 {
        notes.push(note(
            parsed.origin,
            NoteKind::OutsideAlignment { count: outside, alignment: alignment.name.clone(), start, end },
        ));
    }
}

/// Reads a ground line (`ProfSurf`) from a LandXML file into a project in
/// `units` with `foot`; values in other units are converted, with a note.
///
/// # Errors
/// As [`read_landxml`], and when the alignment has no ground line.
pub fn read_landxml_ground(
    reader: impl Read,
    origin: &Path,
    selection: &Selection,
    units: Units,
    foot: Foot,
) -> Result<LandXmlGround, ReadError> {
    let (text, encoding) = read_xml(reader, origin)?;
    let parsed = Parsed::parse(&text, origin)?;
    let mut notes = parsed.notes.clone();
    if let Some(encoding) = encoding {
        notes.insert(0, note(origin, NoteKind::Encoding { encoding }));
    }
    let alignments = parsed.alignments();
    let root = parsed.doc.root_element();
    let with_ground: Vec<&AlignmentNodes<'_, '_>> = alignments
        .iter()
        .filter(|a| selection.alignment.as_ref().is_none_or(|n| n == &a.name))
        .filter(|a| !a.surfaces.is_empty())
        .collect();
    let alignment = match (with_ground.as_slice(), &selection.alignment) {
        ([one], _) => *one,
        ([], Some(name)) if !alignments.iter().any(|a| &a.name == name) => {
            return Err(parsed.no_alignment(name, &alignments));
        }
        ([], _) => {
            return Err(parsed.err(
                root,
                "ProfSurf",
                "no ground line (Alignments/Alignment/Profile/ProfSurf) in the file",
            ));
        }
        (many, _) => {
            return Err(parsed
                .err(
                    root,
                    "Alignment",
                    format!(
                        "{} alignments have ground lines: {}",
                        many.len(),
                        list(many.iter().map(|a| a.name.as_str()))
                    ),
                )
                .with_choice(Choosing::Alignment, many.iter().map(|a| a.name.clone()).collect()));
        }
    };
    let (_, _, scale) = parsed.target(Some((units, foot)), &mut notes);
    let Some((name, node)) = parsed.pick_surface(alignment, selection, true)? else {
        return Err(parsed.err(alignment.node, "ProfSurf", "no ground line"));
    };
    parsed.alignment_notes(alignment, &mut notes);
    let points = parsed.ground(*node, name, scale, &mut notes)?;
    Ok(LandXmlGround { alignment: alignment.name.clone(), surface: name.clone(), points, notes })
}

/// The design profiles a LandXML file offers, for a user to choose from.
///
/// # Errors
/// As [`read_landxml`] for a file that cannot be read or is not LandXML.
pub fn landxml_choices(reader: impl Read, origin: &Path) -> Result<Vec<Choice>, ReadError> {
    let (text, _) = read_xml(reader, origin)?;
    let parsed = Parsed::parse(&text, origin)?;
    Ok(parsed
        .alignments()
        .iter()
        .flat_map(|a| {
            a.profiles.iter().map(|p| Choice {
                alignment: a.name.clone(),
                profile: p.0.clone(),
                surfaces: a.surfaces.iter().map(|s| s.0.clone()).collect(),
            })
        })
        .collect())
}
