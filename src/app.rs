//! The commands of the `plumbline` program as library functions: each takes the parsed
//! arguments, reads the files it names, and returns the text to print or a typed error.
//! `main.rs` only parses arguments, calls one of these and prints.

use std::collections::BTreeMap;
use std::path::{Path, PathBuf};

use crate::check::CheckError;
use crate::combos::{
    ComboTable, expand, expansion_summary, load_table, render_expansion, render_table,
    render_table_list,
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
        out.insert(k.trim().to_string(), v);
    }
    Ok(out)
}

/// The combination table a command uses: `--combos` if given, else the model's
/// `[combinations] table` (a path there is relative to the model file).
pub fn resolve_table(
    model: &Model,
    model_path: &Path,
    combos: Option<&str>,
) -> Result<ComboTable, AppError> {
    let base = model_path
        .parent()
        .map(Path::to_path_buf)
        .unwrap_or_else(|| PathBuf::from("."));
    match (combos, model.combos.table.as_deref()) {
        (Some(name), _) => Ok(load_table(name, Some(Path::new(".")))?),
        (None, Some(name)) => Ok(load_table(name, Some(&base))?),
        (None, None) => Err(AppError::Usage(format!(
            "{}: no combination table: name one with --combos NAME|PATH or with \
             [combinations] table = \"...\" in the model (`plumbline combos` lists the shipped ones)",
            model_path.display()
        ))),
    }
}

/// The model's parameter overrides, then the command line's on top.
fn overrides(model: &Model, sets: &[String]) -> Result<BTreeMap<String, f64>, AppError> {
    let mut params = model.combos.params.clone();
    params.extend(parse_sets(sets)?);
    Ok(params)
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
        Some(name) => render_table(&load_table(name, Some(Path::new(".")))?),
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
    let table = resolve_table(&model, model_path, combos)?;
    let arranged = crate::arrange::arrange(&model);
    let expansion = arranged.apply(expand(
        &table,
        &model.load_cases,
        &overrides(&model, sets)?,
    )?);
    Ok(render_expansion(
        &table,
        &expansion,
        &arranged.model.load_cases,
        format,
    ))
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
    /// Add the approximate check (hand methods beside the stiffness solution).
    pub approximate: bool,
}

/// `plumbline check MODEL`: every factored case with and without sway, amplified for
/// second-order effects, stories classified.
pub fn check(model_path: &Path, args: &CheckArgs) -> Result<String, AppError> {
    if args.approximate && args.format == OutputFormat::Csv {
        return Err(AppError::Usage(
            "--approximate gives a table or JSON: use --format table or --format json".into(),
        ));
    }
    let mut model = load_model(model_path)?;
    if let Some(m) = args.method {
        model.analysis.method = m;
    }
    let table = resolve_table(&model, model_path, args.combos.as_deref())?;
    // Arranged live load: pieces appended to the model, arrangements as alternatives.
    let arranged = crate::arrange::arrange(&model);
    let expansion = arranged.apply(expand(
        &table,
        &model.load_cases,
        &overrides(&model, &args.sets)?,
    )?);
    let model = arranged.model;
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
    let body = if args.approximate {
        with_approximate(&model, &cases, args, body).map_err(|e| analysis(model_path, e))?
    } else {
        body
    };
    Ok(match args.format {
        OutputFormat::Table => expansion_summary(&expansion) + "\n" + &body,
        _ => body,
    })
}

/// The check report with the approximate check of the same cases: a text section after
/// it, or an `approximate` key in the JSON document. CSV has no room for it.
fn with_approximate(
    model: &Model,
    cases: &[crate::combos::FactoredCase],
    args: &CheckArgs,
    body: String,
) -> Result<String, CheckError> {
    use crate::approx::{ApproxError, Thresholds, approximate_check};
    let r = approximate_check(model, cases, &Thresholds::default()).map_err(|e| match e {
        ApproxError::Stories(s) => CheckError::Stories(s),
        ApproxError::System(s) => CheckError::System(s),
    })?;
    Ok(match args.format {
        OutputFormat::Table => body + "\n" + &crate::report::approx::render_text(model, &r),
        OutputFormat::Json => match serde_json::from_str::<serde_json::Value>(&body) {
            Ok(serde_json::Value::Object(mut doc)) => {
                doc.insert("approximate".into(), crate::report::approx::to_json(&r));
                serde_json::to_string_pretty(&doc).unwrap_or(body) + "\n"
            }
            _ => body,
        },
        OutputFormat::Csv => body, // refused in `check`
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
