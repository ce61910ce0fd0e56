//! Reading a combination table from TOML, with every error located (file:line:column).
//!
//! The TOML is walked through `toml::de::DeTable`, which keeps the span of every key and
//! value, so unknown keys, unknown action symbols, bad expressions, undeclared or circular
//! parameters and empty combinations all point at the offending text.

use std::collections::{BTreeMap, BTreeSet};
use std::ops::Range;
use std::path::Path;
use std::str::FromStr;
use std::sync::Arc;

use toml::Spanned;
use toml::de::{DeTable, DeValue};

use super::expr::{Expr, find_cycle};
use super::types::{
    Action, ActionFactor, ActionKind, Basis, Combination, ComboTable, Factor, Param, Term, TermKind,
};
use crate::diag::FileError;
use crate::model::{ActionCategory, LoadLevel};

type Val<'i> = Spanned<DeValue<'i>>;

/// Keys of a term that are not action symbols.
const TERM_KEYS: [&str; 8] = [
    "favourable",
    "reversible",
    "allow-negative",
    "optional",
    "principal",
    "one-of",
    "leading",
    "companions",
];
const TERM_KEY_COMPANIONS_OPTIONAL: &str = "optional-companions";

/// Reading context: the file name and source text for located errors.
struct Ctx<'a> {
    file: &'a str,
    text: Arc<str>,
}

impl Ctx<'_> {
    fn err(&self, span: Range<usize>, field: &str, message: impl Into<String>) -> FileError {
        FileError::at(self.file, &self.text, Some(span), field, message)
    }

    /// Entries of a table sorted by their position in the file.
    fn entries<'t, 'i>(
        &self,
        t: &'t DeTable<'i>,
    ) -> Vec<(&'t Spanned<std::borrow::Cow<'i, str>>, &'t Val<'i>)> {
        let mut v: Vec<_> = t.iter().collect();
        v.sort_by_key(|(k, _)| k.span().start);
        v
    }

    /// Fail on the first key not in `allowed`.
    fn only_keys(&self, t: &DeTable, allowed: &[&str], field: &str) -> Result<(), FileError> {
        for (k, _) in self.entries(t) {
            if !allowed.contains(&k.get_ref().as_ref()) {
                return Err(self
                    .err(
                        k.span(),
                        &join(field, k.get_ref()),
                        format!("unknown key `{}`", k.get_ref()),
                    )
                    .with_help(format!("expected one of: {}", allowed.join(", "))));
            }
        }
        Ok(())
    }

    fn table<'t, 'i>(&self, v: &'t Val<'i>, field: &str) -> Result<&'t DeTable<'i>, FileError> {
        v.get_ref().as_table().ok_or_else(|| {
            self.err(
                v.span(),
                field,
                format!("expected a table, found {}", v.get_ref().type_str()),
            )
        })
    }

    fn string(&self, v: &Val, field: &str) -> Result<String, FileError> {
        v.get_ref().as_str().map(str::to_string).ok_or_else(|| {
            self.err(
                v.span(),
                field,
                format!("expected a string, found {}", v.get_ref().type_str()),
            )
        })
    }

    fn boolean(&self, v: &Val, field: &str) -> Result<bool, FileError> {
        v.get_ref().as_bool().ok_or_else(|| {
            self.err(
                v.span(),
                field,
                format!("expected true or false, found {}", v.get_ref().type_str()),
            )
        })
    }

    fn array<'t, 'i>(&self, v: &'t Val<'i>, field: &str) -> Result<&'t [Val<'i>], FileError> {
        v.get_ref().as_array().map(|a| &a[..]).ok_or_else(|| {
            self.err(
                v.span(),
                field,
                format!("expected an array, found {}", v.get_ref().type_str()),
            )
        })
    }

    /// A factor: a TOML number, or a string holding an expression of parameters.
    fn factor(&self, v: &Val, field: &str) -> Result<Factor, FileError> {
        let span = v.span();
        match v.get_ref() {
            DeValue::Integer(i) => {
                let s = i.as_str().replace('_', "");
                let x = i64::from_str_radix(&s, i.radix()).map_err(|_| {
                    self.err(span.clone(), field, format!("`{s}` is not a valid number"))
                })?;
                Ok(Factor {
                    text: s,
                    expr: Expr::Num(x as f64),
                    span,
                })
            }
            DeValue::Float(f) => {
                let s = f.as_str().replace('_', "");
                let x: f64 = s
                    .parse()
                    .ok()
                    .filter(|x: &f64| x.is_finite())
                    .ok_or_else(|| {
                        self.err(span.clone(), field, format!("`{s}` is not a finite number"))
                    })?;
                Ok(Factor {
                    text: s,
                    expr: Expr::Num(x),
                    span,
                })
            }
            DeValue::String(s) => {
                let expr = Expr::parse(s).map_err(|e| {
                    // Point inside the string: the opening quote is one byte.
                    let at = span.start + 1 + e.offset;
                    self.err(at..at + 1, field, format!("invalid factor expression `{s}`: {}", e.message))
                        .with_help("a factor is a number or an expression of parameters with + - * / and parentheses, e.g. \"1.2 + 0.2*s_ds\"")
                })?;
                Ok(Factor {
                    text: s.trim().to_string(),
                    expr,
                    span,
                })
            }
            other => Err(self.err(
                span,
                field,
                format!(
                    "expected a number or an expression string, found {}",
                    other.type_str()
                ),
            )),
        }
    }
}

