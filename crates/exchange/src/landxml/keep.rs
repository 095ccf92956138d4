//! Writing a project back into the LandXML file it was read from: the
//! file's text with only what Gradewright edits replaced.
//!
//! What is replaced, and only when the project differs from the file:
//! - the content of the design profile's `ProfAlign` (its PVI elements);
//! - the points of the ground line's `ProfSurf` (a new `ProfSurf` when the
//!   project gained a ground line, the element removed when it lost one);
//! - the design speed's attribute (a `Feature` of the alignment when the
//!   file gave none).
//!
//! Everything else — the `CoordGeom`, `StaEquation`s, `Feature`s, other
//! profiles and alignments, the root's attributes, comments and
//! indentation — is written back byte for byte. A project whose profile,
//! ground and speed are as read is written back as the very file.

use std::ops::Range;
use std::path::Path;

use gradewright_document::{Kept, Project};
use roxmltree::Node;

use gradewright_geometry::Pvi;

use super::parse::{AlignmentNodes, Parsed, is};
use super::write::{GROUND_NAME, equation_element, escape, number, point_list, pvi_element};

/// One change to the kept text: `range` replaced by `with`.
struct Edit {
    range: Range<usize>,
    with: String,
}

/// The kept file with `project`'s profile, ground and design speed in it,
/// or `None` when the file cannot take them (it no longer parses, its
/// units are not the project's, or the alignment or profile is not found):
/// the caller then writes a new file.
pub(super) fn written_back(project: &Project, kept: &Kept) -> Option<String> {
    let text: &str = &kept.text;
    let parsed = Parsed::parse(text, Path::new("kept")).ok()?;
    let file = parsed.units;
    if file.units != project.units || file.foot != project.foot || file.scale.to_bits() != 1.0_f64.to_bits() {
        return None;
    }
    let alignments = parsed.alignments();
    let alignment = alignments.iter().find(|a| a.name == kept.alignment)?;
    let (_, _, prof_align) = alignment.profiles.iter().find(|p| p.0 == kept.profile)?;
    let mut notes = Vec::new();
    let mut edits = Vec::new();

    let (read, _) = parsed.pvis(*prof_align, &kept.profile, 1.0, &mut notes).ok()?;
    if read != project.pvis {
        edits.push(profile_edit(text, *prof_align, &read, &project.pvis)?);
    }
    edits.extend(ground_edit(&parsed, alignment, *prof_align, kept, project)?);
    let equations = parsed.equations(alignment, 1.0).ok()?;
    if equations.as_slice() != project.equations.as_slice() {
        edits.extend(equation_edits(text, alignment, *prof_align, project)?);
    }
    let speed = parsed.design_speed(alignment, project.units, &mut notes).ok()?;
    let wanted = project.criteria.design_speed.filter(|v| v.is_finite() && *v > 0.0);
    if let Some(v) = wanted.filter(|v| speed != Some(*v)) {
        edits.push(speed_edit(&parsed, alignment, text, v)?);
    }

    edits.sort_by_key(|e| e.range.start);
    let mut out = String::with_capacity(text.len() + edits.iter().map(|e| e.with.len()).sum::<usize>());
    let mut at = 0;
    for edit in &edits {
        out.push_str(text.get(at..edit.range.start)?);
        out.push_str(&edit.with);
        at = edit.range.end;
    }
    out.push_str(text.get(at..)?);
    Some(out)
}

/// The whitespace that indents the line `pos` is on, if only whitespace
/// comes before it there.
fn indent_at(text: &str, pos: usize) -> &str {
    let before = text.get(..pos).unwrap_or("");
    let line = before.rfind('\n').map_or(before, |k| before.get(k + 1..).unwrap_or(""));
    if line.chars().all(|c| c == ' ' || c == '\t') { line } else { "" }
}

/// The indentation one level in from `outer`: the file's own (the first
/// element child's), else two spaces more.
fn inner_indent(text: &str, node: Node<'_, '_>, outer: &str) -> String {
    node.children()
        .find(Node::is_element)
        .map(|child| indent_at(text, child.range().start))
        .filter(|i| !i.is_empty())
        .map_or_else(|| format!("{outer}  "), str::to_owned)
}

