//! Expansion of a combination table into factored cases for a model's load cases.
//!
//! Steps, for each combination of the table:
//! 1. **Table variants** (independent of the model): the product of every term's choices
//!    (one-of options, each leading action with its companions, unfavourable/favourable
//!    factor, both signs of a reversible action), for every on/off setting of the optional
//!    groups (all on first). More than one variant: each gets a letter (`2.3.1-3a`, `3b`…),
//!    stable whatever the model holds.
//! 2. **Missing actions**: an action is present when the model has a load case of its
//!    category. A variant whose principal actions (those marked `principal`, the leading
//!    action of a rotation, or else all its variable actions) are all missing is skipped and
//!    reported; other missing terms simply drop out. A factor that evaluates to zero drops
//!    its term.
//! 3. **Alternatives**: load cases of one category add up; cases sharing an
//!    `alternative_group` are alternatives, one factored case per alternative, cross
//!    product over groups (`/1`, `/2`… appended to the id when there is more than one).
//! 4. **Merging**: a case whose factors equal an earlier case's is dropped and the merge
//!    reported.

use std::collections::{BTreeMap, BTreeSet};

use serde::Serialize;

use super::expr::{EvalError, resolve};
use super::{ActionFactor, ActionKind, Basis, ComboTable, Factor, TermKind};
use crate::diag::FileError;
use crate::model::{ActionCategory, LoadCase};

/// A factored load case: factors on the model's load cases.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct FactoredCase {
    /// Combination id, variant letter and alternative number, e.g. `2.3.1-4c/2`.
    pub id: String,
    /// Readable form, e.g. `1.2D + 1.0W(W-left) + 1.0L + 0.5S`.
    pub expression: String,
    pub basis: Basis,
    /// Id of the table combination it comes from.
    pub combination: String,
    /// (index into the model's load cases, factor), nonzero only, by index.
    pub factors: Vec<(usize, f64)>,
    /// The combination's note (when a factor may be reduced, etc.).
    pub note: Option<String>,
}

impl FactoredCase {
    /// Factor on load case `case_index` (0 when the case does not take part).
    pub fn factor_of(&self, case_index: usize) -> f64 {
        self.factors
            .iter()
            .find(|(i, _)| *i == case_index)
            .map_or(0.0, |(_, f)| *f)
    }
}

/// Cases found identical to a kept case once the model's load cases are applied.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Merged {
    pub kept: String,
    pub dropped: Vec<String>,
}

/// A combination (or one variant of it) not generated because the model lacks every one of
/// its principal actions.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Skipped {
    /// Combination id, or variant id when only some variants are skipped.
    pub combination: String,
    /// Action symbols the model has no load case for.
    pub missing: Vec<String>,
}

/// Load cases of a category that no action of the table draws on: left out of every case.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Unplaced {
    pub category: ActionCategory,
    pub cases: Vec<String>,
}

/// The result of [`expand`].
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Expansion {
    pub cases: Vec<FactoredCase>,
    pub merged: Vec<Merged>,
    pub skipped: Vec<Skipped>,
    pub warnings: Vec<Unplaced>,
}

/// One action with its signed factor inside a table variant.
#[derive(Debug, Clone)]
struct Part<'t> {
    action: usize,
    factor: &'t Factor,
    sign: f64,
    principal: bool,
}

/// The load cases of one category: those that always add up, and the alternative groups.
#[derive(Debug, Default)]
struct CategoryCases {
    always: Vec<usize>,
    groups: Vec<(String, Vec<usize>)>,
}

