//! The CSV format (`csv`): one file per table in the model's units, each closed by the
//! caution as a comment line.

use super::exporter::{
    CasesView, CheckView, CompareView, ExportError, Exporter, Sink, SolveView, whole,
};
use crate::report::page::RowStream;
use crate::report::{approx, combos, compare, solve, summary};

/// One CSV file per table.
pub struct Csv;

/// Write each table as its own part, `<table name>.csv`, one at a time: each is formed as
/// it is written and dropped once written.
fn tables<'a, T: Into<RowStream<'a>>>(
    out: &mut dyn Sink,
    tables: impl IntoIterator<Item = T>,
) -> Result<(), ExportError> {
    for t in tables {
        let mut t = Some(t.into());
        let name = format!("{}.csv", t.as_ref().map_or("", |t| t.name));
        out.part(&name, &mut |w| match t.take() {
            Some(t) => summary::write_csv(t, w),
            None => Ok(()),
        })?;
    }
    Ok(())
}

impl Exporter for Csv {
    fn name(&self) -> &'static str {
        "csv"
    }

    /// The summary's tables in tidy form, the per-case detail, the serviceability tables,
    /// then the approximate check.
    fn check(&self, doc: &CheckView, out: &mut dyn Sink) -> Result<(), ExportError> {
        let s = &doc.summary;
        let approximate = doc.approximate.map(|a| approx::table(s.model, a).into());
        tables(out, summary::csv_tables(s).chain(approximate))
    }

    fn solve(&self, doc: &SolveView, out: &mut dyn Sink) -> Result<(), ExportError> {
        tables(out, solve::tables(doc))
    }

    fn compare(&self, doc: &CompareView, out: &mut dyn Sink) -> Result<(), ExportError> {
        tables(out, compare::csv_tables(doc))
    }

    /// One file: a row per factored case, a factor column per load case.
    fn cases(&self, doc: &CasesView, out: &mut dyn Sink) -> Result<(), ExportError> {
        whole(out, &combos::cases_csv(doc))
    }
}
