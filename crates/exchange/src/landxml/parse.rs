//! The parsed file and what every reader needs of it: the units it states,
//! its alignments with their design profiles and ground lines, and the
//! values of their elements.

use std::path::Path;

use gradewright_geometry::{
    Foot, GroundPoint, Pvi, Station, StationEquation, Units, VerticalCurve, excerpt, length_factor,
    speed_factor, tolerance,
};
use roxmltree::{Document, Node};

use super::NAMESPACE;
use super::text::{ElementText, Lines, MAX_DEPTH, too_deep};
use crate::ReadError;
use crate::ground_csv::order_ground;
use crate::note::{FileLengths, Note, NoteKind};

/// The units a file states and how its linear unit scales to the base
/// unit of that system (metre or foot).
#[derive(Clone, Copy, Debug)]
pub(super) struct FileUnits {
    pub(super) units: Units,
    pub(super) foot: Foot,
    /// Base units (m or ft) per file unit: 1 for meter, foot, USSurveyFoot.
    pub(super) scale: f64,
    /// The `linearUnit` as written.
    pub(super) name: &'static str,
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
pub(super) struct Parsed<'a> {
    pub(super) origin: &'a Path,
    pub(super) doc: Document<'a>,
    /// Lines of positions in the file's text.
    pub(super) lines: Lines<'a>,
    pub(super) units: FileUnits,
    pub(super) notes: Vec<Note>,
}

/// An alignment's design profiles and ground lines.
pub(super) struct AlignmentNodes<'a, 'i> {
    pub(super) name: String,
    pub(super) node: Node<'a, 'i>,
    pub(super) profiles: Vec<(String, Option<String>, Node<'a, 'i>)>,
    pub(super) surfaces: Vec<(String, Node<'a, 'i>)>,
}

/// Whether `node` is LandXML's element `name` (in the LandXML namespace, an
/// older LandXML one, or none; never another vocabulary's element of the
/// same name).
pub(super) fn is(node: Node<'_, '_>, name: &str) -> bool {
    node.is_element() && node.tag_name().name() == name && is_landxml_element(node)
}

/// Whether an element in namespace `ns` is LandXML's.
pub(super) fn is_landxml_namespace(ns: Option<&str>) -> bool {
    ns.is_none_or(|ns| ns == NAMESPACE || ns.starts_with("http://www.landxml.org/schema/LandXML-"))
}

/// Whether `node` is in LandXML's namespace or the file's own (an
/// application profile's: the reader accepts no other root).
fn is_landxml_element(node: Node<'_, '_>) -> bool {
    let ns = node.tag_name().namespace();
    is_landxml_namespace(ns) || ns == node.document().root_element().tag_name().namespace()
}

/// An element of another vocabulary, as `{namespace}name` for a note.
pub(super) fn foreign(node: Node<'_, '_>) -> Option<String> {
    let ns = node.tag_name().namespace();
    (node.is_element() && !is_landxml_element(node))
        .then(|| format!("{{{}}}{}", excerpt(ns.unwrap_or("")), excerpt(node.tag_name().name())))
}

/// A note about `origin`.
pub(super) fn note(origin: &Path, kind: NoteKind) -> Note {
    Note { path: origin.to_owned(), kind }
}

