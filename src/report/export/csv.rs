//! The CSV format (`csv`): one file per table in the model's units, each closed by the
//! caution as a comment line.

use super::exporter::{
    CasesView, CheckView, CompareView, ExportError, Exporter, Sink, SolveView, whole,
};
use crate::report::page::Table;
use crate::report::{approx, combos, compare, solve, summary};

/// One CSV file per table.
pub struct Csv;

/// Write each table as its own part, `<table name>.csv`, one at a time: each is dropped
/// once written.
fn tables(out: &mut dyn Sink, tables: impl IntoIterator<Item = Table>) -> Result<(), ExportError> {
    for t in tables {
        out.part(&format!("{}.csv", t.name), &mut |w| {
            summary::write_csv(&t, w)
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
        let mut all = summary::csv_tables(s);
        if let Some(a) = doc.approximate {
            all.push(approx::table(s.model, a));
        }
        tables(out, all)
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
