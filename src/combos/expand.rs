//! Expansion of a combination table into factored cases for a model's load cases.
//!
//! Steps, for each combination of the table:
//! 1. **Choices** (table only): every term offers choices (one-of options, each leading
//!    action, unfavourable/favourable factor, both signs of a reversible action). A variant
//!    takes one choice per term; its letter (`2.3.1-3a`, `3b`…) is its index in the product
//!    of the terms' choices, last term fastest, so a letter means the same for every model.
//! 2. **Accompanying actions that may drop out**: an `optional` term (alone, or with the
//!    other terms of its named group) and each companion of a leading group with
//!    `optional-companions` are also generated without it, when the model has a load case
//!    for it. The id names what was left out: `2.3.1-4b~L` is 2.3.1-4b without L. ASCE/SEI
//!    7-16 §2.3.1 ("the effects of one or more loads not acting shall be investigated") and
//!    EN 1990 Table A1.2(B) (γQ = 0 where a variable action is favourable) ask for these.
//! 3. **Missing actions**: an action is present when the model has a load case of its
//!    category. A variant whose principal actions (those marked `principal`, the leading
//!    action of a rotation, or else all its variable actions) are all missing or zero is
//!    skipped and reported; other missing terms simply drop out.
//! 4. **Alternatives**: load cases of one category add up; cases sharing an
//!    `alternative_group` are alternatives, one factored case per alternative, cross
//!    product over groups. When there is more than one, the id names the load case drawn from
//!    each group of two or more (`/WL`, `/WL+Su`; `/-WL` for a reversed case). A case with
//!    `reverse` is its own alternative with every load negated.
//! 5. **Bounded work**: the number of cases a combination can give for the model is counted
//!    before anything is generated; beyond [`MAX_FACTORED_CASES`] it is an error naming the
//!    combination.
//! 6. **Merging**: a case whose factors equal an earlier case's is dropped and the merge
//!    reported.

use std::collections::{BTreeMap, BTreeSet};

use serde::Serialize;

use super::expr::{EvalError, resolve};
use super::levels::{CaseScale, case_scales};
use super::settings::{Notice, Settings, format_factor};
use super::types::{
    ActionFactor, ActionKind, Basis, Combination, ComboTable, Factor, Term, TermKind,
};
use crate::diag::FileError;
use crate::model::{ActionCategory, LoadCase, ModelSpans};

/// The most factored cases one combination (and a whole table) may give for a model,
/// counted before merging. Beyond it, expansion stops with an error that names the
/// combination: each case is a full analysis, and a table that asks for more is almost
/// certainly written wrongly (too many optional terms or alternatives).
pub const MAX_FACTORED_CASES: usize = 10_000;

/// A factored load case: factors on the model's load cases.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct FactoredCase {
    /// Combination id, variant letter, left-out actions and the load cases of the
    /// alternative, e.g. `2.3.1-4c~L/W-right`.
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
    /// Located warnings: a lateral load given from one side only, a load level assumed.
    pub notices: Vec<Notice>,
}

/// One action with its signed factor inside a variant.
#[derive(Debug, Clone)]
struct Part<'t> {
    action: usize,
    factor: &'t Factor,
    allow_negative: bool,
    sign: f64,
    principal: bool,
    /// A companion of a leading group that may drop out by itself.
    droppable: bool,
}

/// One option of a slot (a term, or the terms of a named optional group): the choice index
/// per term it stands for and the parts it contributes.
#[derive(Debug, Clone)]
struct SlotOption<'t> {
    digits: Vec<(usize, usize)>,
    parts: Vec<Part<'t>>,
    /// The slot left out (optional terms only).
    off: bool,
}

/// The options of one slot for this model.
#[derive(Debug, Clone)]
struct Slot<'t> {
    options: Vec<SlotOption<'t>>,
}

/// One member of an alternative: a load case and its sign (−1 for the reversed case).
type Member = (usize, f64);

/// The load cases of one category: those that always add up, and the alternative groups.
#[derive(Debug, Default)]
struct CategoryCases {
    always: Vec<usize>,
    groups: Vec<(String, Vec<Member>)>,
}

