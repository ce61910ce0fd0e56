//! `plumbline compare`: the same model under variants of the check's settings.

use std::path::Path;

use super::check::{CheckArgs, CheckRun, run_check};
use super::error::AppError;
use crate::model::SecondOrderMethod;

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
