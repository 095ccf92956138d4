//! Reading a design profile and a ground line from a LandXML 1.2 file.

use std::io::Read;
use std::path::Path;

use gradewright_geometry::{Foot, GroundPoint, Pvi, Station, Units, VerticalCurve, excerpt, length_factor};
use roxmltree::{Document, Node};

use super::NAMESPACE;
use crate::ReadError;
use crate::error::Choosing;
use crate::ground_csv::{order_ground, read_text};
use crate::note::{FileLengths, Note, NoteKind};

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
    /// What the reader wants the user to know: the units it read, what it
    /// converted, and every element it skipped.
    pub notes: Vec<Note>,
}

impl LandXmlProfile {
    /// A new project of this profile and ground, named after the alignment,
    /// in the units and foot read (criteria at their defaults: LandXML has
    /// none).
    pub fn project(&self) -> gradewright_document::Project {
        let mut project = gradewright_document::Project::new(self.alignment.clone(), self.units);
        project.foot = self.foot;
        project.pvis.clone_from(&self.pvis);
        project.ground = self.ground.clone().into();
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

/// The units a file states and how its linear unit scales to the base
/// unit of that system (metre or foot).
#[derive(Clone, Copy, Debug)]
struct FileUnits {
    units: Units,
    foot: Foot,
    /// Base units (m or ft) per file unit: 1 for meter, foot, USSurveyFoot.
    scale: f64,
    /// The `linearUnit` as written.
    name: &'static str,
}

/// Linear units the schema allows and what they are in Gradewright's terms.
const LINEAR_UNITS: [(&str, Units, Foot, f64); 8] = [
    ("meter", Units::Metric, Foot::International, 1.0),
    ("millimeter", Units::Metric, Foot::International, 0.001),
    ("centimeter", Units::Metric, Foot::International, 0.01),
    ("kilometer", Units::Metric, Foot::International, 1000.0),
    ("foot", Units::UsCustomary, Foot::International, 1.0),
    ("USSurveyFoot", Units::UsCustomary, Foot::UsSurvey, 1.0),
    ("inch", Units::UsCustomary, Foot::International, 1.0 / 12.0),
    ("mile", Units::UsCustomary, Foot::International, 5280.0),
];

/// A parsed file and what every reader needs of it.
struct Parsed<'a> {
    origin: &'a Path,
    doc: Document<'a>,
    units: FileUnits,
    notes: Vec<Note>,
}

/// An alignment's design profiles and ground lines.
struct AlignmentNodes<'a, 'i> {
    name: String,
    node: Node<'a, 'i>,
    profiles: Vec<(String, Option<String>, Node<'a, 'i>)>,
    surfaces: Vec<(String, Node<'a, 'i>)>,
}

fn is(node: Node<'_, '_>, name: &str) -> bool {
    node.is_element() && node.tag_name().name() == name
}

fn line_of(doc: &Document<'_>, node: Node<'_, '_>) -> u64 {
    u64::from(doc.text_pos_at(node.range().start).row)
}

/// A note about `origin`.
fn note(origin: &Path, kind: NoteKind) -> Note {
    Note { path: origin.to_owned(), kind }
}

impl<'a> Parsed<'a> {
    fn parse(text: &'a str, origin: &'a Path) -> Result<Self, ReadError> {
        let doc = Document::parse(text).map_err(|e| {
            // The end of a cut-off file is its last line, not where the
            // parser started.
            let line = if matches!(e, roxmltree::Error::UnexpectedEndOfStream) {
                text.lines().count().max(1) as u64
            } else {
                u64::from(e.pos().row)
            };
            ReadError::new(origin, line, "xml", format!("not well-formed XML: {e}"))
        })?;
        let root = doc.root_element();
        let mut notes = Vec::new();
        if root.tag_name().name() != "LandXML" {
            return Err(ReadError::new(
                origin,
                line_of(&doc, root),
                "LandXML",
                format!("the root element is <{}>, not <LandXML>", excerpt(root.tag_name().name())),
            ));
        }
        match root.tag_name().namespace() {
            Some(NAMESPACE) => {}
            Some(ns) if ns.starts_with("http://www.landxml.org/schema/LandXML-") => {
                notes.push(note(origin, NoteKind::OlderNamespace { namespace: ns.to_owned() }));
            }
            Some(ns) => {
                return Err(ReadError::new(
                    origin,
                    line_of(&doc, root),
                    "LandXML",
                    format!("namespace '{}' is not LandXML's ({NAMESPACE})", excerpt(ns)),
                ));
            }
            None => notes.push(note(origin, NoteKind::NoNamespace)),
        }
        let units = file_units(&doc, root, origin, &mut notes)?;
        Ok(Self { origin, doc, units, notes })
    }