/// Generate the factored cases of `table` for `cases`, with parameter `overrides`.
///
/// Errors: an override names a parameter the table does not declare, or is not finite; a
/// generated case needs a parameter that has no default and no override.
pub fn expand(
    table: &ComboTable,
    cases: &[LoadCase],
    overrides: &BTreeMap<String, f64>,
) -> Result<Expansion, FileError> {
    check_overrides(table, overrides)?;
    let defaults = table
        .params
        .iter()
        .map(|p| (p.name.clone(), p.default.as_ref().map(|d| d.expr.clone())))
        .collect();
    let values = resolve(&defaults, overrides);
    let by_cat = cases_by_category(cases);

    let mut out = Expansion {
        cases: Vec::new(),
        merged: Vec::new(),
        skipped: Vec::new(),
        warnings: unplaced(table, cases),
    };
    for comb in &table.combinations {
        let variants = table_variants(&comb.terms);
        let lettered = variants.len() > 1;
        let mut skipped_here: Vec<Skipped> = Vec::new();
        for (vi, parts) in variants.iter().enumerate() {
            let vid = if lettered {
                format!("{}{}", comb.id, letters(vi))
            } else {
                comb.id.clone()
            };
            // Principal actions: flagged ones, else the variable ones. Checked on presence
            // before any factor is evaluated (a parameter may only matter to skipped rows).
            let any_flagged = parts.iter().any(|p| p.principal);
            let is_principal = |p: &Part| {
                if any_flagged {
                    p.principal
                } else {
                    table.actions[p.action].kind == ActionKind::Variable
                }
            };
            let principal: Vec<usize> = (0..parts.len())
                .filter(|&i| is_principal(&parts[i]))
                .collect();
            let present: Vec<bool> = parts
                .iter()
                .map(|p| by_cat.contains_key(&table.actions[p.action].category))
                .collect();
            // Evaluate the factors of the present parts; a zero factor drops the term.
            let mut live: Vec<(usize, f64)> = Vec::new();
            let mut nonzero: Vec<bool> = vec![false; parts.len()];
            let principal_present = principal.is_empty() || principal.iter().any(|&i| present[i]);
            if principal_present {
                for (i, p) in parts.iter().enumerate().filter(|(i, _)| present[*i]) {
                    let x = p.sign * eval_factor(table, p.factor, &values, &comb.id)?;
                    if x != 0.0 {
                        nonzero[i] = true;
                        live.push((p.action, x));
                    }
                }
            }
            let lacking = live.is_empty()
                || (!principal.is_empty() && principal.iter().all(|&i| !nonzero[i]));
            if lacking {
                let set: Vec<usize> = if principal.is_empty() {
                    (0..parts.len()).collect()
                } else {
                    principal
                };
                let missing: BTreeSet<String> = set
                    .iter()
                    .filter(|&&i| !nonzero[i])
                    .map(|&i| table.actions[parts[i].action].symbol.clone())
                    .collect();
                skipped_here.push(Skipped {
                    combination: vid,
                    missing: missing.into_iter().collect(),
                });
                continue;
            }
            let alts = alternatives(table, &live, &by_cat);
            let numbered = alts.len() > 1;
            for (ai, choice) in alts.iter().enumerate() {
                let id = if numbered {
                    format!("{vid}/{}", ai + 1)
                } else {
                    vid.clone()
                };
                let fc = factored_case(table, comb, &live, choice, &by_cat, cases, id);
                push_merging(&mut out, fc);
            }
        }
        if !skipped_here.is_empty() && skipped_here.len() == variants.len() {
            let missing: BTreeSet<String> =
                skipped_here.into_iter().flat_map(|s| s.missing).collect();
            out.skipped.push(Skipped {
                combination: comb.id.clone(),
                missing: missing.into_iter().collect(),
            });
        } else {
            out.skipped.extend(skipped_here);
        }
    }
    Ok(out)
}

/// Every override must name a declared parameter and be a finite number.
fn check_overrides(table: &ComboTable, overrides: &BTreeMap<String, f64>) -> Result<(), FileError> {
    let names: Vec<&str> = table.params.iter().map(|p| p.name.as_str()).collect();
    for (k, v) in overrides {
        let problem = if !names.contains(&k.as_str()) {
            Some(format!(
                "parameter `{k}` is not declared in table `{}`",
                table.file
            ))
        } else if !v.is_finite() {
            Some(format!("parameter `{k}` must be a finite number"))
        } else {
            None
        };
        if let Some(message) = problem {
            return Err(FileError {
                file: table.file.clone(),
                line: 0,
                column: 0,
                field: format!("params.{k}"),
                message,
                help: Some(if names.is_empty() {
                    "this table declares no parameters".to_string()
                } else {
                    format!("declared parameters: {}", names.join(", "))
                }),
                span: None,
                source_text: None,
            });
        }
    }
    Ok(())
}

fn eval_factor(
    table: &ComboTable,
    f: &Factor,
    values: &BTreeMap<String, Option<f64>>,
    comb: &str,
) -> Result<f64, FileError> {
    f.expr.eval(values).map_err(|e| {
        let (span, field, message) = match e {
            EvalError::Unset(n) | EvalError::Unknown(n) => {
                let span = table.param(&n).map_or(f.span.clone(), |p| p.span.clone());
                (
                    span,
                    format!("params.{n}"),
                    format!("parameter `{n}` has no value and combination `{comb}` needs it"),
                )
            }
            EvalError::NotFinite => (
                f.span.clone(),
                format!("combination {comb}"),
                format!(
                    "factor `{}` is not a finite number (division by zero?)",
                    f.text
                ),
            ),
        };
        FileError::at(&table.file, &table.source_text, Some(span), field, message)
            .with_help("set it in the model file's combination parameters or with --set NAME=VALUE")
    })
}