/// The prefix an element's name is written with (`""` or `"lx:"`).
fn prefix_of<'t>(text: &'t str, node: Node<'_, '_>) -> &'t str {
    let start = node.range().start + 1;
    let name = text.get(start..).unwrap_or("");
    let end = name.find(|c: char| c.is_whitespace() || c == '>' || c == '/').unwrap_or(0);
    let qname = name.get(..end).unwrap_or("");
    qname.rfind(':').and_then(|k| qname.get(..=k)).unwrap_or("")
}

/// Where an element's content lies: from its first child to its last.
fn content(node: Node<'_, '_>) -> Option<Range<usize>> {
    Some(node.first_child()?.range().start..node.last_child()?.range().end)
}

/// The design profile's PVI elements in place of the file's: a PVI the
/// file holds unchanged keeps its element as written (a `CircCurve`, a
/// `desc`), the others are written anew.
fn profile_edit(text: &str, prof_align: Node<'_, '_>, read: &[Pvi], pvis: &[Pvi]) -> Option<Edit> {
    let range = content(prof_align)?;
    let outer = indent_at(text, prof_align.range().start);
    let inner = inner_indent(text, prof_align, outer);
    let prefix = prefix_of(text, prof_align);
    // The elements the reader took as PVIs, in its order.
    let elements: Vec<Node<'_, '_>> = prof_align
        .children()
        .filter(|n| is(*n, "PVI") || is(*n, "ParaCurve") || is(*n, "UnsymParaCurve") || is(*n, "CircCurve"))
        .collect();
    if elements.len() != read.len() {
        return None;
    }
    let mut unused: Vec<Option<(Pvi, Node<'_, '_>)>> = read.iter().copied().zip(elements).map(Some).collect();
    let mut with = String::with_capacity(pvis.len() * 48);
    for pvi in pvis {
        with.push('\n');
        with.push_str(&inner);
        let same =
            unused.iter_mut().find(|e| e.as_ref().is_some_and(|(p, _)| p == pvi)).and_then(Option::take);
        match same.and_then(|(_, node)| text.get(node.range())) {
            Some(original) => with.push_str(original),
            None => with.push_str(&pvi_element(pvi, prefix)),
        }
    }
    with.push('\n');
    with.push_str(outer);
    Some(Edit { range, with })
}

/// The ground line's change, if the project's differs from the file's.
fn ground_edit(
    parsed: &Parsed<'_>,
    alignment: &AlignmentNodes<'_, '_>,
    prof_align: Node<'_, '_>,
    kept: &Kept,
    project: &Project,
) -> Option<Option<Edit>> {
    let text = parsed.doc.input_text();
    let surface = kept.surface.as_ref().and_then(|name| alignment.surfaces.iter().find(|s| &s.0 == name));
    let Some((name, node)) = surface else {
        if project.ground.is_empty() {
            return Some(None);
        }
        // A ground line new to the file: a ProfSurf beside the profile.
        let outer = indent_at(text, prof_align.range().start);
        let inner = format!("{outer}  ");
        let prefix = prefix_of(text, prof_align);
        let mut name = GROUND_NAME.to_owned();
        while alignment.surfaces.iter().any(|s| s.0 == name) {
            name.push_str(" (Gradewright)");
        }
        let with = format!(
            "<{prefix}ProfSurf name=\"{}\">\n{inner}<{prefix}PntList2D>{}</{prefix}PntList2D>\n{outer}</{prefix}ProfSurf>\n{outer}",
            escape(&name),
            point_list(&project.ground, &format!("{inner}  ")),
        );
        let at = prof_align.range().start;
        return Some(Some(Edit { range: at..at, with }));
    };
    let read = parsed.ground(*node, name, 1.0, &mut Vec::new()).ok()?;
    if read.as_slice() == &project.ground[..] {
        return Some(None);
    }
    if project.ground.is_empty() {
        // The project dropped its ground line: so does the file (with the
        // indentation of its line).
        return Some(Some(Edit { range: whole_line(text, *node), with: String::new() }));
    }
    let outer = indent_at(text, node.range().start);
    let inner = inner_indent(text, *node, outer);
    let prefix = prefix_of(text, *node);
    let with = format!(
        "\n{inner}<{prefix}PntList2D>{}</{prefix}PntList2D>\n{outer}",
        point_list(&project.ground, &format!("{inner}  "))
    );
    Some(Some(Edit { range: content(*node)?, with }))
}

