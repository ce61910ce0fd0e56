//! The exporter interface: one [`Exporter`] per output format, one method per document
//! plumbline writes, and the [`Sink`] every exporter writes into.
//!
//! A document is read from its view ([`CheckView`], [`SolveView`], [`CompareView`],
//! [`CasesView`]); the exporter decides its form and writes it part by part: a document
//! that is one stream (text, Markdown, JSON, HTML, the factored cases' CSV) is one part
//! named `""`, a document of several files (CSV: one per table) is one part per file,
//! named after it (`members.csv`). The sink decides where the parts go: memory
//! ([`Memory`]), a file or a directory, or standard output (`app`). A part is written
//! straight into its destination, so a large JSON document or CSV table is never held
//! whole in memory on its way to a file.

use std::io::{self, Write};

pub use crate::report::combos::CasesView;
pub use crate::report::compare::CompareView;
pub use crate::report::page::CheckView;
pub use crate::report::solve::SolveView;

/// The documents plumbline writes, one [`Exporter`] method each.
#[derive(Debug, Clone, Copy, PartialEq, Eq, strum::Display)]
pub enum Document {
    /// The check of a model (`plumbline check`, `plumbline report`).
    #[strum(to_string = "the check report")]
    Check,
    /// One load case's first-order solution (`plumbline solve`).
    #[strum(to_string = "a load case's solution")]
    Solve,
    /// The variants of a check side by side (`plumbline compare`).
    #[strum(to_string = "the comparison of variants")]
    Compare,
    /// The factored cases of a model (`plumbline cases`).
    #[strum(to_string = "the list of factored cases")]
    Cases,
}

/// Why a document could not be exported.
#[derive(Debug, thiserror::Error)]
pub enum ExportError {
    /// The format has no form of this document.
    #[error("the {format} format cannot write {document}")]
    Unsupported {
        format: &'static str,
        document: Document,
    },
    /// No format of this name is registered.
    #[error("no output format \"{name}\": expected one of {known}")]
    UnknownFormat { name: String, known: String },
    /// A part could not be written.
    #[error("could not write {path}: {source}")]
    Write {
        path: String,
        #[source]
        source: io::Error,
    },
}

/// The error of a format that has no form of `document`: what every [`Exporter`] method
/// returns unless the format implements it.
pub fn unsupported(format: &'static str, document: Document) -> ExportError {
    ExportError::Unsupported { format, document }
}

/// What an exporter writes into.
pub trait Sink {
    /// Write one part of a document: `name` is `""` for a document that is one stream, or
    /// the file name of one of its files. `write` produces the part's bytes into the
    /// writer it is given.
    fn part(
        &mut self,
        name: &str,
        write: &mut dyn FnMut(&mut dyn Write) -> io::Result<()>,
    ) -> Result<(), ExportError>;
}

/// Write `text` as the one part of a document.
pub fn whole(out: &mut dyn Sink, text: &str) -> Result<(), ExportError> {
    out.part("", &mut |w| w.write_all(text.as_bytes()))
}

/// A sink that keeps every part in memory, in order: `(name, text)`.
#[derive(Debug, Default)]
pub struct Memory {
    pub files: Vec<(String, String)>,
}

impl Sink for Memory {
    fn part(
        &mut self,
        name: &str,
        write: &mut dyn FnMut(&mut dyn Write) -> io::Result<()>,
    ) -> Result<(), ExportError> {
        let mut bytes = Vec::new();
        write(&mut bytes).map_err(|source| ExportError::Write {
            path: format!("memory ({name})"),
            source,
        })?;
        let text = String::from_utf8(bytes)
            .unwrap_or_else(|e| String::from_utf8_lossy(e.as_bytes()).into_owned());
        self.files.push((name.to_string(), text));
        Ok(())
    }
}

/// An output format: one method per document. A method the format does not implement
/// returns [`ExportError::Unsupported`]; a new format is one type implementing the
/// documents it has a form of, listed in the registry (`report/export/registry.rs`).
pub trait Exporter: Sync {
    /// The format's name on the command line (`--format NAME`).
    fn name(&self) -> &'static str;

    /// The check of a model: summary, per-case detail (with `summary.detail`), the
    /// approximate check when there is one.
    fn check(&self, doc: &CheckView, out: &mut dyn Sink) -> Result<(), ExportError> {
        let _ = (doc, out);
        Err(unsupported(self.name(), Document::Check))
    }

    /// One load case's first-order solution.
    fn solve(&self, doc: &SolveView, out: &mut dyn Sink) -> Result<(), ExportError> {
        let _ = (doc, out);
        Err(unsupported(self.name(), Document::Solve))
    }

    /// The variants of a check side by side.
    fn compare(&self, doc: &CompareView, out: &mut dyn Sink) -> Result<(), ExportError> {
        let _ = (doc, out);
        Err(unsupported(self.name(), Document::Compare))
    }

    /// The factored cases of a model.
    fn cases(&self, doc: &CasesView, out: &mut dyn Sink) -> Result<(), ExportError> {
        let _ = (doc, out);
        Err(unsupported(self.name(), Document::Cases))
    }
}
