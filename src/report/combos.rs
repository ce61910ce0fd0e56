//! The combination tables and factored cases for people and programs: the list of shipped
//! tables and one table's combinations as the standard writes them (`plumbline combos`,
//! text), and the factored cases of a model (`plumbline cases`) as text, CSV or JSON, each
//! form built here and written by its exporter (`report::export`).

use std::collections::BTreeMap;

use serde::Serialize;

use super::{CAUTION, table_of};
use crate::combos::expr::{Expr, resolve};
use crate::combos::{
    ActionFactor, ComboTable, Expansion, Factor, Term, TermKind, format_factor, parse_table,
    shipped_tables,
};
use crate::diag::FileError;
use crate::model::LoadCase;

/// `plumbline combos`: name, title and edition of every shipped table.
pub fn render_table_list() -> Result<String, FileError> {
    let mut rows = Vec::new();
    for t in shipped_tables() {
        let table = parse_table(t.text, t.name)?;
        rows.push(vec![
            t.name.to_string(),
            table.title,
            table.edition,
            table.basis.to_string(),
        ]);
    }
    Ok(format!(
        "{}\n\nShow one with `plumbline combos NAME`. Verify every table against the edition adopted where the building stands.\n\n{CAUTION}\n",
        table_of(&["name", "title", "edition", "basis"], rows)
    ))
}

/// How to show a factor: as written (`1.2 + 0.2*s_ds`), or evaluated with the defaults.
#[derive(Clone, Copy)]
enum Show<'a> {
    Written,
    Evaluated(&'a BTreeMap<String, Option<f64>>),
}

fn factor_sym(f: &Factor, sym: &str, show: Show) -> String {
    if let Show::Evaluated(v) = show
        && let Ok(x) = f.expr.eval(v)
    {
        return format!("{}{sym}", format_factor(x));
    }
    match &f.expr {
        Expr::Num(_) => format!("{}{sym}", f.text),
        Expr::Param(_) => format!("{}·{sym}", f.text),
        _ => format!("({}){sym}", f.text),
    }
}

fn af_text(table: &ComboTable, af: &ActionFactor, show: Show) -> String {
    let sym = &table.actions[af.action].symbol;
    let sign = if af.reversible { "±" } else { "" };
    match &af.favourable {
        None => format!("{sign}{}", factor_sym(&af.factor, sym, show)),
        Some(fav) => format!(
            "({sign}{} or {sign}{})",
            factor_sym(&af.factor, sym, show),
            factor_sym(fav, sym, show)
        ),
    }
}

fn term_text_with(table: &ComboTable, term: &Term, show: Show) -> String {
    let body = match &term.kind {
        TermKind::Single(af) => af_text(table, af, show),
        TermKind::OneOf(opts) => {
            let first = &opts[0].factor;
            let common = opts.iter().all(|o| {
                o.favourable.is_none() && !o.reversible && same_shown(&o.factor, first, show)
            });
            if common {
                let syms: Vec<&str> = opts
                    .iter()
                    .map(|o| table.actions[o.action].symbol.as_str())
                    .collect();
                let x = factor_sym(first, "", show);
                let x = if x == "1.0" { String::new() } else { x };
                format!("{x}({})", syms.join(" or "))
            } else {
                format!(
                    "({})",
                    opts.iter()
                        .map(|o| af_text(table, o, show))
                        .collect::<Vec<_>>()
                        .join(" or ")
                )
            }
        }
        TermKind::Leading {
            leading,
            companions,
            optional_companions,
        } => {
            let l: Vec<String> = leading.iter().map(|a| af_text(table, a, show)).collect();
            let c: Vec<String> = companions.iter().map(|a| af_text(table, a, show)).collect();
            let mut s = format!("leading one of ({})", l.join(" | "));
            if !c.is_empty() {
                let others = if *optional_companions {
                    c.iter().map(|x| format!("[{x}]")).collect::<Vec<_>>()
                } else {
                    c
                };
                s.push_str(&format!(" + the others of ({})", others.join(" + ")));
            }
            s
        }
    };
    if term.optional.is_some() {
        format!("[{body}]")
    } else {
        body
    }
}

