//! Located errors in input files (model files and combination tables), and reading those
//! files safely.
//!
//! The library returns a [`FileError`]; the command line renders it with the offending
//! source line through [`miette`]. Whatever the input, the rendering stays small: a line
//! longer than [`SNIPPET_WINDOW`] bytes is shown as a window around the error's column,
//! and the field and message of the headline are cut to [`HEADLINE_FIELD_MAX`] and
//! [`HEADLINE_MESSAGE_MAX`] characters. [`read_input`] reads a file whole, refusing one
//! larger than [`crate::limits::MAX_FILE_BYTES`], and [`decode_utf8`] names the line and
//! byte where a file stops being UTF-8.

use std::io::Read;
use std::ops::Range;
use std::path::Path;
use std::sync::Arc;

use miette::{MietteError, MietteSpanContents, SourceCode, SourceSpan, SpanContents};

use crate::limits::MAX_FILE_BYTES;

/// Bytes of a source line shown on each side of an error's column when the line is longer
/// than this (a 64 MiB line must not be copied to the terminal).
pub const SNIPPET_WINDOW: usize = 120;

/// Characters of the field name kept in a headline.
pub const HEADLINE_FIELD_MAX: usize = 120;

/// Characters of the message kept in a headline (messages may quote the user's text).
pub const HEADLINE_MESSAGE_MAX: usize = 400;

/// An error located in an input file: file, line, column (1-based) and the field concerned.
#[derive(Debug, Clone, thiserror::Error)]
#[error("{}", self.headline())]
pub struct FileError {
    pub file: String,
    pub line: usize,
    pub column: usize,
    /// Dotted path of the field, e.g. `member[3].section` or `combination[2].terms`.
    pub field: String,
    /// What was wrong and what was expected, lowercase, no trailing period.
    pub message: String,
    /// What to try, where a fix is known.
    pub help: Option<String>,
    /// Byte range in the source, when known.
    pub span: Option<Range<usize>>,
    /// The whole source text, for rendering a snippet.
    pub source_text: Option<Arc<str>>,
}

impl FileError {
    /// `file:line:column: field: message`, without the position when there is none (a
    /// table named on the command line that does not exist, an unreadable file).
    pub fn headline(&self) -> String {
        let field = clip(&self.field, HEADLINE_FIELD_MAX);
        let message = clip(&self.message, HEADLINE_MESSAGE_MAX);
        if self.line == 0 {
            format!("{}: {field}: {message}", self.file)
        } else {
            format!(
                "{}:{}:{}: {field}: {message}",
                self.file, self.line, self.column
            )
        }
    }

    /// A file-level error with no position (unreadable, too large).
    pub fn whole_file(file: &str, message: impl Into<String>) -> FileError {
        FileError {
            file: file.to_string(),
            line: 0,
            column: 0,
            field: "(file)".to_string(),
            message: message.into(),
            help: None,
            span: None,
            source_text: None,
        }
    }

    /// The span shown in the snippet: the error's span, cut to the end of its first line
    /// and to at most [`SNIPPET_WINDOW`] bytes, on character boundaries.
    fn shown_span(&self) -> Option<Range<usize>> {
        let text = self.source_text.as_deref()?;
        let span = self.span.clone()?;
        let start = text.floor_char_boundary(span.start.min(text.len()));
        let line_end = text[start..].find('\n').map_or(text.len(), |k| start + k);
        let end = span.end.clamp(start, line_end.min(start + SNIPPET_WINDOW));
        Some(start..text.floor_char_boundary(end))
    }

    /// A located error; `span` is a byte range in `text` (line and column are derived).
    pub fn at(
        file: &str,
        text: &Arc<str>,
        span: Option<Range<usize>>,
        field: impl Into<String>,
        message: impl Into<String>,
    ) -> FileError {
        let (line, column) = span.as_ref().map_or((0, 0), |s| line_col(text, s.start));
        FileError {
            file: file.to_string(),
            line,
            column,
            field: field.into(),
            message: message.into(),
            help: None,
            span,
            source_text: Some(text.clone()),
        }
    }