/// Load cases grouped by category: ungrouped ones, then alternative groups in order of
/// first appearance.
fn cases_by_category(cases: &[LoadCase]) -> BTreeMap<ActionCategory, CategoryCases> {
    let mut m: BTreeMap<ActionCategory, CategoryCases> = BTreeMap::new();
    for (i, c) in cases.iter().enumerate() {
        let e = m.entry(c.category).or_default();
        match &c.alternative_group {
            None => e.always.push(i),
            Some(g) => match e.groups.iter_mut().find(|(n, _)| n == g) {
                Some((_, v)) => v.push(i),
                None => e.groups.push((g.clone(), vec![i])),
            },
        }
    }
    m
}

/// Categories used by the model that no action of the table draws on.
fn unplaced(table: &ComboTable, cases: &[LoadCase]) -> Vec<Unplaced> {
    let mut out: Vec<Unplaced> = Vec::new();
    for c in cases {
        if table.actions.iter().any(|a| a.category == c.category) {
            continue;
        }
        match out.iter_mut().find(|u| u.category == c.category) {
            Some(u) => u.cases.push(c.id.clone()),
            None => out.push(Unplaced {
                category: c.category,
                cases: vec![c.id.clone()],
            }),
        }
    }
    out
}

/// `a`, `b`, … `z`, `aa`, `ab`, … for variant index `i`.
fn letters(i: usize) -> String {
    let mut n = i + 1;
    let mut s = Vec::new();
    while n > 0 {
        n -= 1;
        s.push(b'a' + (n % 26) as u8);
        n /= 26;
    }
    s.reverse();
    String::from_utf8(s).unwrap_or_default()
}

/// The signed single-action choices of an action factor: unfavourable then favourable
/// factor, each with + then − when reversible.
fn af_choices(af: &ActionFactor, principal: bool) -> Vec<Part<'_>> {
    let signs: &[f64] = if af.reversible { &[1.0, -1.0] } else { &[1.0] };
    std::iter::once(&af.factor)
        .chain(af.favourable.as_ref())
        .flat_map(|f| {
            signs.iter().map(move |&sign| Part {
                action: af.action,
                factor: f,
                sign,
                principal,
            })
        })
        .collect()
}

/// The choices a term offers, each a list of parts.
fn term_choices(t: &super::Term) -> Vec<Vec<Part<'_>>> {
    match &t.kind {
        TermKind::Single(af) => af_choices(af, t.principal)
            .into_iter()
            .map(|p| vec![p])
            .collect(),
        TermKind::OneOf(opts) => opts
            .iter()
            .flat_map(|o| af_choices(o, t.principal))
            .map(|p| vec![p])
            .collect(),
        TermKind::Leading {
            leading,
            companions,
            optional_companions,
        } => {
            let mut out = Vec::new();
            for lead in leading {
                let comps: Vec<Part> = companions
                    .iter()
                    .filter(|c| c.action != lead.action)
                    .flat_map(|c| af_choices(c, false).into_iter().take(1))
                    .collect();
                for l in af_choices(lead, true) {
                    let mut full = vec![l.clone()];
                    full.extend(comps.iter().cloned());
                    out.push(full);
                    if *optional_companions && !comps.is_empty() {
                        out.push(vec![l]);
                    }
                }
            }
            out
        }
    }
}

/// All table variants of a combination: every on/off setting of the optional groups (all
/// on first), then the product of the active terms' choices in term order.
fn table_variants(terms: &[super::Term]) -> Vec<Vec<Part<'_>>> {
    let mut groups: Vec<&str> = Vec::new();
    for t in terms {
        if let Some(g) = &t.optional
            && !groups.contains(&g.as_str())
        {
            groups.push(g);
        }
    }
    let mut out = Vec::new();
    for mask in 0..(1usize << groups.len()) {
        let off = |g: &str| {
            groups
                .iter()
                .position(|x| *x == g)
                .is_some_and(|i| mask & (1 << i) != 0)
        };
        let mut acc: Vec<Vec<Part>> = vec![Vec::new()];
        for t in terms
            .iter()
            .filter(|t| t.optional.as_deref().is_none_or(|g| !off(g)))
        {
            let choices = term_choices(t);
            acc = acc
                .iter()
                .flat_map(|a| {
                    choices.iter().map(move |c| {
                        let mut v = a.clone();
                        v.extend(c.iter().cloned());
                        v
                    })
                })
                .collect();
        }
        out.extend(acc);
    }
    out
}

