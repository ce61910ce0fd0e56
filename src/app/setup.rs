//! What every command that reads a model shares: the `--set` values, the combination table
//! (the model's own, a shipped one or a file) and its settings.

use std::collections::BTreeMap;
use std::path::{Path, PathBuf};

use super::error::AppError;
use crate::combos::{ComboTable, FactoredCase, Settings, load_table};
use crate::diag::FileError;
use crate::model::Model;

/// Parse `PARAM=VALUE` overrides of combination-table parameters.
pub fn parse_sets(sets: &[String]) -> Result<BTreeMap<String, f64>, AppError> {
    let mut out = BTreeMap::new();
    for s in sets {
        let (k, v) = s
            .split_once('=')
            .ok_or_else(|| AppError::Usage(format!("--set expects PARAM=VALUE, got \"{s}\"")))?;
        let k = k.trim();
        if k.is_empty() {
            return Err(AppError::Usage(format!(
                "--set \"{s}\": the parameter name before `=` is missing (expected PARAM=VALUE, e.g. --set l_companion=0.5)"
            )));
        }
        let v: f64 = v.trim().parse().map_err(|_| {
            AppError::Usage(format!(
                "--set {k}: expected a number, got \"{}\"",
                v.trim()
            ))
        })?;
        if !v.is_finite() {
            return Err(AppError::Usage(format!(
                "--set {k}: the value must be finite"
            )));
        }
        out.insert(k.to_string(), v);
    }
    Ok(out)
}

/// How many combination names the `--case` no-match message shows.
const NO_MATCH_SHOWN: usize = 8;

/// The message for a `--case` prefix that matches no factored case: the first few
/// combination names (ids up to their first `/` or `~`), never the whole list, and how to
/// see every id.
pub(super) fn no_case_message(prefix: &str, cases: &[FactoredCase], model_path: &Path) -> String {
    let mut names: Vec<&str> = Vec::new();
    for c in cases {
        let name = c.id.split(['/', '~']).next().unwrap_or(&c.id);
        if !names.contains(&name) {
            names.push(name);
        }
    }
    let more = if names.len() > NO_MATCH_SHOWN {
        format!(" and {} more", names.len() - NO_MATCH_SHOWN)
    } else {
        String::new()
    };
    names.truncate(NO_MATCH_SHOWN);
    format!(
        "no factored case id starts with \"{prefix}\"; the combinations are {}{more} \
         ({} cases: `plumbline cases {}` lists them)",
        names.join(", "),
        cases.len(),
        model_path.display()
    )
}

/// The folder of the model file (tables named in the model are relative to it).
fn model_dir(model_path: &Path) -> PathBuf {
    model_path
        .parent()
        .map(Path::to_path_buf)
        .unwrap_or_else(|| PathBuf::from("."))
}

/// The model's own table (`[combinations] table`), when it names one; an error reading it
/// points at the model's line.
pub fn own_table(model: &Model, model_path: &Path) -> Result<Option<ComboTable>, AppError> {
    let Some(name) = model.combos.table.as_deref() else {
        return Ok(None);
    };
    load_table(name, Some(&model_dir(model_path)))
        .map(Some)
        .map_err(|e| {
            if e.line > 0 {
                return AppError::from(e); // an error inside the table file itself
            }
            let w = &model.combos.written;
            let message = if e.file == name {
                e.message
            } else {
                format!("{} ({})", e.message, e.file)
            };
            let mut located = w.error(w.table.clone(), "combinations.table", message);
            located.help = e.help;
            AppError::from(located)
        })
}

/// The load cases that state no `level` in a category where the trade distinguishes levels
/// (wind, snow, seismic): only these take their level from the model's own table.
fn cases_without_level(model: &Model) -> Vec<&str> {
    model
        .load_cases
        .iter()
        .filter(|c| c.level.is_none() && c.category.has_levels())
        .map(|c| c.id.as_str())
        .collect()
}

