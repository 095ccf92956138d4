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

/// The encoding a file's XML declaration names, if it names one.
fn declared_encoding(bytes: &[u8]) -> Option<String> {
    let head = bytes.get(..bytes.len().min(200))?;
    let end = head.windows(2).position(|w| w == b"?>")?;
    let decl = std::str::from_utf8(head.get(..end)?).ok()?;
    let decl = decl.strip_prefix("<?xml")?;
    let at = decl.find("encoding")?;
    let rest = decl.get(at + "encoding".len()..)?.trim_start().strip_prefix('=')?.trim_start();
    let quote = rest.chars().next().filter(|c| *c == '"' || *c == '\'')?;
    let value = rest.get(1..)?;
    Some(value.get(..value.find(quote)?)?.to_owned())
}

/// A LandXML file's text: UTF-8 (a byte-order mark dropped), or
/// ISO-8859-1 when its declaration says so, converted (each byte is the
/// character of that code point) with the declaration rewritten to UTF-8 —
/// the text is what a writer writes back, and it writes UTF-8. The second
/// value names the encoding converted from.
///
/// # Errors
/// The file cannot be read, declares an encoding other than these, or is
/// not in the encoding it declares.
pub(super) fn read_xml(
    mut reader: impl std::io::Read,
    origin: &std::path::Path,
) -> Result<(String, Option<String>), crate::ReadError> {
    let mut bytes = Vec::new();
    reader.read_to_end(&mut bytes).map_err(|e| crate::ReadError::io(origin, e))?;
    let body = bytes.strip_prefix(b"\xEF\xBB\xBF".as_slice()).unwrap_or(&bytes);
    let encoding = declared_encoding(body);
    let latin = encoding.as_deref().is_some_and(|e| {
        ["ISO-8859-1", "ISO8859-1", "latin1", "ISO_8859-1", "l1"].iter().any(|n| n.eq_ignore_ascii_case(e))
    });
    if latin {
        let text: String = body.iter().map(|&b| char::from(b)).collect();
        let declared = encoding.clone().unwrap_or_default();
        // Only the declaration's own value is rewritten.
        let end = text.find("?>").unwrap_or(0);
        let head = text.get(..end).unwrap_or("").replacen(&declared, "UTF-8", 1);
        let text = format!("{head}{}", text.get(end..).unwrap_or(""));
        return Ok((text, encoding));
    }
    if let Some(other) =
        encoding.as_deref().filter(|e| !e.eq_ignore_ascii_case("UTF-8") && !e.eq_ignore_ascii_case("UTF8"))
    {
        return Err(crate::ReadError::new(
            origin,
            1,
            "xml",
            format!(
                "the file declares encoding '{}'; Gradewright reads UTF-8 and ISO-8859-1 (convert the file to UTF-8)",
                gradewright_geometry::excerpt(other)
            ),
        ));
    }
    match std::str::from_utf8(body) {
        Ok(text) => Ok((text.to_owned(), None)),
        Err(e) => {
            let line =
                body.get(..e.valid_up_to()).map_or(0, |b| b.iter().filter(|&&c| c == b'\n').count()) + 1;
            Err(crate::ReadError::new(
                origin,
                line as u64,
                "xml",
                "the file is not UTF-8 text (declare its encoding if it is ISO-8859-1)",
            ))
        }
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
