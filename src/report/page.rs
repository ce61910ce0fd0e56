//! The page of one `check` run as every exporter sees it: the run's [`Summary`] (model,
//! check report, envelope, settings) and the [`Table`] every exporter renders. Its own
//! module so that the exporters and the summary share them without importing each other.

use serde::{Deserialize, Serialize};

use crate::check::CheckReport;
use crate::envelope::Envelope;
use crate::model::{Model, SecondOrderMethod};

/// One setting of the run, its value and where the value came from.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Setting {
    pub setting: String,
    pub value: String,
    /// `command line`, `model file`, `table default`, `method default` or `program default`.
    pub source: String,
}

/// The combination table of the run.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct TableInfo {
    /// Shipped name or file the table was read from.
    pub name: String,
    pub title: String,
    pub standard: String,
    pub edition: String,
    pub source: String,
    pub caution: String,
}

/// Which factored cases a run covers.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Selection {
    /// The `--case` prefix, when given.
    pub filter: Option<String>,
    /// Factored cases the table gives for the model.
    pub table_cases: usize,
    /// Factored cases kept by the filter.
    pub selected: usize,
    /// Ids of the case checks analysed (gravity-only cases once per notional direction).
    pub analysed: Vec<String>,
    /// What the expansion reported: merged, skipped and unplaced combinations.
    pub remarks: Vec<String>,
}

impl Selection {
    /// One line saying which cases the results cover.
    pub fn heading(&self) -> String {
        let which = match &self.filter {
            None => format!("all {} factored cases of the table", self.table_cases),
            Some(p) => format!(
                "{} of {} factored cases (ids starting with \"{p}\")",
                self.selected, self.table_cases
            ),
        };
        let n = self.analysed.len();
        if n == self.selected {
            format!("Cases included: {which}")
        } else {
            format!(
                "Cases included: {which}, {n} analyses (gravity-only cases once per notional-load direction)"
            )
        }
    }
}

/// Everything the summary reports about one run.
pub struct Summary<'a> {
    pub model: &'a Model,
    pub report: &'a CheckReport,
    /// The model file as named on the command line.
    pub model_file: String,
    /// SHA-256 of the model file's bytes, lowercase hex.
    pub model_sha256: String,
    pub table: TableInfo,
    pub settings: Vec<Setting>,
    pub selection: Selection,
    pub envelope: &'a Envelope,
    /// The serviceability half of the run, when it has one.
    pub service: Option<&'a crate::service::ServiceReport>,
    /// `--detail`: every table with all its columns (the default page keeps the figures of
    /// the chosen method and leaves the secondary columns out, to fit the width).
    pub detail: bool,
    /// Whether `report` holds every case's member results and buckled shape (false in a
    /// lean run, `--lean`, and for the one-page summary): the JSON says so
    /// (`case_detail`), and the CSV files of them are written only with it.
    pub case_detail: bool,
}

impl Summary<'_> {
    /// Whether the run has strength cases (a run of a serviceability table alone has not).
    pub fn has_strength(&self) -> bool {
        !(self.report.cases.is_empty() && self.service.is_some())
    }

    /// Whether the chosen method defines Pr, the required axial strength (AISC 360-16
    /// App. 8 (A-8-2); the other methods have none, so the page shows only N).
    pub fn method_defines_pr(&self) -> bool {
        self.report.method == SecondOrderMethod::AiscB1B2
    }

    /// "title; standard; edition" of the combination table.
    pub fn table_line(&self) -> String {
        format!(
            "{}; {}; edition {}",
            self.table.title, self.table.standard, self.table.edition
        )
    }
}

/// A table: header and rows of cells.
pub struct Table {
    pub name: &'static str,
    pub title: String,
    pub header: Vec<String>,
    pub rows: Vec<Vec<String>>,
}

/// A table for a file, its rows formed one at a time as they are written: a large table
/// (a row per case and member) is never held whole.
pub struct RowStream<'a> {
    pub name: &'static str,
    pub header: Vec<String>,
    pub rows: Box<dyn Iterator<Item = Vec<String>> + 'a>,
}

impl<'a> From<Table> for RowStream<'a> {
    fn from(t: Table) -> RowStream<'a> {
        RowStream {
            name: t.name,
            header: t.header,
            rows: Box::new(t.rows.into_iter()),
        }
    }
}

/// What a check report reads: the run's summary (`summary.detail` asks for the per-case
/// detail), the approximate check when it was asked for, and the factored cases analysed
/// (the drawings of the HTML report take their loads).
pub struct CheckView<'a> {
    pub summary: Summary<'a>,
    pub approximate: Option<&'a crate::approx::ApproxReport>,
    pub cases: &'a [crate::combos::FactoredCase],
}