fn same_shown(a: &Factor, b: &Factor, show: Show) -> bool {
    match show {
        Show::Written => a.text == b.text,
        Show::Evaluated(v) => match (a.expr.eval(v), b.expr.eval(v)) {
            (Ok(x), Ok(y)) => (x - y).abs() < 1e-12,
            _ => a.text == b.text,
        },
    }
}

/// A term as the standard writes it: `1.2D`, `0.5(Lr or S or R)`, `(1.25D or 0.9D)`,
/// `±rho·E`; optional terms in square brackets.
pub fn term_text(table: &ComboTable, term: &Term) -> String {
    term_text_with(table, term, Show::Written)
}

/// Parameter values with the table's defaults (and `overrides`).
fn values(table: &ComboTable, overrides: &BTreeMap<String, f64>) -> BTreeMap<String, Option<f64>> {
    let d = table
        .params
        .iter()
        .map(|p| (p.name.clone(), p.default.as_ref().map(|f| f.expr.clone())))
        .collect();
    resolve(&d, overrides)
}

fn header(table: &ComboTable) -> String {
    let mut s = format!(
        "{}\n{} ({}), clauses {}; basis: {}\nSource: {}\nCaution: {}\n",
        table.title,
        table.standard,
        table.edition,
        table.clauses.join(", "),
        table.basis,
        table.source,
        table.caution
    );
    for n in &table.notes {
        s.push_str(&format!("Note: {n}\n"));
    }
    s
}

/// `plumbline combos NAME`: header, actions, parameters and every combination as written and
/// with the default parameter values.
pub fn render_table(table: &ComboTable) -> String {
    let vals = values(table, &BTreeMap::new());
    let mut s = header(table);
    let actions = table
        .actions
        .iter()
        .map(|a| {
            vec![
                a.symbol.clone(),
                a.category.to_string(),
                a.kind.to_string(),
                a.level.map_or(String::new(), |l| l.to_string()),
                a.description.clone(),
            ]
        })
        .collect();
    s.push_str(&format!(
        "\nActions (level: the load level the table expects for the category)\n{}\n",
        table_of(
            &["symbol", "category", "kind", "level", "description"],
            actions
        )
    ));
    if !table.params.is_empty() {
        let params = table
            .params
            .iter()
            .map(|p| {
                vec![
                    p.name.clone(),
                    p.default
                        .as_ref()
                        .map_or("(must be set)".to_string(), |d| d.text.clone()),
                    p.range_text(),
                    p.tag.clone().unwrap_or_default(),
                    p.description.clone(),
                ]
            })
            .collect();
        s.push_str(&format!(
            "\nParameters\n{}\n",
            table_of(&["name", "default", "range", "tag", "description"], params)
        ));
    }
    let rows = table
        .combinations
        .iter()
        .map(|c| {
            let written: Vec<String> = c.terms.iter().map(|t| term_text(table, t)).collect();
            let eval: Vec<String> = c
                .terms
                .iter()
                .map(|t| term_text_with(table, t, Show::Evaluated(&vals)))
                .collect();
            vec![
                c.id.clone(),
                written.join(" + "),
                eval.join(" + "),
                c.tag.clone().unwrap_or_default(),
                c.note.clone().unwrap_or_default(),
            ]
        })
        .collect();
    s.push_str(&format!(
        "\nCombinations ([ ] may drop out: also generated without it where the model has it; ± both signs)\n{}\n",
        table_of(&["id", "combination", "with defaults", "tag", "note"], rows)
    ));
    s.push('\n');
    s.push_str(CAUTION);
    s.push('\n');
    s
}

#[derive(Serialize)]
struct JsonCase<'a> {
    id: &'a str,
    expression: &'a str,
    basis: String,
    combination: &'a str,
    factors: BTreeMap<&'a str, f64>,
    note: &'a Option<String>,
}

/// What the list of factored cases reads (`plumbline cases`): the table, its expansion and
/// the load cases the factors refer to.
pub struct CasesView<'a> {
    pub table: &'a ComboTable,
    pub expansion: &'a Expansion,
    pub load_cases: &'a [LoadCase],
}