impl CategoryCases {
    /// Number of alternative choices (product of the group sizes).
    fn alternatives(&self) -> f64 {
        self.groups.iter().map(|(_, m)| m.len() as f64).product()
    }
}

/// Generate the factored cases of `table` for `cases`, with parameter `overrides` (taken as
/// given on the command line).
///
/// Errors: an override names a parameter the table does not declare, is not finite or out
/// of the declared range; a generated case needs a parameter that has no value; a factor
/// evaluates negative without the table allowing it; a combination would give more than
/// [`MAX_FACTORED_CASES`] cases.
pub fn expand(
    table: &ComboTable,
    cases: &[LoadCase],
    overrides: &BTreeMap<String, f64>,
) -> Result<Expansion, FileError> {
    expand_with(table, cases, &Settings::with_sets(overrides))
}

/// [`expand`] with everything the model says: parameters and conversions with their
/// locations, and the levels of its own table. A load case whose level differs from the
/// table's is an error located in the model, unless a conversion is stated.
pub fn expand_with(
    table: &ComboTable,
    cases: &[LoadCase],
    settings: &Settings,
) -> Result<Expansion, FileError> {
    let values = param_values(table, settings)?;
    let scale = case_scales(table, cases, settings)?;
    let by_cat = cases_by_category(cases);

    let mut out = Expansion {
        cases: Vec::new(),
        merged: Vec::new(),
        skipped: Vec::new(),
        warnings: unplaced(table, cases),
        notices: scale.notices.clone(),
    };
    out.notices
        .extend(one_sided_lateral(table, cases, &by_cat, &settings.written));
    let mut total = 0.0;
    for comb in &table.combinations {
        let slots = slots(comb, table, &by_cat);
        let count = count_cases(&slots, table, &by_cat);
        total += count;
        if count > MAX_FACTORED_CASES as f64 || total > MAX_FACTORED_CASES as f64 {
            return Err(too_many(table, comb, count, total));
        }
        let ctx = Row {
            table,
            comb,
            cases,
            by_cat: &by_cat,
            values: &values,
            scale: &scale,
            settings,
            radix: comb.terms.iter().map(|t| term_choices(t).len()).collect(),
            row_has_principal: comb
                .terms
                .iter()
                .any(|t| t.principal || matches!(t.kind, TermKind::Leading { .. })),
        };
        let mut skipped_here: Vec<Skipped> = Vec::new();
        let mut generated = 0usize;
        let mut chosen: Vec<&SlotOption> = Vec::new();
        walk(&slots, &mut chosen, &mut |variant| {
            ctx.variant(variant, &mut out, &mut skipped_here, &mut generated)
        })?;
        if generated == 0 && !skipped_here.is_empty() {
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

/// The value of every parameter of `table` under `settings`: the model's and the command
/// line's values (checked as [`expand_with`] checks them), else the table's default; None
/// where a parameter has neither.
pub fn param_values(
    table: &ComboTable,
    settings: &Settings,
) -> Result<BTreeMap<String, Option<f64>>, FileError> {
    let overrides = checked_overrides(table, settings)?;
    let defaults = table
        .params
        .iter()
        .map(|p| (p.name.clone(), p.default.as_ref().map(|d| d.expr.clone())))
        .collect();
    Ok(resolve(&defaults, &overrides))
}

/// Visit every combination of one option per slot, in order (first options first).
fn walk<'s, 't>(
    slots: &'s [Slot<'t>],
    chosen: &mut Vec<&'s SlotOption<'t>>,
    f: &mut impl FnMut(&[&'s SlotOption<'t>]) -> Result<(), FileError>,
) -> Result<(), FileError> {
    match slots.split_first() {
        None => f(chosen),
        Some((first, rest)) => {
            for o in &first.options {
                chosen.push(o);
                walk(rest, chosen, f)?;
                chosen.pop();
            }
            Ok(())
        }
    }
}

fn too_many(table: &ComboTable, comb: &Combination, count: f64, total: f64) -> FileError {
    let message = if count > MAX_FACTORED_CASES as f64 {
        format!(
            "combination {} would give {count:.0} factored cases for this model; the limit is {MAX_FACTORED_CASES}",
            comb.id
        )
    } else {
        format!(
            "the table would give more than {MAX_FACTORED_CASES} factored cases for this model ({total:.0} up to combination {})",
            comb.id
        )
    };
    FileError::at(
        &table.file,
        &table.source_text,
        Some(comb.span.clone()),
        format!("combination {}", comb.id),
        message,
    )
    .with_help("each optional term, accompanying action that may drop out and alternative multiplies the count: give fewer, or split the combination")
}

/// Everything one combination's variants need.
struct Row<'a, 't> {
    table: &'t ComboTable,
    comb: &'t Combination,
    cases: &'a [LoadCase],
    by_cat: &'a BTreeMap<ActionCategory, CategoryCases>,
    values: &'a BTreeMap<String, Option<f64>>,
    scale: &'a CaseScale,
    settings: &'a Settings,
    /// Number of choices of each term (for the variant letters).
    radix: Vec<usize>,
    /// The row marks principal terms or rotates a leading action.
    row_has_principal: bool,
}

impl Row<'_, '_> {
    fn present(&self, action: usize) -> bool {
        self.by_cat
            .contains_key(&self.table.actions[action].category)
    }

    fn symbol(&self, action: usize) -> &str {
        &self.table.actions[action].symbol
    }

    /// The variant id: combination id and letter (when the row has several variants).
    fn variant_id(&self, variant: &[&SlotOption]) -> String {
        let total: f64 = self.radix.iter().map(|&r| r as f64).product();
        if total <= 1.0 {
            return self.comb.id.clone();
        }
        let mut digit = vec![0usize; self.radix.len()];
        for o in variant {
            for &(t, d) in &o.digits {
                digit[t] = d;
            }
        }
        let mut index: u128 = 0;
        for (t, &r) in self.radix.iter().enumerate() {
            index = index
                .saturating_mul(r as u128)
                .saturating_add(digit[t] as u128);
        }
        format!("{}{}", self.comb.id, letters(index))
    }

    /// Generate (or skip) one variant and its subsets of dropped companions.
    fn variant(
        &self,
        variant: &[&SlotOption],
        out: &mut Expansion,
        skipped: &mut Vec<Skipped>,
        generated: &mut usize,
    ) -> Result<(), FileError> {
        let vid = self.variant_id(variant);
        // Actions left out with their slot (present ones only: absent ones change nothing).
        let mut off: Vec<usize> = variant
            .iter()
            .filter(|o| o.off)
            .flat_map(|o| o.parts.iter().map(|p| p.action))
            .filter(|&a| self.present(a))
            .collect();
        off.sort_unstable();
        off.dedup();
        let parts: Vec<&Part> = variant
            .iter()
            .filter(|o| !o.off)
            .flat_map(|o| o.parts.iter())
            .collect();
        let is_principal = |p: &Part| {
            if self.row_has_principal {
                p.principal
            } else {
                self.table.actions[p.action].kind == ActionKind::Variable
            }
        };
        let principal: Vec<&&Part> = parts.iter().filter(|p| is_principal(p)).collect();
        // Evaluate the present parts (none when every principal action is missing: a
        // parameter may matter only to rows the model does not use); a zero factor drops
        // the term.
        let mut live: Vec<(&Part, f64)> = Vec::new();
        if principal.is_empty() || principal.iter().any(|p| self.present(p.action)) {
            for p in parts.iter().filter(|p| self.present(p.action)) {
                let x = self.eval(p)?;
                if x != 0.0 {
                    live.push((p, p.sign * x));
                }
            }
        }
        let lacking = live.is_empty()
            || (!principal.is_empty() && !live.iter().any(|(p, _)| is_principal(p)));
        if lacking {
            if off.is_empty() {
                let missing: BTreeSet<String> = principal
                    .iter()
                    .map(|p| p.action)
                    .chain(if principal.is_empty() {
                        parts.iter().map(|p| p.action).collect::<Vec<_>>()
                    } else {
                        Vec::new()
                    })
                    .filter(|&a| !live.iter().any(|(p, _)| p.action == a))
                    .map(|a| self.symbol(a).to_string())
                    .collect();
                skipped.push(Skipped {
                    combination: vid,
                    missing: missing.into_iter().collect(),
                });
            }
            return Ok(());
        }
        // Each companion that may drop out: with and without it (all in first).
        let droppable: Vec<usize> = (0..live.len()).filter(|&i| live[i].0.droppable).collect();
        for mask in 0..(1u64 << droppable.len()) {
            let dropped: Vec<usize> = droppable
                .iter()
                .enumerate()
                .filter(|(b, _)| mask & (1 << b) != 0)
                .map(|(_, &i)| i)
                .collect();
            let active: Vec<(usize, f64)> = live
                .iter()
                .enumerate()
                .filter(|(i, _)| !dropped.contains(i))
                .map(|(_, (p, x))| (p.action, *x))
                .collect();
            let mut left_out: Vec<usize> = off
                .iter()
                .copied()
                .chain(dropped.iter().map(|&i| live[i].0.action))
                .collect();
            left_out.sort_unstable();
            left_out.dedup();
            let suffix: String = left_out
                .iter()
                .map(|&a| format!("~{}", self.symbol(a)))
                .collect();
            let base = format!("{vid}{suffix}");
            let alts = alternatives(self.table, &active, self.by_cat);
            let named = alts.len() > 1;
            let order = active_categories(self.table, &active);
            for choice in &alts {
                let id = if named {
                    let label = alternative_label(&order, choice, self.by_cat, self.cases);
                    format!("{base}/{label}")
                } else {
                    base.clone()
                };
                let fc = self.factored_case(&active, choice, id);
                push_merging(out, fc);
                *generated += 1;
            }
        }
        Ok(())
    }

    /// The value of a part's factor: finite, and not negative unless the table allows it.
    fn eval(&self, p: &Part) -> Result<f64, FileError> {
        let comb = &self.comb.id;
        let f = p.factor;
        let x = f.expr.eval(self.values).map_err(|e| {
            let (span, field, message) = match e {
                EvalError::Unset(n) | EvalError::Unknown(n) => {
                    let span = self
                        .table
                        .param(&n)
                        .map_or(f.span.clone(), |q| q.span.clone());
                    (
                        span,
                        format!("params.{n}"),
                        format!("parameter `{n}` has no value and combination {comb} needs it"),
                    )
                }
                EvalError::NotFinite => (
                    f.span.clone(),
                    format!("combination {comb}"),
                    format!(
                        "factor `{}` on {} is not a finite number (division by zero?)",
                        f.text,
                        self.symbol(p.action)
                    ),
                ),
            };
            FileError::at(
                &self.table.file,
                &self.table.source_text,
                Some(span),
                field,
                message,
            )
            .with_help("set it in the model file's [combinations] params or with --set NAME=VALUE")
        })?;
        let with = || {
            let used: Vec<String> = f
                .expr
                .params()
                .into_iter()
                .map(|n| {
                    let v = self.values.get(&n).copied().flatten().unwrap_or(f64::NAN);
                    format!("{n} = {}{}", value_text(v), self.origin_of(&n))
                })
                .collect();
            if used.is_empty() {
                String::new()
            } else {
                format!(" with {}", used.join(", "))
            }
        };
        if x.abs() > MAX_LOAD_FACTOR {
            return Err(FileError::at(
                &self.table.file,
                &self.table.source_text,
                Some(f.span.clone()),
                format!("combination {comb}"),
                format!(
                    "factor `{}` on {} evaluates to {:e}{}; a load factor above {MAX_LOAD_FACTOR} is \
                     taken for a slip in a parameter value",
                    f.text,
                    self.symbol(p.action),
                    x,
                    with()
                ),
            )
            .with_help("check the parameter values (their ranges are listed by `plumbline combos NAME`)"));
        }
        if x < 0.0 && !p.allow_negative {
            let with = with();
            return Err(FileError::at(
                &self.table.file,
                &self.table.source_text,
                Some(f.span.clone()),
                format!("combination {comb}"),
                format!(
                    "factor `{}` on {} evaluates to -{}{with}; a load factor must not be negative",
                    f.text,
                    self.symbol(p.action),
                    format_factor(-x)
                ),
            )
            .with_help("check the parameter values (their ranges are listed by `plumbline combos NAME`); a table may allow a negative factor on a term with allow-negative = true"));
        }
        Ok(x)
    }

    /// Where a parameter's value came from, for messages.
    fn origin_of(&self, name: &str) -> String {
        if let Some(v) = self.settings.sets.get(name) {
            format!(" (--set {name}={})", value_text(*v))
        } else if self.settings.model_params.contains_key(name) {
            let span = self.settings.written.params.get(name);
            format!(" (model, {})", self.settings.written.place(span))
        } else {
            " (table default)".to_string()
        }
    }

    /// Build one factored case from the active parts and a choice of alternatives.
    fn factored_case(
        &self,
        active: &[(usize, f64)],
        choice: &BTreeMap<ActionCategory, Vec<Member>>,
        id: String,
    ) -> FactoredCase {
        let mut factors: BTreeMap<usize, f64> = BTreeMap::new();
        let mut expression = String::new();
        for (a, x) in active {
            let action = &self.table.actions[*a];
            let chosen: &[Member] = choice.get(&action.category).map_or(&[], |v| v.as_slice());
            let always = self.by_cat[&action.category]
                .always
                .iter()
                .map(|&i| (i, 1.0));
            let mut labels: Vec<String> = Vec::new();
            for (ci, sign) in always.chain(chosen.iter().copied()) {
                let k = self.scale.factor[ci];
                *factors.entry(ci).or_insert(0.0) += x * sign * k;
                let is_alt = chosen.iter().any(|(c, _)| *c == ci);
                if is_alt || k != 1.0 {
                    let neg = if sign < 0.0 { "−" } else { "" };
                    let conv = if k != 1.0 {
                        format!(" ×{}", format_factor(k))
                    } else {
                        String::new()
                    };
                    labels.push(format!("{neg}{}{conv}", self.cases[ci].id));
                }
            }
            let label = if labels.is_empty() {
                String::new()
            } else {
                format!("({})", labels.join(", "))
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
            basis: self.table.basis,
            combination: self.comb.id.clone(),
            factors: factors
                .into_iter()
                .filter(|(_, f)| f.abs() > 1e-12)
                .collect(),
            note: self.comb.note.clone(),
        }
    }
}

/// A parameter value for a message: plain, or in exponent form when very large or small
/// (`1e308`, never 309 digits).
fn value_text(v: f64) -> String {
    if v != 0.0 && !(1e-4..1e6).contains(&v.abs()) {
        format!("{v:e}")
    } else {
        format!("{v}")
    }
}

/// Largest load factor a combination may apply, in magnitude. Published load factors lie
/// between 0 and about 3; a factor a hundred times larger is a slip in a parameter value,
/// and one near 1e308 would overflow the factored loads (common practice, no source).
pub const MAX_LOAD_FACTOR: f64 = 100.0;

/// Parameter values of the model and the command line, each declared by the table, finite
/// and in the declared range; command-line values win.
fn checked_overrides(
    table: &ComboTable,
    settings: &Settings,
) -> Result<BTreeMap<String, f64>, FileError> {
    let names: Vec<&str> = table.params.iter().map(|p| p.name.as_str()).collect();
    let declared_help = || {
        if names.is_empty() {
            format!("table {} declares no parameters", table.file)
        } else {
            format!("parameters of table {}: {}", table.file, names.join(", "))
        }
    };
    let mut out = BTreeMap::new();
    for (from_model, map) in [(true, &settings.model_params), (false, &settings.sets)] {
        for (k, &v) in map {
            let problem = match table.param(k) {
                None => Some(format!(
                    "parameter `{k}` is not declared in table {}",
                    table.file
                )),
                Some(p) if !p.accepts(v) => Some(format!(
                    "parameter `{k}` = {v} is outside the range table {} declares ({})",
                    table.file,
                    p.range_text()
                )),
                Some(_) => None,
            };
            if let Some(message) = problem {
                let err = if from_model {
                    let span = settings.written.params.get(k).cloned();
                    settings
                        .written
                        .error(span, &format!("combinations.params.{k}"), message)
                } else {
                    FileError {
                        file: "command line".to_string(),
                        line: 0,
                        column: 0,
                        field: format!("--set {k}={v}"),
                        message,
                        help: None,
                        span: None,
                        source_text: None,
                    }
                };
                let help = match table.param(k) {
                    Some(p) => {
                        let (l, _) = crate::diag::line_col(&table.source_text, p.span.start);
                        format!(
                            "{} declares `{k}` on line {l}: {}",
                            table.file, p.description
                        )
                    }
                    None => declared_help(),
                };
                return Err(err.with_help(help));
            }
            out.insert(k.clone(), v);
        }
    }
    Ok(out)
}

/// Load cases grouped by category: ungrouped ones, then alternative groups in order of
/// first appearance. A reversed case is an alternative of itself and its negative.
fn cases_by_category(cases: &[LoadCase]) -> BTreeMap<ActionCategory, CategoryCases> {
    let mut m: BTreeMap<ActionCategory, CategoryCases> = BTreeMap::new();
    for (i, c) in cases.iter().enumerate() {
        let e = m.entry(c.category).or_default();
        let members: Vec<Member> = if c.reverse {
            vec![(i, 1.0), (i, -1.0)]
        } else {
            vec![(i, 1.0)]
        };
        match &c.alternative_group {
            None if !c.reverse => e.always.push(i),
            None => e.groups.push((format!("±{}", c.id), members)),
            Some(g) => match e.groups.iter_mut().find(|(n, _)| n == g) {
                Some((_, v)) => v.extend(members),
                None => e.groups.push((g.clone(), members)),
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

/// A lateral category (wind, seismic) given from one side only: no alternative group with
/// two or more members, no reversed case, and no reversible term in the table. A planar
/// frame must be checked with the load from either side.
fn one_sided_lateral(
    table: &ComboTable,
    cases: &[LoadCase],
    by_cat: &BTreeMap<ActionCategory, CategoryCases>,
    written: &ModelSpans,
) -> Vec<Notice> {
    let mut out = Vec::new();
    for (cat, cc) in by_cat {
        if !cat.is_lateral() || !table.actions.iter().any(|a| a.category == *cat) {
            continue;
        }
        let both_sides = cc.groups.iter().any(|(_, m)| m.len() >= 2);
        let reversed_by_table = table.combinations.iter().any(|c| {
            c.terms.iter().any(|t| {
                super::table::term_factors(t)
                    .iter()
                    .any(|af| af.reversible && table.actions[af.action].category == *cat)
            })
        });
        if both_sides || reversed_by_table {
            continue;
        }
        let ids: Vec<&str> = cases
            .iter()
            .filter(|c| c.category == *cat)
            .map(|c| c.id.as_str())
            .collect();
        let first = ids.first().and_then(|id| written.cases.get(*id));
        out.push(Notice {
            at: written.place(first),
            message: format!(
                "{cat} load cases {} act from one side only and table {} does not reverse them: a planar frame must also be checked with {cat} from the other side. Add the other direction as a load case with the same `alternative` name, or set `reverse = true` on a case whose loads simply change sign (a purely lateral load; not wind with roof pressures)",
                ids.join(", "),
                table.file
            ),
        });
    }
    out
}

/// `a`, `b`, … `z`, `aa`, `ab`, … for variant index `i`.
fn letters(i: u128) -> String {
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
fn af_choices(af: &ActionFactor, principal: bool, droppable: bool) -> Vec<Part<'_>> {
    let signs: &[f64] = if af.reversible { &[1.0, -1.0] } else { &[1.0] };
    std::iter::once(&af.factor)
        .chain(af.favourable.as_ref())
        .flat_map(|f| {
            signs.iter().map(move |&sign| Part {
                action: af.action,
                factor: f,
                allow_negative: af.allow_negative,
                sign,
                principal,
                droppable,
            })
        })
        .collect()
}

/// The choices a term offers, each a list of parts (table only, independent of the model).
fn term_choices(t: &Term) -> Vec<Vec<Part<'_>>> {
    match &t.kind {
        TermKind::Single(af) => af_choices(af, t.principal, false)
            .into_iter()
            .map(|p| vec![p])
            .collect(),
        TermKind::OneOf(opts) => opts
            .iter()
            .flat_map(|o| af_choices(o, t.principal, false))
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
                    .flat_map(|c| {
                        af_choices(c, false, *optional_companions)
                            .into_iter()
                            .take(1)
                    })
                    .collect();
                for l in af_choices(lead, true, false) {
                    let mut full = vec![l];
                    full.extend(comps.iter().cloned());
                    out.push(full);
                }
            }
            out
        }
    }
}

/// The slots of a combination for this model: each term, or the terms of a named optional
/// group together. Choices whose actions are all missing from the model are kept once
/// (they all give the same case); an optional slot also offers to be left out, and is left
/// out when none of its actions is present.
fn slots<'t>(
    comb: &'t Combination,
    table: &ComboTable,
    by_cat: &BTreeMap<ActionCategory, CategoryCases>,
) -> Vec<Slot<'t>> {
    let present = |a: usize| by_cat.contains_key(&table.actions[a].category);
    // A choice is present when its first part is (the leading action of a rotation, or the
    // single action of any other choice).
    let choice_present = |c: &[Part]| c.first().is_some_and(|p| present(p.action));
    let mut groups: Vec<(Option<&str>, Vec<usize>)> = Vec::new();
    for (ti, t) in comb.terms.iter().enumerate() {
        match t.optional.as_deref() {
            Some(g) => match groups.iter_mut().find(|(n, _)| *n == Some(g)) {
                Some((_, v)) => v.push(ti),
                None => groups.push((Some(g), vec![ti])),
            },
            None => groups.push((None, vec![ti])),
        }
    }
    let mut out = Vec::new();
    for (group, terms) in groups {
        // Per term: present choices, then the first absent one.
        // Options with whether any of their terms' choices is present.
        let mut options: Vec<(SlotOption, bool)> = vec![(
            SlotOption {
                digits: Vec::new(),
                parts: Vec::new(),
                off: false,
            },
            false,
        )];
        for &ti in &terms {
            let choices = term_choices(&comb.terms[ti]);
            let mut kept: Vec<(usize, Vec<Part>, bool)> = Vec::new();
            let mut absent_kept = false;
            for (d, c) in choices.into_iter().enumerate() {
                let here = choice_present(&c);
                if here || !absent_kept {
                    absent_kept |= !here;
                    kept.push((d, c, here));
                }
            }
            options = options
                .iter()
                .flat_map(|(o, was)| {
                    kept.iter().map(move |(d, c, here)| {
                        let mut n = o.clone();
                        n.digits.push((ti, *d));
                        n.parts.extend(c.iter().cloned());
                        (n, *was || *here)
                    })
                })
                .collect();
        }
        let mut options: Vec<SlotOption> = if group.is_some() {
            options
                .into_iter()
                .filter(|(_, here)| *here)
                .map(|(o, _)| o)
                .collect()
        } else {
            options.into_iter().map(|(o, _)| o).collect()
        };
        if group.is_some() {
            let off = match options.first() {
                Some(first) => SlotOption {
                    off: true,
                    ..first.clone()
                },
                None => SlotOption {
                    digits: terms.iter().map(|&t| (t, 0)).collect(),
                    parts: Vec::new(),
                    off: true,
                },
            };
            options.push(off);
        }
        out.push(Slot { options });
    }
    out
}

/// The number of factored cases the slots can give before merging (skipped variants
/// included, so an upper bound): every option, every subset of present droppable
/// companions, times the alternatives of the categories each case uses.
fn count_cases(
    slots: &[Slot],
    table: &ComboTable,
    by_cat: &BTreeMap<ActionCategory, CategoryCases>,
) -> f64 {
    // Categories with alternatives, as bits.
    let alt_cats: Vec<ActionCategory> = by_cat
        .iter()
        .filter(|(_, cc)| !cc.groups.is_empty())
        .map(|(c, _)| *c)
        .collect();
    let bit = |a: usize| -> u32 {
        alt_cats
            .iter()
            .position(|c| *c == table.actions[a].category)
            .map_or(0, |i| 1 << i)
    };
    let present = |a: usize| by_cat.contains_key(&table.actions[a].category);
    let mut states: BTreeMap<u32, f64> = BTreeMap::from([(0, 1.0)]);
    for slot in slots {
        let mut opt_states: BTreeMap<u32, f64> = BTreeMap::new();
        for o in &slot.options {
            let mut inner: BTreeMap<u32, f64> = BTreeMap::from([(0, 1.0)]);
            if !o.off {
                for p in o.parts.iter().filter(|p| present(p.action)) {
                    let b = bit(p.action);
                    let mut next: BTreeMap<u32, f64> = BTreeMap::new();
                    for (&m, &n) in &inner {
                        *next.entry(m | b).or_insert(0.0) += n;
                        if p.droppable {
                            *next.entry(m).or_insert(0.0) += n;
                        }
                    }
                    inner = next;
                }
            }
            for (m, n) in inner {
                *opt_states.entry(m).or_insert(0.0) += n;
            }
        }
        let mut next: BTreeMap<u32, f64> = BTreeMap::new();
        for (&m1, &n1) in &states {
            for (&m2, &n2) in &opt_states {
                *next.entry(m1 | m2).or_insert(0.0) += n1 * n2;
            }
        }
        states = next;
    }
    states
        .iter()
        .map(|(&m, &n)| {
            let alts: f64 = alt_cats
                .iter()
                .enumerate()
                .filter(|(i, _)| m & (1 << i) != 0)
                .map(|(_, c)| by_cat[c].alternatives())
                .product();
            n * alts
        })
        .sum()
}

/// One choice of alternative per (category, group) for the categories of `active`, as a
/// map category → chosen members (one per group of that category).
fn alternatives(
    table: &ComboTable,
    active: &[(usize, f64)],
    by_cat: &BTreeMap<ActionCategory, CategoryCases>,
) -> Vec<BTreeMap<ActionCategory, Vec<Member>>> {
    let mut acc: Vec<BTreeMap<ActionCategory, Vec<Member>>> = vec![BTreeMap::new()];
    for c in active_categories(table, active) {
        for (_, members) in &by_cat[&c].groups {
            acc = acc
                .iter()
                .flat_map(|m| {
                    members.iter().map(move |&member| {
                        let mut m = m.clone();
                        m.entry(c).or_insert_with(Vec::new).push(member);
                        m
                    })
                })
                .collect();
        }
    }
    acc
}

/// The categories of the `active` actions, in the order of the terms.
fn active_categories(table: &ComboTable, active: &[(usize, f64)]) -> Vec<ActionCategory> {
    let mut cats: Vec<ActionCategory> = Vec::new();
    for (a, _) in active {
        let c = table.actions[*a].category;
        if !cats.contains(&c) {
            cats.push(c);
        }
    }
    cats
}

/// The id suffix of one alternative: the load case chosen from each alternative group of
/// more than one member, `-` in front of a reversed case, joined by `+` (`WL`, `-WL`,
/// `WL+Su`), in the order of the terms. Load case ids are unique, so the suffixes of one
/// combination's alternatives are too, and a suffix names the same load cases in every
/// combination (issue 20).
fn alternative_label(
    order: &[ActionCategory],
    choice: &BTreeMap<ActionCategory, Vec<Member>>,
    by_cat: &BTreeMap<ActionCategory, CategoryCases>,
    cases: &[LoadCase],
) -> String {
    let mut names: Vec<String> = Vec::new();
    for cat in order {
        let members = choice.get(cat).map_or(&[][..], Vec::as_slice);
        for ((_, group), &(ci, sign)) in by_cat[cat].groups.iter().zip(members) {
            if group.len() > 1 {
                let neg = if sign < 0.0 { "-" } else { "" };
                names.push(format!("{neg}{}", cases[ci].id));
            }
        }
    }
    names.join("+")
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
