//! The commands of the `plumbline` program as library functions: each takes the parsed
//! arguments, reads the files it names, and returns the text to print or a typed error.
//! `main.rs` only parses arguments, calls one of these and prints.

use std::collections::BTreeMap;
use std::path::{Path, PathBuf};

use crate::check::CheckError;
use crate::combos::{
    ComboTable, Settings, cases_report_with, expand_with, expansion_summary, load_table,
    render_table, render_table_list,
};
use crate::diag::FileError;
use crate::input::load_model;
use crate::model::{Model, SecondOrderMethod};
use crate::report::OutputFormat;
use crate::solve::SystemError;

/// Why a command failed; rendered for people by `miette` at the edge.
#[derive(Debug, thiserror::Error, miette::Diagnostic)]
pub enum AppError {
    /// An error located in an input file.
    #[error(transparent)]
    #[diagnostic(transparent)]
    File(Box<FileError>),
    /// The frame could not be analysed.
    #[error("{file}: {source}")]
    Analysis {
        file: String,
        #[source]
        source: CheckError,
    },
    /// A command-line value is wrong.
    #[error("{0}")]
    #[diagnostic(help("see `plumbline help` for the command's options"))]
    Usage(String),
    /// An output file could not be written.
    #[error("could not write {path}: {source}")]
    Write {
        path: String,
        #[source]
        source: std::io::Error,
    },
}

impl From<FileError> for AppError {
    fn from(e: FileError) -> Self {
        AppError::File(Box::new(e))
    }
}

fn analysis(path: &Path, e: impl Into<CheckError>) -> AppError {
    AppError::Analysis {
        file: path.display().to_string(),
        source: e.into(),
    }
}

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
            let mut located = w.error(
                w.table.clone(),
                "combinations.table",
                format!("{} ({})", e.message, e.file),
            );
            located.help = e.help;
            AppError::from(located)
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

/// The table a command uses and the settings the model and `--set` give it: parameters with
/// their locations, load-level conversions, and the levels of the model's own table for
/// load cases that state none.
fn table_and_settings(
    model: &Model,
    model_path: &Path,
    combos: Option<&str>,
    sets: &[String],
) -> Result<(ComboTable, Settings), AppError> {
    let sets = parse_sets(sets)?;
    let table = resolve_table(model, model_path, combos)?;
    let own = match combos {
        Some(_) => own_table(model, model_path)?,
        None => Some(table.clone()),
    };
    let settings = Settings::for_model(model, own.as_ref(), &sets);
    Ok((table, settings))
}

/// `plumbline solve MODEL --case ID`: the first-order solution of one load case.
pub fn solve(model_path: &Path, case: &str, format: OutputFormat) -> Result<String, AppError> {
    let model = load_model(model_path)?;
    let k = model.case_index(case).ok_or_else(|| {
        let ids: Vec<&str> = model.load_cases.iter().map(|c| c.id.as_str()).collect();
        AppError::Usage(format!(
            "{}: no load case \"{case}\"; the model has: {}",
            model_path.display(),
            ids.join(", ")
        ))
    })?;
    let solution =
        crate::solve::solve_case(&model, k).map_err(|e: SystemError| analysis(model_path, e))?;
    Ok(crate::report::solve::render(&model, k, &solution, format))
}

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
    let (table, settings) = table_and_settings(&model, model_path, combos, sets)?;
    Ok(cases_report_with(
        &model.load_cases,
        &table,
        &settings,
        format,
    )?)
}

/// Options of [`check`].
#[derive(Debug, Clone, Default)]
pub struct CheckArgs {
    pub combos: Option<String>,
    pub sets: Vec<String>,
    pub method: Option<SecondOrderMethod>,
    /// Only the factored cases whose id starts with this (notional-load variants such as
    /// `2.3.1-2a/N+` included).
    pub case: Option<String>,
    pub format: OutputFormat,
}

/// `plumbline check MODEL`: every factored case with and without sway, amplified for
/// second-order effects, stories classified.
pub fn check(model_path: &Path, args: &CheckArgs) -> Result<String, AppError> {
    let mut model = load_model(model_path)?;
    if let Some(m) = args.method {
        model.analysis.method = m;
    }
    let (table, settings) =
        table_and_settings(&model, model_path, args.combos.as_deref(), &args.sets)?;
    let expansion = expand_with(&table, &model.load_cases, &settings)?;
    let mut cases = expansion.cases.clone();
    if let Some(prefix) = &args.case {
        // A prefix may also name a notional-load variant such as `2.3.1-2a/N+`.
        cases.retain(|c| c.id.starts_with(prefix.as_str()) || prefix.starts_with(c.id.as_str()));
        if cases.is_empty() {
            return Err(AppError::Usage(format!(
                "no factored case id starts with \"{prefix}\""
            )));
        }
    }
    let mut report = crate::check::check(&model, &cases).map_err(|e| analysis(model_path, e))?;
    if let Some(prefix) = &args.case {
        report.cases.retain(|c| c.id.starts_with(prefix.as_str()));
    }
    let title = format!(
        "{}; {}; edition {}",
        table.title, table.standard, table.edition
    );
    let body = crate::report::check::render(&model, &report, &title, args.format);
    Ok(match args.format {
        OutputFormat::Table => expansion_summary(&expansion) + "\n" + &body,
        _ => body,
    })
}

/// Write `text` to `path` whole or not at all: written to a temporary file beside it,
/// then renamed over it.
pub fn write_output(path: &Path, text: &str) -> Result<(), AppError> {
    let err = |source| AppError::Write {
        path: path.display().to_string(),
        source,
    };
    let name = path
        .file_name()
        .map(|n| n.to_string_lossy().into_owned())
        .unwrap_or_default();
    let tmp = path.with_file_name(format!(".{name}.partial"));
    std::fs::write(&tmp, text).map_err(err)?;
    std::fs::rename(&tmp, path).map_err(|e| {
        let _ = std::fs::remove_file(&tmp);
        err(e)
    })
}

/// Print `text` on standard output. A reader that stops early (`plumbline check … | head`)
/// is not an error.
pub fn write_stdout(text: &str) -> Result<(), AppError> {
    use std::io::Write;
    let mut out = std::io::stdout().lock();
    match out.write_all(text.as_bytes()).and_then(|()| out.flush()) {
        Err(e) if e.kind() != std::io::ErrorKind::BrokenPipe => Err(AppError::Write {
            path: "standard output".into(),
            source: e,
        }),
        _ => Ok(()),
    }
}
