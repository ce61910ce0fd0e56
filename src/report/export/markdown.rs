//! The Markdown format (`md`): a calculation-package page.

use super::exporter::{CheckView, CompareView, ExportError, Exporter, Sink, whole};
use crate::caution::CAUTION;
use crate::report::check::{DETAIL_HEADING, detail_text};
use crate::report::{approx, compare, summary};

/// A calculation-package page in Markdown.
pub struct Markdown;

impl Exporter for Markdown {
    fn name(&self) -> &'static str {
        "md"
    }

    /// The summary page; with `detail`, the per-case detail as a text block; then the
    /// approximate check as a text block.
    fn check(&self, doc: &CheckView, out: &mut dyn Sink) -> Result<(), ExportError> {
        let s = &doc.summary;
        let mut text = summary::markdown(s);
        if s.detail {
            text.push_str(&format!(
                "\n## {DETAIL_HEADING}\n\n```text\n{}```\n\n{}\n",
                detail_text(s.model, s.report),
                CAUTION
            ));
        }
        if let Some(a) = doc.approximate {
            text.push_str(&format!(
                "\n## Approximate check\n\n```text\n{}```\n",
                approx::render_text(s.model, a)
            ));
        }
        whole(out, &text)
    }

    fn compare(&self, doc: &CompareView, out: &mut dyn Sink) -> Result<(), ExportError> {
        whole(out, &compare::markdown(doc))
    }
}
