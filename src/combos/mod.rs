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
mod render;
mod table;

use std::path::Path;
use std::sync::Arc;

use serde::{Deserialize, Serialize};
use strum::{Display, EnumString};

use crate::diag::FileError;
use crate::model::ActionCategory;
#[cfg(doc)]
use crate::model::LoadCase;

pub use expand::{Expansion, FactoredCase, Merged, Skipped, Unplaced, expand};
pub use expr::Expr;
pub use render::{
    OutputFormat, cases_report, expansion_summary, render_expansion, render_table,
    render_table_list, term_text,
};
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
    #[serde(skip)]
    pub span: std::ops::Range<usize>,
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
    "nbcc-2020",
    "asnzs1170-0-2002",
];

/// The tables shipped with plumbline, in a fixed order.
pub fn shipped_tables() -> &'static [ShippedTable] {
    SHIPPED
}

/// Read a table by shipped name or by path. A relative path is taken against `base_dir`
/// (the model file's folder) when given. A name that is neither a shipped table nor an
/// existing file gives an error listing the shipped names.
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
    match std::fs::metadata(&path) {
        Ok(_) => parse_table(
            &crate::diag::read_input(&path, "combination table")?,
            &path.display().to_string(),
        ),
        Err(e) => {
            let names: Vec<&str> = SHIPPED.iter().map(|t| t.name).collect();
            let message = if looks_like_path {
                format!("cannot read combination table `{}`: {e}", path.display())
            } else {
                format!("`{name_or_path}` is not a shipped combination table")
            };
            Err(FileError {
                file: path.display().to_string(),
                line: 0,
                column: 0,
                field: "combos".to_string(),
                message,
                help: Some(format!(
                    "shipped tables: {}; or give the path of a table file",
                    names.join(", ")
                )),
                span: None,
                source_text: None,
            })
        }
    }
}
