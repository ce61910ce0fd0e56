//! The commands of the `plumbline` program as library functions: each takes the parsed
//! arguments, reads the files it names, and returns the text to print or a typed error.
//! `main.rs` only parses arguments, calls one of these and prints.

use std::collections::BTreeMap;
use std::path::{Path, PathBuf};

use crate::check::{CheckError, CheckReport};
use crate::combos::{
    ComboTable, FactoredCase, Settings, expand_with, expansion_summary, load_table,
    render_expansion, render_table, render_table_list,
};
use crate::diag::FileError;
use crate::envelope::Envelope;
use crate::input::load_model;
use crate::model::{Model, SecondOrderMethod};
pub use crate::report::solve::stiffness_words;
pub use crate::report::starter::NewArgs;
use crate::report::summary::{self, Selection, Setting, Summary, TableInfo};
use crate::report::{CheckFormat, OutputFormat};
use crate::solve::SystemError;

/// Why a command failed; rendered for people by `miette` at the edge.
#[derive(Debug, thiserror::Error, miette::Diagnostic)]
pub enum AppError {
    /// An error located in an input file.
    #[error(transparent)]
    #[diagnostic(transparent)]
    File(Box<FileError>),
    /// The frame could not be analysed. The cause is part of the message, not a source, so
    /// that it is printed once; `note` adds what the model's properties suggest.
    #[error("{file}: {error}{note}")]
    Analysis {
        file: String,
        error: CheckError,
        note: String,
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

/// An analysis error of `model`, read from `path`. A mechanism says whether members with
/// implausible properties sit at the nodes found free to move (a unit slip makes pivots
/// vanish as surely as a missing support does).
fn analysis(model: &Model, path: &Path, e: impl Into<CheckError>) -> AppError {
    let error = e.into();
    let note = match &error {
        CheckError::System(SystemError::Mechanism(free)) => {
            let nodes: Vec<usize> = free.iter().map(|f| f.node).collect();
            crate::model::plausible::mechanism_note(model, &nodes)
        }
        _ => String::new(),
    };
    AppError::Analysis {
        file: path.display().to_string(),
        error,
        note,
    }
}

/// Warnings on the model file at `path` that do not stop a command: members whose
/// properties look like a unit slip, each prefixed with the file name. Empty when the file
/// cannot be read (the command itself then reports why).
pub fn model_warnings(path: &Path) -> Vec<String> {
    let Ok(model) = load_model(path) else {
        return Vec::new();
    };
    crate::model::plausible::implausible_members(&model)
        .into_iter()
        .map(|w| format!("{}: {}", path.display(), w.message))
        .collect()
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

/// How many combination names the `--case` no-match message shows.
const NO_MATCH_SHOWN: usize = 8;

/// The message for a `--case` prefix that matches no factored case: the first few
/// combination names (ids up to their first `/` or `~`), never the whole list, and how to
/// see every id.
fn no_case_message(prefix: &str, cases: &[FactoredCase], model_path: &Path) -> String {
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
fn own_table_for_levels(model: &Model, model_path: &Path) -> Result<Option<ComboTable>, AppError> {
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
fn require_load_cases(model: &Model, model_path: &Path) -> Result<(), AppError> {
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
fn table_and_settings(
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

/// `plumbline solve MODEL --case ID`: the first-order solution of one load case, with
/// gross section properties (a load case is a service load: the strength method's reduced
/// stiffness does not apply).
pub fn solve(model_path: &Path, case: &str, format: OutputFormat) -> Result<Rendered, AppError> {
    solve_with(model_path, case, "gross", format)
}

/// [`solve`] with the member stiffness preset `stiffness` (`--stiffness`).
pub fn solve_with(
    model_path: &Path,
    case: &str,
    stiffness: &str,
    format: OutputFormat,
) -> Result<Rendered, AppError> {
    use std::str::FromStr;
    let mut model = load_model(model_path)?;
    model.analysis.stiffness = crate::model::StiffnessPreset::from_str(stiffness).map_err(|_| {
        AppError::Usage(format!(
            "--stiffness: expected gross, aci-cracked, aisc-direct or aci-service, got \"{stiffness}\""
        ))
    })?;
    let k = model.case_index(case).ok_or_else(|| {
        let ids: Vec<&str> = model.load_cases.iter().map(|c| c.id.as_str()).collect();
        AppError::Usage(format!(
            "{}: no load case \"{case}\"; the model has: {}",
            model_path.display(),
            ids.join(", ")
        ))
    })?;
    let solution = crate::solve::solve_case(&model, k)
        .map_err(|e: SystemError| analysis(&model, model_path, e))?;
    Ok(Rendered {
        files: crate::report::solve::render(&model, k, &solution, format),
    })
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

/// Options of [`check`].
#[derive(Debug, Clone, Default)]
pub struct CheckArgs {
    pub combos: Option<String>,
    pub sets: Vec<String>,
    pub method: Option<SecondOrderMethod>,
    /// `--stiffness`: `gross`, `aci-cracked`, `aisc-direct`, or `auto` (the method's
    /// default); overrides the model.
    pub stiffness: Option<String>,
    /// `--notional`: `auto`, `none`, `aisc`, `ec3-imperfection`, or a number (the AISC
    /// coefficient); overrides the model.
    pub notional: Option<String>,
    /// Only the factored cases whose id starts with this (notional-load variants such as
    /// `2.3.1-2a/N+` included). Implies `detail`.
    pub case: Option<String>,
    pub format: CheckFormat,
    /// Add the per-case detail to the summary (text and Markdown; JSON and CSV always
    /// carry it).
    pub detail: bool,
    /// Add the approximate check (hand methods beside the stiffness solution).
    pub approximate: bool,
    /// `--service`: the serviceability table of the run (shipped name or path); overrides
    /// the model's `[combinations] service`.
    pub service: Option<String>,
    /// `--service-stiffness`: `gross` or `aci-service`; overrides the model.
    pub service_stiffness: Option<String>,
}

/// Exit status of the program (documented in docs/commands.md, "Exit status").
pub mod exit {
    /// The command ran and every factored case is stable.
    pub const OK: u8 = 0;
    /// The command failed: bad input (file, line and field named), an analysis that could
    /// not run, or an output that could not be written. Nothing was written.
    pub const FAILED: u8 = 1;
    /// The command line itself is wrong (unknown option, missing argument, bad value).
    pub const USAGE: u8 = 2;
    /// `check` ran and wrote its report, but at least one factored case is unstable.
    pub const UNSTABLE: u8 = 3;
}

/// Apply the command line's `--stiffness` and `--notional` to `model`'s analysis options,
/// then the method's defaults to every setting neither the model nor the command line gave.
pub fn apply_settings(
    model: &mut Model,
    stiffness: Option<&str>,
    notional: Option<&str>,
) -> Result<(), AppError> {
    use crate::model::{NotionalLoads, SettingOrigin, StiffnessPreset};
    use std::str::FromStr;
    let a = &mut model.analysis;
    if let Some(s) = stiffness {
        if s == "auto" {
            a.origin.stiffness = SettingOrigin::MethodDefault;
        } else {
            a.stiffness = StiffnessPreset::from_str(s)
                .ok()
                .filter(|p| !p.is_service_only())
                .ok_or_else(|| {
                    AppError::Usage(format!(
                        "--stiffness: expected gross, aci-cracked, aisc-direct or auto, got \"{s}\" \
                         (aci-service is the serviceability preset: --service-stiffness)"
                    ))
                })?;
            a.origin.stiffness = SettingOrigin::CommandLine;
        }
    }
    if let Some(n) = notional {
        a.notional = match n {
            "auto" => NotionalLoads::Auto,
            "none" => NotionalLoads::None,
            "aisc" => NotionalLoads::Aisc {
                coefficient: crate::check::aisc::NOTIONAL_COEFFICIENT,
            },
            "ec3-imperfection" => NotionalLoads::Ec3Imperfection,
            other => match other.parse::<f64>() {
                Ok(c) if c.is_finite() && c > 0.0 && c < 0.1 => {
                    NotionalLoads::Aisc { coefficient: c }
                }
                _ => {
                    return Err(AppError::Usage(format!(
                        "--notional: expected auto, none, aisc, ec3-imperfection or an AISC \
                         coefficient between 0 and 0.1 (e.g. 0.003), got \"{other}\""
                    )));
                }
            },
        };
        a.origin.notional = if n == "auto" {
            SettingOrigin::MethodDefault
        } else {
            SettingOrigin::CommandLine
        };
    }
    a.apply_method_defaults();
    Ok(())
}

/// Where a method-dependent setting came from, in the words of the settings table.
fn origin_source(o: crate::model::SettingOrigin, key: &str, method: SecondOrderMethod) -> String {
    match o {
        crate::model::SettingOrigin::Model => format!("model file ({key})"),
        crate::model::SettingOrigin::MethodDefault => format!("method default ({method})"),
        crate::model::SettingOrigin::CommandLine => "command line".into(),
    }
}

/// Everything one `check` run found, before rendering.
pub struct CheckRun {
    pub model: Model,
    pub model_file: String,
    /// SHA-256 of the model file's bytes, lowercase hex.
    pub model_sha256: String,
    pub table: ComboTable,
    /// The factored cases analysed (after `--case`).
    pub cases: Vec<FactoredCase>,
    pub report: CheckReport,
    pub settings: Vec<Setting>,
    pub selection: Selection,
    pub envelope: Envelope,
    /// The approximate check of the same cases, when asked for.
    pub approximate: Option<crate::approx::ApproxReport>,
    /// The serviceability half of the run, when it has a serviceability table.
    pub service: Option<ServiceRun>,
}

/// The serviceability half of a `check` run.
pub struct ServiceRun {
    pub table: ComboTable,
    /// The service cases analysed.
    pub cases: Vec<FactoredCase>,
    pub report: crate::service::ServiceReport,
}

impl CheckRun {
    /// The summary view of this run.
    pub fn summary(&self) -> Summary<'_> {
        Summary {
            model: &self.model,
            report: &self.report,
            model_file: self.model_file.clone(),
            model_sha256: self.model_sha256.clone(),
            table: TableInfo {
                name: self.table.file.clone(),
                title: self.table.title.clone(),
                standard: self.table.standard.clone(),
                edition: self.table.edition.clone(),
                source: self.table.source.clone(),
                caution: self.table.caution.clone(),
            },
            settings: self.settings.clone(),
            selection: self.selection.clone(),
            envelope: self.envelope.clone(),
            service: self.service.as_ref().map(|s| &s.report),
            detail: false,
        }
    }

    /// Whether the run has a strength half (a run of a serviceability table alone has not).
    pub fn has_strength(&self) -> bool {
        self.table.basis != crate::combos::Basis::Serviceability
    }
}

/// SHA-256 of `bytes`, lowercase hex.
pub fn sha256_hex(bytes: &[u8]) -> String {
    use sha2::Digest;
    sha2::Sha256::digest(bytes)
        .iter()
        .map(|b| format!("{b:02x}"))
        .collect()
}

/// The keys the model file sets in its `[analysis]` and `[combinations]` tables (to say
/// where each setting came from); empty when the file cannot be read again.
fn model_keys(path: &Path) -> std::collections::BTreeSet<String> {
    let mut out = std::collections::BTreeSet::new();
    let Ok(text) = std::fs::read_to_string(path) else {
        return out;
    };
    let Ok(doc) = text.parse::<toml::Table>() else {
        return out;
    };
    for section in ["analysis", "combinations"] {
        if let Some(t) = doc.get(section).and_then(|v| v.as_table()) {
            out.extend(t.keys().map(|k| format!("{section}.{k}")));
        }
    }
    out
}

/// One assumptions row per parameter of `table`: its value and where it came from; `label`
/// starts each row's name.
fn param_settings(
    model: &Model,
    table: &ComboTable,
    cli_params: &BTreeMap<String, f64>,
    label: &str,
) -> Vec<Setting> {
    let mut out = Vec::new();
    for p in &table.params {
        let (value, source) = if let Some(v) = cli_params.get(&p.name) {
            (
                crate::report::num(*v, 4),
                "command line (--set)".to_string(),
            )
        } else if let Some(v) = model.combos.params.get(&p.name) {
            (
                crate::report::num(*v, 4),
                "model file (combinations.params)".to_string(),
            )
        } else if let Some(d) = &p.default {
            (
                d.text.clone(),
                format!("table default {}", p.tag.clone().unwrap_or_default())
                    .trim()
                    .to_string(),
            )
        } else {
            (
                "not set".into(),
                if label == "parameter" {
                    "no default: combinations that need it are skipped".into()
                } else {
                    "no default: the limit that needs it is not checked".into()
                },
            )
        };
        out.push(Setting {
            setting: format!("{label} {}", p.name),
            value,
            source,
        });
    }
    out
}

/// Each setting of a run with its value and where it came from.
fn settings(
    model: &Model,
    model_path: &Path,
    table: &ComboTable,
    args: &CheckArgs,
    cli_params: &BTreeMap<String, f64>,
    patterns: usize,
) -> Vec<Setting> {
    let keys = model_keys(model_path);
    let from = |cli: bool, key: &str| -> String {
        if cli {
            "command line".into()
        } else if keys.contains(key) {
            format!("model file ({key})")
        } else {
            "program default".into()
        }
    };
    let mut out = vec![Setting {
        setting: "combination table".into(),
        value: format!(
            "{}: {}; {}; edition {}",
            table.file, table.title, table.standard, table.edition
        ),
        source: from(args.combos.is_some(), "combinations.table"),
    }];
    out.extend(param_settings(model, table, cli_params, "parameter"));
    let a = &model.analysis;
    out.push(Setting {
        setting: "second-order method".into(),
        value: format!(
            "{}: {}",
            a.method,
            crate::report::check::method_title(a.method)
        ),
        source: from(args.method.is_some(), "analysis.method"),
    });
    out.push(Setting {
        setting: "analysis stiffness".into(),
        value: stiffness_words(a.stiffness).into(),
        source: origin_source(a.origin.stiffness, "analysis.stiffness", a.method),
    });
    for (role, f) in &a.inertia_factor {
        out.push(Setting {
            setting: format!("inertia factor, {role}"),
            value: crate::report::num(*f, 3),
            source: from(false, "analysis.inertia_factor"),
        });
    }
    let tau_b_term = if a.stiffness == crate::model::StiffnessPreset::AiscDirect {
        ", plus 0.001·α·Yi of §C2.3(c) (τb = 1.0) shown as its own term"
    } else {
        ""
    };
    out.push(Setting {
        setting: "notional loads".into(),
        value: match crate::check::effective_notional(model) {
            crate::model::NotionalLoads::None => "none".to_string(),
            crate::model::NotionalLoads::Aisc { coefficient } => {
                format!(
                    "aisc, Ni = {}·α·Yi (AISC 360-16 §C2.2b){}",
                    crate::report::num(coefficient, 4),
                    tau_b_term
                )
            }
            crate::model::NotionalLoads::Ec3Imperfection => {
                "ec3-imperfection (EN 1993-1-1 §5.3.2)".to_string()
            }
            crate::model::NotionalLoads::Auto => "none (as the method calls for)".to_string(),
        },
        source: origin_source(a.origin.notional, "analysis.notional", a.method),
    });
    out.push(Setting {
        setting: "elements per member (second-order)".into(),
        value: a.segments.to_string(),
        source: from(false, "analysis.segments"),
    });
    if a.method == SecondOrderMethod::AciMagnifier {
        out.push(Setting {
            setting: "βdns (ACI 318-19 6.6.4.4.4)".into(),
            value: crate::report::num(a.beta_dns, 2),
            source: from(false, "analysis.beta_dns"),
        });
    }
    out.push(Setting {
        setting: "story levels".into(),
        value: if model.stories.is_some() {
            "declared".into()
        } else {
            "column tops".into()
        },
        source: from(false, "analysis.story_levels"),
    });
    if model.load_cases.iter().any(|c| c.arrange) {
        let exact = a.live_patterns == crate::model::LivePatterns::Exact;
        out.push(Setting {
            setting: "live-load patterns".into(),
            value: if exact {
                format!(
                    "exact: the worst subset of spans for each section, by signs; {patterns} \
                     subsets run as cases"
                )
            } else {
                format!(
                    "code: full, alt-a/-b, adj-{{joint}}, left-/right-{{column}}; {patterns} \
                     arrangements"
                )
            },
            source: from(false, "analysis.live_patterns"),
        });
        if exact {
            out.push(Setting {
                setting: "pattern spans".into(),
                value: "x loaded, . not; floors from the lowest, spans from the left".into(),
                source: "program default".into(),
            });
        }
    }
    out
}

/// Run `check` on a model file: read it, form the factored cases, analyse them (calling
/// `progress(done, total)` after each) and envelope the results.
pub fn run_check(
    model_path: &Path,
    args: &CheckArgs,
    progress: &mut dyn FnMut(usize, usize),
) -> Result<CheckRun, AppError> {
    let mut model = load_model(model_path)?;
    let bytes = std::fs::read(model_path).unwrap_or_default();
    if let Some(m) = args.method {
        model.analysis.method = m;
    }
    apply_settings(
        &mut model,
        args.stiffness.as_deref(),
        args.notional.as_deref(),
    )?;
    let cli_params = parse_sets(&args.sets)?;
    require_load_cases(&model, model_path)?;
    let table = resolve_table(&model, model_path, args.combos.as_deref())?;
    let own = match &args.combos {
        Some(_) => own_table_for_levels(&model, model_path)?,
        None => Some(table.clone()),
    };
    let service_only = table.basis == crate::combos::Basis::Serviceability;
    let service_table = match (args.service.as_deref(), service_only) {
        (Some(name), _) => Some(named_table(name, "--service")?),
        (None, true) => Some(table.clone()),
        (None, false) => model_service_table(&model, model_path)?,
    };
    if let Some(t) = service_table
        .as_ref()
        .filter(|t| t.basis != crate::combos::Basis::Serviceability)
    {
        return Err(AppError::Usage(format!(
            "the serviceability table {} has basis {}: name a table of basis serviceability \
             (`plumbline combos` lists them)",
            t.file, t.basis
        )));
    }
    let other = |t: &ComboTable| -> Option<ComboTable> {
        service_table.as_ref().filter(|s| s.file != t.file).cloned()
    };
    let combo_settings = split_settings(
        Settings::for_model(&model, own.as_ref(), &cli_params),
        &table,
        other(&table).as_ref(),
    );
    // Arranged live load: pieces appended to the model, arrangements as alternatives.
    let arranged =
        crate::arrange::arrange_model(&model).map_err(|e| analysis(&model, model_path, e))?;
    let expansion = arranged.apply(expand_with(&table, &model.load_cases, &combo_settings)?);
    let service = match &service_table {
        Some(st) => {
            let settings = split_settings(
                Settings::for_model(&model, own.as_ref(), &cli_params),
                st,
                Some(&table).filter(|t| t.file != st.file),
            );
            let exp = arranged.apply(expand_with(st, &model.load_cases, &settings)?);
            let values = crate::combos::param_values(st, &settings)?;
            Some((
                st.clone(),
                exp,
                crate::service::ServiceLimits::from_params(&values),
            ))
        }
        None => None,
    };
    crate::arrange::within_case_limit(&expansion).map_err(|e| analysis(&model, model_path, e))?;
    let patterns = arranged.patterns.len();
    let model = arranged.model;
    let mut cases = expansion.cases.clone();
    if let Some(prefix) = &args.case {
        // A prefix may also name a notional-load variant such as `2.3.1-2a/N+`.
        cases.retain(|c| c.id.starts_with(prefix.as_str()) || prefix.starts_with(c.id.as_str()));
        if cases.is_empty() {
            return Err(AppError::Usage(no_case_message(
                prefix,
                &expansion.cases,
                model_path,
            )));
        }
    }
    let mut report = if service_only {
        empty_report(&model)
    } else {
        crate::check::check_with_progress(&model, &cases, progress)
            .map_err(|e| analysis(&model, model_path, e))?
    };
    if let Some(prefix) = &args.case {
        report.cases.retain(|c| c.id.starts_with(prefix.as_str()));
    }
    let service = match service {
        Some((st, exp, limits)) => {
            let mut smodel = crate::service::service_model(&model);
            if let Some(p) = args.service_stiffness.as_deref() {
                smodel.analysis.stiffness = service_stiffness(p)?;
            }
            let scases = if service_only && st.file == table.file {
                cases.clone()
            } else {
                exp.cases
            };
            let line = format!("{}; {}; edition {}", st.title, st.standard, st.edition);
            let r = crate::service::service_check(&smodel, &scases, &limits, (&st.file, &line))
                .map_err(|e| analysis(&model, model_path, e))?;
            Some(ServiceRun {
                table: st,
                cases: scases,
                report: r,
            })
        }
        None => None,
    };
    let analysed = match (&service, service_only) {
        (Some(s), true) => s.report.cases.iter().map(|c| c.id.clone()).collect(),
        _ => report.cases.iter().map(|c| c.id.clone()).collect(),
    };
    let selection = Selection {
        filter: args.case.clone(),
        table_cases: expansion.cases.len(),
        selected: cases.len(),
        analysed,
        remarks: expansion_summary(&expansion)
            .lines()
            .skip(1)
            .map(str::to_string)
            .collect(),
    };
    let mut settings = settings(&model, model_path, &table, args, &cli_params, patterns);
    settings.extend(crate::report::summary::second_order_setting(&report));
    if !service_only {
        settings.push(crate::report::handoff::handoff_setting(report.method));
    }
    if service_only {
        // No strength analysis ran: its method, stiffness and notional loads do not apply.
        settings.retain(|s| {
            !STRENGTH_ONLY_SETTINGS
                .iter()
                .any(|p| s.setting.starts_with(p))
        });
    }
    if let Some(s) = &service {
        settings.extend(service_settings(
            &model,
            args,
            s,
            &cli_params,
            model_path,
            service_only,
        ));
    }
    let envelope = crate::envelope::envelope(&report);
    let approximate = if args.approximate {
        let th = crate::approx::Thresholds::default();
        Some(
            crate::approx::approximate_check(&model, &cases, &th).map_err(|e| {
                analysis(
                    &model,
                    model_path,
                    match e {
                        crate::approx::ApproxError::Stories(s) => CheckError::Stories(s),
                        crate::approx::ApproxError::System(s) => CheckError::System(s),
                    },
                )
            })?,
        )
    } else {
        None
    };
    Ok(CheckRun {
        model_file: model_path.display().to_string(),
        model_sha256: sha256_hex(&bytes),
        model,
        table,
        cases,
        report,
        settings,
        selection,
        envelope,
        approximate,
        service,
    })
}

/// Assumptions rows of the strength analysis, left out of a serviceability run alone.
const STRENGTH_ONLY_SETTINGS: [&str; 4] = [
    "second-order method",
    "analysis stiffness",
    "notional loads",
    "βdns",
];

/// A table named on the command line by `option` (a shipped name or a path).
fn named_table(name: &str, option: &str) -> Result<ComboTable, AppError> {
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
fn model_service_table(model: &Model, model_path: &Path) -> Result<Option<ComboTable>, AppError> {
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

/// `settings` for `table` when the run also uses `other`: the parameters (model and
/// command line) that only `other` declares are left to it. A parameter neither declares
/// stays, so that `table`'s expansion reports it.
fn split_settings(
    mut settings: Settings,
    table: &ComboTable,
    other: Option<&ComboTable>,
) -> Settings {
    if let Some(other) = other {
        let keep = |k: &String| table.param(k).is_some() || other.param(k).is_none();
        settings.model_params.retain(|k, _| keep(k));
        settings.sets.retain(|k, _| keep(k));
    }
    settings
}

/// `--service-stiffness`: `gross` or `aci-service`.
fn service_stiffness(p: &str) -> Result<crate::model::StiffnessPreset, AppError> {
    use std::str::FromStr;
    crate::input::validate::SERVICE_STIFFNESS_NAMES
        .contains(&p)
        .then(|| crate::model::StiffnessPreset::from_str(p).ok())
        .flatten()
        .ok_or_else(|| {
            AppError::Usage(format!(
                "--service-stiffness: expected gross or aci-service, got \"{p}\""
            ))
        })
}

/// A report with no strength cases (a run of a serviceability table alone).
fn empty_report(model: &Model) -> CheckReport {
    CheckReport {
        title: model.title.clone(),
        method: model.analysis.method,
        stiffness: model.analysis.stiffness,
        notional: model.analysis.notional,
        origin: model.analysis.origin,
        stories: Vec::new(),
        cases: Vec::new(),
        supports: crate::check::support_info(model),
        service_reactions: Vec::new(),
        warnings: Vec::new(),
        caution: crate::CAUTION.to_string(),
    }
}

/// The assumptions of the serviceability half: its table, stiffness and limit parameters.
fn service_settings(
    model: &Model,
    args: &CheckArgs,
    s: &ServiceRun,
    cli_params: &BTreeMap<String, f64>,
    model_path: &Path,
    alone: bool,
) -> Vec<Setting> {
    let keys = model_keys(model_path);
    let t = &s.table;
    let mut out = vec![Setting {
        setting: "serviceability table".into(),
        value: format!(
            "{}: {}; {}; edition {}",
            t.file, t.title, t.standard, t.edition
        ),
        source: if args.service.is_some() {
            "command line (--service)".into()
        } else if keys.contains("combinations.service") {
            "model file (combinations.service)".into()
        } else {
            "combination table (basis serviceability)".into()
        },
    }];
    if !alone {
        // A table run alone has its parameters listed once, as the run's table.
        out.extend(param_settings(model, t, cli_params, "service parameter"));
    }
    // Of the allowable seismic drifts, only the risk category's (none while the seismic
    // check is off).
    let chosen = s.report.limits.seismic.map(|l| {
        format!(
            "{}{}",
            crate::service::params::SEISMIC_DRIFT_PREFIX,
            l.risk_category
        )
    });
    out.retain(|x| {
        let name = x.setting.rsplit(' ').next().unwrap_or_default();
        !name.starts_with(crate::service::params::SEISMIC_DRIFT_PREFIX)
            || chosen.as_deref() == Some(name)
    });
    let preset: crate::model::StiffnessPreset = s.report.stiffness.parse().unwrap_or_default();
    out.push(Setting {
        setting: "service stiffness".into(),
        value: crate::service::stiffness_words(preset).into(),
        source: if args.service_stiffness.is_some() {
            "command line (--service-stiffness)".into()
        } else if keys.contains("analysis.service_stiffness") {
            "model file (analysis.service_stiffness)".into()
        } else if model.analysis.method == SecondOrderMethod::AciMagnifier {
            "program default for a concrete frame (aci-magnifier)".into()
        } else {
            "program default".into()
        },
    });
    out.push(Setting {
        setting: "service analysis".into(),
        value: "P-Δ at service load, no notional loads, no amplifiers".into(),
        source: "program (serviceability basis)".into(),
    });
    out
}

/// Refuse an output file that is one of the input files (the model or a table file named
/// by path), so that `-o` can never overwrite what was read. Paths are compared after
/// resolving links, and on Unix also by device and inode (hard links).
pub fn check_output_path(output: &Path, inputs: &[&Path]) -> Result<(), AppError> {
    for input in inputs {
        if same_file(output, input) {
            return Err(AppError::Usage(format!(
                "the output file {} is the input file {}: refusing to overwrite an input",
                output.display(),
                input.display()
            )));
        }
    }
    Ok(())
}

/// Whether two paths name the same existing file.
fn same_file(a: &Path, b: &Path) -> bool {
    match (std::fs::canonicalize(a), std::fs::canonicalize(b)) {
        (Ok(x), Ok(y)) if x == y => return true,
        (Ok(_), Ok(_)) => {}
        _ => return false,
    }
    #[cfg(unix)]
    {
        use std::os::unix::fs::MetadataExt;
        if let (Ok(x), Ok(y)) = (std::fs::metadata(a), std::fs::metadata(b)) {
            return x.dev() == y.dev() && x.ino() == y.ino();
        }
    }
    false
}

/// The rendered output of a command: one text, or several named files (CSV tables).
#[derive(Debug, Clone, PartialEq)]
pub struct Rendered {
    /// `(file name, text)`; a single text has an empty name.
    pub files: Vec<(String, String)>,
}

impl Rendered {
    /// One text.
    pub fn text(text: String) -> Rendered {
        Rendered {
            files: vec![(String::new(), text)],
        }
    }

    /// Everything as one text: several files each under a `# name` line.
    pub fn joined(&self) -> String {
        match self.files.as_slice() {
            [(_, text)] => text.clone(),
            files => files
                .iter()
                .map(|(name, text)| format!("# {name}\n{text}"))
                .collect::<Vec<_>>()
                .join("\n"),
        }
    }
}

/// Heading of the per-case detail, printed after the summary (issue 20).
pub const DETAIL_HEADING: &str = "Per-case detail";

/// Render a check run in `format` (`detail` gives the summary's tables every column and
/// adds the per-case tables after the summary, in text and Markdown).
pub fn render_check(run: &CheckRun, format: CheckFormat, detail: bool) -> Rendered {
    let mut s = run.summary();
    s.detail = detail;
    let rendered = match format {
        CheckFormat::Table => {
            let mut text = summary::text(&s);
            if detail {
                let width = crate::report::text_width();
                let d = crate::report::check::detail_text(&run.model, &run.report);
                let d = crate::report::fit_lines(&format!("{d}{}", crate::CAUTION), width);
                let rule = "=".repeat(DETAIL_HEADING.chars().count());
                text = format!("{text}\n{DETAIL_HEADING}\n{rule}\n\n{d}");
            }
            Rendered::text(text)
        }
        CheckFormat::Md => {
            let mut text = summary::markdown(&s);
            if detail {
                text.push_str(&format!(
                    "\n## {DETAIL_HEADING}\n\n```text\n{}```\n\n{}\n",
                    crate::report::check::detail_text(&run.model, &run.report),
                    crate::CAUTION
                ));
            }
            Rendered::text(text)
        }
        CheckFormat::Json => {
            let approximate = run.approximate.as_ref().map(crate::report::approx::to_json);
            return Rendered::text(summary::json(&s, approximate.as_ref()));
        }
        CheckFormat::Csv => Rendered {
            files: summary::csv_files(&s),
        },
    };
    match &run.approximate {
        Some(a) => with_approximate(&run.model, a, format, rendered),
        None => rendered,
    }
}

/// `rendered` with the approximate check added: a section after the text and Markdown, an
/// `approximate` key in the JSON document, an `approximate.csv` file.
fn with_approximate(
    model: &Model,
    a: &crate::approx::ApproxReport,
    format: CheckFormat,
    mut rendered: Rendered,
) -> Rendered {
    use crate::report::approx;
    match (format, rendered.files.as_mut_slice()) {
        (CheckFormat::Table, [(_, text)]) => {
            text.push('\n');
            text.push_str(&approx::render_text(model, a));
        }
        (CheckFormat::Md, [(_, text)]) => {
            text.push_str(&format!(
                "\n## Approximate check\n\n```text\n{}```\n",
                approx::render_text(model, a)
            ));
        }
        // The JSON writer adds its `approximate` section itself.
        (CheckFormat::Json, _) => {}
        _ => rendered.files.push((
            "approximate.csv".into(),
            summary::csv_text(&approx::table(model, a)),
        )),
    }
    rendered
}

/// `plumbline check MODEL`: every factored case with and without sway, amplified for
/// second-order effects, stories classified, enveloped into a summary.
pub fn check_output(
    model_path: &Path,
    args: &CheckArgs,
    progress: &mut dyn FnMut(usize, usize),
) -> Result<Rendered, AppError> {
    Ok(check_output_status(model_path, args, progress)?.0)
}

/// [`check_output`], and whether some factored case is unstable (for the exit status).
pub fn check_output_status(
    model_path: &Path,
    args: &CheckArgs,
    progress: &mut dyn FnMut(usize, usize),
) -> Result<(Rendered, bool), AppError> {
    let run = run_check(model_path, args, progress)?;
    let unstable = run.report.cases.iter().any(|c| !c.stable)
        || run
            .service
            .as_ref()
            .is_some_and(|s| s.report.cases.iter().any(|c| !c.converged));
    let rendered = render_check(&run, args.format, args.detail || args.case.is_some());
    Ok((rendered, unstable))
}

/// [`check_output`] as one text, without progress.
pub fn check(model_path: &Path, args: &CheckArgs) -> Result<String, AppError> {
    Ok(check_output(model_path, args, &mut |_, _| {})?.joined())
}

/// Run `check` and write its report to `output` (or print it): [`emit_check`]. Returns the
/// paths written and whether some factored case is unstable (for the exit status).
pub fn check_and_emit(
    model_path: &Path,
    args: &CheckArgs,
    output: Option<&Path>,
    progress: &mut dyn FnMut(usize, usize),
) -> Result<(Vec<PathBuf>, bool), AppError> {
    let run = run_check(model_path, args, progress)?;
    let unstable = run.report.cases.iter().any(|c| !c.stable);
    let written = emit_check(
        &run,
        args.format,
        args.detail || args.case.is_some(),
        output,
    )?;
    Ok((written, unstable))
}

/// Write a check run's report in `format` to `output` (a file; for CSV a directory of
/// files), or print it. JSON and CSV are streamed: formatted straight into their file (or
/// standard output), never held whole in memory, and still written whole or not at all
/// ([`write_output_with`]). Returns the paths written.
pub fn emit_check(
    run: &CheckRun,
    format: CheckFormat,
    detail: bool,
    output: Option<&Path>,
) -> Result<Vec<PathBuf>, AppError> {
    let approximate = || run.approximate.as_ref().map(crate::report::approx::to_json);
    match (format, output) {
        (CheckFormat::Json, Some(path)) => {
            let a = approximate();
            write_output_with(path, |w| summary::write_json(&run.summary(), a.as_ref(), w))?;
            Ok(vec![path.to_path_buf()])
        }
        (CheckFormat::Json, None) => {
            let a = approximate();
            stdout_with(|w| summary::write_json(&run.summary(), a.as_ref(), w))?;
            Ok(Vec::new())
        }
        (CheckFormat::Csv, Some(dir)) => {
            std::fs::create_dir_all(dir).map_err(|source| AppError::Write {
                path: dir.display().to_string(),
                source,
            })?;
            let s = run.summary();
            let mut tables = summary::csv_tables(&s);
            if let Some(a) = &run.approximate {
                tables.push(crate::report::approx::table(&run.model, a));
            }
            let mut written = Vec::new();
            // One table at a time, each dropped once written.
            for t in tables {
                let p = dir.join(format!("{}.csv", t.name));
                write_output_with(&p, |w| summary::write_csv(&t, w))?;
                written.push(p);
            }
            Ok(written)
        }
        _ => emit(&render_check(run, format, detail), output),
    }
}

/// Write `rendered` to `output` (a file, or for several files a directory created if
/// needed), or print it. Returns the paths written.
pub fn emit(rendered: &Rendered, output: Option<&Path>) -> Result<Vec<PathBuf>, AppError> {
    match (output, rendered.files.as_slice()) {
        (None, _) => {
            write_stdout(&rendered.joined())?;
            Ok(Vec::new())
        }
        (Some(path), [(_, text)]) => {
            write_output(path, text)?;
            Ok(vec![path.to_path_buf()])
        }
        (Some(dir), files) => {
            std::fs::create_dir_all(dir).map_err(|source| AppError::Write {
                path: dir.display().to_string(),
                source,
            })?;
            let mut written = Vec::new();
            for (name, text) in files {
                let p = dir.join(name);
                write_output(&p, text)?;
                written.push(p);
            }
            Ok(written)
        }
    }
}

/// `plumbline report MODEL`: the check as one self-contained HTML file.
pub fn report(
    model_path: &Path,
    args: &CheckArgs,
    progress: &mut dyn FnMut(usize, usize),
) -> Result<String, AppError> {
    let run = run_check(model_path, args, progress)?;
    Ok(crate::report::html::render(&run.summary(), &run.cases))
}

/// `plumbline new FILE --bays … --stories …`: a commented starter model of a regular frame,
/// refused when `file` exists. The text is checked by reading it back as a model.
pub fn new_model(file: &Path, args: &NewArgs) -> Result<String, AppError> {
    if file.exists() {
        return Err(AppError::Usage(format!(
            "{} exists; `plumbline new` does not overwrite a file",
            file.display()
        )));
    }
    for (name, list) in [("--bays", &args.bays), ("--stories", &args.stories)] {
        if list.is_empty() || list.iter().any(|v| !v.is_finite() || *v <= 0.0) {
            return Err(AppError::Usage(format!(
                "{name}: expected positive lengths separated by commas, got {list:?}"
            )));
        }
    }
    let text = crate::report::starter::starter_model(args);
    crate::input::parse_model(&text, &file.display().to_string())?;
    Ok(text)
}

/// Write `text` to `path` whole or not at all: written to a temporary file beside it
/// (named after the process, so that two runs do not share it), flushed to disk, then
/// renamed over it.
pub fn write_output(path: &Path, text: &str) -> Result<(), AppError> {
    write_output_with(path, |w| {
        use std::io::Write;
        w.write_all(text.as_bytes())
    })
}

/// Write to `path` whole or not at all, as [`write_output`] does, with `write` producing
/// the content straight into the temporary file.
pub fn write_output_with(
    path: &Path,
    write: impl FnOnce(&mut std::fs::File) -> std::io::Result<()>,
) -> Result<(), AppError> {
    let err = |source| AppError::Write {
        path: path.display().to_string(),
        source,
    };
    let name = path
        .file_name()
        .map(|n| n.to_string_lossy().into_owned())
        .unwrap_or_default();
    let tmp = path.with_file_name(format!(".{name}.{}.partial", std::process::id()));
    let written = std::fs::File::create(&tmp).and_then(|mut f| {
        write(&mut f)?;
        f.sync_all()
    });
    if let Err(e) = written {
        let _ = std::fs::remove_file(&tmp);
        return Err(err(e));
    }
    std::fs::rename(&tmp, path).map_err(|e| {
        let _ = std::fs::remove_file(&tmp);
        err(e)
    })
}

/// Print `text` on standard output. A reader that stops early (`plumbline check … | head`)
/// is not an error.
pub fn write_stdout(text: &str) -> Result<(), AppError> {
    stdout_with(|out| {
        use std::io::Write;
        out.write_all(text.as_bytes())
    })
}

/// Print on standard output what `write` produces. A reader that stops early is not an
/// error.
pub fn stdout_with(
    write: impl FnOnce(&mut std::io::StdoutLock<'static>) -> std::io::Result<()>,
) -> Result<(), AppError> {
    use std::io::Write;
    let mut out = std::io::stdout().lock();
    match write(&mut out).and_then(|()| out.flush()) {
        Err(e) if e.kind() != std::io::ErrorKind::BrokenPipe => Err(AppError::Write {
            path: "standard output".into(),
            source: e,
        }),
        _ => Ok(()),
    }
}

/// One variant of `compare`: a label and the check options it changes.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct VariantSpec {
    pub label: String,
    pub combos: Option<String>,
    pub method: Option<SecondOrderMethod>,
    pub stiffness: Option<String>,
    pub notional: Option<String>,
    /// Table parameters, `PARAM=VALUE`.
    pub sets: Vec<String>,
}

impl VariantSpec {
    /// The `check` options of this variant.
    pub fn check_args(&self) -> CheckArgs {
        CheckArgs {
            combos: self.combos.clone(),
            sets: self.sets.clone(),
            method: self.method,
            stiffness: self.stiffness.clone(),
            notional: self.notional.clone(),
            ..Default::default()
        }
    }

    /// The settings in words, `model as written` for none.
    pub fn describe(&self) -> String {
        let mut parts = Vec::new();
        if let Some(c) = &self.combos {
            parts.push(format!("combos={c}"));
        }
        if let Some(m) = self.method {
            parts.push(format!("second-order={m}"));
        }
        if let Some(s) = &self.stiffness {
            parts.push(format!("stiffness={s}"));
        }
        if let Some(n) = &self.notional {
            parts.push(format!("notional={n}"));
        }
        parts.extend(self.sets.iter().cloned());
        if parts.is_empty() {
            "model as written".into()
        } else {
            parts.join(" ")
        }
    }
}

/// Parse a variant: `[LABEL:] key=value …`, separated by spaces or commas. Keys `combos`,
/// `second-order`, `stiffness` and `notional` take the values of the `check` options of the
/// same names; any other key is a table parameter (as `--set`). Without a label the variant
/// is called `v{number}`.
pub fn parse_variant(spec: &str, number: usize) -> Result<VariantSpec, AppError> {
    use std::str::FromStr;
    let (label, rest) = match spec.split_once(':') {
        Some((l, r)) if !l.contains('=') => (l.trim().to_string(), r),
        _ => (format!("v{number}"), spec),
    };
    if label.is_empty() {
        return Err(AppError::Usage(format!(
            "--variant \"{spec}\": the label before ':' is empty"
        )));
    }
    let mut v = VariantSpec {
        label,
        ..Default::default()
    };
    for item in rest.split([' ', ',']).filter(|s| !s.is_empty()) {
        let Some((key, value)) = item.split_once('=') else {
            return Err(AppError::Usage(format!(
                "--variant \"{spec}\": \"{item}\" is not key=value (keys: combos, second-order, \
                 stiffness, notional, or a table parameter)"
            )));
        };
        match key {
            "combos" => v.combos = Some(value.to_string()),
            "second-order" => {
                v.method = Some(SecondOrderMethod::from_str(value).map_err(|_| {
                    AppError::Usage(format!(
                        "--variant \"{spec}\": second-order: expected one of {}, got \"{value}\"",
                        crate::input::validate::METHOD_NAMES.join(", ")
                    ))
                })?)
            }
            "stiffness" => v.stiffness = Some(value.to_string()),
            "notional" => v.notional = Some(value.to_string()),
            _ => v.sets.push(item.to_string()),
        }
    }
    Ok(v)
}

/// Everything one `compare` run found.
pub struct CompareRun {
    /// The variants that ran, in order (the first is the reference), with their checks.
    pub runs: Vec<(VariantSpec, CheckRun)>,
    pub left_out: Vec<crate::compare::LeftOut>,
    pub comparison: crate::compare::Comparison,
}

impl CompareRun {
    /// The variants that ran, as the reports list them.
    pub fn variants(&self) -> Vec<crate::compare::VariantInfo> {
        self.runs
            .iter()
            .map(|(v, r)| crate::compare::VariantInfo {
                label: v.label.clone(),
                table: r.table.file.clone(),
                method: r.model.analysis.method.to_string(),
                settings: v.describe(),
            })
            .collect()
    }

    /// The report view of this run (the reference's model gives ids and units).
    pub fn view(&self) -> crate::report::compare::CompareView<'_> {
        crate::report::compare::CompareView {
            model: &self.runs[0].1.model,
            variants: self.variants(),
            left_out: &self.left_out,
            comparison: &self.comparison,
        }
    }
}

/// `plumbline compare MODEL --variant …`: check the model under each variant and set the
/// results side by side. With one variant the model as written is the reference (`model`);
/// with two or more the first given is. A variant that cannot run (a load-level conversion
/// the model does not state, an unknown table) is left out with its message while the
/// others run; the reference must run.
pub fn run_compare(
    model_path: &Path,
    specs: &[VariantSpec],
    progress: &mut dyn FnMut(usize, usize),
) -> Result<CompareRun, AppError> {
    let mut variants: Vec<VariantSpec> = Vec::new();
    if specs.len() < 2 {
        variants.push(VariantSpec {
            label: "model".into(),
            ..Default::default()
        });
    }
    variants.extend(specs.iter().cloned());
    let mut seen = std::collections::BTreeSet::new();
    for v in &variants {
        if !seen.insert(v.label.as_str()) {
            return Err(AppError::Usage(format!(
                "two variants are labelled \"{}\"; give each its own label (LABEL: …)",
                v.label
            )));
        }
    }
    let mut runs = Vec::new();
    let mut left_out = Vec::new();
    for (k, v) in variants.into_iter().enumerate() {
        match run_check(model_path, &v.check_args(), progress) {
            Ok(run) => runs.push((v, run)),
            Err(e) if k > 0 => left_out.push(crate::compare::LeftOut {
                label: v.label.clone(),
                settings: v.describe(),
                reason: {
                    use miette::Diagnostic;
                    match e.help() {
                        Some(h) => format!("{e} ({h})"),
                        None => e.to_string(),
                    }
                },
            }),
            Err(e) => return Err(e),
        }
    }
    if runs.len() < 2 {
        return Err(AppError::Usage(format!(
            "compare needs the reference and at least one other variant that runs; left out: {}",
            left_out
                .iter()
                .map(|l| format!("{}: {}", l.label, l.reason))
                .collect::<Vec<_>>()
                .join("; ")
        )));
    }
    let view: Vec<crate::compare::VariantRun> = runs
        .iter()
        .map(|(v, r)| crate::compare::VariantRun {
            label: &v.label,
            method: r.model.analysis.method,
            envelope: &r.envelope,
        })
        .collect();
    let comparison = crate::compare::compare(&view);
    Ok(CompareRun {
        runs,
        left_out,
        comparison,
    })
}