    fn err(&self, node: Node<'_, '_>, field: &str, message: impl Into<String>) -> ReadError {
        ReadError::new(self.origin, line_of(&self.doc, node), field, message)
    }

    fn alignments(&self) -> Vec<AlignmentNodes<'_, 'a>> {
        let mut out = Vec::new();
        let root = self.doc.root_element();
        for (k, node) in root
            .children()
            .filter(|n| is(*n, "Alignments"))
            .flat_map(|a| a.children())
            .filter(|n| is(*n, "Alignment"))
            .enumerate()
        {
            let name = node.attribute("name").map_or_else(|| format!("alignment {}", k + 1), str::to_owned);
            let mut profiles = Vec::new();
            let mut surfaces = Vec::new();
            for profile in node.children().filter(|n| is(*n, "Profile")) {
                let holder = profile.attribute("name").map(str::to_owned);
                for (j, child) in profile.children().filter(Node::is_element).enumerate() {
                    let own = || {
                        child
                            .attribute("name")
                            .map_or_else(|| format!("{} {}", child.tag_name().name(), j + 1), str::to_owned)
                    };
                    if is(child, "ProfAlign") {
                        profiles.push((own(), holder.clone(), child));
                    } else if is(child, "ProfSurf") {
                        surfaces.push((own(), child));
                    }
                }
            }
            out.push(AlignmentNodes { name, node, profiles, surfaces });
        }
        out
    }

    /// The one alignment and design profile `selection` picks.
    fn pick_profile<'p>(
        &self,
        alignments: &'p [AlignmentNodes<'p, 'a>],
        selection: &Selection,
    ) -> Result<(&'p AlignmentNodes<'p, 'a>, usize), ReadError> {
        let root = self.doc.root_element();
        let chosen: Vec<&AlignmentNodes<'_, '_>> = match &selection.alignment {
            Some(name) => {
                let found: Vec<_> = alignments.iter().filter(|a| &a.name == name).collect();
                if found.is_empty() {
                    return Err(self.err(
                        root,
                        "Alignment",
                        format!(
                            "no alignment named '{}'; the file has: {}",
                            excerpt(name),
                            list(alignments.iter().map(|a| a.name.as_str()))
                        ),
                    ));
                }
                found
            }
            None => alignments.iter().collect(),
        };
        let mut candidates = Vec::new();
        for a in &chosen {
            for (k, (name, holder, _)) in a.profiles.iter().enumerate() {
                let wanted =
                    selection.profile.as_ref().is_none_or(|p| p == name || holder.as_ref() == Some(p));
                if wanted {
                    candidates.push((*a, k));
                }
            }
        }
        let every = || {
            list(chosen.iter().flat_map(|a| a.profiles.iter().map(move |p| format!("{} / {}", a.name, p.0))))
        };
        match candidates.as_slice() {
            [one] => Ok(*one),
            [] if chosen.iter().all(|a| a.profiles.is_empty()) => Err(self.err(
                root,
                "ProfAlign",
                "no design profile (Alignments/Alignment/Profile/ProfAlign) in the file",
            )),
            [] => Err(self.err(
                root,
                "ProfAlign",
                format!(
                    "no design profile named '{}'; the file has (alignment / profile): {}",
                    excerpt(selection.profile.as_deref().unwrap_or("")),
                    every()
                ),
            )),
            _ => Err(self
                .err(
                    root,
                    "ProfAlign",
                    format!(
                        "the file holds {} design profiles (alignment / profile): {}",
                        candidates.len(),
                        every()
                    ),
                )
                .with_choice(
                    Choosing::Profile,
                    candidates
                        .iter()
                        .filter_map(|(a, k)| a.profiles.get(*k).map(|p| format!("{} / {}", a.name, p.0)))
                        .collect(),
                )),
        }
    }