impl<'a> Parsed<'a> {
    pub(super) fn parse(text: &'a str, origin: &'a Path) -> Result<Self, ReadError> {
        // The parser recurses once per level: a file nested deeper than any
        // LandXML is refused before it could run out of stack.
        if let Some(line) = too_deep(text) {
            return Err(ReadError::new(
                origin,
                line,
                "xml",
                format!("elements nest more than {MAX_DEPTH} deep; a LandXML profile is a few levels deep"),
            ));
        }
        let lines = Lines::new(text);
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
                lines.of(root),
                "LandXML",
                format!("the root element is <{}>, not <LandXML>", excerpt(root.tag_name().name())),
            ));
        }
        match root.tag_name().namespace() {
            Some(NAMESPACE) => {}
            Some(ns) if ns.starts_with("http://www.landxml.org/schema/LandXML-") => {
                notes.push(note(origin, NoteKind::OlderNamespace { namespace: ns.to_owned() }));
            }
            // A national application profile reuses LandXML 1.2's elements
            // under its own namespace; its root says which version.
            Some(ns) if root.attribute("version").is_some_and(|v| v.trim() == "1.2") => {
                notes.push(note(origin, NoteKind::ApplicationProfile { namespace: ns.to_owned() }));
            }
            Some(ns) => {
                return Err(ReadError::new(
                    origin,
                    lines.of(root),
                    "LandXML",
                    format!(
                        "namespace '{}' is not LandXML's ({NAMESPACE}), and the root does not say version=\"1.2\" \
                         (as an application profile of LandXML 1.2 would)",
                        excerpt(ns)
                    ),
                ));
            }
            None => notes.push(note(origin, NoteKind::NoNamespace)),
        }
        let units = file_units(&lines, root, origin, &mut notes)?;
        Ok(Self { origin, doc, lines, units, notes })
    }

    pub(super) fn err(&self, node: Node<'_, '_>, field: &str, message: impl Into<String>) -> ReadError {
        ReadError::new(self.origin, self.lines.of(node), field, message)
    }

    /// The design speed the file gives `alignment`: a `Roadway` referring to
    /// it (`Speeds`/`DesignSpeed@speed`, the standard's place), else a
    /// `Feature` of the alignment with a `Property` labelled `designSpeed`
    /// (where a name holding spaces cannot be referred to). In km/h for a
    /// Metric file and mph for an Imperial one, converted to `units`.
    pub(super) fn design_speed<'d>(
        &'d self,
        alignment: &AlignmentNodes<'d, 'a>,
        units: Units,
        notes: &mut Vec<Note>,
    ) -> Result<Option<f64>, ReadError> {
        let Some((node, attribute)) = self.design_speed_node(alignment) else { return Ok(None) };
        let speed = self.attribute(node, attribute)?;
        if speed <= 0.0 {
            let field = format!("{}@speed", node.tag_name().name());
            return Err(self.err(node, &field, format!("design speed {speed} is not a positive speed")));
        }
        // km/h and mph: the file's system, converted when read into the other.
        let converted = speed * speed_factor(self.units.units, units);
        notes.push(note(
            self.origin,
            NoteKind::DesignSpeed { speed, file_units: self.units.units, converted, units },
        ));
        Ok(Some(converted))
    }

    /// Where the file gives `alignment` its design speed: the element and
    /// the attribute holding it (see [`Self::design_speed`]).
    pub(super) fn design_speed_node<'d>(
        &'d self,
        alignment: &AlignmentNodes<'d, 'a>,
    ) -> Option<(Node<'d, 'a>, &'static str)> {
        let root = self.doc.root_element();
        let refers = |refs: &str| {
            refs.trim() == alignment.name || refs.split_whitespace().any(|r| r == alignment.name)
        };
        let roadway = root
            .children()
            .filter(|n| is(*n, "Roadways"))
            .flat_map(|n| n.children())
            .filter(|n| is(*n, "Roadway") && n.attribute("alignmentRefs").is_some_and(refers))
            .flat_map(|n| n.children())
            .filter(|n| is(*n, "Speeds"))
            .flat_map(|n| n.children())
            .find(|n| is(*n, "DesignSpeed") && n.attribute("speed").is_some());
        if let Some(node) = roadway {
            return Some((node, "speed"));
        }
        alignment
            .node
            .children()
            .filter(|n| is(*n, "Feature"))
            .flat_map(|n| n.children())
            .find(|n| {
                is(*n, "Property")
                    && n.attribute("label").is_some_and(|l| l.eq_ignore_ascii_case("designSpeed"))
            })
            .map(|node| (node, "value"))
    }

    /// There is no alignment called `name`: the error lists those there are.
    pub(super) fn no_alignment(&self, name: &str, alignments: &[AlignmentNodes<'_, '_>]) -> ReadError {
        self.err(
            self.doc.root_element(),
            "Alignment",
            format!(
                "no alignment named '{}'; the file has: {}",
                excerpt(name),
                list(alignments.iter().map(|a| a.name.as_str()))
            ),
        )
    }

    pub(super) fn alignments(&self) -> Vec<AlignmentNodes<'_, 'a>> {
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

    /// A finite number in attribute `name` of `node`.
    pub(super) fn attribute(&self, node: Node<'_, '_>, name: &str) -> Result<f64, ReadError> {
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
    pub(super) fn length(&self, node: Node<'_, '_>, name: &str, scale: f64) -> Result<f64, ReadError> {
        let value = self.attribute(node, name)?;
        if value < 0.0 {
            let field = format!("{}@{name}", node.tag_name().name());
            return Err(self.err(node, &field, format!("length {value} is negative")));
        }
        Ok(value * scale)
    }

    /// The "station elevation" text of a PVI-like element, scaled: its whole
    /// character data (`interrupted` counts the elements whose data a comment
    /// or processing instruction split).
    pub(super) fn station_elevation(
        &self,
        node: Node<'_, '_>,
        scale: f64,
        interrupted: &mut usize,
    ) -> Result<(f64, f64), ReadError> {
        let field = node.tag_name().name();
        let data = ElementText::of(node);
        *interrupted += usize::from(data.interrupted);
        let text = data.text.as_str();
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
    pub(super) fn pvis(
        &self,
        prof_align: Node<'_, '_>,
        name: &str,
        scale: f64,
        notes: &mut Vec<Note>,
    ) -> Result<(Vec<Pvi>, Vec<u64>), ReadError> {
        let mut pvis = Vec::new();
        let mut lines = Vec::new();
        let mut circular = Vec::new();
        let mut interrupted = 0;
        let mut skipped: Vec<String> = Vec::new();
        for child in prof_align.children().filter(Node::is_element) {
            if let Some(name) = foreign(child) {
                if !skipped.contains(&name) {
                    skipped.push(name);
                }
                continue;
            }
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
                    // The length from the radius is found once every PVI is
                    // read; the stated one stands until then.
                    let radius = self.length(child, "radius", scale)?;
                    let stated = self.length(child, "length", scale)?;
                    circular.push((pvis.len(), radius, stated));
                    VerticalCurve::from_lengths(stated / 2.0, stated / 2.0)
                }
                other => {
                    if !skipped.iter().any(|s| s == other) {
                        skipped.push(other.to_owned());
                    }
                    continue;
                }
            };
            let (station, elevation) = self.station_elevation(child, scale, &mut interrupted)?;
            pvis.push(Pvi { station: Station(station), elevation, curve });
            lines.push(self.lines.of(child));
        }
        if interrupted > 0 {
            notes
                .push(note(self.origin, NoteKind::DataAroundComments { element: "PVI", count: interrupted }));
        }
        if pvis.is_empty() {
            return Err(self.err(
                prof_align,
                "ProfAlign",
                format!("design profile '{}' has no PVI", excerpt(name)),
            ));
        }
        if !circular.is_empty() {
            notes.push(note(self.origin, NoteKind::CircularCurves { count: circular.len() }));
        }
        for (k, radius, stated) in circular {
            let (Some(a), Some(b), Some(c)) = (pvis.get(k.wrapping_sub(1)), pvis.get(k), pvis.get(k + 1))
            else {
                continue;
            };
            // The parabola of the same radius at the PVI: r = 1/R, so
            // L = A·R with A the algebraic grade difference as a fraction
            // (the curvature of y = y0 + g1·x + r·x²/2 at the vertex is r for
            // small grades: derived from the curve equation).
            let g1 = (b.elevation - a.elevation) / (b.station.0 - a.station.0);
            let g2 = (c.elevation - b.elevation) / (c.station.0 - b.station.0);
            let length = (g2 - g1).abs() * radius;
            if !length.is_finite() {
                continue;
            }
            if (length - stated).abs() > tolerance::CIRCULAR_LENGTH_AGREEMENT * length.max(stated) {
                notes.push(note(
                    self.origin,
                    NoteKind::CircularLength {
                        station: b.station.0,
                        line: lines.get(k).copied().unwrap_or(0),
                        stated,
                        from_radius: length,
                    },
                ));
            }
            if let Some(p) = pvis.get_mut(k) {
                p.curve = VerticalCurve::from_lengths(length / 2.0, length / 2.0);
            }
        }
        if !skipped.is_empty() {
            notes.push(note(self.origin, NoteKind::Skipped { profile: name.to_owned(), elements: skipped }));
        }
        Ok((pvis, lines))
    }

    /// The points of a `ProfSurf` element, in station order.
    pub(super) fn ground(
        &self,
        surface: Node<'_, '_>,
        name: &str,
        scale: f64,
        notes: &mut Vec<Note>,
    ) -> Result<Vec<GroundPoint>, ReadError> {
        let mut rows = Vec::new();
        let lists: Vec<_> = surface.children().filter(|n| is(*n, "PntList2D")).collect();
        let mut interrupted = 0;
        for list in &lists {
            let data = ElementText::of(*list);
            if data.text.trim().is_empty() {
                return Err(self.err(*list, "PntList2D", "the point list is empty"));
            }
            interrupted += usize::from(data.interrupted);
            let text = data.text.as_str();
            let mut pending: Option<(f64, u64)> = None;
            let mut offset = 0;
            while let Some(begin) =
                text.get(offset..).and_then(|rest| rest.find(|c: char| !c.is_whitespace()))
            {
                let begin = offset + begin;
                let after = text.get(begin..).unwrap_or("");
                let end = after.find(char::is_whitespace).unwrap_or(after.len());
                let token = after.get(..end).unwrap_or("");
                let line = data.line(&self.lines, begin);
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
                offset = begin + end;
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
        if interrupted > 0 {
            notes.push(note(
                self.origin,
                NoteKind::DataAroundComments { element: "PntList2D", count: interrupted },
            ));
        }
        if lists.is_empty() {
            return Err(self.err(
                surface,
                "ProfSurf",
                format!("ground line '{}' has no PntList2D", excerpt(name)),
            ));
        }
        if lists.len() > 1 {
            notes.push(note(
                self.origin,
                NoteKind::PointListsJoined { surface: name.to_owned(), lists: lists.len() },
            ));
        }
        let table = order_ground(rows, self.origin, ("PntList2D", "PntList2D"))?;
        notes.extend(table.warnings);
        Ok(table.points)
    }

    /// The station equations of an alignment (`StaEquation`: `staInternal`
    /// and `staAhead` required, `staBack` the station the road reaches
    /// there when left out), scaled, in file order.
    ///
    /// # Errors
    /// A number that does not parse, decreasing stationing
    /// (`staIncrement="decreasing"`), or equations out of order or whose
    /// back station is not where the road is (see
    /// [`gradewright_geometry::Equations::problem`]), naming the line.
    pub(super) fn equations(
        &self,
        alignment: &AlignmentNodes<'_, '_>,
        scale: f64,
    ) -> Result<Vec<StationEquation>, ReadError> {
        let nodes: Vec<Node<'_, '_>> = alignment.node.children().filter(|n| is(*n, "StaEquation")).collect();
        let mut out: Vec<StationEquation> = Vec::with_capacity(nodes.len());
        for node in &nodes {
            if node.attribute("staIncrement").is_some_and(|v| v.trim() == "decreasing") {
                return Err(self.err(
                    *node,
                    "StaEquation@staIncrement",
                    "stations decreasing ahead of an equation are not supported; Gradewright stations increase",
                ));
            }
            let internal = self.attribute(*node, "staInternal")? * scale;
            let ahead = self.attribute(*node, "staAhead")? * scale;
            let back = match node.attribute("staBack") {
                Some(_) => self.attribute(*node, "staBack")? * scale,
                None => StationEquation::reached(out.last(), internal),
            };
            out.push(StationEquation { internal, back, ahead });
        }
        if let Some((k, why)) = gradewright_geometry::Equations::new(out.clone()).problem() {
            let node = nodes.get(k).copied().unwrap_or(alignment.node);
            return Err(self.err(node, "StaEquation", why));
        }
        Ok(out)
    }

    /// Notes on what an alignment holds that is not read.
    pub(super) fn alignment_notes(&self, alignment: &AlignmentNodes<'_, '_>, notes: &mut Vec<Note>) {
        let equations = alignment.node.children().filter(|n| is(*n, "StaEquation")).count();
        if equations > 0 {
            notes.push(note(
                self.origin,
                NoteKind::StationEquations { alignment: alignment.name.clone(), count: equations },
            ));
        }
        // Another vocabulary's elements in the alignment's profiles (a
        // ProfAlign of another namespace is not LandXML's): named, not read.
        let mut elements: Vec<String> = Vec::new();
        for child in alignment.node.children().filter(|n| is(*n, "Profile")).flat_map(|p| p.children()) {
            if let Some(name) = foreign(child)
                && !elements.contains(&name)
            {
                elements.push(name);
            }
        }
        if !elements.is_empty() {
            notes.push(note(self.origin, NoteKind::Foreign { alignment: alignment.name.clone(), elements }));
        }
    }

    /// The scale from file values to the target and the units read into.
    pub(super) fn target(&self, target: Option<(Units, Foot)>, notes: &mut Vec<Note>) -> (Units, Foot, f64) {
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

pub(super) fn list<S: AsRef<str>>(names: impl Iterator<Item = S>) -> String {
    let names: Vec<String> = names.map(|n| format!("'{}'", excerpt(n.as_ref()))).collect();
    if names.is_empty() { "none".to_owned() } else { names.join(", ") }
}

pub(super) fn file_units(
    lines: &Lines<'_>,
    root: Node<'_, '_>,
    origin: &Path,
    notes: &mut Vec<Note>,
) -> Result<FileUnits, ReadError> {
    let err = |node: Node<'_, '_>, field: &str, message: String| {
        ReadError::new(origin, lines.of(node), field, message)
    };
    let mut all = root.children().filter(|n| is(*n, "Units"));
    let Some(units) = all.next() else {
        return Err(err(root, "Units", "the file has no Units element (LandXML requires one)".to_owned()));
    };
    if let Some(second) = all.next() {
        return Err(err(
            second,
            "Units",
            format!(
                "a second Units element (the first is on line {}); a file states its units once",
                lines.of(units)
            ),
        ));
    }
    let systems: Vec<Node<'_, '_>> =
        units.children().filter(|n| is(*n, "Metric") || is(*n, "Imperial")).collect();
    let Some(&system) = systems.first() else {
        return Err(err(units, "Units", "Units has neither Metric nor Imperial".to_owned()));
    };
    if let Some(&other) = systems.get(1) {
        return Err(err(
            other,
            "Units",
            format!(
                "Units has both {} and {}; a file states one system of units",
                system.tag_name().name(),
                other.tag_name().name()
            ),
        ));
    }
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