    /// The same error with a hint on how to fix it.
    pub fn with_help(mut self, help: impl Into<String>) -> FileError {
        self.help = Some(help.into());
        self
    }
}

/// `s` cut to at most `max` characters, with `…` where it was cut.
pub fn clip(s: &str, max: usize) -> std::borrow::Cow<'_, str> {
    match s.char_indices().nth(max) {
        None => s.into(),
        Some((k, _)) => format!("{}…", &s[..k]).into(),
    }
}

/// Read an input file whole and decode it as UTF-8. A file larger than
/// [`MAX_FILE_BYTES`] is refused without reading the rest of it (a device that never ends
/// included); `what` names the kind of file in messages ("model file").
pub fn read_input(path: &Path, what: &str) -> Result<String, FileError> {
    let file = path.display().to_string();
    let unreadable = |e: std::io::Error| {
        FileError::whole_file(&file, format!("cannot read the {what}: {e}"))
            .with_help("expected a readable UTF-8 TOML file")
    };
    let mut bytes = Vec::new();
    std::fs::File::open(path)
        .and_then(|f| f.take(MAX_FILE_BYTES as u64 + 1).read_to_end(&mut bytes))
        .map_err(unreadable)?;
    if bytes.len() > MAX_FILE_BYTES {
        return Err(FileError::whole_file(
            &file,
            format!(
                "the {what} is larger than the limit of {} MiB (MAX_FILE_BYTES)",
                MAX_FILE_BYTES >> 20
            ),
        )
        .with_help("split the input, or check that the right file was named"));
    }
    decode_utf8(bytes, &file)
}

/// The text of `bytes`, or an error naming the line and the byte (in the line and in the
/// file) where UTF-8 decoding failed; the snippet shows the line up to that byte.
pub fn decode_utf8(bytes: Vec<u8>, file: &str) -> Result<String, FileError> {
    String::from_utf8(bytes).map_err(|e| {
        let bytes = e.as_bytes();
        let bad = e.utf8_error().valid_up_to();
        let line_start = bytes[..bad]
            .iter()
            .rposition(|&b| b == b'\n')
            .map_or(0, |k| k + 1);
        let line_end = bytes[bad..]
            .iter()
            .position(|&b| b == b'\n')
            .map_or(bytes.len(), |k| bad + k);
        // The valid text before the bad byte, then the rest of its line made readable.
        let shown = format!(
            "{}{}",
            String::from_utf8_lossy(&bytes[..bad]),
            String::from_utf8_lossy(&bytes[bad..line_end])
        );
        let text: Arc<str> = Arc::from(shown);
        let end = text.ceil_char_boundary(bad + 1);
        let (line, _) = line_col(&text, bad);
        FileError::at(
            file,
            &text,
            Some(bad..end),
            "(file)",
            format!(
                "not valid UTF-8: byte 0x{:02X} at line {line}, byte {} of the line \
                 (byte {} of the file)",
                bytes[bad],
                bad - line_start + 1,
                bad + 1
            ),
        )
        .with_help("save the file as UTF-8 text")
    })
}

/// 1-based line and column (in characters) of byte offset `pos` in `text`.
pub fn line_col(text: &str, pos: usize) -> (usize, usize) {
    let pos = pos.min(text.len());
    let before = &text[..text.floor_char_boundary(pos)];
    let line = before.matches('\n').count() + 1;
    let col = before.rsplit('\n').next().map_or(0, |l| l.chars().count()) + 1;
    (line, col)
}

impl miette::Diagnostic for FileError {
    fn help<'a>(&'a self) -> Option<Box<dyn std::fmt::Display + 'a>> {
        self.help
            .as_ref()
            .map(|h| Box::new(h) as Box<dyn std::fmt::Display>)
    }

    fn source_code(&self) -> Option<&dyn miette::SourceCode> {
        match (&self.source_text, &self.span) {
            (Some(_), Some(_)) => Some(self as &dyn miette::SourceCode),
            _ => None,
        }
    }

    fn labels(&self) -> Option<Box<dyn Iterator<Item = miette::LabeledSpan> + '_>> {
        let span = self.shown_span()?;
        let label = miette::LabeledSpan::new_with_span(
            Some(clip(&self.field, HEADLINE_FIELD_MAX).into_owned()),
            span,
        );
        Some(Box::new(std::iter::once(label)))
    }
}