fn join(field: &str, key: &str) -> String {
    if field.is_empty() {
        key.to_string()
    } else {
        format!("{field}.{key}")
    }
}

fn lookup<'t, 'i>(t: &'t DeTable<'i>, key: &str) -> Option<&'t Val<'i>> {
    t.iter().find(|(k, _)| k.get_ref() == key).map(|(_, v)| v)
}

/// Parse a combination table. `file` names the source in error messages.
///
/// Checks: unknown keys, action symbols not declared in `[actions]`, unknown action
/// categories, factors that are neither numbers nor valid expressions, parameters used but
/// not declared, circular parameter defaults, empty combinations and duplicate ids.
pub fn parse_table(text: &str, file: &str) -> Result<ComboTable, FileError> {
    let ctx = Ctx {
        file,
        text: Arc::from(text),
    };
    let doc = DeTable::parse(text).map_err(|e| {
        let span = e.span().unwrap_or(0..0);
        let field = crate::diag::key_on_line(text, span.start);
        let message = e.message().trim().trim_end_matches('.').replace('\n', " ");
        ctx.err(span, &field, format!("not valid TOML: {message}"))
    })?;
    let root = doc.get_ref();
    const TOP: [&str; 11] = [
        "title",
        "standard",
        "edition",
        "source",
        "clauses",
        "basis",
        "caution",
        "notes",
        "actions",
        "params",
        "combination",
    ];
    ctx.only_keys(root, &TOP, "")?;

    let need = |key: &str| -> Result<&Val, FileError> {
        lookup(root, key).ok_or_else(|| {
            ctx.err(0..0, key, format!("missing required key `{key}`"))
                .with_help("see combos/TEMPLATE.toml for the layout of a table")
        })
    };
    let title = ctx.string(need("title")?, "title")?;
    let standard = ctx.string(need("standard")?, "standard")?;
    let edition = ctx.string(need("edition")?, "edition")?;
    let source = ctx.string(need("source")?, "source")?;
    let caution = ctx.string(need("caution")?, "caution")?;
    let basis_v = need("basis")?;
    let basis_s = ctx.string(basis_v, "basis")?;
    let basis = Basis::from_str(&basis_s).map_err(|_| {
        ctx.err(
            basis_v.span(),
            "basis",
            format!("unknown basis `{basis_s}`"),
        )
        .with_help("expected strength, allowable-stress or serviceability")
    })?;
    let clauses = ctx
        .array(need("clauses")?, "clauses")?
        .iter()
        .map(|v| ctx.string(v, "clauses"))
        .collect::<Result<Vec<_>, _>>()?;
    let notes = match lookup(root, "notes") {
        Some(v) => ctx
            .array(v, "notes")?
            .iter()
            .map(|v| ctx.string(v, "notes"))
            .collect::<Result<_, _>>()?,
        None => Vec::new(),
    };

    let actions = parse_actions(&ctx, need("actions")?)?;
    let params = match lookup(root, "params") {
        Some(v) => parse_params(&ctx, v)?,
        None => Vec::new(),
    };
    let declared: BTreeSet<&str> = params.iter().map(|p| p.name.as_str()).collect();
    check_params(&ctx, &params, &declared)?;

    let combos_v = need("combination")?;
    let mut combinations = Vec::new();
    for (i, c) in ctx.array(combos_v, "combination")?.iter().enumerate() {
        let comb = parse_combination(&ctx, c, i, &actions)?;
        let field = format!("combination {}", comb.id);
        for t in &comb.terms {
            for af in term_factors(t) {
                check_factor_params(&ctx, &af.factor, &declared, &field)?;
                if let Some(f) = &af.favourable {
                    check_factor_params(&ctx, f, &declared, &field)?;
                }
            }
        }
        if let Some(prev) = combinations.iter().find(|p: &&Combination| p.id == comb.id) {
            let (line, _) = crate::diag::line_col(text, prev.span.start);
            return Err(ctx.err(
                comb.span.clone(),
                &format!("{field}.id"),
                format!(
                    "duplicate combination id `{}` (first used on line {line})",
                    comb.id
                ),
            ));
        }
        combinations.push(comb);
    }
    if combinations.is_empty() {
        return Err(ctx.err(
            combos_v.span(),
            "combination",
            "a table needs at least one [[combination]]",
        ));
    }

    Ok(ComboTable {
        file: file.to_string(),
        title,
        standard,
        edition,
        source,
        clauses,
        basis,
        caution,
        notes,
        actions,
        params,
        combinations,
        source_text: ctx.text.clone(),
    })
}

