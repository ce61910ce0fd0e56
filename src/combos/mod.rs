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
mod settings;
mod table;
mod types;

#[cfg(doc)]
use crate::model::{ActionCategory, LoadCase};

pub use expand::{
    Expansion, FactoredCase, MAX_FACTORED_CASES, Merged, Skipped, Unplaced, expand, expand_with,
    param_values,
};
pub use expr::Expr;
pub use settings::{Notice, Settings, format_factor};
pub use table::{ShippedTable, load_table, parse_table, shipped_tables};
pub use types::{
    Action, ActionFactor, ActionKind, Basis, Combination, ComboTable, Factor, Param, Term, TermKind,
};
