//! Combination tables as data: one TOML file per standard, factored cases generated from it.
//!
//! A [`ComboTable`] names its standard, edition and clauses, declares the action symbols it
//! uses (each drawing load cases from one [`ActionCategory`]), named parameters (ψ factors,
//! permitted reductions, seismic coefficients) and the combinations themselves. [`expand`]
//! turns a table and the model's [`LoadCase`]s into [`FactoredCase`]s. No standard is
//! written in Rust: the shipped tables live in `combos/*.toml` (see
//! `docs/combination-tables.md` for the format).
//!
//! Tables assist a licensed engineer; the edition of each standard adopted where the
//! building stands, with its national annex or local amendments, governs.

// `FileError` (crate::diag) is the crate's located error and is large by design; boxing it is
// the integrator's call, the API signatures here return it as specified.

mod expand;
pub mod expr;
pub mod levels;
mod render;
mod settings;
mod table;

use std::path::Path;
use std::sync::Arc;

use serde::{Deserialize, Serialize};
use strum::{Display, EnumString};

use crate::diag::FileError;
#[cfg(doc)]
use crate::model::LoadCase;
use crate::model::{ActionCategory, LoadLevel};

pub use expand::{
    Expansion, FactoredCase, MAX_FACTORED_CASES, Merged, Skipped, Unplaced, expand, expand_with,
    param_values,
};
pub use expr::Expr;
pub use render::{
    OutputFormat, cases_report, cases_report_with, csv_caution, expansion_summary,
    render_expansion, render_table, render_table_list, term_text,
};
pub use settings::{Notice, Settings};
pub use table::parse_table;

/// The design basis of a table's combinations.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize, Display, EnumString)]
#[serde(rename_all = "kebab-case")]
#[strum(serialize_all = "kebab-case")]
pub enum Basis {
    /// Strength design / ultimate limit state (factored loads).
    Strength,
    /// Allowable stress design (service-level combinations).
    AllowableStress,
    /// Serviceability limit state.
    Serviceability,
}

/// Whether an action is permanent (dead load) or variable (everything else, including wind
/// and earthquake). Only variable actions can be a combination's principal action.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize, Display, EnumString)]
#[serde(rename_all = "kebab-case")]
#[strum(serialize_all = "kebab-case")]
pub enum ActionKind {
    Permanent,
    Variable,
}

/// An action symbol of a table (`D`, `Lr`, `G`, `Q`…) and the load cases it draws on.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Action {
    /// The symbol as the standard writes it.
    pub symbol: String,
    pub description: String,
    /// The model's load cases of this category make up the action.
    pub category: ActionCategory,
    pub kind: ActionKind,
    /// The load level the table expects for this action's load cases (wind, snow and
    /// seismic), e.g. strength-level wind for ASCE/SEI 7-16.
    pub level: Option<LoadLevel>,
}

/// A factor as written in the table: a number or an expression of parameters.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Factor {
    /// The text as written (a number is kept as written, e.g. `1.0`).
    pub text: String,
    #[serde(skip)]
    pub expr: Expr,
    /// Byte range in the table source.
    #[serde(skip)]
    pub span: std::ops::Range<usize>,
}

/// A named parameter with its default (absent: the engineer must set it).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Param {
    pub name: String,
    pub default: Option<Factor>,
    pub description: String,
    /// Confidence tag of the default, e.g. `[C: …]`, `[M]`, `verify`.
    pub tag: Option<String>,
    /// Smallest and largest value the table accepts (inclusive), when it declares them.
    pub min: Option<f64>,
    pub max: Option<f64>,
    #[serde(skip)]
    pub span: std::ops::Range<usize>,
}

impl Param {
    /// The declared range as text, e.g. `0.5 to 1.0`, `at least 0`.
    pub fn range_text(&self) -> String {
        match (self.min, self.max) {
            (Some(a), Some(b)) => format!("{a} to {b}"),
            (Some(a), None) => format!("at least {a}"),
            (None, Some(b)) => format!("at most {b}"),
            (None, None) => "any finite number".to_string(),
        }
    }

    /// Whether `x` lies in the declared range.
    pub fn accepts(&self, x: f64) -> bool {
        x.is_finite() && self.min.is_none_or(|a| x >= a) && self.max.is_none_or(|b| x <= b)
    }
}

/// One action with its factor inside a term.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ActionFactor {
    /// Index into [`ComboTable::actions`].
    pub action: usize,
    pub factor: Factor,
    /// A second factor used where the action is favourable; both variants are generated.
    pub favourable: Option<Factor>,
    /// The action acts in either sense: both signs are generated.
    pub reversible: bool,
    /// The table allows this factor to evaluate below zero (`allow-negative = true`); any
    /// other negative factor is an error.
    pub allow_negative: bool,
}

/// What a term of a combination contributes.
#[derive(Debug, Clone, PartialEq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum TermKind {
    /// One action with its factor.
    Single(ActionFactor),
    /// Exactly one of these actions, each giving its own variant.
    OneOf(Vec<ActionFactor>),
    /// Each listed action leads in turn; the other actions of `companions` accompany it.
    Leading {
        leading: Vec<ActionFactor>,
        companions: Vec<ActionFactor>,
        /// Also generate the leading action alone (all companions favourable, set to zero).
        optional_companions: bool,
    },
}

/// A term of a combination.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Term {
    pub kind: TermKind,
    /// Name of an optional group: each combination is generated with and without all the
    /// terms of a group.
    pub optional: Option<String>,
    /// A principal term: a variant whose principal actions are all missing from the model
    /// is skipped (reported), instead of generated with the remaining terms.
    pub principal: bool,
}

/// One combination as the standard writes it.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Combination {
    /// Id tracing back to the standard, e.g. `2.3.1-3`.
    pub id: String,
    pub terms: Vec<Term>,
    /// When a factor may change, or what the combination is for.
    pub note: Option<String>,
    /// Confidence tag of the row.
    pub tag: Option<String>,
    #[serde(skip)]
    pub span: std::ops::Range<usize>,
}

/// A combination table read from TOML.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct ComboTable {
    /// File name (or shipped name) the table was read from.
    pub file: String,
    pub title: String,
    pub standard: String,
    pub edition: String,
    /// Where the rows come from (document, tables, notes used).
    pub source: String,
    pub clauses: Vec<String>,
    pub basis: Basis,
    pub caution: String,
    /// Table-wide remarks printed with every expansion (e.g. "S must be strength-level").
    pub notes: Vec<String>,
    pub actions: Vec<Action>,
    pub params: Vec<Param>,
    pub combinations: Vec<Combination>,
    /// The source text, for located errors found after parsing.
    #[serde(skip)]
    pub source_text: Arc<str>,
}

impl ComboTable {
    /// Index of the action with this symbol.
    pub fn action_index(&self, symbol: &str) -> Option<usize> {
        self.actions.iter().position(|a| a.symbol == symbol)
    }

    /// The parameter with this name.
    pub fn param(&self, name: &str) -> Option<&Param> {
        self.params.iter().find(|p| p.name == name)
    }
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