/// All action factors of a term (for checks and rendering).
pub(crate) fn term_factors(t: &Term) -> Vec<&ActionFactor> {
    match &t.kind {
        TermKind::Single(a) => vec![a],
        TermKind::OneOf(v) => v.iter().collect(),
        TermKind::Leading {
            leading,
            companions,
            ..
        } => leading.iter().chain(companions).collect(),
    }
}

fn parse_actions(ctx: &Ctx, v: &Val) -> Result<Vec<Action>, FileError> {
    let t = ctx.table(v, "actions")?;
    let mut out = Vec::new();
    for (k, val) in ctx.entries(t) {
        let sym = k.get_ref().to_string();
        let field = format!("actions.{sym}");
        let valid = sym.chars().next().is_some_and(|c| c.is_alphabetic())
            && sym.chars().all(|c| c.is_alphanumeric() || c == '_')
            && !TERM_KEYS.contains(&sym.as_str());
        if !valid {
            return Err(ctx.err(k.span(), &field, format!("`{sym}` cannot be an action symbol"))
                .with_help("a symbol starts with a letter and holds letters, digits or _ (e.g. D, Lr, Qk1)"));
        }
        let at = ctx.table(val, &field)?;
        ctx.only_keys(at, &["category", "kind", "description", "level"], &field)?;
        let cat_v = lookup(at, "category")
            .ok_or_else(|| ctx.err(val.span(), &field, "missing `category` (the model's action category this symbol draws load cases from)"))?;
        let cat_s = ctx.string(cat_v, &format!("{field}.category"))?;
        let category = ActionCategory::from_str(&cat_s).map_err(|_| {
            let names: Vec<&'static str> = <ActionCategory as strum::IntoEnumIterator>::iter()
                .map(|c| c.into())
                .collect();
            ctx.err(
                cat_v.span(),
                &format!("{field}.category"),
                format!("unknown action category `{cat_s}`"),
            )
            .with_help(format!("expected one of: {}", names.join(", ")))
        })?;
        let kind = match lookup(at, "kind") {
            Some(kv) => {
                let s = ctx.string(kv, &format!("{field}.kind"))?;
                ActionKind::from_str(&s).map_err(|_| {
                    ctx.err(
                        kv.span(),
                        &format!("{field}.kind"),
                        format!("unknown kind `{s}`"),
                    )
                    .with_help("expected permanent or variable")
                })?
            }
            None if category == ActionCategory::Dead => ActionKind::Permanent,
            None => ActionKind::Variable,
        };
        let description = match lookup(at, "description") {
            Some(d) => ctx.string(d, &format!("{field}.description"))?,
            None => String::new(),
        };
        let level = match lookup(at, "level") {
            Some(lv) => {
                let f = format!("{field}.level");
                let s = ctx.string(lv, &f)?;
                if !category.has_levels() {
                    return Err(ctx.err(
                        lv.span(),
                        &f,
                        format!("the level of a {category} load is not distinguished: expected `level` only on wind, snow and seismic actions"),
                    ));
                }
                Some(LoadLevel::from_str(&s).map_err(|_| {
                    let names: Vec<&'static str> = <LoadLevel as strum::IntoEnumIterator>::iter()
                        .map(|c| c.into())
                        .collect();
                    ctx.err(lv.span(), &f, format!("unknown load level `{s}`"))
                        .with_help(format!("expected one of: {}", names.join(", ")))
                })?)
            }
            None => None,
        };
        out.push(Action {
            symbol: sym,
            description,
            category,
            kind,
            level,
        });
    }
    if out.is_empty() {
        return Err(ctx.err(
            v.span(),
            "actions",
            "a table needs at least one action symbol",
        ));
    }
    Ok(out)
}

