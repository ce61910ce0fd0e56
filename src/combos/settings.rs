//! What the model file and the command line say about a table's use ([`Settings`]), the
//! located warnings an expansion gives ([`Notice`]) and how a factor is printed. Shared by
//! the expansion (`combos/expand.rs`) and the load-level checks (`combos/levels.rs`), which
//! import it rather than each other.

use std::collections::BTreeMap;

use serde::Serialize;

use super::types::ComboTable;
use crate::model::{ActionCategory, ComboChoice, LevelConversion, LoadLevel, Model, ModelSpans};

/// A warning about the model, located in the model file where possible.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Notice {
    /// `file:line:column` (or the file name) the warning refers to.
    pub at: String,
    pub message: String,
}

/// What the model file and the command line say about a table's use, with where they said
/// it: parameter values, load-level conversions and the levels of load cases that state
/// none. [`Settings::default`] is "nothing said" (parameters at their defaults).
#[derive(Debug, Clone, Default)]
pub struct Settings {
    /// Parameter values from the model file's `[combinations] params`.
    pub model_params: BTreeMap<String, f64>,
    /// Parameter values from the command line (`--set`); they win over the model's.
    pub sets: BTreeMap<String, f64>,
    /// Conversions between load levels stated in the model.
    pub conversions: Vec<LevelConversion>,
    /// The model's own table (`[combinations] table`) and the level it expects per
    /// category: the level of a load case that states none.
    pub assumed_levels: Option<(String, BTreeMap<ActionCategory, LoadLevel>)>,
    /// Where the model wrote all this (for located errors).
    pub written: ModelSpans,
}

impl Settings {
    /// Parameters given on the command line only (library callers, tests).
    pub fn with_sets(sets: &BTreeMap<String, f64>) -> Settings {
        Settings {
            sets: sets.clone(),
            ..Settings::default()
        }
    }

    /// The settings of `model`, its own table `own` (when the model names one) and the
    /// command line's `sets`.
    pub fn for_model(
        model: &Model,
        own: Option<&ComboTable>,
        sets: &BTreeMap<String, f64>,
    ) -> Settings {
        let ComboChoice {
            params,
            conversions,
            written,
            ..
        } = &model.combos;
        Settings {
            model_params: params.clone(),
            sets: sets.clone(),
            conversions: conversions.clone(),
            assumed_levels: own.map(|t| (t.file.clone(), t.expected_levels())),
            written: written.clone(),
        }
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
