//! The text format (`table`): aligned plain-text tables in the model's units, fitted to
//! the text width.

use super::exporter::{
    CasesView, CheckView, CompareView, ExportError, Exporter, Sink, SolveView, whole,
};
use crate::caution::CAUTION;
use crate::report::check::{DETAIL_HEADING, detail_text};
use crate::report::{approx, combos, compare, fit_lines, solve, summary, text_width};

/// Aligned plain-text tables in the model's units.
pub struct Text;

impl Exporter for Text {
    fn name(&self) -> &'static str {
        "table"
    }

    /// The one-page summary; with `detail`, the per-case detail under its heading; then
    /// the approximate check.
    fn check(&self, doc: &CheckView, out: &mut dyn Sink) -> Result<(), ExportError> {
        let s = &doc.summary;
        let mut text = summary::text(s);
        if s.detail {
            let d = detail_text(s.model, s.report);
            let d = fit_lines(&format!("{d}{CAUTION}"), text_width());
            let rule = "=".repeat(DETAIL_HEADING.chars().count());
            text = format!("{text}\n{DETAIL_HEADING}\n{rule}\n\n{d}");
        }
        if let Some(a) = doc.approximate {
            text.push('\n');
            text.push_str(&approx::render_text(s.model, a));
        }
        whole(out, &text)
    }

    fn solve(&self, doc: &SolveView, out: &mut dyn Sink) -> Result<(), ExportError> {
        whole(out, &solve::text(doc))
    }

    fn compare(&self, doc: &CompareView, out: &mut dyn Sink) -> Result<(), ExportError> {
        whole(out, &compare::text(doc))
    }

    fn cases(&self, doc: &CasesView, out: &mut dyn Sink) -> Result<(), ExportError> {
        whole(out, &combos::cases_text(doc))
    }
}