fn parse_params(ctx: &Ctx, v: &Val) -> Result<Vec<Param>, FileError> {
    let t = ctx.table(v, "params")?;
    let mut out = Vec::new();
    for (k, val) in ctx.entries(t) {
        let name = k.get_ref().to_string();
        let field = format!("params.{name}");
        let ok = name
            .chars()
            .next()
            .is_some_and(|c| c.is_ascii_alphabetic() || c == '_')
            && name.chars().all(|c| c.is_ascii_alphanumeric() || c == '_');
        if !ok {
            return Err(ctx
                .err(
                    k.span(),
                    &field,
                    format!("`{name}` cannot be a parameter name"),
                )
                .with_help(
                    "a parameter name holds ASCII letters, digits and _ and starts with a letter",
                ));
        }
        let pt = ctx.table(val, &field)?;
        ctx.only_keys(pt, &["default", "description", "tag", "min", "max"], &field)?;
        let default = match lookup(pt, "default") {
            Some(d) => Some(ctx.factor(d, &format!("{field}.default"))?),
            None => None,
        };
        let description = match lookup(pt, "description") {
            Some(d) => ctx.string(d, &format!("{field}.description"))?,
            None => String::new(),
        };
        let tag = match lookup(pt, "tag") {
            Some(d) => Some(ctx.string(d, &format!("{field}.tag"))?),
            None => None,
        };
        let bound = |key: &str| -> Result<Option<f64>, FileError> {
            match lookup(pt, key) {
                None => Ok(None),
                Some(b) => {
                    let f = ctx.factor(b, &format!("{field}.{key}"))?;
                    f.expr.constant().map(Some).ok_or_else(|| {
                        ctx.err(
                            b.span(),
                            &format!("{field}.{key}"),
                            format!("`{key}` must be a number"),
                        )
                    })
                }
            }
        };
        let (min, max) = (bound("min")?, bound("max")?);
        if let (Some(a), Some(b)) = (min, max)
            && a > b
        {
            return Err(ctx.err(
                val.span(),
                &field,
                format!("the range is empty: min {a} is above max {b}"),
            ));
        }
        let p = Param {
            name,
            default,
            description,
            tag,
            min,
            max,
            span: k.span(),
        };
        if let Some(d) = &p.default
            && let Some(x) = d.expr.constant()
            && !p.accepts(x)
        {
            return Err(ctx.err(
                d.span.clone(),
                &format!("{field}.default"),
                format!(
                    "the default {x} is outside the declared range ({})",
                    p.range_text()
                ),
            ));
        }
        out.push(p);
    }
    Ok(out)
}

/// Every parameter a default uses is declared, and defaults do not refer to each other in
/// a circle.
fn check_params(ctx: &Ctx, params: &[Param], declared: &BTreeSet<&str>) -> Result<(), FileError> {
    let mut deps: BTreeMap<String, BTreeSet<String>> = BTreeMap::new();
    for p in params {
        let used = p
            .default
            .as_ref()
            .map(|d| d.expr.params())
            .unwrap_or_default();
        if let Some(d) = &p.default {
            check_factor_params(ctx, d, declared, &format!("params.{}", p.name))?;
        }
        deps.insert(p.name.clone(), used);
    }
    if let Some(cycle) = find_cycle(&deps) {
        let first = &cycle[0];
        let p = params
            .iter()
            .find(|p| &p.name == first)
            .expect("cycle names a declared parameter");
        let span = p
            .default
            .as_ref()
            .map_or(p.span.clone(), |d| d.span.clone());
        return Err(ctx
            .err(
                span,
                &format!("params.{first}.default"),
                format!("circular parameter: {}", cycle.join(" → ")),
            )
            .with_help("give one of these parameters a number as its default"));
    }
    Ok(())
}