    /// The ground line of `alignment` that `selection` picks, if any.
    fn pick_surface<'p>(
        &self,
        alignment: &'p AlignmentNodes<'p, 'a>,
        selection: &Selection,
        required: bool,
    ) -> Result<Option<&'p (String, Node<'p, 'a>)>, ReadError> {
        let names = || list(alignment.surfaces.iter().map(|s| s.0.as_str()));
        if let Some(name) = &selection.surface {
            return match alignment.surfaces.iter().find(|s| &s.0 == name) {
                Some(s) => Ok(Some(s)),
                None => Err(self.err(
                    alignment.node,
                    "ProfSurf",
                    if alignment.surfaces.is_empty() {
                        format!(
                            "no ground line named '{}': alignment '{}' has none",
                            excerpt(name),
                            alignment.name
                        )
                    } else {
                        format!(
                            "no ground line named '{}' in alignment '{}'; it has: {}",
                            excerpt(name),
                            alignment.name,
                            names()
                        )
                    },
                )),
            };
        }
        match alignment.surfaces.as_slice() {
            [] if required => Err(self.err(
                alignment.node,
                "ProfSurf",
                format!("alignment '{}' has no ground line (Profile/ProfSurf)", alignment.name),
            )),
            [] => Ok(None),
            [one] => Ok(Some(one)),
            _ => Err(self
                .err(
                    alignment.node,
                    "ProfSurf",
                    format!(
                        "alignment '{}' holds {} ground lines: {}",
                        alignment.name,
                        alignment.surfaces.len(),
                        names()
                    ),
                )
                .with_choice(Choosing::Surface, alignment.surfaces.iter().map(|s| s.0.clone()).collect())),
        }
    }

    /// A finite number in attribute `name` of `node`.
    fn attribute(&self, node: Node<'_, '_>, name: &str) -> Result<f64, ReadError> {
        let field = format!("{}@{name}", node.tag_name().name());
        let Some(text) = node.attribute(name) else {
            return Err(self.err(node, &field, format!("the attribute '{name}' is missing")));
        };
        match text.trim().parse::<f64>() {
            Ok(v) if v.is_finite() => Ok(v),
            _ => Err(self.err(node, &field, format!("'{}' is not a finite number", excerpt(text)))),
        }
    }

    /// A finite, non-negative length in attribute `name`, scaled.
    fn length(&self, node: Node<'_, '_>, name: &str, scale: f64) -> Result<f64, ReadError> {
        let value = self.attribute(node, name)?;
        if value < 0.0 {
            let field = format!("{}@{name}", node.tag_name().name());
            return Err(self.err(node, &field, format!("length {value} is negative")));
        }
        Ok(value * scale)
    }

    /// The "station elevation" text of a PVI-like element, scaled.
    fn station_elevation(&self, node: Node<'_, '_>, scale: f64) -> Result<(f64, f64), ReadError> {
        let field = node.tag_name().name();
        let text = node.text().unwrap_or("");
        let mut values = Vec::with_capacity(2);
        for token in text.split_whitespace() {
            match token.parse::<f64>() {
                Ok(v) if v.is_finite() => values.push(v * scale),
                _ => {
                    return Err(self.err(
                        node,
                        field,
                        format!("'{}' is not a finite number", excerpt(token)),
                    ));
                }
            }
        }
        match values.as_slice() {
            [station, elevation] => Ok((*station, *elevation)),
            _ => Err(self.err(
                node,
                field,
                format!("{} number(s); a station and an elevation (two numbers) are needed", values.len()),
            )),
        }
    }

    /// The PVIs of a `ProfAlign` element, with their lines.
    fn pvis(
        &self,
        prof_align: Node<'_, '_>,
        name: &str,
        scale: f64,
        notes: &mut Vec<Note>,
    ) -> Result<(Vec<Pvi>, Vec<u64>), ReadError> {
        let mut pvis = Vec::new();
        let mut lines = Vec::new();
        let mut circular = 0;
        let mut skipped: Vec<String> = Vec::new();
        for child in prof_align.children().filter(Node::is_element) {
            let curve = match child.tag_name().name() {
                "PVI" => VerticalCurve::None,
                "ParaCurve" => {
                    let half = self.length(child, "length", scale)? / 2.0;
                    VerticalCurve::from_lengths(half, half)
                }
                "UnsymParaCurve" => VerticalCurve::from_lengths(
                    self.length(child, "lengthIn", scale)?,
                    self.length(child, "lengthOut", scale)?,
                ),
                "CircCurve" => {
                    self.attribute(child, "radius")?;
                    circular += 1;
                    let half = self.length(child, "length", scale)? / 2.0;
                    VerticalCurve::from_lengths(half, half)
                }
                other => {
                    if !skipped.iter().any(|s| s == other) {
                        skipped.push(other.to_owned());
                    }
                    continue;
                }
            };
            let (station, elevation) = self.station_elevation(child, scale)?;
            pvis.push(Pvi { station: Station(station), elevation, curve });
            lines.push(line_of(&self.doc, child));
        }
        if pvis.is_empty() {
            return Err(self.err(prof_align, "ProfAlign", format!("design profile '{name}' has no PVI")));
        }
        if circular > 0 {
            notes.push(note(self.origin, NoteKind::CircularCurves { count: circular }));
        }
        if !skipped.is_empty() {
            notes.push(note(self.origin, NoteKind::Skipped { profile: name.to_owned(), elements: skipped }));
        }
        Ok((pvis, lines))
    }

    /// The points of a `ProfSurf` element, in station order.
    fn ground(
        &self,
        surface: Node<'_, '_>,
        name: &str,
        scale: f64,
        notes: &mut Vec<Note>,
    ) -> Result<Vec<GroundPoint>, ReadError> {
        let mut rows = Vec::new();
        let lists: Vec<_> = surface.children().filter(|n| is(*n, "PntList2D")).collect();
        for list in &lists {
            let Some(text_node) = list.children().find(Node::is_text) else {
                return Err(self.err(*list, "PntList2D", "the point list is empty"));
            };
            let text = text_node.text().unwrap_or("");
            let start = self.doc.text_pos_at(text_node.range().start);
            let mut pending: Option<(f64, u64)> = None;
            let mut line = u64::from(start.row);
            let mut rest = text;
            while let Some(begin) = rest.find(|c: char| !c.is_whitespace()) {
                line += rest.get(..begin).map_or(0, |s| s.matches('\n').count()) as u64;
                let after = rest.get(begin..).unwrap_or("");
                let end = after.find(char::is_whitespace).unwrap_or(after.len());
                let token = after.get(..end).unwrap_or("");
                let value = match token.parse::<f64>() {
                    Ok(v) if v.is_finite() => v * scale,
                    _ => {
                        return Err(ReadError::new(
                            self.origin,
                            line,
                            "PntList2D",
                            format!("'{}' is not a finite number", excerpt(token)),
                        ));
                    }
                };
                match pending.take() {
                    None => pending = Some((value, line)),
                    Some((station, first_line)) => {
                        rows.push((GroundPoint { station, elevation: value }, first_line));
                    }
                }
                rest = after.get(end..).unwrap_or("");
            }
            if let Some((_, l)) = pending {
                return Err(ReadError::new(
                    self.origin,
                    l,
                    "PntList2D",
                    "an odd count of numbers: the last station has no elevation",
                ));
            }
        }
        if lists.is_empty() {
            return Err(self.err(surface, "ProfSurf", format!("ground line '{name}' has no PntList2D")));
        }
        if lists.len() > 1 {
            notes.push(note(
                self.origin,
                NoteKind::PointListsJoined { surface: name.to_owned(), lists: lists.len() },
            ));
        }
        let table = order_ground(rows, self.origin, "PntList2D")?;
        notes.extend(table.warnings);
        Ok(table.points)
    }

    /// Notes on what an alignment holds that is not read.
    fn alignment_notes(&self, alignment: &AlignmentNodes<'_, '_>, notes: &mut Vec<Note>) {
        if alignment.node.children().any(|n| is(n, "StaEquation")) {
            notes.push(note(self.origin, NoteKind::StationEquations { alignment: alignment.name.clone() }));
        }
    }

    /// The scale from file values to the target and the units read into.
    fn target(&self, target: Option<(Units, Foot)>, notes: &mut Vec<Note>) -> (Units, Foot, f64) {
        let file = self.units;
        let (units, foot) = target.unwrap_or((file.units, file.foot));
        let factor = length_factor(file.units, file.foot, units, foot);
        let scale = file.scale * factor;
        let lengths = match (file.units, file.foot) {
            (Units::UsCustomary, Foot::UsSurvey) => FileLengths::UsSurveyFeet,
            (u, _) => FileLengths::of(u),
        };
        let linear_unit = file.name.to_owned();
        let kept = units == file.units && factor.to_bits() == 1.0_f64.to_bits();
        if kept {
            notes.push(note(self.origin, NoteKind::Lengths { lengths, linear_unit: linear_unit.clone() }));
        } else {
            notes.push(note(
                self.origin,
                NoteKind::Converted { from: lengths, linear_unit: linear_unit.clone(), to: units, scale },
            ));
        }
        if file.scale.to_bits() != 1.0_f64.to_bits() && kept {
            notes.push(note(self.origin, NoteKind::Scaled { linear_unit, to: units, scale: file.scale }));
        }
        (units, foot, scale)
    }
}