/// The model's own table when `--combos` names another one: it then serves only to know the
/// load level of cases that state none. When every case states its level (or none needs
/// one) it is not read at all; when it cannot be read and some case needs it, the error
/// says so and names those cases.
pub(super) fn own_table_for_levels(
    model: &Model,
    model_path: &Path,
) -> Result<Option<ComboTable>, AppError> {
    let unstated = cases_without_level(model);
    if unstated.is_empty() {
        return Ok(None);
    }
    own_table(model, model_path).map_err(|e| match e {
        AppError::File(mut fe) if fe.field == "combinations.table" => {
            fe.message = format!(
                "{}; with --combos, the model's table serves only to know the load level of \
                 case{} {}, which state{} no `level`",
                fe.message,
                if unstated.len() == 1 { "" } else { "s" },
                unstated.join(", "),
                if unstated.len() == 1 { "s" } else { "" },
            );
            fe.help = Some(
                "give those cases `level = \"...\"` (then the model's table is not read), or make \
                 the table file available"
                    .into(),
            );
            AppError::File(fe)
        }
        other => other,
    })
}

/// The combination table a command uses: `--combos` if given, else the model's
/// `[combinations] table` (a path there is relative to the model file).
pub fn resolve_table(
    model: &Model,
    model_path: &Path,
    combos: Option<&str>,
) -> Result<ComboTable, AppError> {
    match combos {
        Some(name) => load_table(name, Some(Path::new("."))).map_err(|e| {
            if e.line > 0 {
                return AppError::from(e);
            }
            AppError::from(FileError {
                file: "command line".to_string(),
                field: format!("--combos {name}"),
                ..e
            })
        }),
        None => own_table(model, model_path)?.ok_or_else(|| {
            AppError::Usage(format!(
                "{}: no combination table: name one with --combos NAME|PATH or with \
                 [combinations] table = \"...\" in the model (`plumbline combos` lists the shipped ones)",
                model_path.display()
            ))
        }),
    }
}

/// A model with no load case has nothing to combine or check: refused, naming the file.
pub(super) fn require_load_cases(model: &Model, model_path: &Path) -> Result<(), AppError> {
    if !model.load_cases.is_empty() {
        return Ok(());
    }
    Err(AppError::from(FileError {
        file: model_path.display().to_string(),
        line: 0,
        column: 0,
        field: "case".into(),
        message: "the model has no load cases: nothing to combine or check".into(),
        help: Some("add at least one [[case]] with its category and loads".into()),
        span: None,
        source_text: None,
    }))
}

/// The table a command uses and the settings the model and `--set` give it: parameters with
/// their locations, load-level conversions, and the levels of the model's own table for
/// load cases that state none.
pub(super) fn table_and_settings(
    model: &Model,
    model_path: &Path,
    combos: Option<&str>,
    sets: &[String],
) -> Result<(ComboTable, Settings), AppError> {
    let sets = parse_sets(sets)?;
    require_load_cases(model, model_path)?;
    let table = resolve_table(model, model_path, combos)?;
    let own = match combos {
        Some(_) => own_table_for_levels(model, model_path)?,
        None => Some(table.clone()),
    };
    let settings = Settings::for_model(model, own.as_ref(), &sets);
    Ok((table, settings))
}

/// A table named on the command line by `option` (a shipped name or a path).
pub(super) fn named_table(name: &str, option: &str) -> Result<ComboTable, AppError> {
    load_table(name, Some(Path::new("."))).map_err(|e| {
        if e.line > 0 {
            return AppError::from(e);
        }
        AppError::from(FileError {
            file: "command line".to_string(),
            field: format!("{option} {name}"),
            ..e
        })
    })
}

/// The model's serviceability table (`[combinations] service`), when it names one; an error
/// reading it points at the model's line.
pub(super) fn model_service_table(
    model: &Model,
    model_path: &Path,
) -> Result<Option<ComboTable>, AppError> {
    let Some(name) = model.combos.service.as_deref() else {
        return Ok(None);
    };
    load_table(name, Some(&model_dir(model_path)))
        .map(Some)
        .map_err(|e| {
            if e.line > 0 {
                return AppError::from(e);
            }
            let w = &model.combos.written;
            let mut located = w.error(w.service.clone(), "combinations.service", e.message);
            located.help = e.help;
            AppError::from(located)
        })
}