fn check_factor_params(
    ctx: &Ctx,
    f: &Factor,
    declared: &BTreeSet<&str>,
    field: &str,
) -> Result<(), FileError> {
    for name in f.expr.params() {
        if !declared.contains(name.as_str()) {
            // Point at the name inside the expression string when it can be found.
            let span = ctx.text[f.span.clone()]
                .find(name.as_str())
                .map_or(f.span.clone(), |o| {
                    f.span.start + o..f.span.start + o + name.len()
                });
            return Err(ctx.err(span, field, format!("parameter `{name}` is used but not declared"))
                .with_help(format!("declare it under [params], e.g. {name} = {{ default = 1.0, description = \"…\" }}")));
        }
    }
    Ok(())
}

/// One `[[combination]]`; `index` (0-based) names it in messages until its id is read, then
/// every message names it `combination ID`.
fn parse_combination(
    ctx: &Ctx,
    v: &Val,
    index: usize,
    actions: &[Action],
) -> Result<Combination, FileError> {
    let unnamed = format!("combination number {} (no id yet)", index + 1);
    let t = ctx.table(v, &unnamed)?;
    let id_v = lookup(t, "id").ok_or_else(|| {
        ctx.err(
            v.span(),
            &unnamed,
            "missing `id` (the standard's number of the combination)",
        )
    })?;
    let id = ctx.string(id_v, &format!("{unnamed}.id"))?;
    let field_s = format!("combination {id}");
    let field = field_s.as_str();
    ctx.only_keys(t, &["id", "terms", "note", "tag"], field)?;
    let note = lookup(t, "note")
        .map(|n| ctx.string(n, &format!("{field}.note")))
        .transpose()?;
    let tag = lookup(t, "tag")
        .map(|n| ctx.string(n, &format!("{field}.tag")))
        .transpose()?;
    let terms_v =
        lookup(t, "terms").ok_or_else(|| ctx.err(id_v.span(), field, "missing `terms`"))?;
    let tf = format!("{field}.terms");
    let arr = ctx.array(terms_v, &tf)?;
    if arr.is_empty() {
        return Err(ctx
            .err(terms_v.span(), &tf, format!("combination `{id}` is empty"))
            .with_help("list at least one term, e.g. terms = [{ D = 1.4 }]"));
    }
    let terms = arr
        .iter()
        .enumerate()
        .map(|(i, tv)| parse_term(ctx, tv, &format!("{tf}[{}]", i + 1), actions))
        .collect::<Result<Vec<_>, _>>()?;
    Ok(Combination {
        id,
        terms,
        note,
        tag,
        span: id_v.span(),
    })
}