fn list<S: AsRef<str>>(names: impl Iterator<Item = S>) -> String {
    let names: Vec<String> = names.map(|n| format!("'{}'", excerpt(n.as_ref()))).collect();
    if names.is_empty() { "none".to_owned() } else { names.join(", ") }
}

fn file_units(
    doc: &Document<'_>,
    root: Node<'_, '_>,
    origin: &Path,
    notes: &mut Vec<Note>,
) -> Result<FileUnits, ReadError> {
    let err = |node: Node<'_, '_>, field: &str, message: String| {
        ReadError::new(origin, line_of(doc, node), field, message)
    };
    let Some(units) = root.children().find(|n| is(*n, "Units")) else {
        return Err(err(root, "Units", "the file has no Units element (LandXML requires one)".to_owned()));
    };
    let Some(system) = units.children().find(|n| is(*n, "Metric") || is(*n, "Imperial")) else {
        return Err(err(units, "Units", "Units has neither Metric nor Imperial".to_owned()));
    };
    let kind = system.tag_name().name();
    let field = format!("{kind}@linearUnit");
    let Some(linear) = system.attribute("linearUnit") else {
        return Err(err(system, &field, "the attribute 'linearUnit' is missing".to_owned()));
    };
    let Some(&(name, units, foot, scale)) = LINEAR_UNITS.iter().find(|u| u.0 == linear) else {
        return Err(err(
            system,
            &field,
            format!("'{}' is not a linear unit of LandXML 1.2", excerpt(linear)),
        ));
    };
    let expected = if kind == "Metric" { Units::Metric } else { Units::UsCustomary };
    if units != expected {
        return Err(err(system, &field, format!("'{linear}' is not a {kind} unit")));
    }
    if let Some(elevation) = system.attribute("elevationUnit") {
        let agrees = matches!((units, elevation), (Units::Metric, "meter") | (Units::UsCustomary, "feet"));
        if !agrees {
            notes.push(note(
                origin,
                NoteKind::ElevationUnitUnused { given: excerpt(elevation), linear_unit: linear.to_owned() },
            ));
        }
    }
    Ok(FileUnits { units, foot, scale, name })
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
    let text = read_text(reader, origin)?;
    let parsed = Parsed::parse(&text, origin)?;
    let mut notes = parsed.notes.clone();
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
    Ok(LandXmlProfile {
        units,
        foot,
        alignment: alignment.name.clone(),
        profile: profile.clone(),
        pvis,
        lines,
        surface,
        ground,
        notes,
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
    let text = read_text(reader, origin)?;
    let parsed = Parsed::parse(&text, origin)?;
    let mut notes = parsed.notes.clone();
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
            return Err(parsed.err(
                root,
                "Alignment",
                format!(
                    "no alignment named '{}'; the file has: {}",
                    excerpt(name),
                    list(alignments.iter().map(|a| a.name.as_str()))
                ),
            ));
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
    let text = read_text(reader, origin)?;
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
