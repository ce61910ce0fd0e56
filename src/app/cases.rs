//! `plumbline combos` and `plumbline cases`: the tables and the factored cases of a model.

use std::path::Path;

use super::error::{AppError, analysis};
use super::setup::table_and_settings;
use crate::combos::{expand_with, load_table};
use crate::diag::FileError;
use crate::input::load_model;
use crate::report::OutputFormat;
use crate::report::combos::{render_table, render_table_list};
use crate::report::export::render_expansion;

/// `plumbline combos [NAME|PATH]`: the shipped tables, or one table's combinations.
pub fn combos(table: Option<&str>) -> Result<String, AppError> {
    Ok(match table {
        None => render_table_list()?,
        Some(name) => render_table(&load_table(name, Some(Path::new("."))).map_err(|e| {
            if e.line > 0 {
                return AppError::from(e);
            }
            AppError::from(FileError {
                file: "command line".to_string(),
                field: format!("combos {name}"),
                ..e
            })
        })?),
    })
}

/// `plumbline cases MODEL [--combos T] [--set P=V]`: the factored cases of a model.
pub fn cases(
    model_path: &Path,
    combos: Option<&str>,
    sets: &[String],
    format: OutputFormat,
) -> Result<String, AppError> {
    let model = load_model(model_path)?;
    let (table, combo_settings) = table_and_settings(&model, model_path, combos, sets)?;
    let arranged =
        crate::arrange::arrange_model(&model).map_err(|e| analysis(&model, model_path, e))?;
    let expansion = arranged.apply(expand_with(&table, &model.load_cases, &combo_settings)?);
    crate::arrange::within_case_limit(&expansion).map_err(|e| analysis(&model, model_path, e))?;
    Ok(render_expansion(
        &table,
        &expansion,
        &arranged.model.load_cases,
        format,
    ))
}