/// The snippet of an error: the lines around the span when they are short, or a window of
/// [`SNIPPET_WINDOW`] bytes on each side of the span on its own line when that line is
/// long. Line numbers stay those of the file.
impl SourceCode for FileError {
    fn read_span<'a>(
        &'a self,
        span: &SourceSpan,
        context_lines_before: usize,
        context_lines_after: usize,
    ) -> Result<Box<dyn SpanContents<'a> + 'a>, MietteError> {
        let text: &'a str = self
            .source_text
            .as_deref()
            .ok_or(MietteError::OutOfBounds)?;
        let (start, end) = (span.offset(), span.offset() + span.len());
        if end > text.len() {
            return Err(MietteError::OutOfBounds);
        }
        let line_start = text[..start].rfind('\n').map_or(0, |k| k + 1);
        let line_end = text[start..].find('\n').map_or(text.len(), |k| start + k);
        let short = |a: usize, b: usize| b - a <= 2 * SNIPPET_WINDOW;
        if short(line_start, line_end) && end <= line_end + 1 {
            // Short line: take the context lines too, each as long as the window at most.
            let before = text[..line_start]
                .rsplit_terminator('\n')
                .take(context_lines_before)
                .take_while(|l| l.len() <= 2 * SNIPPET_WINDOW)
                .map(|l| l.len() + 1)
                .sum::<usize>();
            let after = text[line_end.min(text.len())..]
                .split_terminator('\n')
                .skip(1)
                .take(context_lines_after)
                .take_while(|l| l.len() <= 2 * SNIPPET_WINDOW)
                .map(|l| l.len() + 1)
                .sum::<usize>();
            let from = line_start - before;
            let to = (line_end + after).min(text.len());
            let (line, _) = line_col(text, from);
            return Ok(Box::new(MietteSpanContents::new(
                &text.as_bytes()[from..to],
                (from, to - from).into(),
                line - 1,
                0,
                line - 1 + text[from..to].matches('\n').count() + 1,
            )));
        }
        // Long line: a window around the span, on character boundaries.
        let from = text.floor_char_boundary(start.saturating_sub(SNIPPET_WINDOW).max(line_start));
        let to = text.ceil_char_boundary((end + SNIPPET_WINDOW).min(line_end).max(start));
        let (line, column) = line_col(text, from);
        Ok(Box::new(MietteSpanContents::new(
            &text.as_bytes()[from..to],
            (from, to - from).into(),
            line - 1,
            column - 1,
            line,
        )))
    }
}

/// The name of a table header line, without its trailing comment: `frame` for `[frame]`,
/// and with 1-based indices for arrays of tables, counted over the text `before` it:
/// `section[2]` for the second `[[section]]`, `case[3].member_load[1]` for the first
/// `[[case.member_load]]` of the third `[[case]]`.
fn header_path(before: &str, line: &str) -> String {
    let name = |l: &str| -> Option<(bool, String)> {
        let l = l.split('#').next().unwrap_or("").trim();
        let array = l.starts_with("[[");
        let inner = l
            .strip_prefix('[')?
            .split(']')
            .next()?
            .trim_start_matches('[');
        let parts: Vec<&str> = inner
            .split('.')
            .map(|p| p.trim().trim_matches('"'))
            .collect();
        Some((array, parts.join(".")))
    };
    let Some((array, path)) = name(line) else {
        return "(toml)".to_string();
    };
    if !array {
        return path;
    }
    // Count the array-of-tables headers before this one; a header resets the counts of the
    // tables nested under it.
    let mut counts: std::collections::HashMap<String, usize> = std::collections::HashMap::new();
    let mut bump = |p: &str| {
        *counts.entry(p.to_string()).or_default() += 1;
        let nested = format!("{p}.");
        counts.retain(|k, _| !k.starts_with(&nested));
    };
    for l in before.lines().filter(|l| l.trim_start().starts_with("[[")) {
        if let Some((true, p)) = name(l) {
            bump(&p);
        }
    }
    bump(&path);
    let parts: Vec<&str> = path.split('.').collect();
    (1..=parts.len())
        .map(|n| {
            let prefix = parts[..n].join(".");
            match counts.get(&prefix) {
                Some(c) => format!("{}[{c}]", parts[n - 1]),
                None => parts[n - 1].to_string(),
            }
        })
        .collect::<Vec<_>>()
        .join(".")
}

