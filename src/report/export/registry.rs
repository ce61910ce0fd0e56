//! The registry of output formats: each format's name and its exporter, and the documents
//! rendered in the formats the commands offer ([`OutputFormat`],
//! [`CheckFormat`](crate::report::CheckFormat), [`CompareFormat`]: their names are exporter
//! names).

use std::collections::BTreeMap;
use std::fmt::Display;

use super::csv::Csv;
use super::exporter::{CasesView, CompareView, ExportError, Exporter, Memory, Sink, SolveView};
use super::html::Html;
use super::json::Json;
use super::markdown::Markdown;
use super::text::Text;
use crate::combos::{ComboTable, Settings, expand, expand_with};
use crate::diag::FileError;
use crate::model::{LoadCase, Model};
use crate::report::OutputFormat;
use crate::report::compare::CompareFormat;
use crate::solve::Solution;

/// Every output format, in the order the commands list them. A new format is one line here
/// and its own file.
pub static FORMATS: [&dyn Exporter; 5] = [&Text, &Json, &Csv, &Markdown, &Html];

/// The exporter of the format called `name`.
pub fn exporter(name: &str) -> Result<&'static dyn Exporter, ExportError> {
    FORMATS
        .iter()
        .copied()
        .find(|e| e.name() == name)
        .ok_or_else(|| ExportError::UnknownFormat {
            name: name.to_string(),
            known: FORMATS.map(|e| e.name()).join(", "),
        })
}

/// The parts a document writes in the format called `name`, kept in memory: `(file name,
/// text)`, one unnamed part for a document that is one stream.
pub fn to_memory(
    name: &str,
    write: impl FnOnce(&dyn Exporter, &mut dyn Sink) -> Result<(), ExportError>,
) -> Result<Vec<(String, String)>, ExportError> {
    let mut memory = Memory::default();
    write(exporter(name)?, &mut memory)?;
    Ok(memory.files)
}

/// [`to_memory`] for a format a command offers: every one of [`OutputFormat`],
/// [`CheckFormat`](crate::report::CheckFormat) and [`CompareFormat`] names a registered exporter (tested here) that
/// writes the documents of its command (tested by each command's tests), and writing to
/// memory does not fail.
pub fn offered(
    format: impl Display,
    write: impl FnOnce(&dyn Exporter, &mut dyn Sink) -> Result<(), ExportError>,
) -> Vec<(String, String)> {
    let name = format.to_string();
    to_memory(&name, write)
        .unwrap_or_else(|e| panic!("the offered format {name} writes its document: {e}"))
}

/// The first-order `solution` of load case number `case` of `model` in `format` (see
/// [`crate::report::solve`] for what each value is): one text, or for CSV one file per
/// table.
pub fn render_solve(
    model: &Model,
    case: usize,
    solution: &Solution,
    format: OutputFormat,
) -> Vec<(String, String)> {
    let doc = SolveView {
        model,
        case,
        solution,
    };
    offered(format, |e, out| e.solve(&doc, out))
}

/// The comparison `run` in `format`.
pub fn render_compare(run: &CompareView, format: CompareFormat) -> Vec<(String, String)> {
    offered(format, |e, out| e.compare(run, out))
}

/// The factored cases in `format`, with counts, merges, skips, unplaced load cases and the
/// caution lines.
pub fn render_expansion(
    table: &ComboTable,
    expansion: &crate::combos::Expansion,
    load_cases: &[LoadCase],
    format: OutputFormat,
) -> String {
    let doc = CasesView {
        table,
        expansion,
        load_cases,
    };
    offered(format, |e, out| e.cases(&doc, out))
        .into_iter()
        .map(|(_, text)| text)
        .collect()
}

/// Expand `table` for `cases` with `overrides` and render the result in `format`: the
/// library side of `plumbline cases`.
pub fn cases_report(
    cases: &[LoadCase],
    table: &ComboTable,
    overrides: &BTreeMap<String, f64>,
    format: OutputFormat,
) -> Result<String, FileError> {
    let exp = expand(table, cases, overrides)?;
    Ok(render_expansion(table, &exp, cases, format))
}

/// [`cases_report`] with the model's [`Settings`] (parameters with their locations, load
/// levels and conversions).
pub fn cases_report_with(
    cases: &[LoadCase],
    table: &ComboTable,
    settings: &Settings,
    format: OutputFormat,
) -> Result<String, FileError> {
    let exp = expand_with(table, cases, settings)?;
    Ok(render_expansion(table, &exp, cases, format))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::report::CheckFormat;
    use clap::ValueEnum;

    /// Every format a command offers is registered: `offered` never meets an unknown name
    /// (that each writes its command's document, the commands' tests show).
    #[test]
    fn every_offered_format_is_registered() {
        let names = OutputFormat::value_variants()
            .iter()
            .map(|f| f.to_string())
            .chain(CheckFormat::value_variants().iter().map(|f| f.to_string()))
            .chain(
                CompareFormat::value_variants()
                    .iter()
                    .map(|f| f.to_string()),
            );
        for name in names {
            assert!(exporter(&name).is_ok(), "{name}");
        }
    }

    #[test]
    fn an_unknown_format_names_the_known_ones() {
        let e = exporter("xlsx").err().map(|e| e.to_string());
        assert_eq!(
            e.as_deref(),
            Some("no output format \"xlsx\": expected one of table, json, csv, md, html")
        );
    }
}
