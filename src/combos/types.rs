//! What a combination table holds once read: its basis, actions, parameters, factors,
//! terms and combinations ([`ComboTable`]). The bottom layer of `combos`: reading
//! (`table.rs`), expansion (`expand.rs`), level checks (`levels.rs`) and printing
//! (`render.rs`) all import it.

use std::sync::Arc;

use serde::{Deserialize, Serialize};
use strum::{Display, EnumString};

use super::expr::Expr;
use crate::model::{ActionCategory, LoadLevel};

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