/// The key assigned on the line holding byte `pos` (`key = ...`), or the table header
/// (`[frame]`, `[[case.member_load]]`), or `(toml)`.
pub(crate) fn key_on_line(text: &str, pos: usize) -> String {
    let pos = text.floor_char_boundary(pos.min(text.len()));
    let start = text[..pos].rfind('\n').map_or(0, |k| k + 1);
    let line = text[start..].lines().next().unwrap_or("").trim();
    let is_key = |k: &str| {
        !k.is_empty()
            && k.chars()
                .all(|c| c.is_alphanumeric() || matches!(c, '_' | '-' | '.' | '"'))
    };
    if line.starts_with('[') {
        return header_path(&text[..start], line);
    }
    match line.split_once('=') {
        Some((k, _)) if is_key(k.trim()) => k.trim().to_string(),
        _ => "(toml)".to_string(),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn line_and_column_are_one_based() {
        let t = "a = 1\nbb = 2\n";
        assert_eq!(line_col(t, 0), (1, 1));
        assert_eq!(line_col(t, 6), (2, 1));
        assert_eq!(line_col(t, 11), (2, 6));
    }

    fn rendered(e: &FileError) -> String {
        let mut out = String::new();
        miette::GraphicalReportHandler::new_themed(miette::GraphicalTheme::unicode_nocolor())
            .render_report(&mut out, e)
            .unwrap();
        out
    }

    #[test]
    fn a_huge_line_is_shown_as_a_window_around_the_column() {
        let long = "x".repeat(1_000_000);
        let text: Arc<str> = Arc::from(format!("a = 1\nkey = \"{long}\" # end\nb = 2\n"));
        let at = 6 + 7 + 500_000;
        let e = FileError::at("m.toml", &text, Some(at..at + 3), "key", "bad value");
        let out = rendered(&e);
        assert!(
            out.len() < 4 * (2 * SNIPPET_WINDOW + 200),
            "{} bytes",
            out.len()
        );
        assert!(out.contains("m.toml:2:"), "{out}");
        assert!(
            out.contains(" 2 │"),
            "the window keeps the file's line number:\n{out}"
        );
    }

    #[test]
    fn a_short_line_is_shown_whole_with_its_neighbours() {
        let text: Arc<str> = Arc::from("a = 1\nkey = \"bad\"\nb = 2\n");
        let e = FileError::at("m.toml", &text, Some(12..15), "key", "bad value");
        let out = rendered(&e);
        for l in ["a = 1", "key = \"bad\"", "b = 2"] {
            assert!(out.contains(l), "{out}");
        }
    }

    #[test]
    fn a_span_over_many_lines_is_cut_to_its_first_line() {
        let text: Arc<str> = Arc::from("[frame]\n".to_string() + &"x = 1\n".repeat(100_000));
        let e = FileError::at("m.toml", &text, Some(0..text.len()), "frame", "too big");
        assert!(rendered(&e).len() < 2_000);
    }

    #[test]
    fn non_utf8_input_names_line_and_byte() {
        let bytes = b"a = 1\nb = \"caf\xE9\"\n".to_vec();
        let e = decode_utf8(bytes, "m.toml").unwrap_err();
        assert_eq!(e.line, 2);
        assert!(
            e.message.contains("line 2, byte 9 of the line"),
            "{}",
            e.message
        );
        assert!(e.message.contains("byte 15 of the file"), "{}", e.message);
        assert!(rendered(&e).contains("caf"));
    }

    #[test]
    fn headline_parts_are_clipped() {
        let e = FileError::whole_file("m.toml", "y".repeat(10_000));
        assert!(e.headline().chars().count() < HEADLINE_MESSAGE_MAX + 40);
    }
}
