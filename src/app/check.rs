//! `plumbline check` and `plumbline report`: the run, its settings with their sources and
//! its rendering in every format.

use std::collections::BTreeMap;
use std::path::{Path, PathBuf};

use super::error::{AppError, analysis};
use super::output::{Destination, Rendered};
use super::setup::{
    model_service_table, named_table, no_case_message, own_table_for_levels, parse_sets,
    require_load_cases, resolve_table,
};
use crate::check::{CheckError, CheckReport};
use crate::combos::{ComboTable, FactoredCase, Settings, expand_with};
use crate::envelope::Envelope;
use crate::input::load_model;
use crate::model::{Model, SecondOrderMethod};
use crate::report::CheckFormat;
use crate::report::combos::expansion_summary;
use crate::report::export::{self, CheckView};
use crate::report::solve::stiffness_words;
use crate::report::summary::{Selection, Setting, Summary, TableInfo};

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
    /// `--lean`: JSON and CSV without each case's member results and buckled shape (the
    /// envelopes, governing moments, story figures and reactions stay); the run then keeps
    /// no case's members, as the one-page summary does. Not with `detail`.
    pub lean: bool,
    /// `--service`: the serviceability table of the run (shipped name or path); overrides
    /// the model's `[combinations] service`.
    pub service: Option<String>,
    /// `--service-stiffness`: `gross` or `aci-service`; overrides the model.
    pub service_stiffness: Option<String>,
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
    /// Every case's member results and buckled shape; without them (`case_detail` false)
    /// the report holds what the one-page summary prints, and the envelope is complete.
    pub report: CheckReport,
    /// Whether `report` keeps every case's member results ([`run_check_keeping`]).
    pub case_detail: bool,
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
            envelope: &self.envelope,
            service: self.service.as_ref().map(|s| &s.report),
            detail: false,
            case_detail: self.case_detail,
        }
    }

    /// What the exporters read of this run: the summary (with `detail`), the approximate
    /// check and the factored cases.
    pub fn view(&self, detail: bool) -> CheckView<'_> {
        let mut summary = self.summary();
        summary.detail = detail;
        CheckView {
            summary,
            approximate: self.approximate.as_ref(),
            cases: &self.cases,
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
/// `progress(done, total)` after each) and envelope the results. The report keeps every
/// case's detail.
pub fn run_check(
    model_path: &Path,
    args: &CheckArgs,
    progress: &mut dyn FnMut(usize, usize),
) -> Result<CheckRun, AppError> {
    run_check_keeping(model_path, args, progress, true)
}

/// Whether the output of `format` reads every case's member results: the per-case detail
/// (`detail`), the JSON document (its `report` section) and the CSV files (the detail
/// tables), unless `lean` leaves them out. The one-page text or Markdown summary reads
/// only the envelope.
pub fn needs_case_detail(format: CheckFormat, detail: bool, lean: bool) -> bool {
    detail || (!lean && matches!(format, CheckFormat::Json | CheckFormat::Csv))
}

/// The run `args` ask for: every case's member results kept only where the output reads
/// them ([`needs_case_detail`]). `--lean` with `--detail` or `--case` is refused: those show
/// what the lean run leaves out.
pub fn run_check_for(
    model_path: &Path,
    args: &CheckArgs,
    progress: &mut dyn FnMut(usize, usize),
) -> Result<CheckRun, AppError> {
    let detail = args.detail || args.case.is_some();
    if args.lean && detail {
        return Err(AppError::Usage(
            "--lean leaves out each case's member results, which --detail and --case show: \
             give one or the other"
                .into(),
        ));
    }
    let keep = needs_case_detail(args.format, detail, args.lean);
    run_check_keeping(model_path, args, progress, keep)
}

/// [`run_check`]; with `case_detail` false, each case's member results are folded into the
/// envelope as the case is checked and then dropped with its buckled shape
/// ([`crate::check::CaseCheck::drop_member_detail`]), so that the run holds the members'
/// envelopes rather than every case's results (issue 21: memory linear in the frame, not
/// in frame × cases).
pub fn run_check_keeping(
    model_path: &Path,
    args: &CheckArgs,
    progress: &mut dyn FnMut(usize, usize),
    case_detail: bool,
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
    // The cases the report keeps (a `--case` prefix may also name a notional variant).
    let kept = |id: &str| args.case.as_deref().is_none_or(|p| id.starts_with(p));
    let mut fold = crate::envelope::MemberFold::default();
    let mut report = if service_only {
        empty_report(&model)
    } else {
        let times = crate::check::StageTimes::default();
        crate::check::check_streamed(&model, &cases, progress, &times, &mut |c| {
            if kept(&c.id) {
                fold.add(c);
            }
            if !case_detail {
                c.drop_member_detail();
            }
        })
        .map_err(|e| analysis(&model, model_path, e))?
    };
    report.cases.retain(|c| kept(&c.id));
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
    let envelope = crate::envelope::envelope_with(&report, fold);
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
        case_detail,
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
        caution: crate::caution::CAUTION.to_string(),
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

/// Render a check run in `format` (`detail` gives the summary's tables every column and
/// adds the per-case tables after the summary, in text and Markdown), in memory.
pub fn render_check(run: &CheckRun, format: CheckFormat, detail: bool) -> Rendered {
    debug_assert!(
        run.case_detail || !detail,
        "the per-case detail reads every case's member results: run with run_check"
    );
    Rendered {
        files: export::offered(format, |e, out| e.check(&run.view(detail), out)),
    }
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
    let run = run_check_for(model_path, args, progress)?;
    let detail = args.detail || args.case.is_some();
    let unstable = run.report.cases.iter().any(|c| !c.stable)
        || run
            .service
            .as_ref()
            .is_some_and(|s| s.report.cases.iter().any(|c| !c.converged));
    let rendered = render_check(&run, args.format, detail);
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
    let run = run_check_for(model_path, args, progress)?;
    let detail = args.detail || args.case.is_some();
    let unstable = run.report.cases.iter().any(|c| !c.stable);
    let written = emit_check(&run, args.format, detail, output)?;
    Ok((written, unstable))
}

/// Write a check run's report in `format` to `output` (a file; for CSV a directory of
/// files), or print it. Each part goes straight from its exporter into its file (or
/// standard output), so JSON and CSV are never held whole in memory, and each file is still
/// written whole or not at all ([`Destination`]). Returns the paths written.
pub fn emit_check(
    run: &CheckRun,
    format: CheckFormat,
    detail: bool,
    output: Option<&Path>,
) -> Result<Vec<PathBuf>, AppError> {
    debug_assert!(
        run.case_detail || !detail,
        "the per-case detail reads every case's member results: run with run_check"
    );
    let mut destination = Destination::new(output);
    export::exporter(&format.to_string())?.check(&run.view(detail), &mut destination)?;
    destination.finish()
}

/// `plumbline report MODEL`: the check as one self-contained HTML file.
pub fn report(
    model_path: &Path,
    args: &CheckArgs,
    progress: &mut dyn FnMut(usize, usize),
) -> Result<String, AppError> {
    let run = run_check(model_path, args, progress)?;
    let files = export::to_memory("html", |e, out| e.check(&run.view(false), out))?;
    Ok(Rendered { files }.joined())
}