/// A term: `{ D = 1.2 }`, `{ D = 1.25, favourable = 0.9 }`, `{ E = "rho", reversible = true }`,
/// `{ one-of = [{ Lr = 0.5 }, { S = 0.5 }] }` or
/// `{ leading = { Q = 1.5, W = 1.5 }, companions = { Q = 1.05, W = 0.9 } }`, each with the
/// optional keys `optional = "group"` (or `true`) and `principal = true`.
fn parse_term(ctx: &Ctx, v: &Val, field: &str, actions: &[Action]) -> Result<Term, FileError> {
    let t = ctx.table(v, field)?;
    let optional = match lookup(t, "optional") {
        Some(o) => match o.get_ref() {
            DeValue::Boolean(true) => Some(field.to_string()),
            DeValue::Boolean(false) => None,
            DeValue::String(s) => Some(s.to_string()),
            other => {
                return Err(ctx.err(
                    o.span(),
                    &format!("{field}.optional"),
                    format!("expected true or a group name, found {}", other.type_str()),
                ));
            }
        },
        None => None,
    };
    let principal = lookup(t, "principal")
        .map(|p| ctx.boolean(p, &format!("{field}.principal")))
        .transpose()?
        .unwrap_or(false);

    let kind = if let Some(oo) = lookup(t, "one-of") {
        ctx.only_keys(t, &["one-of", "optional", "principal"], field)?;
        let of = format!("{field}.one-of");
        let opts = ctx.array(oo, &of)?;
        if opts.len() < 2 {
            return Err(ctx.err(oo.span(), &of, "a one-of group needs at least two options"));
        }
        let v = opts
            .iter()
            .enumerate()
            .map(|(i, o)| {
                let f = format!("{of}[{}]", i + 1);
                action_factor(ctx, ctx.table(o, &f)?, o.span(), &f, actions, true)
            })
            .collect::<Result<Vec<_>, _>>()?;
        TermKind::OneOf(v)
    } else if let Some(lv) = lookup(t, "leading") {
        ctx.only_keys(
            t,
            &[
                "leading",
                "companions",
                TERM_KEY_COMPANIONS_OPTIONAL,
                "optional",
                "principal",
            ],
            field,
        )?;
        let leading = factor_map(ctx, lv, &format!("{field}.leading"), actions)?;
        if leading.is_empty() {
            return Err(ctx.err(
                lv.span(),
                &format!("{field}.leading"),
                "a leading group needs at least one action",
            ));
        }
        let companions = match lookup(t, "companions") {
            Some(cv) => factor_map(ctx, cv, &format!("{field}.companions"), actions)?,
            None => Vec::new(),
        };
        let optional_companions = lookup(t, TERM_KEY_COMPANIONS_OPTIONAL)
            .map(|b| ctx.boolean(b, &format!("{field}.{TERM_KEY_COMPANIONS_OPTIONAL}")))
            .transpose()?
            .unwrap_or(false);
        TermKind::Leading {
            leading,
            companions,
            optional_companions,
        }
    } else {
        TermKind::Single(action_factor(ctx, t, v.span(), field, actions, false)?)
    };
    Ok(Term {
        kind,
        optional,
        principal,
    })
}

/// `{ Q = 1.5, W = "gamma_q" }`: several actions with their factors, in file order.
fn factor_map(
    ctx: &Ctx,
    v: &Val,
    field: &str,
    actions: &[Action],
) -> Result<Vec<ActionFactor>, FileError> {
    let t = ctx.table(v, field)?;
    ctx.entries(t)
        .into_iter()
        .map(|(k, fv)| {
            let f = join(field, k.get_ref());
            let action = symbol(ctx, k, &f, actions)?;
            Ok(ActionFactor {
                action,
                factor: ctx.factor(fv, &f)?,
                favourable: None,
                reversible: false,
                allow_negative: false,
            })
        })
        .collect()
}

fn symbol(
    ctx: &Ctx,
    k: &Spanned<std::borrow::Cow<str>>,
    field: &str,
    actions: &[Action],
) -> Result<usize, FileError> {
    actions
        .iter()
        .position(|a| a.symbol == k.get_ref().as_ref())
        .ok_or_else(|| {
            let known: Vec<&str> = actions.iter().map(|a| a.symbol.as_str()).collect();
            ctx.err(
                k.span(),
                field,
                format!("unknown action symbol `{}`", k.get_ref()),
            )
            .with_help(format!(
                "declared symbols: {}; term keys: {}",
                known.join(", "),
                TERM_KEYS.join(", ")
            ))
        })
}

/// One action symbol key with its factor, plus `favourable` / `reversible`
/// (and, outside one-of options, `optional` / `principal` handled by the caller).
fn action_factor(
    ctx: &Ctx,
    t: &DeTable,
    span: Range<usize>,
    field: &str,
    actions: &[Action],
    in_one_of: bool,
) -> Result<ActionFactor, FileError> {
    let mut found: Option<(usize, Factor)> = None;
    let mut favourable = None;
    let mut reversible = false;
    let mut allow_negative = false;
    for (k, v) in ctx.entries(t) {
        let key = k.get_ref().as_ref();
        match key {
            "favourable" => favourable = Some(ctx.factor(v, &join(field, key))?),
            "reversible" => reversible = ctx.boolean(v, &join(field, key))?,
            "allow-negative" => allow_negative = ctx.boolean(v, &join(field, key))?,
            "optional" | "principal" if !in_one_of => {}
            _ => {
                let f = join(field, key);
                if (TERM_KEYS.contains(&key) || key == TERM_KEY_COMPANIONS_OPTIONAL)
                    && !actions.iter().any(|a| a.symbol == key)
                {
                    return Err(ctx.err(k.span(), &f, format!("`{key}` is not allowed here")));
                }
                let a = symbol(ctx, k, &f, actions)?;
                if let Some((prev, _)) = &found {
                    return Err(ctx
                        .err(
                            k.span(),
                            &f,
                            format!(
                                "a term holds one action; `{}` is already given",
                                actions[*prev].symbol
                            ),
                        )
                        .with_help("write each action as its own term, or use one-of / leading"));
                }
                found = Some((a, ctx.factor(v, &f)?));
            }
        }
    }
    let (action, factor) = found.ok_or_else(|| {
        ctx.err(span, field, "a term names no action")
            .with_help("e.g. { D = 1.2 } or { one-of = [...] }")
    })?;
    Ok(ActionFactor {
        action,
        factor,
        favourable,
        reversible,
        allow_negative,
    })
}

