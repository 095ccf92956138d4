//! The sheet as a tree, between its layout and its SVG: each part of the
//! sheet (paper, grid, profile, labels, bands, sight band, match lines,
//! findings, title block, cautions) is a list of elements with their
//! attributes in paper millimetres, written out by [`SheetTree::to_svg`].

use std::fmt::Write as _;

/// One drawn element: its SVG name, its attributes in order, its children
/// and its text.
#[derive(Clone, Debug, PartialEq)]
pub struct Element {
    /// `rect`, `line`, `path`, `text`, `g`, …
    pub name: &'static str,
    /// Attributes, in the order they are written.
    pub attrs: Vec<(&'static str, String)>,
    /// Elements inside it.
    pub children: Vec<Element>,
    /// Its text (escaped when written).
    pub text: Option<String>,
}

impl Element {
    /// An element with nothing in it yet.
    pub fn new(name: &'static str) -> Self {
        Self { name, attrs: Vec::new(), children: Vec::new(), text: None }
    }

    /// A text element saying `text`.
    pub fn text(text: impl Into<String>) -> Self {
        Self { text: Some(text.into()), ..Self::new("text") }
    }

    /// With attribute `name` set to `value` (written as it displays).
    #[must_use]
    #[allow(clippy::needless_pass_by_value)] // numbers, and strings made for it
    pub fn a(mut self, name: &'static str, value: impl ToString) -> Self {
        self.attrs.push((name, value.to_string()));
        self
    }

    /// With attribute `name` set to `value` only when there is one.
    #[must_use]
    pub fn maybe(self, name: &'static str, value: Option<impl ToString>) -> Self {
        match value {
            Some(v) => self.a(name, v),
            None => self,
        }
    }

    /// With `children` inside it.
    #[must_use]
    pub fn holding(mut self, children: Vec<Element>) -> Self {
        self.children = children;
        self
    }

    /// The value of attribute `name`, if set.
    pub fn attr(&self, name: &str) -> Option<&str> {
        self.attrs.iter().find(|(n, _)| *n == name).map(|(_, v)| v.as_str())
    }

    fn write(&self, out: &mut String) {
        let _ = write!(out, "<{}", self.name);
        for (name, value) in &self.attrs {
            let _ = write!(out, r#" {name}="{value}""#);
        }
        let container = matches!(self.name, "g" | "defs" | "clipPath");
        match (&self.text, self.children.is_empty()) {
            (None, true) if !container => out.push_str("/>"),
            (text, _) => {
                out.push('>');
                for child in &self.children {
                    child.write(out);
                }
                if let Some(text) = text {
                    out.push_str(&escape(text));
                }
                let _ = write!(out, "</{}>", self.name);
            }
        }
    }
}

/// A length on paper to the micrometre, as the sheet writes coordinates.
pub fn mm(value: f64) -> String {
    format!("{value:.3}")
}

/// The most characters of any one text on a sheet.
const MAX_TEXT: usize = 2000;

/// Text made safe inside an element: what XML cannot hold (control
/// characters) replaced visibly, the markup characters escaped, and no
/// text longer than [`MAX_TEXT`].
fn escape(text: &str) -> String {
    gradewright_geometry::visible(text, MAX_TEXT)
        .replace('&', "&amp;")
        .replace('<', "&lt;")
        .replace('>', "&gt;")
        .replace('"', "&quot;")
}

/// What a part of the sheet is.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum PartKind {
    /// The paper, its border and the profile frame's clip.
    Paper,
    /// The station and elevation grid, the frame and the axis labels.
    Grid,
    /// The profile: hatching, lines and markers, clipped to the frame.
    Profile,
    /// The labels placed apart, with their leaders.
    Labels,
    /// The bands under the profile: elevations, ground, cut and fill.
    Bands,
    /// The sight-distance band.
    SightBand,
    /// The match lines where the profile goes on on another sheet.
    MatchLines,
    /// The list of findings.
    Findings,
    /// The title block.
    TitleBlock,
    /// The cautions.
    Caution,
}

/// One part of a sheet.
#[derive(Clone, Debug, PartialEq)]
pub struct Part {
    /// What it is.
    pub kind: PartKind,
    /// What it draws, in order.
    pub elements: Vec<Element>,
}

/// One sheet, laid out: its size and its parts in drawing order.
#[derive(Clone, Debug, PartialEq)]
pub struct SheetTree {
    /// Width, mm.
    pub width: f64,
    /// Height, mm.
    pub height: f64,
    /// The parts, in drawing order.
    pub parts: Vec<Part>,
}

impl SheetTree {
    /// The part of `kind`, if the sheet has one.
    pub fn part(&self, kind: PartKind) -> Option<&Part> {
        self.parts.iter().find(|p| p.kind == kind)
    }

    /// The sheet as SVG text, in millimetres.
    pub fn to_svg(&self) -> String {
        let (w, h) = (self.width, self.height);
        let mut svg = String::new();
        let _ = write!(
            svg,
            r#"<svg xmlns="http://www.w3.org/2000/svg" width="{w}mm" height="{h}mm" viewBox="0 0 {w} {h}" font-family="Ubuntu, sans-serif">"#
        );
        for element in self.parts.iter().flat_map(|p| &p.elements) {
            element.write(&mut svg);
        }
        svg.push_str("</svg>\n");
        svg
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn elements_write_as_svg() {
        let g = Element::new("g").a("stroke", "#000").holding(vec![
            Element::new("line").a("x1", mm(1.0)).a("y1", 2.5),
            Element::text("a < b").a("x", 3),
        ]);
        let tree = SheetTree {
            width: 10.0,
            height: 5.0,
            parts: vec![Part { kind: PartKind::Grid, elements: vec![g] }],
        };
        assert_eq!(
            tree.to_svg(),
            "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"10mm\" height=\"5mm\" viewBox=\"0 0 10 5\" \
             font-family=\"Ubuntu, sans-serif\"><g stroke=\"#000\"><line x1=\"1.000\" y1=\"2.5\"/>\
             <text x=\"3\">a &lt; b</text></g></svg>\n"
        );
    }
}
