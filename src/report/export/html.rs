//! The HTML format (`html`): one self-contained page (inline CSS and SVG) that reads on
//! screen and prints to PDF.

use super::exporter::{CheckView, CompareView, ExportError, Exporter, Sink, whole};
use crate::report::compare;

/// A self-contained HTML page.
pub struct Html;

impl Exporter for Html {
    fn name(&self) -> &'static str {
        "html"
    }

    /// The report of `plumbline report`: drawings of the frame, its loads and envelopes,
    /// and the summary's tables (`report/html.rs`). The per-case detail and the approximate
    /// check are not part of it.
    fn check(&self, doc: &CheckView, out: &mut dyn Sink) -> Result<(), ExportError> {
        whole(out, &crate::report::html::render(&doc.summary, doc.cases))
    }

    /// The comparison with its ratio chart.
    fn compare(&self, doc: &CompareView, out: &mut dyn Sink) -> Result<(), ExportError> {
        whole(out, &compare::html(doc))
    }
}
