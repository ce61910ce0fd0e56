//! Load levels: the level at which a load case's magnitudes were computed, against the level
//! a combination table expects for its category.
//!
//! Wind at strength level (ASCE/SEI 7-16) under a table that expects characteristic wind
//! (EN 1990 with EN 1991-1-4) would be factored 1.5 on top of a load that already carries
//! its safety margin. So a load case whose level differs from the table's is refused, with
//! a message located in the model file that says what to convert and by what factor the
//! standards imply (`combos/levels.toml`), unless the model states a conversion
//! (`[[combinations.convert]]`), which then multiplies the case.
//!
//! The level of a load case is the one it states (`level = "..."`); failing that, the level
//! the model's own table (`[combinations] table`) expects, so a model prepared for one
//! standard and run under another table is caught; failing that, unknown (a notice).

use std::collections::BTreeMap;

use serde::Deserialize;

use super::settings::{Notice, Settings, format_factor};
use super::types::ComboTable;
use crate::diag::FileError;
use crate::model::{ActionCategory, LoadCase, LoadLevel};

/// A relation between two load levels that the standards imply (data, `combos/levels.toml`).
#[derive(Debug, Clone, PartialEq, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Relation {
    pub category: ActionCategory,
    pub from: LoadLevel,
    pub to: LoadLevel,
    /// Multiply a load at `from` by this to obtain it at `to`.
    pub factor: f64,
    /// Where the factor comes from, with its confidence tag.
    pub source: String,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct RelationFile {
    relation: Vec<Relation>,
}

/// The shipped relations between load levels.
pub fn relations() -> Vec<Relation> {
    // The file is part of the program and is checked by a unit test below.
    toml::from_str::<RelationFile>(include_str!("../../combos/levels.toml"))
        .map(|f| f.relation)
        .unwrap_or_default()
}

/// The multiplier of every load case (1 unless a stated conversion applies) and the
/// notices about levels that could not be checked.
#[derive(Debug, Clone, PartialEq)]
pub struct CaseScale {
    /// By load case index.
    pub factor: Vec<f64>,
    pub notices: Vec<Notice>,
}

impl ComboTable {
    /// The level this table expects for each category, from its actions' `level` keys.
    pub fn expected_levels(&self) -> BTreeMap<ActionCategory, LoadLevel> {
        let mut m = BTreeMap::new();
        for a in &self.actions {
            if let Some(l) = a.level {
                m.entry(a.category).or_insert(l);
            }
        }
        m
    }
}

/// Check the level of every load case against `table` and apply the stated conversions.
///
/// Errors (located at the load case in the model file): a case whose level differs from
/// the table's without a stated conversion.
pub fn case_scales(
    table: &ComboTable,
    cases: &[LoadCase],
    settings: &Settings,
) -> Result<CaseScale, FileError> {
    let expected = table.expected_levels();
    let mut out = CaseScale {
        factor: vec![1.0; cases.len()],
        notices: Vec::new(),
    };
    let mut unstated: BTreeMap<ActionCategory, Vec<&str>> = BTreeMap::new();
    let mut mismatches: Vec<(usize, LoadLevel, LoadLevel, String)> = Vec::new();
    for (i, c) in cases.iter().enumerate() {
        let Some(&want) = expected.get(&c.category) else {
            continue;
        };
        let assumed = settings
            .assumed_levels
            .as_ref()
            .and_then(|(name, m)| m.get(&c.category).map(|l| (name.as_str(), *l)));
        let (have, how) = match (c.level, assumed) {
            (Some(l), _) => (l, "as its `level` states".to_string()),
            (None, Some((name, l))) => (
                l,
                format!(
                    "the case states no `level`, so it takes the level of table {name}, which the model names"
                ),
            ),
            (None, None) => {
                unstated.entry(c.category).or_default().push(&c.id);
                continue;
            }
        };
        if have == want {
            continue;
        }
        if let Some(conv) = settings
            .conversions
            .iter()
            .find(|v| v.category == c.category && v.from == have && v.to == want)
        {
            out.factor[i] = conv.factor;
            continue;
        }
        mismatches.push((i, have, want, how));
    }
    if let Some((i, have, want, how)) = mismatches.first() {
        let others: Vec<String> = mismatches[1..]
            .iter()
            .map(|(j, h, w, _)| format!("{} ({} {h} → {w})", cases[*j].id, cases[*j].category))
            .collect();
        let mut e = mismatch(table, &cases[*i], *have, *want, how, settings);
        if !others.is_empty() {
            e.message
                .push_str(&format!("; so are load cases {}", others.join(", ")));
        }
        return Err(e);
    }
    for (cat, ids) in unstated {
        out.notices.push(Notice {
            at: settings.written.place(settings.written.cases.get(ids[0])),
            message: format!(
                "{cat} load cases {} state no level; table {} expects {}-level {cat}: make sure they are, or state `level` on each",
                ids.join(", "),
                table.file,
                expected[&cat]
            ),
        });
    }
    Ok(out)
}

/// The located error for a load case at level `have` under a table expecting `want`.
fn mismatch(
    table: &ComboTable,
    c: &LoadCase,
    have: LoadLevel,
    want: LoadLevel,
    how: &str,
    settings: &Settings,
) -> FileError {
    let cat = c.category;
    let span = settings.written.cases.get(&c.id).cloned();
    let field = if c.level.is_some() {
        format!("case {}.level", c.id)
    } else {
        format!("case {}", c.id)
    };
    let message = format!(
        "load case {} is {cat} at {have} level ({how}), but table {} expects {want}-level {cat}; its factors would be applied to a load of the wrong level",
        c.id, table.file
    );
    let relation = relations()
        .into_iter()
        .find(|r| r.category == cat && r.from == have && r.to == want);
    let convert = |factor: &str| {
        format!(
            "[[combinations.convert]] category = \"{cat}\", from = \"{have}\", to = \"{want}\", factor = {factor}"
        )
    };
    let help = match relation {
        Some(r) => format!(
            "convert the {cat} loads from {have} to {want} level: the standards imply a factor of about {} ({}). Give the load case at {want} level, or state the conversion in the model: {}",
            format_factor(r.factor),
            r.source,
            convert(&format_factor(r.factor))
        ),
        None => format!(
            "no factor between {have} and {want} level is implied by the standards plumbline knows: recompute the {cat} loads under the table's standard, or state your own conversion: {}",
            convert("…")
        ),
    };
    settings
        .written
        .error(span, &field, message)
        .with_help(help)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_shipped_relations_read_and_are_positive() {
        let r = relations();
        assert!(r.len() >= 10, "combos/levels.toml did not read");
        assert!(r.iter().all(|x| x.factor > 0.0 && !x.source.is_empty()));
        // ASCE/SEI 7-16 strength-level to nominal wind: 1/1.6 [M].
        let w = r
            .iter()
            .find(|x| {
                x.category == ActionCategory::Wind
                    && x.from == LoadLevel::Strength
                    && x.to == LoadLevel::Nominal
            })
            .unwrap();
        assert_eq!(w.factor, 0.625);
    }
}