/// The factored cases as JSON: the table, the caution, the count, every case with its
/// factors by load case, merges, skips, unplaced load cases and notices.
pub fn cases_json(v: &CasesView) -> String {
    let (table, exp, cases) = (v.table, v.expansion, v.load_cases);
    let list: Vec<JsonCase> = exp
        .cases
        .iter()
        .map(|c| JsonCase {
            id: &c.id,
            expression: &c.expression,
            basis: c.basis.to_string(),
            combination: &c.combination,
            factors: c
                .factors
                .iter()
                .map(|(i, f)| (cases[*i].id.as_str(), *f))
                .collect(),
            note: &c.note,
        })
        .collect();
    let v = serde_json::json!({
        "table": { "file": table.file, "title": table.title, "standard": table.standard,
                   "edition": table.edition, "caution": table.caution, "notes": table.notes },
        "caution": CAUTION,
        "count": exp.cases.len(),
        "cases": list,
        "merged": exp.merged,
        "skipped": exp.skipped,
        "unplaced": exp.warnings,
        "notices": exp.notices,
    });
    serde_json::to_string_pretty(&v).unwrap_or_default() + "\n"
}

/// The factored cases as one CSV file: id, combination, basis, expression and one factor
/// column per load case, then the caution line.
pub fn cases_csv(v: &CasesView) -> String {
    let (exp, cases) = (v.expansion, v.load_cases);
    let mut s = String::from("id,combination,basis,expression");
    for c in cases {
        s.push(',');
        s.push_str(&csv_field(&c.id));
    }
    s.push('\n');
    for fc in &exp.cases {
        s.push_str(
            &[
                csv_field(&fc.id),
                csv_field(&fc.combination),
                fc.basis.to_string(),
                csv_field(&fc.expression),
            ]
            .join(","),
        );
        for i in 0..cases.len() {
            s.push_str(&format!(",{}", fc.factor_of(i)));
        }
        s.push('\n');
    }
    s.push_str(&csv_caution());
    s
}

/// The factored cases as text: the table's header, one row per case, the counts and the
/// lines a reader must see ([`expansion_summary`]), and the caution.
pub fn cases_text(v: &CasesView) -> String {
    let (table, exp) = (v.table, v.expansion);
    let rows = exp
        .cases
        .iter()
        .map(|c| {
            vec![
                c.id.clone(),
                c.expression.clone(),
                c.basis.to_string(),
                c.note.clone().unwrap_or_default(),
            ]
        })
        .collect();
    let mut s = header(table);
    s.push('\n');
    s.push_str(&table_of(&["id", "expression", "basis", "note"], rows));
    s.push_str("\n\n");
    s.push_str(&expansion_summary(exp));
    s.push_str(CAUTION);
    s.push('\n');
    s
}

/// Counts of an expansion and the lines a reader must see: merged, skipped and unplaced.
pub fn expansion_summary(exp: &Expansion) -> String {
    let nm: usize = exp.merged.iter().map(|m| m.dropped.len()).sum();
    let mut s = format!(
        "{} factored cases, {nm} merged as identical, {} skipped\n",
        exp.cases.len(),
        exp.skipped.len()
    );
    for m in &exp.merged {
        s.push_str(&format!(
            "merged: {} kept; identical: {}\n",
            m.kept,
            m.dropped.join(", ")
        ));
    }
    for k in &exp.skipped {
        s.push_str(&format!(
            "skipped: {} (the model has no load case for {})\n",
            k.combination,
            k.missing.join(", ")
        ));
    }
    for w in &exp.warnings {
        s.push_str(&format!(
            "warning: the table has no action for category {}; load cases left out: {}\n",
            w.category,
            w.cases.join(", ")
        ));
    }
    for n in &exp.notices {
        s.push_str(&format!("warning: {}: {}\n", n.at, n.message));
    }
    s
}

/// The caution as the last line of a CSV file: a comment line (`# …`), which spreadsheet
/// users see as a last row and CSV readers with a comment character skip.
pub fn csv_caution() -> String {
    format!("# {CAUTION}\n")
}

fn csv_field(s: &str) -> String {
    if s.contains([',', '"', '\n']) {
        format!("\"{}\"", s.replace('"', "\"\""))
    } else {
        s.to_string()
    }
}