/// The range of `node`'s line: from the start of its indentation (and the
/// line break before it) to its end, so that removing it leaves no blank
/// line.
fn whole_line(text: &str, node: Node<'_, '_>) -> Range<usize> {
    let range = node.range();
    let start = range.start - indent_at(text, range.start).len();
    let start = if text.get(..start).is_some_and(|b| b.ends_with('\n')) { start - 1 } else { start };
    start..range.end
}

/// The project's station equations in place of the file's: written where
/// the first of the file's was (or before the profile when it had none),
/// the file's others removed.
fn equation_edits(
    text: &str,
    alignment: &AlignmentNodes<'_, '_>,
    prof_align: Node<'_, '_>,
    project: &Project,
) -> Option<Vec<Edit>> {
    let nodes: Vec<Node<'_, '_>> = alignment.node.children().filter(|n| is(*n, "StaEquation")).collect();
    let holder = prof_align.parent_element()?;
    let anchor = nodes.first().copied().unwrap_or(holder);
    let indent = indent_at(text, anchor.range().start);
    let prefix = prefix_of(text, anchor);
    let written: Vec<String> =
        project.equations.as_slice().iter().map(|e| equation_element(e, prefix)).collect();
    let mut edits = Vec::new();
    match nodes.split_first() {
        Some((first, rest)) => {
            if written.is_empty() {
                edits.push(Edit { range: whole_line(text, *first), with: String::new() });
            } else {
                edits.push(Edit { range: first.range(), with: written.join(&format!("\n{indent}")) });
            }
            edits.extend(rest.iter().map(|n| Edit { range: whole_line(text, *n), with: String::new() }));
        }
        None => {
            let at = holder.range().start;
            let with: String = written.iter().map(|w| format!("{w}\n{indent}")).collect();
            edits.push(Edit { range: at..at, with });
        }
    }
    Some(edits)
}

/// The design speed written where the file keeps it, or as a `Feature` of
/// the alignment when the file gives none.
fn speed_edit(
    parsed: &Parsed<'_>,
    alignment: &AlignmentNodes<'_, '_>,
    text: &str,
    speed: f64,
) -> Option<Edit> {
    if let Some((node, attribute)) = parsed.design_speed_node(alignment) {
        let attr = node.attributes().find(|a| a.name() == attribute && a.namespace().is_none())?;
        return Some(Edit { range: attr.range_value(), with: number(speed) });
    }
    let node = alignment.node;
    let outer = indent_at(text, node.range().start);
    let inner = inner_indent(text, node, outer);
    let prefix = prefix_of(text, node);
    // Before the whitespace that ends the alignment's content, so the
    // closing tag keeps its line.
    let last = node.last_child()?;
    let at = if last.is_text() && last.text().is_some_and(|t| t.trim().is_empty()) {
        last.range().start
    } else {
        last.range().end
    };
    let with = format!(
        "\n{inner}<{prefix}Feature name=\"Design criteria\">\n{inner}  <{prefix}Property label=\"designSpeed\" value=\"{}\"/>\n{inner}</{prefix}Feature>",
        number(speed)
    );
    Some(Edit { range: at..at, with })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn indentation_and_prefixes_are_the_files() {
        let text = "<a>\n    <lx:b x='1'/>\n</a>";
        assert_eq!(indent_at(text, 8), "    ");
        assert_eq!(indent_at("<a><b/>", 3), "");
        let doc = roxmltree::Document::parse("<r xmlns:lx='u'>\n\t<lx:b/></r>").expect("xml");
        let b = doc.root_element().first_element_child().expect("b");
        assert_eq!(prefix_of(doc.input_text(), b), "lx:");
        assert_eq!(prefix_of(doc.input_text(), doc.root_element()), "");
    }
}