/// A table shipped inside the binary.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct ShippedTable {
    /// File stem, e.g. `asce7-16-strength`.
    pub name: &'static str,
    /// The TOML text.
    pub text: &'static str,
}

macro_rules! shipped {
    ($($name:literal),* $(,)?) => {
        &[$(ShippedTable {
            name: $name,
            text: include_str!(concat!("../../combos/", $name, ".toml")),
        }),*]
    };
}

static SHIPPED: &[ShippedTable] = shipped![
    "asce7-16-strength",
    "asce7-16-asd",
    "asce7-22-strength",
    "asce7-22-asd",
    "en1990-6.10",
    "en1990-6.10ab",
    "en1990-sls-characteristic",
    "en1990-sls-frequent",
    "en1990-sls-quasi-permanent",
    "asce7-16-service",
    "nbcc-2020",
    "asnzs1170-0-2002",
];

/// The tables shipped with plumbline, in a fixed order.
pub fn shipped_tables() -> &'static [ShippedTable] {
    SHIPPED
}

/// Read a table by shipped name or by path. A relative path is taken against `base_dir`
/// (the model file's folder) when given. A name that is neither a shipped table nor an
/// existing file gives an error that names it as written (not as a path), with the nearest
/// shipped names; the caller locates it (model file or command line).
pub fn load_table(name_or_path: &str, base_dir: Option<&Path>) -> Result<ComboTable, FileError> {
    if let Some(t) = SHIPPED.iter().find(|t| t.name == name_or_path) {
        return parse_table(t.text, t.name);
    }
    let p = Path::new(name_or_path);
    let path = match base_dir {
        Some(b) if p.is_relative() => b.join(p),
        _ => p.to_path_buf(),
    };
    let looks_like_path = name_or_path.contains(['/', '\\']) || name_or_path.ends_with(".toml");
    if !looks_like_path && !path.is_file() {
        return Err(FileError {
            file: name_or_path.to_string(),
            line: 0,
            column: 0,
            field: "table".to_string(),
            message: format!("`{name_or_path}` is not a shipped combination table"),
            help: Some(shipped_help(name_or_path)),
            span: None,
            source_text: None,
        });
    }
    match std::fs::metadata(&path) {
        // Read whole, at most MAX_FILE_BYTES, UTF-8 (errors name the line and byte).
        Ok(_) => parse_table(
            &crate::diag::read_input(&path, "combination table")?,
            &path.display().to_string(),
        ),
        Err(e) => Err(FileError {
            file: path.display().to_string(),
            line: 0,
            column: 0,
            field: "table".to_string(),
            message: format!("cannot read the combination table file: {e}"),
            help: Some(shipped_help(name_or_path)),
            span: None,
            source_text: None,
        }),
    }
}

/// The shipped names closest to `name` first (sharing its longest prefix), then the rest.
fn shipped_help(name: &str) -> String {
    let common = |t: &str| {
        t.chars()
            .zip(name.chars())
            .take_while(|(a, b)| a == b)
            .count()
    };
    let best = SHIPPED.iter().map(|t| common(t.name)).max().unwrap_or(0);
    let near: Vec<&str> = SHIPPED
        .iter()
        .filter(|t| best >= 3 && common(t.name) == best)
        .map(|t| t.name)
        .collect();
    let all: Vec<&str> = SHIPPED.iter().map(|t| t.name).collect();
    if near.is_empty() {
        format!(
            "shipped tables: {}; or give the path of a table file",
            all.join(", ")
        )
    } else {
        format!(
            "did you mean {}? Shipped tables: {}; or give the path of a table file",
            near.join(" or "),
            all.join(", ")
        )
    }
}
