//! Located errors in input files (model files and combination tables).
//!
//! The library returns a [`FileError`]; the command line renders it with the offending
//! source line through [`miette`].

use std::ops::Range;
use std::sync::Arc;

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
        if self.line == 0 {
            format!("{}: {}: {}", self.file, self.field, self.message)
        } else {
            format!(
                "{}:{}:{}: {}: {}",
                self.file, self.line, self.column, self.field, self.message
            )
        }
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
            (Some(t), Some(_)) => Some(t as &dyn miette::SourceCode),
            _ => None,
        }
    }

    fn labels(&self) -> Option<Box<dyn Iterator<Item = miette::LabeledSpan> + '_>> {
        let span = self.span.clone()?;
        let label = miette::LabeledSpan::new_with_span(Some(self.field.clone()), span);
        Some(Box::new(std::iter::once(label)))
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
}
