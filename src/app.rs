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
    let (table, combo_settings) = table_and_settings(&model, model_path, combos, sets)?;
    let arranged = crate::arrange::arrange(&model);
    let expansion = arranged.apply(expand_with(&table, &model.load_cases, &combo_settings)?);
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
}

/// Exit status of the program (documented in the README, "Exit status").
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
            a.stiffness = StiffnessPreset::from_str(s).map_err(|_| {
                AppError::Usage(format!(
                    "--stiffness: expected gross, aci-cracked, aisc-direct or auto, got \"{s}\""
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

/// Plain words for a stiffness preset, with its clause.
fn stiffness_words(p: crate::model::StiffnessPreset) -> &'static str {
    use crate::model::StiffnessPreset;
    match p {
        StiffnessPreset::Gross => "gross: gross section properties",
        StiffnessPreset::AciCracked => {
            "aci-cracked: ACI 318-19 Table 6.6.3.1.1(a), 0.70 Ig columns, 0.35 Ig beams, 1.0 Ag"
        }
        StiffnessPreset::AiscDirect => {
            "aisc-direct: AISC 360-16 §C2.3 direct-analysis rules, 0.8·τb·EI with τb = 1.0, 0.8·EA"
        }
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
        }
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

/// Each setting of a run with its value and where it came from.
fn settings(
    model: &Model,
    model_path: &Path,
    table: &ComboTable,
    args: &CheckArgs,
    cli_params: &BTreeMap<String, f64>,
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
                "no default: combinations that need it are skipped".into(),
            )
        };
        out.push(Setting {
            setting: format!("parameter {}", p.name),
            value,
            source,
        });
    }
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
    let (table, combo_settings) =
        table_and_settings(&model, model_path, args.combos.as_deref(), &args.sets)?;
    let cli_params = parse_sets(&args.sets)?;
    // Arranged live load: pieces appended to the model, arrangements as alternatives.
    let arranged = crate::arrange::arrange(&model);
    let expansion = arranged.apply(expand_with(&table, &model.load_cases, &combo_settings)?);
    let model = arranged.model;
    let mut cases = expansion.cases.clone();
    if let Some(prefix) = &args.case {
        // A prefix may also name a notional-load variant such as `2.3.1-2a/N+`.
        cases.retain(|c| c.id.starts_with(prefix.as_str()) || prefix.starts_with(c.id.as_str()));
        if cases.is_empty() {
            let ids: Vec<&str> = expansion.cases.iter().map(|c| c.id.as_str()).collect();
            return Err(AppError::Usage(format!(
                "no factored case id starts with \"{prefix}\"; the cases are: {}",
                ids.join(", ")
            )));
        }
    }
    let mut report = crate::check::check_with_progress(&model, &cases, progress)
        .map_err(|e| analysis(model_path, e))?;
    if let Some(prefix) = &args.case {
        report.cases.retain(|c| c.id.starts_with(prefix.as_str()));
    }
    let selection = Selection {
        filter: args.case.clone(),
        table_cases: expansion.cases.len(),
        selected: cases.len(),
        analysed: report.cases.iter().map(|c| c.id.clone()).collect(),
        remarks: expansion_summary(&expansion)
            .lines()
            .skip(1)
            .map(str::to_string)
            .collect(),
    };
    let mut settings = settings(&model, model_path, &table, args, &cli_params);
    settings.extend(crate::report::summary::second_order_setting(&report));
    let envelope = crate::envelope::envelope(&report);
    let approximate = if args.approximate {
        let th = crate::approx::Thresholds::default();
        Some(
            crate::approx::approximate_check(&model, &cases, &th).map_err(|e| {
                analysis(
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
    })
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

/// Render a check run in `format` (`detail` adds the per-case tables to text and
/// Markdown).
pub fn render_check(run: &CheckRun, format: CheckFormat, detail: bool) -> Rendered {
    let s = run.summary();
    let rendered = match format {
        CheckFormat::Table => {
            let mut text = summary::text(&s);
            if detail {
                let d = crate::report::check::detail_text(&run.model, &run.report);
                text = format!("{d}\n{text}");
            }
            Rendered::text(text)
        }
        CheckFormat::Md => {
            let mut text = summary::markdown(&s);
            if detail {
                text.push_str(&format!(
                    "\n## Per-case detail\n\n```text\n{}```\n\n{}\n",
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
    let unstable = run.report.cases.iter().any(|c| !c.stable);
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

/// Options of [`new_model`].
#[derive(Debug, Clone)]
pub struct NewArgs {
    /// Bay widths, left to right, in the preset's length unit.
    pub bays: Vec<f64>,
    /// Story heights, bottom up.
    pub stories: Vec<f64>,
    /// Unit preset name (`kN-m`, `kip-ft`, `kip-in`, `N-mm`).
    pub units: String,
    /// `fixed` or `pinned`.
    pub base: String,
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
