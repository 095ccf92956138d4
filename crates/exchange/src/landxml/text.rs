//! What the reader needs of the file's text itself: how deep its elements
//! nest (checked before parsing, since the parser recurses once per level),
//! the line of a position found in one walk through the text (never a scan
//! from the start per element), and an element's whole character data.

use std::cell::Cell;

use roxmltree::Node;

/// How deep elements may nest. A LandXML profile is about eight levels
/// deep; far deeper files are refused before the parser (which recurses
/// once per level) could run out of stack.
pub(super) const MAX_DEPTH: usize = 256;

/// The 1-based line of the first element that lies deeper than
/// [`MAX_DEPTH`], if one does: a scan of the tags that skips comments,
/// CDATA, processing instructions, declarations and quoted attribute
/// values. The text need not be well-formed (the parser judges that).
pub(super) fn too_deep(text: &str) -> Option<u64> {
    let bytes = text.as_bytes();
    let mut depth = 0usize;
    let mut i = 0;
    let find = |from: usize, what: &[u8]| -> usize {
        bytes
            .get(from..)
            .and_then(|rest| rest.windows(what.len()).position(|w| w == what))
            .map_or(bytes.len(), |p| from + p + what.len())
    };
    while let Some(offset) = bytes.get(i..).and_then(|rest| rest.iter().position(|&b| b == b'<')) {
        let at = i + offset;
        let rest = bytes.get(at..).unwrap_or(&[]);
        i = if rest.starts_with(b"<!--") {
            find(at + 4, b"-->")
        } else if rest.starts_with(b"<![CDATA[") {
            find(at + 9, b"]]>")
        } else if rest.starts_with(b"<?") {
            find(at + 2, b"?>")
        } else if rest.starts_with(b"<!") {
            find(at + 2, b">")
        } else if rest.starts_with(b"</") {
            depth = depth.saturating_sub(1);
            find(at + 2, b">")
        } else {
            // A start tag: to its `>`, past quoted values; `/>` closes it.
            let mut j = at + 1;
            let mut quote = None;
            let mut closed = false;
            while let Some(&b) = bytes.get(j) {
                match (quote, b) {
                    (Some(q), _) if b == q => quote = None,
                    (Some(_), _) => {}
                    (None, b'"' | b'\'') => quote = Some(b),
                    (None, b'>') => {
                        closed = j > at + 1 && bytes.get(j - 1) == Some(&b'/');
                        break;
                    }
                    _ => {}
                }
                j += 1;
            }
            if !closed {
                depth += 1;
                if depth > MAX_DEPTH {
                    let line = bytes.get(..at).map_or(0, |b| b.iter().filter(|&&c| c == b'\n').count());
                    return Some(line as u64 + 1);
                }
            }
            j + 1
        };
    }
    None
}

/// Lines of positions in one text, found by walking on from the last
/// position asked for (positions asked for in order cost the text once).
pub(super) struct Lines<'t> {
    text: &'t str,
    at: Cell<(usize, u64)>,
}

impl<'t> Lines<'t> {
    pub(super) fn new(text: &'t str) -> Self {
        Self { text, at: Cell::new((0, 1)) }
    }

    /// The 1-based line of byte `position`.
    pub(super) fn line(&self, position: usize) -> u64 {
        let (mut from, mut line) = self.at.get();
        if position < from {
            (from, line) = (0, 1);
        }
        let position = position.min(self.text.len());
        let newlines =
            self.text.as_bytes().get(from..position).map_or(0, |b| b.iter().filter(|&&c| c == b'\n').count());
        line += newlines as u64;
        self.at.set((position, line));
        line
    }

    /// The line of `node`'s start.
    pub(super) fn of(&self, node: Node<'_, '_>) -> u64 {
        self.line(node.range().start)
    }
}

/// An element's character data, whole: its text children joined, with the
/// byte position in the file where each piece starts (comments and
/// processing instructions between them are not part of the data).
pub(super) struct ElementText {
    pub(super) text: String,
    /// (offset in `text`, position in the file) of each piece.
    pub(super) pieces: Vec<(usize, usize)>,
    /// Whether comments or processing instructions were left out between
    /// pieces of the data.
    pub(super) interrupted: bool,
}

impl ElementText {
    pub(super) fn of(node: Node<'_, '_>) -> Self {
        let mut out = Self { text: String::new(), pieces: Vec::new(), interrupted: false };
        let mut between = false;
        for child in node.children() {
            if child.is_text() {
                let piece = child.text().unwrap_or("");
                if between && !out.text.trim().is_empty() && !piece.trim().is_empty() {
                    out.interrupted = true;
                }
                between = false;
                out.pieces.push((out.text.len(), child.range().start));
                out.text.push_str(piece);
            } else if child.is_comment() || child.is_pi() {
                between = true;
            }
        }
        out
    }

    /// The line of byte `offset` of the joined text, with `lines`: the line
    /// its piece starts on, plus the newlines before it in the piece.
    pub(super) fn line(&self, lines: &Lines<'_>, offset: usize) -> u64 {
        let k = self.pieces.partition_point(|(start, _)| *start <= offset).saturating_sub(1);
        let Some(&(start, position)) = self.pieces.get(k) else { return lines.line(0) };
        lines.line(position + (offset - start))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn depth_is_counted_past_comments_quotes_and_empty_elements() {
        let shallow =
            r#"<?xml version="1.0"?><!-- <a><a> --><L a="x>y" b='/>'><b/><c><![CDATA[<d><d>]]></c></L>"#;
        assert_eq!(too_deep(shallow), None);
        let deep = format!("<L>\n{}{}</L>", "<a>".repeat(MAX_DEPTH), "</a>".repeat(MAX_DEPTH));
        assert_eq!(too_deep(&deep), Some(2));
        let just = format!("{}{}", "<a>".repeat(MAX_DEPTH), "</a>".repeat(MAX_DEPTH));
        assert_eq!(too_deep(&just), None);
    }

    #[test]
    fn lines_walk_on_and_back() {
        let text = "a\nb\nc\nd";
        let lines = Lines::new(text);
        assert_eq!((lines.line(0), lines.line(2), lines.line(6), lines.line(4)), (1, 2, 4, 3));
    }
}
