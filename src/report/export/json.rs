//! The JSON format (`json`): one document in SI base units with stable keys.

use super::exporter::{
    CasesView, CheckView, CompareView, ExportError, Exporter, Sink, SolveView, whole,
};
use crate::report::{approx, combos, compare, solve, summary};

/// One JSON document in SI base units.
pub struct Json;

impl Exporter for Json {
    fn name(&self) -> &'static str {
        "json"
    }

    /// Summary, envelope, per-case detail and the approximate check, streamed section by
    /// section into the sink ([`summary::write_json`]).
    fn check(&self, doc: &CheckView, out: &mut dyn Sink) -> Result<(), ExportError> {
        let a = doc.approximate.map(approx::to_json);
        out.part("", &mut |w| {
            summary::write_json(&doc.summary, a.as_ref(), w)
        })
    }

    fn solve(&self, doc: &SolveView, out: &mut dyn Sink) -> Result<(), ExportError> {
        whole(out, &solve::json(doc))
    }

    fn compare(&self, doc: &CompareView, out: &mut dyn Sink) -> Result<(), ExportError> {
        whole(out, &compare::json(doc))
    }

    fn cases(&self, doc: &CasesView, out: &mut dyn Sink) -> Result<(), ExportError> {
        whole(out, &combos::cases_json(doc))
    }
}