/// One choice of alternative per (category, group) for the categories of `live`, as a map
/// category → chosen group members (indices into the groups of that category).
fn alternatives(
    table: &ComboTable,
    live: &[(usize, f64)],
    by_cat: &BTreeMap<ActionCategory, CategoryCases>,
) -> Vec<BTreeMap<ActionCategory, Vec<usize>>> {
    let mut cats: Vec<ActionCategory> = Vec::new();
    for (a, _) in live {
        let c = table.actions[*a].category;
        if !cats.contains(&c) {
            cats.push(c);
        }
    }
    let mut acc: Vec<BTreeMap<ActionCategory, Vec<usize>>> = vec![BTreeMap::new()];
    for c in cats {
        let cc = &by_cat[&c];
        for (gi, (_, members)) in cc.groups.iter().enumerate() {
            acc = acc
                .iter()
                .flat_map(|m| {
                    members.iter().map(move |&case| {
                        let mut m = m.clone();
                        let v = m.entry(c).or_insert_with(Vec::new);
                        debug_assert_eq!(v.len(), gi);
                        v.push(case);
                        m
                    })
                })
                .collect();
        }
    }
    acc
}

/// Build one factored case from the evaluated parts and a choice of alternatives.
fn factored_case(
    table: &ComboTable,
    comb: &super::Combination,
    live: &[(usize, f64)],
    choice: &BTreeMap<ActionCategory, Vec<usize>>,
    by_cat: &BTreeMap<ActionCategory, CategoryCases>,
    cases: &[LoadCase],
    id: String,
) -> FactoredCase {
    let mut factors: BTreeMap<usize, f64> = BTreeMap::new();
    let mut expression = String::new();
    for (a, x) in live {
        let action = &table.actions[*a];
        let chosen: &[usize] = choice.get(&action.category).map_or(&[], |v| v.as_slice());
        for &ci in by_cat[&action.category].always.iter().chain(chosen) {
            *factors.entry(ci).or_insert(0.0) += x;
        }
        let label = if chosen.is_empty() {
            String::new()
        } else {
            format!(
                "({})",
                chosen
                    .iter()
                    .map(|&i| cases[i].id.as_str())
                    .collect::<Vec<_>>()
                    .join(", ")
            )
        };
        let sep = match (expression.is_empty(), *x < 0.0) {
            (true, false) => "",
            (true, true) => "-",
            (false, false) => " + ",
            (false, true) => " - ",
        };
        expression.push_str(&format!(
            "{sep}{}{}{label}",
            format_factor(x.abs()),
            action.symbol
        ));
    }
    FactoredCase {
        id,
        expression,
        basis: table.basis,
        combination: comb.id.clone(),
        factors: factors
            .into_iter()
            .filter(|(_, f)| f.abs() > 1e-12)
            .collect(),
        note: comb.note.clone(),
    }
}

/// A factor as the standards print it: at most four decimals, at least one (`1.0`, `1.35`).
pub fn format_factor(x: f64) -> String {
    let s = format!("{x:.4}");
    let s = s.trim_end_matches('0');
    if s.ends_with('.') {
        format!("{s}0")
    } else {
        s.to_string()
    }
}

/// Two factor lists are the same case (relative tolerance 1e-9).
fn same_factors(a: &[(usize, f64)], b: &[(usize, f64)]) -> bool {
    a.len() == b.len()
        && a.iter()
            .zip(b)
            .all(|((i, x), (j, y))| i == j && (x - y).abs() <= 1e-9 * x.abs().max(y.abs()).max(1.0))
}

fn push_merging(out: &mut Expansion, fc: FactoredCase) {
    if let Some(kept) = out
        .cases
        .iter()
        .find(|k| same_factors(&k.factors, &fc.factors))
    {
        let kept_id = kept.id.clone();
        match out.merged.iter_mut().find(|m| m.kept == kept_id) {
            Some(m) => m.dropped.push(fc.id),
            None => out.merged.push(Merged {
                kept: kept_id,
                dropped: vec![fc.id],
            }),
        }
    } else {
        out.cases.push(fc);
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn letters_run_past_z() {
        assert_eq!(letters(0), "a");
        assert_eq!(letters(25), "z");
        assert_eq!(letters(26), "aa");
        assert_eq!(letters(27), "ab");
    }

    #[test]
    fn factors_print_like_the_standards() {
        assert_eq!(format_factor(1.0), "1.0");
        assert_eq!(format_factor(1.35), "1.35");
        assert_eq!(format_factor(0.6 * 1.5), "0.9");
        assert_eq!(format_factor(0.525), "0.525");
    }
}
