//! Entry points shared by the fuzz targets in `fuzz/` and the replay of their saved corpus
//! in `tests/fuzz_corpus.rs`: each takes arbitrary bytes, runs one reader on them and goes
//! on as far as the input allows (an error is rendered as the terminal would show it; a
//! valid input is carried into the next stages). None of them may panic, hang or use
//! unbounded memory on any input; that is the property the fuzzer searches against.
//!
//! They read no files: a model's table is taken only when it is a shipped one.

use std::collections::BTreeMap;

use strum::IntoEnumIterator;

use crate::combos::{self, Expr};
use crate::diag::FileError;
use crate::model::{ActionCategory, LoadCase, Model};
use crate::report::OutputFormat;

/// Largest model (in nodes) whose cases are solved and checked after reading; bigger ones
/// are only read, so that one input costs milliseconds.
const ANALYSE_NODES: usize = 40;

/// Most load cases solved, and factored cases checked, per input.
const ANALYSE_CASES: usize = 4;

/// Render an error as the command line does, through `miette`, and return its length.
pub fn render_error(e: &FileError) -> usize {
    let mut out = String::new();
    let handler =
        miette::GraphicalReportHandler::new_themed(miette::GraphicalTheme::unicode_nocolor());
    // A formatting error would be a bug of the renderer, not of the input: ignore it.
    let _ = handler.render_report(&mut out, e);
    out.len()
}

/// The model reader: decode, parse and validate; a small valid model is solved case by
/// case and checked under its shipped table (or a default one).
pub fn model(bytes: &[u8]) {
    let model = match crate::input::parse_model_bytes(bytes, "fuzz.toml") {
        Ok(m) => m,
        Err(e) => {
            render_error(&e);
            return;
        }
    };
    if model.nodes.len() > ANALYSE_NODES {
        return;
    }
    for k in 0..model.load_cases.len().min(ANALYSE_CASES) {
        if let Ok(solution) = crate::solve::solve_case(&model, k) {
            crate::report::export::render_solve(&model, k, &solution, OutputFormat::Json);
        }
    }
    check_model(&model);
}

/// The check of a small model under its shipped table (or ASCE/SEI 7-16 strength).
fn check_model(model: &Model) {
    let name = model
        .combos
        .table
        .as_deref()
        .filter(|n| combos::shipped_tables().iter().any(|t| t.name == *n))
        .unwrap_or("asce7-16-strength");
    let Ok(table) = combos::load_table(name, None) else {
        return;
    };
    let mut params = BTreeMap::from([("s_ds".to_string(), 0.5)]);
    params.extend(model.combos.params.clone());
    let Ok(arranged) = crate::arrange::arrange_model(model) else {
        return;
    };
    let Ok(expansion) = combos::expand(&table, &model.load_cases, &params) else {
        return;
    };
    let expansion = arranged.apply(expansion);
    let model = &arranged.model;
    let cases = &expansion.cases[..expansion.cases.len().min(ANALYSE_CASES)];
    if let Ok(report) = crate::check::check(model, cases) {
        crate::report::check::detail_text(model, &report);
        crate::envelope::envelope(&report);
    }
}

/// One empty load case per action category, dead load twice as alternatives, for
/// expanding tables.
fn sample_cases() -> Vec<LoadCase> {
    let mut cases: Vec<LoadCase> = ActionCategory::iter()
        .map(|category| LoadCase {
            id: format!("{category}"),
            description: String::new(),
            category,
            alternative_group: None,
            nodal: Vec::new(),
            member: Vec::new(),
            arrange: false,
            level: None,
            reverse: false,
        })
        .collect();
    for side in ["W-left", "W-right"] {
        cases.push(LoadCase {
            id: side.to_string(),
            description: String::new(),
            category: ActionCategory::Wind,
            alternative_group: Some("wind".to_string()),
            nodal: Vec::new(),
            member: Vec::new(),
            arrange: false,
            level: None,
            reverse: false,
        });
    }
    cases
}

/// The combination-table reader: decode and parse; a valid table is printed and expanded
/// over one load case per category.
pub fn table(bytes: &[u8]) {
    let parsed = crate::diag::decode_utf8(bytes.to_vec(), "fuzz-table.toml")
        .and_then(|text| combos::parse_table(&text, "fuzz-table.toml"));
    let table = match parsed {
        Ok(t) => t,
        Err(e) => {
            render_error(&e);
            return;
        }
    };
    crate::report::combos::render_table(&table);
    let cases = sample_cases();
    match combos::expand(&table, &cases, &BTreeMap::new()) {
        Ok(exp) => {
            crate::report::export::render_expansion(&table, &exp, &cases, OutputFormat::Table);
            crate::report::export::render_expansion(&table, &exp, &cases, OutputFormat::Json);
        }
        Err(e) => {
            render_error(&e);
        }
    }
}

/// The factor-expression parser: parse, list the parameters, evaluate with every
/// parameter set, then with one unset.
pub fn expr(bytes: &[u8]) {
    let Ok(text) = std::str::from_utf8(bytes) else {
        return;
    };
    let Ok(e) = Expr::parse(text) else {
        return;
    };
    let names = e.params();
    let mut values: BTreeMap<String, Option<f64>> = names
        .iter()
        .enumerate()
        .map(|(k, n)| (n.clone(), Some(0.5 + k as f64)))
        .collect();
    let _ = e.eval(&values);
    let _ = e.constant();
    if let Some(first) = names.first() {
        values.insert(first.clone(), None);
        let _ = e.eval(&values);
    }
}
